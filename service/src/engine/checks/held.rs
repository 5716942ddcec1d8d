//! Checks of a window as the tool holds it, after rounding to the tool's
//! resolution: the torque window in the tool's unit, and the angle window
//! in degrees. Fewer than two steps in a window is a warning (the tool can
//! hardly tell a good joint from a bad one); a window that rounds to one
//! value has no tolerance left at all (an error). Both rules are common
//! practice.

use super::{Check, Severity};

/// Code of the warning that a tool's window holds fewer than two steps.
pub const WINDOW_UNDER_TWO_STEPS: &str = "setpoint_window_under_two_steps";
/// Code of the error that rounding left lower = target = upper.
pub const WINDOW_ZERO_WIDTH: &str = "setpoint_window_zero_width";

/// Code of the warning that an angle window holds fewer than two steps.
pub const ANGLE_WINDOW_UNDER_TWO_STEPS: &str = "setpoint_angle_window_under_two_steps";
/// Code of the error that rounding left the angle window's min = max.
pub const ANGLE_WINDOW_ZERO_WIDTH: &str = "setpoint_angle_window_zero_width";

/// Checks of a torque window as a tool holds it, in the tool's unit: the
/// window before rounding (`lower`, `upper`) and after (`rounded`), and the
/// tool's resolution. Fewer than two steps fit in a window narrower than
/// two steps (a warning: the tool can hardly tell a good joint from a bad
/// one); a window that rounds to one value has no tolerance left at all
/// (an error). Both rules are common practice.
pub fn tool_window(
    lower: f64,
    upper: f64,
    rounded: (f64, f64, f64),
    resolution: f64,
    unit: &str,
) -> Option<Check> {
    let (lo, target, up) = rounded;
    if lo == target && target == up {
        return Some(Check {
            code: WINDOW_ZERO_WIDTH,
            severity: Severity::Error,
            message: format!(
                "At a resolution of {resolution} {unit} the window {lower:.3}–{upper:.3} {unit} \
                 rounds to the single value {target} {unit}: lower, target and upper are the \
                 same, so the tool has no tolerance to accept or reject a joint. Use a tool \
                 with a finer resolution or a method with less scatter."
            ),
        });
    }
    if upper - lower < 2.0 * resolution {
        return Some(Check {
            code: WINDOW_UNDER_TWO_STEPS,
            severity: Severity::Warning,
            message: format!(
                "The window {lower:.3}–{upper:.3} {unit} is narrower than two steps of the \
                 tool's resolution ({resolution} {unit}): the tool can barely tell a joint \
                 inside the window from one outside. A finer resolution is advisable."
            ),
        });
    }
    None
}

/// The same checks for an angle window in degrees: `rounded` is the
/// (min, max) the tool holds.
pub fn tool_angle_window(
    lower: f64,
    upper: f64,
    rounded: (f64, f64),
    resolution: f64,
) -> Option<Check> {
    let (lo, up) = rounded;
    if lo == up {
        return Some(Check {
            code: ANGLE_WINDOW_ZERO_WIDTH,
            severity: Severity::Error,
            message: format!(
                "At an angle resolution of {resolution}° the angle window {lower:.2}–{upper:.2}° \
                 rounds to the single value {lo}°: the tool has no tolerance to accept or reject \
                 a joint. Use a tool with a finer angle resolution."
            ),
        });
    }
    if upper - lower < 2.0 * resolution {
        return Some(Check {
            code: ANGLE_WINDOW_UNDER_TWO_STEPS,
            severity: Severity::Warning,
            message: format!(
                "The angle window {lower:.2}–{upper:.2}° is narrower than two steps of the \
                 tool's angle resolution ({resolution}°): the tool can barely tell a joint \
                 inside the window from one outside. A finer angle resolution is advisable."
            ),
        });
    }
    None
}
