use super::*;
use crate::catalogue::{ChangeItem, EntryInput, FinishInput, RangeInput};

fn input(finish: &str, lubricant: &str, min: f64, max: f64) -> EntryInput {
    EntryInput {
        finish: finish.into(),
        lubricant: lubricant.into(),
        bearing_surface: None,
        joint_tag: None,
        thread_friction: RangeInput { min, max },
        bearing_friction: RangeInput { min, max },
        total_friction: None,
        source: "Hollowmere Works test series HW-17 (demo data)".into(),
        notes: String::new(),
        status: None,
    }
}

#[test]
fn update_creates_one_revision_with_before_and_after() {
    let seed = Snapshot::seed_revision_1();
    let id = seed.friction_for("zinc-electroplated", "none").unwrap().id;
    let set = ChangeSet::single(
        "hollowmere-editor",
        "plant test series HW-17",
        Change::UpdateEntry {
            id,
            expected_revision: Some(1),
            entry: input("zinc-electroplated", "none", 0.12, 0.18),
        },
    );
    let applied = apply(&seed, &set).unwrap();
    assert_eq!(applied.snapshot.revision, 2);
    let e = applied.snapshot.entry(id).unwrap();
    assert_eq!((e.thread_friction.min, e.revision), (0.12, 2));
    assert_eq!(applied.records.len(), 1);
    let r = &applied.records[0];
    assert_eq!(r.action, Action::Update);
    assert_eq!(r.before.as_ref().unwrap()["thread_friction"]["min"], 0.14);
    assert_eq!(r.after["thread_friction"]["min"], 0.12);
    // the input snapshot is untouched
    assert_eq!(seed.entry(id).unwrap().thread_friction.min, 0.14);
}

#[test]
fn stale_expected_revision_is_412_with_current_state() {
    let seed = Snapshot::seed_revision_1();
    let set = ChangeSet::single(
        "a",
        "r",
        Change::UpdateEntry {
            id: 1,
            expected_revision: Some(7),
            entry: input("plain", "none", 0.1, 0.2),
        },
    );
    match apply(&seed, &set) {
        Err(CatalogueError::Stale {
            expected,
            current_revision,
            current: CurrentState::Entry(e),
            ..
        }) => {
            assert_eq!((expected, current_revision, e.id), (7, 1, 1));
        }
        other => panic!("{other:?}"),
    }
}

#[test]
fn every_problem_is_listed() {
    let seed = Snapshot::seed_revision_1();
    let mut bad = input("zinc-electroplatd", "oyl", 0.7, 0.01);
    bad.source = " ".into();
    let set = ChangeSet::single("a", "", Change::CreateEntry(bad));
    let Err(CatalogueError::Invalid { problems }) = apply(&seed, &set) else {
        panic!()
    };
    let fields: Vec<&str> = problems.iter().map(|p| p.field.as_str()).collect();
    for f in [
        "reason",
        "finish",
        "lubricant",
        "source",
        "thread_friction.min",
        "thread_friction.max",
        "bearing_friction.min",
    ] {
        assert!(fields.contains(&f), "{f} missing from {fields:?}");
    }
    let finish = problems.iter().find(|p| p.field == "finish").unwrap();
    assert_eq!(
        finish.suggestions.first().map(String::as_str),
        Some("zinc-electroplated")
    );
}

#[test]
fn duplicate_active_key_refused_and_retire_then_create_allowed() {
    let seed = Snapshot::seed_revision_1();
    let dup = ChangeSet::single(
        "a",
        "r",
        Change::CreateEntry(input("plain", "none", 0.1, 0.2)),
    );
    let Err(CatalogueError::Invalid { problems }) = apply(&seed, &dup) else {
        panic!()
    };
    assert!(
        problems[0].reason.contains("already exists"),
        "{problems:?}"
    );

    let id = seed.friction_for("plain", "none").unwrap().id;
    let batch = ChangeSet {
        actor: "a".into(),
        reason: "replace".into(),
        evidence: None,
        items: vec![
            ChangeItem {
                at: "changes[0].".into(),
                change: Change::RetireEntry {
                    id,
                    expected_revision: Some(1),
                },
            },
            ChangeItem {
                at: "changes[1].".into(),
                change: Change::CreateEntry(input("plain", "none", 0.1, 0.2)),
            },
        ],
    };
    let applied = apply(&seed, &batch).unwrap();
    assert_eq!(applied.snapshot.revision, 2);
    assert_eq!(applied.records.len(), 2);
    assert_eq!(applied.records[0].action, Action::Retire);
    let new = applied.snapshot.friction_for("plain", "none").unwrap();
    assert_eq!(new.id, seed.entries.len() as i64 + 1);
    assert_eq!(applied.snapshot.entry(id).unwrap().status, Status::Retired);
}

