//! Friction calibration endpoints: evaluate a torque–tension test series
//! (ISO 16047 method) without storing it; store a series as evidence; propose
//! and apply the catalogue change it supports.
//!
//! Only the HTTP side lives here: `handlers` (extraction, the route docs,
//! one call of an `app::friction_tests` use case, rendering). The wire
//! types, parsing, evaluation and the proposal are in `app/friction_tests/`.

mod handlers;

pub use handlers::configure;
