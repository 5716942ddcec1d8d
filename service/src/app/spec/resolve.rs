//! The parse step: a [`SpecRequest`] and a catalogue snapshot in, the
//! engine's validated [`SpecInput`] out, with the friction provenance and the
//! content hash that identifies the spec. Names are turned into engine types
//! through the engine's own look-ups; nothing here computes.
//!
//! Every problem is collected, so a client sees all bad fields at once.
//! Engine field names are mapped to the request's names where they differ
//! (`method` → `tightening_method`, `joint.snug_torque` → `snug_torque`, ...).
//! The parts are read in `parts`, the bolt and its shank inside the clamp
//! length in `bolt`; the identity is written in `normalised`;
//! tests are in `resolve/tests.rs`.

use uom::si::force::newton;
use uom::si::length::millimeter;
use uom::si::torque::newton_meter;

use crate::app::quantity::Units;
use crate::app::{AppError, FieldProblem};
use crate::catalogue::Snapshot;
use crate::engine::angle::JointType;
use crate::engine::method::TighteningMethod;
use crate::engine::plausible;
use crate::engine::spec::{SpecFlags, SpecInput};
use crate::engine::EngineError;

use super::friction::{resolve_friction, ResolvedFriction};
use super::request::SpecRequest;

mod bolt;
mod joint_model;
mod mating;
mod normalised;
mod parts;

pub use normalised::{answer_hash, content_hash};
use normalised::{friction_words, origin, Normalised, NormalisedBolt};
use parts::{keep, Problems, Quantities};

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

/// Request field for an engine field name.
fn request_field(engine_field: &str) -> &str {
    match engine_field {
        "method" => "tightening_method",
        "scatter" => "tool_scatter",
        "joint.type" => "joint_type",
        "joint.outer_diameter" => "joint_outer_diameter",
        "joint.snug_torque" => "snug_torque",
        "joint.clamp_length" | "joint" => "clamp_length",
        "joint.engagement_length" => "engagement_length",
        "joint.clamped_material" | "clamped_material" => "clamped_material",
        other => other,
    }
}

/// An engine error as a field problem named by its request field.
pub fn from_engine(e: EngineError) -> FieldProblem {
    let mut problem = FieldProblem::from(e);
    let renamed = request_field(&problem.field);
    if renamed != problem.field {
        problem.field = renamed.to_string();
    }
    problem
}

/// An engine error of `req` named by its request field; with a stack the
/// clamp length is the stack's (`clamped_parts`).
pub fn from_engine_for(req: &SpecRequest, e: EngineError) -> FieldProblem {
    let mut problem = from_engine(e);
    if req.clamped_parts.is_some() && problem.field == "clamp_length" {
        problem.field = "clamped_parts".to_string();
    }
    problem
}

fn refused(p: Problems) -> Result<(), AppError> {
    if p.is_empty() {
        Ok(())
    } else {
        Err(AppError::Fields(p))
    }
}

