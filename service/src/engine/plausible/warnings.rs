//! Plausibility warnings: inputs inside the refused ranges but outside the
//! band where the model or common practice vouches for them. Each is a
//! check with a code and a sentence; the bands are stated here.

use uom::si::length::millimeter;

use super::super::checks::{Check, Severity};
use super::super::method::TighteningMethod;
use super::super::spec::SpecInput;
use super::super::window::TorqueWindow;

/// Check codes of the plausibility warnings.
pub mod codes {
    /// ν outside [`super::UTILISATION_BAND`].
    pub const UTILISATION_OUTSIDE_BAND: &str = "utilisation_outside_band";
    /// l_K/d outside [`super::CLAMP_LENGTH_MODEL_PER_D`].
    pub const CLAMP_LENGTH_OUTSIDE_MODEL: &str = "clamp_length_outside_model";
    /// Prevailing torque above [`super::PREVAILING_SHARE_MAX`] of the upper torque.
    pub const PREVAILING_TORQUE_LARGE_SHARE: &str = "prevailing_torque_large_share";
    /// Tool scatter above [`super::SCATTER_WARN_ABOVE`].
    pub const TOOL_SCATTER_VERY_LARGE: &str = "tool_scatter_very_large";
}

/// Utilisation band without a warning: 0.5 to 0.95. VDI 2230 Part 1 uses
/// ν = 0.9 (Table A1 basis); below 0.5 the bolt is barely used and the
/// clamp load is lost to embedding sooner, above 0.95 the scatter of Rp
/// leaves no margin before yield (common practice).
pub const UTILISATION_BAND: (f64, f64) = (0.5, 0.95);
/// Utilisation below this is refused (422): a tenth of the yield strength
/// is no tightening specification (common practice).
pub const UTILISATION_MIN: f64 = 0.1;
/// Clamp length band l_K/d of the resilience model: 1 to 10. Below 1·d the
/// head, nut and embedding dominate the joint's resilience and the
/// deformation-cone model of VDI 2230 Part 1 §5.1.2 is outside the
/// proportions it was fitted on; above 10·d bending and buckling of the
/// long bolt are not in the model (band: common practice).
pub const CLAMP_LENGTH_MODEL_PER_D: (f64, f64) = (1.0, 10.0);
/// Prevailing torque share of the upper torque above which a warning is
/// given: 30 %. The prevailing torque scatters from joint to joint, and
/// with a larger share the preload the torque gives is no longer known
/// (common practice; ISO 2320 prevailing torques are a few tenths of the
/// tightening torque at most, recalled from memory).
pub const PREVAILING_SHARE_MAX: f64 = 0.3;
/// Tool scatter ±s above 0.25: the window spans more than 50 % of its
/// target (common practice). The impact wrench has its own check.
pub const SCATTER_WARN_ABOVE: f64 = 0.25;

fn warning(code: &'static str, message: String) -> Check {
    Check {
        code,
        severity: Severity::Warning,
        message,
    }
}

/// The plausibility warnings of a computed window.
pub fn warnings(input: &SpecInput, window: &TorqueWindow, scatter: f64) -> Vec<Check> {
    let mut out = Vec::new();
    if let Some(nu) = input.utilisation {
        let (lo, hi) = UTILISATION_BAND;
        if !(lo..=hi).contains(&nu) {
            out.push(warning(
                codes::UTILISATION_OUTSIDE_BAND,
                format!(
                    "The utilisation ν = {nu} is outside the usual band {lo}–{hi} (VDI 2230 \
                     Part 1 uses 0.9): {}",
                    if nu < lo {
                        "the bolt is barely used and loses its clamp load to embedding and \
                         settling sooner"
                    } else {
                        "the scatter of the yield strength leaves no margin, some bolts will \
                         yield"
                    }
                ),
            ));
        }
    }
    let d = input.thread.nominal_diameter.get::<millimeter>();
    if let Some(lk) = input.joint.as_ref().and_then(|j| j.clamp_length) {
        let ratio = lk.get::<millimeter>() / d;
        let (lo, hi) = CLAMP_LENGTH_MODEL_PER_D;
        if ratio.is_finite() && !(lo..=hi).contains(&ratio) {
            out.push(warning(
                codes::CLAMP_LENGTH_OUTSIDE_MODEL,
                format!(
                    "The clamp length is {ratio:.2}·d, outside {lo}·d to {hi}·d where the \
                     joint's resilience model is used with confidence: the angle window and \
                     the load factor are estimates to be confirmed by a joint test."
                ),
            ));
        }
    }
    if let Some(mp) = input.prevailing_torque {
        let share = mp.value / window.upper.value;
        if share.is_finite() && share > PREVAILING_SHARE_MAX {
            out.push(warning(
                codes::PREVAILING_TORQUE_LARGE_SHARE,
                format!(
                    "The prevailing torque is {:.0} % of the upper torque (more than {:.0} %): \
                     it scatters from joint to joint, so the preload the torque gives is \
                     uncertain. Measure it on each joint and add it, or tighten by angle.",
                    share * 100.0,
                    PREVAILING_SHARE_MAX * 100.0
                ),
            ));
        }
    }
    if scatter > SCATTER_WARN_ABOVE && input.method != TighteningMethod::ImpactWrench {
        out.push(warning(
            codes::TOOL_SCATTER_VERY_LARGE,
            format!(
                "The tool scatter ±{:.0} % makes the window span more than 50 % of its target: \
                 the lowest preload is far below the highest. Use a more precise tool or \
                 method.",
                scatter * 100.0
            ),
        ));
    }
    out
}
