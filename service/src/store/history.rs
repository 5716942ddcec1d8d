//! Catalogue history: the list of revisions, one revision with its changes,
//! and every change to one item. The tables are append-only.

use std::collections::HashMap;

use chrono::{DateTime, Utc};

use super::backend::dispatch;
use super::{HistoryItem, RevisionInfo, Store, StoreError};
use crate::catalogue::{Action, CatalogueError, EntityKind, Snapshot};

const REVISION_COLUMNS: &str = "SELECT r.revision, r.created_at, r.actor, r.reason, \
     r.evidence, (SELECT COUNT(*) FROM catalogue_history h WHERE h.revision = r.revision) \
     AS change_count FROM catalogue_revisions r";

const HISTORY_COLUMNS: &str = "SELECT h.seq, h.revision, h.entity_kind, h.entity_id, h.action, \
     h.before_json, h.after_json, h.actor, h.reason, r.evidence, h.created_at \
     FROM catalogue_history h JOIN catalogue_revisions r ON r.revision = h.revision";

/// A `catalogue_revisions` row with its change count.
#[derive(sqlx::FromRow)]
struct RevisionRow {
    revision: i64,
    created_at: DateTime<Utc>,
    actor: String,
    reason: String,
    evidence: Option<String>,
    change_count: i64,
}

impl From<RevisionRow> for RevisionInfo {
    fn from(r: RevisionRow) -> Self {
        RevisionInfo {
            revision: r.revision,
            created_at: r.created_at,
            actor: r.actor,
            reason: r.reason,
            evidence: r.evidence,
            change_count: r.change_count,
        }
    }
}

/// A `catalogue_history` row with its revision's evidence.
#[derive(sqlx::FromRow)]
struct HistoryRow {
    seq: i64,
    revision: i64,
    entity_kind: String,
    entity_id: String,
    action: String,
    before_json: Option<String>,
    after_json: String,
    actor: String,
    reason: String,
    evidence: Option<String>,
    created_at: DateTime<Utc>,
}

impl TryFrom<HistoryRow> for HistoryItem {
    type Error = StoreError;

    fn try_from(r: HistoryRow) -> Result<Self, StoreError> {
        let kind = &r.entity_kind;
        let action = &r.action;
        Ok(HistoryItem {
            seq: r.seq,
            revision: r.revision,
            entity: EntityKind::parse(kind)
                .ok_or_else(|| StoreError::Internal(format!("unknown entity kind {kind}")))?,
            entity_id: r.entity_id,
            action: Action::parse(action)
                .ok_or_else(|| StoreError::Internal(format!("unknown action {action}")))?,
            before: r
                .before_json
                .map(|b| serde_json::from_str(&b))
                .transpose()?,
            after: serde_json::from_str(&r.after_json)?,
            actor: r.actor,
            reason: r.reason,
            evidence: r.evidence,
            created_at: r.created_at,
        })
    }
}

fn items(rows: Vec<HistoryRow>) -> Result<Vec<HistoryItem>, StoreError> {
    rows.into_iter().map(HistoryItem::try_from).collect()
}

impl Store {
    /// Revisions newest first; `before` is an exclusive cursor; `limit` is
    /// held to 1–1000.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn revisions(
        &self,
        before: Option<i64>,
        limit: i64,
    ) -> Result<Vec<RevisionInfo>, StoreError> {
        let before = before.unwrap_or(i64::MAX);
        let limit = limit.clamp(1, 1000);
        let sql =
            format!("{REVISION_COLUMNS} WHERE r.revision < $1 ORDER BY r.revision DESC LIMIT $2");
        let rows: Vec<RevisionRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(before)
            .bind(limit)
            .fetch_all(pool)
            .await?);
        Ok(rows.into_iter().map(RevisionInfo::from).collect())
    }

    /// The evidence reference (e.g. `friction-test:42`) of each revision
    /// that last changed an entry of `snapshot`, by revision number; one
    /// look-up per distinct revision.
    #[tracing::instrument(skip_all, level = "debug", fields(revision = snapshot.revision))]
    pub async fn entry_evidence(
        &self,
        snapshot: &Snapshot,
    ) -> Result<HashMap<i64, String>, StoreError> {
        let mut numbers: Vec<i64> = snapshot.entries.iter().map(|e| e.revision).collect();
        numbers.sort_unstable();
        numbers.dedup();
        let mut found = HashMap::new();
        for n in numbers {
            let info = self.revisions(Some(n.saturating_add(1)), 1).await?;
            if let Some(evidence) = info
                .into_iter()
                .find(|i| i.revision == n)
                .and_then(|i| i.evidence)
            {
                found.insert(n, evidence);
            }
        }
        Ok(found)
    }

    /// One revision and every change it made.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn revision(&self, n: i64) -> Result<(RevisionInfo, Vec<HistoryItem>), StoreError> {
        let sql = format!("{REVISION_COLUMNS} WHERE r.revision = $1");
        let found: Option<RevisionRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(n)
            .fetch_optional(pool)
            .await?);
        let Some(info) = found else {
            let current = self.head().await?;
            return Err(CatalogueError::UnknownRevision {
                field: "revision".into(),
                revision: n,
                current,
            }
            .into());
        };
        let sql = format!("{HISTORY_COLUMNS} WHERE h.revision = $1 ORDER BY h.seq");
        let rows: Vec<HistoryRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(n)
            .fetch_all(pool)
            .await?);
        Ok((info.into(), items(rows)?))
    }

    /// Every change to one item, oldest first.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn history(
        &self,
        kind: EntityKind,
        id: &str,
    ) -> Result<Vec<HistoryItem>, StoreError> {
        let sql = format!(
            "{HISTORY_COLUMNS} WHERE h.entity_kind = $1 AND h.entity_id = $2 ORDER BY h.seq"
        );
        let rows: Vec<HistoryRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(kind.as_str())
            .bind(id)
            .fetch_all(pool)
            .await?);
        items(rows)
    }
}
