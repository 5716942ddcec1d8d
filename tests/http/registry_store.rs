//! The joint registry's store, on both backends: create (a taken id is a
//! conflict naming `id`), update from the expected version (a stale one
//! carries the current joint), history before/after, listing by tag and
//! review mark in pages of ids, marking and clearing the review mark.

use chrono::Utc;
use serde_json::json;
use tightspec::registry::{event, JointDefinition, JointId, OutboxEvent, Page, RegistryError};
use tightspec::store::joints::{JointFilter, ReviewMark};
use tightspec::store::outbox::new_event_id;
use tightspec::store::{RegistryStoreError, Store, StoreError};

use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    a_joint_is_created_read_and_updated_with_its_history,
    a_taken_id_and_a_stale_version_are_refused,
    joints_are_listed_by_tag_and_review_mark_in_pages,
    review_marks_are_set_once_with_their_event_and_cleared,
);

pub async fn open(db: &TestDb) -> Store {
    Store::open(Some(&db.url))
        .await
        .unwrap_or_else(|e| panic!("open {}: {e}", db.url))
}

/// A store holding joints `ids` (untagged).
pub async fn with_joints(db: &TestDb, ids: &[&str]) -> Store {
    let store = open(db).await;
    for id in ids {
        store
            .create_joint(&definition(id, &[]), "editor", "new")
            .await
            .unwrap_or_else(|e| panic!("create {id}: {e}"));
    }
    store
}

/// A joint of the invented Kestrel K4 tractor.
pub fn definition(id: &str, tags: &[&str]) -> JointDefinition {
    JointDefinition::from_json(&json!({
        "id": id,
        "title": format!("Kestrel K4 joint {id}"),
        "tags": tags,
        "request": {"thread": "M10", "property_class": "8.8", "finish": "zinc-flake-lubricated",
                    "lubricant": "none", "tightening_method": "dc-nutrunner"},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.5}
    }))
    .expect("a valid joint")
}

pub fn id(s: &str) -> JointId {
    JointId::parse("id", s).expect("a valid id")
}

async fn a_joint_is_created_read_and_updated_with_its_history(db: &TestDb) {
    let store = open(db).await;
    let def = definition("K4-RA-017", &["kestrel-k4", "station-12"]);
    let created = store
        .create_joint(&def, "editor-a", "new joint")
        .await
        .unwrap();
    assert_eq!(created.version, 1);
    assert_eq!(created.definition(), def);
    assert_eq!(created.review_due, None);
    assert_eq!(store.joint(&def.id).await.unwrap(), created);

    let mut changed = def.clone();
    changed.title = "Rear-axle bracket, left".into();
    changed.tags = vec!["kestrel-k4".into(), "line-2".into()];
    changed.setpoints.resolution = Some(0.1);
    let updated = store
        .update_joint(&changed, 1, "editor-b", "tool changed")
        .await
        .unwrap();
    assert_eq!(updated.version, 2);
    assert_eq!(updated.definition(), changed);
    assert_eq!(store.joint(&def.id).await.unwrap(), updated);

    let history = store.joint_history(&def.id).await.unwrap();
    let actions: Vec<_> = history
        .iter()
        .map(|h| (h.action.as_str(), h.version))
        .collect();
    assert_eq!(actions, [("create", 1), ("update", 2)]);
    assert_eq!(history[0].before_json, None);
    let read = |t: &Option<String>| -> JointDefinition {
        serde_json::from_str(t.as_deref().expect("a body")).unwrap()
    };
    assert_eq!(read(&history[0].after_json), def);
    assert_eq!(read(&history[1].before_json), def);
    assert_eq!(read(&history[1].after_json), changed);
    assert_eq!(
        (history[1].actor.as_str(), history[1].reason.as_str()),
        ("editor-b", "tool changed")
    );

    let missing = store.joint(&id("K4-RA-999")).await.unwrap_err();
    assert!(
        matches!(&missing, StoreError::NotFound { field, .. } if field == "id"),
        "{missing:?}"
    );
}

async fn a_taken_id_and_a_stale_version_are_refused(db: &TestDb) {
    let store = open(db).await;
    let def = definition("K4-FR-002", &["kestrel-k4"]);
    store.create_joint(&def, "editor-a", "new").await.unwrap();
    let mut other = definition("K4-FR-002", &["other"]);
    other.title = "another joint".into();
    let taken = store
        .create_joint(&other, "editor-b", "new")
        .await
        .unwrap_err();
    assert!(
        matches!(&taken, RegistryStoreError::Store(StoreError::Conflict { field, .. }) if field == "id"),
        "{taken:?}"
    );
    // ids keep their case: another case is another joint
    store
        .create_joint(&definition("k4-fr-002", &[]), "editor-a", "new")
        .await
        .unwrap();

    store
        .update_joint(&def, 1, "editor-a", "first edit")
        .await
        .unwrap();
    let stale = store
        .update_joint(&other, 1, "editor-b", "late edit")
        .await
        .unwrap_err();
    match stale {
        RegistryStoreError::Registry(RegistryError::Stale {
            field,
            expected,
            current,
        }) => {
            assert_eq!(
                (field.as_str(), expected, current.version),
                ("If-Match", 1, 2)
            );
            assert_eq!(current.definition(), def);
        }
        other => panic!("expected a stale error, got {other:?}"),
    }
    // nothing written by the refusals
    assert_eq!(store.joint(&def.id).await.unwrap().title, def.title);
    assert_eq!(store.joint_history(&def.id).await.unwrap().len(), 2);
    let unknown = store
        .update_joint(&definition("K4-XX-1", &[]), 1, "e", "r")
        .await
        .unwrap_err();
    assert!(
        matches!(&unknown, RegistryStoreError::Store(StoreError::NotFound { field, .. }) if field == "id"),
        "{unknown:?}"
    );
}

