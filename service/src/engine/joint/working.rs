//! The working state of a tightened joint under its operating loads, by VDI
//! 2230 Part 1:2003 §5.5 (formulas recalled from memory, not checked against
//! the guideline here):
//!
//! - additional bolt load F_SA = Φ·F_A;
//! - residual clamp load F_KR,min = F_M,min − F_Z − (1 − Φ)·F_A;
//! - clamp load required against slip F_KQ = F_Q/(q_F·μ_T) + M_Y/(q_F·r_a·μ_T),
//!   and the sealing clamp load F_KP where given;
//! - working stress σ_red,B = sqrt(σ_z² + 3·(k_τ·τ)²), σ_z = (F_M,max + F_SA)/A_S,
//!   τ = M_G/W_P, M_G = F_M,max·d2/2·(P/(π·d2) + 1.155·μ_th,min), W_P = π·d_S³/16,
//!   k_τ = 0.5;
//! - alternating stress σ_a = Φ·(F_A,max − F_A,min)/(2·A_S) (§5.5.3 with the
//!   stress area A_S; some texts use A_d3, which gives a higher stress);
//! - fatigue limit σ_ASV = 0.85·(150/d + 45) N/mm² (d in mm) for threads rolled
//!   before heat treatment, σ_ASG = (2 − F_Sm/F_0.2min)·σ_ASV for threads rolled
//!   after it (§5.5.4);
//! - safety factors S_F = R_p0.2min/σ_red,B (≥ 1.0), S_D = σ_AS/σ_a (≥ 1.2),
//!   S_G = F_KR,min/F_KQ (≥ 1.2 for static transverse load), S_p = p_G/p_max
//!   (≥ 1.0) with p_max = (F_M,max + F_SA)/A_p.
//!
//! Each safety gives one check: information when met, an error when not.

use std::f64::consts::PI;

use uom::si::f64::{Force, Length, Pressure, Torque};
use uom::si::force::newton;
use uom::si::pressure::{megapascal, pascal};

use crate::engine::bearing::BearingSurface;
use crate::engine::checks::{
    Check, FATIGUE_SAFETY, RESIDUAL_CLAMP_LOAD, SEALING_CLAMP_LOAD, SLIP_SAFETY,
    WORKING_SURFACE_PRESSURE, WORKING_YIELD_SAFETY,
};
use crate::engine::quantity::{non_negative, positive};
use crate::engine::thread::ThreadGeometry;
use crate::engine::EngineError;

/// Every code this module writes.
pub const WORKING_CODES: [&str; 6] = [
    RESIDUAL_CLAMP_LOAD,
    WORKING_YIELD_SAFETY,
    FATIGUE_SAFETY,
    SLIP_SAFETY,
    SEALING_CLAMP_LOAD,
    WORKING_SURFACE_PRESSURE,
];

/// Share of the tightening torsion left in the working state, k_τ = 0.5
/// (VDI 2230 Part 1:2003 §5.5.2, recalled from memory).
pub const RESIDUAL_TORSION: f64 = 0.5;
/// Required safety against slip under static transverse load, 1.2 (VDI 2230
/// Part 1:2003 §5.5.6, recalled from memory).
pub const REQUIRED_SLIP_SAFETY: f64 = 1.2;
/// Required safety against fatigue, 1.2 (VDI 2230 Part 1:2003 §5.5.3,
/// recalled from memory).
pub const REQUIRED_FATIGUE_SAFETY: f64 = 1.2;
/// Largest force accepted for a working load: 100 MN (common practice: no
/// single bolt in the ISO and ASME ranges carries more; keeps every figure
/// finite).
pub const MAX_LOAD_N: f64 = 1e8;
/// Most interfaces q_F that transmit the transverse load.
pub const MAX_INTERFACES: u32 = 32;

/// How the thread was made, which sets the fatigue limit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum ThreadRolling {
    /// Rolled before heat treatment (σ_ASV); the usual case and the default.
    #[default]
    BeforeHeatTreatment,
    /// Rolled after heat treatment (σ_ASG, higher).
    AfterHeatTreatment,
}

/// Operating loads on one bolt.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Loads {
    /// Largest axial working load F_A,max (≥ 0).
    pub axial_max: Force,
    /// Smallest axial working load F_A,min (0 ≤ F_A,min ≤ F_A,max).
    pub axial_min: Force,
    /// Transverse load F_Q (≥ 0).
    pub transverse: Force,
    /// Torsion about the bolt axis M_Y (≥ 0); needs `torsion_radius`.
    pub torsion: Torque,
    /// Friction radius r_a of the torsion.
    pub torsion_radius: Option<Length>,
    /// Interfaces q_F that transmit the transverse load (1..=32).
    pub interfaces: u32,
    /// Friction μ_T at those interfaces; needed with transverse load or torsion.
    pub interface_friction: Option<f64>,
    /// Clamp load F_KP the seal needs.
    pub sealing_clamp_load: Option<Force>,
}

