//! Releases in the store, on both backends: numbered 1, 2, … per joint even
//! when written concurrently, each with its first event and its outbox event
//! in one transaction; status events checked against the allowed
//! transitions; the active release; joints listed by release status; and
//! every append-only registry table refusing UPDATE and DELETE.

use chrono::Utc;
use serde_json::json;
use tightspec::registry::{
    event, AcceptedCheck, JointId, NewRelease, OutboxEvent, Page, RegistryError, Release,
    ReleaseEventKind as K, ReleaseStatus as S,
};
use tightspec::store::joints::JointFilter;
use tightspec::store::outbox::new_event_id;
use tightspec::store::{RegistryStoreError, Store, StoreError};

use crate::on_both_backends;
use crate::registry_store::{id, with_joints};
use crate::support::db::TestDb;

on_both_backends!(
    a_release_is_frozen_with_its_event_and_outbox_row,
    the_four_eyes_flow_and_refused_transitions,
    concurrent_releases_get_distinct_numbers,
    a_release_whose_outbox_row_fails_leaves_nothing,
    a_release_computed_from_an_older_definition_is_refused,
    registry_records_are_append_only_in_the_database,
);

fn new_release(joint: &str, requested_by: &str, reason: &str) -> NewRelease {
    NewRelease {
        joint_id: id(joint),
        spec_hash: "86c2879684c6fa92".into(),
        catalogue_revision: 1,
        service_version: "0.1.0".into(),
        method_version: "vdi2230-1:2003".into(),
        requested_by: requested_by.into(),
        reason: reason.into(),
        accepted_checks: vec![AcceptedCheck {
            code: "surface_pressure_not_checked".into(),
            reason: "bearing checked on the drawing".into(),
        }],
        spec: r#"{"torque":{"target":{"value":37.66,"unit":"N·m"}}}"#.into(),
        setpoints: r#"{"target":{"value":37.5,"unit":"N·m"}}"#.into(),
    }
}

fn released_event(joint: &str) -> OutboxEvent {
    OutboxEvent::cloud_event(
        new_event_id(),
        event::JOINT_RELEASED,
        joint,
        Utc::now(),
        json!({}),
    )
}

/// Writes a release of `joint` requested by `editor-a` with its event.
async fn release(
    store: &Store,
    joint: &str,
    reason: &str,
    first: K,
) -> Result<Release, RegistryStoreError> {
    let new = new_release(joint, "editor-a", reason);
    store
        .write_release(&new, None, first, |_| Some(released_event(joint)))
        .await
}

/// The number of the joint's active release.
async fn active_number(store: &Store, joint: &JointId) -> Option<i64> {
    let active = store.active_release(joint).await.unwrap();
    active.map(|r| r.number)
}

async fn outbox_ids(store: &Store) -> Vec<String> {
    store
        .outbox_after(0, 1000)
        .await
        .unwrap()
        .into_iter()
        .map(|e| e.event.id)
        .collect()
}

async fn a_release_is_frozen_with_its_event_and_outbox_row(db: &TestDb) {
    let store = with_joints(db, &["K4-RA-017"]).await;
    let joint = id("K4-RA-017");
    assert_eq!(store.active_release(&joint).await.unwrap(), None);

    let new = new_release("K4-RA-017", "editor-a", "first release");
    let ev = released_event("K4-RA-017");
    let first = store
        .write_release(&new, None, K::Released, |_| Some(ev.clone()))
        .await
        .unwrap();
    assert_eq!((first.number, first.status), (1, S::Released));
    assert_eq!(
        (first.spec.as_str(), first.setpoints.as_str()),
        (new.spec.as_str(), new.setpoints.as_str())
    );
    assert_eq!(first.accepted_checks, new.accepted_checks);
    assert_eq!(
        (first.requested_by.as_str(), first.approved_by.as_deref()),
        ("editor-a", None)
    );
    assert_eq!(store.release(&joint, 1).await.unwrap(), first);
    assert_eq!(
        store.active_release(&joint).await.unwrap(),
        Some(first.clone())
    );
    assert_eq!(outbox_ids(&store).await, std::slice::from_ref(&ev.id));

    // a review mark is cleared by the next release, which supersedes the first
    let mark = tightspec::store::joints::ReviewMark {
        joint: joint.clone(),
        event: OutboxEvent::cloud_event(
            new_event_id(),
            event::JOINT_REVIEW_DUE,
            "K4-RA-017",
            Utc::now(),
            json!({"revision": 2}),
        ),
    };
    store.mark_review_due(2, Utc::now(), &[mark]).await.unwrap();
    let second = release(&store, "K4-RA-017", "friction changed", K::Released)
        .await
        .unwrap();
    assert_eq!(second.number, 2);
    assert_eq!(
        store.release(&joint, 1).await.unwrap().status,
        S::Superseded
    );
    assert_eq!(active_number(&store, &joint).await, Some(2));
    assert_eq!(store.joint(&joint).await.unwrap().review_due, None);
    let events: Vec<_> = store
        .release_events(&joint, 1)
        .await
        .unwrap()
        .into_iter()
        .map(|e| e.event)
        .collect();
    assert_eq!(events, ["released", "superseded"]);

    // refused: no reason, an unknown joint, a missing release; nothing written
    let before = outbox_ids(&store).await.len();
    let err = release(&store, "K4-RA-017", " ", K::Released)
        .await
        .unwrap_err();
    assert!(
        matches!(&err, RegistryStoreError::Registry(e) if e.field() == "reason"),
        "{err:?}"
    );
    let err = release(&store, "K4-NONE", "r", K::Released)
        .await
        .unwrap_err();
    assert!(
        matches!(&err, RegistryStoreError::Store(StoreError::NotFound { field, .. }) if field == "id"),
        "{err:?}"
    );
    let err = store.release(&joint, 9).await.unwrap_err();
    assert!(
        matches!(&err, StoreError::NotFound { field, .. } if field == "release"),
        "{err:?}"
    );
    assert_eq!(outbox_ids(&store).await.len(), before);
}

