//! Catalogue snapshots: the head revision, the current catalogue, the
//! catalogue at a past revision (rebuilt from history), and writing a change
//! set as one new revision. The rules of a change live in
//! `catalogue::apply`; this module persists what it returns.

use std::sync::Arc;

use chrono::Utc;

use super::backend::{dispatch, Tx};
use super::{outbox, Store, StoreError};
use crate::catalogue::{self, Applied, CatalogueError, ChangeSet, EntityKind, Live, Snapshot};
use crate::registry::{event, OutboxEvent};

pub(super) const HEAD: &str = "SELECT revision FROM catalogue_head WHERE id = 1";

/// For every item, its state after its last change at or before `$1`.
const STATE_AT: &str = "SELECT h.entity_kind, h.after_json FROM catalogue_history h \
     JOIN (SELECT MAX(seq) AS seq FROM catalogue_history WHERE revision <= $1 \
           GROUP BY entity_kind, entity_id) last ON last.seq = h.seq";

const INSERT_REVISION: &str = "INSERT INTO catalogue_revisions \
     (revision, created_at, actor, reason, evidence) VALUES ($1, $2, $3, $4, $5)";

const INSERT_HISTORY: &str = "INSERT INTO catalogue_history (revision, entity_kind, entity_id, \
     action, before_json, after_json, actor, reason, created_at) \
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)";

const UPSERT_FINISH: &str = "INSERT INTO finishes (id, status, revision, body) \
     VALUES ($1, $2, $3, $4) ON CONFLICT (id) DO UPDATE SET status = excluded.status, \
     revision = excluded.revision, body = excluded.body";

const UPSERT_LUBRICANT: &str = "INSERT INTO lubricants (id, status, revision, body) \
     VALUES ($1, $2, $3, $4) ON CONFLICT (id) DO UPDATE SET status = excluded.status, \
     revision = excluded.revision, body = excluded.body";

const UPSERT_ENTRY: &str = "INSERT INTO friction_entries (id, finish, lubricant, \
     bearing_surface, status, revision, body) VALUES ($1, $2, $3, $4, $5, $6, $7) \
     ON CONFLICT (id) DO UPDATE SET finish = excluded.finish, lubricant = excluded.lubricant, \
     bearing_surface = excluded.bearing_surface, status = excluded.status, \
     revision = excluded.revision, body = excluded.body";

const SET_HEAD: &str = "UPDATE catalogue_head SET revision = $1 WHERE id = 1";

