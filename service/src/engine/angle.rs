//! Torque-angle: joint resilience by the VDI 2230 Part 1 model and the angle
//! from snug torque to the preload window.
//!
//! All resilience formulas here are VDI 2230 Part 1:2003 §5.1 as recalled
//! from memory (no published reproduction was found); they are the elastic
//! model only. Angle-controlled tightening often ends in the plastic range,
//! where this estimate no longer holds.
//!
//! Bolt resilience δ_S = δ_SK + Σδ_i + δ_Gew + δ_G + δ_M:
//! - head δ_SK = l_SK/(E_S·A_N), l_SK = 0.5·d (hexagon head), 0.4·d (socket head);
//! - shank sections δ_i = l_i/(E_S·A_i);
//! - free loaded thread δ_Gew = l_Gew/(E_S·A_d3), l_Gew = l_K − Σl_i;
//! - engaged thread δ_G = 0.5·d/(E_S·A_d3);
//! - nut or tapped-hole zone δ_M = l_M/(E_M·A_N), l_M = 0.4·d (nut), 0.33·d (tapped hole).
//!
//! Clamped parts δ_P by the deformation cone, through-bolted (DSV, w = 1)
//! tan φ = 0.362 + 0.032·ln(β_L/2) + 0.153·ln y, tapped (ESV, w = 2)
//! tan φ = 0.348 + 0.013·ln β_L + 0.193·ln y, β_L = l_K/d_W, y = D_A/d_W;
//! full cone when D_A ≥ D_A,Gr = d_W + w·l_K·tan φ, cone plus sleeve between
//! d_W and D_A,Gr, plain sleeve δ_P = 4·l_K/(E_P·π·(D_A² − d_h²)) when D_A ≤ d_W.
//!
//! Angle from snug: θ = 360°·ΔF·(δ_S + δ_P)/P (the nut advances P per turn).

use std::str::FromStr;

use uom::si::angle::degree;
use uom::si::f64::{Angle, Force, Length, Pressure, Torque};
use uom::si::pressure::megapascal;
use uom::si::torque::newton_meter;

use super::bearing::BearingSurface;
use super::quantity::{positive, Utilisation};
use super::tightening::{permissible_preload, preload_at_torque};
use super::window::{TorqueWindow, WindowInput};
use super::EngineError;

/// Elastic modulus of a steel bolt, E_S = 205 000 N/mm² (the usual VDI 2230
/// value, recalled from memory).
pub fn steel_bolt_modulus() -> Pressure {
    Pressure::new::<megapascal>(205_000.0)
}

/// Default snug torque as a fraction of the target torque: common practice
/// (about 30 %); give the plant's own snug torque where it has one.
pub const DEFAULT_SNUG_FRACTION: f64 = 0.3;

/// How the bolt is held at the far end.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum JointType {
    /// Bolt and nut (VDI "DSV").
    ThroughBolted,
    /// Screw in a tapped hole (VDI "ESV").
    TappedHole,
}

impl JointType {
    pub fn id(self) -> &'static str {
        match self {
            Self::ThroughBolted => "through-bolted",
            Self::TappedHole => "tapped-hole",
        }
    }
}

impl FromStr for JointType {
    type Err = EngineError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        match s
            .trim()
            .to_ascii_lowercase()
            .replace(['_', ' '], "-")
            .as_str()
        {
            "through-bolted" | "nut" | "dsv" => Ok(Self::ThroughBolted),
            "tapped-hole" | "tapped" | "esv" => Ok(Self::TappedHole),
            _ => Err(EngineError::Unknown {
                field: "joint.type".into(),
                kind: "joint type",
                given: s.chars().take(60).collect(),
                suggestions: vec!["through-bolted".into(), "tapped-hole".into()],
            }),
        }
    }
}

/// A plain shank or reduced-shank section of the bolt inside the clamp length.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ShankSection {
    pub length: Length,
    pub diameter: Length,
}

/// The joint around the bolt, as the request gives it.
#[derive(Debug, Clone, PartialEq)]
pub struct JointInput {
    /// Clamp length l_K; without it the angle is not computed.
    pub clamp_length: Option<Length>,
    pub joint_type: JointType,
    /// E_P of the clamped parts; `spec` fills it from the clamped material
    /// when not given. Without it the angle is not computed.
    pub clamped_modulus: Option<Pressure>,
    /// E_M of the nut or tapped part; default: steel for a nut, the clamped
    /// material for a tapped hole.
    pub nut_modulus: Option<Pressure>,
    /// E_S of the bolt; default [`steel_bolt_modulus`].
    pub bolt_modulus: Option<Pressure>,
    /// Outer diameter of the clamped parts D_A.
    pub outer_diameter: Option<Length>,
    /// Socket head cap screw (l_SK = 0.4·d) rather than a hexagon head (0.5·d).
    pub socket_head: bool,
    pub shank_sections: Vec<ShankSection>,
    /// Snug torque; default [`DEFAULT_SNUG_FRACTION`] of the target torque.
    pub snug_torque: Option<Torque>,
}