/// The ids of the joints with a release now at `status`.
async fn listed(store: &Store, status: S) -> Vec<String> {
    let filter = JointFilter {
        status: Some(status),
        ..JointFilter::default()
    };
    let page = Page::new(None, 500).unwrap();
    let joints = store.joints(&filter, &page).await.unwrap();
    joints.into_iter().map(|j| j.id.to_string()).collect()
}

async fn the_four_eyes_flow_and_refused_transitions(db: &TestDb) {
    let store = with_joints(db, &["K4-ST-004", "K4-ST-005"]).await;
    let joint = id("K4-ST-004");
    let draft = release(&store, "K4-ST-004", "first", K::Requested)
        .await
        .unwrap();
    assert_eq!(draft.status, S::Draft);
    assert_eq!(store.active_release(&joint).await.unwrap(), None);
    assert_eq!(listed(&store, S::Draft).await, ["K4-ST-004"]);
    assert!(listed(&store, S::Released).await.is_empty());
    // a draft is released by approval only
    let err = store
        .append_release_event(&joint, 1, K::Released, "approver-b", "ok", None)
        .await
        .unwrap_err();
    match err {
        RegistryStoreError::Registry(RegistryError::Transition { field, from, to }) => {
            assert_eq!(
                (field.as_str(), from, to),
                ("status", Some(S::Draft), S::Released)
            );
        }
        other => panic!("expected a transition error, got {other:?}"),
    }
    let ev = released_event("K4-ST-004");
    let approved = store
        .append_release_event(&joint, 1, K::Approved, "approver-b", "checked", Some(&ev))
        .await
        .unwrap();
    assert_eq!(
        (approved.status, approved.approved_by.as_deref()),
        (S::Released, Some("approver-b"))
    );
    assert_eq!(active_number(&store, &joint).await, Some(1));
    assert!(outbox_ids(&store).await.contains(&ev.id));
    assert_eq!(listed(&store, S::Released).await, ["K4-ST-004"]);
    assert!(listed(&store, S::Draft).await.is_empty());

    let withdrawn = store
        .append_release_event(&joint, 1, K::Withdrawn, "approver-b", "wrong part", None)
        .await
        .unwrap();
    assert_eq!(withdrawn.status, S::Withdrawn);
    assert_eq!(store.active_release(&joint).await.unwrap(), None);
    for k in [
        K::Approved,
        K::Released,
        K::Superseded,
        K::Withdrawn,
        K::Requested,
    ] {
        let err = store
            .append_release_event(&joint, 1, k, "x", "y", None)
            .await
            .unwrap_err();
        assert!(
            matches!(
                err,
                RegistryStoreError::Registry(RegistryError::Transition { .. })
            ),
            "{k:?}"
        );
    }
    let events: Vec<_> = store
        .release_events(&joint, 1)
        .await
        .unwrap()
        .into_iter()
        .map(|e| (e.event, e.status))
        .collect();
    let want = [
        ("requested", "draft"),
        ("approved", "released"),
        ("withdrawn", "withdrawn"),
    ];
    assert_eq!(events, want.map(|(a, b)| (a.to_string(), b.to_string())));
    let err = store
        .append_release_event(&joint, 5, K::Withdrawn, "x", "y", None)
        .await
        .unwrap_err();
    assert!(
        matches!(&err, RegistryStoreError::Store(StoreError::NotFound { field, .. }) if field == "release"),
        "{err:?}"
    );
}

