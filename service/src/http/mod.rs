//! The HTTP layer (actix-web): thin handlers over the engine and the
//! catalogue. Infrastructure: `error` (problem responses), `extract`
//! (extractor error handlers), `request_id`, `metrics`, `deadline` (body-read and request deadlines), `state`,
//! `quantity` (wire quantities), `openapi`. Routes: `health`, `reference`,
//! and the feature modules, all registered in `crate::startup::routes`.

pub mod accept;
pub mod auth;
pub mod catalogue;
pub mod deadline;
pub mod error;
pub mod extract;
pub mod friction_tests;
pub mod health;
pub mod metrics;
pub mod openapi;
pub mod problem;
pub mod problem_responses;
pub mod quantity;
pub mod reference;
pub mod reference_lists;
pub mod request_id;
pub mod routes_table;
pub mod specs;
pub mod state;
