//! Friction-test use cases over the catalogue and the store: evaluate a
//! series against the names of the current catalogue, keep a series as
//! evidence, read one back with the catalogue revisions made from it,
//! propose the entry change it supports, and apply that change as one
//! revision recorded with the series as its evidence.

use serde::Serialize;
use utoipa::ToSchema;

use super::proposal::{self, Basis, ProposalResponse, Proposed};
use super::wire::{EvaluationResponse, SeriesRequest};
use crate::app::quantity::Units;
use crate::app::{App, AppError, FieldProblem};
use crate::catalogue::{Change, ChangeItem, ChangeSet, FrictionEntry, Snapshot};
use crate::store::friction_series::{evidence, NewSeries, SeriesApplication, StoredSeries};

/// A stored series: the series as posted, its evaluation as answered
/// (SI units) and the catalogue revisions made from it.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct StoredSeriesResponse {
    pub id: i64,
    pub created_at: String,
    /// Name of the token that stored it.
    pub actor: String,
    /// Catalogue revision current when it was stored.
    pub catalogue_revision: i64,
    /// Recorded with every catalogue revision made from this series.
    pub evidence: String,
    pub series: SeriesRequest,
    pub evaluation: EvaluationResponse,
    pub applications: Vec<SeriesApplication>,
}

/// The answer to an apply.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct ApplyResponse {
    pub series_id: i64,
    pub catalogue_revision: i64,
    pub evidence: String,
    pub entry: FrictionEntry,
    pub entry_etag: String,
}

/// An apply checked and its proposal built, waiting for the entry revision
/// the client last saw (the adapter reads it, e.g. from `If-Match`).
pub struct PendingApply {
    series_id: i64,
    basis: Basis,
    reason: String,
    proposed: Proposed,
}

impl PendingApply {
    /// The catalogue friction entry the apply changes.
    pub fn entry_id(&self) -> i64 {
        self.proposed.entry_id()
    }
}

/// Unknown catalogue names (404 with suggestions).
fn check_names(snap: &Snapshot, req: &SeriesRequest) -> Result<(), AppError> {
    if let Some(f) = &req.finish {
        snap.finish(f)?;
    }
    if let Some(l) = &req.lubricant {
        snap.lubricant(l)?;
    }
    Ok(())
}

fn to_json<T: Serialize>(v: &T) -> Result<String, AppError> {
    serde_json::to_string(v)
        .map_err(|e| AppError::Internal(format!("serialising a friction test: {e}")))
}

fn stored_response(
    s: &StoredSeries,
    applications: Vec<SeriesApplication>,
) -> Result<StoredSeriesResponse, AppError> {
    let corrupt = |e: serde_json::Error| {
        AppError::Internal(format!("stored friction test {} unreadable: {e}", s.id))
    };
    Ok(StoredSeriesResponse {
        id: s.id,
        created_at: s.created_at.to_rfc3339(),
        actor: s.actor.clone(),
        catalogue_revision: s.catalogue_revision,
        evidence: evidence(s.id),
        series: serde_json::from_str(&s.series_json).map_err(corrupt)?,
        evaluation: serde_json::from_str(&s.evaluation_json).map_err(corrupt)?,
        applications,
    })
}

/// The entry update a proposal stands for.
fn update(proposed: &Proposed, expected_revision: Option<i64>) -> Change {
    Change::UpdateEntry {
        id: proposed.entry_id(),
        expected_revision,
        entry: proposed.entry.clone(),
    }
}

impl App {
    /// Evaluates a series whose finish and lubricant, where named, are in
    /// the current catalogue. Nothing is stored.
    pub fn evaluate_series(
        &self,
        req: &SeriesRequest,
        units: Units,
    ) -> Result<EvaluationResponse, AppError> {
        check_names(&self.current(), req)?;
        super::evaluate(req, units)
    }

    /// Evaluates and stores a series by `actor` (never changed afterwards).
    /// A stored series names the catalogue finish and lubricant it tested.
    pub async fn record_series(
        &self,
        actor: &str,
        req: &SeriesRequest,
    ) -> Result<StoredSeriesResponse, AppError> {
        let missing: Vec<FieldProblem> = [("finish", &req.finish), ("lubricant", &req.lubricant)]
            .into_iter()
            .filter(|(_, v)| v.as_deref().is_none_or(|s| s.trim().is_empty()))
            .map(|(f, _)| {
                FieldProblem::invalid(
                    f,
                    "missing: a stored series must name the catalogue finish and lubricant it \
                     tested",
                )
            })
            .collect();
        if !missing.is_empty() {
            return Err(AppError::Fields(missing));
        }
        let snap = self.current();
        check_names(&snap, req)?;
        let evaluation = super::evaluate(req, Units::Si)?;
        let new = NewSeries {
            actor: actor.to_owned(),
            thread: evaluation.thread.clone(),
            property_class: evaluation.property_class.clone(),
            finish: req.finish.clone().unwrap_or_default(),
            lubricant: req.lubricant.clone().unwrap_or_default(),
            catalogue_revision: snap.revision,
            series_json: to_json(req)?,
            evaluation_json: to_json(&evaluation)?,
        };
        let stored = self.store().insert_friction_test(&new).await?;
        stored_response(&stored, Vec::new())
    }

