//! The answers the line fetches by joint id (`GET /v1/joints/{id}/spec`
//! and `/setpoints` without `?release=`), kept in memory as the bytes and
//! ETag served, so that a fetch does not read the database each time.
//!
//! An answer is kept under a stamp: this instance's own registry writes
//! (every `App` use case that writes joints, releases, release events or
//! review marks calls [`FetchCache::registry_written`] after its write) and
//! the database's registry change counter, which triggers raise on every
//! such write by any instance or the command line and the watcher reads
//! (PostgreSQL `LISTEN registry_changed`, else every 500 ms). An answer kept
//! under another stamp is never served. While the database cannot be
//! reached nothing kept is served (the fetch reads the database and
//! answers 503), so a withdrawal made elsewhere is not hidden.

use std::collections::HashMap;
use std::sync::atomic::{AtomicI64, AtomicU64, Ordering};
use std::sync::{Arc, RwLock};

use bytes::Bytes;

use super::view::FrozenAnswer;

/// Answers kept at most; beyond, everything kept is let go (bounded memory).
pub const KEPT_MAX: usize = 20_000;

/// One answer as served. The body is shared, not copied, by every
/// response that sends it.
#[derive(Debug, PartialEq, Eq)]
pub struct Rendered {
    pub etag: String,
    pub body: Bytes,
}

type Stamp = (u64, i64);

/// Joint id → the stamp an answer was kept under and the answer; one map
/// per answer kind, so that a look-up by `&str` allocates nothing.
type Answers = HashMap<Box<str>, (Stamp, Arc<Rendered>)>;

/// The spec answers and the setpoint answers.
#[derive(Debug, Default)]
struct Kept {
    spec: Answers,
    setpoints: Answers,
}

impl Kept {
    fn of(&self, which: FrozenAnswer) -> &Answers {
        match which {
            FrozenAnswer::Spec => &self.spec,
            FrozenAnswer::Setpoints => &self.setpoints,
        }
    }

    fn len(&self) -> usize {
        self.spec.len() + self.setpoints.len()
    }
}

#[derive(Debug, Default)]
pub struct FetchCache {
    /// Bumped after each of this instance's registry writes.
    written: AtomicU64,
    /// The database's registry change counter as the watcher last read it.
    seen: Arc<AtomicI64>,
    /// Read by every fetch, written on a miss: a read-write lock.
    kept: RwLock<Kept>,
}

impl FetchCache {
    /// The atomic the watcher writes the database's counter into.
    pub fn seen(&self) -> Arc<AtomicI64> {
        Arc::clone(&self.seen)
    }

    /// Called after every registry write of this instance.
    pub fn registry_written(&self) {
        self.written.fetch_add(1, Ordering::SeqCst);
    }

    /// The stamp now; read it before reading the database, so that a write
    /// committed meanwhile leaves what is read under an old stamp.
    pub fn stamp(&self) -> Stamp {
        (
            self.written.load(Ordering::SeqCst),
            self.seen.load(Ordering::SeqCst),
        )
    }

    /// The kept answer for `id`, when kept under `stamp`.
    pub fn get(&self, id: &str, which: FrozenAnswer, stamp: Stamp) -> Option<Arc<Rendered>> {
        let kept = self.kept.read().unwrap_or_else(|p| p.into_inner());
        match kept.of(which).get(id) {
            Some((s, r)) if *s == stamp => Some(Arc::clone(r)),
            _ => None,
        }
    }

    /// Keeps `answer` for `id` under `stamp` (read before the database was).
    pub fn put(&self, id: &str, which: FrozenAnswer, stamp: Stamp, answer: Arc<Rendered>) {
        let mut kept = self.kept.write().unwrap_or_else(|p| p.into_inner());
        if kept.len() >= KEPT_MAX {
            *kept = Kept::default();
        }
        let answers = match which {
            FrozenAnswer::Spec => &mut kept.spec,
            FrozenAnswer::Setpoints => &mut kept.setpoints,
        };
        answers.insert(id.into(), (stamp, answer));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn answer(tag: &str) -> Arc<Rendered> {
        Arc::new(Rendered {
            etag: tag.into(),
            body: Bytes::from_static(b"{}"),
        })
    }

    #[test]
    fn an_answer_is_served_only_under_the_stamp_it_was_kept_with() {
        let c = FetchCache::default();
        let s = c.stamp();
        c.put("K4-RA-017", FrozenAnswer::Setpoints, s, answer("a"));
        let got = c.get("K4-RA-017", FrozenAnswer::Setpoints, c.stamp());
        assert_eq!(got.map(|r| r.etag.clone()), Some("a".to_string()));
        // the other answer of the joint, and another joint: not kept
        assert!(c.get("K4-RA-017", FrozenAnswer::Spec, c.stamp()).is_none());
        assert!(c
            .get("K4-RA-018", FrozenAnswer::Setpoints, c.stamp())
            .is_none());
        // a write of this instance ends it
        c.registry_written();
        assert!(c
            .get("K4-RA-017", FrozenAnswer::Setpoints, c.stamp())
            .is_none());
        // so does a change the watcher read from the database
        let s = c.stamp();
        c.put("K4-RA-017", FrozenAnswer::Setpoints, s, answer("b"));
        assert!(c
            .get("K4-RA-017", FrozenAnswer::Setpoints, c.stamp())
            .is_some());
        c.seen().store(7, Ordering::SeqCst);
        assert!(c
            .get("K4-RA-017", FrozenAnswer::Setpoints, c.stamp())
            .is_none());
    }

    #[test]
    fn an_answer_read_before_a_write_is_not_kept_past_it() {
        let c = FetchCache::default();
        let before = c.stamp(); // a fetch starts and reads the database
        c.registry_written(); // a release commits meanwhile
        c.put("K4-RA-017", FrozenAnswer::Spec, before, answer("old"));
        assert!(c.get("K4-RA-017", FrozenAnswer::Spec, c.stamp()).is_none());
    }

    #[test]
    fn memory_is_bounded() {
        let c = FetchCache::default();
        let s = c.stamp();
        for i in 0..KEPT_MAX + 5 {
            c.put(&format!("J{i}"), FrozenAnswer::Spec, s, answer("x"));
        }
        let kept = c.kept.read().unwrap().len();
        assert!(kept <= KEPT_MAX, "{kept}");
    }
}
