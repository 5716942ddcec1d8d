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

use std::f64::consts::PI;
use std::str::FromStr;

use uom::si::angle::degree;
use uom::si::f64::{Angle, Force, Length, Pressure, Torque};
use uom::si::pressure::megapascal;
use uom::si::torque::newton_meter;

use super::bearing::BearingSurface;
use super::quantity::{positive, Utilisation};
use super::thread::ThreadGeometry;
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

/// The resilience figures, in m/N.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Resilience {
    pub head: f64,
    pub shank_sections: f64,
    pub free_thread: f64,
    pub engaged_thread: f64,
    pub nut_or_tapped_hole: f64,
    /// δ_S, the sum of the above.
    pub bolt: f64,
    /// δ_P of the clamped parts.
    pub clamped_parts: f64,
    /// tan φ of the deformation cone.
    pub cone_tan: f64,
    /// D_A,Gr, the diameter at which the cone is fully developed.
    pub cone_limit_diameter: Length,
    /// Φ_K = δ_P/(δ_S + δ_P), load factor for load introduced under the head.
    pub load_factor: f64,
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

fn area(d: f64) -> f64 {
    PI / 4.0 * d * d
}

fn field_positive(v: f64, field: &str) -> Result<f64, EngineError> {
    positive(v, field)
}

/// Bolt and clamped-part resilience; validates the joint input.
pub fn resilience(
    thread: &ThreadGeometry,
    bearing: &BearingSurface,
    joint: &JointInput,
    clamp_length: Length,
    outer_diameter: Length,
) -> Result<Resilience, EngineError> {
    let d = thread.nominal_diameter.value;
    let d3 = thread.minor_diameter.value;
    let lk = field_positive(clamp_length.value, "joint.clamp_length")?;
    let da = field_positive(outer_diameter.value, "joint.outer_diameter")?;
    let es = field_positive(
        joint.bolt_modulus.unwrap_or_else(steel_bolt_modulus).value,
        "joint.bolt_modulus",
    )?;
    let ep = joint
        .clamped_modulus
        .ok_or_else(|| EngineError::invalid("clamped_material", "no elastic modulus given"))?;
    let ep = field_positive(ep.value, "clamped_material")?;
    let em = match (joint.nut_modulus, joint.joint_type) {
        (Some(e), _) => e.value,
        (None, JointType::ThroughBolted) => steel_bolt_modulus().value,
        (None, JointType::TappedHole) => ep,
    };
    let em = field_positive(em, "joint.nut_modulus")?;
    let (dw, dh) = (bearing.outer_diameter.value, bearing.inner_diameter.value);
    if !(dw > dh && dh > 0.0) {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            "the bearing outer diameter must exceed the hole diameter",
        ));
    }
    let engaged = 0.5 * d;
    if lk < engaged {
        return Err(EngineError::invalid(
            "joint.clamp_length",
            format!(
                "clamp length {:.2} mm is shorter than the engaged thread length the VDI 2230 \
                 model uses (0.5·d = {:.2} mm); the resilience model does not apply",
                lk * 1e3,
                engaged * 1e3
            ),
        ));
    }
    if da <= dh {
        return Err(EngineError::invalid(
            "joint.outer_diameter",
            format!(
                "outer diameter of the clamped parts {:.2} mm must exceed the hole {:.2} mm",
                da * 1e3,
                dh * 1e3
            ),
        ));
    }
    let (mut shank_len, mut shank) = (0.0, 0.0);
    for (i, s) in joint.shank_sections.iter().enumerate() {
        let l = field_positive(s.length.value, &format!("joint.shank_sections[{i}].length"))?;
        let ds = field_positive(
            s.diameter.value,
            &format!("joint.shank_sections[{i}].diameter"),
        )?;
        if ds > d * (1.0 + 1e-9) {
            return Err(EngineError::invalid(
                format!("joint.shank_sections[{i}].diameter"),
                "a shank section cannot be thicker than the nominal diameter",
            ));
        }
        shank_len += l;
        shank += l / (es * area(ds));
    }
    if shank_len > lk * (1.0 + 1e-9) {
        return Err(EngineError::invalid(
            "joint.shank_sections",
            format!(
                "shank sections total {:.2} mm, longer than the clamp length {:.2} mm",
                shank_len * 1e3,
                lk * 1e3
            ),
        ));
    }
    let (an, ad3) = (area(d), area(d3));
    let head = if joint.socket_head { 0.4 } else { 0.5 } * d / (es * an);
    let free_thread = (lk - shank_len).max(0.0) / (es * ad3);
    let engaged_thread = engaged / (es * ad3);
    let lm = match joint.joint_type {
        JointType::ThroughBolted => 0.4 * d,
        JointType::TappedHole => 0.33 * d,
    };
    let nut = lm / (em * an);
    let bolt = head + shank + free_thread + engaged_thread + nut;

    let (w, tan_phi) = cone(joint.joint_type, lk, dw, da);
    if !(tan_phi.is_finite() && tan_phi > 0.0) {
        return Err(EngineError::invalid(
            "joint.clamp_length",
            "the deformation cone model gives no valid cone for this clamp length and \
             outer diameter",
        ));
    }
    let da_gr = dw + w * lk * tan_phi;
    let clamped = if da <= dw {
        4.0 * lk / (ep * PI * (da * da - dh * dh))
    } else if da >= da_gr {
        let num = (dw + dh) * (dw + w * lk * tan_phi - dh);
        let den = (dw - dh) * (dw + w * lk * tan_phi + dh);
        2.0 * (num / den).ln() / (w * ep * PI * dh * tan_phi)
    } else {
        let cone_part =
            2.0 / (w * dh * tan_phi) * (((dw + dh) * (da - dh)) / ((dw - dh) * (da + dh))).ln();
        let sleeve = 4.0 / (da * da - dh * dh) * (lk - (da - dw) / (w * tan_phi));
        (cone_part + sleeve) / (ep * PI)
    };
    Ok(Resilience {
        head,
        shank_sections: shank,
        free_thread,
        engaged_thread,
        nut_or_tapped_hole: nut,
        bolt,
        clamped_parts: clamped,
        cone_tan: tan_phi,
        cone_limit_diameter: Length::new::<uom::si::length::meter>(da_gr),
        load_factor: clamped / (bolt + clamped),
    })
}

/// (w, tan φ) of the deformation cone, VDI 2230 Part 1 (recalled from memory).
fn cone(joint: JointType, lk: f64, dw: f64, da: f64) -> (f64, f64) {
    let beta = lk / dw;
    let y = (da / dw).max(1.0);
    match joint {
        JointType::ThroughBolted => (1.0, 0.362 + 0.032 * (beta / 2.0).ln() + 0.153 * y.ln()),
        JointType::TappedHole => (2.0, 0.348 + 0.013 * beta.ln() + 0.193 * y.ln()),
    }
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

#[cfg(test)]
mod tests;
