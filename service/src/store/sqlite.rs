//! SQLite backend (the embedded default). `BEGIN IMMEDIATE` takes the
//! database write lock before the head revision is read, so two writers
//! can never build on the same revision.

super::sql::backend!(
    db = sqlx::Sqlite,
    write_begin = "BEGIN IMMEDIATE",
    read_begin = "BEGIN",
    lock_head = "SELECT revision FROM catalogue_head WHERE id = 1",
    notify = None
);

pub static MIGRATOR: sqlx::migrate::Migrator = sqlx::migrate!("../migrations/sqlite");
