//! The catalogue over HTTP: read, change with If-Match and a reason,
//! history, revisions, diff, past revisions, export; every refusal leaves
//! the catalogue unchanged. Runs on SQLite and PostgreSQL.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{problem_fields, start, token};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    engineer_changes_an_entry_and_reads_history_diff_and_past_revision,
    refused_changes_are_listed_and_write_nothing,
    finishes_and_lubricants_are_versioned_items,
    export_json_and_csv,
    fifty_concurrent_editors_one_wins_each_round,
);

async fn engineer_changes_an_entry_and_reads_history_diff_and_past_revision(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-quality", Role::Editor).await;
    let list = app.get_json("/v1/friction-entries").await;
    let base = list["catalogue_revision"].as_i64().expect("revision");
    assert!(base >= 1);
    assert_eq!(list["catalogue_may_be_stale"], false);
    let id = list["entries"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["finish"] == "zinc-electroplated" && e["lubricant"] == "none")
        .and_then(|e| e["id"].as_i64())
        .expect("seed entry zinc-electroplated + none");
    let (before, etag) = app.entry(id).await;
    assert_eq!(before["thread_friction"], json!({"min": 0.14, "max": 0.24}));
    let history_before = app
        .get_json(&format!("/v1/friction-entries/{id}/history"))
        .await["history"]
        .as_array()
        .unwrap()
        .len();

    // no If-Match → 428; a good one → 200, new revision, new ETag
    let r = app.put_thread_min(&editor, id, None, 0.12).await;
    assert_eq!(r.status(), StatusCode::PRECONDITION_REQUIRED);
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["If-Match"]);
    let r = app.put_thread_min(&editor, id, Some(&etag), 0.12).await;
    assert_eq!(r.status(), StatusCode::OK);
    let new_etag = r.headers()["etag"].to_str().unwrap().to_string();
    assert_ne!(new_etag, etag);
    let after: Value = r.json().await.unwrap();
    assert_eq!(
        (
            after["catalogue_revision"].as_i64(),
            after["revision"].as_i64()
        ),
        (Some(base + 1), Some(base + 1))
    );
    assert_eq!(after["thread_friction"]["min"], 0.12);

    // the old ETag is stale now: 412 with the current state
    let r = app.put_thread_min(&editor, id, Some(&etag), 0.13).await;
    assert_eq!(r.status(), StatusCode::PRECONDITION_FAILED);
    let p: Value = r.json().await.unwrap();
    assert_eq!(p["current"]["thread_friction"]["min"], 0.12);
    assert_eq!(problem_fields(&p), ["If-Match"]);

    // history names the token as author and the reason
    let h = app
        .get_json(&format!("/v1/friction-entries/{id}/history"))
        .await;
    let items = h["history"].as_array().unwrap();
    assert_eq!(items.len(), history_before + 1);
    let last = items.last().unwrap();
    assert_eq!(last["actor"], "hollowmere-quality");
    assert_eq!(
        last["reason"],
        "Hollowmere Works test series HW-17 (demo data)"
    );
    assert_eq!(last["before"]["thread_friction"]["min"], 0.14);
    assert_eq!(last["after"]["thread_friction"]["min"], 0.12);

    // revisions, one revision, diff
    let revs = app.get_json("/v1/catalogue/revisions").await;
    assert_eq!(revs["revisions"][0]["revision"], base + 1);
    assert_eq!(revs["revisions"][0]["actor"], "hollowmere-quality");
    let r2 = app
        .get_json(&format!("/v1/catalogue/revisions/{}", base + 1))
        .await;
    assert_eq!(r2["changes"].as_array().unwrap().len(), 1);
    assert_eq!(r2["changes"][0]["entity_id"], id.to_string());
    let d = app
        .get_json(&format!("/v1/catalogue/diff?from={base}&to={}", base + 1))
        .await;
    assert_eq!(d["changes"].as_array().unwrap().len(), 1);
    assert_eq!(d["changes"][0]["fields"], json!(["thread_friction"]));

    // the past stays readable exactly
    let old = app
        .get_json(&format!(
            "/v1/friction-entries/{id}?catalogue_revision={base}"
        ))
        .await;
    assert_eq!(old["thread_friction"]["min"], 0.14);
    assert_eq!(old["catalogue_revision"], base);
    let old_list = app
        .get_json(&format!("/v1/friction-entries?catalogue_revision={base}"))
        .await;
    assert_eq!(old_list["catalogue_revision"], base);
    let r = app.get("/v1/friction-entries?catalogue_revision=99").await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);

    // retire (DELETE) is a revision too; the entry stays readable
    let (_, etag) = app.entry(id).await;
    let r = app
        .client
        .delete(app.url(&format!("/v1/friction-entries/{id}?reason=superseded")))
        .bearer_auth(&editor)
        .header("If-Match", &etag)
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::OK);
    let (retired, _) = app.entry(id).await;
    assert_eq!(
        (
            retired["status"].as_str(),
            retired["catalogue_revision"].as_i64()
        ),
        (Some("retired"), Some(base + 2))
    );

    // create a replacement
    let r = app
        .client
        .post(app.url("/v1/friction-entries"))
        .bearer_auth(&editor)
        .json(&json!({
            "finish": "zinc-electroplated", "lubricant": "none",
            "thread_friction": {"min": 0.12, "max": 0.2}, "bearing_friction": {"min": 0.12, "max": 0.2},
            "source": "Hollowmere Works test series HW-18 (demo data)", "reason": "new series"
        }))
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::CREATED);
    assert!(r.headers().contains_key("location"));
    let created: Value = r.json().await.unwrap();
    assert_eq!(created["catalogue_revision"], base + 3);
    assert_eq!(app.revision().await, base + 3);
}

