//! tightspec: tightening specifications for threaded fasteners.
//!
//! Dependencies point one way: `engine` (pure computation) and `catalogue`
//! (friction data as domain types) use no other module of the crate;
//! `registry` (joints and their releases as domain types) uses only
//! `catalogue`; `store` (sqlx) uses `catalogue` and `registry`; `http` and `cli` use all three.
//! `startup` wires `http` and `store` into a server (and holds the route
//! registrations the OpenAPI document is generated from); `config` reads
//! flags and environment.

pub mod app;
pub mod catalogue;
pub mod cli;
pub mod config;
pub mod engine;
pub mod http;
pub mod registry;
pub mod startup;

#[cfg(test)]
mod fuzz_tests;
pub mod store;