/// Where the snug torque came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SnugSource {
    Given,
    /// Common practice default fraction of the target torque.
    DefaultFraction,
}

/// The angle window from snug torque.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AngleWindow {
    pub snug_torque: Torque,
    pub snug_source: SnugSource,
    /// Preload at snug torque, at maximum and minimum friction.
    pub snug_preload_min: Force,
    pub snug_preload_max: Force,
    /// Smallest angle that reaches preload min even from the lowest snug preload.
    pub angle_min: Angle,
    /// Largest angle that stays below preload max even from the highest snug preload.
    pub angle_max: Angle,
    /// Angle from snug at which the bolt may first reach yield (ν = 1 at maximum
    /// thread friction, highest snug preload): a limit, never a target.
    pub angle_at_yield: Angle,
    pub resilience: Resilience,
}

/// The angle result, or why it was not computed.
#[derive(Debug, Clone, PartialEq)]
pub enum AngleOutcome {
    Computed(AngleWindow),
    NotComputed { reason: String },
}

fn degrees(v: f64) -> Angle {
    Angle::new::<degree>(v)
}

/// Angle window from snug to the preload window of `window`.
pub fn angle_window(
    input: &WindowInput,
    bearing: &BearingSurface,
    joint: &JointInput,
    window: &TorqueWindow,
) -> Result<AngleOutcome, EngineError> {
    let Some(lk) = joint.clamp_length else {
        return Ok(AngleOutcome::NotComputed {
            reason: "no clamp length given: the angle depends on the joint's resilience and \
                     is never guessed"
                .into(),
        });
    };
    let Some(da) = joint.outer_diameter else {
        return Ok(AngleOutcome::NotComputed {
            reason: "no outer diameter of the clamped parts (joint.outer_diameter) given: the \
                     clamped-part resilience cannot be computed"
                .into(),
        });
    };
    if joint.clamped_modulus.is_none() {
        return Ok(AngleOutcome::NotComputed {
            reason: "no clamped material (or its elastic modulus) given: the clamped-part \
                     resilience cannot be computed"
                .into(),
        });
    }
    let thread = input.thread;
    let res = resilience(thread, bearing, joint, lk, da)?;
    let (snug, snug_source) = match joint.snug_torque {
        Some(t) => {
            let v = positive(t.value, "joint.snug_torque")?;
            if v >= window.lower.value {
                return Err(EngineError::invalid(
                    "joint.snug_torque",
                    format!(
                        "snug torque {v:.2} N·m must be below the lower torque of the window \
                         ({:.2} N·m)",
                        window.lower.value
                    ),
                ));
            }
            (t, SnugSource::Given)
        }
        None => (
            Torque::new::<newton_meter>(DEFAULT_SNUG_FRACTION * window.target.value),
            SnugSource::DefaultFraction,
        ),
    };
    let (th, b, dkm, mp) = (
        input.thread_friction,
        input.bearing_friction,
        input.mean_bearing_diameter,
        input.prevailing_torque,
    );
    let snug_lo = preload_at_torque(thread, snug, dkm, th.max(), b.max(), mp);
    let snug_hi = preload_at_torque(thread, snug, dkm, th.min(), b.min(), mp);
    let per_newton = 360.0 * (res.bolt + res.clamped_parts) / thread.pitch.value;
    let angle_min = (window.preload_min.value - snug_lo.value) * per_newton;
    let angle_max = (window.preload_max.value - snug_hi.value) * per_newton;
    let full_yield = Utilisation::new(1.0, "utilisation")?;
    let yield_force = permissible_preload(thread, input.yield_strength, full_yield, th.max());
    let angle_at_yield = (yield_force.value - snug_hi.value) * per_newton;
    // Equal ends are a valid (single-angle) window: single friction values, no scatter.
    if !(angle_max >= angle_min * (1.0 - 1e-12) && angle_min > 0.0) {
        return Ok(AngleOutcome::NotComputed {
            reason: format!(
                "the snug preload scatters from {:.1} to {:.1} kN with the friction range, which \
                 leaves no angle that keeps the preload between {:.1} and {:.1} kN; lower the \
                 snug torque or narrow the friction range",
                snug_lo.value / 1e3,
                snug_hi.value / 1e3,
                window.preload_min.value / 1e3,
                window.preload_max.value / 1e3
            ),
        });
    }
    Ok(AngleOutcome::Computed(AngleWindow {
        snug_torque: snug,
        snug_source,
        snug_preload_min: snug_lo,
        snug_preload_max: snug_hi,
        angle_min: degrees(angle_min),
        angle_max: degrees(angle_max),
        angle_at_yield: degrees(angle_at_yield),
        resilience: res,
    }))
}

mod resilience;
pub use resilience::{deformation_cone, resilience, Resilience};

#[cfg(test)]
mod tests;
