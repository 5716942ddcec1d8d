//! Revision use cases: the list of revisions (paged), one revision's
//! changes, one item's history, the difference between two revisions,
//! export (JSON or CSV) and import of a whole file as one revision.

use std::sync::Arc;

use super::AtRevision;
use crate::app::{App, AppError, FieldProblem};
use crate::catalogue::{diff, exchange, CatalogueError, ChangeSet, DiffItem, EntityKind, Snapshot};
use crate::store::{HistoryItem, RevisionInfo};

/// One page of revisions, newest first.
#[derive(Debug, Clone)]
pub struct RevisionPage {
    pub revisions: Vec<RevisionInfo>,
    /// Pass as `before` for the next page; `None` on the last page.
    pub next_before: Option<i64>,
}

/// Every change to one item, oldest first.
pub type History = AtRevision<Vec<HistoryItem>>;

/// A catalogue export.
#[derive(Debug, Clone)]
pub enum CatalogueExport {
    /// Everything, rendered by the caller with `catalogue::exchange::export`.
    Json(Arc<Snapshot>),
    /// Friction entries as CSV, with the evidence of each entry's revision.
    Csv { revision: i64, text: String },
}

impl CatalogueExport {
    /// The revision exported.
    pub fn revision(&self) -> i64 {
        match self {
            Self::Json(s) => s.revision,
            Self::Csv { revision, .. } => *revision,
        }
    }
}

/// What an import did.
#[derive(Debug, Clone, PartialEq)]
pub enum Imported {
    /// The file matches the current revision: nothing written.
    Unchanged { revision: i64 },
    /// `changes` changes written as `revision`.
    Applied { changes: usize, revision: i64 },
}

/// Names the request field `field` in a refusal about a revision.
fn naming(e: AppError, field: &str) -> AppError {
    match e {
        AppError::Fields(problems) => AppError::Fields(
            problems
                .into_iter()
                .map(|p| FieldProblem {
                    field: field.to_owned(),
                    ..p
                })
                .collect(),
        ),
        other => other,
    }
}

impl App {
    /// Revisions older than `before` (all when `None`), at most `limit`
    /// (1–1000, default 100), newest first.
    pub async fn revisions(
        &self,
        before: Option<i64>,
        limit: Option<i64>,
    ) -> Result<AtRevision<RevisionPage>, AppError> {
        let limit = limit.unwrap_or(100);
        if !(1..=1000).contains(&limit) {
            return Err(FieldProblem::invalid("limit", "must be between 1 and 1000").into());
        }
        let revisions = self.store().revisions(before, limit).await?;
        let next_before = if revisions.len() as i64 == limit {
            revisions.last().map(|r| r.revision)
        } else {
            None
        };
        Ok(AtRevision {
            value: RevisionPage {
                revisions,
                next_before,
            },
            revision: self.revision(),
        })
    }

    /// Revision `n`: who, when, why, and every change with before and after.
    pub async fn revision_detail(
        &self,
        n: i64,
    ) -> Result<(RevisionInfo, Vec<HistoryItem>), AppError> {
        Ok(self.store().revision(n).await?)
    }

    /// Every change to the item `id` of `kind`, oldest first (404 naming
    /// `id` when it never existed).
    pub async fn history(&self, kind: EntityKind, id: &str) -> Result<History, AppError> {
        let history = self.store().history(kind, id).await?;
        if history.is_empty() {
            let kind = match kind {
                EntityKind::FrictionEntry => "friction entry",
                other => other.as_str(),
            };
            return Err(CatalogueError::NotFound {
                field: "id".into(),
                kind,
                id: id.into(),
            }
            .into());
        }
        Ok(AtRevision {
            value: history,
            revision: self.revision(),
        })
    }

    /// What differs between revisions `from` and `to`, item by item.
    pub async fn diff(&self, from: i64, to: i64) -> Result<Vec<DiffItem>, AppError> {
        let a = self
            .snapshot(Some(from))
            .await
            .map_err(|e| naming(e, "from"))?;
        let b = self.snapshot(Some(to)).await.map_err(|e| naming(e, "to"))?;
        Ok(diff(&a, &b))
    }

    /// The catalogue (current or at `revision`) as JSON, or its friction
    /// entries as CSV (`csv_bom`: `Some(with a byte order mark)`).
    pub async fn export(
        &self,
        revision: Option<i64>,
        csv_bom: Option<bool>,
    ) -> Result<CatalogueExport, AppError> {
        let snap = self.snapshot(revision).await?;
        let Some(bom) = csv_bom else {
            return Ok(CatalogueExport::Json(snap));
        };
        let evidence = self.store().entry_evidence(&snap).await?;
        let options = exchange::CsvOptions {
            bom,
            evidence: Some(&evidence),
        };
        let text = exchange::to_csv_with(&snap, &options).map_err(AppError::Internal)?;
        Ok(CatalogueExport::Csv {
            revision: snap.revision,
            text,
        })
    }

    /// Reads a whole catalogue file (CSV of friction entries when `csv`,
    /// else JSON as exported) and applies what differs from the current
    /// catalogue as one revision, or refuses it whole with every problem.
    /// `reason` overrides the file's own.
    pub async fn import(
        &self,
        text: &str,
        csv: bool,
        actor: &str,
        reason: Option<&str>,
        evidence: &str,
    ) -> Result<Imported, AppError> {
        let parsed = if csv {
            exchange::parse_csv(text)
        } else {
            exchange::parse_json(text)
        };
        let parsed = parsed.map_err(|problems| {
            AppError::Fields(
                problems
                    .into_iter()
                    .map(|p| FieldProblem::malformed(p.field, p.reason))
                    .collect(),
            )
        })?;
        let current = self.current();
        let items = exchange::changes_for(&current, &parsed);
        if items.is_empty() {
            return Ok(Imported::Unchanged {
                revision: current.revision,
            });
        }
        let set = ChangeSet {
            actor: actor.to_owned(),
            reason: reason
                .map(str::to_owned)
                .or(parsed.reason.clone())
                .unwrap_or_default(),
            evidence: Some(evidence.to_owned()),
            items,
        };
        let applied = self.apply(&set).await?;
        Ok(Imported::Applied {
            changes: applied.records.len(),
            revision: applied.snapshot.revision,
        })
    }
}
