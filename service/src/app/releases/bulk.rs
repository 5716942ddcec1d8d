//! Releasing many joints in one call (`POST /v1/joints/releases`,
//! `tightspec joint release` with several ids or `--tag`): all or nothing.
//! Every joint is computed at the same catalogue revision with the same
//! reason and accepted checks; an accepted check is recorded on each
//! joint it applies to, and a code that applies to none of them is
//! refused. If any joint is refused (an unknown id, a definition that no
//! longer computes, an error check not accepted) the answer is one 422
//! listing every refused joint with its reasons (`ids[i]` for an unknown
//! id, `joints[<id>].<field>` otherwise) and nothing is written; otherwise
//! every release is written with its first event and outbox event in one
//! transaction. The four-eyes rule holds as for one release: each becomes
//! a draft awaiting approval.

use std::collections::BTreeSet;

use serde::Serialize;
use serde_json::Value;
use utoipa::ToSchema;

use super::body::{bulk_release_ask, Selection, BULK_RELEASE_MAX};
use super::freeze_at;
use super::view::ReleaseView;
use crate::app::{App, AppError, FieldProblem, ProblemClass};
use crate::registry::joint::PAGE_MAX;
use crate::registry::{Joint, JointId, Page, Release};
use crate::store::joints::JointFilter;
use crate::store::releases_bulk::BulkItem;

/// What a bulk release wrote: how many, their status (`released`, or
/// `draft` under the four-eyes rule) and each release, in joint id order.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct BulkReleaseView {
    pub count: usize,
    pub status: String,
    pub releases: Vec<ReleaseView>,
}

impl BulkReleaseView {
    pub fn of(released: &[Release], four_eyes: bool) -> BulkReleaseView {
        BulkReleaseView {
            count: released.len(),
            status: if four_eyes { "draft" } else { "released" }.into(),
            releases: released.iter().map(|r| ReleaseView::of(r, None)).collect(),
        }
    }
}

/// A joint's refusal as problems under `joints[<id>]`, every one a 422: a
/// bulk release names joints that exist but cannot be released as they
/// stand. Outages and defects pass through unchanged.
fn refused(id: &JointId, e: AppError) -> Result<Vec<FieldProblem>, AppError> {
    let problems = match e {
        AppError::Fields(p) => p,
        AppError::ChecksNotAccepted { unaccepted, .. } => unaccepted,
        other => return Err(other),
    };
    Ok(problems
        .into_iter()
        .map(|mut p| {
            p.class = ProblemClass::Invalid;
            p.field = format!("joints[{id}].{}", p.field);
            p
        })
        .collect())
}

impl App {
    /// The joints named by id, in the order given; every unknown id is a
    /// problem naming `ids[i]` (with near ids).
    async fn joints_by_ids(
        &self,
        ids: &[JointId],
        problems: &mut Vec<FieldProblem>,
    ) -> Result<Vec<Joint>, AppError> {
        let mut joints = Vec::with_capacity(ids.len());
        for (i, id) in ids.iter().enumerate() {
            match self.joint(id.as_str()).await {
                Ok(joint) => joints.push(joint),
                Err(AppError::Fields(found)) => problems.extend(found.into_iter().map(|mut p| {
                    p.class = ProblemClass::Invalid;
                    p.field = format!("ids[{i}]");
                    p
                })),
                Err(other) => return Err(other),
            }
        }
        Ok(joints)
    }

    /// Every joint carrying `tag`, in id order: at least one, at most
    /// [`BULK_RELEASE_MAX`] (otherwise a problem naming `tag`).
    async fn joints_tagged(&self, tag: &str) -> Result<Vec<Joint>, AppError> {
        let filter = JointFilter {
            tag: Some(tag.to_string()),
            ..Default::default()
        };
        let mut joints: Vec<Joint> = Vec::new();
        let mut after = None;
        // bounded: each page adds PAGE_MAX joints until there are more
        // than BULK_RELEASE_MAX
        for _ in 0..=(BULK_RELEASE_MAX / PAGE_MAX as usize) {
            let page = Page {
                after: after.clone(),
                limit: PAGE_MAX,
            };
            let found = self.store().joints(&filter, &page).await?;
            let last = found.len() < PAGE_MAX as usize;
            after = found.last().map(|j| j.id.clone());
            joints.extend(found);
            if last || joints.len() > BULK_RELEASE_MAX {
                break;
            }
        }
        let reason = if joints.is_empty() {
            format!("no joint carries the tag '{tag}'")
        } else if joints.len() > BULK_RELEASE_MAX {
            format!(
                "more than {BULK_RELEASE_MAX} joints carry the tag '{tag}'; release them by a \
                 narrower tag or by ids"
            )
        } else {
            return Ok(joints);
        };
        Err(FieldProblem::invalid("tag", reason).into())
    }

    /// Releases every joint the body selects (see the module); the releases
    /// written, in joint id order.
    pub async fn release_joints(
        &self,
        actor: &str,
        body: &Value,
    ) -> Result<Vec<Release>, AppError> {
        let bulk = bulk_release_ask(body)?;
        if self.stale() {
            return Err(AppError::Unavailable {
                reason: "the catalogue in memory may be stale; a release waits until the \
                         database is reachable"
                    .into(),
            });
        }
        let mut problems = Vec::new();
        let joints = match &bulk.joints {
            Selection::Ids(ids) => self.joints_by_ids(ids, &mut problems).await?,
            Selection::Tag(tag) => self.joints_tagged(tag).await?,
        };
        let ask = &bulk.ask;
        // one revision for every joint of the call
        let snapshot = self.current();
        let mut applied_somewhere: BTreeSet<&'static str> = BTreeSet::new();
        let mut items = Vec::with_capacity(joints.len());
        for joint in &joints {
            match freeze_at(&snapshot, joint, ask) {
                Ok(frozen) => {
                    applied_somewhere.extend(frozen.applied.iter().copied());
                    let accepted_checks = ask
                        .accept_checks
                        .iter()
                        .filter(|c| frozen.applied.contains(&c.code.as_str()))
                        .cloned()
                        .collect();
                    items.push(BulkItem {
                        new: frozen.into_release(joint, actor, ask.reason.clone(), accepted_checks),
                        version: joint.version,
                    });
                }
                Err(e) => problems.extend(refused(&joint.id, e)?),
            }
        }
        // Only judged when every joint computed: a refused joint may be
        // the one a code was meant for.
        if problems.is_empty() {
            for (i, c) in ask.accept_checks.iter().enumerate() {
                if !applied_somewhere.contains(c.code.as_str()) {
                    problems.push(FieldProblem::invalid(
                        format!("accept_checks[{i}].code"),
                        format!(
                            "error check {} applies to none of these {} joints; accept only \
                             error checks that apply",
                            c.code,
                            joints.len()
                        ),
                    ));
                }
            }
        }
        if !problems.is_empty() {
            return Err(AppError::Fields(problems));
        }
        let (first, event) = self.first_step();
        let written = self.store().write_releases(&items, first, event).await;
        self.fetch_cache().registry_written();
        Ok(written?)
    }
}
