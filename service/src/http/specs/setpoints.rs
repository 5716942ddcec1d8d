//! The compact answer a tool controller needs: target, lower and upper
//! torque in its unit, rounded to its resolution without leaving the window
//! (see [`super::rounding`]), plus the angle window when the method is
//! angle- or yield-controlled, the catalogue revision and the spec hash.
//! It carries every check of the spec (and the checks of the window as the
//! tool holds it) and every caution that applies; while an error check
//! applies it is refused unless the request accepts each one
//! ([`super::checks::gate`]).

use serde::Serialize;
use utoipa::ToSchema;

use crate::engine::angle::AngleOutcome;
use crate::engine::cautions::Caution;
use crate::engine::checks::{tool_angle_window, tool_window};
use crate::engine::spec::Spec;
use crate::http::error::ApiError;
use crate::http::quantity::{Quantity, TorqueUnit};

use super::cautions::Cautions;
use super::checks::{checks_out, error_count, gate, CheckOut};
use super::item_error::{ItemError, ItemErrors};
use super::resolve::Resolved;
use super::rounding::{round_window, RoundingError};

/// Default torque resolution of a tool, in its torque unit.
pub const DEFAULT_RESOLUTION: f64 = 0.1;
/// Default angle resolution of a tool, in degrees.
pub const DEFAULT_ANGLE_RESOLUTION: f64 = 1.0;

/// The angle window to program, from snug torque.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct SetpointAngle {
    /// Snug torque, rounded to the torque resolution.
    pub snug_torque: Quantity,
    /// Smallest angle from snug (rounded up).
    pub min: Quantity,
    /// Largest angle from snug (rounded down).
    pub max: Quantity,
    /// Angle resolution used, in degrees.
    pub resolution: f64,
}

/// Tool setpoints for one spec.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct SetpointResponse {
    /// Normalised thread designation.
    pub thread: String,
    pub property_class: String,
    /// Tightening method id.
    pub tightening_method: &'static str,
    /// `N·m`, `lbf·ft` or `lbf·in`.
    pub torque_unit: &'static str,
    /// Torque resolution used, in `torque_unit`.
    pub resolution: f64,
    /// Target torque: nearest step, kept inside `[lower, upper]`.
    pub target: Quantity,
    /// Lower torque limit, rounded up.
    pub lower: Quantity,
    /// Upper torque limit, rounded down.
    pub upper: Quantity,
    /// Present when the method is angle- or yield-controlled.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub angle: Option<SetpointAngle>,
    pub catalogue_revision: i64,
    /// True when the database is unreachable and the catalogue may be stale.
    pub catalogue_may_be_stale: bool,
    /// SHA-256 (hex) of the normalised request and catalogue revision; the
    /// same as `spec_hash` of the full spec.
    pub spec_hash: String,
    /// Every check of the spec, then the checks of the window at the
    /// tool's resolution (`setpoint_window_under_two_steps`,
    /// `setpoint_window_zero_width`).
    pub checks: Vec<CheckOut>,
    /// True when an error-severity check applies; such an answer is only
    /// given when the request accepted each one (`accepted_checks`).
    pub has_errors: bool,
    /// The error checks that applied and that the request accepted by
    /// naming them in `accept_checks`.
    pub accepted_checks: Vec<&'static str>,
    /// Every caution that applies (the same as the spec's).
    #[schema(value_type = Vec<String>)]
    pub cautions: Cautions,
}

/// How the tool holds the window, and which error checks the request accepts.
#[derive(Debug, Clone, Copy)]
pub struct ToolOptions<'a> {
    pub unit: TorqueUnit,
    /// Torque resolution in `unit`; default [`DEFAULT_RESOLUTION`].
    pub resolution: Option<f64>,
    /// Angle resolution in degrees; default [`DEFAULT_ANGLE_RESOLUTION`].
    pub angle_resolution: Option<f64>,
    /// Error check codes the request accepts.
    pub accept: &'a [&'static str],
}

