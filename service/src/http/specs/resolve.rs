//! The parse step: a wire [`SpecRequest`] and a catalogue snapshot in, the
//! engine's validated [`SpecInput`] out, with the friction provenance and the
//! normalised request that identifies the spec. Names are turned into engine
//! types through the engine's own look-ups; nothing here computes.
//!
//! Every problem is collected, so a client sees all bad fields at once.
//! Engine field names are mapped to the request's names where they differ
//! (`method` → `tightening_method`, `joint.snug_torque` → `snug_torque`, ...).
//!
//! Slightly over 400 lines on purpose: [`resolve`] reads the fields of a
//! request in one pass, in the order a client reads them, and collects every
//! problem on the way; cutting that pass in two would split one reading
//! order across files. Its tests are in `resolve/tests.rs`.

use serde::Serialize;
use uom::si::f64::{Force, Length, Torque};
use uom::si::force::newton;
use uom::si::length::millimeter;
use uom::si::torque::newton_meter;

use crate::catalogue::Snapshot;
use crate::engine::angle::{JointInput, JointType};
use crate::engine::bearing::{bearing_surface, explicit_bearing, HeadType, HoleSeries, Washer};
use crate::engine::checks::TappedHole;
use crate::engine::grade::{find_property_class, strength_for};
use crate::engine::material::{find_material, min_engagement_factor};
use crate::engine::method::TighteningMethod;
use crate::engine::plausible;
use crate::engine::spec::{SpecFlags, SpecInput, WindowMode};
use crate::engine::thread::parse_designation;
use crate::engine::EngineError;
use crate::http::error::ApiError;
use crate::http::quantity::Quantity;

use super::caching::content_hash;
use super::friction::{resolve_friction, FrictionOrigin, ResolvedFriction};
use super::item_error::{ItemError, ItemErrors};
use super::request::{SpecRequest, Units};

/// Default tightening method when the request names none.
pub const DEFAULT_METHOD: TighteningMethod = TighteningMethod::ClickWrench;

/// A request read and resolved, ready for `engine::spec::compute`.
#[derive(Debug, Clone)]
pub struct Resolved {
    pub input: SpecInput,
    pub friction: ResolvedFriction,
    pub units: Units,
    /// Catalogue revision answered from.
    pub revision: i64,
    /// True when the request named a catalogue revision.
    pub pinned: bool,
    /// SHA-256 hex of the normalised request and revision.
    pub content_hash: String,
}

/// The request after defaults, in normal spellings and SI numbers: what the
/// content hash is computed from. Field order is fixed by this struct.
#[derive(Serialize)]
struct Normalised<'a> {
    thread: &'a str,
    property_class: &'a str,
    finish: Option<&'a str>,
    lubricant: Option<&'a str>,
    thread_friction: [f64; 2],
    thread_friction_origin: Origin,
    bearing_friction: [f64; 2],
    bearing_friction_origin: Origin,
    tightening_method: &'static str,
    tool_scatter: Option<f64>,
    bearing_mm: [f64; 2],
    head: Option<&'static str>,
    washer: Option<&'static str>,
    hole: Option<&'static str>,
    utilisation: Option<f64>,
    prevailing_torque_nm: Option<f64>,
    clamp_length_mm: Option<f64>,
    clamped_material: Option<&'a str>,
    joint_outer_diameter_mm: Option<f64>,
    joint_type: Option<&'static str>,
    snug_torque_nm: Option<f64>,
    engagement_length_mm: Option<f64>,
    required_clamp_load_n: Option<f64>,
    window_mode: &'static str,
}

#[derive(Serialize)]
enum Origin {
    Request,
    Catalogue(i64, i64),
}

fn origin(o: &FrictionOrigin) -> Origin {
    match o {
        FrictionOrigin::Request => Origin::Request,
        FrictionOrigin::Catalogue {
            entry_id,
            entry_revision,
            ..
        } => Origin::Catalogue(*entry_id, *entry_revision),
    }
}

/// Request field for an engine field name.
fn request_field(engine_field: &str) -> &str {
    match engine_field {
        "method" => "tightening_method",
        "scatter" => "tool_scatter",
        "joint.type" => "joint_type",
        "joint.outer_diameter" => "joint_outer_diameter",
        "joint.snug_torque" => "snug_torque",
        "joint.clamp_length" => "clamp_length",
        "joint.engagement_length" => "engagement_length",
        "joint.clamped_material" | "clamped_material" => "clamped_material",
        other => other,
    }
}

/// An engine error as an item problem named by its request field.
pub fn from_engine(e: EngineError) -> ItemError {
    let mut item = ItemError::from(e);
    let renamed = request_field(&item.field);
    if renamed != item.field {
        item.field = renamed.to_string();
    }
    item
}

/// Collects `r` into `problems`, returning the value if it was good.
fn keep<T>(r: Result<T, ItemError>, problems: &mut Vec<ItemError>) -> Option<T> {
    match r {
        Ok(v) => Some(v),
        Err(e) => {
            problems.push(e);
            None
        }
    }
}

