//! One catalogue revision held in memory: every finish, lubricant and
//! friction entry (retired ones included, so past answers can be explained),
//! with look-ups that return typed errors naming the request field.

use std::sync::OnceLock;

use serde::{Deserialize, Serialize};

use super::error::{suggest, CatalogueError};
use super::types::{Finish, FrictionEntry, Lubricant};

/// The friction entry a look-up chose, and what it was chosen for.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FrictionMatch<'a> {
    pub entry: &'a FrictionEntry,
    /// Whether the look-up was given any joint tags.
    pub joint_tags_given: bool,
}

impl FrictionMatch<'_> {
    /// The joint tag that selected the entry (a tag-scoped entry won).
    pub fn joint_tag(&self) -> Option<&str> {
        self.entry.joint_tag.as_deref()
    }

    /// Why this entry applies, in plain words.
    pub fn reason(&self) -> String {
        match (self.joint_tag(), self.joint_tags_given) {
            (Some(tag), _) => format!(
                "the entry is limited to joints tagged '{tag}', which this joint carries; an \
                 entry limited to a joint tag wins over the generic entry for the same finish \
                 and lubricant"
            ),
            (None, true) => "the generic entry for this finish and lubricant: no active entry \
                 for them is limited to any of this joint's tags"
                .into(),
            (None, false) => "the generic entry for this finish and lubricant (no joint tags \
                 given)"
                .into(),
        }
    }
}

/// The entry of `list` for exactly the named surface (none named: none).
fn for_surface<'a>(list: &[&'a FrictionEntry], surface: Option<&str>) -> Option<&'a FrictionEntry> {
    let surface = surface?;
    list.iter()
        .find(|e| e.bearing_surface.as_deref() == Some(surface))
        .copied()
}

/// The entry of `list` for any bearing surface.
fn for_any_surface<'a>(list: &[&'a FrictionEntry]) -> Option<&'a FrictionEntry> {
    list.iter().find(|e| e.bearing_surface.is_none()).copied()
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Snapshot {
    pub revision: i64,
    pub finishes: Vec<Finish>,
    pub lubricants: Vec<Lubricant>,
    pub entries: Vec<FrictionEntry>,
}

impl Snapshot {
    /// The seed catalogue as a fresh database holds it: revision 1 with
    /// the revisions the migrations write after it (see `seed.rs`).
    pub fn seed() -> Snapshot {
        static SEED: OnceLock<Snapshot> = OnceLock::new();
        SEED.get_or_init(|| {
            // The embedded files are part of the build, not client or
            // database data; `seed::tests` fails the build's tests if invalid.
            #[allow(clippy::expect_used)]
            super::seed::parse_current()
                .expect("embedded seed catalogue is valid (checked by seed::tests)")
        })
        .clone()
    }

    /// Revision 1, the seed the store writes into an empty catalogue.
    pub fn seed_revision_1() -> Snapshot {
        static SEED: OnceLock<Snapshot> = OnceLock::new();
        SEED.get_or_init(|| {
            #[allow(clippy::expect_used)]
            super::seed::parse()
                .map(|(s, _)| s)
                .expect("embedded seed catalogue is valid (checked by seed::tests)")
        })
        .clone()
    }

    /// The finish with this id (active or retired). Unknown → 404-style
    /// error with the nearest ids.
    pub fn finish(&self, id: &str) -> Result<&Finish, CatalogueError> {
        self.finishes
            .iter()
            .find(|f| f.id == id)
            .ok_or_else(|| CatalogueError::Unknown {
                field: "finish".into(),
                kind: "finish",
                given: id.into(),
                suggestions: suggest(id, self.active_finish_ids()),
            })
    }

    pub fn lubricant(&self, id: &str) -> Result<&Lubricant, CatalogueError> {
        self.lubricants
            .iter()
            .find(|l| l.id == id)
            .ok_or_else(|| CatalogueError::Unknown {
                field: "lubricant".into(),
                kind: "lubricant",
                given: id.into(),
                suggestions: suggest(id, self.active_lubricant_ids()),
            })
    }

    /// The active friction entry for a finish and lubricant that applies to
    /// any bearing surface (or, when the only active entries are for named
    /// bearing surfaces, the one with the lowest id).
    pub fn friction_for(
        &self,
        finish: &str,
        lubricant: &str,
    ) -> Result<&FrictionEntry, CatalogueError> {
        self.friction_for_surface(finish, lubricant, None)
    }

    /// As [`Snapshot::friction_for`], for a named bearing-surface condition:
    /// an entry for exactly that surface wins, else the "any surface" entry.
    pub fn friction_for_surface(
        &self,
        finish: &str,
        lubricant: &str,
        bearing_surface: Option<&str>,
    ) -> Result<&FrictionEntry, CatalogueError> {
        self.friction_for_joint(finish, lubricant, bearing_surface, &[])
            .map(|m| m.entry)
    }

