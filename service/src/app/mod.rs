//! The application layer: the use cases, between the adapters (`http`,
//! `cli`) and the domain (`engine`, `catalogue`, `store`). Adapters
//! translate their input into the types here, call one use case and render
//! its answer; they never call the engine or the store themselves.
//!
//! - `error` — [`AppError`], the one error of every use case, with field
//!   paths; `http` maps it to a problem response in one place.

pub mod error;

pub use error::{AppError, FieldProblem, ProblemClass};
