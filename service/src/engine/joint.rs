//! The joint model of VDI 2230 Part 1 beyond the torque window, pure
//! computation: `bolt` (bolt geometry, from explicit lengths or a product
//! standard's thread length, turned into the shank sections inside the clamp
//! length that `angle::resilience` takes).
//!
//! The resilience formulas themselves (δ_S with shank sections, δ_P by the
//! cone/sleeve model) live in `angle::resilience`; this module reuses them.

pub mod bolt;
