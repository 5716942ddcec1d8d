//! Rendered answers to `GET /v1/tightening-specs` and `GET /v1/setpoints`,
//! kept so that a repeated look-up (a station asking for the same setpoints
//! at every product change) is answered without parsing, computing and
//! writing the JSON again.
//!
//! - Keyed by the raw query string of one route: an answer depends on
//!   nothing else but the catalogue (the reader's token is checked before
//!   the cache is asked, and an answer carries no time or request id).
//! - An entry is used only while the catalogue revision and the
//!   may-be-stale flag it was answered under are still the ones served;
//!   otherwise it is a miss and the fresh answer replaces it.
//! - Only successful answers are kept; a refused request is computed again
//!   (it is cheap and its problem names the request path and id).
//! - Bounded: two generations of at most `capacity / 2` entries each. A new
//!   answer goes into the young one; when that is full the old one is
//!   dropped and the young one becomes old; a hit in the old one moves the
//!   entry back to the young one. Recently used answers stay; memory stays
//!   under `capacity` answers (a spec is about 5 KB). Capacity 0 keeps
//!   nothing; a query string longer than [`MAX_QUERY_BYTES`] is never kept,
//!   so keys cannot grow the cache beyond that either.

use std::collections::HashMap;
use std::sync::{Arc, Mutex};

use actix_web::http::header::HeaderValue;
use actix_web::web::Bytes;

/// Longest query string kept (real look-ups are a few hundred bytes).
pub const MAX_QUERY_BYTES: usize = 2048;

/// One rendered answer and the catalogue state it was answered under.
#[derive(Debug)]
pub struct Rendered {
    pub revision: i64,
    pub stale: bool,
    /// Whether the request named a catalogue revision (Cache-Control).
    pub pinned: bool,
    pub etag: HeaderValue,
    pub body: Bytes,
}

/// The cache of one route.
#[derive(Debug)]
pub struct AnswerCache {
    generation_size: usize,
    generations: Mutex<Generations>,
}

#[derive(Debug, Default)]
struct Generations {
    young: HashMap<Box<str>, Arc<Rendered>>,
    old: HashMap<Box<str>, Arc<Rendered>>,
}

impl Generations {
    fn insert(&mut self, query: Box<str>, answer: Arc<Rendered>, generation_size: usize) {
        self.young.insert(query, answer);
        if self.young.len() >= generation_size {
            self.old = std::mem::take(&mut self.young);
        }
    }
}

impl AnswerCache {
    /// A cache holding at most `capacity` answers (0: none).
    pub fn new(capacity: usize) -> Self {
        Self {
            generation_size: capacity / 2,
            generations: Mutex::new(Generations::default()),
        }
    }

    /// The answer to `query` if one is kept for this catalogue revision and
    /// stale flag.
    pub fn get(&self, query: &str, revision: i64, stale: bool) -> Option<Arc<Rendered>> {
        if self.generation_size == 0 {
            return None;
        }
        let current = |a: &Rendered| a.revision == revision && a.stale == stale;
        let mut g = self.generations.lock().ok()?;
        if let Some(a) = g.young.get(query) {
            return current(a).then(|| Arc::clone(a));
        }
        let (key, answer) = g.old.remove_entry(query)?;
        if !current(&answer) {
            return None;
        }
        g.insert(key, Arc::clone(&answer), self.generation_size);
        Some(answer)
    }

    /// Keeps the answer to `query`.
    pub fn put(&self, query: &str, answer: Arc<Rendered>) {
        if self.generation_size == 0 || query.len() > MAX_QUERY_BYTES {
            return;
        }
        if let Ok(mut g) = self.generations.lock() {
            g.insert(query.into(), answer, self.generation_size);
        }
    }

    /// Answers held now (both generations).
    #[cfg(test)]
    fn len(&self) -> usize {
        self.generations
            .lock()
            .map(|g| g.young.len() + g.old.len())
            .unwrap_or(0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn answer(revision: i64, stale: bool, body: &'static str) -> Arc<Rendered> {
        Arc::new(Rendered {
            revision,
            stale,
            pinned: false,
            etag: HeaderValue::from_static("\"t\""),
            body: Bytes::from_static(body.as_bytes()),
        })
    }

    #[test]
    fn hit_only_for_the_same_query_revision_and_stale_flag() {
        let c = AnswerCache::new(8);
        c.put("thread=M10", answer(3, false, "a"));
        let hit = c.get("thread=M10", 3, false).expect("kept");
        assert_eq!(hit.body, Bytes::from_static(b"a"));
        assert!(c.get("thread=M12", 3, false).is_none());
        assert!(c.get("thread=M10", 4, false).is_none(), "newer revision");
        assert!(c.get("thread=M10", 3, true).is_none(), "now stale");
        c.put("thread=M10", answer(4, false, "b"));
        assert_eq!(
            c.get("thread=M10", 4, false).map(|a| a.body.clone()),
            Some(Bytes::from_static(b"b"))
        );
    }

    #[test]
    fn bounded_and_keeps_what_is_used() {
        let c = AnswerCache::new(4);
        for i in 0..100 {
            c.put(&format!("q{i}"), answer(1, false, "x"));
            assert!(c.len() <= 4, "{} answers held", c.len());
        }
        // Generations of two: q98 and q99 fill the young one, which becomes
        // old. Using q98 moves it back to the young one; q100 fills that and
        // it becomes old in turn (q99, unused, is dropped with the old one).
        assert!(c.get("q98", 1, false).is_some());
        c.put("q100", answer(1, false, "x"));
        c.put("q101", answer(1, false, "x"));
        assert!(c.get("q98", 1, false).is_some(), "used, so kept");
        assert!(c.get("q99", 1, false).is_none(), "unused, so dropped");
        assert!(c.get("q0", 1, false).is_none());
    }

    #[test]
    fn overlong_queries_are_not_kept() {
        let c = AnswerCache::new(8);
        let long = "x".repeat(MAX_QUERY_BYTES + 1);
        c.put(&long, answer(1, false, "a"));
        assert!(c.get(&long, 1, false).is_none());
        let longest = "x".repeat(MAX_QUERY_BYTES);
        c.put(&longest, answer(1, false, "a"));
        assert!(c.get(&longest, 1, false).is_some());
    }

    #[test]
    fn capacity_zero_keeps_nothing() {
        let c = AnswerCache::new(0);
        c.put("thread=M10", answer(1, false, "a"));
        assert!(c.get("thread=M10", 1, false).is_none());
        assert_eq!(c.len(), 0);
    }
}
