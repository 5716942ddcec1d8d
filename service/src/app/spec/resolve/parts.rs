//! The parts of a spec request read one at a time, in the order a client
//! reads them: the fastener (thread and grade), the bearing surface (tables
//! or explicit diameters), the method and window mode, the dimensional
//! quantities, and the joint with its tapped hole. Each part collects its
//! problems; `None` means "not readable" (a problem was recorded) or "not
//! given".

use uom::si::f64::{Force, Length, Torque};

use crate::app::quantity::Quantity;
use crate::app::FieldProblem;
use crate::engine::angle::{JointInput, JointType};
use crate::engine::bearing::{
    bearing_surface, explicit_bearing, BearingSurface, HeadType, HoleSeries, Washer,
};
use crate::engine::grade::{find_property_class, strength_for, Strength};
use crate::engine::material::{find_material, ClampedMaterial};
use crate::engine::method::TighteningMethod;
use crate::engine::spec::WindowMode;
use crate::engine::thread::{parse_designation, ThreadGeometry};
use crate::engine::EngineError;

use super::super::request::SpecRequest;
use super::{from_engine, DEFAULT_METHOD};

/// The problems of one request, collected as its parts are read.
pub(super) type Problems = Vec<FieldProblem>;

/// Collects `r` into `problems`, returning the value if it was good.
pub(super) fn keep<T>(r: Result<T, FieldProblem>, problems: &mut Problems) -> Option<T> {
    match r {
        Ok(v) => Some(v),
        Err(e) => {
            problems.push(e);
            None
        }
    }
}

/// An engine result, its error named by the request field.
pub(super) fn engine<T>(r: Result<T, EngineError>, problems: &mut Problems) -> Option<T> {
    keep(r.map_err(from_engine), problems)
}

/// The thread and its grade; an unknown grade is reported alongside a bad
/// thread.
pub(super) fn fastener(
    req: &SpecRequest,
    p: &mut Problems,
) -> (Option<ThreadGeometry>, Option<Strength>) {
    let thread = engine(parse_designation(&req.thread), p);
    let strength = match &thread {
        Some(t) => engine(strength_for(&req.property_class, t), p),
        None => {
            engine(find_property_class(&req.property_class), p);
            None
        }
    };
    (thread, strength)
}

/// The head, washer and hole the bearing tables are read with (defaults
/// filled in).
#[derive(Debug, Clone, Copy)]
pub(super) struct BearingParts {
    pub head: Option<HeadType>,
    pub washer: Option<Washer>,
    pub hole: Option<HoleSeries>,
}

/// The bearing surface: the explicit diameters when given, else the
/// tables for the head, washer and hole.
pub(super) fn bearing(
    req: &SpecRequest,
    thread: Option<&ThreadGeometry>,
    p: &mut Problems,
) -> (BearingParts, Option<BearingSurface>) {
    let parts = BearingParts {
        head: match req.head.as_deref() {
            Some(h) => engine(h.parse::<HeadType>(), p),
            None => Some(HeadType::HexagonHead),
        },
        washer: match req.washer.as_deref() {
            Some(w) => engine(w.parse::<Washer>(), p),
            None => Some(Washer::None),
        },
        hole: match req.hole.as_deref() {
            Some(h) => engine(h.parse::<HoleSeries>(), p),
            None => Some(HoleSeries::Medium),
        },
    };
    let surface = match (&req.bearing, thread) {
        (Some(b), _) => {
            let outer = keep(b.outer_diameter.to_length("bearing.outer_diameter"), p);
            let inner = keep(b.inner_diameter.to_length("bearing.inner_diameter"), p);
            match (outer, inner) {
                (Some(o), Some(i)) => engine(explicit_bearing(o, i), p),
                _ => None,
            }
        }
        (None, Some(t)) => match (parts.head, parts.washer, parts.hole) {
            (Some(h), Some(w), Some(s)) => engine(bearing_surface(t, h, w, s), p),
            _ => None,
        },
        (None, None) => None,
    };
    (parts, surface)
}