/// Everything the working state needs, the assembly figures already computed.
#[derive(Debug, Clone, Copy)]
pub struct WorkingInput<'a> {
    pub thread: &'a ThreadGeometry,
    /// R_p0.2min of the bolt.
    pub yield_strength: Pressure,
    /// F_M,min and F_M,max of the assembly.
    pub preload_min: Force,
    pub preload_max: Force,
    /// μ_th,min, for the thread torque left in the bolt.
    pub thread_friction_min: f64,
    /// Φ = n·Φ_K.
    pub load_factor: f64,
    /// F_Z.
    pub embedding_loss: Force,
    pub bearing: &'a BearingSurface,
    /// p_G of the part under head or nut, where known.
    pub permissible_surface_pressure: Option<Pressure>,
    pub rolling: ThreadRolling,
    pub loads: &'a Loads,
}

/// Safety factors; `None` where the load or the limit that defines it is absent.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Safety {
    pub yield_: f64,
    pub fatigue: Option<f64>,
    pub slip: Option<f64>,
    pub surface_pressure: Option<f64>,
}

/// The working state and its checks.
#[derive(Debug, Clone, PartialEq)]
pub struct WorkingState {
    /// F_SA = Φ·F_A,max.
    pub additional_bolt_load: Force,
    /// F_KR,min.
    pub residual_clamp_load_min: Force,
    /// F_KQ, clamp load required against slip (zero without transverse load or torsion).
    pub slip_clamp_load: Force,
    /// F_S,max = F_M,max + F_SA.
    pub max_bolt_load: Force,
    /// σ_red,B.
    pub working_stress: Pressure,
    /// σ_a.
    pub alternating_stress: Pressure,
    /// σ_ASV or σ_ASG, as the rolling gives.
    pub fatigue_limit: Pressure,
    pub safety: Safety,
    pub checks: Vec<Check>,
}

fn load(f: Force, field: &str) -> Result<f64, EngineError> {
    let v = non_negative(f.value, field)?;
    if v > MAX_LOAD_N {
        return Err(EngineError::invalid(
            field,
            format!(
                "{:.0} kN is above the 100 MN accepted for one bolt",
                v / 1e3
            ),
        ));
    }
    Ok(v)
}

/// Fatigue limit σ_ASV = 0.85·(150/d + 45) N/mm², d in mm (VDI 2230 Part 1:2003
/// §5.5.4, recalled from memory), for threads rolled before heat treatment.
pub fn fatigue_limit_rolled_before(thread: &ThreadGeometry) -> Pressure {
    let d_mm = thread.nominal_diameter.value * 1e3;
    Pressure::new::<megapascal>(0.85 * (150.0 / d_mm + 45.0))
}

/// σ_ASG = (2 − F_Sm/F_0.2min)·σ_ASV for threads rolled after heat treatment
/// (same section, recalled from memory); the ratio is held in [0, 1].
pub fn fatigue_limit_rolled_after(
    thread: &ThreadGeometry,
    mean_bolt_load: Force,
    yield_strength: Pressure,
) -> Pressure {
    let f02 = thread.stress_area.value * yield_strength.value;
    let ratio = (mean_bolt_load.value / f02).clamp(0.0, 1.0);
    fatigue_limit_rolled_before(thread) * (2.0 - ratio)
}

/// The assembly figures come from the engine; refuse any that would make a
/// figure of the working state meaningless or not finite.
fn assembly_figures(i: &WorkingInput) -> Result<(), EngineError> {
    positive(i.yield_strength.value, "property_class")?;
    let lo = load(i.preload_min, "preload.min")?;
    let hi = load(i.preload_max, "preload.max")?;
    if lo <= 0.0 || lo > hi {
        return Err(EngineError::invalid(
            "preload.min",
            "the minimum preload must be positive and at most the maximum",
        ));
    }
    load(i.embedding_loss, "embedding.preload_loss")?;
    let mu = i.thread_friction_min;
    if !(mu.is_finite() && (0.0..=1.0).contains(&mu)) {
        return Err(EngineError::invalid(
            "thread_friction.min",
            format!("thread friction must lie between 0 and 1, got {mu}"),
        ));
    }
    Ok(())
}