impl Store {
    /// The catalogue's current revision number (a cheap query; also the
    /// watcher's health probe).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn head(&self) -> Result<i64, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_scalar(HEAD)
            .fetch_one(pool)
            .await?))
    }

    /// The registry's change counter (`registry_generation`): database
    /// triggers add one on every write to joints, releases and release
    /// events. The watcher reads it to end what the instance keeps of the
    /// answers fetched by joint id.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn registry_generation(&self) -> Result<i64, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_scalar(
            "SELECT n FROM registry_generation WHERE id = 1"
        )
        .fetch_one(pool)
        .await?))
    }

    /// The current catalogue, read in one consistent transaction.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn load_current(&self) -> Result<Snapshot, StoreError> {
        let mut tx = Tx::read(self).await?;
        let revision = dispatch!(Tx, &mut tx, |c| sqlx::query_scalar(HEAD)
            .fetch_one(&mut **c)
            .await?);
        let s = current_in(&mut tx, revision).await?;
        tx.commit().await?;
        Ok(s)
    }

    /// The catalogue as it was at `revision`, rebuilt from history.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn load_at(&self, revision: i64) -> Result<Snapshot, StoreError> {
        let mut tx = Tx::read(self).await?;
        let current: i64 = dispatch!(Tx, &mut tx, |c| sqlx::query_scalar(HEAD)
            .fetch_one(&mut **c)
            .await?);
        if revision < 1 || revision > current {
            tx.rollback().await?;
            return Err(CatalogueError::UnknownRevision {
                field: "catalogue_revision".into(),
                revision,
                current,
            }
            .into());
        }
        let rows: Vec<(String, String)> = dispatch!(Tx, &mut tx, |c| sqlx::query_as(STATE_AT)
            .bind(revision)
            .fetch_all(&mut **c)
            .await?);
        tx.commit().await?;
        let mut s = empty(revision);
        for (kind, after) in rows {
            match EntityKind::parse(&kind) {
                Some(EntityKind::Finish) => s.finishes.push(serde_json::from_str(&after)?),
                Some(EntityKind::Lubricant) => s.lubricants.push(serde_json::from_str(&after)?),
                Some(EntityKind::FrictionEntry) => s.entries.push(serde_json::from_str(&after)?),
                None => return Err(StoreError::Internal(format!("unknown entity kind {kind}"))),
            }
        }
        s.normalise();
        Ok(s)
    }

    /// Checks and writes a batch as one new revision, in one transaction;
    /// nothing is written on any error.
    #[tracing::instrument(skip_all, level = "debug", fields(actor = %set.actor, items = set.items.len()))]
    pub async fn apply(&self, set: &ChangeSet) -> Result<Applied, StoreError> {
        let applied = apply_in(self, set, false).await?;
        applied.ok_or_else(|| StoreError::Internal("write skipped".into()))
    }

    /// As [`Store::apply`], then swaps the new revision into `live` (other
    /// instances pick it up through the watcher). An outage marks `live`
    /// as possibly stale.
    #[tracing::instrument(skip_all, level = "debug", fields(actor = %set.actor, items = set.items.len()))]
    pub async fn apply_live(&self, live: &Live, set: &ChangeSet) -> Result<Applied, StoreError> {
        match self.apply(set).await {
            Ok(applied) => {
                live.set_stale(false);
                live.swap(applied.snapshot.clone());
                Ok(applied)
            }
            Err(e) => {
                if e.is_unavailable() {
                    live.set_stale(true);
                }
                Err(e)
            }
        }
    }

    /// The catalogue at `revision`: from memory when cached, else rebuilt
    /// from history and cached.
    #[tracing::instrument(skip(self, live), level = "debug")]
    pub async fn snapshot_at(
        &self,
        live: &Live,
        revision: i64,
    ) -> Result<Arc<Snapshot>, StoreError> {
        if let Some(s) = live.at(revision) {
            return Ok(s);
        }
        let s = Arc::new(self.load_at(revision).await?);
        live.remember(Arc::clone(&s));
        Ok(s)
    }

    /// Writes the seed catalogue as revision 1 when the catalogue is empty.
    /// Safe when several instances start at once (the head row is locked).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn ensure_seeded(&self) -> Result<(), StoreError> {
        if self.head().await? > 0 {
            return Ok(());
        }
        if let Some(applied) = apply_in(self, &super::seed_change_set(), true).await? {
            let mut expected = Snapshot::seed_revision_1();
            expected.normalise();
            if applied.snapshot != expected {
                return Err(StoreError::Internal(
                    "the seed written differs from the embedded seed catalogue".into(),
                ));
            }
            tracing::info!(backend = self.backend(), "catalogue seeded as revision 1");
        }
        Ok(())
    }
}

fn empty(revision: i64) -> Snapshot {
    Snapshot {
        revision,
        finishes: vec![],
        lubricants: vec![],
        entries: vec![],
    }
}

/// The current tables, as of `revision`, inside an open transaction.
async fn current_in(tx: &mut Tx, revision: i64) -> Result<Snapshot, StoreError> {
    let mut s = empty(revision);
    for (table, kind) in [
        ("finishes", EntityKind::Finish),
        ("lubricants", EntityKind::Lubricant),
        ("friction_entries", EntityKind::FrictionEntry),
    ] {
        let sql = format!("SELECT body FROM {table}");
        let bodies: Vec<String> = dispatch!(Tx, &mut *tx, |c| sqlx::query_scalar(&sql)
            .fetch_all(&mut **c)
            .await?);
        for body in bodies {
            match kind {
                EntityKind::Finish => s.finishes.push(serde_json::from_str(&body)?),
                EntityKind::Lubricant => s.lubricants.push(serde_json::from_str(&body)?),
                EntityKind::FrictionEntry => s.entries.push(serde_json::from_str(&body)?),
            }
        }
    }
    s.normalise();
    Ok(s)
}

/// Checks and writes a batch as one new revision in one transaction.
/// `only_if_empty` is for the seed: it is written only at revision 0.
async fn apply_in(
    store: &Store,
    set: &ChangeSet,
    only_if_empty: bool,
) -> Result<Option<Applied>, StoreError> {
    let mut tx = Tx::write(store).await?;
    let revision = tx.lock_head().await?;
    if only_if_empty && revision > 0 {
        // release the write lock now, not when the pool next uses the
        // connection (a migration may be about to write)
        tx.rollback().await?;
        return Ok(None);
    }
    let current = current_in(&mut tx, revision).await?;
    let applied = match catalogue::apply(&current, set) {
        Ok(applied) => applied,
        Err(e) => {
            // a refused change releases the write lock at once
            tx.rollback().await?;
            return Err(e.into());
        }
    };
    write(&mut tx, set, &applied).await?;
    // Revisions are announced in the transaction that writes them. The
    // seed, and any revision written to a schema older than the outbox (a
    // database part-way through its migrations), go unannounced.
    if !only_if_empty && has_outbox(&mut tx).await? {
        outbox::insert_in(&mut tx, &revision_event(set, &applied)).await?;
    }
    tx.commit().await?;
    Ok(Some(applied))
}

