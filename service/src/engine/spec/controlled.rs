//! The window of a method that does not control torque: yield-controlled
//! and torque-angle tightening take their preload range, α_A and torque
//! monitoring band from `joint::controlled` (VDI 2230 Part 1 yield-point
//! and elastic angle models), not from a torque window with a tool scatter.
//!
//! - Yield-controlled: F_M,min at R_p0.2min and μ_th,max, F_M,max at
//!   R_p0.2max and μ_th,min; the torque band is the torque at which yield
//!   is reached over the friction and yield ranges. No joint is needed and
//!   no angle window is given (the bolt is taken into yield, where the
//!   elastic angle model does not hold). The minimum-clamp-load mode does
//!   not apply.
//! - Torque-angle: snug torque, then an angle window θ·(1 ± s) whose upper
//!   end brings the highest snug preload (minimum friction) to F_M,zul at ν
//!   and maximum thread friction, so that with ν ≤ 1 the window never passes
//!   the angle at which the first bolt yields (ν = 1, μ_th,max, highest snug
//!   preload). In the minimum-clamp-load mode the lower end brings the
//!   lowest snug preload to the required clamp load instead. The joint's
//!   resilience (shank-aware δ_S, δ_P) is required; it is never guessed.

use uom::si::f64::{Force, Torque};
use uom::si::torque::newton_meter;

use super::{SpecInput, WindowMode};
use crate::engine::angle::{
    resilience, AngleOutcome, AngleWindow, JointInput, SnugSource, DEFAULT_SNUG_FRACTION,
};
use crate::engine::bearing::BearingSurface;
use crate::engine::joint::controlled::{
    angle_controlled, angle_to_reach, yield_controlled, Assembly, ControlledPreload, WindowEnd,
};
use crate::engine::method::TighteningMethod;
use crate::engine::quantity::positive;
use crate::engine::tightening::permissible_preload;
use crate::engine::window::{Governing, TorqueWindow, WindowInput};
use crate::engine::EngineError;

/// The window, angle and preload model of a yield- or angle-controlled spec.
pub(super) struct Controlled {
    pub window: TorqueWindow,
    pub angle: AngleOutcome,
    pub preload: ControlledPreload,
}

fn assembly<'a>(w: &WindowInput<'a>) -> Assembly<'a> {
    Assembly {
        thread: w.thread,
        yield_min: w.yield_strength,
        yield_max: None,
        thread_friction: w.thread_friction,
        bearing_friction: w.bearing_friction,
        mean_bearing_diameter: w.mean_bearing_diameter,
        prevailing_torque: w.prevailing_torque,
    }
}

/// A monitoring band as the window the rest of the spec reads: lower and
/// upper the band, target its middle, upper limit the band's upper end.
fn band(
    lo: Torque,
    hi: Torque,
    p: &ControlledPreload,
    permissible: Force,
    governing: Governing,
) -> TorqueWindow {
    TorqueWindow {
        lower: lo,
        target: Torque::new::<newton_meter>(0.5 * (lo.value + hi.value)),
        upper: hi,
        preload_min: p.preload_min,
        preload_max: p.preload_max,
        permissible_preload: permissible,
        upper_limit: hi,
        tightening_factor: p.tightening_factor,
        governing,
    }
}

/// `None` for torque-controlled methods; otherwise the controlled window.
/// `base` is the forward torque window (its F_M,zul and yield-limited
/// torque M_A,zul set the default snug torque). `embedding_loss` F_Z is
/// added to a required clamp load the window must reach.
pub(super) fn controlled(
    input: &SpecInput,
    w: &WindowInput,
    base: &TorqueWindow,
    joint: Option<&JointInput>,
    embedding_loss: Force,
) -> Result<Option<Controlled>, EngineError> {
    match input.method {
        TighteningMethod::YieldControlled => yield_point(input, w, base).map(Some),
        TighteningMethod::TorqueAngle => angle(input, w, base, joint, embedding_loss).map(Some),
        _ => Ok(None),
    }
}

