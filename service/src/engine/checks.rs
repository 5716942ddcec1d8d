//! Checks on a computed window: each has a machine-readable code, a severity
//! and a sentence a technician understands.
//!
//! Inputs that depend on catalogue facts (is the finish electroplated? is the
//! joint assembled dry? which friction range was measured?) arrive as plain
//! flags and values; the engine never depends on the catalogue.

use std::f64::consts::PI;

use uom::si::f64::Pressure;

use super::angle::AngleWindow;
use super::bearing::BearingSurface;
use super::grade::Strength;
use super::material::ClampedMaterial;
use super::method::TighteningMethod;
use super::plausible::codes as plausible_codes;
use super::quantity::FrictionRange;
use super::thread::ThreadGeometry;
use super::window::{ClampLoadVerdict, TorqueWindow};

mod held;
mod parts;
pub use held::{
    tool_angle_window, tool_window, ANGLE_WINDOW_UNDER_TWO_STEPS, ANGLE_WINDOW_ZERO_WIDTH,
    WINDOW_UNDER_TWO_STEPS, WINDOW_ZERO_WIDTH,
};
pub use parts::{
    MatingParts, TappedHole, DEFAULT_TAPPED_ENGAGEMENT_PER_D, MATERIAL_OUTSIDE_METHOD,
    NUT_PROOF_LOAD_EXCEEDED, NUT_WEAKER_THAN_BOLT, PERMISSIBLE_TORQUE_EXCEEDED,
    SURFACE_PRESSURE_EXCEEDED, SURFACE_PRESSURE_NOT_CHECKED, THREAD_ENGAGEMENT_TOO_SHORT,
    THREAD_STRIPPING_NOT_CHECKED, WASHER_SURFACE_PRESSURE_EXCEEDED,
};

#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Severity {
    Info,
    Warning,
    Error,
}

/// One finding.
#[derive(Debug, Clone, PartialEq)]
pub struct Check {
    /// Stable code, e.g. `surface_pressure_exceeded`.
    pub code: &'static str,
    pub severity: Severity,
    pub message: String,
}

/// Everything the checks look at.
#[derive(Debug, Clone, Copy)]
pub struct CheckInput<'a> {
    pub thread: &'a ThreadGeometry,
    pub strength: &'a Strength,
    pub bearing: &'a BearingSurface,
    pub window: &'a TorqueWindow,
    pub method: TighteningMethod,
    pub clamp_load: Option<&'a ClampLoadVerdict>,
    /// p_G of the clamped material under head or nut, where tabulated.
    pub permissible_surface_pressure: Option<Pressure>,
    pub tapped_hole: Option<TappedHole>,
    pub thread_friction: FrictionRange,
    pub bearing_friction: FrictionRange,
    /// Range the friction data was measured over, where known.
    pub measured_thread_friction: Option<FrictionRange>,
    pub measured_bearing_friction: Option<FrictionRange>,
    pub electroplated: bool,
    /// Hot-dip galvanized finish (ISO 10684).
    pub hot_dip_galvanized: bool,
    /// Phosphated or otherwise acid-cleaned parts.
    pub acid_cleaned: bool,
    /// Assembled without lubricant.
    pub dry: bool,
    /// Austenitic stainless fastener (ISO 3506 A1–A5 or similar).
    pub stainless: bool,
    /// The torque-angle window, where computed.
    pub angle: Option<&'a AngleWindow>,
    /// The bolt's shank was described (`bolt`), so the angle window and its
    /// yield angle are those of the real bolt, not of a fully threaded one.
    pub bolt_described: bool,
    /// Nut, tapped part, washer and test values.
    pub parts: &'a MatingParts,
    /// A part (clamped or tapped) outside the method, where there is one.
    pub outside_method: Option<&'a ClampedMaterial>,
}

/// Strength from which electroplated fasteners are at risk of hydrogen
/// embrittlement: Rm ≥ 1000 MPa (about 320 HV), ISO 4042 (threshold recalled
/// from memory); covers 10.9, 12.9, SAE J429 Grade 8 and ASTM A574.
const HYDROGEN_RM_MPA: f64 = 1000.0;

