//! Change impact over the registered joints, and the review marks.
//!
//! [`App::impact`] takes a proposed friction-entry change (create, update,
//! retire) or a friction test's proposal, applies it to a copy of the
//! current catalogue in memory (nothing is written) and, for every joint
//! with an active release, compares the figures of the stored release
//! (before) with those computed against the changed catalogue (after).
//! Joints are read in pages of [`PAGE`] ids, at most [`PAGES_MAX`] pages.
//!
//! [`App::mark_reviews`] runs right after a catalogue revision is written
//! (every path goes through [`App::apply`]): every joint whose active release
//! would now compute differently is marked `review_due` with that revision,
//! with a `joint.review_due` event, in one transaction per page. It runs
//! after the revision's own transaction because computing specs belongs to
//! the application layer, not to the store's transaction; a failure is
//! logged, and the next revision marks what is still different.

pub mod compare;
pub mod figures;
pub mod preview;
pub mod review;

use chrono::Utc;
use serde::Serialize;
use serde_json::json;
use utoipa::ToSchema;

use super::{App, AppError, FieldProblem};
use crate::catalogue::{self, Change, ChangeItem, ChangeSet, EntryInput, Snapshot};
use crate::registry::event::JOINT_REVIEW_DUE;
use crate::registry::{Joint, JointId, OutboxEvent, Page, Release, ReleaseStatus};
use crate::store::joints::{JointFilter, ReviewMark};
use crate::store::outbox::new_event_id;
pub use compare::{compare, compute};
use figures::ImpactFigures;

/// Joints read per page.
pub const PAGE: u32 = 500;
/// Pages read at most (200 000 joints); beyond, the answer says `truncated`.
pub const PAGES_MAX: usize = 400;

/// A proposed catalogue change.
#[derive(Debug, Clone, PartialEq)]
pub enum ProposedChange {
    Create(EntryInput),
    Update {
        entry_id: i64,
        entry: EntryInput,
    },
    Retire {
        entry_id: i64,
    },
    /// Friction test `id`'s proposal on `basis`.
    FrictionTest {
        id: i64,
        basis: String,
    },
}

/// One joint's before and after.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct JointImpact {
    /// The joint id.
    pub id: String,
    /// The active release compared.
    pub release: i64,
    /// From the stored release.
    pub before: Option<ImpactFigures>,
    /// Computed against the changed catalogue; absent when the joint no
    /// longer computes (see `problem`).
    pub after: Option<ImpactFigures>,
    /// Largest relative change of any figure, percent of its value before;
    /// absent when not comparable (unit changed, no value after).
    pub change_percent: Option<f64>,
    /// Whether anything differs (a figure or a check).
    pub changed: bool,
    pub checks_added: Vec<String>,
    pub checks_removed: Vec<String>,
    /// Why the joint no longer computes after the change.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub problem: Option<String>,
}

/// Counts over the joints.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ImpactSummary {
    /// Joints with an active release that were compared.
    pub compared: usize,
    /// Joints whose figures or checks differ, or that no longer compute.
    pub affected: usize,
    pub largest_change_percent: f64,
    /// True when the scan stopped at its bound before the last joint.
    pub truncated: bool,
}

impl ImpactSummary {
    /// The counts in plain words.
    pub fn note(&self) -> String {
        let mut note = match (self.compared, self.affected) {
            (0, _) => "No joint has an active release, so the change affects no registered \
                       joint; release joints to see their impact here."
                .to_owned(),
            (n, 0) => format!("{n} joint(s) with an active release compared; none would change."),
            (n, a) => format!(
                "{n} joint(s) with an active release compared; {a} would change or no longer \
                 compute."
            ),
        };
        if self.truncated {
            note.push_str(" The scan stopped at its bound: later joints were not compared.");
        }
        note
    }
}

/// The impact of a change over the registered joints.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ImpactResponse {
    /// The catalogue revision the change was applied to (in memory).
    pub catalogue_revision: i64,
    pub joints: Vec<JointImpact>,
    pub summary: ImpactSummary,
    /// The summary in plain words (says so when no joint has an active
    /// release).
    pub note: String,
    /// Values are estimates to be confirmed by joint tests.
    pub caution: &'static str,
}

pub const CAUTION: &str = "Estimates from the catalogue's friction data, to be confirmed by \
     joint tests; a safety-critical joint's new release needs sign-off by the responsible \
     engineer; drawings, local codes and licensed practice take precedence.";

/// `id` when catalogue `current` holds that friction entry; else unknown,
/// naming the body's `entry_id` (404).
fn known_entry(current: &Snapshot, id: i64) -> Result<i64, AppError> {
    if current.entries.iter().any(|e| e.id == id) {
        return Ok(id);
    }
    Err(AppError::field(FieldProblem::unknown(
        "entry_id",
        format!("no friction entry with id {id}"),
    )))
}

