//! Release use cases: release a joint (compute its spec and setpoints at
//! the current catalogue revision with the joint's tool presentation and
//! freeze both answers' exact bytes), approve a draft (four-eyes rule),
//! withdraw, list and read releases, and fetch the frozen answer the line
//! uses (the active release, or release N) — always the stored bytes,
//! never a recomputation.
//!
//! A release is refused (422, `/problems/checks-not-accepted`, listing the
//! checks) while an error-severity check applies that the body does not
//! accept by code with a reason; a code accepted that does not apply is a
//! 422 too. With the four-eyes rule on ([`App::four_eyes`]) a release starts
//! as a draft and becomes active only when someone other than the
//! requester, with the role `approver`, approves it.

pub mod body;
pub mod bulk;
pub mod fetch_cache;
pub mod view;

use std::sync::Arc;

use chrono::Utc;
use serde_json::{json, Value};

use super::joints::joint_spec_request;
use super::spec::checks::known_codes;
use super::spec::setpoints::setpoints;
use super::spec::tool::{torque_unit, ToolAsk};
use super::spec::view::spec_response;
use super::spec::{compute_one, SpecRequest, METHOD_VERSION, SERVICE_VERSION};
use super::{App, AppError, FieldProblem};
use crate::catalogue::Snapshot;
use crate::registry::event::{JOINT_RELEASED, JOINT_WITHDRAWN};
use crate::registry::{
    AcceptedCheck, Joint, JointId, NewRelease, OutboxEvent, Release, ReleaseEventKind,
};
use crate::store::outbox::new_event_id;
use crate::store::releases::ReleaseEventRecord;
use body::{release_ask, status_reason, ReleaseAsk};
use fetch_cache::Rendered;
use view::{FrozenAnswer, ReleasedAnswer};

/// The two answers a release freezes, as served, and the hash that
/// identifies them.
struct Frozen {
    spec: String,
    setpoints: String,
    spec_hash: String,
    revision: i64,
    /// The accepted error-check codes that apply to these values.
    applied: Vec<&'static str>,
}

impl Frozen {
    /// The release to write: these values with who asked, why and the
    /// checks accepted, stamped with this service's and method's versions.
    fn into_release(
        self,
        joint: &Joint,
        actor: &str,
        reason: String,
        accepted_checks: Vec<AcceptedCheck>,
    ) -> NewRelease {
        NewRelease {
            joint_id: joint.id.clone(),
            spec_hash: self.spec_hash,
            catalogue_revision: self.revision,
            service_version: SERVICE_VERSION.into(),
            method_version: METHOD_VERSION.into(),
            requested_by: actor.into(),
            reason,
            accepted_checks,
            spec: self.spec,
            setpoints: self.setpoints,
        }
    }
}

/// A problem of computing the joint's stored definition, named under the
/// joint body's field (`request.thread`, `setpoints.resolution`); the
/// accepting field keeps its name (it is the release body's).
fn under_definition(e: AppError) -> AppError {
    match e {
        AppError::Fields(problems) => AppError::Fields(
            problems
                .into_iter()
                .map(|mut p| {
                    p.field = match p.field.as_str() {
                        "accept_checks" => p.field,
                        "resolution" | "angle_resolution" | "torque_unit" => {
                            format!("setpoints.{}", p.field)
                        }
                        f if f.starts_with("torque_unit.") => format!("setpoints.{f}"),
                        "" => "request".into(),
                        f if f.starts_with("joint_tags") => f.replacen("joint_tags", "tags", 1),
                        f => format!("request.{f}"),
                    };
                    p
                })
                .collect(),
        ),
        other => other,
    }
}

/// The CloudEvent of a release becoming active.
fn released_event(r: &Release) -> OutboxEvent {
    let setpoints: Value = serde_json::from_str(&r.setpoints).unwrap_or(Value::Null);
    OutboxEvent::cloud_event(
        new_event_id(),
        JOINT_RELEASED,
        r.joint_id.as_str(),
        Utc::now(),
        json!({
            "joint_id": r.joint_id.as_str(),
            "release": r.number,
            "spec_hash": r.spec_hash,
            "catalogue_revision": r.catalogue_revision,
            "service_version": r.service_version,
            "method_version": r.method_version,
            "requested_by": r.requested_by,
            "reason": r.reason,
            "setpoints": setpoints,
        }),
    )
}

fn release_number(number: i64) -> Result<i64, AppError> {
    if number < 1 {
        return Err(FieldProblem::invalid(
            "release",
            format!("release numbers start at 1, not {number}"),
        )
        .into());
    }
    Ok(number)
}

