//! Helpers of `spec_query!`: the objects of the POST body built from their
//! flat query parameters.

use super::{BoltRequest, FrictionInput, LoadsInput};
use crate::app::quantity::Quantity;
use crate::app::FieldProblem;

/// The `loads_*` parameters, read.
pub(super) struct FlatLoads {
    pub axial: Option<Quantity>,
    pub axial_min: Option<Quantity>,
    pub transverse: Option<Quantity>,
    pub torsion: Option<Quantity>,
    pub torsion_radius: Option<Quantity>,
    pub interfaces: Option<i64>,
    pub interface_friction: Option<f64>,
    pub sealing_clamp_load: Option<Quantity>,
}

/// `loads` from its flat parameters: none of them, or the object.
pub(super) fn loads_from_query(f: FlatLoads) -> Option<LoadsInput> {
    let l = LoadsInput {
        axial: f.axial,
        axial_min: f.axial_min,
        transverse: f.transverse,
        torsion: f.torsion,
        torsion_radius: f.torsion_radius,
        interfaces: f.interfaces,
        interface_friction: f.interface_friction,
        sealing_clamp_load: f.sealing_clamp_load,
    };
    (l != LoadsInput::default()).then_some(l)
}

/// The bolt from its flat parameters: none of them, or `bolt_length` with
/// `bolt_standard` or `bolt_thread_length` (checked further in `resolve`).
pub(super) fn bolt_from_query(
    standard: Option<&str>,
    length_given: bool,
    length: Option<Quantity>,
    thread_length: Option<Quantity>,
    problems: &mut Vec<FieldProblem>,
) -> Option<BoltRequest> {
    if standard.is_none() && !length_given && thread_length.is_none() {
        return None;
    }
    if !length_given {
        problems.push(FieldProblem::malformed(
            "bolt_length",
            "bolt_standard and bolt_thread_length need bolt_length",
        ));
    }
    Some(BoltRequest {
        standard: standard.map(str::to_string),
        length,
        thread_length,
        shank_sections: None,
    })
}

/// One value, or both ends of a range; anything else is refused.
pub(super) fn friction_from_query(
    field: &str,
    single: Option<f64>,
    min: Option<f64>,
    max: Option<f64>,
    problems: &mut Vec<FieldProblem>,
) -> Option<FrictionInput> {
    match (single, min, max) {
        (None, None, None) => None,
        (Some(v), None, None) => Some(FrictionInput::Single(v)),
        (None, Some(min), Some(max)) => Some(FrictionInput::Range { min, max }),
        (Some(_), _, _) => {
            problems.push(FieldProblem::malformed(
                field,
                format!("give either {field} or {field}_min and {field}_max, not both"),
            ));
            None
        }
        (None, Some(_), None) => {
            problems.push(FieldProblem::malformed(
                format!("{field}_max"),
                format!("{field}_min needs {field}_max"),
            ));
            None
        }
        (None, None, Some(_)) => {
            problems.push(FieldProblem::malformed(
                format!("{field}_min"),
                format!("{field}_max needs {field}_min"),
            ));
            None
        }
    }
}
