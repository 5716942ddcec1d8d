//! tightspec: tightening specifications for threaded fasteners.
//!
//! Dependencies point one way: `engine` (pure computation) and `catalogue`
//! (friction data as domain types) use no other module of the crate;
//! `store` (sqlx) uses `catalogue`; `app` (the use cases) uses all three;
//! `http` and `cli` are adapters over `app` (and, where a use case has not
//! moved into `app` yet, over the three directly).
//! `startup` wires `http` and `store` into a server (and holds the route
//! registrations the OpenAPI document is generated from); `config` reads
//! flags and environment.

pub mod app;
pub mod catalogue;
pub mod cli;
pub mod config;
pub mod engine;
pub mod http;
pub mod startup;

#[cfg(test)]
mod fuzz_tests;
pub mod store;
