//! `/v1/joints/import` and `/v1/joints/export` over HTTP on SQLite and
//! PostgreSQL: a JSON import and a CSV import (with a byte order mark),
//! created / updated / unchanged counts, every bad row reported with
//! nothing written, the export re-importing unchanged in both formats,
//! the history recording the reason, and the roles. The plant and its
//! joints are invented for the test (demo data).

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::registry::JointId;
use tightspec::store::{Role, Store};

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    engineer_imports_and_exports_joints_as_json_and_csv,
    bad_rows_are_all_reported_and_nothing_is_imported,
);

fn definition(id: &str, tags: &[&str], thread: &str) -> Value {
    json!({
        "id": id,
        "title": "Demo plant: seat rail to floor, front",
        "tags": tags,
        "request": {"thread": thread, "property_class": "8.8",
                    "thread_friction": 0.12, "bearing_friction": {"min": 0.1, "max": 0.14},
                    "clamp_length": {"value": 30, "unit": "mm"}},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.5, "angle_resolution": 1.0},
    })
}

async fn import(
    app: &Instance,
    token: &str,
    content_type: &str,
    body: String,
    query: &str,
) -> reqwest::Response {
    app.client
        .post(app.url(&format!("/v1/joints/import{query}")))
        .bearer_auth(token)
        .header("content-type", content_type)
        .body(body)
        .send()
        .await
        .expect("POST import")
}

async fn text(app: &Instance, path: &str) -> String {
    let r = app.client.get(app.url(path)).send().await.expect("GET");
    assert_eq!(r.status(), StatusCode::OK, "{path}");
    r.text().await.unwrap()
}

fn ids(v: &Value) -> Vec<String> {
    v.as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_str().unwrap().to_string())
        .collect()
}

async fn engineer_imports_and_exports_joints_as_json_and_csv(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "demo-planning", Role::Editor).await;
    let reader = token(db, "demo-line", Role::Reader).await;

    let body = json!({
        "joints": [definition("DM-SR-002", &["seat", "st-10"], "M10"),
                   definition("DM-SR-001", &["seat"], "M8")],
        "reason": "demo: seat line joints from the planning sheet",
    });
    // a reader may not import
    let r = import(&app, &reader, "application/json", body.to_string(), "").await;
    assert_eq!(r.status(), StatusCode::FORBIDDEN);
    let r = import(&app, &editor, "application/json", body.to_string(), "").await;
    assert_eq!(r.status(), StatusCode::OK);
    let report: Value = r.json().await.unwrap();
    assert_eq!(
        report["counts"],
        json!({"created": 2, "updated": 0, "unchanged": 0})
    );
    assert_eq!(ids(&report["created"]), ["DM-SR-002", "DM-SR-001"]);

    // the JSON export re-imports unchanged
    let export: Value = serde_json::from_str(&text(&app, "/v1/joints/export").await).unwrap();
    assert_eq!(export["joints"][0]["id"], "DM-SR-001");
    assert_eq!(export["joints"][1]["request"], body["joints"][0]["request"]);
    let mut again = export.clone();
    again["reason"] = json!("demo: re-import");
    let r = import(&app, &editor, "application/json", again.to_string(), "").await;
    let report: Value = r.json().await.unwrap();
    assert_eq!(
        report["counts"],
        json!({"created": 0, "updated": 0, "unchanged": 2})
    );

    // the CSV export with a byte order mark, by tag, re-imports unchanged
    let csv = text(&app, "/v1/joints/export?format=csv&bom=true&tag=st-10").await;
    assert!(csv.starts_with("\u{feff}id,title,tags,"), "{csv}");
    assert_eq!(csv.lines().count(), 2, "{csv}");
    let r = import(
        &app,
        &editor,
        "text/csv",
        csv.clone(),
        "?reason=demo%3A%20round%20trip",
    )
    .await;
    assert_eq!(r.status(), StatusCode::OK);
    let report: Value = r.json().await.unwrap();
    assert_eq!(
        report["counts"],
        json!({"created": 0, "updated": 0, "unchanged": 1}),
        "{report}"
    );

    // a CSV changing one joint and adding one (no BOM)
    let csv = text(&app, "/v1/joints/export?format=csv").await;
    let header = csv.lines().next().unwrap().to_string();
    let row = csv.lines().nth(1).unwrap().replace(",M8,", ",M12,");
    assert!(row.contains(",M12,"), "{row}");
    let new_row = row.replacen("DM-SR-001", "DM-SR-003", 1);
    let sheet = format!("{header}\n{row}\n{new_row}\n");
    let r = import(
        &app,
        &editor,
        "text/csv; charset=utf-8",
        sheet,
        "?reason=demo%3A%20M12",
    )
    .await;
    assert_eq!(r.status(), StatusCode::OK);
    let report: Value = r.json().await.unwrap();
    assert_eq!(
        report["counts"],
        json!({"created": 1, "updated": 1, "unchanged": 0}),
        "{report}"
    );
    assert_eq!(ids(&report["updated"]), ["DM-SR-001"]);
    assert_eq!(ids(&report["created"]), ["DM-SR-003"]);
    let joint = app.get_json("/v1/joints/DM-SR-001").await;
    assert_eq!(joint["version"], 2);
    assert_eq!(joint["request"]["thread"], "M12");

    // the history records the import's reason
    let store = Store::open(Some(&db.url)).await.expect("store");
    let history = store
        .joint_history(&JointId::parse("id", "DM-SR-001").unwrap())
        .await
        .unwrap();
    let reasons: Vec<&str> = history.iter().map(|h| h.reason.as_str()).collect();
    assert_eq!(
        reasons,
        [
            "demo: seat line joints from the planning sheet",
            "demo: M12"
        ]
    );
    assert_eq!(history[1].actor, "demo-planning");
    store.close().await;

    // neither JSON nor CSV
    let r = import(&app, &editor, "text/plain", "x".into(), "").await;
    assert_eq!(r.status(), StatusCode::UNSUPPORTED_MEDIA_TYPE);
}

