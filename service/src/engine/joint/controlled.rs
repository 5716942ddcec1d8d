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
//!   advancing P per turn); the angle scatters by ±s of the tool. The angle
//!   window may not reach the angle at which the first bolt of the batch
//!   yields (highest snug preload, R_p0.2min, μ_th,max): such an angle is
//!   refused, since beyond it the elastic model no longer holds.

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

/// Angle-controlled tightening by the elastic model: `resilience` is
/// δ_S + δ_P in m/N (shank-aware δ_S from `joint::bolt` and
/// `angle::resilience`), `angle` the target angle from `snug_torque`, and
/// `angle_scatter` the tool's ±s in [0, 0.5). An angle window that reaches
/// the angle at yield is refused naming `angle`.
pub fn angle_controlled(
    a: &Assembly,
    resilience: f64,
    snug_torque: Torque,
    angle: Angle,
    angle_scatter: f64,
) -> Result<AngleControlled, EngineError> {
    let (rp_max, defaulted) = yield_max(a)?;
    let delta = positive(resilience, "joint")?;
    if delta > MAX_RESILIENCE {
        return Err(EngineError::invalid(
            "joint",
            format!("joint resilience {delta:e} m/N is outside the model's range"),
        ));
    }
    let snug = positive(snug_torque.value, "joint.snug_torque")?;
    let theta = positive(angle.get::<degree>(), "angle")?;
    if !(angle_scatter.is_finite() && (0.0..0.5).contains(&angle_scatter)) {
        return Err(EngineError::invalid(
            "angle_scatter",
            format!("angle scatter must be at least 0 and below 0.5 (±50 %), got {angle_scatter}"),
        ));
    }
    let t = a.thread;
    let (th, b) = (a.thread_friction, a.bearing_friction);
    let (dkm, mp) = (a.mean_bearing_diameter, a.prevailing_torque);
    let snug_t = Torque::new::<newton_meter>(snug);
    let snug_lo = preload_at_torque(t, snug_t, dkm, th.max(), b.max(), mp).value;
    let snug_hi = preload_at_torque(t, snug_t, dkm, th.min(), b.min(), mp).value;
    let per_degree = t.pitch.value / (360.0 * delta);
    let yield_first = yield_preload(t, a.yield_min.value, th.max())?;
    if snug_hi >= yield_first {
        return Err(EngineError::invalid(
            "joint.snug_torque",
            "the snug torque may already bring the bolt to yield at low friction",
        ));
    }
    let at_yield = (yield_first - snug_hi) / per_degree;
    let (lo, hi) = (theta * (1.0 - angle_scatter), theta * (1.0 + angle_scatter));
    if hi > at_yield {
        return Err(EngineError::invalid(
            "angle",
            format!(
                "the angle window reaches {hi:.1}°, beyond the {at_yield:.1}° at which the \
                 first bolt may yield (highest snug preload, minimum yield strength, maximum \
                 thread friction); the elastic model does not hold there"
            ),
        ));
    }
    let f_min = snug_lo + lo * per_degree;
    let f_max = snug_hi + hi * per_degree;
    Ok(AngleControlled {
        preload: ControlledPreload::new(f_min, f_max, rp_max, defaulted),
        angle_min: Angle::new::<degree>(lo),
        angle_max: Angle::new::<degree>(hi),
        angle_at_yield: Angle::new::<degree>(at_yield),
    })
}

#[cfg(test)]
mod tests;