#[test]
fn unknown_id_single_is_not_found_batch_is_problem() {
    let seed = Snapshot::seed_revision_1();
    let one = ChangeSet::single(
        "a",
        "r",
        Change::RetireEntry {
            id: 999,
            expected_revision: Some(1),
        },
    );
    assert!(matches!(
        apply(&seed, &one),
        Err(CatalogueError::NotFound { .. })
    ));
    let mut two = one.clone();
    two.items.push(ChangeItem {
        at: "changes[1].".into(),
        change: Change::RetireEntry {
            id: 998,
            expected_revision: None,
        },
    });
    two.items[0].at = "changes[0].".into();
    let Err(CatalogueError::Invalid { problems }) = apply(&seed, &two) else {
        panic!()
    };
    assert_eq!(problems.len(), 2);
    assert_eq!(problems[1].field, "changes[1].id");
}

#[test]
fn identical_update_and_double_retire_refused() {
    let seed = Snapshot::seed_revision_1();
    let e = seed.entry(1).unwrap().clone();
    let same = EntryInput {
        finish: e.finish.clone(),
        lubricant: e.lubricant.clone(),
        bearing_surface: None,
        joint_tag: None,
        thread_friction: e.thread_friction.into(),
        bearing_friction: e.bearing_friction.into(),
        total_friction: e.total_friction.map(Into::into),
        source: e.source.clone(),
        notes: e.notes.clone(),
        status: None,
    };
    let set = ChangeSet::single(
        "a",
        "r",
        Change::UpdateEntry {
            id: 1,
            expected_revision: Some(1),
            entry: same,
        },
    );
    assert!(matches!(
        apply(&seed, &set),
        Err(CatalogueError::Invalid { .. })
    ));

    let retire = ChangeSet::single(
        "a",
        "r",
        Change::RetireEntry {
            id: 1,
            expected_revision: Some(1),
        },
    );
    let after = apply(&seed, &retire).unwrap().snapshot;
    let again = ChangeSet::single(
        "a",
        "r",
        Change::RetireEntry {
            id: 1,
            expected_revision: Some(2),
        },
    );
    assert!(matches!(
        apply(&after, &again),
        Err(CatalogueError::Invalid { .. })
    ));
}

#[test]
fn finishes_and_lubricants_are_versioned_items() {
    let seed = Snapshot::seed_revision_1();
    let set = ChangeSet {
        actor: "a".into(),
        reason: "Hollowmere Works own coating (demo data)".into(),
        evidence: None,
        items: vec![
            ChangeItem {
                at: "finishes[0].".into(),
                change: Change::CreateFinish(FinishInput {
                    id: "hw-dacro-blue".into(),
                    name: "HW blue flake".into(),
                    electroplated: false,
                    stainless: false,
                    notes: String::new(),
                    status: None,
                }),
            },
            ChangeItem {
                at: "entries[0].".into(),
                change: Change::CreateEntry(input("hw-dacro-blue", "none", 0.1, 0.15)),
            },
        ],
    };
    let applied = apply(&seed, &set).unwrap();
    assert!(applied
        .snapshot
        .friction_for("hw-dacro-blue", "none")
        .is_ok());
    // retiring a finish still used by an active entry is refused
    let retire = ChangeSet::single(
        "a",
        "r",
        Change::UpdateFinish {
            expected_revision: Some(1),
            finish: FinishInput {
                id: "plain".into(),
                name: "Plain steel (bright) or black oxide".into(),
                electroplated: false,
                stainless: false,
                notes: seed.finish("plain").unwrap().notes.clone(),
                status: Some(Status::Retired),
            },
        },
    );
    let Err(CatalogueError::Invalid { problems }) = apply(&seed, &retire) else {
        panic!()
    };
    assert!(problems[0].reason.contains("cannot be retired"));
}

#[test]
fn a_tag_scoped_entry_sits_beside_the_generic_one_but_not_twice() {
    let seed = Snapshot::seed_revision_1();
    let generic = seed
        .friction_for("zinc-electroplated", "none")
        .unwrap()
        .clone();
    let scoped = |tag: &str| EntryInput {
        joint_tag: Some(tag.into()),
        ..input("zinc-electroplated", "none", 0.10, 0.14)
    };
    let set = ChangeSet::single("a", "r", Change::CreateEntry(scoped("kestrel-k4")));
    let applied = apply(&seed, &set).unwrap();
    let created = applied.snapshot.entries.last().unwrap();
    assert_eq!(created.joint_tag.as_deref(), Some("kestrel-k4"));
    assert!(applied
        .snapshot
        .entry(generic.id)
        .unwrap()
        .status
        .is_active());
    // the same scope again is the duplicate rule's refusal
    let again = ChangeSet::single("a", "r", Change::CreateEntry(scoped("kestrel-k4")));
    match apply(&applied.snapshot, &again) {
        Err(CatalogueError::Invalid { problems }) => {
            assert_eq!(problems[0].field, "lubricant");
            assert!(
                problems[0].reason.contains("joint tag 'kestrel-k4'"),
                "{problems:?}"
            );
        }
        other => panic!("{other:?}"),
    }
    // a blank or control-character tag is refused naming joint_tag
    for bad in [" ", "a\tb"] {
        let set = ChangeSet::single("a", "r", Change::CreateEntry(scoped(bad)));
        match apply(&seed, &set) {
            Err(CatalogueError::Invalid { problems }) => {
                assert_eq!(problems[0].field, "joint_tag", "{problems:?}");
            }
            other => panic!("{other:?}"),
        }
    }
}