/// The working state of the joint under `input.loads`.
pub fn working_state(input: &WorkingInput) -> Result<WorkingState, EngineError> {
    let l = input.loads;
    let fa = load(l.axial_max, "loads.axial")?;
    let fa_min = load(l.axial_min, "loads.axial_min")?;
    if fa_min > fa {
        return Err(EngineError::invalid(
            "loads.axial_min",
            "the smallest axial load is above the largest",
        ));
    }
    let fq = load(l.transverse, "loads.transverse")?;
    let my = non_negative(l.torsion.value, "loads.torsion")?;
    if my > MAX_LOAD_N {
        return Err(EngineError::invalid("loads.torsion", "above 100 MN·m"));
    }
    let fkp = match l.sealing_clamp_load {
        Some(f) => Some(load(f, "loads.sealing_clamp_load")?),
        None => None,
    };
    let phi = input.load_factor;
    if !(phi.is_finite() && phi > 0.0 && phi < 1.0) {
        return Err(EngineError::invalid("load_factor", "Φ must lie in (0, 1)"));
    }
    let slip_clamp = if fq > 0.0 || my > 0.0 {
        if l.interfaces == 0 || l.interfaces > MAX_INTERFACES {
            return Err(EngineError::invalid(
                "loads.interfaces",
                format!(
                    "between 1 and {MAX_INTERFACES} interfaces, got {}",
                    l.interfaces
                ),
            ));
        }
        let mu = l.interface_friction.ok_or_else(|| {
            EngineError::invalid(
                "loads.interface_friction",
                "the friction at the interfaces is needed to resist a transverse load or torsion",
            )
        })?;
        if !(mu.is_finite() && (0.02..=1.0).contains(&mu)) {
            return Err(EngineError::invalid(
                "loads.interface_friction",
                format!("interface friction must lie between 0.02 and 1, got {mu}"),
            ));
        }
        let q = f64::from(l.interfaces);
        let torsion = if my > 0.0 {
            let ra = l.torsion_radius.ok_or_else(|| {
                EngineError::invalid(
                    "loads.torsion_radius",
                    "the friction radius is needed to turn a torsion into a clamp load",
                )
            })?;
            let ra = positive(ra.value, "loads.torsion_radius")?;
            if ra < 1e-4 {
                return Err(EngineError::invalid("loads.torsion_radius", "below 0.1 mm"));
            }
            my / (q * ra * mu)
        } else {
            0.0
        };
        fq / (q * mu) + torsion
    } else {
        0.0
    };

    assembly_figures(input)?;
    let t = input.thread;
    let a_s = t.stress_area.value;
    let fm_min = input.preload_min.value;
    let fm_max = input.preload_max.value;
    let fsa = phi * fa;
    let residual = fm_min - input.embedding_loss.value - (1.0 - phi) * fa;
    let fs_max = fm_max + fsa;
    let (p, d2) = (t.pitch.value, t.pitch_diameter.value);
    let thread_torque = fm_max * d2 / 2.0 * (p / (PI * d2) + 1.155 * input.thread_friction_min);
    let ds = (4.0 * a_s / PI).sqrt();
    let tau = thread_torque / (PI * ds.powi(3) / 16.0);
    let sigma_z = fs_max / a_s;
    let sigma_red = (sigma_z * sigma_z + 3.0 * (RESIDUAL_TORSION * tau).powi(2)).sqrt();
    let sigma_a = phi * (fa - fa_min) / (2.0 * a_s);
    let fatigue_limit = match input.rolling {
        ThreadRolling::BeforeHeatTreatment => fatigue_limit_rolled_before(t),
        ThreadRolling::AfterHeatTreatment => {
            let mean = Force::new::<newton>(fm_max + phi * (fa + fa_min) / 2.0);
            fatigue_limit_rolled_after(t, mean, input.yield_strength)
        }
    };
    let (dw, dh) = (
        input.bearing.outer_diameter.value,
        input.bearing.inner_diameter.value,
    );
    let bearing_area = PI / 4.0 * (dw * dw - dh * dh);
    if bearing_area.is_nan() || bearing_area <= 0.0 {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            "the bearing outer diameter must exceed the hole diameter",
        ));
    }
    let pressure = fs_max / bearing_area;
    let safety = Safety {
        yield_: input.yield_strength.value / sigma_red,
        fatigue: (sigma_a > 0.0).then(|| fatigue_limit.value / sigma_a),
        slip: (slip_clamp > 0.0).then(|| residual.max(0.0) / slip_clamp),
        surface_pressure: input
            .permissible_surface_pressure
            .map(|pg| pg.value / pressure),
    };
    let checks = working_checks(&safety, residual, fkp, sigma_a, slip_clamp);
    Ok(WorkingState {
        additional_bolt_load: Force::new::<newton>(fsa),
        residual_clamp_load_min: Force::new::<newton>(residual),
        slip_clamp_load: Force::new::<newton>(slip_clamp),
        max_bolt_load: Force::new::<newton>(fs_max),
        working_stress: Pressure::new::<pascal>(sigma_red),
        alternating_stress: Pressure::new::<pascal>(sigma_a),
        fatigue_limit,
        safety,
        checks,
    })
}

mod verdicts;
use verdicts::working_checks;

#[cfg(test)]
mod tests;
