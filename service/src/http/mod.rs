//! http
pub mod friction_tests;
