//! Computes the compact answer a tool controller needs ([`super::view::SetpointResponse`]): target, lower and upper
//! torque in its unit, rounded to its resolution without leaving the window
//! (see [`super::rounding`]), plus the snug torque and angle window when
//! the method is torque-angle, the catalogue revision and the spec hash.
//! `controls` says what the tool controls (torque, angle, yield point) and
//! `torque_role` whether the torques are the setting or a band to monitor
//! (torque-angle and yield-controlled).
//! It carries every check of the spec (and the checks of the window as the
//! tool holds it) and every caution that applies; while an error check
//! applies it is refused unless the request accepts each one
//! ([`super::checks::gate`]).

use crate::app::quantity::Quantity;
use crate::app::{AppError, FieldProblem};
use crate::engine::angle::AngleOutcome;
use crate::engine::cautions::Caution;
use crate::engine::checks::{tool_angle_window, tool_window};
use crate::engine::method::TighteningMethod;
use crate::engine::spec::Spec;

use super::cautions::Cautions;
use super::checks::gate;
use super::resolve::Resolved;
use super::rounding::{round_window, RoundingError};
use super::tool::ToolAsk;
use super::view::{checks_out, error_count, SetpointAngle, SetpointResponse};

/// Default torque resolution of a tool, in its torque unit.
pub const DEFAULT_RESOLUTION: f64 = 0.1;
/// Default angle resolution of a tool, in degrees.
pub const DEFAULT_ANGLE_RESOLUTION: f64 = 1.0;

/// The refusal of a window that cannot be rounded, with the window in the
/// tool's unit to two decimal places more than the resolution has.
fn rounding_problem(field: &str, unit: &str, e: RoundingError) -> FieldProblem {
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
    FieldProblem::invalid(field, reason)
}

/// The setpoints of a computed spec, or the refusal while an error check
/// applies that `tool.accept` does not name.
pub fn setpoints(
    spec: &Spec,
    resolved: &Resolved,
    tool: &ToolAsk,
    stale: bool,
) -> Result<SetpointResponse, AppError> {
    let unit = tool.unit;
    let res = tool.resolution.unwrap_or(DEFAULT_RESOLUTION);
    let angle_res = tool.angle_resolution.unwrap_or(DEFAULT_ANGLE_RESOLUTION);
    let w = &spec.window;
    let value = |t| Quantity::torque_in(t, unit).value;
    let (lower, upper) = (value(w.lower), value(w.upper));
    let rounded = round_window(lower, value(w.target), upper, res)
        .map_err(|e| AppError::field(rounding_problem("resolution", unit.symbol(), e)))?;
    let sym = unit.symbol();
    let held = (rounded.lower, rounded.target, rounded.upper);
    let window_check = tool_window(lower, upper, held, res, sym);
    let q = |v: f64| Quantity::new(v, sym);

    let mut angle_check = None;
    let angle_set = spec.method.method == TighteningMethod::TorqueAngle;
    let angle = if !angle_set {
        None
    } else {
        match &spec.angle {
            AngleOutcome::Computed(a) => {
                let lo = a.angle_min.get::<uom::si::angle::degree>();
                let hi = a.angle_max.get::<uom::si::angle::degree>();
                let r = round_window(lo, (lo + hi) / 2.0, hi, angle_res).map_err(|e| {
                    AppError::field(rounding_problem("angle_resolution", "degrees", e))
                })?;
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
                return Err(AppError::field(FieldProblem::invalid(
                    "clamp_length",
                    format!(
                        "the {} method is set by angle, but no angle window could be \
                         computed: {reason}",
                        spec.method.id
                    ),
                )))
            }
        }
    };
    let found: Vec<_> = spec
        .checks
        .iter()
        .chain(&window_check)
        .chain(&angle_check)
        .cloned()
        .collect();
    let accepted_checks = gate(&found, &tool.accept)?;
    // The angle resolution changes the answer only where there is an angle window.
    let angle_step = angle
        .as_ref()
        .map(|a| a.resolution.to_string())
        .unwrap_or_default();
    let presentation = format!(
        "setpoints|torque_unit={sym}|resolution={res}|angle_resolution={angle_step}|accepted={}",
        accepted_checks.join(",")
    );
    let checks = checks_out(&found);
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
        controls: match spec.method.method {
            TighteningMethod::TorqueAngle => "angle",
            TighteningMethod::YieldControlled => "yield_point",
            _ => "torque",
        },
        torque_role: if spec.method.torque_controlled {
            "setting"
        } else {
            "monitoring"
        },
        torque_unit: sym,
        resolution: res,
        target: q(rounded.target),
        lower: q(rounded.lower),
        upper: q(rounded.upper),
        angle,
        catalogue_revision: resolved.revision,
        catalogue_may_be_stale: stale,
        spec_hash: super::answer_hash(&resolved.content_hash, &presentation),
        service_version: super::SERVICE_VERSION,
        method_version: super::METHOD_VERSION,
        has_errors: error_count(&checks) > 0,
        checks,
        accepted_checks,
        cautions: Cautions::of(cautions),
    })
}
