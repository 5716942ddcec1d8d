//! Reading a sampled tightening curve at the evaluation clamp force.
//!
//! The curve is read where the clamp force first reaches the evaluation
//! force, interpolating linearly between the two samples either side. A
//! curve that never reaches it is refused with its maximum stated.

use uom::si::f64::{Angle, Force, Torque};
use uom::si::force::kilonewton;

use super::{CurvePoint, Measurement};
use crate::engine::EngineError;

/// The measurement (and angle, if the curve has one) at `fe`, or `None`
/// with the problems pushed to `errors`.
pub(super) fn read_at(
    points: &[CurvePoint],
    fe: Force,
    index: usize,
    errors: &mut Vec<EngineError>,
) -> Option<(Measurement, Option<Angle>)> {
    let field = format!("specimens[{index}].curve");
    let before = errors.len();
    if points.len() < 2 {
        errors.push(EngineError::invalid(
            field.as_str(),
            "a curve needs at least two samples",
        ));
        return None;
    }
    let with_thread = points[0].thread_torque.is_some();
    let with_angle = points[0].angle.is_some();
    for (j, p) in points.iter().enumerate() {
        let sample = |name: &str| format!("{field}[{j}].{name}");
        let finite_non_negative = |v: f64| v.is_finite() && v >= 0.0;
        if !finite_non_negative(p.clamp_force.value) {
            errors.push(EngineError::invalid(
                sample("clamp_force"),
                "must be a finite, non-negative clamp force",
            ));
        }
        if !finite_non_negative(p.total_torque.value) {
            errors.push(EngineError::invalid(
                sample("total_torque"),
                "must be a finite, non-negative torque",
            ));
        }
        match p.thread_torque {
            Some(th) if !finite_non_negative(th.value) => errors.push(EngineError::invalid(
                sample("thread_torque"),
                "must be a finite, non-negative torque",
            )),
            Some(_) if !with_thread => errors.push(EngineError::invalid(
                sample("thread_torque"),
                "every sample of a curve has a thread torque, or none has",
            )),
            None if with_thread => errors.push(EngineError::invalid(
                sample("thread_torque"),
                "missing: every sample of a curve has a thread torque, or none has",
            )),
            _ => {}
        }
        match p.angle {
            Some(a) if !a.value.is_finite() => errors.push(EngineError::invalid(
                sample("angle"),
                "must be a finite angle",
            )),
            Some(_) if !with_angle => errors.push(EngineError::invalid(
                sample("angle"),
                "every sample of a curve has an angle, or none has",
            )),
            None if with_angle => errors.push(EngineError::invalid(
                sample("angle"),
                "missing: every sample of a curve has an angle, or none has",
            )),
            _ => {}
        }
    }
    if errors.len() > before {
        return None;
    }
    let Some(j) = points.iter().position(|p| p.clamp_force >= fe) else {
        let max = points
            .iter()
            .map(|p| p.clamp_force.get::<kilonewton>())
            .fold(0.0, f64::max);
        errors.push(EngineError::invalid(
            field,
            format!(
                "the curve never reaches the evaluation clamp force of {:.3} kN (its maximum \
                 is {max:.3} kN)",
                fe.get::<kilonewton>()
            ),
        ));
        return None;
    };
    if j == 0 {
        if points[0].clamp_force == fe {
            return Some(at_sample(&points[0]));
        }
        errors.push(EngineError::invalid(
            field,
            format!(
                "the curve starts above the evaluation clamp force of {:.3} kN, so there is no \
                 sample to interpolate from",
                fe.get::<kilonewton>()
            ),
        ));
        return None;
    }
    let (a, b) = (&points[j - 1], &points[j]);
    // a.F < fe <= b.F, so the span is strictly positive.
    let s = (fe - a.clamp_force).value / (b.clamp_force - a.clamp_force).value;
    let lerp_t = |x: Torque, y: Torque| x + (y - x) * s;
    let measurement = Measurement {
        clamp_force: fe,
        total_torque: lerp_t(a.total_torque, b.total_torque),
        thread_torque: a
            .thread_torque
            .zip(b.thread_torque)
            .map(|(x, y)| lerp_t(x, y)),
    };
    let angle = a.angle.zip(b.angle).map(|(x, y)| x + (y - x) * s);
    Some((measurement, angle))
}

fn at_sample(p: &CurvePoint) -> (Measurement, Option<Angle>) {
    (
        Measurement {
            clamp_force: p.clamp_force,
            total_torque: p.total_torque,
            thread_torque: p.thread_torque,
        },
        p.angle,
    )
}
