//! The seed catalogue. Revision 1 lives in one file,
//! `migrations/seed/catalogue-revision-1.json`, embedded here; the store
//! writes exactly this snapshot as revision 1 on first start. The
//! migrations then write revision 2 (`catalogue-revision-2.json`: entry
//! sources rewritten without publishers' names), which [`parse_current`]
//! applies in memory, so a fresh database and `Snapshot::seed` agree (a
//! black-box test compares them on both backends).

use serde::Deserialize;

use super::types::{Finish, FrictionEntry, Lubricant, Status, TabulatedFriction};
use super::Snapshot;

/// The seed file, embedded at build time.
pub const SEED_JSON: &str = include_str!("../../../migrations/seed/catalogue-revision-1.json");

/// Revision 2, written by the migrations `*_provenance.sql`.
pub const REVISION_2_JSON: &str =
    include_str!("../../../migrations/seed/catalogue-revision-2.json");

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RevisionFile {
    #[allow(dead_code)]
    about: String,
    #[allow(dead_code)]
    actor: String,
    #[allow(dead_code)]
    reason: String,
    entries: Vec<SourceChange>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SourceChange {
    id: i64,
    source: String,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SeedFile {
    #[allow(dead_code)]
    about: String,
    reason: String,
    finishes: Vec<SeedFinish>,
    lubricants: Vec<SeedLubricant>,
    entries: Vec<SeedEntry>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SeedFinish {
    id: String,
    name: String,
    electroplated: bool,
    stainless: bool,
    notes: String,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SeedLubricant {
    id: String,
    name: String,
    dry: bool,
    notes: String,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct SeedEntry {
    id: i64,
    finish: String,
    lubricant: String,
    #[serde(default)]
    bearing_surface: Option<String>,
    thread_friction: TabulatedFriction,
    bearing_friction: TabulatedFriction,
    #[serde(default)]
    total_friction: Option<TabulatedFriction>,
    source: String,
    notes: String,
}

/// The reason recorded in history for revision 1.
pub fn seed_reason() -> String {
    parse().map(|(_, r)| r).unwrap_or_default()
}

/// Parses the embedded seed. The file is part of the build and checked by
/// a unit test, so a failure here is a build defect; callers still get a
/// `Result` instead of a panic.
pub(super) fn parse() -> Result<(Snapshot, String), String> {
    let file: SeedFile =
        serde_json::from_str(SEED_JSON).map_err(|e| format!("seed catalogue: {e}"))?;
    let revision = 1;
    let snapshot = Snapshot {
        revision,
        finishes: file
            .finishes
            .into_iter()
            .map(|f| Finish {
                id: f.id,
                name: f.name,
                electroplated: f.electroplated,
                stainless: f.stainless,
                notes: f.notes,
                status: Status::Active,
                revision,
            })
            .collect(),
        lubricants: file
            .lubricants
            .into_iter()
            .map(|l| Lubricant {
                id: l.id,
                name: l.name,
                dry: l.dry,
                notes: l.notes,
                status: Status::Active,
                revision,
            })
            .collect(),
        entries: file
            .entries
            .into_iter()
            .map(|e| FrictionEntry {
                id: e.id,
                finish: e.finish,
                lubricant: e.lubricant,
                bearing_surface: e.bearing_surface,
                joint_tag: None,
                thread_friction: e.thread_friction,
                bearing_friction: e.bearing_friction,
                total_friction: e.total_friction,
                source: e.source,
                notes: e.notes,
                status: Status::Active,
                revision,
            })
            .collect(),
    };
    Ok((snapshot, file.reason))
}

/// What a fresh database holds: revision 1 with revision 2's changes.
pub(super) fn parse_current() -> Result<Snapshot, String> {
    let (mut snapshot, _) = parse()?;
    let file: RevisionFile = serde_json::from_str(REVISION_2_JSON)
        .map_err(|e| format!("seed catalogue revision 2: {e}"))?;
    let revision = 2;
    for change in file.entries {
        let entry = snapshot
            .entries
            .iter_mut()
            .find(|e| e.id == change.id)
            .ok_or_else(|| format!("seed catalogue revision 2: no entry {}", change.id))?;
        entry.source = change.source;
        entry.revision = revision;
    }
    snapshot.revision = revision;
    Ok(snapshot)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn seed_parses_and_is_consistent() {
        let (s, reason) = parse().expect("seed parses");
        assert!(!reason.is_empty());
        assert_eq!(s.revision, 1);
        assert_eq!(s.finishes.len(), 8);
        assert_eq!(s.lubricants.len(), 6);
        // every entry names a known finish and lubricant, has a source, and
        // at most one active entry per key
        let mut keys = std::collections::HashSet::new();
        for e in &s.entries {
            assert!(s.finish(&e.finish).is_ok(), "{}", e.finish);
            assert!(s.lubricant(&e.lubricant).is_ok(), "{}", e.lubricant);
            assert!(!e.source.trim().is_empty());
            assert!(keys.insert(e.key()), "duplicate key {:?}", e.key());
        }
        // ids unique and 1..=n
        let mut ids: Vec<i64> = s.entries.iter().map(|e| e.id).collect();
        ids.sort_unstable();
        assert_eq!(ids, (1..=s.entries.len() as i64).collect::<Vec<_>>());
        for f in &s.finishes {
            assert!(crate::catalogue::types::is_slug(&f.id));
        }
        for l in &s.lubricants {
            assert!(crate::catalogue::types::is_slug(&l.id));
        }
    }

    #[test]
    fn revision_2_changes_only_sources_and_names_no_publisher() {
        let (first, _) = parse().expect("revision 1 parses");
        let second = parse_current().expect("revision 2 parses");
        assert_eq!(second.revision, 2);
        assert_eq!(first.finishes, second.finishes);
        assert_eq!(first.lubricants, second.lubricants);
        let mut changed = 0;
        for (a, b) in first.entries.iter().zip(&second.entries) {
            assert_eq!(a.id, b.id);
            if a.source != b.source {
                changed += 1;
                assert_eq!(b.revision, 2);
                assert!(b
                    .source
                    .contains("as reproduced in a supplier's technical tables"));
                assert!(!b.source.contains("://"), "{}", b.source);
                let mut same = b.clone();
                same.source.clone_from(&a.source);
                same.revision = 1;
                assert_eq!(&same, a, "only the source changes");
            } else {
                assert_eq!(a, b);
            }
        }
        assert_eq!(changed, 7);
        // the migrations write the same texts (both backends)
        for sql in [
            include_str!("../../../migrations/sqlite/20261203060000_provenance.sql"),
            include_str!("../../../migrations/postgres/20261203060000_provenance.sql"),
        ] {
            for e in second.entries.iter().filter(|e| e.revision == 2) {
                let quoted = format!("({}, '{}')", e.id, e.source.replace('\'', "''"));
                assert!(sql.contains(&quoted), "migration lacks {quoted}");
            }
        }
    }

    #[test]
    fn seed_class_values_match_vdi_2230_table_a5() {
        // VDI 2230 Part 1 (2003) Table A5 friction classes, as reproduced in
        // an engineering reference page that names VDI 2230 Part 1 as its
        // source: A 0.04–0.10, B 0.08–0.16, C 0.14–0.24, D 0.20–0.35.
        let s = Snapshot::seed();
        assert!(s.revision >= 1);
        let check = |f: &str, l: &str, min: f64, max: f64| {
            let e = s.friction_for(f, l).expect("entry");
            assert_eq!((e.thread_friction.min, e.thread_friction.max), (min, max));
            assert_eq!((e.bearing_friction.min, e.bearing_friction.max), (min, max));
        };
        check("plain", "none", 0.14, 0.24); // class C
        check("plain", "light-oil", 0.08, 0.16); // class B
        check("plain", "mos2-paste", 0.04, 0.10); // class A
        check("hot-dip-galvanized", "none", 0.20, 0.35); // class D
        check("stainless-bright", "light-oil", 0.20, 0.35); // class D
    }
}
