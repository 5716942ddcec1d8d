//! [`App`]: the application context every use case runs in — the store and
//! the live catalogue (the revision being served, kept in step with the
//! database by the watcher). Opened once at start-up (`startup.rs`) or by a
//! command-line subcommand; cheap to clone (a pool handle and an `Arc`).

use std::sync::Arc;

use super::releases::fetch_cache::FetchCache;
use super::AppError;
use crate::catalogue::{Live, Snapshot};
use crate::store::Store;

/// The store and the catalogue being served.
#[derive(Debug, Clone)]
pub struct App {
    store: Store,
    live: Arc<Live>,
    /// The four-eyes rule for joint releases (see `app::releases`).
    four_eyes: bool,
    /// The answers fetched by joint id, kept (see `app::releases::fetch_cache`).
    fetch: Arc<FetchCache>,
}

impl App {
    /// Opens the store (`database_url` `None` → embedded SQLite; migrations
    /// and seed applied) and loads the current catalogue. The watcher is
    /// started separately ([`App::watch`]): a command-line run needs none.
    pub async fn open(database_url: Option<&str>) -> Result<Self, AppError> {
        let store = Store::open(database_url).await?;
        let live = Arc::new(Live::new(store.load_current().await?));
        tracing::info!(
            backend = store.backend(),
            revision = live.revision(),
            "catalogue loaded"
        );
        let fetch = Arc::new(FetchCache::default());
        crate::store::watch::refresh_registry(&store, &fetch.seen()).await;
        Ok(Self {
            store,
            live,
            four_eyes: false,
            fetch,
        })
    }

    /// The same context with the four-eyes rule on or off: on, a release
    /// starts as a draft that a second person with the role `approver`
    /// must approve; off, a release is active at once.
    pub fn with_four_eyes(mut self, on: bool) -> Self {
        self.four_eyes = on;
        self
    }

    /// Whether the four-eyes rule is on.
    pub fn four_eyes(&self) -> bool {
        self.four_eyes
    }

    /// Starts the task that keeps the live catalogue in step with the
    /// database; abort the handle on shutdown.
    pub fn watch(&self) -> tokio::task::JoinHandle<()> {
        crate::store::watch::spawn(
            self.store.clone(),
            Arc::clone(&self.live),
            self.fetch.seen(),
        )
    }

    /// Closes the store's connections (command-line runs, at their end).
    pub async fn close(&self) {
        self.store.close().await;
    }

    /// The answers fetched by joint id, kept; for the use cases in `app/`.
    pub(in crate::app) fn fetch_cache(&self) -> &FetchCache {
        &self.fetch
    }

    /// The store, for the use cases in `app/` only.
    pub(in crate::app) fn store(&self) -> &Store {
        &self.store
    }

    /// `postgres` or `sqlite`.
    pub fn backend(&self) -> &'static str {
        self.store.backend()
    }

    /// The head revision as the database holds it (a readiness probe: it
    /// fails while the database cannot be reached).
    pub async fn head(&self) -> Result<i64, AppError> {
        Ok(self.store.head().await?)
    }

    /// The live catalogue.
    pub(in crate::app) fn live(&self) -> &Arc<Live> {
        &self.live
    }

    /// The current catalogue.
    pub fn current(&self) -> Arc<Snapshot> {
        self.live.current()
    }

    /// The current catalogue revision.
    pub fn revision(&self) -> i64 {
        self.live.revision()
    }

    /// Whether the catalogue in memory may be stale (database unreachable).
    pub fn stale(&self) -> bool {
        self.live.is_stale()
    }

    /// The catalogue at `revision` (the current one when `None`): held in
    /// memory when it is current or was read before, else rebuilt from the
    /// store's history (404 naming `catalogue_revision` when it does not
    /// exist).
    pub async fn snapshot(&self, revision: Option<i64>) -> Result<Arc<Snapshot>, AppError> {
        let current = self.live.current();
        match revision {
            None => Ok(current),
            Some(r) if r == current.revision => Ok(current),
            Some(r) => Ok(self.store.snapshot_at(&self.live, r).await?),
        }
    }
}