fn ids(joints: &[tightspec::registry::Joint]) -> Vec<&str> {
    joints.iter().map(|j| j.id.as_str()).collect()
}

fn review_event(joint: &str) -> OutboxEvent {
    OutboxEvent::cloud_event(
        new_event_id(),
        event::JOINT_REVIEW_DUE,
        joint,
        Utc::now(),
        json!({"revision": 3}),
    )
}

async fn joints_are_listed_by_tag_and_review_mark_in_pages(db: &TestDb) {
    let store = open(db).await;
    for n in 1..=7 {
        let tags: &[&str] = if n % 2 == 0 {
            &["station-12", "kestrel-k4"]
        } else {
            &["kestrel-k4"]
        };
        store
            .create_joint(&definition(&format!("K4-{n:02}"), tags), "editor", "new")
            .await
            .unwrap();
    }
    let all = JointFilter::default();
    let first = store
        .joints(&all, &Page::new(None, 3).unwrap())
        .await
        .unwrap();
    assert_eq!(ids(&first), ["K4-01", "K4-02", "K4-03"]);
    let next = store
        .joints(&all, &Page::new(Some("K4-03"), 3).unwrap())
        .await
        .unwrap();
    assert_eq!(ids(&next), ["K4-04", "K4-05", "K4-06"]);
    let last = store
        .joints(&all, &Page::new(Some("K4-06"), 3).unwrap())
        .await
        .unwrap();
    assert_eq!(ids(&last), ["K4-07"]);

    let station = JointFilter {
        tag: Some("station-12".into()),
        status: None,
        review_due: None,
    };
    let got = store
        .joints(&station, &Page::new(Some("K4-02"), 500).unwrap())
        .await
        .unwrap();
    assert_eq!(ids(&got), ["K4-04", "K4-06"]);
    let none = JointFilter {
        tag: Some("station-1".into()),
        status: None,
        review_due: None,
    };
    assert!(store
        .joints(&none, &Page::new(None, 10).unwrap())
        .await
        .unwrap()
        .is_empty());

    let marks: Vec<ReviewMark> = ["K4-02", "K4-05"]
        .iter()
        .map(|j| ReviewMark {
            joint: id(j),
            event: review_event(j),
        })
        .collect();
    store.mark_review_due(3, Utc::now(), &marks).await.unwrap();
    let due = JointFilter {
        tag: None,
        status: None,
        review_due: Some(true),
    };
    assert_eq!(
        ids(&store
            .joints(&due, &Page::new(None, 10).unwrap())
            .await
            .unwrap()),
        ["K4-02", "K4-05"]
    );
    let due_at_station = JointFilter {
        tag: Some("station-12".into()),
        status: None,
        review_due: Some(true),
    };
    let got = store
        .joints(&due_at_station, &Page::new(None, 10).unwrap())
        .await
        .unwrap();
    assert_eq!(ids(&got), ["K4-02"]);
    let not_due = JointFilter {
        tag: None,
        status: None,
        review_due: Some(false),
    };
    let got = store
        .joints(&not_due, &Page::new(None, 10).unwrap())
        .await
        .unwrap();
    assert_eq!(ids(&got), ["K4-01", "K4-03", "K4-04", "K4-06", "K4-07"]);
}

async fn review_marks_are_set_once_with_their_event_and_cleared(db: &TestDb) {
    let store = with_joints(db, &["K4-RA-017"]).await;
    let joint = id("K4-RA-017");
    let before = store.outbox_after(0, 1000).await.unwrap().len();
    let first = ReviewMark {
        joint: joint.clone(),
        event: review_event("K4-RA-017"),
    };
    let marked = store
        .mark_review_due(3, Utc::now(), std::slice::from_ref(&first))
        .await
        .unwrap();
    assert_eq!(marked, std::slice::from_ref(&joint));
    let due = store
        .joint(&joint)
        .await
        .unwrap()
        .review_due
        .expect("marked");
    assert_eq!(due.revision, 3);
    // a later revision leaves the first mark (and writes no second event)
    let again = ReviewMark {
        joint: joint.clone(),
        event: review_event("K4-RA-017"),
    };
    assert!(store
        .mark_review_due(4, Utc::now(), &[again])
        .await
        .unwrap()
        .is_empty());
    assert_eq!(store.joint(&joint).await.unwrap().review_due, Some(due));
    let events = store.outbox_after(0, 1000).await.unwrap();
    assert_eq!(events.len(), before + 1);
    let last = &events.last().expect("an event").event;
    // the stored time may be rounded to the database's precision
    assert_eq!(
        (&last.id, &last.payload),
        (&first.event.id, &first.event.payload)
    );
    assert_eq!(last.payload["type"], "joint.review_due");

    assert_eq!(
        store.clear_review_due(&joint).await.unwrap().review_due,
        None
    );
    assert_eq!(store.joint(&joint).await.unwrap().review_due, None);
    let unknown = store.clear_review_due(&id("K4-NONE")).await.unwrap_err();
    assert!(
        matches!(unknown, StoreError::NotFound { .. }),
        "{unknown:?}"
    );
}
