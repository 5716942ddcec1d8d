//! The bolt's partners in a spec request: the tapped part (its own material,
//! defaulting to `clamped_material`), the nut's class, the washer the tables
//! put under the head, the permissible torque from a joint test, and the
//! tapped hole whose thread engagement is checked (always for a tapped
//! hole: the given engagement length or the stated default).

use uom::si::f64::{Length, Torque};

use crate::app::FieldProblem;
use crate::engine::angle::JointType;
use crate::engine::bearing::{washer_bearing, HoleSeries, Washer};
use crate::engine::checks::{MatingParts, TappedHole, DEFAULT_TAPPED_ENGAGEMENT_PER_D};
use crate::engine::grade::Strength;
use crate::engine::material::{
    find_material, min_engagement_factor, ClampedMaterial, MaterialKind,
};
use crate::engine::nut::nut_strength;
use crate::engine::thread::ThreadGeometry;

use super::super::request::SpecRequest;
use super::parts::{engine, keep, Problems};

/// The tapped part's material as named in `tapped_part.material`.
pub(super) fn tapped_material(req: &SpecRequest, p: &mut Problems) -> Option<ClampedMaterial> {
    let t = req.tapped_part.as_ref()?;
    keep(
        find_material(&t.material).map_err(|e| {
            let mut f = FieldProblem::from(e);
            f.field = "tapped_part.material".into();
            f
        }),
        p,
    )
}

/// The joint type after `tapped_part` and `nut`: a tapped part makes the
/// joint tapped; a nut on a tapped hole, or a tapped part on a joint named
/// through-bolted, is refused.
pub(super) fn joint_type(
    req: &SpecRequest,
    named: Option<JointType>,
    p: &mut Problems,
) -> Option<JointType> {
    let tapped = req.tapped_part.is_some();
    match named {
        Some(JointType::ThroughBolted) if tapped => {
            p.push(FieldProblem::invalid(
                "tapped_part",
                "a through-bolted joint has no tapped part; leave joint_type out or give \
                 tapped-hole",
            ));
            named
        }
        Some(JointType::TappedHole) | None if req.nut.is_some() && (tapped || named.is_some()) => {
            p.push(FieldProblem::invalid(
                "nut",
                "a tapped-hole joint has no nut; the tapped part's thread is checked instead",
            ));
            named
        }
        None if tapped => Some(JointType::TappedHole),
        other => other,
    }
}

/// Everything the engine's `MatingParts` and `TappedHole` need.
pub(super) struct Mating {
    pub parts: MatingParts,
    pub tapped_hole: Option<TappedHole>,
}

pub(super) struct MatingInput<'a> {
    pub thread: &'a ThreadGeometry,
    pub strength: &'a Strength,
    pub joint_type: Option<JointType>,
    pub clamped: Option<&'a ClampedMaterial>,
    pub tapped: Option<ClampedMaterial>,
    pub engagement: Option<Length>,
    pub permissible_torque: Option<Torque>,
    pub washer: Option<Washer>,
    pub hole: Option<HoleSeries>,
}

pub(super) fn mating(req: &SpecRequest, m: MatingInput, p: &mut Problems) -> Mating {
    let nut = req
        .nut
        .as_ref()
        .and_then(|n| engine(nut_strength(&n.property_class, m.thread), p));
    let washer = match (&req.bearing, m.washer, m.hole) {
        (None, Some(w), Some(h)) => engine(washer_bearing(m.thread, w, h), p).flatten(),
        _ => None,
    };
    let is_tapped = m.joint_type == Some(JointType::TappedHole) || m.engagement.is_some();
    let material = m.tapped.clone().or_else(|| m.clamped.cloned());
    let mut tapped_material_unknown = false;
    let tapped_hole = match (is_tapped, &material) {
        (false, _) => None,
        (true, Some(mat)) if mat.kind != MaterialKind::Metal => None,
        (true, Some(mat)) => {
            let factor = engine(min_engagement_factor(mat, m.strength, m.thread), p);
            let default = m.thread.nominal_diameter * DEFAULT_TAPPED_ENGAGEMENT_PER_D;
            factor.map(|f| TappedHole {
                engagement_length: m.engagement.unwrap_or(default),
                min_engagement_factor: f.factor,
                engagement_given: m.engagement.is_some(),
            })
        }
        (true, None) if m.engagement.is_some() => {
            p.push(FieldProblem::invalid(
                "clamped_material",
                "needed with engagement_length: the minimum engagement depends on the \
                 tapped part's material (tapped_part.material or clamped_material)",
            ));
            None
        }
        (true, None) => {
            tapped_material_unknown = true;
            None
        }
    };
    Mating {
        parts: MatingParts {
            nut,
            tapped_part: m.tapped,
            tapped_material_unknown,
            washer,
            permissible_torque: m.permissible_torque,
            friction_given: req.thread_friction.is_some() && req.bearing_friction.is_some(),
        },
        tapped_hole,
    }
}
