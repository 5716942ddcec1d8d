//! Keeps an instance's in-memory catalogue in step with the database:
//! PostgreSQL `LISTEN catalogue_changed` for an immediate reload, and a
//! revision check every 500 ms as the fallback (and the only path on
//! SQLite), so a change made through another instance is used within 1 s.
//! The same wake-ups read the registry's change counter (PostgreSQL also
//! `LISTEN registry_changed`) into the atomic the application compares its
//! kept fetch answers with.
//! While the database cannot be reached the catalogue is flagged "may be
//! stale"; the watcher keeps retrying and clears the flag on recovery.

use std::sync::atomic::{AtomicI64, Ordering};
use std::sync::Arc;
use std::time::Duration;

use sqlx::postgres::PgListener;

use super::Store;
use crate::catalogue::Live;

/// Notified by the registry's triggers at commit (PostgreSQL).
pub const REGISTRY_CHANNEL: &str = "registry_changed";

/// Fallback revision-check period.
pub const POLL_EVERY: Duration = Duration::from_millis(500);

/// Starts the watcher on the current tokio runtime. It runs until the
/// returned handle is aborted (or the runtime shuts down).
pub fn spawn(
    store: Store,
    live: Arc<Live>,
    registry: Arc<AtomicI64>,
) -> tokio::task::JoinHandle<()> {
    tokio::spawn(run(store, live, registry))
}

enum Wake {
    Notified,
    Tick,
    ListenerLost,
}

async fn run(store: Store, live: Arc<Live>, registry: Arc<AtomicI64>) {
    let mut listener: Option<PgListener> = None;
    let mut tick = tokio::time::interval(POLL_EVERY);
    tick.set_missed_tick_behavior(tokio::time::MissedTickBehavior::Delay);
    loop {
        if let (Store::Postgres(pool), None) = (&store, &listener) {
            listener = listen(pool).await;
        }
        let wake = match listener.as_mut() {
            Some(l) => tokio::select! {
                n = l.recv() => if n.is_ok() { Wake::Notified } else { Wake::ListenerLost },
                _ = tick.tick() => Wake::Tick,
            },
            None => {
                tick.tick().await;
                Wake::Tick
            }
        };
        if matches!(wake, Wake::ListenerLost) {
            listener = None;
        }
        if matches!(wake, Wake::Notified) {
            tracing::debug!("catalogue change notified");
        }
        refresh(&store, &live).await;
        refresh_registry(&store, &registry).await;
    }
}

/// Reads the registry's change counter into `seen` (left as it is while
/// the database cannot be reached: the catalogue's stale flag covers that).
pub async fn refresh_registry(store: &Store, seen: &AtomicI64) {
    match store.registry_generation().await {
        Ok(n) => seen.store(n, Ordering::SeqCst),
        Err(e) => tracing::debug!(error = %e, "registry counter unreadable"),
    }
}

async fn listen(pool: &sqlx::PgPool) -> Option<PgListener> {
    let mut l = match PgListener::connect_with(pool).await {
        Ok(l) => l,
        Err(e) => {
            tracing::debug!(error = %e, "catalogue listener cannot connect yet");
            return None;
        }
    };
    match l
        .listen_all([super::backend::CHANNEL, REGISTRY_CHANNEL])
        .await
    {
        Ok(()) => Some(l),
        Err(e) => {
            tracing::debug!(error = %e, "LISTEN failed");
            None
        }
    }
}

/// One check: reload when the database is ahead; flag staleness when it
/// cannot be reached.
pub async fn refresh(store: &Store, live: &Live) {
    match store.head().await {
        Ok(head) => {
            if head > live.revision() {
                match store.load_current().await {
                    Ok(s) => {
                        let rev = s.revision;
                        if live.swap(s) {
                            tracing::info!(revision = rev, "catalogue reloaded");
                        }
                    }
                    Err(e) => {
                        tracing::warn!(error = %e, "catalogue reload failed");
                        live.set_stale(true);
                        return;
                    }
                }
            }
            if live.is_stale() {
                tracing::info!("catalogue database reachable again");
            }
            live.set_stale(false);
        }
        Err(e) => {
            if !live.is_stale() {
                tracing::warn!(error = %e, "catalogue database unreachable; serving the catalogue in memory (may be stale)");
            }
            live.set_stale(true);
        }
    }
}
