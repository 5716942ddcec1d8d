//! The identity of a spec: the request after defaults, in normal spellings
//! and SI numbers, serialised in a fixed field order and hashed with the
//! catalogue revision (SHA-256, lower-case hex): the content hash, the base
//! of a look-up's ETag. An answer's `spec_hash` ([`answer_hash`]) adds what
//! else changes the answer: its presentation (unit system; a tool's torque
//! unit, resolutions and accepted checks), the engine method version and
//! the service version.

use serde::Serialize;
use sha2::{Digest, Sha256};
use uom::si::length::millimeter;

use crate::engine::joint::bolt::Bolt;

use super::super::friction::{FrictionOrigin, ResolvedFriction};

/// The request after defaults: what the content hash is computed from.
/// Field order is fixed by this struct.
#[derive(Serialize)]
pub(super) struct Normalised<'a> {
    pub thread: &'a str,
    pub property_class: &'a str,
    pub finish: Option<&'a str>,
    pub lubricant: Option<&'a str>,
    pub thread_friction: [f64; 2],
    pub thread_friction_origin: Origin,
    pub bearing_friction: [f64; 2],
    pub bearing_friction_origin: Origin,
    pub tightening_method: &'static str,
    pub tool_scatter: Option<f64>,
    pub bearing_mm: [f64; 2],
    pub head: Option<&'static str>,
    pub washer: Option<&'static str>,
    pub hole: Option<&'static str>,
    pub utilisation: Option<f64>,
    pub prevailing_torque_nm: Option<f64>,
    pub clamp_length_mm: Option<f64>,
    /// Left out when none of the joint model's fields is given (older
    /// hashes unchanged).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub joint_model: Option<super::joint_model::NormalisedJointModel>,
    pub clamped_material: Option<&'a str>,
    pub joint_outer_diameter_mm: Option<f64>,
    pub joint_type: Option<&'static str>,
    pub snug_torque_nm: Option<f64>,
    pub engagement_length_mm: Option<f64>,
    pub required_clamp_load_n: Option<f64>,
    pub window_mode: &'static str,
    /// Left out when no bolt is described, so the hash of a request without
    /// `bolt` is what it was before `bolt` existed.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub bolt: Option<NormalisedBolt>,
    /// The tapped part's material, the nut class and the permissible torque
    /// from a test; each left out when not given (earlier hashes unchanged).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tapped_part_material: Option<&'a str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub nut_property_class: Option<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub permissible_torque_nm: Option<f64>,
    /// The joint tag that chose the catalogue entry used (a tag-scoped
    /// entry); left out for the generic entry or no catalogue values, so
    /// only a tag that changed the look-up changes the hash.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub friction_joint_tag: Option<&'a str>,
}

/// The described bolt after validation: lengths in mm, the shank sections
/// from under the head as `[length, diameter]`. A standard bolt and the same
/// bolt given by its lengths are one spec.
#[derive(Serialize)]
pub(super) struct NormalisedBolt {
    pub length_mm: f64,
    pub thread_length_mm: f64,
    pub shank_mm: Vec<[f64; 2]>,
    pub socket_head: bool,
}

impl From<&Bolt> for NormalisedBolt {
    fn from(b: &Bolt) -> Self {
        Self {
            length_mm: b.length.get::<millimeter>(),
            thread_length_mm: b.thread_length.get::<millimeter>(),
            shank_mm: b
                .shank
                .iter()
                .map(|s| [s.length.get::<millimeter>(), s.diameter.get::<millimeter>()])
                .collect(),
            socket_head: b.socket_head,
        }
    }
}

#[derive(Serialize)]
pub(super) enum Origin {
    Request,
    Catalogue(i64, i64),
}

pub(super) fn origin(o: &FrictionOrigin) -> Origin {
    match o {
        FrictionOrigin::Request => Origin::Request,
        FrictionOrigin::Catalogue {
            entry_id,
            entry_revision,
            ..
        } => Origin::Catalogue(*entry_id, *entry_revision),
    }
}

/// SHA-256 (lower-case hex) of the normalised request bytes and the revision.
pub fn content_hash(normalised: &[u8], revision: i64) -> String {
    let mut h = Sha256::new();
    h.update(normalised);
    h.update(b"|catalogue_revision=");
    h.update(revision.to_string().as_bytes());
    hex::encode(h.finalize())
}

/// The `spec_hash` of an answer: SHA-256 (lower-case hex) of the content
/// hash, the answer's presentation, the engine method version and the
/// service version. Two answers that differ in any input share no hash
/// (102.2 N·m and 75 lbf·ft of one spec are two hashes).
pub fn answer_hash(content_hash: &str, presentation: &str) -> String {
    let mut h = Sha256::new();
    h.update(content_hash.as_bytes());
    h.update(b"|presentation=");
    h.update(presentation.as_bytes());
    h.update(b"|method_version=");
    h.update(crate::engine::METHOD_VERSION.as_bytes());
    h.update(b"|service_version=");
    h.update(env!("CARGO_PKG_VERSION").as_bytes());
    hex::encode(h.finalize())
}

/// The friction source in words, for the engine's `friction_source`.
pub(super) fn friction_words(f: &ResolvedFriction, revision: i64) -> String {
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

#[cfg(test)]
mod tests {
    use super::{answer_hash, content_hash};

    #[test]
    fn an_answer_hash_depends_on_its_presentation() {
        let c = content_hash(b"{\"thread\":\"M10\"}", 1);
        let a = answer_hash(&c, "units=si");
        assert_eq!(a.len(), 64);
        assert_ne!(a, c);
        assert_ne!(a, answer_hash(&c, "units=us"));
        assert_eq!(a, answer_hash(&c, "units=si"));
    }

    #[test]
    fn hash_depends_on_request_and_revision() {
        let a = content_hash(b"{\"thread\":\"M10\"}", 1);
        assert_eq!(a.len(), 64);
        assert_ne!(a, content_hash(b"{\"thread\":\"M10\"}", 2));
        assert_ne!(a, content_hash(b"{\"thread\":\"M12\"}", 1));
        assert_eq!(a, content_hash(b"{\"thread\":\"M10\"}", 1));
    }
}
