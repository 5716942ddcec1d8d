//! tightspec: tightening specifications for threaded fasteners.
//!
//! Dependencies point one way: `engine` (pure computation) and `catalogue`
//! (friction data as domain types) use no other module of the crate;
//! `registry` (joints and their releases as domain types) uses only
//! `catalogue`; `store` (sqlx) uses `catalogue` and `registry`; `app` (the
//! use cases and the application context) uses those and the engine;
//! `http`, `cli` and `ui` (the engineer's web page) are adapters over `app`. `startup` opens the
//! application context and serves `http` (`http::routes` holds the route
//! registrations the OpenAPI document is generated from); `config` holds
//! the server's settings; `chart` (a deterministic SVG writer) uses nothing
//! and `app` builds its charts with it.

pub mod app;
pub mod catalogue;
pub mod chart;
pub mod cli;
pub mod config;
pub mod engine;
pub mod http;
pub mod registry;
pub mod startup;
pub mod ui;

#[cfg(test)]
mod fuzz_tests;
#[cfg(test)]
mod layering_tests;
pub mod store;