/// Code of the check that the angle window reaches the yield angle.
pub const ANGLE_MAY_YIELD: &str = "angle_may_yield_bolt";
/// Code of the error check that the angle window of a described bolt (its
/// shank in the resilience) reaches that bolt's yield angle.
pub const ANGLE_PAST_BOLT_YIELD: &str = "angle_past_bolt_yield";
/// Code of the working-state check on the residual clamp load (joint opening).
pub const RESIDUAL_CLAMP_LOAD: &str = "residual_clamp_load";
/// Code of the working-state check on the safety against yield.
pub const WORKING_YIELD_SAFETY: &str = "working_yield_safety";
/// Code of the working-state check on the safety against fatigue.
pub const FATIGUE_SAFETY: &str = "fatigue_safety";
/// Code of the working-state check on the safety against slip.
pub const SLIP_SAFETY: &str = "slip_safety";
/// Code of the working-state check on the sealing clamp load.
pub const SEALING_CLAMP_LOAD: &str = "sealing_clamp_load";
/// Code of the working-state check on the surface pressure in service.
pub const WORKING_SURFACE_PRESSURE: &str = "working_surface_pressure";
/// Every code a check can have (the names `accept_checks` may use).
pub const CODES: [&str; 33] = [
    SURFACE_PRESSURE_EXCEEDED,
    SURFACE_PRESSURE_NOT_CHECKED,
    WASHER_SURFACE_PRESSURE_EXCEEDED,
    THREAD_ENGAGEMENT_TOO_SHORT,
    THREAD_STRIPPING_NOT_CHECKED,
    NUT_WEAKER_THAN_BOLT,
    NUT_PROOF_LOAD_EXCEEDED,
    MATERIAL_OUTSIDE_METHOD,
    PERMISSIBLE_TORQUE_EXCEEDED,
    plausible_codes::UTILISATION_OUTSIDE_BAND,
    plausible_codes::CLAMP_LENGTH_OUTSIDE_MODEL,
    plausible_codes::PREVAILING_TORQUE_LARGE_SHARE,
    plausible_codes::TOOL_SCATTER_VERY_LARGE,
    "clamp_load_not_reached",
    "friction_outside_measured_range",
    "hydrogen_embrittlement_risk",
    "hot_dip_galvanized_class_not_covered",
    "acid_cleaning_hydrogen_risk",
    "galling_risk_dry_stainless",
    "impact_tool_unsuitable",
    "torque_window_is_monitoring",
    ANGLE_MAY_YIELD,
    ANGLE_PAST_BOLT_YIELD,
    WINDOW_UNDER_TWO_STEPS,
    WINDOW_ZERO_WIDTH,
    ANGLE_WINDOW_UNDER_TWO_STEPS,
    ANGLE_WINDOW_ZERO_WIDTH,
    RESIDUAL_CLAMP_LOAD,
    WORKING_YIELD_SAFETY,
    FATIGUE_SAFETY,
    SLIP_SAFETY,
    SEALING_CLAMP_LOAD,
    WORKING_SURFACE_PRESSURE,
];

/// Property class 12.9 and stronger: Rm,min 1220 MPa for 12.9 (ISO 898-1:2013,
/// Table 3). ISO 10684 covers hot-dip galvanized fasteners up to class 10.9
/// only (scope, recalled from memory); ISO 4042 counts acid cleaning and
/// phosphating of parts this hard among the processes that bring a
/// hydrogen-embrittlement risk (paraphrased, recalled from memory). The
/// threshold lies between 10.9 (1040) and 12.9 (1220) and also takes ASTM
/// A574 (Rm 1240 MPa, 180 ksi).
const CLASS_12_9_RM_MPA: f64 = 1200.0;

/// Run every check; findings in a fixed order.
pub fn run(input: &CheckInput) -> Vec<Check> {
    let mut out = Vec::with_capacity(4);
    parts::surface_pressure(input, &mut out);
    parts::engagement(input, &mut out);
    parts::nut(input, &mut out);
    parts::outside_method(input, &mut out);
    clamp_load(input, &mut out);
    friction_range(input, &mut out);
    hydrogen(input, &mut out);
    coating_process(input, &mut out);
    galling(input, &mut out);
    impact(input, &mut out);
    method_monitoring(input, &mut out);
    angle_yield(input, &mut out);
    out
}

