//! Persistence of the friction catalogue and API tokens (sqlx).
//! PostgreSQL in production, SQLite as the embedded default; one
//! interface, [`Store`], whose SQL is shared (`sql.rs`). Catalogue rules
//! live in `catalogue::apply`; the store only persists what it returns.

pub mod error;
pub mod friction_tests;
mod pg;
mod sql;
mod sqlite;
pub mod tokens;
pub mod watch;

use std::path::Path;
use std::str::FromStr;
use std::sync::Arc;
use std::time::Duration;

use chrono::{DateTime, Utc};
use serde::Serialize;
use sqlx::postgres::PgPoolOptions;
use sqlx::sqlite::{SqliteConnectOptions, SqliteJournalMode, SqlitePoolOptions};

use crate::catalogue::{
    Action, Applied, Change, ChangeItem, ChangeSet, EntityKind, EntryInput, FinishInput, Live,
    LubricantInput, Snapshot,
};
pub use error::{StoreError, RETRY_AFTER_SECS};
pub use tokens::{Role, TokenInfo};

/// Where the embedded store lives when no database URL is configured.
pub const DEFAULT_SQLITE_PATH: &str = "./data/tightspec.sqlite";

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
    /// How many items the revision changed (named apart from the revision
    /// detail's `changes` list, which flattens this struct beside it).
    #[serde(rename = "change_count")]
    pub changes: i64,
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

/// How long a request waits for a database connection before the store
/// reports itself unavailable (writes then get 503 + Retry-After).
const ACQUIRE_TIMEOUT: Duration = Duration::from_secs(3);

impl Store {
    /// Connects, runs the migrations and writes the seed (revision 1) into
    /// an empty catalogue. `None` → the embedded SQLite file
    /// [`DEFAULT_SQLITE_PATH`] (its directory is created).
    pub async fn open(url: Option<&str>) -> Result<Store, StoreError> {
        let store = Store::connect(url).await?;
        store.migrate().await?;
        store.ensure_seeded().await?;
        Ok(store)
    }

    /// Connects without migrating.
    pub async fn connect(url: Option<&str>) -> Result<Store, StoreError> {
        let url = url.map(str::trim).filter(|u| !u.is_empty());
        match url {
            Some(u) if u.starts_with("postgres://") || u.starts_with("postgresql://") => {
                let pool = PgPoolOptions::new()
                    .max_connections(16)
                    .acquire_timeout(ACQUIRE_TIMEOUT)
                    .connect(u)
                    .await?;
                Ok(Store::Postgres(pool))
            }
            Some(u) if u.starts_with("sqlite:") => Store::sqlite(u).await,
            Some(u) => Err(StoreError::Internal(format!(
                "unsupported database URL '{}': use postgres://… or sqlite://…",
                u.split('@').next_back().unwrap_or("")
            ))),
            None => {
                let path = Path::new(DEFAULT_SQLITE_PATH);
                if let Some(dir) = path.parent() {
                    std::fs::create_dir_all(dir).map_err(|e| {
                        StoreError::Internal(format!("cannot create {}: {e}", dir.display()))
                    })?;
                }
                Store::sqlite(&format!("sqlite://{DEFAULT_SQLITE_PATH}")).await
            }
        }
    }

    async fn sqlite(url: &str) -> Result<Store, StoreError> {
        let options = SqliteConnectOptions::from_str(url)?
            .create_if_missing(true)
            .journal_mode(SqliteJournalMode::Wal)
            .foreign_keys(true)
            .busy_timeout(Duration::from_secs(5));
        let pool = SqlitePoolOptions::new()
            .max_connections(8)
            .acquire_timeout(ACQUIRE_TIMEOUT)
            .connect_with(options)
            .await?;
        Ok(Store::Sqlite(pool))
    }