/// The refusal of a window that cannot be rounded, with the window in the
/// tool's unit to two decimal places more than the resolution has.
fn rounding_problem(field: &str, unit: &str, e: RoundingError) -> ApiError {
    let reason = match e {
        RoundingError::NoStepInside {
            lower,
            upper,
            resolution,
        } => {
            let d = super::rounding::decimals(resolution) as usize + 2;
            format!(
                "the window {lower:.d$}–{upper:.d$} {unit} holds no multiple of the resolution \
                 {resolution} {unit}; use a finer tool resolution"
            )
        }
        other => other.to_string(),
    };
    ItemErrors::from(ItemError::invalid(field, reason)).into()
}

/// The setpoints of a computed spec, or the refusal while an error check
/// applies that `tool.accept` does not name.
pub fn setpoints(
    spec: &Spec,
    resolved: &Resolved,
    tool: ToolOptions,
    stale: bool,
) -> Result<SetpointResponse, ApiError> {
    let unit = tool.unit;
    let res = tool.resolution.unwrap_or(DEFAULT_RESOLUTION);
    let angle_res = tool.angle_resolution.unwrap_or(DEFAULT_ANGLE_RESOLUTION);
    let w = &spec.window;
    let value = |t| Quantity::torque_in(t, unit).value;
    let (lower, upper) = (value(w.lower), value(w.upper));
    let rounded = round_window(lower, value(w.target), upper, res)
        .map_err(|e| rounding_problem("resolution", unit.symbol(), e))?;
    let sym = unit.symbol();
    let held = (rounded.lower, rounded.target, rounded.upper);
    let window_check = tool_window(lower, upper, held, res, sym);
    let q = |v: f64| Quantity::new(v, sym);

    let mut angle_check = None;
    let angle = if spec.method.torque_controlled {
        None
    } else {
        match &spec.angle {
            AngleOutcome::Computed(a) => {
                let lo = a.angle_min.get::<uom::si::angle::degree>();
                let hi = a.angle_max.get::<uom::si::angle::degree>();
                let r = round_window(lo, (lo + hi) / 2.0, hi, angle_res)
                    .map_err(|e| rounding_problem("angle_resolution", "degrees", e))?;
                angle_check = tool_angle_window(lo, hi, (r.lower, r.upper), angle_res);
                let snug = value(a.snug_torque);
                // Nearest step, but never zero: a snug torque is always some torque.
                let steps = (snug / res).round().max(1.0);
                let d = super::rounding::decimals(res) as i32;
                let scale = 10f64.powi(d);
                Some(SetpointAngle {
                    snug_torque: q((steps * res * scale).round() / scale),
                    min: Quantity::new(r.lower, "degrees"),
                    max: Quantity::new(r.upper, "degrees"),
                    resolution: angle_res,
                })
            }
            AngleOutcome::NotComputed { reason } => {
                return Err(ItemErrors::from(ItemError::invalid(
                    "clamp_length",
                    format!(
                        "the {} method is set by angle, but no angle window could be \
                         computed: {reason}",
                        spec.method.id
                    ),
                ))
                .into())
            }
        }
    };
    let checks = checks_out(spec.checks.iter().chain(&window_check).chain(&angle_check));
    let accepted_checks = gate(&checks, tool.accept)?;
    // The elastic-model caution goes with an angle window in the answer.
    let cautions = if angle.is_some() {
        spec.cautions
    } else {
        spec.cautions.without(Caution::ElasticModel)
    };
    Ok(SetpointResponse {
        thread: spec.thread.designation.clone(),
        property_class: spec.strength.id.clone(),
        tightening_method: spec.method.id,
        torque_unit: sym,
        resolution: res,
        target: q(rounded.target),
        lower: q(rounded.lower),
        upper: q(rounded.upper),
        angle,
        catalogue_revision: resolved.revision,
        catalogue_may_be_stale: stale,
        spec_hash: resolved.content_hash.clone(),
        has_errors: error_count(&checks) > 0,
        checks,
        accepted_checks,
        cautions: Cautions::of(cautions),
    })
}