/// Reads `req` against `snapshot` into the engine's input.
pub fn resolve(req: &SpecRequest, snapshot: &Snapshot) -> Result<Resolved, AppError> {
    let mut p: Problems = Vec::new();
    let revision = snapshot.revision;

    let (thread, strength) = parts::fastener(req, &mut p);
    let (bearing_parts, bearing) = parts::bearing(req, thread.as_ref(), &mut p);
    let method = parts::method(req, &mut p);
    let mode = keep(parts::window_mode(req.window_mode.as_deref()), &mut p);
    let q = Quantities::read(req, &mut p);
    let (joint_type, material) = parts::joint_names(req, &mut p);
    let joint_type = mating::joint_type(req, joint_type, &mut p);
    let tapped_material = mating::tapped_material(req, &mut p);
    let friction = resolve_friction(req, snapshot, &mut p);
    let described = bolt::described(req, thread.as_ref(), bearing_parts.head, &mut p);
    let model = joint_model::read(req, &mut p);
    refused(p)?;

    // Every `None` below is an input the request left out (problems would
    // have returned above); a missing required part cannot remain.
    let (Some(thread), Some(strength), Some(bearing), Some(method), Some(mode), Some(friction)) =
        (thread, strength, bearing, method, mode, friction)
    else {
        return Err(FieldProblem::malformed("thread", "the request could not be read").into());
    };

    let mut joint = parts::joint(req, &q, joint_type, bearing_parts.head);
    // A stack's clamp length is its thickness; its head-side layer carries
    // the bearing's surface pressure.
    let stack_length = model.clamp_length();
    if let (Some(lk), Some(j)) = (stack_length, joint.as_mut()) {
        j.clamp_length = Some(lk);
    }
    let shorthand_material = material.clone();
    let material = material.or_else(|| model.materials.first().cloned());
    let mut p: Problems = Vec::new();
    let mating = mating::mating(
        req,
        mating::MatingInput {
            thread: &thread,
            strength: &strength,
            joint_type,
            // The shorthand plate's material stands for the tapped part when
            // no tapped_part is named; a stack's layers never do.
            clamped: shorthand_material.as_ref(),
            tapped: tapped_material,
            engagement: q.engagement,
            permissible_torque: q.permissible_torque,
            washer: bearing_parts.washer,
            hole: bearing_parts.hole,
        },
        &mut p,
    );
    if stack_length.is_some() && q.engagement.is_some() && mating.parts.tapped_part.is_none() {
        // The stack's layers are clamped plates; the tapped part below them
        // is not one of them.
        p.retain(|x| x.field != "clamped_material");
        p.push(FieldProblem::invalid(
            "tapped_part.material",
            "needed with clamped_parts and engagement_length: the stripping check depends on \
             the tapped part's material, and the stack's layers are the clamped plates",
        ));
    }
    if let (Some(j), Some(t)) = (joint.as_mut(), &mating.parts.tapped_part) {
        // The thread's other side is the tapped part, not the clamped one.
        j.nut_modulus = Some(t.elastic_modulus);
    }
    // The described bolt's shank inside the clamp length goes into δ_S.
    let mut bolt_described = false;
    if let (Some(b), Some(j)) = (&described, joint.as_mut()) {
        if let Some(lk) = j.clamp_length {
            let tapped = j.joint_type == JointType::TappedHole;
            let engagement = q.engagement.filter(|_| tapped);
            if let Some(c) = bolt::clamped(b, &thread, lk, engagement, &mut p) {
                j.shank_sections = c.shank_sections;
                j.socket_head = c.socket_head;
                bolt_described = true;
            }
        }
    }
    refused(p)?;

    let tables = req.bearing.is_none();
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
        head: tables.then(|| bearing_parts.head.map(|h| h.id())).flatten(),
        washer: tables
            .then(|| bearing_parts.washer.map(|w| w.id()))
            .flatten(),
        hole: tables.then(|| bearing_parts.hole.map(|h| h.id())).flatten(),
        utilisation: req.utilisation,
        prevailing_torque_nm: q.prevailing_torque.map(|t| t.get::<newton_meter>()),
        clamp_length_mm: q.clamp_length.map(|l| l.get::<millimeter>()),
        joint_model: joint_model::NormalisedJointModel::of(&model),
        clamped_material: material.as_ref().map(|m| m.id.as_str()),
        joint_outer_diameter_mm: q.joint_outer.map(|l| l.get::<millimeter>()),
        joint_type: joint.as_ref().map(|j| j.joint_type.id()),
        snug_torque_nm: q.snug_torque.map(|t| t.get::<newton_meter>()),
        engagement_length_mm: q.engagement.map(|l| l.get::<millimeter>()),
        required_clamp_load_n: q.required_clamp_load.map(|f| f.get::<newton>()),
        window_mode: parts::window_mode_id(mode),
        bolt: described.as_ref().map(NormalisedBolt::from),
        tapped_part_material: mating.parts.tapped_part.as_ref().map(|m| m.id.as_str()),
        nut_property_class: mating.parts.nut.as_ref().map(|n| n.id),
        permissible_torque_nm: q.permissible_torque.map(|t| t.get::<newton_meter>()),
        friction_joint_tag: friction.scope.as_ref().and_then(|s| s.joint_tag.as_deref()),
    };
    let bytes = serde_json::to_vec(&normalised).map_err(|e| {
        AppError::field(FieldProblem::malformed(
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
        bolt_described,
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
        prevailing_torque: q.prevailing_torque,
        clamped_material: material,
        joint,
        tapped_hole: mating.tapped_hole,
        parts: mating.parts,
        required_clamp_load: q.required_clamp_load,
        window_mode: mode,
        flags,
        joint_model: model.input,
    };
    refused(
        plausible::problems(&input)
            .into_iter()
            .map(|e| from_engine_for(req, e))
            .collect(),
    )?;
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
