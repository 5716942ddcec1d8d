//! The joint model of one spec, put together from the pieces of this module:
//! resilience of bolt and clamped parts (`angle::resilience`, the stack's
//! equivalent modulus from `stack`), load factor, embedding, and the working
//! state under the operating loads when they are given. `spec::compute`
//! calls [`assembly`] before the torque window (the embedding loss enters
//! the clamp-load verdict) and [`working`] after it.

use uom::si::f64::{Force, Length};
use uom::si::length::micrometer;

use super::embedding::{embedding, Embedding, Loading, Surfaces};
use super::load_factor::{load_factor, LoadFactor};
use super::stack::ClampedLayer;
use super::working::{working_state, Loads, ThreadRolling, WorkingInput, WorkingState};
use crate::engine::angle::{resilience, JointInput, Resilience};
use crate::engine::bearing::BearingSurface;
use crate::engine::grade::Strength;
use crate::engine::material::ClampedMaterial;
use crate::engine::quantity::FrictionRange;
use crate::engine::thread::ThreadGeometry;
use crate::engine::window::TorqueWindow;
use crate::engine::EngineError;

/// Roughness taken when the request gives none: Rz 16 µm, in the class
/// "10 µm to below 40 µm" of VDI 2230 Part 1:2003 Table 5 (machined faces;
/// common practice, the class recalled from memory).
pub const DEFAULT_ROUGHNESS_RZ_UM: f64 = 16.0;

/// The joint-model inputs of a spec request beyond the joint's geometry.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct JointModelInput {
    /// The clamped stack from under the head; empty for the one-plate
    /// shorthand (clamp length and one material).
    pub layers: Vec<ClampedLayer>,
    /// Surface roughness Rz of the joint's faces.
    pub roughness_rz: Option<Length>,
    /// Load-introduction factor n.
    pub load_introduction: Option<f64>,
    pub loads: Option<Loads>,
    /// How the thread was rolled; default before heat treatment.
    pub rolling: Option<ThreadRolling>,
}

impl JointModelInput {
    /// True when the request asked for anything only the joint model answers.
    pub fn asked(&self) -> bool {
        !self.layers.is_empty()
            || self.roughness_rz.is_some()
            || self.load_introduction.is_some()
            || self.loads.is_some()
            || self.rolling.is_some()
    }
}

/// The joint model of a spec.
#[derive(Debug, Clone, PartialEq)]
pub struct JointModel {
    pub resilience: Resilience,
    pub load_factor: LoadFactor,
    pub embedding: Embedding,
    /// Rz used for the embedding.
    pub roughness_rz: Length,
    pub rolling: ThreadRolling,
    /// Under `loads`, when given.
    pub working: Option<WorkingState>,
    /// Request inputs that were defaulted: `roughness_rz`, `load_introduction`,
    /// `thread_rolling`.
    pub defaults: Vec<&'static str>,
}

fn needed(field: &str, what: &str) -> EngineError {
    EngineError::invalid(
        field,
        format!(
            "{what} is needed for the joint model (clamped parts, embedding, load factor, \
             operating loads)"
        ),
    )
}

