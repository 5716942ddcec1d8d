//! The reconcile decision, pure: what this instance has put on the broker
//! per joint and the ETags of the active releases' answers now → which
//! joints to publish and which to clear. No I/O, no time.

use std::collections::{HashMap, HashSet};

/// What the broker holds for a joint, as far as this instance knows.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Held {
    /// The answer with this ETag was published.
    Answer(String),
    /// A value may be retained but which is not known: after a reconnect
    /// (what was sent on the lost connection may not have arrived) or
    /// when the broker showed a retained message this instance did not
    /// send (another replica's, or one from before a restart).
    Unknown,
    /// The retained message was cleared.
    Cleared,
}

/// Entries kept at most; beyond, the cleared ones are let go (bounded
/// memory: each is at most a clear sent once more after a reconnect).
pub const HELD_MAX: usize = 40_000;

/// Joint id → what the broker holds for it.
#[derive(Debug, Default)]
pub struct Published {
    held: HashMap<String, Held>,
}

/// Joints to publish (their answer differs from what was published) and
/// to clear (something may be retained, but no active release now).
#[derive(Debug, Default, PartialEq, Eq)]
pub struct Plan {
    pub publish: Vec<String>,
    pub clear: Vec<String>,
}

impl Published {
    /// After a reconnect: nothing sent before is known to have arrived.
    pub fn forget_values(&mut self) {
        for h in self.held.values_mut() {
            *h = Held::Unknown;
        }
    }

    /// A retained message seen on the broker for `id`.
    pub fn seen_on_broker(&mut self, id: &str) {
        if self.held.len() < HELD_MAX {
            self.held.entry(id.to_string()).or_insert(Held::Unknown);
        }
    }

    pub fn published(&mut self, id: &str, etag: String) {
        self.held.insert(id.to_string(), Held::Answer(etag));
        self.bound();
    }

    pub fn cleared(&mut self, id: &str) {
        self.held.insert(id.to_string(), Held::Cleared);
        self.bound();
    }

    pub fn get(&self, id: &str) -> Option<&Held> {
        self.held.get(id)
    }

    pub fn len(&self) -> usize {
        self.held.len()
    }

    pub fn is_empty(&self) -> bool {
        self.held.is_empty()
    }

    fn bound(&mut self) {
        if self.held.len() > HELD_MAX {
            self.held.retain(|_, h| *h != Held::Cleared);
        }
    }

    /// The decision: `current` holds the joints with an active release
    /// and their answers' ETags. A joint is published when the broker
    /// does not hold that answer; it is cleared when it may hold a value
    /// and the joint is not in `current` (withdrawn, or past the pass's
    /// bound: clearing is the safe side, a tool keeps no value that is not
    /// followed). Both lists come in joint id order.
    pub fn plan(&self, current: &[(String, String)]) -> Plan {
        let now: HashSet<&str> = current.iter().map(|(id, _)| id.as_str()).collect();
        let publish = current
            .iter()
            .filter(|(id, etag)| !matches!(self.held.get(id), Some(Held::Answer(e)) if e == etag))
            .map(|(id, _)| id.clone())
            .collect();
        let mut clear: Vec<String> = self
            .held
            .iter()
            .filter(|(id, h)| **h != Held::Cleared && !now.contains(id.as_str()))
            .map(|(id, _)| id.clone())
            .collect();
        clear.sort();
        Plan { publish, clear }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn answers(list: &[(&str, &str)]) -> Vec<(String, String)> {
        list.iter()
            .map(|(i, e)| (i.to_string(), e.to_string()))
            .collect()
    }

    fn plan(publish: &[&str], clear: &[&str]) -> Plan {
        Plan {
            publish: publish.iter().map(|s| s.to_string()).collect(),
            clear: clear.iter().map(|s| s.to_string()).collect(),
        }
    }

    #[test]
    fn only_changed_answers_are_published_and_only_withdrawn_ones_cleared() {
        let mut p = Published::default();
        let now = answers(&[("HW-K4-RA-017", "\"a-r1\""), ("HW-K4-RA-018", "\"b-r1\"")]);
        assert_eq!(p.plan(&now), plan(&["HW-K4-RA-017", "HW-K4-RA-018"], &[]));
        p.published("HW-K4-RA-017", "\"a-r1\"".into());
        p.published("HW-K4-RA-018", "\"b-r1\"".into());
        assert_eq!(p.plan(&now), Plan::default());
        // a new release, a review mark (another ETag), a withdrawal
        let now = answers(&[("HW-K4-RA-017", "\"a-r1-review5\"")]);
        assert_eq!(p.plan(&now), plan(&["HW-K4-RA-017"], &["HW-K4-RA-018"]));
        p.published("HW-K4-RA-017", "\"a-r1-review5\"".into());
        p.cleared("HW-K4-RA-018");
        // a cleared joint is not cleared again, and comes back when released
        assert_eq!(p.plan(&now), Plan::default());
        let back = answers(&[
            ("HW-K4-RA-017", "\"a-r1-review5\""),
            ("HW-K4-RA-018", "\"c-r2\""),
        ]);
        assert_eq!(p.plan(&back), plan(&["HW-K4-RA-018"], &[]));
    }

    #[test]
    fn after_a_reconnect_everything_is_sent_again() {
        let mut p = Published::default();
        p.published("HW-K4-RA-017", "\"a\"".into());
        p.cleared("HW-K4-RA-018");
        p.forget_values();
        let now = answers(&[("HW-K4-RA-017", "\"a\"")]);
        assert_eq!(p.plan(&now), plan(&["HW-K4-RA-017"], &["HW-K4-RA-018"]));
    }

    #[test]
    fn a_retained_message_seen_on_the_broker_is_cleared_unless_active() {
        let mut p = Published::default();
        p.seen_on_broker("HW-K4-RA-030");
        p.seen_on_broker("HW-K4-RA-017");
        let now = answers(&[("HW-K4-RA-017", "\"a\"")]);
        assert_eq!(p.plan(&now), plan(&["HW-K4-RA-017"], &["HW-K4-RA-030"]));
        // what this instance published is not overridden by seeing it
        p.published("HW-K4-RA-017", "\"a\"".into());
        p.seen_on_broker("HW-K4-RA-017");
        assert_eq!(p.get("HW-K4-RA-017"), Some(&Held::Answer("\"a\"".into())));
    }

    #[test]
    fn memory_is_bounded() {
        let mut p = Published::default();
        for i in 0..HELD_MAX + 10 {
            p.cleared(&format!("J{i}"));
        }
        assert!(p.len() <= HELD_MAX, "{}", p.len());
        for i in 0..HELD_MAX + 10 {
            p.seen_on_broker(&format!("S{i}"));
        }
        assert!(p.len() <= HELD_MAX, "{}", p.len());
    }
}