fn engine<T>(r: Result<T, EngineError>, problems: &mut Vec<ItemError>) -> Option<T> {
    keep(r.map_err(from_engine), problems)
}

fn api<T>(r: Result<T, ApiError>, problems: &mut Vec<ItemError>) -> Option<T> {
    match r {
        Ok(v) => Some(v),
        Err(e) => {
            problems.extend(ItemError::from_api(&e));
            None
        }
    }
}

fn window_mode(text: Option<&str>) -> Result<WindowMode, ItemError> {
    match text.map(str::trim) {
        None | Some("maximum-preload") => Ok(WindowMode::MaximumPreload),
        Some("minimum-clamp-load") => Ok(WindowMode::MinimumClampLoad),
        Some(other) => Err(ItemError::new(
            super::ErrorClass::Unknown,
            "window_mode",
            format!("unknown window mode '{other}'"),
        )
        .with_suggestions(vec!["maximum-preload".into(), "minimum-clamp-load".into()])),
    }
}

fn window_mode_id(m: WindowMode) -> &'static str {
    match m {
        WindowMode::MaximumPreload => "maximum-preload",
        WindowMode::MinimumClampLoad => "minimum-clamp-load",
    }
}

/// The friction source in words, for the engine's `friction_source`.
fn friction_words(f: &ResolvedFriction, revision: i64) -> String {
    let words = |o: &FrictionOrigin| match o {
        FrictionOrigin::Request => "given in the request".to_string(),
        FrictionOrigin::Catalogue {
            entry_id,
            entry_revision,
            ..
        } => format!(
            "from catalogue revision {revision}, entry {entry_id} (changed in revision \
             {entry_revision}; its source is in friction.catalogue_entry)"
        ),
    };
    if f.thread_origin == f.bearing_origin {
        format!("thread and bearing friction {}", words(&f.thread_origin))
    } else {
        format!(
            "thread friction {}; bearing friction {}",
            words(&f.thread_origin),
            words(&f.bearing_origin)
        )
    }
}

