//! What differs between the two databases, and nothing else: how to
//! connect, the migrations, how a transaction starts, how the writer locks
//! the head row (and a joint's row), how other instances are told of a new
//! revision. Every query lives in the module of its aggregate (`snapshots`,
//! `history`, `tokens`, `friction_series`, `joints`, `releases`, `outbox`,
//! `subscriptions`, `deliveries`)
//! and is written once: its SQL is portable (`$n` placeholders, `RETURNING`,
//! `ON CONFLICT` work in both), and [`dispatch!`] compiles that one body for
//! each backend.

use std::path::Path;
use std::str::FromStr;
use std::time::Duration;

use sqlx::postgres::PgPoolOptions;
use sqlx::sqlite::{SqliteConnectOptions, SqliteJournalMode, SqlitePoolOptions};

use super::{Store, StoreError};

/// Runs `$body` with `$x` bound to the PostgreSQL or the SQLite value inside
/// `$value` (a [`Store`] or a [`Tx`]): the query in `$body` is written once
/// and compiled for both backends.
macro_rules! dispatch {
    ($kind:ident, $value:expr, |$x:ident| $body:expr) => {
        match $value {
            $kind::Postgres($x) => $body,
            $kind::Sqlite($x) => $body,
        }
    };
}
pub(super) use dispatch;

/// Where the embedded store lives when no database URL is configured.
pub const DEFAULT_SQLITE_PATH: &str = "./data/tightspec.sqlite";

/// How long a request waits for a database connection before the store
/// reports itself unavailable (writes then get 503 + Retry-After).
const ACQUIRE_TIMEOUT: Duration = Duration::from_secs(3);

/// The channel PostgreSQL instances LISTEN on for new revisions.
pub const CHANNEL: &str = "catalogue_changed";

pub static PG_MIGRATOR: sqlx::migrate::Migrator = sqlx::migrate!("../migrations/postgres");
pub static SQLITE_MIGRATOR: sqlx::migrate::Migrator = sqlx::migrate!("../migrations/sqlite");

/// An open transaction on either backend.
pub(super) enum Tx {
    Postgres(sqlx::Transaction<'static, sqlx::Postgres>),
    Sqlite(sqlx::Transaction<'static, sqlx::Sqlite>),
}

impl Tx {
    /// A consistent read-only view: PostgreSQL `REPEATABLE READ READ ONLY`;
    /// SQLite's snapshot starts with the first read of a plain `BEGIN`.
    pub(super) async fn read(store: &Store) -> Result<Tx, StoreError> {
        Ok(match store {
            Store::Postgres(p) => Tx::Postgres(
                p.begin_with("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY")
                    .await?,
            ),
            Store::Sqlite(p) => Tx::Sqlite(p.begin_with("BEGIN").await?),
        })
    }

    /// A write transaction. SQLite's `BEGIN IMMEDIATE` takes the database
    /// write lock before the head revision is read, so two writers never
    /// build on the same revision; PostgreSQL locks the head row instead
    /// ([`Tx::lock_head`]).
    pub(super) async fn write(store: &Store) -> Result<Tx, StoreError> {
        Ok(match store {
            Store::Postgres(p) => Tx::Postgres(p.begin_with("BEGIN").await?),
            Store::Sqlite(p) => Tx::Sqlite(p.begin_with("BEGIN IMMEDIATE").await?),
        })
    }

    /// The head revision, locked until the transaction ends (revisions are
    /// sequential across instances).
    pub(super) async fn lock_head(&mut self) -> Result<i64, StoreError> {
        Ok(match self {
            Tx::Postgres(c) => {
                sqlx::query_scalar("SELECT revision FROM catalogue_head WHERE id = 1 FOR UPDATE")
                    .fetch_one(&mut **c)
                    .await?
            }
            // the write lock is already held (BEGIN IMMEDIATE)
            Tx::Sqlite(c) => {
                sqlx::query_scalar(super::snapshots::HEAD)
                    .fetch_one(&mut **c)
                    .await?
            }
        })
    }

    /// Tells the other instances that `revision` is committed (PostgreSQL
    /// `NOTIFY`, delivered at commit; SQLite instances poll).
    pub(super) async fn notify(&mut self, revision: i64) -> Result<(), StoreError> {
        if let Tx::Postgres(c) = self {
            sqlx::query("SELECT pg_notify($1, $2)")
                .bind(CHANNEL)
                .bind(revision.to_string())
                .execute(&mut **c)
                .await?;
        }
        Ok(())
    }

    /// The version of joint `id`, its row locked until the transaction ends
    /// (PostgreSQL `FOR UPDATE`; SQLite's `BEGIN IMMEDIATE` already holds
    /// the write lock), so two releases or edits of one joint take turns.
    pub(super) async fn lock_joint(&mut self, id: &str) -> Result<Option<i64>, StoreError> {
        Ok(match self {
            Tx::Postgres(c) => {
                sqlx::query_scalar("SELECT version FROM joints WHERE id = $1 FOR UPDATE")
                    .bind(id)
                    .fetch_optional(&mut **c)
                    .await?
            }
            Tx::Sqlite(c) => {
                sqlx::query_scalar("SELECT version FROM joints WHERE id = $1")
                    .bind(id)
                    .fetch_optional(&mut **c)
                    .await?
            }
        })
    }

    /// `postgres` or `sqlite`: the one of two statements this backend
    /// runs, where the databases need different SQL (the delivery claim:
    /// `FOR UPDATE SKIP LOCKED` exists only on PostgreSQL; SQLite's
    /// `BEGIN IMMEDIATE` already makes the claiming transaction the only
    /// writer).
    pub(super) fn by_backend(&self, postgres: &'static str, sqlite: &'static str) -> &'static str {
        match self {
            Tx::Postgres(_) => postgres,
            Tx::Sqlite(_) => sqlite,
        }
    }

    pub(super) async fn commit(self) -> Result<(), StoreError> {
        dispatch!(Tx, self, |c| c.commit().await?);
        Ok(())
    }

    pub(super) async fn rollback(self) -> Result<(), StoreError> {
        dispatch!(Tx, self, |c| c.rollback().await?);
        Ok(())
    }
}

/// A pool for `url`: `postgres://…`, `sqlite:…`, or `None` for the embedded
/// SQLite file [`DEFAULT_SQLITE_PATH`] (its directory is created).
pub(super) async fn connect(url: Option<&str>) -> Result<Store, StoreError> {
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
        Some(u) if u.starts_with("sqlite:") => sqlite(u).await,
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
            sqlite(&format!("sqlite://{DEFAULT_SQLITE_PATH}")).await
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
