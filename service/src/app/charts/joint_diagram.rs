//! The joint diagram (working state): force against deformation, the bolt
//! line rising with slope 1/δ_S and the clamped-part line falling with
//! slope 1/δ_P from the assembly point (VDI 2230 Part 1:2015, the joint
//! diagram of section 5.1, recalled from memory).
//!
//! Drawn for the smallest assembly preload F_M,min, the case the residual
//! clamp load is checked in: the embedding loss F_Z lowers the preload to
//! F_V = F_M,min − F_Z; under the axial load F_A the bolt gains
//! F_SA = Φ·F_A and the clamped parts keep F_KR,min = F_V − (1 − Φ)·F_A, so
//! at the working point the two are F_A apart. Every force is the one the
//! spec's `joint` block states. With n < 1 the diagram is the simplified
//! one: the working point is drawn at the bolt's elongation.

use uom::si::f64::{Force, Length};
use uom::si::force::newton;
use uom::si::length::meter;

use super::{Scale, SPEC_CAUTION};
use crate::app::quantity::{Quantity, Units};
use crate::app::spec::Resolved;
use crate::app::{AppError, FieldProblem};
use crate::chart::{pens, Axis, Figure, Mark, Marker, Plot, Shape};
use crate::engine::joint::model::JointModel;
use crate::engine::joint::working::WorkingState;
use crate::engine::spec::Spec;

/// The deformation axis runs this far past the clamped parts' free end.
const DEFORMATION_HEADROOM: f64 = 1.1;

/// Deformations in µm (SI) or µin (US).
fn deformation(units: Units, metres: f64) -> f64 {
    let q = Quantity::roughness(Length::new::<meter>(metres), units);
    q.value
}

fn deformation_unit(units: Units) -> String {
    Quantity::roughness(Length::new::<meter>(0.0), units)
        .unit
        .into_owned()
}

fn resilience_text(metre_per_newton: f64, units: Units) -> String {
    let q = Quantity::resilience(metre_per_newton, units);
    format!("{:.3e} {}", q.value, q.unit)
}

/// The joint model and its working state, or a 422 naming what is missing.
fn working(spec: &Spec) -> Result<(&JointModel, &WorkingState), AppError> {
    let Some(m) = &spec.joint_model else {
        return Err(AppError::Fields(vec![
            FieldProblem::invalid(
                "clamp_length",
                "the joint diagram needs the joint model: give the clamp length (or \
                 clamped_parts), clamped_material and joint_outer_diameter",
            ),
            FieldProblem::invalid(
                "loads_axial",
                "the joint diagram shows the working state: give the axial working load",
            ),
        ]));
    };
    let Some(w) = &m.working else {
        return Err(AppError::field(FieldProblem::invalid(
            "loads_axial",
            "the joint diagram shows the working state: give the axial working load",
        )));
    };
    Ok((m, w))
}