/// Resilience, load factor and embedding of a joint whose geometry is
/// complete; `Ok(None)` when it is not and nothing of the model was asked
/// for; a refusal naming the missing input when something was.
pub fn assembly(
    thread: &ThreadGeometry,
    bearing: &BearingSurface,
    joint: Option<&JointInput>,
    input: &JointModelInput,
) -> Result<Option<JointModel>, EngineError> {
    let asked = input.asked();
    let Some(j) = joint else {
        return match asked {
            true => Err(needed(
                "clamp_length",
                "the clamp length (or clamped_parts)",
            )),
            false => Ok(None),
        };
    };
    let (Some(lk), Some(da), Some(_)) = (j.clamp_length, j.outer_diameter, j.clamped_modulus)
    else {
        if !asked {
            return Ok(None);
        }
        return Err(if j.clamp_length.is_none() {
            needed("clamp_length", "the clamp length (or clamped_parts)")
        } else if j.outer_diameter.is_none() {
            needed("joint_outer_diameter", "the outer diameter D_A")
        } else {
            needed(
                "clamped_material",
                "the clamped material (or clamped_parts)",
            )
        });
    };
    let r = resilience(thread, bearing, j, lk, da)?;
    let lf = load_factor(r.bolt, r.clamped_parts, input.load_introduction)?;
    let mut defaults = Vec::new();
    if lf.load_introduction_defaulted {
        defaults.push("load_introduction");
    }
    let rz = match input.roughness_rz {
        Some(rz) => rz,
        None => {
            defaults.push("roughness_rz");
            Length::new::<micrometer>(DEFAULT_ROUGHNESS_RZ_UM)
        }
    };
    let rolling = match input.rolling {
        Some(r) => r,
        None => {
            if input.loads.is_some() {
                defaults.push("thread_rolling");
            }
            ThreadRolling::default()
        }
    };
    let transverse = input
        .loads
        .is_some_and(|l| l.transverse.value > 0.0 || l.torsion.value > 0.0);
    let loading = if transverse {
        Loading::Transverse
    } else {
        Loading::Axial
    };
    let layers = u32::try_from(input.layers.len().max(1)).unwrap_or(u32::MAX);
    let surfaces = Surfaces::of_stack(j.joint_type, layers)?;
    let emb = embedding(rz, loading, surfaces, r.bolt, r.clamped_parts)?;
    Ok(Some(JointModel {
        resilience: r,
        load_factor: lf,
        embedding: emb,
        roughness_rz: rz,
        rolling,
        working: None,
        defaults,
    }))
}

/// The assembly figures the working state starts from.
#[derive(Debug, Clone, Copy)]
pub struct Assembled<'a> {
    pub thread: &'a ThreadGeometry,
    pub strength: &'a Strength,
    pub bearing: &'a BearingSurface,
    pub window: &'a TorqueWindow,
    pub thread_friction: FrictionRange,
    pub clamped_material: Option<&'a ClampedMaterial>,
}

/// The working state under `loads`, added to `model`.
pub fn working(
    model: &mut JointModel,
    loads: Option<&Loads>,
    a: &Assembled,
) -> Result<(), EngineError> {
    let Some(loads) = loads else { return Ok(()) };
    let state = working_state(&WorkingInput {
        thread: a.thread,
        yield_strength: a.strength.yield_strength_min,
        preload_min: a.window.preload_min,
        preload_max: a.window.preload_max,
        thread_friction_min: a.thread_friction.min(),
        load_factor: model.load_factor.load_factor,
        embedding_loss: model.embedding.preload_loss,
        bearing: a.bearing,
        permissible_surface_pressure: a
            .clamped_material
            .and_then(|m| m.permissible_surface_pressure),
        rolling: model.rolling,
        loads,
    })?;
    model.working = Some(state);
    Ok(())
}

/// F_Z of the model, zero without one.
pub fn embedding_loss(model: Option<&JointModel>) -> Force {
    model
        .map(|m| m.embedding.preload_loss)
        .unwrap_or_else(|| Force::new::<uom::si::force::newton>(0.0))
}

/// Every number of the model is finite.
pub fn all_finite(m: &JointModel) -> bool {
    let mut v = vec![
        m.resilience.bolt,
        m.resilience.clamped_parts,
        m.load_factor.load_factor,
        m.load_factor.load_factor_k,
        m.embedding.amount.value,
        m.embedding.preload_loss.value,
    ];
    if let Some(w) = &m.working {
        v.extend([
            w.additional_bolt_load.value,
            w.residual_clamp_load_min.value,
            w.slip_clamp_load.value,
            w.max_bolt_load.value,
            w.working_stress.value,
            w.alternating_stress.value,
            w.fatigue_limit.value,
            w.safety.yield_,
        ]);
        v.extend(
            [w.safety.fatigue, w.safety.slip, w.safety.surface_pressure]
                .into_iter()
                .flatten(),
        );
    }
    v.iter().all(|x| x.is_finite())
}

#[cfg(test)]
mod tests;
