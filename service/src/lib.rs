//! tightspec: tightening specifications for threaded fasteners.
//!
//! Dependencies point one way: `engine` (pure computation) ← `catalogue`
//! (friction data as domain types) ← `store` (sqlx) ← `http` and `cli`.
//! `startup` wires them; `config` reads flags and environment.

pub mod catalogue;
pub mod cli;
pub mod config;
pub mod engine;
pub mod http;
pub mod startup;

#[cfg(test)]
mod fuzz_tests;
pub mod store;
