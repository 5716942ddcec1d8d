//! One joint's active release compared with the joint computed against a
//! catalogue: the figures and check codes before and after.

use super::figures::{change_percent, read_stored, ImpactFigures};
use super::AppError;
use super::JointImpact;
use crate::app::joints::joint_spec_request;
use crate::app::spec::setpoints::setpoints;
use crate::app::spec::tool::{torque_unit, ToolAsk};
use crate::app::spec::view::{spec_response, SetpointResponse};
use crate::app::spec::{compute_one, SpecRequest};
use crate::catalogue::Snapshot;
use crate::engine::checks::CODES;
use crate::registry::{Joint, Release};

/// The setpoint answer (every check accepted) and the spec answer of joint
/// `joint` computed against `snap`, or why it does not compute.
pub(super) fn answers(
    joint: &Joint,
    snap: &Snapshot,
) -> Result<(SetpointResponse, String), String> {
    let mut req: SpecRequest =
        joint_spec_request(&joint.request, &joint.tags).map_err(|e| e.to_string())?;
    req.catalogue_revision = None;
    let describe = |e: AppError| {
        e.problems()
            .iter()
            .map(|p| format!("{}: {}", p.field, p.reason))
            .collect::<Vec<_>>()
            .join("; ")
    };
    let (resolved, spec) = compute_one(&req, snap).map_err(describe)?;
    let unit = torque_unit(joint.setpoints.torque_unit.as_deref()).map_err(|p| p.reason)?;
    let tool = ToolAsk {
        unit,
        resolution: joint.setpoints.resolution,
        angle_resolution: joint.setpoints.angle_resolution,
        accept: CODES.to_vec(),
    };
    let answer = setpoints(&spec, &resolved, &tool, false).map_err(describe)?;
    let p = serde_json::to_string(&spec_response(&spec, &resolved, false))
        .map_err(|e| e.to_string())?;
    Ok((answer, p))
}

/// The figures of a setpoint and spec answer computed now, read from their
/// JSON exactly as a release's stored answers are (like with like).
pub(super) fn figures_of(
    answer: &SetpointResponse,
    spec: &str,
) -> Result<(ImpactFigures, Vec<String>), String> {
    let s = serde_json::to_string(answer).map_err(|e| e.to_string())?;
    read_stored(&s, spec).ok_or_else(|| "the computed answer lacks a figure".into())
}

/// The figures and check codes of joint `joint` computed against `snap`
/// (every check accepted: the impact reports checks, it does not refuse).
pub fn compute(joint: &Joint, snap: &Snapshot) -> Result<(ImpactFigures, Vec<String>), String> {
    let (answer, spec) = answers(joint, snap)?;
    figures_of(&answer, &spec)
}

/// Joint `joint`'s release compared with the joint computed against `snap`.
pub fn compare(joint: &Joint, release: &Release, snap: &Snapshot) -> JointImpact {
    compare_with(joint, release, compute(joint, snap))
}

/// Joint `joint`'s release compared with figures computed `after`.
pub(super) fn compare_with(
    joint: &Joint,
    release: &Release,
    after: Result<(ImpactFigures, Vec<String>), String>,
) -> JointImpact {
    let before = read_stored(&release.setpoints, &release.spec);
    let (before_codes, before) = match before {
        Some((f, c)) => (c, Some(f)),
        None => (Vec::new(), None),
    };
    let (after_codes, after, problem) = match after {
        Ok((f, c)) => (c, Some(f), None),
        Err(e) => (Vec::new(), None, Some(e)),
    };
    let added = codes_not_in(&after_codes, &before_codes);
    let removed = codes_not_in(&before_codes, &after_codes);
    let pct = match (&before, &after) {
        (Some(b), Some(a)) => change_percent(b, a),
        _ => None,
    };
    let changed = before != after || !added.is_empty() || !removed.is_empty();
    JointImpact {
        id: joint.id.to_string(),
        release: release.number,
        before,
        after,
        change_percent: pct,
        changed,
        checks_added: added,
        checks_removed: removed,
        problem,
    }
}

/// The check codes of `these` that `those` lacks, each once, in order (a
/// code raised for thread and for bearing friction is one change).
fn codes_not_in(these: &[String], those: &[String]) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for c in these {
        if !those.contains(c) && !out.contains(c) {
            out.push(c.clone());
        }
    }
    out
}
