//! The torque window: from friction ranges and tool scatter to the torques to
//! set and the preload range they give. All inputs are explicit.
//!
//! Forward (maximum utilisation, VDI 2230 Part 1 practice):
//! - upper torque M_A,max: the torque that, at minimum friction, just reaches
//!   F_M,zul(μ_th,min) (VDI 2230 Part 1), a prevailing torque's twist
//!   included (`tightening::permissible_preload_with_prevailing`);
//! - target = upper/(1 + s); lower = target·(1 − s);
//! - preload max = preload at upper torque and minimum friction;
//!   preload min = preload at lower torque and maximum friction;
//!   α_A = max/min.
//!
//! Guard beyond the plain rule: the combined stress at a given torque is
//! largest at minimum bearing friction and at one END of the thread-friction
//! range (stress/torque is a convex function of μ_th over an affine one, hence
//! quasi-convex, so its maximum over an interval is at an end). Normally the
//! minimum-friction end governs and the window is exactly the VDI one; when a
//! high bearing friction makes the maximum-thread-friction end govern, the
//! upper torque is lowered so that no friction in the ranges overloads the
//! bolt, and `governing` says so.
//!
//! Inverse (required clamp load): the lowest, hence narrowest, window whose
//! lower torque at maximum friction still gives the required clamp load, or a
//! [`NoWindow`] explaining why none exists.

use uom::si::f64::{Force, Length, Pressure, Torque};
use uom::si::torque::newton_meter;

use super::quantity::{FrictionRange, Scatter, Utilisation};
use super::thread::ThreadGeometry;
use super::tightening::{
    permissible_preload_with_prevailing as permissible, preload_at_torque, torque_per_preload,
};
use super::EngineError;

/// Everything the window needs, each value already validated.
#[derive(Debug, Clone, Copy)]
pub struct WindowInput<'a> {
    pub thread: &'a ThreadGeometry,
    /// Minimum yield strength of the fastener (ReL, Rp0.2 or Rpf).
    pub yield_strength: Pressure,
    /// Mean bearing-friction diameter D_Km.
    pub mean_bearing_diameter: Length,
    pub thread_friction: FrictionRange,
    pub bearing_friction: FrictionRange,
    pub scatter: Scatter,
    pub utilisation: Utilisation,
    /// Prevailing torque of a locking element (zero if none).
    pub prevailing_torque: Torque,
}

/// Which friction case limits the upper torque.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Governing {
    /// Minimum thread and bearing friction: the VDI 2230 rule.
    MinimumFriction,
    /// Maximum thread with minimum bearing friction (see module docs).
    MaximumThreadFriction,
    /// The required clamp load set the window (inverse mode).
    RequiredClampLoad,
    /// Angle-controlled tightening: the band is the torque the angle window
    /// ends at over the friction range (a monitoring band, not a setting).
    AngleWindow,
    /// Yield-controlled tightening: the band is the torque at which the
    /// bolts reach yield over the friction and yield ranges (monitoring).
    YieldPoint,
}

/// The torques to set and the preload they give.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TorqueWindow {
    pub lower: Torque,
    pub target: Torque,
    pub upper: Torque,
    pub preload_min: Force,
    pub preload_max: Force,
    /// F_M,zul at minimum thread friction (VDI 2230 Part 1).
    pub permissible_preload: Force,
    /// The yield-limited upper torque (equal to `upper` in forward mode).
    pub upper_limit: Torque,
    /// Effective tightening factor α_A = preload max / preload min.
    pub tightening_factor: f64,
    pub governing: Governing,
}

/// Pass/fail of a required minimum clamp load at the low end of the window.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ClampLoadVerdict {
    pub required: Force,
    /// Lowest clamp load the window gives: the preload at the lower torque
    /// and maximum friction, less the embedding loss F_Z.
    pub achieved_min: Force,
    /// F_Z taken off the lowest preload (zero where the joint model is absent).
    pub embedding_loss: Force,
    /// achieved_min − required (negative when not met).
    pub margin: Force,
    /// margin / required.
    pub margin_ratio: f64,
    pub met: bool,
}

/// No window guarantees the required clamp load with this bolt.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NoWindow {
    pub required: Force,
    pub permissible_preload: Force,
    /// Preload spread from friction: c(max)/c(min).
    pub friction_factor: f64,
    /// Preload spread from the tool: (1 + s)/(1 − s).
    pub tool_factor: f64,
    /// What the bolt allows: F_M,zul / required.
    pub available_factor: f64,
}

impl NoWindow {
    /// A sentence for the technician and the problem response.
    pub fn explanation(&self) -> String {
        format!(
            "no torque window guarantees the required clamp load of {:.1} kN with this bolt: \
             the friction range spreads the preload by a factor {:.2} and the tool scatter by \
             {:.2} (together {:.2}), but the bolt allows only {:.2} between its permissible \
             assembly preload of {:.1} kN and the required clamp load; narrow the friction \
             range (lubricant, coating), use a tool with less scatter, or choose a larger or \
             stronger bolt",
            self.required.value / 1000.0,
            self.friction_factor,
            self.tool_factor,
            self.friction_factor * self.tool_factor,
            self.available_factor,
            self.permissible_preload.value / 1000.0,
        )
    }
}

fn nm(v: f64) -> Torque {
    Torque::new::<newton_meter>(v)
}

