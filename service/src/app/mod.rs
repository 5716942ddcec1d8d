//! The application layer: the use cases, between the adapters (`http`,
//! `cli`) and the domain (`engine`, `catalogue`, `store`). Adapters
//! translate their input into the types here, call one use case and render
//! its answer; they never call the engine or the store themselves.
//!
//! - `catalogue` — catalogue use cases: entries, finishes and lubricants
//!   (one item kind), revisions, history, diff, export, import.
//! - `context` — [`App`], the store and the live catalogue, opened once at
//!   start-up; [`App::snapshot`] gives the catalogue at a revision.
//! - `error` — [`AppError`], the one error of every use case, with field
//!   paths; `http` maps it to a problem response in one place.
//! - `friction_tests` — friction test series: store, read, apply the
//!   entry change a series supports.
//! - `tokens` — API tokens: create, list, revoke, find by secret.

pub mod catalogue;
pub mod context;
pub mod error;
pub mod friction_tests;
pub mod tokens;

#[cfg(test)]
mod layering_tests;

pub use context::App;
pub use error::{AppError, FieldProblem, ProblemClass};
