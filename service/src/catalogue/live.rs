//! The catalogue the service answers from: the current snapshot behind an
//! atomic pointer (readers never wait, a change swaps it in whole), a small
//! cache of past revisions loaded on demand, and a "may be stale" flag set
//! while the database cannot be reached.

use std::collections::BTreeMap;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, Mutex};

use arc_swap::ArcSwap;

use super::Snapshot;

/// How many past revisions are kept in memory (least recently loaded
/// dropped first). Each snapshot is a few kilobytes.
const PAST_CACHE: usize = 64;

#[derive(Debug)]
pub struct Live {
    current: ArcSwap<Snapshot>,
    past: Mutex<BTreeMap<i64, (u64, Arc<Snapshot>)>>,
    tick: std::sync::atomic::AtomicU64,
    stale: AtomicBool,
}

impl Live {
    pub fn new(snapshot: Snapshot) -> Self {
        Self {
            current: ArcSwap::from_pointee(snapshot),
            past: Mutex::new(BTreeMap::new()),
            tick: Default::default(),
            stale: AtomicBool::new(false),
        }
    }

    /// The current catalogue. Cheap (an atomic load and a reference count).
    pub fn current(&self) -> Arc<Snapshot> {
        self.current.load_full()
    }

    pub fn revision(&self) -> i64 {
        self.current.load().revision
    }

    /// Replaces the current catalogue, unless it is older than the one held
    /// (two reload paths may race; the newest revision always wins). The
    /// replaced snapshot goes into the past-revision cache. Returns whether
    /// it was swapped in.
    pub fn swap(&self, snapshot: Snapshot) -> bool {
        let new = Arc::new(snapshot);
        let mut swapped = false;
        self.current.rcu(|old| {
            if new.revision >= old.revision {
                swapped = true;
                Arc::clone(&new)
            } else {
                swapped = false;
                Arc::clone(old)
            }
        });
        if swapped {
            self.remember(new);
        }
        swapped
    }

    /// The snapshot at `revision` if it is the current one or cached.
    pub fn at(&self, revision: i64) -> Option<Arc<Snapshot>> {
        let current = self.current();
        if current.revision == revision {
            return Some(current);
        }
        let mut past = self.past.lock().ok()?;
        let tick = self.tick.fetch_add(1, Ordering::Relaxed);
        past.get_mut(&revision).map(|(used, s)| {
            *used = tick;
            Arc::clone(s)
        })
    }

    /// Keeps a past revision (loaded from the store) for later requests.
    pub fn remember(&self, snapshot: Arc<Snapshot>) {
        let Ok(mut past) = self.past.lock() else {
            return;
        };
        let tick = self.tick.fetch_add(1, Ordering::Relaxed);
        past.insert(snapshot.revision, (tick, snapshot));
        while past.len() > PAST_CACHE {
            let oldest = past
                .iter()
                .min_by_key(|(_, (used, _))| *used)
                .map(|(r, _)| *r);
            match oldest {
                Some(r) => {
                    past.remove(&r);
                }
                None => break,
            }
        }
    }

    /// True while the store cannot be reached: the catalogue in memory may
    /// be behind the database.
    pub fn is_stale(&self) -> bool {
        self.stale.load(Ordering::Relaxed)
    }

    pub fn set_stale(&self, stale: bool) {
        self.stale.store(stale, Ordering::Relaxed);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn swap_keeps_newest_and_caches_past() {
        let live = Live::new(Snapshot::seed_revision_1());
        assert_eq!(live.revision(), 1);
        let mut r3 = Snapshot::seed_revision_1();
        r3.revision = 3;
        assert!(live.swap(r3));
        let mut r2 = Snapshot::seed_revision_1();
        r2.revision = 2;
        assert!(
            !live.swap(r2),
            "older revision must not replace a newer one"
        );
        assert_eq!(live.revision(), 3);
        assert!(live.at(3).is_some());
        assert!(live.at(2).is_none());
        let mut r1 = Snapshot::seed_revision_1();
        r1.revision = 1;
        live.remember(Arc::new(r1));
        assert_eq!(live.at(1).map(|s| s.revision), Some(1));
        assert!(!live.is_stale());
        live.set_stale(true);
        assert!(live.is_stale());
    }

    #[test]
    fn past_cache_is_bounded() {
        let live = Live::new(Snapshot::seed_revision_1());
        for r in 2..(PAST_CACHE as i64 + 20) {
            let mut s = Snapshot::seed_revision_1();
            s.revision = r;
            live.remember(Arc::new(s));
        }
        let n = live.past.lock().map(|p| p.len()).unwrap_or(0);
        assert!(n <= PAST_CACHE);
    }
}