    pub fn backend(&self) -> &'static str {
        match self {
            Store::Postgres(_) => "postgres",
            Store::Sqlite(_) => "sqlite",
        }
    }

    /// Applies pending migrations (idempotent; an older database upgrades
    /// in place).
    pub async fn migrate(&self) -> Result<(), StoreError> {
        match self {
            Store::Postgres(p) => pg::MIGRATOR.run(p).await?,
            Store::Sqlite(p) => sqlite::MIGRATOR.run(p).await?,
        }
        Ok(())
    }

    /// Writes the seed catalogue as revision 1 when the catalogue is empty.
    /// Safe when several instances start at once (the head row is locked).
    pub async fn ensure_seeded(&self) -> Result<(), StoreError> {
        let set = seed_change_set();
        let applied = match self {
            Store::Postgres(p) => pg::apply(p, &set, true).await?,
            Store::Sqlite(p) => sqlite::apply(p, &set, true).await?,
        };
        if let Some(applied) = applied {
            let mut expected = Snapshot::seed();
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

    /// The catalogue's current revision number (a cheap query; also the
    /// watcher's health probe).
    pub async fn head(&self) -> Result<i64, StoreError> {
        match self {
            Store::Postgres(p) => pg::head(p).await,
            Store::Sqlite(p) => sqlite::head(p).await,
        }
    }

    pub async fn load_current(&self) -> Result<Snapshot, StoreError> {
        match self {
            Store::Postgres(p) => pg::load_current(p).await,
            Store::Sqlite(p) => sqlite::load_current(p).await,
        }
    }

    pub async fn load_at(&self, revision: i64) -> Result<Snapshot, StoreError> {
        match self {
            Store::Postgres(p) => pg::load_at(p, revision).await,
            Store::Sqlite(p) => sqlite::load_at(p, revision).await,
        }
    }

    /// Checks and writes a batch as one new revision, in one transaction;
    /// nothing is written on any error.
    pub async fn apply(&self, set: &ChangeSet) -> Result<Applied, StoreError> {
        let applied = match self {
            Store::Postgres(p) => pg::apply(p, set, false).await?,
            Store::Sqlite(p) => sqlite::apply(p, set, false).await?,
        };
        applied.ok_or_else(|| StoreError::Internal("write skipped".into()))
    }

    /// As [`Store::apply`], then swaps the new revision into `live` (other
    /// instances pick it up through the watcher). An outage marks `live`
    /// as possibly stale.
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

    /// Revisions newest first; `before` is an exclusive cursor.
    pub async fn revisions(
        &self,
        before: Option<i64>,
        limit: i64,
    ) -> Result<Vec<RevisionInfo>, StoreError> {
        let before = before.unwrap_or(i64::MAX);
        let limit = limit.clamp(1, 1000);
        match self {
            Store::Postgres(p) => pg::revisions(p, before, limit).await,
            Store::Sqlite(p) => sqlite::revisions(p, before, limit).await,
        }
    }

    pub async fn revision(&self, n: i64) -> Result<(RevisionInfo, Vec<HistoryItem>), StoreError> {
        match self {
            Store::Postgres(p) => pg::revision(p, n).await,
            Store::Sqlite(p) => sqlite::revision(p, n).await,
        }
    }

    pub async fn history(
        &self,
        kind: EntityKind,
        id: &str,
    ) -> Result<Vec<HistoryItem>, StoreError> {
        match self {
            Store::Postgres(p) => pg::history(p, kind, id).await,
            Store::Sqlite(p) => sqlite::history(p, kind, id).await,
        }
    }

    /// Creates a token; returns it with its secret, which is never stored
    /// (only its SHA-256) and cannot be shown again.
    pub async fn create_token(
        &self,
        name: &str,
        role: Role,
        expires_at: Option<DateTime<Utc>>,
    ) -> Result<(TokenInfo, String), StoreError> {
        tokens::valid_name(name).map_err(|reason| {
            StoreError::Catalogue(crate::catalogue::CatalogueError::invalid_one(
                "name", reason,
            ))
        })?;
        let secret = tokens::new_secret();
        let hash = tokens::hash_secret(&secret);
        let info = match self {
            Store::Postgres(p) => pg::create_token(p, name, role, expires_at, &hash).await?,
            Store::Sqlite(p) => sqlite::create_token(p, name, role, expires_at, &hash).await?,
        };
        Ok((info, secret))
    }

    pub async fn list_tokens(&self) -> Result<Vec<TokenInfo>, StoreError> {
        match self {
            Store::Postgres(p) => pg::list_tokens(p).await,
            Store::Sqlite(p) => sqlite::list_tokens(p).await,
        }
    }

    pub async fn revoke_token(&self, name_or_id: &str) -> Result<TokenInfo, StoreError> {
        match self {
            Store::Postgres(p) => pg::revoke_token(p, name_or_id).await,
            Store::Sqlite(p) => sqlite::revoke_token(p, name_or_id).await,
        }
    }

    /// Looks a presented secret up by its hash (constant-time compare).
    pub async fn find_token(&self, secret: &str) -> Result<Option<TokenInfo>, StoreError> {
        match self {
            Store::Postgres(p) => pg::find_token(p, secret).await,
            Store::Sqlite(p) => sqlite::find_token(p, secret).await,
        }
    }

    /// Closes the pool (tests and shutdown).
    pub async fn close(&self) {
        match self {
            Store::Postgres(p) => p.close().await,
            Store::Sqlite(p) => p.close().await,
        }
    }
}

/// The seed catalogue as a batch of creations, in the seed file's order so
/// the entries get the seed's ids.
pub fn seed_change_set() -> ChangeSet {
    let seed = Snapshot::seed();
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
