//! The application layer: the use cases, between the adapters (`http`,
//! `cli`) and the domain (`engine`, `catalogue`, `store`). Adapters
//! translate their input into the types here, call one use case and render
//! its answer; they never call the engine or the store themselves.
//!
//! - `error` — [`AppError`], the one error of every use case, with field
//!   paths; `http` maps it to a problem response in one place.
//! - `spec` — the tightening-spec and setpoint use cases, their request
//!   declaration and the views both adapters render.
//! - `quantity` — wire quantities `{"value", "unit"}` and units, read into
//!   engine quantities (a misread is a [`FieldProblem`]).
//! - `reading` — nearest-name suggestions and JSON Schema integers.
//!
//! `layering_tests` checks from the source that the spec paths keep these
//! edges.

pub mod error;
pub mod quantity;
pub mod reading;
pub mod spec;

pub use error::{AppError, FieldProblem, ProblemClass};

#[cfg(test)]
mod layering_tests;