async fn refused_changes_are_listed_and_write_nothing(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-editor", Role::Editor).await;
    let base = app.revision().await;
    let post = |body: Value| {
        app.client
            .post(app.url("/v1/friction-entries"))
            .bearer_auth(&editor)
            .json(&body)
            .send()
    };
    // every problem listed at once
    let r = post(json!({
        "finish": "zinc-electroplatd", "lubricant": "oyl",
        "thread_friction": {"min": 0.7, "max": 0.01}, "bearing_friction": {"min": 0.1, "max": 0.2},
        "source": "x", "reason": "r"
    }))
    .await
    .unwrap();
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    assert_eq!(r.headers()["content-type"], "application/problem+json");
    let p: Value = r.json().await.unwrap();
    let fields = problem_fields(&p);
    for f in [
        "finish",
        "lubricant",
        "thread_friction.min",
        "thread_friction.max",
    ] {
        assert!(fields.contains(&f.to_string()), "{f} not in {fields:?}");
    }
    let finish = p["errors"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["field"] == "finish")
        .unwrap();
    assert_eq!(finish["suggestions"][0], "zinc-electroplated");
    // missing fields and reason
    let r = post(json!({"finish": "plain"})).await.unwrap();
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let fields = problem_fields(&r.json().await.unwrap());
    for f in [
        "lubricant",
        "thread_friction",
        "bearing_friction",
        "source",
        "reason",
    ] {
        assert!(fields.contains(&f.to_string()), "{f} not in {fields:?}");
    }
    // duplicate active key
    let r = post(json!({
        "finish": "plain", "lubricant": "none",
        "thread_friction": {"min": 0.1, "max": 0.2}, "bearing_friction": {"min": 0.1, "max": 0.2},
        "source": "x", "reason": "r"
    }))
    .await
    .unwrap();
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let p: Value = r.json().await.unwrap();
    assert!(
        p["detail"].as_str().unwrap().contains("already exists"),
        "{p}"
    );
    // malformed JSON → 400, unknown query parameter → 400
    let r = app
        .client
        .post(app.url("/v1/friction-entries"))
        .bearer_auth(&editor)
        .header("content-type", "application/json")
        .body("{not json")
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::BAD_REQUEST);
    assert_eq!(
        app.get("/v1/friction-entries?catalog_revision=1")
            .await
            .status(),
        StatusCode::BAD_REQUEST
    );
    // an ETag of another entry never matches
    let r = app
        .put_thread_min(&editor, 1, Some("\"entry-2-r1\""), 0.1)
        .await;
    assert_eq!(r.status(), StatusCode::PRECONDITION_FAILED);
    // unknown entry
    let r = app.client.put(app.url("/v1/friction-entries/999")).bearer_auth(&editor).header("If-Match", "\"entry-999-r1\"")
        .json(&json!({"finish": "plain", "lubricant": "none", "thread_friction": {"min": 0.1, "max": 0.2},
                      "bearing_friction": {"min": 0.1, "max": 0.2}, "source": "x", "reason": "r"}))
        .send().await.unwrap();
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    // nothing was written
    assert_eq!(app.revision().await, base);
    let revs = app.get_json("/v1/catalogue/revisions").await;
    assert_eq!(revs["revisions"].as_array().unwrap().len() as i64, base);
}

