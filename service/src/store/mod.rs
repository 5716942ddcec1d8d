//! Persistence of the friction catalogue, friction test series, API
//! tokens and the joint registry (sqlx). PostgreSQL in production, SQLite as the embedded default,
//! behind one [`Store`]. Each query is written once, in the module of its
//! aggregate, as a method of `Store`:
//!
//! - `snapshots` — head revision, current catalogue, catalogue at a
//!   revision, writing a change set as a new revision, the seed;
//! - `history` — revisions, one revision's changes, one item's changes;
//! - `friction_series` — stored friction test series and their uses;
//! - `tokens` — API tokens;
//! - `joints` — the joint registry's definitions, their history and review
//!   marks; `releases` — frozen releases and their status events
//!   (`releases_bulk`: many joints' releases in one transaction);
//!   `outbox` — events written with the change they announce (and a
//!   delivery per subscription to their type);
//! - `subscriptions` — webhook subscriptions and their delivery log;
//!   `deliveries` — claiming due deliveries and settling each attempt.
//!
//! `backend` holds what differs between the databases (connecting,
//! migrations, transaction start, head lock, notification) and the
//! `dispatch!` that compiles a query body for both; `watch` keeps an
//! instance's live catalogue in step with the database; `error` tells an
//! outage from other failures. Catalogue rules live in
//! `catalogue::apply`; the store only persists what it returns.

mod backend;
pub mod deliveries;
pub mod error;
pub mod friction_series;
mod history;
mod impact;
pub mod joints;
pub mod joints_bulk;
pub mod outbox;
pub mod releases;
pub mod releases_bulk;
mod snapshots;
pub mod subscriptions;
pub mod tokens;
pub mod watch;

use chrono::{DateTime, Utc};
use serde::Serialize;

use crate::catalogue::{
    Action, Change, ChangeItem, ChangeSet, EntityKind, EntryInput, FinishInput, LubricantInput,
    Snapshot,
};
pub use backend::DEFAULT_SQLITE_PATH;
use backend::{PG_MIGRATOR, SQLITE_MIGRATOR};
pub use error::{RegistryStoreError, StoreError, RETRY_AFTER_SECS};
pub use impact::ActiveKey;
pub use tokens::{Role, TokenInfo};

/// Author recorded for revision 1.
pub const SEED_ACTOR: &str = "seed";

/// One catalogue revision: who, when, why, how many changes.
#[derive(Debug, Clone, PartialEq, Serialize, utoipa::ToSchema)]
pub struct RevisionInfo {
    pub revision: i64,
    #[schema(value_type = String, format = DateTime)]
    pub created_at: DateTime<Utc>,
    pub actor: String,
    pub reason: String,
    /// Evidence the change rests on, e.g. `friction-test:42`.
    pub evidence: Option<String>,
    /// How many changes the revision made (the detail lists them under
    /// `changes`).
    pub change_count: i64,
}

/// One change to one item, as the append-only history holds it.
#[derive(Debug, Clone, PartialEq, Serialize, utoipa::ToSchema)]
pub struct HistoryItem {
    pub seq: i64,
    pub revision: i64,
    pub entity: EntityKind,
    pub entity_id: String,
    pub action: Action,
    #[schema(value_type = Option<Object>)]
    pub before: Option<serde_json::Value>,
    #[schema(value_type = Object)]
    pub after: serde_json::Value,
    pub actor: String,
    pub reason: String,
    pub evidence: Option<String>,
    #[schema(value_type = String, format = DateTime)]
    pub created_at: DateTime<Utc>,
}

/// The store: a connection pool to one of the two backends. Cheap to clone.
#[derive(Debug, Clone)]
pub enum Store {
    Postgres(sqlx::PgPool),
    Sqlite(sqlx::SqlitePool),
}

impl Store {
    /// Connects, runs the migrations and writes the seed (revision 1) into
    /// an empty catalogue. `None` → the embedded SQLite file
    /// [`DEFAULT_SQLITE_PATH`] (its directory is created).
    #[tracing::instrument(skip_all, level = "debug")]
    pub async fn open(url: Option<&str>) -> Result<Store, StoreError> {
        let store = Store::connect(url).await?;
        store.migrate().await?;
        Ok(store)
    }

