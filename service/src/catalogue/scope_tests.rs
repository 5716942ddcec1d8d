//! The look-up order of friction entries over the two dimensions of
//! specificity (joint tag first, bearing surface second) and the refusal
//! of two tag-scoped entries for different tags of one joint.

use super::*;
use crate::catalogue::types::{Status, TabulatedFriction};

const F: &str = "zinc-electroplated";
const L: &str = "none";

/// The seed with every entry for `F` × `L` retired, plus `extra`.
fn with(extra: &[(i64, Option<&str>, Option<&str>)]) -> Snapshot {
    let mut s = Snapshot::seed();
    for e in s.entries.iter_mut() {
        if e.finish == F && e.lubricant == L {
            e.status = Status::Retired;
        }
    }
    for (id, surface, tag) in extra {
        s.entries.push(FrictionEntry {
            id: *id,
            finish: F.into(),
            lubricant: L.into(),
            bearing_surface: surface.map(str::to_string),
            joint_tag: tag.map(str::to_string),
            thread_friction: TabulatedFriction { min: 0.1, max: 0.2 },
            bearing_friction: TabulatedFriction { min: 0.1, max: 0.2 },
            total_friction: None,
            source: "test data".into(),
            notes: String::new(),
            status: Status::Active,
            revision: 1,
        });
    }
    s
}

fn tags(t: &[&str]) -> Vec<String> {
    t.iter().map(|s| s.to_string()).collect()
}

fn chosen(s: &Snapshot, surface: Option<&str>, t: &[&str]) -> i64 {
    s.friction_for_joint(F, L, surface, &tags(t))
        .unwrap()
        .entry
        .id
}

#[test]
fn a_tag_scoped_entry_wins_over_the_generic_one() {
    let s = with(&[(901, None, None), (902, None, Some("k4"))]);
    assert_eq!(chosen(&s, None, &["k4", "station-12"]), 902);
    let m = s.friction_for_joint(F, L, None, &tags(&["k4"])).unwrap();
    assert_eq!(m.joint_tag(), Some("k4"));
    assert!(m.reason().contains("'k4'"), "{}", m.reason());
    // a joint without the tag, or no tags at all: the generic entry
    assert_eq!(chosen(&s, None, &["station-12"]), 901);
    assert_eq!(chosen(&s, None, &[]), 901);
    let m = s
        .friction_for_joint(F, L, None, &tags(&["station-12"]))
        .unwrap();
    assert_eq!(m.joint_tag(), None);
    assert!(m.reason().contains("generic"), "{}", m.reason());
}

#[test]
fn the_joint_tag_is_the_first_dimension_the_bearing_surface_the_second() {
    let s = with(&[
        (901, None, None),
        (902, Some("hardened-washer"), None),
        (903, None, Some("k4")),
        (904, Some("hardened-washer"), Some("k4")),
    ]);
    // 1. tag and surface; 2. tag, any surface; 3. surface; 4. generic
    assert_eq!(chosen(&s, Some("hardened-washer"), &["k4"]), 904);
    assert_eq!(chosen(&s, Some("painted"), &["k4"]), 903);
    assert_eq!(chosen(&s, Some("hardened-washer"), &["other"]), 902);
    assert_eq!(chosen(&s, None, &["other"]), 901);
    // without 903, a tagged joint on another named surface falls back to
    // the generic levels: a tag entry for a named surface applies only there
    let s = with(&[
        (901, None, None),
        (904, Some("hardened-washer"), Some("k4")),
    ]);
    assert_eq!(chosen(&s, Some("painted"), &["k4"]), 901);
    // with no surface named (every spec request today) the tag still comes
    // first: the tagged entry for a named surface, not the generic one
    assert_eq!(chosen(&s, None, &["k4"]), 904);
    assert_eq!(chosen(&s, None, &["other"]), 901);
    let s = with(&[
        (902, Some("hardened-washer"), None),
        (904, Some("hardened-washer"), Some("k4")),
    ]);
    assert_eq!(chosen(&s, None, &["k4"]), 904);
    assert_eq!(chosen(&s, None, &[]), 902);
    // and two such entries for two tags of one joint are ambiguous
    let s = with(&[
        (904, Some("hardened-washer"), Some("k4")),
        (905, Some("hardened-washer"), Some("rear-axle")),
    ]);
    assert!(matches!(
        s.friction_for_joint(F, L, None, &tags(&["k4", "rear-axle"])),
        Err(CatalogueError::AmbiguousFriction { .. })
    ));
    // a tag entry for any surface beats a generic one for the exact surface
    let s = with(&[
        (902, Some("hardened-washer"), None),
        (903, None, Some("k4")),
    ]);
    assert_eq!(chosen(&s, Some("hardened-washer"), &["k4"]), 903);
}

#[test]
fn entries_for_two_tags_of_one_joint_are_refused_naming_both() {
    let s = with(&[
        (901, None, None),
        (902, None, Some("k4")),
        (903, None, Some("rear-axle")),
    ]);
    match s.friction_for_joint(F, L, None, &tags(&["rear-axle", "k4"])) {
        Err(CatalogueError::AmbiguousFriction { field, entries, .. }) => {
            assert_eq!(field, "joint_tags");
            assert_eq!(
                entries,
                [(902, "k4".to_string()), (903, "rear-axle".to_string())]
            );
            let text = CatalogueError::AmbiguousFriction {
                field,
                finish: F.into(),
                lubricant: L.into(),
                entries,
            }
            .to_string();
            assert!(text.contains("902 (joint tag 'k4')"), "{text}");
            assert!(text.contains("903 (joint tag 'rear-axle')"), "{text}");
        }
        other => panic!("{other:?}"),
    }
    // one of the two tags only: no ambiguity
    assert_eq!(chosen(&s, None, &["k4"]), 902);
    // a retired scoped entry does not count
    let mut s = s;
    if let Some(e) = s.entries.iter_mut().find(|e| e.id == 903) {
        e.status = Status::Retired;
    }
    assert_eq!(chosen(&s, None, &["rear-axle", "k4"]), 902);
}

#[test]
fn only_tag_scoped_entries_and_no_tag_is_no_entry() {
    let s = with(&[(902, None, Some("k4"))]);
    assert!(matches!(
        s.friction_for_joint(F, L, None, &[]),
        Err(CatalogueError::NoFrictionEntry { .. })
    ));
    assert_eq!(chosen(&s, None, &["k4"]), 902);
}

#[test]
fn export_and_import_keep_the_scope() {
    let s = with(&[(901, None, None), (902, None, Some("-k4, rear"))]);
    let csv = crate::catalogue::exchange::to_csv(&s).unwrap();
    let file = crate::catalogue::exchange::parse_csv(&csv).unwrap();
    let read = file.entries.iter().find(|e| e.id == Some(902)).unwrap();
    assert_eq!(read.joint_tag.as_deref(), Some("-k4, rear"));
    assert!(crate::catalogue::exchange::changes_for(&s, &file).is_empty());
    // the JSON export's shape
    let json = serde_json::json!({
        "catalogue_revision": s.revision,
        "finishes": s.finishes,
        "lubricants": s.lubricants,
        "entries": s.entries,
    })
    .to_string();
    let file = crate::catalogue::exchange::parse_json(&json).unwrap();
    assert!(crate::catalogue::exchange::changes_for(&s, &file).is_empty());
    // an entry without a tag writes none
    let generic = serde_json::to_value(s.entry(901).unwrap()).unwrap();
    assert!(generic.get("joint_tag").is_none(), "{generic}");
}
