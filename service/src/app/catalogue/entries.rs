//! Friction-entry use cases: list (filtered), read, create, replace, retire.

use super::{AtRevision, Author};
use crate::app::{App, AppError};
use crate::catalogue::{Applied, Change, EntryInput, FrictionEntry};

/// Which entries a listing holds; `None` admits any.
#[derive(Debug, Clone, Default)]
pub struct EntryFilter {
    /// `Some(true)`: active only; `Some(false)`: retired only.
    pub active: Option<bool>,
    pub finish: Option<String>,
    pub lubricant: Option<String>,
}

impl EntryFilter {
    fn admits(&self, e: &FrictionEntry) -> bool {
        self.active.is_none_or(|a| a == e.status.is_active())
            && self.finish.as_ref().is_none_or(|f| *f == e.finish)
            && self.lubricant.as_ref().is_none_or(|l| *l == e.lubricant)
    }
}

/// The entry `id` of an applied change.
fn changed(applied: Applied, id: i64) -> Result<AtRevision<FrictionEntry>, AppError> {
    Ok(AtRevision {
        value: applied.snapshot.entry(id)?.clone(),
        revision: applied.snapshot.revision,
    })
}

impl App {
    /// The friction entries `filter` admits, current or at `revision`.
    pub async fn entries(
        &self,
        filter: &EntryFilter,
        revision: Option<i64>,
    ) -> Result<AtRevision<Vec<FrictionEntry>>, AppError> {
        let snap = self.snapshot(revision).await?;
        Ok(AtRevision {
            value: snap
                .entries
                .iter()
                .filter(|e| filter.admits(e))
                .cloned()
                .collect(),
            revision: snap.revision,
        })
    }

    /// One friction entry, current or at `revision`.
    pub async fn entry(
        &self,
        id: i64,
        revision: Option<i64>,
    ) -> Result<AtRevision<FrictionEntry>, AppError> {
        let snap = self.snapshot(revision).await?;
        Ok(AtRevision {
            value: snap.entry(id)?.clone(),
            revision: snap.revision,
        })
    }

    /// Creates a friction entry (ids are assigned by the catalogue).
    pub async fn create_entry(
        &self,
        by: Author<'_>,
        input: EntryInput,
    ) -> Result<AtRevision<FrictionEntry>, AppError> {
        let applied = self.change(by, Change::CreateEntry(input)).await?;
        let id = applied
            .records
            .first()
            .and_then(|r| r.entity_id.parse::<i64>().ok())
            .ok_or_else(|| AppError::Internal("a created entry has no id".into()))?;
        changed(applied, id)
    }

    /// Replaces entry `id`, last seen at `expected_revision`.
    pub async fn update_entry(
        &self,
        by: Author<'_>,
        id: i64,
        expected_revision: i64,
        entry: EntryInput,
    ) -> Result<AtRevision<FrictionEntry>, AppError> {
        let change = Change::UpdateEntry {
            id,
            expected_revision: Some(expected_revision),
            entry,
        };
        changed(self.change(by, change).await?, id)
    }

    /// Retires entry `id`, last seen at `expected_revision`; it stays in
    /// history and in past revisions.
    pub async fn retire_entry(
        &self,
        by: Author<'_>,
        id: i64,
        expected_revision: i64,
    ) -> Result<AtRevision<FrictionEntry>, AppError> {
        let change = Change::RetireEntry {
            id,
            expected_revision: Some(expected_revision),
        };
        changed(self.change(by, change).await?, id)
    }
}
