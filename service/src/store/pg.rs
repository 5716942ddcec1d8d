//! PostgreSQL backend (production). Writers lock the head row so
//! revisions are sequential across instances; each commit notifies
//! `catalogue_changed` so other instances reload at once.

super::sql::backend!(
    db = sqlx::Postgres,
    write_begin = "BEGIN",
    read_begin = "BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY",
    lock_head = "SELECT revision FROM catalogue_head WHERE id = 1 FOR UPDATE",
    notify = Some("SELECT pg_notify('catalogue_changed', $1)")
);

/// The channel other instances LISTEN on.
pub const CHANNEL: &str = "catalogue_changed";

pub static MIGRATOR: sqlx::migrate::Migrator = sqlx::migrate!("../migrations/postgres");
