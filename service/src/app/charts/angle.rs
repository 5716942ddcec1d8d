//! The torque–angle chart: clamp force against the angle turned from snug.
//!
//! In the elastic range each turn of the nut stretches the bolt and
//! squeezes the clamped parts by one pitch, so the preload rises by
//! ΔF = θ/360° · P/(δ_S + δ_P) from the preload at snug (VDI 2230 Part 1,
//! resilience model; the relation the engine's angle window uses, recalled
//! from memory). Two lines: from the highest snug preload (minimum
//! friction) and from the lowest (maximum friction). The plastic range past
//! yield is not drawn: the lines stop being true there.

use uom::si::f64::Force;
use uom::si::force::newton;

use super::{Scale, SPEC_CAUTION};
use crate::app::spec::Resolved;
use crate::app::{AppError, FieldProblem};
use crate::chart::{pens, Axis, Figure, Mark, Marker, Plot, Shape};
use crate::engine::angle::AngleOutcome;
use crate::engine::spec::Spec;

/// The angle axis runs this far past the angle at yield.
const ANGLE_HEADROOM: f64 = 1.1;

/// Which request field a spec without an angle window lacks.
fn missing_field(resolved: &Resolved) -> &'static str {
    match &resolved.input.joint {
        None => "clamp_length",
        Some(j) if j.clamp_length.is_none() => "clamp_length",
        Some(j) if j.outer_diameter.is_none() => "joint_outer_diameter",
        Some(j) if j.clamped_modulus.is_none() => "clamped_material",
        Some(_) => "snug_torque",
    }
}

/// The figure of a spec with an angle window; without one, a 422 naming
/// what it lacks and why.
pub fn figure(spec: &Spec, resolved: &Resolved) -> Result<Figure, AppError> {
    let a = match &spec.angle {
        AngleOutcome::Computed(a) => a,
        AngleOutcome::NotComputed { reason } => {
            return Err(AppError::field(FieldProblem::invalid(
                missing_field(resolved),
                format!("this spec has no angle window to draw: {reason}"),
            )))
        }
    };
    let scale = Scale(resolved.units);
    let w = &spec.window;
    // Degrees per newton of preload: 360°·(δ_S + δ_P)/P.
    let per_newton =
        360.0 * (a.resilience.bolt + a.resilience.clamped_parts) / spec.thread.pitch.value;
    let deg = |v: uom::si::f64::Angle| v.get::<uom::si::angle::degree>();
    let (at_yield, lo, hi) = (deg(a.angle_at_yield), deg(a.angle_min), deg(a.angle_max));
    // The lines stop at the angle at yield: past it the elastic model no
    // longer holds (and never past the window's end).
    let stop = at_yield.max(hi);
    let end = stop * ANGLE_HEADROOM;
    let force_at = |snug: Force, angle: f64| Force::new::<newton>(snug.value + angle / per_newton);
    let yield_force = force_at(a.snug_preload_max, at_yield);
    let line = |snug: Force| {
        vec![
            (0.0, scale.force(snug)),
            (stop / 2.0, scale.force(force_at(snug, stop / 2.0))),
            (stop, scale.force(force_at(snug, stop))),
        ]
    };
    let from_high = line(a.snug_preload_max);
    let from_low = line(a.snug_preload_min);
    let forces: Vec<f64> = from_high.iter().chain(&from_low).map(|p| p.1).collect();
    let mut marks = vec![
        Mark::new(
            "angle-window",
            "angle window",
            Shape::Band { from: lo, to: hi },
        )
        .explained(format!("angle window {lo:.0}° to {hi:.0}° from snug")),
        Mark::new(
            "tightening-window",
            "window",
            Shape::Frame {
                x0: lo,
                x1: hi,
                y0: scale.force(w.preload_min),
                y1: scale.force(w.preload_max),
                pen: pens::WINDOW,
            },
        )
        .explained("tightening window: angle window × preload range"),
        Mark::new(
            "from-snug-friction-min",
            "from snug, μ min",
            Shape::Line {
                points: from_high,
                pen: pens::LOW,
                marker: Marker::Circle,
            },
        )
        .explained(format!(
            "clamp force from the highest snug preload {} (minimum friction)",
            scale.force_text(a.snug_preload_max)
        )),
        Mark::new(
            "from-snug-friction-max",
            "from snug, μ max",
            Shape::Line {
                points: from_low,
                pen: pens::HIGH,
                marker: Marker::Square,
            },
        )
        .explained(format!(
            "clamp force from the lowest snug preload {} (maximum friction)",
            scale.force_text(a.snug_preload_min)
        )),
    ];
    for (role, label, legend, f, pen) in [
        (
            "preload-min",
            "F_M,min",
            "preload min of the window",
            w.preload_min,
            pens::PRELOAD,
        ),
        (
            "preload-max",
            "F_M,max",
            "preload max of the window",
            w.preload_max,
            pens::PRELOAD,
        ),
        (
            "yield-preload",
            "yield (ν = 1)",
            "preload at yield: ν = 1, maximum thread friction",
            yield_force,
            pens::LIMIT,
        ),
    ] {
        marks.push(
            Mark::new(
                role,
                format!("{label} {}", scale.force_text(f)),
                Shape::Level {
                    y: scale.force(f),
                    pen,
                },
            )
            .explained(legend),
        );
    }
    marks.push(
        Mark::new(
            "angle-at-yield",
            format!("yield at {at_yield:.0}°"),
            Shape::Upright {
                x: at_yield,
                pen: pens::LIMIT,
            },
        )
        .explained("angle at which the bolt may first reach yield: a limit, never a target"),
    );
    let x = Axis::fit("Angle from snug", "degrees", &[0.0, end], true);
    let y = Axis::fit("Clamp force", scale.force_unit(), &forces, true);
    let t = &spec.thread;
    Ok(Figure {
        title: format!("Torque–angle {} {}", t.designation, spec.strength.id),
        desc: format!(
            "Clamp force against angle turned from snug torque {} for {} property class {}. \
             Angle window {lo:.1}° to {hi:.1}° for preload {} to {}; the bolt may reach yield \
             at {at_yield:.1}° from snug. Elastic model: the plastic range is not drawn.",
            scale.torque_text(a.snug_torque),
            t.designation,
            spec.strength.id,
            scale.force_text(w.preload_min),
            scale.force_text(w.preload_max),
        ),
        plots: vec![Plot {
            heading: format!(
                "snug torque {} · δ_S + δ_P from the joint · catalogue revision {}",
                scale.torque_text(a.snug_torque),
                resolved.revision
            ),
            x,
            y,
            marks,
        }],
        notes: vec![
            "Lines: F = F_snug + θ/360° · P/(δ_S + δ_P), VDI 2230 Part 1 resilience model \
             (recalled from memory); elastic range only, preload losses not deducted."
                .to_string(),
            SPEC_CAUTION.to_string(),
        ],
    })
}
