//! The one black-box test binary: every test starts the real server on a
//! free loopback port (see `support::TestApp`) and talks HTTP to it.
//! Logs are quiet unless `TEST_LOG` is set (`TEST_LOG=debug cargo test`).

mod support;

mod errors;
mod health;
mod openapi;
mod reference;

mod answer_cache;
mod auth;
mod batch;
mod catalogue;
mod catalogue_cli;
mod catalogue_instances;
mod catalogue_specs;
mod catalogue_support;
mod contract;
mod friction_tests;
mod friction_tests_store;
mod implausible;
mod setpoints;
mod specs;
mod specs_support;
mod store;