/// Computes the joint's spec and setpoints at `snapshot` and serialises
/// both answers as they are served. Accepted codes that do not apply are
/// left out of `applied` (the caller decides whether that is a refusal).
fn freeze_at(snapshot: &Snapshot, joint: &Joint, ask: &ReleaseAsk) -> Result<Frozen, AppError> {
    let mut req: SpecRequest = joint_spec_request(&joint.request, &joint.tags).map_err(|e| {
        FieldProblem::invalid(
            "request",
            format!("the joint's request no longer reads as a spec request: {e}"),
        )
    })?;
    // A release is computed at the current revision, whatever the
    // definition pins.
    req.catalogue_revision = None;
    let (resolved, spec) = compute_one(&req, snapshot).map_err(under_definition)?;
    let unit = torque_unit(joint.setpoints.torque_unit.as_deref())
        .map_err(|p| under_definition(p.into()))?;
    let codes = ask.accept_checks.iter().map(|c| c.code.as_str());
    let accept = known_codes("accept_checks", codes).map_err(AppError::field)?;
    let tool = ToolAsk {
        unit,
        resolution: joint.setpoints.resolution,
        angle_resolution: joint.setpoints.angle_resolution,
        accept,
    };
    let answer = setpoints(&spec, &resolved, &tool, false).map_err(under_definition)?;
    let spec_body = spec_response(&spec, &resolved, false);
    let encode = |what: &str, e: serde_json::Error| {
        AppError::Internal(format!("the {what} answer could not be serialised: {e}"))
    };
    Ok(Frozen {
        spec: serde_json::to_string(&spec_body).map_err(|e| encode("spec", e))?,
        setpoints: serde_json::to_string(&answer).map_err(|e| encode("setpoint", e))?,
        spec_hash: answer.spec_hash,
        revision: resolved.revision,
        applied: answer.accepted_checks,
    })
}

impl App {
    /// Computes the joint's spec and setpoints at the current catalogue
    /// revision and serialises both answers as they are served; an
    /// accepted check that does not apply is refused.
    fn freeze(&self, joint: &Joint, ask: &ReleaseAsk) -> Result<Frozen, AppError> {
        let frozen = freeze_at(&self.current(), joint, ask)?;
        let unneeded: Vec<FieldProblem> = ask
            .accept_checks
            .iter()
            .enumerate()
            .filter(|(_, c)| !frozen.applied.contains(&c.code.as_str()))
            .map(|(i, c)| {
                FieldProblem::invalid(
                    format!("accept_checks[{i}].code"),
                    format!(
                        "error check {} does not apply to this joint's values; accept only \
                         the error checks that apply ({})",
                        c.code,
                        if frozen.applied.is_empty() {
                            "none does".to_string()
                        } else {
                            frozen.applied.join(", ")
                        }
                    ),
                )
            })
            .collect();
        if !unneeded.is_empty() {
            return Err(AppError::Fields(unneeded));
        }
        Ok(frozen)
    }

    /// Releases joint `id` (see the module): a draft under the four-eyes
    /// rule, otherwise active at once (the previous active release
    /// superseded, a `joint.released` event in the outbox).
    pub async fn release_joint(
        &self,
        actor: &str,
        id: &str,
        body: &Value,
    ) -> Result<Release, AppError> {
        let ask = release_ask(body)?;
        let joint = self.joint(id).await?;
        if self.stale() {
            return Err(AppError::Unavailable {
                reason: "the catalogue in memory may be stale; a release waits until the \
                         database is reachable"
                    .into(),
            });
        }
        let frozen = self.freeze(&joint, &ask)?;
        let new = frozen.into_release(&joint, actor, ask.reason, ask.accept_checks);
        let (first, event) = self.first_step();
        // The joint's definition must still be the one the release was
        // computed from (as in a bulk release).
        let written = self
            .store()
            .write_release(&new, Some(joint.version), first, event)
            .await;
        self.fetch_cache().registry_written();
        Ok(written?)
    }

    /// How a new release starts under the four-eyes setting: its first
    /// event (requested, or released at once) and the outbox event it
    /// writes with it (none for a draft: approval writes that one).
    fn first_step(&self) -> (ReleaseEventKind, impl Fn(&Release) -> Option<OutboxEvent>) {
        let four_eyes = self.four_eyes();
        let first = if four_eyes {
            ReleaseEventKind::Requested
        } else {
            ReleaseEventKind::Released
        };
        (first, move |r: &Release| {
            (!four_eyes).then(|| released_event(r))
        })
    }

    /// Approves draft `number` of joint `id`: it becomes the active release.
    /// The requester may not approve their own release (403).
    pub async fn approve_release(
        &self,
        actor: &str,
        id: &str,
        number: i64,
        body: &Value,
    ) -> Result<Release, AppError> {
        let reason = status_reason(body)?;
        let (id, draft) = self.release_of(id, number).await?;
        if draft.requested_by == actor {
            return Err(AppError::Forbidden {
                detail: format!(
                    "release {number} of joint '{id}' was requested by '{actor}'; under the \
                     four-eyes rule someone else with the role approver approves it"
                ),
            });
        }
        let event = released_event(&draft);
        let written = self
            .store()
            .append_release_event(
                &id,
                number,
                ReleaseEventKind::Approved,
                actor,
                &reason,
                Some(&event),
            )
            .await;
        self.fetch_cache().registry_written();
        Ok(written?)
    }

