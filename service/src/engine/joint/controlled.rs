//! Yield-controlled and angle-controlled tightening as methods of their own:
//! the preload range comes from the bolt's yield point and the joint's
//! stiffness, not from a torque window with a tool scatter.
//!
//! - Yield-controlled (VDI 2230 Part 1:2003 §5.4.3, recalled from memory):
//!   the bolt is tightened to its yield point under tension plus thread
//!   torsion, F = A_S·R_p0.2/sqrt(1 + 3·[(3/2)·(d2/d_S)·(P/(π·d2) + 1.155·μ_th)]²)
//!   (the ν = 1 case of `tightening::permissible_preload`).
//!   F_M,min from R_p0.2min at μ_th,max, F_M,max from R_p0.2max at μ_th,min;
//!   α_A = F_M,max/F_M,min. Where the grade gives no R_p0.2max, R_p0.2max =
//!   1.2·R_p0.2min (recalled from memory as the usual assumption; common
//!   practice). The torque at which yield is reached, over the friction and
//!   yield ranges, is the monitoring band the tool checks.
//! - Angle-controlled, elastic model: from the snug preload (scattering with
//!   the friction range at the snug torque) the bolt gains
//!   ΔF = θ·P/(360°·(δ_S + δ_P)) (VDI 2230 Part 1 §5.1 resilience, the nut
//!   advancing P per turn); the angle scatters by ±s of the tool. The torque
//!   at the end of tightening is M = M_snug + ΔF·c(μ_th, μ_b) (the snug
//!   preload times c is M_snug − M_ü, the prevailing torque comes back on
//!   top), so the monitoring band is M_snug + ΔF_min·c_min to
//!   M_snug + ΔF_max·c_max. The angle at which the first bolt of the batch
//!   yields (highest snug preload, R_p0.2min, μ_th,max) is reported beside
//!   the window; a window reaching it is an error check of the spec
//!   (`checks::ANGLE_PAST_BOLT_YIELD`), not a refusal here.

use uom::si::angle::degree;
use uom::si::f64::{Angle, Force, Length, Pressure, Torque};
use uom::si::force::newton;
use uom::si::pressure::pascal;
use uom::si::torque::newton_meter;

use crate::engine::quantity::{non_negative, positive, FrictionRange, Utilisation};
use crate::engine::thread::ThreadGeometry;
use crate::engine::tightening::{permissible_preload, preload_at_torque, torque_per_preload};
use crate::engine::EngineError;

/// R_p0.2max/R_p0.2min assumed where the grade gives no upper yield strength
/// (recalled from memory; common practice).
pub const DEFAULT_YIELD_SPREAD: f64 = 1.2;
/// Yield strengths accepted, in N/mm² (common practice: bolt materials lie
/// well inside; the bounds keep every figure finite).
pub const YIELD_RANGE_MPA: (f64, f64) = (50.0, 3000.0);
/// Largest R_p0.2max/R_p0.2min accepted (common practice: one batch of one
/// grade spreads far less).
pub const MAX_YIELD_SPREAD: f64 = 2.0;
/// Largest δ_S + δ_P accepted, m/N (common practice: a bolted joint is
/// orders of magnitude stiffer than 1e-5 m/N).
pub const MAX_RESILIENCE: f64 = 1e-5;

/// The assembly friction and bearing of a tightening.
#[derive(Debug, Clone, Copy)]
pub struct Assembly<'a> {
    pub thread: &'a ThreadGeometry,
    /// R_p0.2min of the bolt.
    pub yield_min: Pressure,
    /// R_p0.2max where the grade gives it; default [`DEFAULT_YIELD_SPREAD`]·R_p0.2min.
    pub yield_max: Option<Pressure>,
    pub thread_friction: FrictionRange,
    pub bearing_friction: FrictionRange,
    /// D_Km.
    pub mean_bearing_diameter: Length,
    pub prevailing_torque: Torque,
}

/// Preload range of a yield- or angle-controlled tightening.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ControlledPreload {
    pub preload_min: Force,
    pub preload_max: Force,
    /// α_A = F_M,max/F_M,min.
    pub tightening_factor: f64,
    /// R_p0.2max assumed (it sets F_M,max of yield-controlled tightening;
    /// the angle-controlled window stays below the first yield), and whether
    /// it was the default spread.
    pub yield_max: Pressure,
    pub yield_max_defaulted: bool,
}

impl ControlledPreload {
    /// From the preload range in N and R_p0.2max in Pa.
    fn new(f_min: f64, f_max: f64, rp_max: f64, yield_max_defaulted: bool) -> Self {
        Self {
            preload_min: Force::new::<newton>(f_min),
            preload_max: Force::new::<newton>(f_max),
            tightening_factor: f_max / f_min,
            yield_max: Pressure::new::<pascal>(rp_max),
            yield_max_defaulted,
        }
    }
}

