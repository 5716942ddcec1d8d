//! The last guard before an answer leaves the engine: every number it
//! reports is finite.

use super::Spec;
use crate::engine::angle::AngleOutcome;
use crate::engine::joint::model;

/// True when every number the spec reports is finite. The plausibility
/// ranges keep it so; this is the last guard, so that no answer ever carries
/// a number that JSON cannot hold.
pub(super) fn all_finite(s: &Spec) -> bool {
    let fin = |v: &[f64]| v.iter().all(|x| x.is_finite());
    let w = &s.window;
    let mut ok = fin(&[
        w.lower.value,
        w.target.value,
        w.upper.value,
        w.preload_min.value,
        w.preload_max.value,
        w.permissible_preload.value,
        w.upper_limit.value,
        w.tightening_factor,
        s.surface_pressure.value,
        s.mean_bearing_diameter.value,
        s.proof_load.value,
        s.yield_load.value,
    ]);
    for f in [&s.at_min_friction, &s.at_max_friction] {
        ok &= fin(&[
            f.preload_at_target.value,
            f.nut_factor,
            f.total_friction,
            f.split.pitch,
            f.split.thread_friction,
            f.split.bearing_friction,
            f.split.prevailing,
        ]);
    }
    if let Some(c) = &s.clamp_load {
        ok &= fin(&[c.achieved_min.value, c.margin.value, c.margin_ratio]);
    }
    if let Some(m) = &s.joint_model {
        ok &= model::all_finite(m);
    }
    if let AngleOutcome::Computed(a) = &s.angle {
        ok &= fin(&[
            a.snug_torque.value,
            a.snug_preload_min.value,
            a.snug_preload_max.value,
            a.angle_min.value,
            a.angle_max.value,
            a.angle_at_yield.value,
        ]);
    }
    ok
}
