//! The `joint` block of a spec answer: the VDI 2230 Part 1 joint model
//! (resiliences, load factor, embedding) and, under operating loads, the
//! working state. Names are fixed for integrations; pieces that do not
//! apply are left out, never written as zero.

use serde::Serialize;
use utoipa::ToSchema;

use crate::app::quantity::{Quantity, Units};
use crate::engine::joint::model::JointModel;
use crate::engine::joint::working::ThreadRolling;

/// f_Z and F_Z.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct EmbeddingOut {
    /// f_Z, the plastic flattening of all embedding surfaces.
    pub amount: Quantity,
    /// F_Z = f_Z/(δ_S + δ_P), the preload it costs.
    pub preload_loss: Quantity,
}

/// Safety factors in service; each absent where its load or limit is.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct SafetyOut {
    /// S_F = R_p0.2min/σ_red,B (required at least 1.0).
    #[serde(rename = "yield")]
    pub yield_: f64,
    /// S_D = σ_ASV/σ_a (required at least 1.2); with an alternating load.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fatigue: Option<f64>,
    /// S_G = F_KR,min/F_KQ (required at least 1.2); with transverse load or torsion.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub slip: Option<f64>,
    /// S_p = p_G/p_max (required at least 1.0); where p_G of the part is tabulated.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub surface_pressure: Option<f64>,
}

/// The joint model (VDI 2230 Part 1) of the spec.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct JointOut {
    /// δ_S, bolt resilience (mm/N or in/lbf).
    pub bolt_resilience: Quantity,
    /// δ_P, resilience of the clamped parts (the stack's substitute body).
    pub clamped_resilience: Quantity,
    /// Φ_K = δ_P/(δ_S + δ_P).
    pub load_factor_k: f64,
    /// Φ = n·Φ_K.
    pub load_factor: f64,
    /// n, the load-introduction factor used.
    pub load_introduction: f64,
    pub embedding: EmbeddingOut,
    /// Rz the embedding was read with (µm or µin).
    pub roughness_rz: Quantity,
    /// F_KR,min = F_M,min − F_Z − (1 − Φ)·F_A; with `loads`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub residual_clamp_load_min: Option<Quantity>,
    /// F_SA = Φ·F_A; with `loads`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub additional_bolt_load: Option<Quantity>,
    /// σ_a of the alternating axial load; with `loads`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub alternating_stress: Option<Quantity>,
    /// σ_ASV (rolled before heat treatment) or σ_ASG (after); with `loads`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub fatigue_limit: Option<Quantity>,
    /// `rolled-before-heat-treatment` or `rolled-after-heat-treatment`; with `loads`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub thread_rolling: Option<&'static str>,
    /// With `loads`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub safety: Option<SafetyOut>,
    /// Request fields that were defaulted: `roughness_rz` (16 µm, class 10 to
    /// below 40 µm, common practice), `load_introduction` (0.5, common
    /// practice), `thread_rolling` (rolled before heat treatment).
    pub defaults: Vec<&'static str>,
}

/// The block for a computed joint model.
pub fn joint_out(m: &JointModel, units: Units) -> JointOut {
    let w = m.working.as_ref();
    JointOut {
        bolt_resilience: Quantity::resilience(m.load_factor.bolt_resilience, units),
        clamped_resilience: Quantity::resilience(m.load_factor.clamped_resilience, units),
        load_factor_k: m.load_factor.load_factor_k,
        load_factor: m.load_factor.load_factor,
        load_introduction: m.load_factor.load_introduction,
        embedding: EmbeddingOut {
            amount: Quantity::roughness(m.embedding.amount, units),
            preload_loss: Quantity::force(m.embedding.preload_loss, units),
        },
        roughness_rz: Quantity::roughness(m.roughness_rz, units),
        residual_clamp_load_min: w.map(|w| Quantity::force(w.residual_clamp_load_min, units)),
        additional_bolt_load: w.map(|w| Quantity::force(w.additional_bolt_load, units)),
        alternating_stress: w.map(|w| Quantity::stress(w.alternating_stress, units)),
        fatigue_limit: w.map(|w| Quantity::stress(w.fatigue_limit, units)),
        thread_rolling: w.map(|_| match m.rolling {
            ThreadRolling::BeforeHeatTreatment => "rolled-before-heat-treatment",
            ThreadRolling::AfterHeatTreatment => "rolled-after-heat-treatment",
        }),
        safety: w.map(|w| SafetyOut {
            yield_: w.safety.yield_,
            fatigue: w.safety.fatigue,
            slip: w.safety.slip,
            surface_pressure: w.safety.surface_pressure,
        }),
        defaults: m.defaults.clone(),
    }
}
