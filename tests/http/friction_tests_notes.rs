//! An entry changed by a friction test series gets notes about that change:
//! the seed's notes on where the old window came from (here "recalled from
//! memory") no longer describe it and stay only in the history.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{start, token};
use crate::friction_tests::demo_series;
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(applied_series_replaces_the_notes_of_the_entry);

async fn applied_series_replaces_the_notes_of_the_entry(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let (mut series, _, _) = demo_series();
    series["finish"] = json!("zinc-flake-lubricated");
    let r = app
        .client
        .post(app.url("/v1/friction-tests"))
        .bearer_auth(&editor)
        .json(&series)
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::CREATED);
    let id = r.json::<Value>().await.unwrap()["id"].as_i64().unwrap();
    let p = app
        .get_json(&format!("/v1/friction-tests/{id}/proposal?basis=observed"))
        .await;
    let entry_id = p["entry_id"].as_i64().unwrap();
    let (before, etag) = app.entry(entry_id).await;
    // the seed entry says its window was recalled from memory
    let old_notes = before["notes"].as_str().unwrap().to_string();
    assert!(old_notes.contains("recalled from memory"), "{before}");
    let proposed = p["proposed_notes"].as_str().expect("proposed_notes");
    assert!(
        proposed.starts_with(&format!("Changed by friction test series {id}")),
        "{p}"
    );
    assert!(!proposed.contains("recalled from memory"), "{p}");

    let r = app
        .client
        .post(app.url(&format!("/v1/friction-tests/{id}/apply")))
        .bearer_auth(&editor)
        .header("if-match", etag)
        .json(&json!({"basis": "observed", "reason": "rig 2 series (demo data)"}))
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::OK);
    let (after, _) = app.entry(entry_id).await;
    assert_eq!(after["notes"], proposed);
    assert!(after["source"]
        .as_str()
        .unwrap()
        .contains(&format!("friction test series {id}")));
    // the old notes stay in the history
    let h = app
        .get_json(&format!("/v1/friction-entries/{entry_id}/history"))
        .await;
    let last = h["history"].as_array().unwrap().last().unwrap().clone();
    assert_eq!(last["before"]["notes"], old_notes.as_str());
    assert_eq!(last["after"]["notes"], proposed);
}