/// Reads `req` against `snapshot` into the engine's input.
pub fn resolve(req: &SpecRequest, snapshot: &Snapshot) -> Result<Resolved, ItemErrors> {
    let mut p: Vec<ItemError> = Vec::new();
    let revision = snapshot.revision;

    let thread = engine(parse_designation(&req.thread), &mut p);
    let strength = match &thread {
        Some(t) => engine(strength_for(&req.property_class, t), &mut p),
        None => {
            // Still report an unknown grade alongside a bad thread.
            engine(find_property_class(&req.property_class), &mut p);
            None
        }
    };

    let head = match req.head.as_deref() {
        Some(h) => engine(h.parse::<HeadType>(), &mut p),
        None => Some(HeadType::HexagonHead),
    };
    let washer = match req.washer.as_deref() {
        Some(w) => engine(w.parse::<Washer>(), &mut p),
        None => Some(Washer::None),
    };
    let hole = match req.hole.as_deref() {
        Some(h) => engine(h.parse::<HoleSeries>(), &mut p),
        None => Some(HoleSeries::Medium),
    };
    let bearing = match (&req.bearing, &thread) {
        (Some(b), _) => {
            let outer = api(b.outer_diameter.to_length("bearing.outer_diameter"), &mut p);
            let inner = api(b.inner_diameter.to_length("bearing.inner_diameter"), &mut p);
            match (outer, inner) {
                (Some(o), Some(i)) => engine(explicit_bearing(o, i), &mut p),
                _ => None,
            }
        }
        (None, Some(t)) => match (head, washer, hole) {
            (Some(h), Some(w), Some(s)) => engine(bearing_surface(t, h, w, s), &mut p),
            _ => None,
        },
        (None, None) => None,
    };

    let method = match req.tightening_method.as_deref() {
        Some(m) => engine(m.parse::<TighteningMethod>(), &mut p),
        None => Some(DEFAULT_METHOD),
    };
    let mode = keep(window_mode(req.window_mode.as_deref()), &mut p);

    let torque = |field: &str, q: &Option<Quantity>, p: &mut Vec<ItemError>| -> Option<Torque> {
        q.as_ref().and_then(|q| api(q.to_torque(field), p))
    };
    let length = |field: &str, q: &Option<Quantity>, p: &mut Vec<ItemError>| -> Option<Length> {
        q.as_ref().and_then(|q| api(q.to_length(field), p))
    };
    let prevailing_torque = torque("prevailing_torque", &req.prevailing_torque, &mut p);
    let snug_torque = torque("snug_torque", &req.snug_torque, &mut p);
    let clamp_length = length("clamp_length", &req.clamp_length, &mut p);
    let joint_outer = length("joint_outer_diameter", &req.joint_outer_diameter, &mut p);
    let engagement = length("engagement_length", &req.engagement_length, &mut p);
    let required_clamp_load: Option<Force> = req
        .required_clamp_load
        .as_ref()
        .and_then(|q| api(q.to_force("required_clamp_load"), &mut p));
    let joint_type = match req.joint_type.as_deref() {
        Some(j) => engine(j.parse::<JointType>(), &mut p),
        None => None,
    };
    let material = match req.clamped_material.as_deref() {
        Some(m) => engine(find_material(m), &mut p),
        None => None,
    };

    let friction = resolve_friction(req, snapshot, &mut p);

    if !p.is_empty() {
        return Err(ItemErrors(p));
    }
    // Every `None` below is an input the request left out (problems would
    // have returned above); a missing required part cannot remain.
    let (Some(thread), Some(strength), Some(bearing), Some(method), Some(mode), Some(friction)) =
        (thread, strength, bearing, method, mode, friction)
    else {
        return Err(ItemError::malformed("thread", "the request could not be read").into());
    };

    let joint_given = clamp_length.is_some()
        || joint_outer.is_some()
        || joint_type.is_some()
        || snug_torque.is_some();
    let joint = joint_given.then(|| JointInput {
        clamp_length,
        joint_type: joint_type.unwrap_or(JointType::ThroughBolted),
        clamped_modulus: None,
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: joint_outer,
        socket_head: head == Some(HeadType::SocketHead) && req.bearing.is_none(),
        shank_sections: Vec::new(),
        snug_torque,
    });
    let tapped_hole = match (engagement, &material) {
        (Some(len), Some(m)) => {
            let factor = engine(min_engagement_factor(m, &strength, &thread), &mut p);
            factor.map(|f| TappedHole {
                engagement_length: len,
                min_engagement_factor: f.factor,
            })
        }
        (Some(_), None) => {
            p.push(ItemError::invalid(
                "clamped_material",
                "needed with engagement_length: the minimum engagement depends on the \
                 tapped part's material",
            ));
            None
        }
        _ => None,
    };
    if !p.is_empty() {
        return Err(ItemErrors(p));
    }

    let normalised = Normalised {
        thread: &thread.designation,
        property_class: &strength.id,
        finish: friction.finish.as_deref(),
        lubricant: friction.lubricant.as_deref(),
        thread_friction: [friction.thread.min(), friction.thread.max()],
        thread_friction_origin: origin(&friction.thread_origin),
        bearing_friction: [friction.bearing.min(), friction.bearing.max()],
        bearing_friction_origin: origin(&friction.bearing_origin),
        tightening_method: method.id(),
        tool_scatter: req.tool_scatter,
        bearing_mm: [
            bearing.outer_diameter.get::<millimeter>(),
            bearing.inner_diameter.get::<millimeter>(),
        ],
        head: req
            .bearing
            .is_none()
            .then(|| head.map(|h| h.id()))
            .flatten(),
        washer: req
            .bearing
            .is_none()
            .then(|| washer.map(|w| w.id()))
            .flatten(),
        hole: req
            .bearing
            .is_none()
            .then(|| hole.map(|h| h.id()))
            .flatten(),
        utilisation: req.utilisation,
        prevailing_torque_nm: prevailing_torque.map(|t| t.get::<newton_meter>()),
        clamp_length_mm: clamp_length.map(|l| l.get::<millimeter>()),
        clamped_material: material.as_ref().map(|m| m.id.as_str()),
        joint_outer_diameter_mm: joint_outer.map(|l| l.get::<millimeter>()),
        joint_type: joint.as_ref().map(|j| j.joint_type.id()),
        snug_torque_nm: snug_torque.map(|t| t.get::<newton_meter>()),
        engagement_length_mm: engagement.map(|l| l.get::<millimeter>()),
        required_clamp_load_n: required_clamp_load.map(|f| f.get::<newton>()),
        window_mode: window_mode_id(mode),
    };
    let bytes = serde_json::to_vec(&normalised).map_err(|e| {
        ItemErrors::from(ItemError::malformed(
            "thread",
            format!("the request could not be normalised: {e}"),
        ))
    })?;
    let hash = content_hash(&bytes, revision);

    let flags = SpecFlags {
        electroplated: friction.electroplated,
        hot_dip_galvanized: friction.hot_dip_galvanized,
        acid_cleaned: friction.acid_cleaned,
        dry: friction.dry,
        measured_thread_friction: friction.catalogue_ranges.map(|(t, _)| t),
        measured_bearing_friction: friction.catalogue_ranges.map(|(_, b)| b),
    };
    let input = SpecInput {
        thread,
        strength,
        bearing,
        thread_friction: friction.thread,
        bearing_friction: friction.bearing,
        friction_source: friction_words(&friction, revision),
        method,
        scatter: req.tool_scatter,
        utilisation: req.utilisation,
        prevailing_torque,
        clamped_material: material,
        joint,
        tapped_hole,
        required_clamp_load,
        window_mode: mode,
        flags,
    };
    let implausible: Vec<ItemError> = plausible::problems(&input)
        .into_iter()
        .map(from_engine)
        .collect();
    if !implausible.is_empty() {
        return Err(ItemErrors(implausible));
    }
    Ok(Resolved {
        input,
        friction,
        units: req.units.unwrap_or_default(),
        revision,
        pinned: req.catalogue_revision.is_some(),
        content_hash: hash,
    })
}

#[cfg(test)]
mod tests;
