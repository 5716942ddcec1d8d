//! The joint of a spec: defaults made visible (moduli of bolt, nut and
//! clamped parts), the clamped stack turned into its clamp length and
//! equivalent modulus, then the joint model (`joint::model`).

use super::SpecInput;
use crate::engine::angle::{steel_bolt_modulus, JointInput, JointType};
use crate::engine::joint::stack::stack;
use crate::engine::EngineError;

/// The request's joint after defaults and the stack (inputs after defaults,
/// so that the answer shows what was used).
pub(super) fn prepare(input: &SpecInput) -> Result<Option<JointInput>, EngineError> {
    let Some(mut j) = input.joint.clone() else {
        return Ok(None);
    };
    let layers = &input.joint_model.layers;
    if !layers.is_empty() {
        let da = j.outer_diameter.ok_or_else(|| {
            EngineError::invalid(
                "joint_outer_diameter",
                "the outer diameter D_A of the clamped parts is needed with clamped_parts",
            )
        })?;
        let s = stack(j.joint_type, &input.bearing, da, layers)?;
        j.clamp_length = Some(s.clamp_length);
        j.clamped_modulus = Some(s.equivalent_modulus);
    }
    if j.clamped_modulus.is_none() {
        j.clamped_modulus = input.clamped_material.as_ref().map(|m| m.elastic_modulus);
    }
    j.bolt_modulus = j.bolt_modulus.or(Some(steel_bolt_modulus()));
    if j.nut_modulus.is_none() {
        j.nut_modulus = match j.joint_type {
            JointType::ThroughBolted => Some(steel_bolt_modulus()),
            JointType::TappedHole => j.clamped_modulus,
        };
    }
    Ok(Some(j))
}