/// Surface pressure p = F_M,max/A_p, A_p = π/4·(d_w² − d_h²) (VDI 2230 Part 1).
pub fn surface_pressure_value(bearing: &BearingSurface, window: &TorqueWindow) -> Pressure {
    let (dw, dh) = (bearing.outer_diameter.value, bearing.inner_diameter.value);
    let ap = PI / 4.0 * (dw * dw - dh * dh);
    Pressure::new::<uom::si::pressure::pascal>(window.preload_max.value / ap)
}

fn clamp_load(i: &CheckInput, out: &mut Vec<Check>) {
    let Some(v) = i.clamp_load else { return };
    if !v.met {
        out.push(Check {
            code: "clamp_load_not_reached",
            severity: Severity::Error,
            message: format!(
                "At the low end of the window (lowest torque, highest friction) the clamp load \
                 is only {:.1} kN{}, below the required clamp load of {:.1} kN. Narrow the \
                 friction range, use a tool with less scatter, or a larger or stronger bolt.",
                v.achieved_min.value / 1e3,
                if v.embedding_loss.value > 0.0 {
                    format!(
                        " after the embedding loss of {:.1} kN (VDI 2230 Part 1)",
                        v.embedding_loss.value / 1e3
                    )
                } else {
                    String::new()
                },
                v.required.value / 1e3
            ),
        });
    }
}

fn friction_range(i: &CheckInput, out: &mut Vec<Check>) {
    let pairs = [
        ("thread", i.thread_friction, i.measured_thread_friction),
        ("bearing", i.bearing_friction, i.measured_bearing_friction),
    ];
    for (what, used, measured) in pairs {
        let Some(m) = measured else { continue };
        if !used.within(&m) {
            out.push(Check {
                code: "friction_outside_measured_range",
                severity: Severity::Warning,
                message: format!(
                    "The {what} friction used ({:.3}–{:.3}) goes outside the range the data was \
                     measured in ({:.3}–{:.3}); the torque outside that range is an \
                     extrapolation. Confirm by a torque-tension test (ISO 16047).",
                    used.min(),
                    used.max(),
                    m.min(),
                    m.max()
                ),
            });
        }
    }
}

fn hydrogen(i: &CheckInput, out: &mut Vec<Check>) {
    if i.electroplated && i.strength.tensile_strength_min.value / 1e6 >= HYDROGEN_RM_MPA {
        out.push(Check {
            code: "hydrogen_embrittlement_risk",
            severity: Severity::Warning,
            message: format!(
                "Electroplated {} fasteners can crack from hydrogen embrittlement, sometimes \
                 days after tightening (ISO 4042). Make sure the supplier baked them or used a \
                 process without hydrogen, e.g. zinc flake.",
                i.strength.id
            ),
        });
    }
}

fn coating_process(i: &CheckInput, out: &mut Vec<Check>) {
    if i.hot_dip_galvanized && i.strength.id == "astm-f3125-a490" {
        out.push(Check {
            code: "hot_dip_galvanized_class_not_covered",
            severity: Severity::Error,
            message: "Hot-dip galvanizing is not for ASTM F3125 Grade A490 bolts: the standard \
                      does not permit a metallic coating applied hot or by electroplating on \
                      this grade because of the risk of hydrogen embrittlement (ASTM F3125, \
                      recalled from memory). Use Grade A325 galvanized, or an A490 bolt with a \
                      coating the standard allows, e.g. zinc flake."
                .into(),
        });
        return;
    }
    if i.strength.tensile_strength_min.value / 1e6 < CLASS_12_9_RM_MPA {
        return;
    }
    if i.hot_dip_galvanized {
        out.push(Check {
            code: "hot_dip_galvanized_class_not_covered",
            severity: Severity::Error,
            message: format!(
                "Hot-dip galvanizing is not for {} fasteners: ISO 10684 covers hot-dip \
                 galvanized fasteners up to property class 10.9 only, because the pickling and \
                 the zinc bath put this strength at risk of cracking. Use class 10.9 or a \
                 coating without acid and heat, e.g. zinc flake.",
                i.strength.id
            ),
        });
    } else if i.acid_cleaned {
        out.push(Check {
            code: "acid_cleaning_hydrogen_risk",
            severity: Severity::Warning,
            message: format!(
                "{} fasteners that were phosphated or otherwise cleaned in acid can take up \
                 hydrogen and crack after tightening; ISO 4042 treats such processes as a \
                 hydrogen-embrittlement risk for parts this hard. Ask the supplier for a \
                 process without acid cleaning, or for baking and an embrittlement test.",
                i.strength.id
            ),
        });
    }
}

