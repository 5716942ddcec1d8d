//! cli
pub mod friction;
