//! Change impact and review marks over HTTP on SQLite and PostgreSQL, on
//! the demo registry of 52 joints of the invented Hollowmere plant
//! (deploy/demo/hollowmere-joints.json, demo data): impact of an update
//! and a retirement of the friction entry most joints use, writing
//! nothing; bad bodies named by field; the review mark set on the joints
//! that move after the change is applied, the `review=due` filter, and the
//! mark cleared by a confirmation (recorded) and by a re-release.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(impact_writes_nothing_and_marks_follow_the_change);

const DEMO: &str = include_str!("../../deploy/demo/hollowmere-joints.json");

async fn post(app: &Instance, token: Option<&str>, path: &str, body: Value) -> (StatusCode, Value) {
    let r = app.post_json(token, path, &body).await;
    let st = r.status();
    (st, r.json().await.unwrap_or(Value::Null))
}

async fn outbox_count(db: &TestDb, kind: &str) -> usize {
    let store = Store::open(Some(&db.url)).await.expect("store");
    let events = store.outbox_after(0, 10_000).await.expect("outbox");
    store.close().await;
    events.iter().filter(|e| e.event.kind == kind).count()
}

async fn due(app: &Instance) -> Vec<String> {
    let list = app.get_json("/v1/joints?review=due&limit=500").await;
    list["joints"]
        .as_array()
        .expect("joints")
        .iter()
        .map(|j| j["id"].as_str().unwrap().to_string())
        .collect()
}

async fn impact_writes_nothing_and_marks_follow_the_change(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let demo: Value = serde_json::from_str(DEMO).expect("demo registry");
    let joints = demo["joints"].as_array().expect("joints");
    assert!(joints.len() >= 50);
    for j in joints {
        let (st, body) = post(&app, Some(&editor), "/v1/joints", j.clone()).await;
        assert_eq!(st, StatusCode::CREATED, "{body}");
        let path = format!("/v1/joints/{}/releases", j["id"].as_str().unwrap());
        let (st, body) = post(
            &app,
            Some(&editor),
            &path,
            json!({"reason": "demo release"}),
        )
        .await;
        assert_eq!(st, StatusCode::CREATED, "{body}");
    }
    let entries = app
        .get_json("/v1/friction-entries?finish=zinc-electroplated&lubricant=none")
        .await;
    let entry_id = entries["entries"][0]["id"].as_i64().expect("entry id");
    let (mut entry, etag) = app.entry(entry_id).await;
    let min = entry["thread_friction"]["min"].as_f64().unwrap();
    entry["thread_friction"]["min"] = (min + 0.02).into();
    let revision = app.revision().await;
    let released = outbox_count(db, "joint.released").await;

    // Update: the joints on that entry move; the others do not.
    let (st, update) = post(
        &app,
        None,
        "/v1/catalogue/impact",
        json!({"action": "update", "entry_id": entry_id, "entry": entry.clone()}),
    )
    .await;
    assert_eq!(st, StatusCode::OK, "{update}");
    let rows = update["joints"].as_array().unwrap();
    assert_eq!(rows.len(), joints.len());
    let on_entry = joints
        .iter()
        .filter(|j| j["request"]["finish"] == "zinc-electroplated")
        .count();
    let affected = update["summary"]["affected"].as_u64().unwrap() as usize;
    assert!(
        affected > 0 && affected <= on_entry,
        "{affected} of {on_entry}"
    );
    assert!(
        update["summary"]["largest_change_percent"]
            .as_f64()
            .unwrap()
            > 0.0
    );
    let moved = rows
        .iter()
        .find(|r| r["changed"] == true)
        .expect("a moved joint");
    assert_eq!(moved["before"]["target"]["unit"], "N·m");
    assert_ne!(
        moved["before"]["preload_min"],
        moved["after"]["preload_min"]
    );
    let still = rows
        .iter()
        .find(|r| r["id"].as_str().unwrap().ends_with("-004"))
        .unwrap();
    assert_eq!(still["changed"], false, "{still}");
    assert_eq!(still["change_percent"], 0.0);

    // Retire: the joints on that entry no longer compute or move.
    let (st, retire) = post(
        &app,
        None,
        "/v1/catalogue/impact",
        json!({"action": "retire", "entry_id": entry_id}),
    )
    .await;
    assert_eq!(st, StatusCode::OK, "{retire}");
    assert!(retire["summary"]["affected"].as_u64().unwrap() as usize >= on_entry);

    // Bad bodies name their field.
    for (body, field) in [
        (
            json!({"action": "update", "entry": entry.clone()}),
            "entry_id",
        ),
        (json!({"action": "move"}), "action"),
        (
            json!({"action": "create", "entry": {"finish": "plain"}}),
            "entry.lubricant",
        ),
        (
            json!({"friction_test": 1, "action": "retire"}),
            "friction_test",
        ),
    ] {
        let (st, p) = post(&app, None, "/v1/catalogue/impact", body).await;
        assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
        assert!(
            problem_fields(&p).contains(&field.to_string()),
            "{field}: {p}"
        );
    }

    // Nothing was written.
    assert_eq!(app.revision().await, revision);
    assert_eq!(outbox_count(db, "joint.released").await, released);
    assert_eq!(outbox_count(db, "joint.review_due").await, 0);
    assert!(due(&app).await.is_empty());

    // Applying the change marks exactly the joints the impact named.
    let r = app
        .put_thread_min(&editor, entry_id, Some(&etag), min + 0.02)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
    let new_revision = app.revision().await;
    let mut expected: Vec<String> = rows
        .iter()
        .filter(|r| r["changed"] == true)
        .map(|r| r["id"].as_str().unwrap().to_string())
        .collect();
    expected.sort();
    assert_eq!(due(&app).await, expected);
    assert_eq!(outbox_count(db, "joint.review_due").await, expected.len());
    let first = &expected[0];
    let joint = app.get_json(&format!("/v1/joints/{first}")).await;
    assert_eq!(joint["review_due"]["revision"], new_revision);

    // A confirmation clears the mark (reason required; editor only).
    let confirm = format!("/v1/joints/{first}/review/confirm");
    let (st, p) = post(&app, Some(&editor), &confirm, json!({})).await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert_eq!(problem_fields(&p), ["reason"]);
    let (st, _) = post(&app, None, &confirm, json!({"reason": "x"})).await;
    assert!(
        st == StatusCode::UNAUTHORIZED || st == StatusCode::FORBIDDEN,
        "{st}"
    );
    let reason = json!({"reason": "within the joint's test margin (demo)"});
    let (st, body) = post(&app, Some(&editor), &confirm, reason.clone()).await;
    assert_eq!(st, StatusCode::OK, "{body}");
    assert!(body.get("review_due").is_none_or(Value::is_null), "{body}");
    let (st, _) = post(&app, Some(&editor), &confirm, reason).await;
    assert_eq!(st, StatusCode::CONFLICT);

    // A re-release clears the mark too.
    let second = &expected[1];
    let path = format!("/v1/joints/{second}/releases");
    let (st, body) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "new friction data"}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{body}");
    let left = due(&app).await;
    assert_eq!(left.len(), expected.len() - 2);
    assert!(!left.contains(first) && !left.contains(second));
}