    /// A stored series with the catalogue revisions made from it, oldest
    /// first (404 naming `id` when there is none).
    pub async fn stored_series(&self, id: i64) -> Result<StoredSeriesResponse, AppError> {
        let stored = self.store().friction_test(id).await?;
        let applications = self.store().friction_test_applications(id).await?;
        stored_response(&stored, applications)
    }

    /// Re-evaluates a stored series (the engine is deterministic) and
    /// builds the proposal against catalogue `snap`.
    async fn proposed(&self, id: i64, basis: Basis, snap: &Snapshot) -> Result<Proposed, AppError> {
        let stored = self.store().friction_test(id).await?;
        let req: SeriesRequest = serde_json::from_str(&stored.series_json).map_err(|e| {
            AppError::Internal(format!("stored friction test {id} unreadable: {e}"))
        })?;
        let (_, eval) = super::run(&req)?;
        proposal::build(
            snap,
            id,
            &stored.finish,
            &stored.lubricant,
            &eval.statistics,
            eval.specimens.len(),
            basis,
        )
    }

    /// The catalogue change stored series `id` supports on `basis`
    /// (`observed` or `three_sigma`; checked before the series is read),
    /// with its impact on every joint with an active release, both against
    /// the same current catalogue.
    pub async fn series_proposal(
        &self,
        id: i64,
        basis: Option<&str>,
    ) -> Result<ProposalResponse, AppError> {
        let basis = proposal::basis(basis)?;
        let snap = self.current();
        let proposed = self.proposed(id, basis, &snap).await?;
        let impact = self.impact_of(&snap, update(&proposed, None)).await?;
        Ok(proposed.response(impact))
    }

    /// The change stored series `id` proposes on `basis` (`observed` or
    /// `three_sigma`) against catalogue `snap`, for the change impact.
    pub async fn proposed_change(
        &self,
        id: i64,
        basis: &str,
        snap: &Snapshot,
    ) -> Result<Change, AppError> {
        let basis = proposal::basis(Some(basis))?;
        let proposed = self.proposed(id, basis, snap).await?;
        Ok(update(&proposed, None))
    }

    /// Checks an apply of series `id` (a reason, a basis; every problem
    /// listed) and builds its proposal in SI units.
    pub async fn prepare_apply(
        &self,
        id: i64,
        basis: Option<&str>,
        reason: Option<&str>,
    ) -> Result<PendingApply, AppError> {
        let mut problems = Vec::new();
        let reason = reason.map(str::trim).unwrap_or("");
        if reason.is_empty() {
            problems.push(FieldProblem::invalid(
                "reason",
                "missing: say why the catalogue changes",
            ));
        }
        let basis = proposal::basis(basis).map_err(|p| problems.push(p)).ok();
        let Some(basis) = basis.filter(|_| problems.is_empty()) else {
            return Err(AppError::Fields(problems));
        };
        let proposed = self.proposed(id, basis, &self.current()).await?;
        Ok(PendingApply {
            series_id: id,
            basis,
            reason: reason.to_owned(),
            proposed,
        })
    }

    /// Applies a checked proposal by `actor` against the entry's revision
    /// `expected_revision`, as one revision with the series as its
    /// evidence, then indexes it from the series side (a failure there is
    /// logged: the revision itself carries the evidence).
    pub async fn apply_series(
        &self,
        actor: &str,
        pending: PendingApply,
        expected_revision: i64,
    ) -> Result<ApplyResponse, AppError> {
        let (series_id, entry_id) = (pending.series_id, pending.entry_id());
        let set = ChangeSet {
            actor: actor.to_owned(),
            reason: pending.reason.clone(),
            evidence: Some(evidence(series_id)),
            items: vec![ChangeItem {
                at: String::new(),
                change: update(&pending.proposed, Some(expected_revision)),
            }],
        };
        let applied = self.apply(&set).await?;
        let entry = applied.snapshot.entry(entry_id)?.clone();
        let application = SeriesApplication {
            series_id,
            revision: applied.snapshot.revision,
            entry_id,
            basis: pending.basis.as_str().into(),
            actor: actor.to_owned(),
            reason: pending.reason,
            created_at: chrono::Utc::now(),
        };
        if let Err(e) = self
            .store()
            .record_friction_test_application(&application)
            .await
        {
            tracing::error!(series = series_id, revision = application.revision, error = %e, "friction test application not indexed");
        }
        let entry_etag = entry.etag();
        Ok(ApplyResponse {
            series_id,
            catalogue_revision: applied.snapshot.revision,
            evidence: evidence(series_id),
            entry,
            entry_etag,
        })
    }
}