fn galling(i: &CheckInput, out: &mut Vec<Check>) {
    if i.stainless && i.dry {
        out.push(Check {
            code: "galling_risk_dry_stainless",
            severity: Severity::Warning,
            message: "Dry stainless threads can gall (seize) while tightening: torque rises \
                      without preload and the bolt may be ruined. Use a lubricant or paste \
                      for stainless and tighten at low speed."
                .into(),
        });
    }
}

fn impact(i: &CheckInput, out: &mut Vec<Check>) {
    if i.method != TighteningMethod::ImpactWrench {
        return;
    }
    let required = i.clamp_load.is_some();
    out.push(Check {
        code: "impact_tool_unsuitable",
        severity: if required {
            Severity::Error
        } else {
            Severity::Warning
        },
        message: "An impact wrench does not control torque or preload; its scatter is very wide. \
                  Where the preload matters, finish with a torque wrench or a controlled \
                  nutrunner."
            .into(),
    });
}

fn method_monitoring(i: &CheckInput, out: &mut Vec<Check>) {
    let info = i.method.info();
    if !info.torque_controlled {
        let how = if i.method == TighteningMethod::TorqueAngle {
            "the preload is set by the angle from snug; the band is the torque the angle window \
             ends at over the friction range"
        } else {
            "the preload is set by yield-point detection; the band is the torque at which the \
             bolts reach yield over the friction and yield-strength ranges"
        };
        out.push(Check {
            code: "torque_window_is_monitoring",
            severity: Severity::Info,
            message: format!(
                "With {} the torque window is a monitoring band, not the setting: {how}. A joint \
                 whose final torque lies outside the band is suspect; confirm the band with the \
                 plant's own process values.",
                info.name
            ),
        });
    }
}

fn angle_yield(i: &CheckInput, out: &mut Vec<Check>) {
    let Some(a) = i.angle else { return };
    // Reaching the yield angle counts (a torque-angle window aimed at ν = 1
    // ends there, to rounding).
    if a.angle_max.value < a.angle_at_yield.value * (1.0 - 1e-9) {
        return;
    }
    let (at_yield, max) = (
        a.angle_at_yield.get::<uom::si::angle::degree>(),
        a.angle_max.get::<uom::si::angle::degree>(),
    );
    if i.bolt_described {
        // The described bolt's own resilience: turning to the window's upper
        // end takes this bolt past its yield force (ν = 1, highest thread
        // friction), so a tool must not be set to it unless accepted.
        out.push(Check {
            code: ANGLE_PAST_BOLT_YIELD,
            severity: Severity::Error,
            message: format!(
                "With the bolt as described (its shank inside the clamp length) the bolt may \
                 yield from {at_yield:.1}° after snug, while the angle window reaches \
                 {max:.1}°. Narrow the friction range, lower the utilisation or keep the angle \
                 below the yield angle."
            ),
        });
        return;
    }
    out.push(Check {
        code: ANGLE_MAY_YIELD,
        severity: Severity::Warning,
        message: format!(
            "At the highest thread friction the bolt may start to yield from {at_yield:.0}° \
             after snug, inside the angle window (up to {max:.0}°). Narrow the friction range \
             or keep the angle below the yield angle."
        ),
    });
}

#[cfg(test)]
mod tests;