fn yield_point(
    input: &SpecInput,
    w: &WindowInput,
    base: &TorqueWindow,
) -> Result<Controlled, EngineError> {
    if input.window_mode == WindowMode::MinimumClampLoad {
        return Err(EngineError::invalid(
            "window_mode",
            "yield-controlled tightening always tightens to the yield point; a minimum-clamp-load \
             window does not apply (give the required clamp load with the maximum-preload mode \
             to have it checked)",
        ));
    }
    let y = yield_controlled(&assembly(w))?;
    Ok(Controlled {
        window: band(
            y.monitoring_torque_min,
            y.monitoring_torque_max,
            &y.preload,
            base.permissible_preload,
            Governing::YieldPoint,
        ),
        angle: AngleOutcome::NotComputed {
            reason: "yield-controlled tightening takes the bolt to its yield point, where the \
                     elastic angle model does not hold; no angle window is given"
                .into(),
        },
        preload: y.preload,
    })
}

fn angle(
    input: &SpecInput,
    w: &WindowInput,
    base: &TorqueWindow,
    joint: Option<&JointInput>,
    embedding_loss: Force,
) -> Result<Controlled, EngineError> {
    let missing = |field: &str, what: &str| {
        EngineError::invalid(
            field,
            format!(
                "torque-angle tightening sets the preload by the angle, which depends on the \
                 joint's resilience; give {what} (the angle is never guessed)"
            ),
        )
    };
    let j = joint.ok_or_else(|| missing("joint.clamp_length", "the clamp length"))?;
    let lk = j
        .clamp_length
        .ok_or_else(|| missing("joint.clamp_length", "the clamp length"))?;
    let da = j
        .outer_diameter
        .ok_or_else(|| missing("joint.outer_diameter", "the clamped parts' outer diameter"))?;
    if j.clamped_modulus.is_none() {
        return Err(missing("clamped_material", "the clamped material"));
    }
    let bearing: &BearingSurface = &input.bearing;
    let res = resilience(w.thread, bearing, j, lk, da)?;
    let delta = res.bolt + res.clamped_parts;
    let (snug, snug_source) = match j.snug_torque {
        Some(t) => (
            Torque::new::<newton_meter>(positive(t.value, "joint.snug_torque")?),
            SnugSource::Given,
        ),
        None => (
            base.upper_limit * DEFAULT_SNUG_FRACTION,
            SnugSource::DefaultFraction,
        ),
    };
    let a = assembly(w);
    let s = w.scatter.value();
    let f_top = permissible_preload(
        w.thread,
        w.yield_strength,
        w.utilisation,
        w.thread_friction.max(),
    );
    let (theta, governing) = match (input.window_mode, input.required_clamp_load) {
        (WindowMode::MinimumClampLoad, Some(req)) => (
            angle_to_reach(&a, delta, snug, s, req + embedding_loss, WindowEnd::Lower)?,
            Governing::RequiredClampLoad,
        ),
        (WindowMode::MinimumClampLoad, None) => {
            return Err(EngineError::invalid(
                "required_clamp_load",
                "a required clamp load is needed to compute the minimum window",
            ))
        }
        (WindowMode::MaximumPreload, _) => (
            angle_to_reach(&a, delta, snug, s, f_top, WindowEnd::Upper)?,
            Governing::AngleWindow,
        ),
    };
    let ac = angle_controlled(&a, delta, snug, theta, s)?;
    if governing == Governing::RequiredClampLoad
        && ac.preload.preload_max.value > f_top.value * (1.0 + 1e-12)
    {
        return Err(EngineError::invalid(
            "required_clamp_load",
            format!(
                "no angle window guarantees the required clamp load: reaching it from the \
                 lowest snug preload takes the highest to {:.1} kN, above F_M,zul of {:.1} kN at \
                 the highest thread friction; narrow the friction range, use a tool with less \
                 angle scatter, or choose a larger or stronger bolt",
                ac.preload.preload_max.value / 1e3,
                f_top.value / 1e3
            ),
        ));
    }
    Ok(Controlled {
        window: band(
            ac.monitoring_torque_min,
            ac.monitoring_torque_max,
            &ac.preload,
            base.permissible_preload,
            governing,
        ),
        angle: AngleOutcome::Computed(AngleWindow {
            snug_torque: snug,
            snug_source,
            snug_preload_min: ac.snug_preload_min,
            snug_preload_max: ac.snug_preload_max,
            angle_min: ac.angle_min,
            angle_max: ac.angle_max,
            angle_at_yield: ac.angle_at_yield,
            resilience: res,
        }),
        preload: ac.preload,
    })
}

#[cfg(test)]
mod tests;
