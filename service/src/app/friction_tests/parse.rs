//! From the posted series to the engine's validated input: names become
//! engine types (thread, property class, bearing), quantities become uom
//! values. Every specimen problem is collected, so one answer lists them all.

use uom::si::f64::{Angle, Force, Length, Torque};

use super::units;
use super::wire::{CurvePointRequest, SeriesRequest, SpecimenRequest};
use crate::app::quantity::Quantity;
use crate::app::{AppError, FieldProblem};
use crate::engine::bearing::{self, BearingSurface};
use crate::engine::calibration::{
    CurvePoint, JointGeometry, Measurement, SeriesInput, SpecimenRecord,
};
use crate::engine::grade::{self, Strength};
use crate::engine::thread::{self, ThreadGeometry};
use crate::engine::EngineError;

/// A series ready for the engine, with the parts the answer reports.
#[derive(Debug, Clone)]
pub struct ParsedSeries {
    pub thread: ThreadGeometry,
    pub strength: Option<Strength>,
    pub bearing: Option<BearingSurface>,
    pub input: SeriesInput,
    /// For each specimen in `input`, its index in the posted series.
    pub original_index: Vec<usize>,
    /// Problems reading individual specimens (units, missing values); the
    /// specimens concerned are left out of `input`.
    pub problems: Vec<FieldProblem>,
}

/// Parse a posted series. Name problems (thread, grade, head) come first
/// and alone; a specimen that cannot be read is left out and its problems
/// kept in `problems`, so the rest can still be checked by the engine.
pub fn parse(req: &SeriesRequest) -> Result<ParsedSeries, AppError> {
    let thread = thread::parse_designation(&req.thread)?;
    let strength = req
        .property_class
        .as_deref()
        .map(|id| grade::strength_for(id, &thread))
        .transpose()?;
    let bearing = parse_bearing(req, &thread)?;
    let joint = JointGeometry::new(&thread, bearing.as_ref(), req.thrust_bearing)?;

    let mut problems = Vec::new();
    let evaluation_clamp_force = req
        .evaluation_clamp_force
        .as_ref()
        .and_then(|q| collect(force(q, "evaluation_clamp_force"), &mut problems));
    let mut specimens = Vec::with_capacity(req.specimens.len());
    let mut original_index = Vec::with_capacity(req.specimens.len());
    for (i, s) in req.specimens.iter().enumerate() {
        let before = problems.len();
        if let Some(record) = specimen(s, i, &mut problems) {
            if problems.len() == before {
                specimens.push(record);
                original_index.push(i);
            }
        }
    }
    let proof_load = strength
        .as_ref()
        .map(|s| thread.stress_area * s.proof_stress);
    Ok(ParsedSeries {
        thread,
        strength,
        bearing,
        input: SeriesInput {
            joint,
            evaluation_clamp_force,
            proof_load,
            specimens,
        },
        original_index,
        problems,
    })
}

fn parse_bearing(
    req: &SeriesRequest,
    thread: &ThreadGeometry,
) -> Result<Option<BearingSurface>, FieldProblem> {
    let named = req.head.is_some() || req.hole.is_some() || req.washer.is_some();
    match (&req.bearing, named) {
        (Some(_), true) => Err(FieldProblem::invalid(
            "bearing",
            "give either `bearing` diameters or `head`/`washer`/`hole`, not both",
        )),
        (Some(b), false) => {
            let outer = length(&b.outer_diameter, "bearing.outer_diameter")?;
            let inner = length(&b.inner_diameter, "bearing.inner_diameter")?;
            Ok(Some(bearing::explicit_bearing(outer, inner)?))
        }
        (None, true) => {
            let named = || -> Result<BearingSurface, EngineError> {
                let head = req.head.as_deref().unwrap_or("hexagon-head").parse()?;
                let washer = req.washer.as_deref().unwrap_or("none").parse()?;
                let hole = req.hole.as_deref().unwrap_or("medium").parse()?;
                bearing::bearing_surface(thread, head, washer, hole)
            };
            Ok(Some(named()?))
        }
        (None, false) if req.thrust_bearing => Ok(None),
        (None, false) => Err(FieldProblem::invalid(
            "bearing",
            "the bearing under the turned part is needed: `head` and `hole`, or `bearing` with \
             `outer_diameter` and `inner_diameter` (or `thrust_bearing: true`)",
        )),
    }
}

fn collect<T>(r: Result<T, FieldProblem>, errors: &mut Vec<FieldProblem>) -> Option<T> {
    r.map_err(|e| errors.push(e)).ok()
}

fn specimen(
    s: &SpecimenRequest,
    i: usize,
    errors: &mut Vec<FieldProblem>,
) -> Option<SpecimenRecord> {
    let at = |name: &str| format!("specimens[{i}].{name}");
    let has_point =
        s.clamp_force.is_some() || s.total_torque.is_some() || s.thread_torque.is_some();
    match (&s.curve, has_point) {
        (Some(_), true) => {
            errors.push(FieldProblem::invalid(
                format!("specimens[{i}]"),
                "give either the values at the evaluation point or a `curve`, not both",
            ));
            None
        }
        (Some(points), false) => {
            let before = errors.len();
            let parsed: Vec<CurvePoint> = points
                .iter()
                .enumerate()
                .filter_map(|(j, p)| curve_point(p, &at(&format!("curve[{j}]")), errors))
                .collect();
            (errors.len() == before).then_some(SpecimenRecord::Curve(parsed))
        }
        (None, _) => {
            let f = required(s.clamp_force.as_ref(), &at("clamp_force"), errors);
            let t = required(s.total_torque.as_ref(), &at("total_torque"), errors);
            let f = f.and_then(|q| collect(force(q, &at("clamp_force")), errors));
            let t = t.and_then(|q| collect(torque(q, &at("total_torque")), errors));
            let th = match &s.thread_torque {
                Some(q) => Some(collect(torque(q, &at("thread_torque")), errors)?),
                None => None,
            };
            Some(SpecimenRecord::Point(Measurement {
                clamp_force: f?,
                total_torque: t?,
                thread_torque: th,
            }))
        }
    }
}

fn required<'a>(
    q: Option<&'a Quantity>,
    field: &str,
    errors: &mut Vec<FieldProblem>,
) -> Option<&'a Quantity> {
    if q.is_none() {
        errors.push(FieldProblem::invalid(field, "missing"));
    }
    q
}

fn curve_point(
    p: &CurvePointRequest,
    at: &str,
    errors: &mut Vec<FieldProblem>,
) -> Option<CurvePoint> {
    let f = collect(force(&p.clamp_force, &format!("{at}.clamp_force")), errors);
    let t = collect(
        torque(&p.total_torque, &format!("{at}.total_torque")),
        errors,
    );
    let th = match &p.thread_torque {
        Some(q) => Some(collect(torque(q, &format!("{at}.thread_torque")), errors)?),
        None => None,
    };
    let angle = match &p.angle {
        Some(q) => Some(collect(angle(q, &format!("{at}.angle")), errors)?),
        None => None,
    };
    Some(CurvePoint {
        clamp_force: f?,
        total_torque: t?,
        thread_torque: th,
        angle,
    })
}

fn force(q: &Quantity, field: &str) -> Result<Force, FieldProblem> {
    units::to_force(q, field)
}

fn torque(q: &Quantity, field: &str) -> Result<Torque, FieldProblem> {
    units::to_torque(q, field)
}

fn length(q: &Quantity, field: &str) -> Result<Length, FieldProblem> {
    units::to_length(q, field)
}

fn angle(q: &Quantity, field: &str) -> Result<Angle, FieldProblem> {
    units::to_angle(q, field)
}
