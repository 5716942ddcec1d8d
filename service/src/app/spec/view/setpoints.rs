//! The setpoint answer as a tool controller reads it.

use serde::Serialize;
use utoipa::ToSchema;

use super::CheckOut;
use crate::app::quantity::Quantity;
use crate::app::spec::cautions::Cautions;

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
    /// What the tool controls: `torque`, `angle` (torque-angle: snug
    /// torque, then the angle window) or `yield_point` (yield-controlled).
    pub controls: &'static str,
    /// `setting`: `target`, `lower` and `upper` are the torques to set;
    /// `monitoring`: they are the band a good joint's final torque lies in
    /// (torque-angle and yield-controlled), not a value to set.
    pub torque_role: &'static str,
    /// `N·m`, `lbf·ft` or `lbf·in`.
    pub torque_unit: &'static str,
    /// Torque resolution used, in `torque_unit`.
    pub resolution: f64,
    /// Target torque: nearest step, kept inside `[lower, upper]` (for a
    /// monitoring band, its middle).
    pub target: Quantity,
    /// Lower torque limit, rounded up.
    pub lower: Quantity,
    /// Upper torque limit, rounded down.
    pub upper: Quantity,
    /// Present when the method is torque-angle: the snug torque to set,
    /// then the angle window from snug.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub angle: Option<SetpointAngle>,
    pub catalogue_revision: i64,
    /// True when the database is unreachable and the catalogue may be stale.
    pub catalogue_may_be_stale: bool,
    /// SHA-256 (hex) of every input that changes this answer: the
    /// normalised request, the catalogue revision, the torque unit, both
    /// resolutions, the accepted checks, the engine method version and the
    /// service version (so it differs from the full spec's `spec_hash`).
    pub spec_hash: String,
    /// The service's version that computed this answer.
    pub service_version: &'static str,
    /// The engine method version that computed this answer.
    pub method_version: &'static str,
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