/// The tightening method (default [`DEFAULT_METHOD`]).
pub(super) fn method(req: &SpecRequest, p: &mut Problems) -> Option<TighteningMethod> {
    match req.tightening_method.as_deref() {
        Some(m) => engine(m.parse::<TighteningMethod>(), p),
        None => Some(DEFAULT_METHOD),
    }
}

pub(super) fn window_mode(text: Option<&str>) -> Result<WindowMode, FieldProblem> {
    match text.map(str::trim) {
        None | Some("maximum-preload") => Ok(WindowMode::MaximumPreload),
        Some("minimum-clamp-load") => Ok(WindowMode::MinimumClampLoad),
        Some(other) => Err(FieldProblem::unknown(
            "window_mode",
            format!("unknown window mode '{other}'"),
        )
        .with_suggestions(vec!["maximum-preload".into(), "minimum-clamp-load".into()])),
    }
}

pub(super) fn window_mode_id(m: WindowMode) -> &'static str {
    match m {
        WindowMode::MaximumPreload => "maximum-preload",
        WindowMode::MinimumClampLoad => "minimum-clamp-load",
    }
}

/// The dimensional inputs of a request, read into engine quantities.
#[derive(Debug, Clone, Copy)]
pub(super) struct Quantities {
    pub prevailing_torque: Option<Torque>,
    pub snug_torque: Option<Torque>,
    pub clamp_length: Option<Length>,
    pub joint_outer: Option<Length>,
    pub engagement: Option<Length>,
    pub required_clamp_load: Option<Force>,
    pub permissible_torque: Option<Torque>,
}

impl Quantities {
    pub(super) fn read(req: &SpecRequest, p: &mut Problems) -> Self {
        let torque = |field: &str, q: &Option<Quantity>, p: &mut Problems| {
            q.as_ref().and_then(|q| keep(q.to_torque(field), p))
        };
        let length = |field: &str, q: &Option<Quantity>, p: &mut Problems| {
            q.as_ref().and_then(|q| keep(q.to_length(field), p))
        };
        Self {
            prevailing_torque: torque("prevailing_torque", &req.prevailing_torque, p),
            snug_torque: torque("snug_torque", &req.snug_torque, p),
            permissible_torque: torque("permissible_torque", &req.permissible_torque, p),
            clamp_length: length("clamp_length", &req.clamp_length, p),
            joint_outer: length("joint_outer_diameter", &req.joint_outer_diameter, p),
            engagement: length("engagement_length", &req.engagement_length, p),
            required_clamp_load: req
                .required_clamp_load
                .as_ref()
                .and_then(|q| keep(q.to_force("required_clamp_load"), p)),
        }
    }
}

/// The joint's type and the clamped material, as named.
pub(super) fn joint_names(
    req: &SpecRequest,
    p: &mut Problems,
) -> (Option<JointType>, Option<ClampedMaterial>) {
    let joint_type = match req.joint_type.as_deref() {
        Some(j) => engine(j.parse::<JointType>(), p),
        None => None,
    };
    let material = match req.clamped_material.as_deref() {
        Some(m) => engine(find_material(m), p),
        None => None,
    };
    (joint_type, material)
}

/// The joint, when any joint input is given.
pub(super) fn joint(
    req: &SpecRequest,
    q: &Quantities,
    joint_type: Option<JointType>,
    head: Option<HeadType>,
) -> Option<JointInput> {
    let given = q.clamp_length.is_some()
        || req.clamped_parts.is_some()
        || q.joint_outer.is_some()
        || joint_type.is_some()
        || q.snug_torque.is_some();
    given.then(|| JointInput {
        clamp_length: q.clamp_length,
        joint_type: joint_type.unwrap_or(JointType::ThroughBolted),
        clamped_modulus: None,
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: q.joint_outer,
        socket_head: head == Some(HeadType::SocketHead) && req.bearing.is_none(),
        shank_sections: Vec::new(),
        snug_torque: q.snug_torque,
    })
}
