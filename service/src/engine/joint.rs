//! The joint model of VDI 2230 Part 1 beyond the torque window, pure
//! computation: `bolt` (bolt geometry, from explicit lengths or a product
//! standard's thread length, turned into the shank sections inside the clamp
//! length that `angle::resilience` takes), `load_factor` (Φ_K and
//! Φ = n·Φ_K), `embedding` (f_Z from the roughness classes and the
//! preload loss F_Z), `working` (the working state under operating loads:
//! residual clamp load, stresses, fatigue limit, safety factors and their
//! checks), `stack` (the clamped stack as one substitute-deformation body,
//! each layer with its modulus), `model` (the joint model of one spec:
//! resilience, load factor, embedding, working state) and `controlled`
//! (yield- and angle-controlled tightening: preload range, α_A, monitoring
//! torque band, angle window bounded by yield).
//!
//! The resilience formulas themselves (δ_S with shank sections, δ_P by the
//! cone/sleeve model) live in `angle::resilience`; this module reuses them.

pub mod bolt;
pub mod controlled;
pub mod embedding;
pub mod load_factor;
pub mod model;
pub mod stack;
pub mod working;

#[cfg(test)]
mod tests;