const HAS_OUTBOX_POSTGRES: &str = "SELECT to_regclass('outbox') IS NOT NULL";
const HAS_OUTBOX_SQLITE: &str =
    "SELECT EXISTS (SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'outbox')";

/// Whether the schema has the outbox yet.
async fn has_outbox(tx: &mut Tx) -> Result<bool, StoreError> {
    let sql = tx.by_backend(HAS_OUTBOX_POSTGRES, HAS_OUTBOX_SQLITE);
    Ok(dispatch!(Tx, &mut *tx, |c| sqlx::query_scalar(sql)
        .fetch_one(&mut **c)
        .await?))
}

/// `catalogue.revision_created` for a revision: its number, author,
/// reason, evidence and how many changes it made.
fn revision_event(set: &ChangeSet, applied: &Applied) -> OutboxEvent {
    let revision = applied.snapshot.revision;
    OutboxEvent::cloud_event(
        outbox::new_event_id(),
        event::CATALOGUE_REVISION_CREATED,
        &revision.to_string(),
        Utc::now(),
        serde_json::json!({
            "revision": revision,
            "actor": set.actor,
            "reason": set.reason.trim(),
            "evidence": set.evidence,
            "change_count": applied.records.len(),
        }),
    )
}

/// The revision row, one history row per change, the current tables, the
/// head; then the notice to other instances.
async fn write(tx: &mut Tx, set: &ChangeSet, applied: &Applied) -> Result<(), StoreError> {
    let now = Utc::now();
    let revision = applied.snapshot.revision;
    let reason = set.reason.trim();
    dispatch!(Tx, &mut *tx, |c| sqlx::query(INSERT_REVISION)
        .bind(revision)
        .bind(now)
        .bind(&set.actor)
        .bind(reason)
        .bind(&set.evidence)
        .execute(&mut **c)
        .await
        .map(drop)?);
    for rec in &applied.records {
        let after = serde_json::to_string(&rec.after)?;
        let before = rec.before.as_ref().map(serde_json::to_string).transpose()?;
        dispatch!(Tx, &mut *tx, |c| sqlx::query(INSERT_HISTORY)
            .bind(revision)
            .bind(rec.entity.as_str())
            .bind(&rec.entity_id)
            .bind(rec.action.as_str())
            .bind(&before)
            .bind(&after)
            .bind(&set.actor)
            .bind(reason)
            .bind(now)
            .execute(&mut **c)
            .await
            .map(drop)?);
        let status = rec.after["status"].as_str().unwrap_or("active");
        let item_revision = rec.after["revision"].as_i64().unwrap_or(revision);
        match rec.entity {
            EntityKind::Finish | EntityKind::Lubricant => {
                let sql = if rec.entity == EntityKind::Finish {
                    UPSERT_FINISH
                } else {
                    UPSERT_LUBRICANT
                };
                dispatch!(Tx, &mut *tx, |c| sqlx::query(sql)
                    .bind(&rec.entity_id)
                    .bind(status)
                    .bind(item_revision)
                    .bind(&after)
                    .execute(&mut **c)
                    .await
                    .map(drop)?);
            }
            EntityKind::FrictionEntry => {
                let id: i64 = rec.entity_id.parse().map_err(|_| {
                    StoreError::Internal(format!("entry id {} is not a number", rec.entity_id))
                })?;
                dispatch!(Tx, &mut *tx, |c| sqlx::query(UPSERT_ENTRY)
                    .bind(id)
                    .bind(rec.after["finish"].as_str().unwrap_or_default())
                    .bind(rec.after["lubricant"].as_str().unwrap_or_default())
                    .bind(rec.after["bearing_surface"].as_str())
                    .bind(status)
                    .bind(item_revision)
                    .bind(&after)
                    .execute(&mut **c)
                    .await
                    .map(drop)?);
            }
        }
    }
    dispatch!(Tx, &mut *tx, |c| sqlx::query(SET_HEAD)
        .bind(revision)
        .execute(&mut **c)
        .await
        .map(drop)?);
    tx.notify(revision).await
}