async fn finishes_and_lubricants_are_versioned_items(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-editor", Role::Editor).await;
    let list = app.get_json("/v1/finishes").await;
    let base = app.revision().await;
    assert_eq!(list["catalogue_revision"], base);
    assert!(list["finishes"]
        .as_array()
        .unwrap()
        .iter()
        .any(|f| f["id"] == "zinc-flake-lubricated"));
    let r = app.get("/v1/finishes/zinc-nickle").await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    let p: Value = r.json().await.unwrap();
    assert_eq!(p["errors"][0]["suggestions"][0], "zinc-nickel");
    // a plant's own finish, then an entry using it
    let r = app.client.post(app.url("/v1/finishes")).bearer_auth(&editor)
        .json(&json!({"id": "hw-blue-flake", "name": "Hollowmere blue zinc flake (demo data)", "reason": "new coating for the Kestrel K4 deck bolts"}))
        .send().await.unwrap();
    assert_eq!(r.status(), StatusCode::CREATED);
    let etag = r.headers()["etag"].to_str().unwrap().to_string();
    let r = app.client.put(app.url("/v1/finishes/hw-blue-flake")).bearer_auth(&editor).header("If-Match", &etag)
        .json(&json!({"name": "Hollowmere blue zinc flake, sealed (demo data)", "reason": "sealer added"}))
        .send().await.unwrap();
    assert_eq!(r.status(), StatusCode::OK);
    let h = app.get_json("/v1/finishes/hw-blue-flake/history").await;
    assert_eq!(h["history"].as_array().unwrap().len(), 2);
    let lubes = app.get_json("/v1/lubricants").await;
    assert!(lubes["lubricants"]
        .as_array()
        .unwrap()
        .iter()
        .any(|l| l["id"] == "none" && l["dry"] == true));
    // retiring a lubricant still used by active entries is refused
    let r = app.get("/v1/lubricants/wax").await;
    let etag = r.headers()["etag"].to_str().unwrap().to_string();
    let r = app
        .client
        .put(app.url("/v1/lubricants/wax"))
        .bearer_auth(&editor)
        .header("If-Match", &etag)
        .json(&json!({"name": "Wax", "status": "retired", "reason": "no longer used"}))
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    assert_eq!(app.revision().await, base + 2);
}

async fn export_json_and_csv(db: &TestDb) {
    let app = start(&db.url, true).await;
    let j = app.get_json("/v1/catalogue/export?format=json").await;
    assert_eq!(j["catalogue_revision"], app.revision().await);
    assert_eq!(j["finishes"].as_array().unwrap().len(), 8);
    let r = app.get("/v1/catalogue/export?format=csv").await;
    assert_eq!(r.status(), StatusCode::OK);
    assert!(r.headers()["content-type"]
        .to_str()
        .unwrap()
        .starts_with("text/csv"));
    let text = r.text().await.unwrap();
    assert!(text.starts_with("id,finish,lubricant,bearing_surface,thread_friction_min"));
    assert_eq!(
        text.lines().count(),
        1 + j["entries"].as_array().unwrap().len()
    );
    assert_eq!(
        app.get("/v1/catalogue/export?format=xml").await.status(),
        StatusCode::BAD_REQUEST
    );
}

async fn fifty_concurrent_editors_one_wins_each_round(db: &TestDb) {
    let app = std::sync::Arc::new(start(&db.url, true).await);
    let editor = token(db, "hollowmere-editor", Role::Editor).await;
    let id = 7;
    let base = app.revision().await;
    let history_before = app
        .get_json(&format!("/v1/friction-entries/{id}/history"))
        .await["history"]
        .as_array()
        .unwrap()
        .len();
    for round in 0..3 {
        let (body, etag) = app.entry(id).await;
        let mut tasks = Vec::new();
        for i in 0..50 {
            let app = std::sync::Arc::clone(&app);
            let editor = editor.clone();
            let etag = etag.clone();
            let mut body = body.clone();
            body["thread_friction"]["min"] = json!(0.100 + 0.01 * round as f64 + 0.0001 * i as f64);
            body["reason"] = json!(format!("editor {i}, round {round}"));
            tasks.push(tokio::spawn(async move {
                let r = app
                    .client
                    .put(app.url(&format!("/v1/friction-entries/{id}")))
                    .bearer_auth(&editor)
                    .header("If-Match", etag)
                    .json(&body)
                    .send()
                    .await
                    .unwrap();
                let status = r.status();
                let reason = body["reason"].as_str().unwrap().to_string();
                (status, reason)
            }));
        }
        let mut winners = Vec::new();
        for t in tasks {
            let (status, reason) = t.await.unwrap();
            match status {
                StatusCode::OK => winners.push(reason),
                StatusCode::PRECONDITION_FAILED => {}
                other => panic!("round {round}: unexpected {other}"),
            }
        }
        assert_eq!(winners.len(), 1, "round {round}: exactly one editor wins");
        let h = app
            .get_json(&format!("/v1/friction-entries/{id}/history"))
            .await;
        let items = h["history"].as_array().unwrap();
        assert_eq!(
            items.len(),
            history_before + 1 + round,
            "history holds exactly the accepted changes"
        );
        assert_eq!(items.last().unwrap()["reason"], winners[0].as_str());
    }
    assert_eq!(app.revision().await, base + 3);
}