/// Yield-controlled tightening: preload range and the torque band at yield.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct YieldControlled {
    pub preload: ControlledPreload,
    /// Lowest and highest torque at which the bolts reach yield over the
    /// friction and yield ranges: the band the tool monitors.
    pub monitoring_torque_min: Torque,
    pub monitoring_torque_max: Torque,
}

/// Angle-controlled tightening from snug.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AngleControlled {
    pub preload: ControlledPreload,
    /// Preload at the snug torque, at maximum and at minimum friction.
    pub snug_preload_min: Force,
    pub snug_preload_max: Force,
    /// Lowest and highest torque at the end of tightening over the friction
    /// range and the angle window: the band the tool monitors.
    pub monitoring_torque_min: Torque,
    pub monitoring_torque_max: Torque,
    /// Angle from snug at −s and +s of the tool.
    pub angle_min: Angle,
    pub angle_max: Angle,
    /// Angle from snug at which the first bolt of the batch may yield.
    pub angle_at_yield: Angle,
}

/// Validates the assembly and gives (R_p0.2max in Pa, defaulted).
fn yield_max(a: &Assembly) -> Result<(f64, bool), EngineError> {
    positive(a.mean_bearing_diameter.value, "bearing")?;
    non_negative(a.prevailing_torque.value, "prevailing_torque")?;
    let (lo, hi) = (YIELD_RANGE_MPA.0 * 1e6, YIELD_RANGE_MPA.1 * 1e6);
    let min = positive(a.yield_min.value, "property_class")?;
    if !(lo..=hi).contains(&min) {
        return Err(EngineError::invalid(
            "property_class",
            format!(
                "minimum yield strength {:.0} N/mm² is outside {:.0} to {:.0} N/mm²",
                min / 1e6,
                YIELD_RANGE_MPA.0,
                YIELD_RANGE_MPA.1
            ),
        ));
    }
    match a.yield_max {
        Some(p) => {
            let max = positive(p.value, "yield_strength_max")?;
            if max < min || max > MAX_YIELD_SPREAD * min {
                return Err(EngineError::invalid(
                    "yield_strength_max",
                    format!(
                        "the upper yield strength must lie between the minimum yield strength \
                         and {MAX_YIELD_SPREAD} times it"
                    ),
                ));
            }
            Ok((max, false))
        }
        None => Ok((DEFAULT_YIELD_SPREAD * min, true)),
    }
}

/// Preload at the yield point (ν = 1) at friction μ_th and yield strength `rp` (Pa).
fn yield_preload(t: &ThreadGeometry, rp: f64, mu_th: f64) -> Result<f64, EngineError> {
    let full = Utilisation::new(1.0, "utilisation")?;
    Ok(permissible_preload(t, Pressure::new::<pascal>(rp), full, mu_th).value)
}

/// Yield-controlled preload range and monitoring torque band.
pub fn yield_controlled(a: &Assembly) -> Result<YieldControlled, EngineError> {
    let (rp_max, defaulted) = yield_max(a)?;
    let rp_min = a.yield_min.value;
    let (th, b) = (a.thread_friction, a.bearing_friction);
    let t = a.thread;
    let f_min = yield_preload(t, rp_min, th.max())?;
    let f_max = yield_preload(t, rp_max, th.min())?;
    let mut lo = f64::INFINITY;
    let mut hi = 0.0_f64;
    for rp in [rp_min, rp_max] {
        for mu_th in [th.min(), th.max()] {
            for mu_b in [b.min(), b.max()] {
                let c = torque_per_preload(t, a.mean_bearing_diameter, mu_th, mu_b).value;
                let m = yield_preload(t, rp, mu_th)? * c + a.prevailing_torque.value;
                lo = lo.min(m);
                hi = hi.max(m);
            }
        }
    }
    Ok(YieldControlled {
        preload: ControlledPreload::new(f_min, f_max, rp_max, defaulted),
        monitoring_torque_min: Torque::new::<newton_meter>(lo),
        monitoring_torque_max: Torque::new::<newton_meter>(hi),
    })
}

/// Which end of the angle window a preload is meant for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WindowEnd {
    /// The window's upper end from the highest snug preload reaches it.
    Upper,
    /// The window's lower end from the lowest snug preload reaches it.
    Lower,
}

/// Snug preloads (lowest, highest) in N, validating the snug torque.
fn snug_preloads(a: &Assembly, snug_torque: Torque) -> Result<(f64, f64), EngineError> {
    let snug = positive(snug_torque.value, "joint.snug_torque")?;
    let (th, b) = (a.thread_friction, a.bearing_friction);
    let (dkm, mp) = (a.mean_bearing_diameter, a.prevailing_torque);
    if snug <= mp.value {
        return Err(EngineError::invalid(
            "joint.snug_torque",
            format!(
                "the snug torque {snug:.2} N·m does not exceed the prevailing torque {:.2} N·m",
                mp.value
            ),
        ));
    }
    let t = Torque::new::<newton_meter>(snug);
    Ok((
        preload_at_torque(a.thread, t, dkm, th.max(), b.max(), mp).value,
        preload_at_torque(a.thread, t, dkm, th.min(), b.min(), mp).value,
    ))
}

