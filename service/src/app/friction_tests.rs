//! Friction-test use cases over the store: keep a series as evidence, read
//! one back with the catalogue revisions made from it, and apply the entry
//! change a series supports as one revision recorded with the series as
//! its evidence.

use super::catalogue::{AtRevision, Author};
use super::{App, AppError};
use crate::catalogue::{Change, ChangeItem, ChangeSet, EntryInput, FrictionEntry};
use crate::store::friction_series::{evidence, NewSeries, SeriesApplication, StoredSeries};

/// The entry change a series supports, as applying it submits it.
#[derive(Debug, Clone)]
pub struct SeriesChange {
    pub series_id: i64,
    /// `observed` or `three_sigma`.
    pub basis: String,
    pub entry_id: i64,
    /// The entry's revision the client last saw (its `If-Match`).
    pub expected_revision: i64,
    pub entry: EntryInput,
}

impl App {
    /// Stores a series and its evaluation (never changed afterwards).
    pub async fn record_series(&self, new: &NewSeries) -> Result<StoredSeries, AppError> {
        Ok(self.store().insert_friction_test(new).await?)
    }

    /// A stored series (404 naming `id` when there is none).
    pub async fn stored_series(&self, id: i64) -> Result<StoredSeries, AppError> {
        Ok(self.store().friction_test(id).await?)
    }

    /// The catalogue revisions made from series `id`, oldest first.
    pub async fn series_applications(&self, id: i64) -> Result<Vec<SeriesApplication>, AppError> {
        Ok(self.store().friction_test_applications(id).await?)
    }

    /// Applies `change` as one revision with the series as its evidence,
    /// then indexes it from the series side (a failure there is logged:
    /// the revision itself carries the evidence).
    pub async fn apply_series(
        &self,
        by: Author<'_>,
        change: SeriesChange,
    ) -> Result<AtRevision<FrictionEntry>, AppError> {
        let set = ChangeSet {
            actor: by.actor.to_owned(),
            reason: by.reason.to_owned(),
            evidence: Some(evidence(change.series_id)),
            items: vec![ChangeItem {
                at: String::new(),
                change: Change::UpdateEntry {
                    id: change.entry_id,
                    expected_revision: Some(change.expected_revision),
                    entry: change.entry,
                },
            }],
        };
        let applied = self.apply(&set).await?;
        let entry = applied.snapshot.entry(change.entry_id)?.clone();
        let application = SeriesApplication {
            series_id: change.series_id,
            revision: applied.snapshot.revision,
            entry_id: change.entry_id,
            basis: change.basis,
            actor: by.actor.to_owned(),
            reason: by.reason.to_owned(),
            created_at: chrono::Utc::now(),
        };
        if let Err(e) = self
            .store()
            .record_friction_test_application(&application)
            .await
        {
            tracing::error!(series = change.series_id, revision = application.revision, error = %e, "friction test application not indexed");
        }
        Ok(AtRevision {
            value: entry,
            revision: applied.snapshot.revision,
        })
    }
}