impl App {
    /// The catalogue change `change` stands for against `current` (a
    /// friction test's proposal is built against `current`; problems as for
    /// the change itself: 422 naming the field, 404 for an unknown entry or
    /// test).
    async fn catalogue_change(
        &self,
        current: &Snapshot,
        change: &ProposedChange,
    ) -> Result<Change, AppError> {
        Ok(match change {
            ProposedChange::Create(e) => Change::CreateEntry(e.clone()),
            ProposedChange::Update { entry_id, entry } => Change::UpdateEntry {
                id: known_entry(current, *entry_id)?,
                expected_revision: None,
                entry: entry.clone(),
            },
            ProposedChange::Retire { entry_id } => Change::RetireEntry {
                id: known_entry(current, *entry_id)?,
                expected_revision: None,
            },
            ProposedChange::FrictionTest { id, basis } => self
                .proposed_change(*id, basis, current)
                .await
                .map_err(|e| match e {
                    // The stored series' own `id` is the body's `friction_test`.
                    AppError::Fields(mut problems) => {
                        for p in problems.iter_mut().filter(|p| p.field == "id") {
                            p.field = "friction_test".into();
                        }
                        AppError::Fields(problems)
                    }
                    other => other,
                })?,
        })
    }

    /// Every joint with an active release, paged; `each` sees one page.
    async fn scan_released(
        &self,
        mut each: impl FnMut(Vec<(Joint, Release)>),
    ) -> Result<bool, AppError> {
        let filter = JointFilter {
            status: Some(ReleaseStatus::Released),
            ..JointFilter::default()
        };
        let mut after: Option<JointId> = None;
        for _ in 0..PAGES_MAX {
            let page = Page {
                after: after.clone(),
                limit: PAGE,
            };
            let joints = self.store().joints(&filter, &page).await?;
            let Some(last) = joints.last().map(|j| j.id.clone()) else {
                return Ok(false);
            };
            let releases = self
                .store()
                .active_releases_between(after.as_ref(), &last)
                .await?;
            let full = joints.len() == PAGE as usize;
            let mut rs = releases.into_iter().peekable();
            let mut pairs = Vec::with_capacity(joints.len());
            for j in joints {
                while rs
                    .peek()
                    .is_some_and(|r| r.joint_id.as_str() < j.id.as_str())
                {
                    rs.next();
                }
                if rs.peek().is_some_and(|r| r.joint_id == j.id) {
                    pairs.push((j, rs.next().expect("peeked")));
                }
            }
            each(pairs);
            if !full {
                return Ok(false);
            }
            after = Some(last);
        }
        Ok(true)
    }

    /// The impact of `change` over every joint with an active release; see
    /// the module. Writes nothing.
    pub async fn impact(&self, change: &ProposedChange) -> Result<ImpactResponse, AppError> {
        let current = self.current();
        let change = self.catalogue_change(&current, change).await?;
        self.impact_of(&current, change).await
    }

    /// The impact of catalogue change `change` applied in memory to
    /// `current` (the one computation behind the impact route and the
    /// friction-test proposal). Writes nothing.
    pub async fn impact_of(
        &self,
        current: &Snapshot,
        change: Change,
    ) -> Result<ImpactResponse, AppError> {
        let set = ChangeSet {
            actor: "impact".into(),
            reason: "impact of a proposed change".into(),
            evidence: None,
            items: vec![ChangeItem {
                at: "entry.".into(),
                change,
            }],
        };
        let snap = catalogue::apply(current, &set)?.snapshot;
        let mut joints = Vec::new();
        let truncated = self
            .scan_released(|page| {
                joints.extend(page.iter().map(|(j, r)| compare(j, r, &snap)));
            })
            .await?;
        let summary = ImpactSummary {
            compared: joints.len(),
            affected: joints.iter().filter(|j| j.changed).count(),
            largest_change_percent: joints
                .iter()
                .filter_map(|j| j.change_percent)
                .fold(0.0, f64::max),
            truncated,
        };
        Ok(ImpactResponse {
            catalogue_revision: current.revision,
            note: summary.note(),
            summary,
            joints,
            caution: CAUTION,
        })
    }

    /// Marks for review every joint whose active release would compute
    /// differently against catalogue `snap` (see the module). Returns the
    /// joints newly marked.
    pub async fn mark_reviews(&self, snap: &Snapshot) -> Result<Vec<JointId>, AppError> {
        let mut marks = Vec::new();
        let now = Utc::now();
        self.scan_released(|page| {
            for (j, r) in page.iter().filter(|(j, _)| j.review_due.is_none()) {
                let c = compare(j, r, snap);
                if !c.changed {
                    continue;
                }
                let event = OutboxEvent::cloud_event(
                    new_event_id(),
                    JOINT_REVIEW_DUE,
                    j.id.as_str(),
                    now,
                    json!({
                        "joint_id": j.id.as_str(),
                        "release": r.number,
                        "catalogue_revision": snap.revision,
                        "change_percent": c.change_percent,
                        "checks_added": c.checks_added,
                        "checks_removed": c.checks_removed,
                        "problem": c.problem,
                    }),
                );
                marks.push(ReviewMark {
                    joint: j.id.clone(),
                    event,
                });
            }
        })
        .await?;
        let mut marked = Vec::new();
        for chunk in marks.chunks(PAGE as usize) {
            let written = self
                .store()
                .mark_review_due(snap.revision, now, chunk)
                .await;
            self.fetch_cache().registry_written();
            marked.extend(written?);
        }
        Ok(marked)
    }
}
