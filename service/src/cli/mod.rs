//! cli
pub mod catalogue;
pub mod friction;
pub mod token;