async fn concurrent_releases_get_distinct_numbers(db: &TestDb) {
    let store = with_joints(db, &["K4-RA-017"]).await;
    let tasks: Vec<_> = (0..8)
        .map(|n| {
            let store = store.clone();
            tokio::spawn(async move {
                let new = new_release("K4-RA-017", "editor", &format!("release {n}"));
                store
                    .write_release(&new, None, K::Released, |_| {
                        Some(released_event("K4-RA-017"))
                    })
                    .await
            })
        })
        .collect();
    let mut numbers = Vec::new();
    for t in tasks {
        numbers.push(t.await.unwrap().unwrap().number);
    }
    numbers.sort();
    assert_eq!(numbers, (1..=8).collect::<Vec<i64>>());
    // exactly one active: the last one written
    let joint = id("K4-RA-017");
    assert_eq!(active_number(&store, &joint).await, Some(8));
    for n in 1..8 {
        assert_eq!(
            store.release(&joint, n).await.unwrap().status,
            S::Superseded,
            "release {n}"
        );
    }
    assert_eq!(outbox_ids(&store).await.len(), 8);
}

async fn a_release_whose_outbox_row_fails_leaves_nothing(db: &TestDb) {
    let store = with_joints(db, &["K4-RA-017"]).await;
    let ev = released_event("K4-RA-017");
    let new = new_release("K4-RA-017", "editor-a", "first");
    store
        .write_release(&new, None, K::Released, |_| Some(ev.clone()))
        .await
        .unwrap();
    // the outbox refuses a second row with the same event id: the release,
    // its first event and the superseding of release 1 are rolled back with it
    let err = store
        .write_release(&new, None, K::Released, |_| Some(ev.clone()))
        .await
        .unwrap_err();
    assert!(
        matches!(&err, RegistryStoreError::Store(StoreError::Conflict { .. })),
        "{err:?}"
    );
    let joint = id("K4-RA-017");
    let err = store.release(&joint, 2).await.unwrap_err();
    assert!(matches!(err, StoreError::NotFound { .. }), "{err:?}");
    let active = store.active_release(&joint).await.unwrap();
    assert_eq!(active.map(|r| (r.number, r.status)), Some((1, S::Released)));
    assert_eq!(store.release_events(&joint, 1).await.unwrap().len(), 1);
    assert_eq!(outbox_ids(&store).await, std::slice::from_ref(&ev.id));
    // the next release takes number 2
    let next = release(&store, "K4-RA-017", "second", K::Released).await;
    assert_eq!(next.unwrap().number, 2);
}

async fn a_release_computed_from_an_older_definition_is_refused(db: &TestDb) {
    let store = with_joints(db, &["K4-RA-017"]).await;
    let joint = id("K4-RA-017");
    let version = store.joint(&joint).await.unwrap().version;
    let new = new_release("K4-RA-017", "editor-a", "first");
    // the definition read was version - 1: changed since, so a conflict
    // naming the joint, and nothing written
    let err = store
        .write_release(&new, Some(version - 1), K::Released, |_| {
            Some(released_event("K4-RA-017"))
        })
        .await
        .unwrap_err();
    match &err {
        RegistryStoreError::Store(StoreError::Conflict { field, .. }) => {
            assert_eq!(field, "joints[K4-RA-017]")
        }
        other => panic!("{other:?}"),
    }
    assert_eq!(store.active_release(&joint).await.unwrap(), None);
    assert!(outbox_ids(&store).await.is_empty());
    // at the version read, it is written
    let r = store
        .write_release(&new, Some(version), K::Released, |_| {
            Some(released_event("K4-RA-017"))
        })
        .await
        .unwrap();
    assert_eq!(r.number, 1);
}

async fn registry_records_are_append_only_in_the_database(db: &TestDb) {
    let store = with_joints(db, &["K4-RA-017"]).await;
    release(&store, "K4-RA-017", "first", K::Released)
        .await
        .unwrap();
    let statements = [
        "UPDATE joint_history SET reason = 'rewritten'",
        "DELETE FROM joint_history",
        "UPDATE joint_releases SET spec = '{}'",
        "DELETE FROM joint_releases",
        "UPDATE joint_release_events SET status = 'withdrawn'",
        "DELETE FROM joint_release_events",
    ];
    for sql in statements {
        let refused = match &store {
            Store::Postgres(p) => sqlx::query(sql).execute(p).await.is_err(),
            Store::Sqlite(p) => sqlx::query(sql).execute(p).await.is_err(),
        };
        assert!(refused, "the database accepted: {sql}");
    }
    let joint = id("K4-RA-017");
    assert_eq!(store.joint_history(&joint).await.unwrap().len(), 1);
    let release = store.release(&joint, 1).await.unwrap();
    assert_eq!(
        (release.status, release.spec.contains("37.66")),
        (S::Released, true)
    );
    assert_eq!(store.release_events(&joint, 1).await.unwrap().len(), 1);
}
