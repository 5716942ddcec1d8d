//! The bolt of a spec request: `bolt` read into the engine's [`BoltInput`]
//! and validated against the thread, then the part of it inside the clamp
//! length (its shank sections) that goes into the joint's resilience.

use uom::si::f64::Length;

use crate::app::FieldProblem;
use crate::engine::angle::ShankSection;
use crate::engine::bearing::HeadType;
use crate::engine::joint::bolt::{
    bolt, in_clamp_length, Bolt, BoltInput, BoltStandard, ClampedBolt, MAX_SHANK_SECTIONS,
};
use crate::engine::thread::ThreadGeometry;

use super::super::request::SpecRequest;
use super::parts::{engine, keep, Problems};

/// Nut height m taken as 0.8·d beyond the clamp length when the bolt's
/// length is checked (common practice; ISO 4032 regular nuts are about
/// 0.8–0.9·d high, recalled from memory).
const NUT_HEIGHT_PER_D: f64 = 0.8;

/// The described bolt, validated against `thread` (`None` when not given or
/// not readable; problems are recorded).
pub(super) fn described(
    req: &SpecRequest,
    thread: Option<&ThreadGeometry>,
    head: Option<HeadType>,
    p: &mut Problems,
) -> Option<Bolt> {
    let b = req.bolt.as_ref()?;
    let length = match &b.length {
        Some(q) => keep(q.to_length("bolt.length"), p),
        None => {
            p.push(FieldProblem::malformed(
                "bolt.length",
                "give the bolt's length under the head",
            ));
            None
        }
    };
    let input = match b.standard.as_deref() {
        Some(s) => {
            if b.thread_length.is_some() {
                p.push(FieldProblem::invalid(
                    "bolt.thread_length",
                    "not with bolt.standard: the standard gives the thread length",
                ));
            }
            if b.shank_sections.is_some() {
                p.push(FieldProblem::invalid(
                    "bolt.shank_sections",
                    "not with bolt.standard: describe a waisted bolt by its lengths",
                ));
            }
            let standard = engine(s.parse::<BoltStandard>(), p);
            BoltInput::Standard {
                standard: standard?,
                length: length?,
            }
        }
        None => {
            let thread_length = match &b.thread_length {
                Some(q) => keep(q.to_length("bolt.thread_length"), p),
                None => {
                    p.push(FieldProblem::malformed(
                        "bolt.thread_length",
                        "give the thread length, or a bolt.standard that gives it",
                    ));
                    None
                }
            };
            let sections = b.shank_sections.as_deref().unwrap_or_default();
            if sections.len() > MAX_SHANK_SECTIONS {
                p.push(FieldProblem::invalid(
                    "bolt.shank_sections",
                    format!(
                        "{} shank sections given, at most {MAX_SHANK_SECTIONS} are accepted",
                        sections.len()
                    ),
                ));
                return None;
            }
            let mut shank_sections = Vec::with_capacity(sections.len());
            for (i, s) in sections.iter().enumerate() {
                let l = keep(
                    s.length
                        .to_length(&format!("bolt.shank_sections[{i}].length")),
                    p,
                );
                let d = keep(
                    s.diameter
                        .to_length(&format!("bolt.shank_sections[{i}].diameter")),
                    p,
                );
                if let (Some(length), Some(diameter)) = (l, d) {
                    shank_sections.push(ShankSection { length, diameter });
                }
            }
            if shank_sections.len() != sections.len() {
                return None;
            }
            BoltInput::Explicit {
                length: length?,
                thread_length: thread_length?,
                shank_sections,
                socket_head: head == Some(HeadType::SocketHead),
            }
        }
    };
    engine(bolt(thread?, &input), p)
}

/// The bolt inside the clamp length `lk`, with the nut (0.8·d) or the
/// tapped hole's engagement length beyond it.
pub(super) fn clamped(
    bolt_: &Bolt,
    thread: &ThreadGeometry,
    lk: Length,
    engagement: Option<Length>,
    p: &mut Problems,
) -> Option<ClampedBolt> {
    let (beyond, field) = match engagement {
        Some(e) => (e, "joint.engagement_length"),
        None => (thread.nominal_diameter * NUT_HEIGHT_PER_D, "bolt.length"),
    };
    engine(in_clamp_length(bolt_, lk, beyond, field), p)
}