    /// Connects without migrating (the URL may hold a password: not logged).
    #[tracing::instrument(skip_all, level = "debug")]
    pub async fn connect(url: Option<&str>) -> Result<Store, StoreError> {
        backend::connect(url).await
    }

    pub fn backend(&self) -> &'static str {
        match self {
            Store::Postgres(_) => "postgres",
            Store::Sqlite(_) => "sqlite",
        }
    }

    /// Applies pending migrations and writes the seed (idempotent; an
    /// older database upgrades in place). The schema migrations before
    /// [`FIRST_CATALOGUE_MIGRATION`] run first, then the seed is written as
    /// revision 1 into an empty catalogue, then the rest, which may write
    /// later catalogue revisions on top of it.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn migrate(&self) -> Result<(), StoreError> {
        match self {
            Store::Postgres(p) => schema_only(&PG_MIGRATOR).run(p).await?,
            Store::Sqlite(p) => schema_only(&SQLITE_MIGRATOR).run(p).await?,
        }
        self.ensure_seeded().await?;
        match self {
            Store::Postgres(p) => PG_MIGRATOR.run(p).await?,
            Store::Sqlite(p) => SQLITE_MIGRATOR.run(p).await?,
        }
        Ok(())
    }

    /// Closes the pool (tests and shutdown).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn close(&self) {
        match self {
            Store::Postgres(p) => p.close().await,
            Store::Sqlite(p) => p.close().await,
        }
    }
}

/// The first migration that writes a catalogue revision (the seed must be
/// there before it runs); the later migrations of both backends may too.
pub const FIRST_CATALOGUE_MIGRATION: i64 = 20261203060000;

/// The migrations before [`FIRST_CATALOGUE_MIGRATION`]. Later ones already
/// applied are left alone (`ignore_missing`); the full migrator runs them
/// after the seed. The fields are set directly because sqlx offers no
/// constructor from a list of migrations.
fn schema_only(all: &sqlx::migrate::Migrator) -> sqlx::migrate::Migrator {
    let migrations: Vec<sqlx::migrate::Migration> = all
        .iter()
        .filter(|m| m.version < FIRST_CATALOGUE_MIGRATION)
        .cloned()
        .collect();
    sqlx::migrate::Migrator {
        migrations: std::borrow::Cow::Owned(migrations),
        ignore_missing: true,
        locking: all.locking,
        no_tx: all.no_tx,
    }
}

/// The seed catalogue as a batch of creations, in the seed file's order so
/// the entries get the seed's ids.
pub fn seed_change_set() -> ChangeSet {
    let seed = Snapshot::seed_revision_1();
    let mut items = Vec::new();
    for (i, f) in seed.finishes.iter().enumerate() {
        items.push(ChangeItem {
            at: format!("finishes[{i}]."),
            change: Change::CreateFinish(FinishInput {
                id: f.id.clone(),
                name: f.name.clone(),
                electroplated: f.electroplated,
                stainless: f.stainless,
                notes: f.notes.clone(),
                status: Some(f.status),
            }),
        });
    }
    for (i, l) in seed.lubricants.iter().enumerate() {
        items.push(ChangeItem {
            at: format!("lubricants[{i}]."),
            change: Change::CreateLubricant(LubricantInput {
                id: l.id.clone(),
                name: l.name.clone(),
                dry: l.dry,
                notes: l.notes.clone(),
                status: Some(l.status),
            }),
        });
    }
    let mut entries = seed.entries.clone();
    entries.sort_by_key(|e| e.id);
    for (i, e) in entries.iter().enumerate() {
        items.push(ChangeItem {
            at: format!("entries[{i}]."),
            change: Change::CreateEntry(EntryInput::from(e)),
        });
    }
    ChangeSet {
        actor: SEED_ACTOR.into(),
        reason: crate::catalogue::seed::seed_reason(),
        evidence: None,
        items,
    }
}