/// The yield-limited upper torque and the case that governs it.
fn upper_limit(input: &WindowInput) -> (f64, Governing, Force) {
    let (t, dkm, mp) = (
        input.thread,
        input.mean_bearing_diameter,
        input.prevailing_torque.value,
    );
    let (th, b) = (input.thread_friction, input.bearing_friction);
    let (rp, nu, p) = (
        input.yield_strength,
        input.utilisation,
        input.prevailing_torque,
    );
    let f_lo = permissible(t, rp, nu, th.min(), p);
    let m_lo = f_lo.value * torque_per_preload(t, dkm, th.min(), b.min()).value + mp;
    let f_hi = permissible(t, rp, nu, th.max(), p);
    let m_hi = f_hi.value * torque_per_preload(t, dkm, th.max(), b.min()).value + mp;
    if m_hi < m_lo {
        (m_hi, Governing::MaximumThreadFriction, f_lo)
    } else {
        (m_lo, Governing::MinimumFriction, f_lo)
    }
}

fn build(
    input: &WindowInput,
    lower: f64,
    target: f64,
    upper: f64,
    limit: f64,
    f_zul: Force,
    governing: Governing,
) -> Result<TorqueWindow, EngineError> {
    let (t, dkm, mp) = (
        input.thread,
        input.mean_bearing_diameter,
        input.prevailing_torque,
    );
    let (th, b) = (input.thread_friction, input.bearing_friction);
    if lower <= mp.value {
        return Err(EngineError::invalid(
            "prevailing_torque",
            format!(
                "the prevailing torque of {:.2} N·m is at or above the lower torque of the \
                 window ({:.2} N·m): the tool would stop before the joint is clamped",
                mp.value, lower
            ),
        ));
    }
    let preload_max = preload_at_torque(t, nm(upper), dkm, th.min(), b.min(), mp);
    let preload_min = preload_at_torque(t, nm(lower), dkm, th.max(), b.max(), mp);
    Ok(TorqueWindow {
        lower: nm(lower),
        target: nm(target),
        upper: nm(upper),
        preload_min,
        preload_max,
        permissible_preload: f_zul,
        upper_limit: nm(limit),
        tightening_factor: preload_max.value / preload_min.value,
        governing,
    })
}

/// Forward mode: the window that uses the bolt up to ν·Rp at the top.
pub fn maximum_window(input: &WindowInput) -> Result<TorqueWindow, EngineError> {
    let (limit, governing, f_zul) = upper_limit(input);
    let s = input.scatter.value();
    let target = limit / (1.0 + s);
    build(
        input,
        target * (1.0 - s),
        target,
        limit,
        limit,
        f_zul,
        governing,
    )
}

/// Compare the low end of a window with a required minimum clamp load.
/// Embedding losses and external loads are not deducted (see spec cautions).
pub fn clamp_load_verdict(window: &TorqueWindow, required: Force) -> ClampLoadVerdict {
    let margin = window.preload_min - required;
    ClampLoadVerdict {
        required,
        achieved_min: window.preload_min,
        embedding_loss: window.preload_min * 0.0,
        margin,
        margin_ratio: margin.value / required.value,
        met: margin.value >= 0.0,
    }
}

impl ClampLoadVerdict {
    /// The verdict with the embedding loss F_Z taken off the lowest preload:
    /// F_M,min − F_Z against the required clamp load (VDI 2230 Part 1:2003
    /// §5.4.2, recalled from memory: the preload lost to embedding is not
    /// available as clamp load).
    pub fn after_embedding(self, loss: Force) -> Self {
        let achieved_min = self.achieved_min - loss;
        let margin = achieved_min - self.required;
        Self {
            achieved_min,
            embedding_loss: self.embedding_loss + loss,
            margin,
            margin_ratio: margin.value / self.required.value,
            met: margin.value >= 0.0,
            ..self
        }
    }
}

/// Inverse mode: the narrowest window whose lower torque at maximum friction
/// still reaches `required`; `Ok(Err(NoWindow))` when the bolt cannot do it.
pub fn clamp_load_window(
    input: &WindowInput,
    required: Force,
) -> Result<Result<TorqueWindow, NoWindow>, EngineError> {
    if !required.value.is_finite() || required.value <= 0.0 {
        return Err(EngineError::invalid(
            "required_clamp_load",
            "must be a finite force greater than zero",
        ));
    }
    let (t, dkm, mp) = (
        input.thread,
        input.mean_bearing_diameter,
        input.prevailing_torque.value,
    );
    let (th, b) = (input.thread_friction, input.bearing_friction);
    let (limit, _, f_zul) = upper_limit(input);
    let s = input.scatter.value();
    let c_max = torque_per_preload(t, dkm, th.max(), b.max()).value;
    let c_min = torque_per_preload(t, dkm, th.min(), b.min()).value;
    let lower = required.value * c_max + mp;
    let target = lower / (1.0 - s);
    let upper = target * (1.0 + s);
    // Relative tolerance: with no scatter and single friction values the
    // window at exactly F_M,zul must still exist.
    if upper > limit * (1.0 + 1e-12) {
        return Ok(Err(NoWindow {
            required,
            permissible_preload: f_zul,
            friction_factor: c_max / c_min,
            tool_factor: (1.0 + s) / (1.0 - s),
            available_factor: f_zul.value / required.value,
        }));
    }
    build(
        input,
        lower,
        target,
        upper,
        limit,
        f_zul,
        Governing::RequiredClampLoad,
    )
    .map(Ok)
}

/// Zero torque, for inputs without a locking element.
pub fn no_prevailing_torque() -> Torque {
    nm(0.0)
}

#[cfg(test)]
mod tests;