    /// Withdraws release `number` of joint `id` (a draft or the active
    /// one); a withdrawn release is never active again.
    pub async fn withdraw_release(
        &self,
        actor: &str,
        id: &str,
        number: i64,
        body: &Value,
    ) -> Result<Release, AppError> {
        let reason = status_reason(body)?;
        let (id, release) = self.release_of(id, number).await?;
        let event = OutboxEvent::cloud_event(
            new_event_id(),
            JOINT_WITHDRAWN,
            id.as_str(),
            Utc::now(),
            json!({
                "joint_id": id.as_str(),
                "release": number,
                "status_before": release.status.as_str(),
                "withdrawn_by": actor,
                "reason": reason,
            }),
        );
        let written = self
            .store()
            .append_release_event(
                &id,
                number,
                ReleaseEventKind::Withdrawn,
                actor,
                &reason,
                Some(&event),
            )
            .await;
        self.fetch_cache().registry_written();
        Ok(written?)
    }

    /// Release `number` of joint `id` (unknown joint: 404 with near ids;
    /// unknown release: 404 naming `release`).
    async fn release_of(&self, id: &str, number: i64) -> Result<(JointId, Release), AppError> {
        let number = release_number(number)?;
        let joint = self.joint(id).await?;
        let release = self.store().release(&joint.id, number).await?;
        Ok((joint.id, release))
    }

    /// Every release of joint `id`, newest first.
    pub async fn releases(&self, id: &str) -> Result<Vec<Release>, AppError> {
        let joint = self.joint(id).await?;
        Ok(self.store().releases(&joint.id).await?)
    }

    /// Release `number` of joint `id` with its status events.
    pub async fn release(
        &self,
        id: &str,
        number: i64,
    ) -> Result<(Release, Vec<ReleaseEventRecord>), AppError> {
        let (id, release) = self.release_of(id, number).await?;
        let events = self.store().release_events(&id, number).await?;
        Ok((release, events))
    }

    /// What the line fetches, as served: the answer's ETag and bytes. The
    /// active release's are kept in memory (see [`fetch_cache`]) while the
    /// database is reachable; `?release=N` and a stale catalogue read the
    /// database each time.
    pub async fn released_answer(
        &self,
        id: &str,
        number: Option<i64>,
        which: FrozenAnswer,
    ) -> Result<Arc<Rendered>, AppError> {
        let keep = number.is_none() && !self.stale();
        let stamp = self.fetch_cache().stamp();
        if keep {
            if let Some(r) = self.fetch_cache().get(id, which, stamp) {
                return Ok(r);
            }
        }
        let answer = self.released(id, number).await?;
        let rendered = Arc::new(Rendered {
            etag: answer.etag(which),
            body: answer.json(which)?.into(),
        });
        if keep {
            self.fetch_cache()
                .put(id, which, stamp, Arc::clone(&rendered));
        }
        Ok(rendered)
    }

    /// What the line fetches: the active release of joint `id` (409 naming
    /// `release` when there is none), or release `number`, with the joint's
    /// review mark. The answers are the stored bytes.
    pub async fn released(
        &self,
        id: &str,
        number: Option<i64>,
    ) -> Result<ReleasedAnswer, AppError> {
        let number = number.map(release_number).transpose()?;
        let joint = self.joint(id).await?;
        let release = match number {
            Some(n) => self.store().release(&joint.id, n).await?,
            None => self
                .store()
                .active_release(&joint.id)
                .await?
                .ok_or_else(|| AppError::Conflict {
                    field: "release".into(),
                    reason: format!(
                        "joint '{}' has no active release; release it (POST /v1/joints/{}/releases) \
                         or name an earlier one with ?release=N",
                        joint.id, joint.id
                    ),
                })?,
        };
        Ok(ReleasedAnswer {
            release,
            review_due: joint.review_due,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn problems_of_the_definition_are_named_under_its_fields() {
        let e = AppError::Fields(vec![
            FieldProblem::invalid("thread", "x"),
            FieldProblem::invalid("resolution", "x"),
            FieldProblem::invalid("accept_checks", "x"),
            FieldProblem::invalid("torque_unit.unit", "x"),
        ]);
        let named: Vec<String> = under_definition(e)
            .problems()
            .iter()
            .map(|p| p.field.clone())
            .collect();
        assert_eq!(
            named,
            [
                "request.thread",
                "setpoints.resolution",
                "accept_checks",
                "setpoints.torque_unit.unit"
            ]
        );
        assert!(release_number(0).is_err());
        assert_eq!(release_number(3).unwrap(), 3);
    }
}