fn checked_resilience(resilience: f64) -> Result<f64, EngineError> {
    let delta = positive(resilience, "joint")?;
    if delta > MAX_RESILIENCE {
        return Err(EngineError::invalid(
            "joint",
            format!("joint resilience {delta:e} m/N is outside the model's range"),
        ));
    }
    Ok(delta)
}

fn checked_scatter(angle_scatter: f64) -> Result<f64, EngineError> {
    if !(angle_scatter.is_finite() && (0.0..0.5).contains(&angle_scatter)) {
        return Err(EngineError::invalid(
            "angle_scatter",
            format!("angle scatter must be at least 0 and below 0.5 (±50 %), got {angle_scatter}"),
        ));
    }
    Ok(angle_scatter)
}

/// The target angle θ from `snug_torque` whose window end `end` (θ·(1 ± s))
/// brings the bolt to `preload`: from the highest snug preload for the
/// upper end, from the lowest for the lower end. Refused naming
/// `joint.snug_torque` when the snug torque alone already reaches it.
pub fn angle_to_reach(
    a: &Assembly,
    resilience: f64,
    snug_torque: Torque,
    angle_scatter: f64,
    preload: Force,
    end: WindowEnd,
) -> Result<Angle, EngineError> {
    let delta = checked_resilience(resilience)?;
    let s = checked_scatter(angle_scatter)?;
    let (snug_lo, snug_hi) = snug_preloads(a, snug_torque)?;
    let per_degree = a.thread.pitch.value / (360.0 * delta);
    let (from, factor) = match end {
        WindowEnd::Upper => (snug_hi, 1.0 + s),
        WindowEnd::Lower => (snug_lo, 1.0 - s),
    };
    let gain = preload.value - from;
    if !(gain > 0.0 && gain.is_finite()) {
        return Err(EngineError::invalid(
            "joint.snug_torque",
            format!(
                "the snug torque already gives up to {:.1} kN (minimum friction), at or above \
                 the {:.1} kN the angle window should reach; lower the snug torque",
                snug_hi / 1e3,
                preload.value / 1e3
            ),
        ));
    }
    Ok(Angle::new::<degree>(gain / (per_degree * factor)))
}

/// Angle-controlled tightening by the elastic model: `resilience` is
/// δ_S + δ_P in m/N (shank-aware δ_S from `joint::bolt` and
/// `angle::resilience`), `angle` the target angle from `snug_torque`, and
/// `angle_scatter` the tool's ±s in [0, 0.5). The angle at yield is
/// reported; a window reaching it is the spec's error check, not a refusal.
pub fn angle_controlled(
    a: &Assembly,
    resilience: f64,
    snug_torque: Torque,
    angle: Angle,
    angle_scatter: f64,
) -> Result<AngleControlled, EngineError> {
    let (rp_max, defaulted) = yield_max(a)?;
    let delta = checked_resilience(resilience)?;
    let theta = positive(angle.get::<degree>(), "angle")?;
    let s = checked_scatter(angle_scatter)?;
    let t = a.thread;
    let (th, b) = (a.thread_friction, a.bearing_friction);
    let (snug_lo, snug_hi) = snug_preloads(a, snug_torque)?;
    let per_degree = t.pitch.value / (360.0 * delta);
    let yield_first = yield_preload(t, a.yield_min.value, th.max())?;
    if snug_hi >= yield_first {
        return Err(EngineError::invalid(
            "joint.snug_torque",
            "the snug torque may already bring the bolt to yield at low friction",
        ));
    }
    let at_yield = (yield_first - snug_hi) / per_degree;
    let (lo, hi) = (theta * (1.0 - s), theta * (1.0 + s));
    let (gain_lo, gain_hi) = (lo * per_degree, hi * per_degree);
    let f_min = snug_lo + gain_lo;
    let f_max = snug_hi + gain_hi;
    let dkm = a.mean_bearing_diameter;
    let c_min = torque_per_preload(t, dkm, th.min(), b.min()).value;
    let c_max = torque_per_preload(t, dkm, th.max(), b.max()).value;
    let snug = snug_torque.value;
    Ok(AngleControlled {
        preload: ControlledPreload::new(f_min, f_max, rp_max, defaulted),
        snug_preload_min: Force::new::<newton>(snug_lo),
        snug_preload_max: Force::new::<newton>(snug_hi),
        monitoring_torque_min: Torque::new::<newton_meter>(snug + gain_lo * c_min),
        monitoring_torque_max: Torque::new::<newton_meter>(snug + gain_hi * c_max),
        angle_min: Angle::new::<degree>(lo),
        angle_max: Angle::new::<degree>(hi),
        angle_at_yield: Angle::new::<degree>(at_yield),
    })
}

#[cfg(test)]
mod tests;