    /// The active friction entry for a finish and lubricant on a joint
    /// carrying `joint_tags`, and why it was chosen. The most specific
    /// entry wins; the joint tag is the first dimension, the bearing
    /// surface the second:
    ///
    /// 1. an entry limited to one of the joint's tags, for exactly the
    ///    named bearing surface;
    /// 2. an entry limited to one of the joint's tags, for any surface;
    ///    with no surface named, then one of the joint's tags for a named
    ///    surface, the lowest id (the tag is the first dimension: a tagged
    ///    entry is never passed over for a generic one);
    /// 3. a generic entry (no tag) for exactly the named bearing surface;
    /// 4. a generic entry for any surface;
    /// 5. with no surface named, the generic entry for a named surface
    ///    with the lowest id (as before tags existed).
    ///
    /// Tag-scoped entries (steps 1 and 2) limited to two different tags of
    /// the joint are ambiguous: refused naming both, never picked.
    pub fn friction_for_joint(
        &self,
        finish: &str,
        lubricant: &str,
        bearing_surface: Option<&str>,
        joint_tags: &[String],
    ) -> Result<FrictionMatch<'_>, CatalogueError> {
        self.finish(finish)?;
        self.lubricant(lubricant)?;
        let mut candidates: Vec<&FrictionEntry> = self
            .entries
            .iter()
            .filter(|e| e.status.is_active() && e.finish == finish && e.lubricant == lubricant)
            .collect();
        candidates.sort_by_key(|e| e.id);
        let fits_surface = |e: &&&FrictionEntry| {
            bearing_surface.is_none()
                || e.bearing_surface.is_none()
                || e.bearing_surface.as_deref() == bearing_surface
        };
        let scoped: Vec<&FrictionEntry> = candidates
            .iter()
            .filter(|e| e.joint_tag.as_ref().is_some_and(|t| joint_tags.contains(t)))
            .filter(fits_surface)
            .copied()
            .collect();
        let mut tags: Vec<&str> = scoped
            .iter()
            .filter_map(|e| e.joint_tag.as_deref())
            .collect();
        tags.sort_unstable();
        tags.dedup();
        if tags.len() > 1 {
            return Err(CatalogueError::AmbiguousFriction {
                field: "joint_tags".into(),
                finish: finish.into(),
                lubricant: lubricant.into(),
                entries: scoped
                    .iter()
                    .map(|e| (e.id, e.joint_tag.clone().unwrap_or_default()))
                    .collect(),
            });
        }
        let generic: Vec<&FrictionEntry> = candidates
            .iter()
            .filter(|e| e.joint_tag.is_none())
            .copied()
            .collect();
        let found = for_surface(&scoped, bearing_surface)
            .or_else(|| for_any_surface(&scoped))
            .or_else(|| {
                bearing_surface
                    .is_none()
                    .then(|| scoped.first().copied())
                    .flatten()
            })
            .or_else(|| for_surface(&generic, bearing_surface))
            .or_else(|| for_any_surface(&generic))
            .or_else(|| {
                bearing_surface
                    .is_none()
                    .then(|| generic.first().copied())
                    .flatten()
            });
        if let Some(entry) = found {
            return Ok(FrictionMatch {
                entry,
                joint_tags_given: !joint_tags.is_empty(),
            });
        }
        let mut with_entry: Vec<String> = self
            .entries
            .iter()
            .filter(|e| e.status.is_active() && e.finish == finish && e.joint_tag.is_none())
            .map(|e| e.lubricant.clone())
            .collect();
        with_entry.sort();
        with_entry.dedup();
        Err(CatalogueError::NoFrictionEntry {
            field: "lubricant".into(),
            finish: finish.into(),
            lubricant: lubricant.into(),
            suggestions: with_entry,
        })
    }

    /// The friction entry with this id (active or retired).
    pub fn entry(&self, id: i64) -> Result<&FrictionEntry, CatalogueError> {
        self.entries
            .iter()
            .find(|e| e.id == id)
            .ok_or_else(|| CatalogueError::NotFound {
                field: "id".into(),
                kind: "friction entry",
                id: id.to_string(),
            })
    }

    pub fn active_entries(&self) -> impl Iterator<Item = &FrictionEntry> {
        self.entries.iter().filter(|e| e.status.is_active())
    }

    fn active_finish_ids(&self) -> impl Iterator<Item = &str> {
        self.finishes
            .iter()
            .filter(|f| f.status.is_active())
            .map(|f| f.id.as_str())
    }

    fn active_lubricant_ids(&self) -> impl Iterator<Item = &str> {
        self.lubricants
            .iter()
            .filter(|l| l.status.is_active())
            .map(|l| l.id.as_str())
    }

    /// Sorts items by id so two snapshots of the same revision compare equal
    /// whatever order the store returned them in.
    pub fn normalise(&mut self) {
        self.finishes.sort_by(|a, b| a.id.cmp(&b.id));
        self.lubricants.sort_by(|a, b| a.id.cmp(&b.id));
        self.entries.sort_by_key(|e| e.id);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lookups_and_errors() {
        let s = Snapshot::seed();
        assert!(s.finish("zinc-electroplated").unwrap().electroplated);
        assert!(s.lubricant("none").unwrap().dry);
        match s.finish("zinc-electroplatd") {
            Err(CatalogueError::Unknown {
                field, suggestions, ..
            }) => {
                assert_eq!(field, "finish");
                assert_eq!(suggestions[0], "zinc-electroplated");
            }
            other => panic!("{other:?}"),
        }
        match s.lubricant("moly") {
            Err(e) => assert_eq!(e.field(), "lubricant"),
            Ok(l) => panic!("{l:?}"),
        }
        let e = s.friction_for("zinc-electroplated", "none").unwrap();
        assert_eq!(e.finish, "zinc-electroplated");
        // dry stainless deliberately has no entry
        match s.friction_for("stainless-bright", "none") {
            Err(CatalogueError::NoFrictionEntry { suggestions, .. }) => {
                assert!(suggestions.contains(&"light-oil".to_string()));
            }
            other => panic!("{other:?}"),
        }
        assert!(s.entry(1).is_ok());
        assert!(matches!(
            s.entry(9999),
            Err(CatalogueError::NotFound { .. })
        ));
    }
}

#[cfg(test)]
#[path = "scope_tests.rs"]
mod scope_tests;
