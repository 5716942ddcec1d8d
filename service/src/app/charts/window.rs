//! The tightening-window chart: clamp force against torque.
//!
//! Each friction line is the torque formula of the spec solved for the
//! preload, F_M = (M_A − M_P)/(torque per unit preload), at one pair of
//! thread and bearing friction (the tightening torque of VDI 2230 Part
//! 1:2015 rearranged; the formula the spec states in its assumptions). The lines
//! are straight: the preload is proportional to the torque past the
//! prevailing torque. Nominal friction is the middle of each range (common
//! practice).

use uom::si::f64::Torque;
use uom::si::torque::newton_meter;

use super::{Scale, SPEC_CAUTION};
use crate::app::spec::Resolved;
use crate::chart::{pens, Axis, Figure, Mark, Marker, Pen, Plot, Shape};
use crate::engine::spec::Spec;
use crate::engine::tightening::preload_at_torque;

/// Points along each friction line (its markers).
const LINE_POINTS: usize = 6;

/// The torque axis runs this far past the highest torque of the window.
const TORQUE_HEADROOM: f64 = 1.2;

fn friction_line(spec: &Spec, scale: Scale, end: Torque, mu_th: f64, mu_b: f64) -> Vec<(f64, f64)> {
    (0..=LINE_POINTS)
        .map(|k| {
            let t = end * (k as f64 / LINE_POINTS as f64);
            let f = preload_at_torque(
                &spec.thread,
                t,
                spec.mean_bearing_diameter,
                mu_th,
                mu_b,
                spec.prevailing_torque,
            );
            (scale.torque(t), scale.force(f))
        })
        .collect()
}

/// The figure of a computed spec.
pub fn figure(spec: &Spec, resolved: &Resolved) -> Figure {
    let scale = Scale(resolved.units);
    let w = &spec.window;
    let (th, b) = (spec.thread_friction, spec.bearing_friction);
    let end = Torque::new::<newton_meter>(
        w.upper.value.max(w.upper_limit.value).max(w.lower.value) * TORQUE_HEADROOM,
    );
    let lines: [(&str, &str, f64, f64, Pen, Marker); 3] = [
        (
            "friction-min",
            "μ min",
            th.min(),
            b.min(),
            pens::LOW,
            Marker::Circle,
        ),
        (
            "friction-nominal",
            "μ nominal",
            (th.min() + th.max()) / 2.0,
            (b.min() + b.max()) / 2.0,
            pens::NOMINAL,
            Marker::None,
        ),
        (
            "friction-max",
            "μ max",
            th.max(),
            b.max(),
            pens::HIGH,
            Marker::Square,
        ),
    ];
    let mut marks = vec![
        Mark::new(
            "torque-window",
            "torque window",
            Shape::Band {
                from: scale.torque(w.lower),
                to: scale.torque(w.upper),
            },
        )
        .explained(format!(
            "torque window {} to {}",
            scale.torque_text(w.lower),
            scale.torque_text(w.upper)
        )),
        Mark::new(
            "tightening-window",
            "window",
            Shape::Frame {
                x0: scale.torque(w.lower),
                x1: scale.torque(w.upper),
                y0: scale.force(w.preload_min),
                y1: scale.force(w.preload_max),
                pen: pens::WINDOW,
            },
        )
        .explained("tightening window: torque window × preload range"),
    ];
    let mut forces = vec![scale.force(w.permissible_preload)];
    for (role, label, mu_th, mu_b, pen, marker) in lines {
        let points = friction_line(spec, scale, end, mu_th, mu_b);
        forces.extend(points.iter().map(|p| p.1));
        marks.push(
            Mark::new(
                role,
                label,
                Shape::Line {
                    points,
                    pen,
                    marker,
                },
            )
            .explained(format!(
                "clamp force at {label}: μ_th {mu_th:.3}, μ_b {mu_b:.3}"
            )),
        );
    }
    let level = |role: &str, label: String, legend: &str, f, pen| {
        Mark::new(
            role,
            label,
            Shape::Level {
                y: scale.force(f),
                pen,
            },
        )
        .explained(legend.to_string())
    };
    marks.push(level(
        "preload-min",
        format!("F_M,min {}", scale.force_text(w.preload_min)),
        "preload min: the window's lowest preload (μ max, lower torque)",
        w.preload_min,
        pens::PRELOAD,
    ));
    marks.push(level(
        "preload-max",
        format!("F_M,max {}", scale.force_text(w.preload_max)),
        "preload max: the window's highest preload (μ min, upper torque)",
        w.preload_max,
        pens::PRELOAD,
    ));
    marks.push(level(
        "permissible-preload",
        format!("F_M,zul {}", scale.force_text(w.permissible_preload)),
        "F_M,zul: permissible assembly preload at ν of the yield strength, μ_th min (VDI 2230 Part 1)",
        w.permissible_preload,
        pens::LIMIT,
    ));
    if let Some(c) = &spec.clamp_load {
        forces.push(scale.force(c.required));
        marks.push(level(
            "required-clamp-load",
            format!("required {}", scale.force_text(c.required)),
            "required clamp load (as given)",
            c.required,
            pens::REQUIRED,
        ));
    }
    marks.push(
        Mark::new(
            "yield-limited-torque",
            format!("yield-limited {}", scale.torque_text(w.upper_limit)),
            Shape::Upright {
                x: scale.torque(w.upper_limit),
                pen: pens::LIMIT,
            },
        )
        .explained("yield-limited torque: the torque that gives F_M,zul at minimum friction"),
    );
    marks.push(
        Mark::new(
            "target-torque",
            format!("target {}", scale.torque_text(w.target)),
            Shape::Upright {
                x: scale.torque(w.target),
                pen: pens::STATISTIC,
            },
        )
        .explained("target torque"),
    );
    let x = Axis::fit(
        "Torque",
        &scale.torque_unit(),
        &[0.0, scale.torque(end)],
        true,
    );
    let y = Axis::fit("Clamp force", scale.force_unit(), &forces, true);
    let t = &spec.thread;
    Figure {
        title: format!("Tightening window {} {}", t.designation, spec.strength.id),
        desc: format!(
            "Clamp force against tightening torque for {} property class {}, {}. Lines at \
             minimum (μ_th {:.3}, μ_b {:.3}), nominal and maximum (μ_th {:.3}, μ_b {:.3}) \
             friction. Torque window {} to {} (target {}); preload {} to {}; F_M,zul {}; \
             yield-limited torque {}.",
            t.designation,
            spec.strength.id,
            spec.method.name,
            th.min(),
            b.min(),
            th.max(),
            b.max(),
            scale.torque_text(w.lower),
            scale.torque_text(w.upper),
            scale.torque_text(w.target),
            scale.force_text(w.preload_min),
            scale.force_text(w.preload_max),
            scale.force_text(w.permissible_preload),
            scale.torque_text(w.upper_limit),
        ),
        plots: vec![Plot {
            heading: format!(
                "{} · friction {} · catalogue revision {}",
                spec.method.name, spec.friction_source, resolved.revision
            ),
            x,
            y,
            marks,
        }],
        notes: vec![
            format!(
                "Friction lines: {}, solved for F_M.",
                spec.torque_formula.description()
            ),
            SPEC_CAUTION.to_string(),
        ],
    }
}