async fn bad_rows_are_all_reported_and_nothing_is_imported(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "demo-planning", Role::Editor).await;

    let mut bad = definition("DM-BAD-1", &[], "M99");
    bad["setpoints"]["resolution"] = json!(-1);
    let body = json!({
        "joints": [definition("DM-OK-1", &[], "M10"), bad, definition("DM-OK-1", &[], "M8")],
        "reason": "demo",
    });
    let r = import(&app, &editor, "application/json", body.to_string(), "").await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let fields = problem_fields(&r.json().await.unwrap());
    for f in [
        "joints[1].request.thread",
        "joints[1].setpoints.resolution",
        "joints[2].id",
    ] {
        assert!(fields.iter().any(|x| x == f), "{f} not in {fields:?}");
    }
    // no reason
    let r = import(
        &app,
        &editor,
        "application/json",
        json!({"joints": [definition("DM-OK-1", &[], "M10")]}).to_string(),
        "",
    )
    .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    assert_eq!(problem_fields(&r.json().await.unwrap()), ["reason"]);

    // CSV: a good row and two bad ones, each bad cell named by row and column
    let sheet = "\u{feff}id,title,tags,resolution,thread,property_class,thread_friction,bearing_friction,clamp_length\n\
                 DM-OK-2,Demo good,demo,0.5,M10,8.8,0.12,0.12,30mm\n\
                 DM BAD,Demo bad id,demo,fine,M10,8.8,0.12,0.12,30mm\n\
                 DM-BAD-3,Demo bad length,demo,0.5,M10,8.8,0.12,0.12,30\n";
    let r = import(&app, &editor, "text/csv", sheet.into(), "?reason=demo").await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let fields = problem_fields(&r.json().await.unwrap());
    for f in ["rows[1].resolution", "rows[2].clamp_length"] {
        assert!(fields.iter().any(|x| x == f), "{f} not in {fields:?}");
    }
    // an unknown column
    let r = import(
        &app,
        &editor,
        "text/csv",
        "id,title,thred,property_class\n".into(),
        "?reason=demo",
    )
    .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let fields = problem_fields(&r.json().await.unwrap());
    assert!(fields.iter().any(|x| x == "header[2]"), "{fields:?}");

    // nothing was written
    let all = app.get_json("/v1/joints").await;
    assert_eq!(all["joints"], json!([]));
}