/// The figure of a spec with a joint model under an axial load; a 422
/// naming the missing fields otherwise.
pub fn figure(spec: &Spec, resolved: &Resolved) -> Result<Figure, AppError> {
    let (m, w) = working(spec)?;
    let units = resolved.units;
    let scale = Scale(units);
    let axial = resolved
        .input
        .joint_model
        .loads
        .as_ref()
        .map(|l| l.axial_max)
        .unwrap_or_default();
    let (d_s, d_p) = (
        m.load_factor.bolt_resilience,
        m.load_factor.clamped_resilience,
    );
    let phi = m.load_factor.load_factor;
    let f_m = spec.window.preload_min.value;
    let f_z = m.embedding.preload_loss.value;
    let f_v = (f_m - f_z).max(0.0);
    let f_sa = w.additional_bolt_load.value;
    let f_kr = w.residual_clamp_load_min.value;
    let f_s = f_v + f_sa;
    let n = |v: f64| Force::new::<newton>(v);
    let x = |metres: f64| deformation(units, metres);
    let y = |newtons: f64| scale.force(n(newtons));
    // Elongation of the bolt and compression of the parts at F_V.
    let (bolt_at_v, parts_at_v) = (d_s * f_v, d_p * f_v);
    let bolt_at_m = d_s * f_m;
    let bolt_at_s = d_s * f_s;
    let free_end = bolt_at_m + d_p * f_m;
    let bolt_line = vec![
        (0.0, 0.0),
        (x(bolt_at_m), y(f_m)),
        (x(bolt_at_s.max(bolt_at_m) * 1.05), y(f_s.max(f_m) * 1.05)),
    ];
    let parts_assembly = vec![(x(bolt_at_m), y(f_m)), (x(free_end), 0.0)];
    let parts_embedded = vec![(x(bolt_at_v), y(f_v)), (x(bolt_at_v + parts_at_v), 0.0)];
    let at_work = x(bolt_at_s);
    let marks = vec![
        Mark::new(
            "bolt-line",
            "bolt, 1/δ_S",
            Shape::Line {
                points: bolt_line,
                pen: pens::NOMINAL,
                marker: Marker::Circle,
            },
        )
        .explained(format!(
            "bolt: force against elongation, slope 1/δ_S (δ_S {})",
            resilience_text(d_s, units)
        )),
        Mark::new(
            "clamped-part-line",
            "clamped parts, 1/δ_P",
            Shape::Line {
                points: parts_assembly,
                pen: pens::HIGH,
                marker: Marker::Square,
            },
        )
        .explained(format!(
            "clamped parts at F_M,min: force against compression, slope 1/δ_P (δ_P {})",
            resilience_text(d_p, units)
        )),
        Mark::new(
            "clamped-part-line-embedded",
            "after embedding",
            Shape::Line {
                points: parts_embedded,
                pen: pens::LOW,
                marker: Marker::Triangle,
            },
        )
        .explained("clamped parts after embedding: the same slope from F_V = F_M,min − F_Z"),
        Mark::new(
            "assembly-preload",
            format!("F_M,min {}", scale.force_text(n(f_m))),
            Shape::Level {
                y: y(f_m),
                pen: pens::PRELOAD,
            },
        )
        .explained("F_M,min: the smallest assembly preload of the window"),
        Mark::new(
            "embedding-loss",
            format!("F_Z {}", scale.force_text(n(f_z))),
            Shape::Bars {
                bars: vec![crate::chart::Bar {
                    x: x(bolt_at_m),
                    low: y(f_v),
                    high: y(f_m),
                    mid: None,
                }],
                pen: pens::STATISTIC,
                marker: Marker::None,
            },
        )
        .explained("F_Z: the preload lost to embedding, f_Z/(δ_S + δ_P)"),
        Mark::new(
            "axial-load",
            format!("F_A {}", scale.force_text(axial)),
            Shape::Bars {
                bars: vec![crate::chart::Bar {
                    x: at_work,
                    low: y(f_kr),
                    high: y(f_s),
                    mid: None,
                }],
                pen: pens::REQUIRED,
                marker: Marker::Diamond,
            },
        )
        .explained("F_A: the axial working load, from F_KR,min up to the bolt force F_V + F_SA"),
        Mark::new(
            "additional-bolt-load",
            format!("F_SA {}", scale.force_text(n(f_sa))),
            Shape::Level {
                y: y(f_s),
                pen: pens::LIMIT,
            },
        )
        .explained("F_SA = Φ·F_A: the bolt force rises to F_V + F_SA"),
        Mark::new(
            "residual-clamp-load",
            format!("F_KR,min {}", scale.force_text(n(f_kr))),
            Shape::Level {
                y: y(f_kr),
                pen: pens::STATISTIC,
            },
        )
        .explained("F_KR,min = F_M,min − F_Z − (1 − Φ)·F_A: what the clamped parts keep"),
    ];
    let xs = [0.0, x(free_end) * DEFORMATION_HEADROOM, at_work];
    let forces = [0.0, y(f_m), y(f_s) * 1.05, y(f_kr)];
    let t = &spec.thread;
    Ok(Figure {
        title: format!("Joint diagram {} {}", t.designation, spec.strength.id),
        desc: format!(
            "Force against deformation of bolt and clamped parts for {} property class {} \
             at F_M,min {}: embedding loss F_Z {}, axial load F_A {}, additional bolt load \
             F_SA {} (Φ {phi:.3}), residual clamp load F_KR,min {}.",
            t.designation,
            spec.strength.id,
            scale.force_text(n(f_m)),
            scale.force_text(n(f_z)),
            scale.force_text(axial),
            scale.force_text(n(f_sa)),
            scale.force_text(n(f_kr)),
        ),
        plots: vec![Plot {
            heading: format!(
                "working state · Φ = n·Φ_K = {phi:.3} · catalogue revision {}",
                resolved.revision
            ),
            x: Axis::fit("Deformation", &deformation_unit(units), &xs, true),
            y: Axis::fit("Force", scale.force_unit(), &forces, true).with_headroom(0.08),
            marks,
        }],
        notes: vec![
            "Joint diagram of VDI 2230 Part 1:2015 (recalled from memory): F_SA = Φ·F_A, \
             F_KR,min = F_M,min − F_Z − (1 − Φ)·F_A; simplified for n < 1 (the working \
             point at the bolt's elongation)."
                .to_string(),
            SPEC_CAUTION.to_string(),
        ],
    })
}
