//! Store errors. Outages are a type of their own so the application layer
//! can report `AppError::Unavailable` (HTTP answers 503 with Retry-After
//! while reads go on from memory).

use crate::catalogue::CatalogueError;

#[derive(Debug, thiserror::Error)]
pub enum StoreError {
    /// The change or look-up was refused on catalogue grounds (404/412/422).
    #[error(transparent)]
    Catalogue(#[from] CatalogueError),
    /// The database cannot be reached (or is refusing connections): retry.
    #[error("the catalogue database is unavailable: {reason}")]
    Unavailable { reason: String },
    /// A uniqueness rule in the database refused the write (409).
    #[error("{field}: {reason}")]
    Conflict { field: String, reason: String },
    /// A token (or other store item) addressed by name or id does not exist.
    #[error("{field}: {reason}")]
    NotFound { field: String, reason: String },
    /// Anything else: a defect or a corrupt database. Logged, never shown.
    #[error("store failure: {0}")]
    Internal(String),
}

/// Seconds a client should wait before retrying a write during an outage
/// (the watcher re-checks the database every 500 ms).
pub const RETRY_AFTER_SECS: u64 = 2;

impl StoreError {
    pub fn is_unavailable(&self) -> bool {
        matches!(self, StoreError::Unavailable { .. })
    }
}

/// PostgreSQL SQLSTATE classes/codes that mean "the server is not there
/// for us right now" (PostgreSQL documentation, Appendix A, error codes):
/// class 08 connection exception, 57P01–57P03 operator intervention
/// (shutdown, crash shutdown, cannot connect now), 53300 too many
/// connections, 3D000 database does not exist (dropped under us).
fn pg_unavailable(code: &str) -> bool {
    code.starts_with("08") || matches!(code, "57P01" | "57P02" | "57P03" | "53300" | "3D000")
}

impl From<sqlx::Error> for StoreError {
    fn from(e: sqlx::Error) -> Self {
        use sqlx::Error as E;
        match &e {
            E::Io(_)
            | E::Tls(_)
            | E::PoolTimedOut
            | E::PoolClosed
            | E::WorkerCrashed
            | E::Protocol(_) => StoreError::Unavailable {
                reason: e.to_string(),
            },
            E::Database(db) => {
                let code = db.code().map(|c| c.to_string()).unwrap_or_default();
                // SQLite: 5 SQLITE_BUSY, 6 SQLITE_LOCKED, 517 SQLITE_BUSY_SNAPSHOT.
                if pg_unavailable(&code) || matches!(code.as_str(), "5" | "6" | "517") {
                    StoreError::Unavailable {
                        reason: db.message().to_string(),
                    }
                } else if db.is_unique_violation() {
                    StoreError::Conflict {
                        field: db.constraint().unwrap_or("").to_string(),
                        reason: "a concurrent change already took this key; re-read and retry"
                            .into(),
                    }
                } else {
                    StoreError::Internal(format!("database error {code}: {}", db.message()))
                }
            }
            _ => StoreError::Internal(e.to_string()),
        }
    }
}

impl From<sqlx::migrate::MigrateError> for StoreError {
    fn from(e: sqlx::migrate::MigrateError) -> Self {
        match e {
            sqlx::migrate::MigrateError::Execute(inner) => inner.into(),
            other => StoreError::Internal(format!("migration failed: {other}")),
        }
    }
}

impl From<serde_json::Error> for StoreError {
    fn from(e: serde_json::Error) -> Self {
        StoreError::Internal(format!("stored JSON could not be read: {e}"))
    }
}

/// Why a registry call failed: refused on registry grounds (invalid input,
/// a stale version, a status change not allowed) or a store failure (a
/// duplicate id is `Store(Conflict)` naming `id`, an unknown joint or
/// release `Store(NotFound)`).
#[derive(Debug, thiserror::Error)]
pub enum RegistryStoreError {
    #[error(transparent)]
    Registry(#[from] crate::registry::RegistryError),
    #[error(transparent)]
    Store(#[from] StoreError),
}

impl From<sqlx::Error> for RegistryStoreError {
    fn from(e: sqlx::Error) -> Self {
        RegistryStoreError::Store(e.into())
    }
}

impl From<serde_json::Error> for RegistryStoreError {
    fn from(e: serde_json::Error) -> Self {
        RegistryStoreError::Store(e.into())
    }
}
