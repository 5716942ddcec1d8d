//! Catalogue routes: friction entries (`entries`), finishes and lubricants
//! (`items`), revisions, diff and export (`revisions`), and their wire
//! types (`wire`). Handlers are thin:
//! parse, call the store, render. Rules live in `catalogue::apply`.

mod entries;
mod items;
mod revisions;
pub mod wire;

use std::sync::Arc;

use actix_web::http::header::{self, HeaderMap};

use super::error::{ApiError, FieldError};
use crate::catalogue::{revision_from_etag, CatalogueError, CurrentState, Live, Snapshot};
use crate::store::{Store, StoreError, RETRY_AFTER_SECS};

/// What the catalogue handlers need, registered as
/// `web::Data<CatalogueService>`. `live` is the same catalogue the spec
/// endpoints answer from.
#[derive(Debug, Clone)]
pub struct CatalogueService {
    pub store: Store,
    pub live: Arc<Live>,
}

impl CatalogueService {
    /// The catalogue at `revision` (current when `None`).
    pub async fn snapshot(&self, revision: Option<i64>) -> Result<Arc<Snapshot>, ApiError> {
        match revision {
            None => Ok(self.live.current()),
            Some(r) => Ok(self.store.snapshot_at(&self.live, r).await?),
        }
    }

    pub fn stale(&self) -> bool {
        self.live.is_stale()
    }
}

/// Registers every catalogue route.
pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    entries::configure(cfg);
    items::configure(cfg);
    revisions::configure(cfg);
}

/// The revision an `If-Match` header names for the resource whose tags
/// start with `prefix` (`entry-7`, `finish-plain`). Missing → 428; `*`, a
/// tag of another resource, or one that is not ours → 412 (a blind
/// overwrite is never allowed).
pub(crate) fn if_match(headers: &HeaderMap, prefix: &str) -> Result<i64, ApiError> {
    let Some(value) = headers.get(header::IF_MATCH) else {
        return Err(ApiError::PreconditionRequired {
            detail: "changes need If-Match with the ETag from GET (optimistic concurrency: no lost updates)".into(),
        });
    };
    let text = value.to_str().unwrap_or("").trim();
    let bare = text.strip_prefix("W/").unwrap_or(text).trim_matches('"');
    let ours = bare.rsplit_once("-r").is_some_and(|(p, _)| p == prefix);
    match revision_from_etag(text) {
        Some(rev) if ours => Ok(rev),
        _ => Err(ApiError::PreconditionFailed {
            detail: format!("If-Match '{text}' is not an ETag of this resource; GET it and resend with its ETag"),
            current: None,
        }),
    }
}

fn current_json(c: &CurrentState) -> Option<serde_json::Value> {
    match c {
        CurrentState::Entry(e) => serde_json::to_value(e).ok(),
        CurrentState::Finish(f) => serde_json::to_value(f).ok(),
        CurrentState::Lubricant(l) => serde_json::to_value(l).ok(),
    }
}

fn field_errors(e: &CatalogueError) -> Vec<FieldError> {
    e.problems()
        .into_iter()
        .map(|p| FieldError::new(p.field, p.reason).with_suggestions(p.suggestions))
        .collect()
}

impl From<CatalogueError> for ApiError {
    fn from(e: CatalogueError) -> Self {
        match &e {
            CatalogueError::Unknown {
                field,
                kind,
                given,
                suggestions,
            } => ApiError::unknown(field.clone(), kind, given, suggestions.clone()),
            CatalogueError::NoFrictionEntry { .. }
            | CatalogueError::NotFound { .. }
            | CatalogueError::UnknownRevision { .. } => ApiError::NotFound {
                detail: e.to_string(),
                errors: field_errors(&e),
            },
            CatalogueError::Stale { current, .. } => ApiError::PreconditionFailed {
                detail: format!(
                    "{e}; the current state is in `current`: merge and resend with its ETag"
                ),
                current: current_json(current),
            },
            CatalogueError::Invalid { .. } => ApiError::unprocessable(field_errors(&e)),
        }
    }
}

/// Maps a store error to its HTTP meaning (503 with Retry-After for an
/// outage; internals logged, never shown).
pub(crate) fn store_error(e: StoreError) -> ApiError {
    match e {
        StoreError::Catalogue(c) => c.into(),
        StoreError::Unavailable { reason } => {
            tracing::warn!(%reason, "catalogue database unavailable");
            ApiError::Unavailable {
                detail: "the catalogue database is unavailable; reads continue from memory (may be stale), \
                         retry changes later"
                    .into(),
                retry_after_secs: RETRY_AFTER_SECS,
            }
        }
        StoreError::Conflict { field, reason } => ApiError::Conflict {
            detail: format!("{field}: {reason}"),
            errors: vec![FieldError::new(field, reason)],
        },
        StoreError::NotFound { field, reason } => ApiError::NotFound {
            detail: format!("{field}: {reason}"),
            errors: vec![FieldError::new(field, reason)],
        },
        StoreError::Internal(m) => ApiError::Internal(m),
    }
}

impl From<StoreError> for ApiError {
    fn from(e: StoreError) -> Self {
        store_error(e)
    }
}

/// Everything the catalogue routes need, opened from configuration.
pub struct CatalogueWiring {
    pub service: actix_web::web::Data<CatalogueService>,
    pub auth: actix_web::web::Data<super::auth::Authenticator>,
    /// Keeps the in-memory catalogue in step with the database; abort on shutdown.
    pub watcher: tokio::task::JoinHandle<()>,
}

impl CatalogueWiring {
    /// Opens the store (migrations, seed), loads the current catalogue and
    /// starts the watcher. `database_url` `None` → embedded SQLite.
    pub async fn open(
        database_url: Option<&str>,
        anonymous_reads: bool,
    ) -> Result<Self, StoreError> {
        let store = Store::open(database_url).await?;
        let live = Arc::new(Live::new(store.load_current().await?));
        let watcher = crate::store::watch::spawn(store.clone(), Arc::clone(&live));
        tracing::info!(
            backend = store.backend(),
            revision = live.revision(),
            "catalogue loaded"
        );
        let auth = super::auth::Authenticator::new(store.clone(), anonymous_reads)
            .with_live(Arc::clone(&live));
        Ok(Self {
            service: actix_web::web::Data::new(CatalogueService { store, live }),
            auth: actix_web::web::Data::new(auth),
            watcher,
        })
    }

    /// The live catalogue (share it with `AppState`).
    pub fn live(&self) -> Arc<Live> {
        Arc::clone(&self.service.live)
    }
}
