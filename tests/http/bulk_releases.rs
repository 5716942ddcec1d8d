//! Bulk release (`POST /v1/joints/releases`) over HTTP on SQLite and
//! PostgreSQL: all or nothing (every refused joint listed, nothing
//! written), by ids and by tag, accepted checks recorded where they apply,
//! roles, and the four-eyes rule (each release a draft until approved).
//! The `tightspec joint release` command with several ids or `--tag`. The
//! plant and its joints are invented (demo data).

use std::process::Command;

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::{demo_joint, problem_fields, start, start_with, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    bulk_release_is_all_or_nothing,
    bulk_release_under_four_eyes_makes_drafts,
    bulk_release_from_the_command_line,
);

const BULK: &str = "/v1/joints/releases";
const A: &str = "HW-K5-DR-101";
const B: &str = "HW-K5-DR-102";
const C: &str = "HW-K5-GB-103";

fn definition(id: &str, request: Value) -> Value {
    demo_joint(
        id,
        "Door hinge to A-pillar (demo)",
        &["hollowmere-demo", "station-50"],
        request,
    )
}

fn plain() -> Value {
    json!({"thread": "M10", "property_class": "8.8",
           "finish": "zinc-electroplated", "lubricant": "none"})
}

/// M8 8.8 screwed 12 mm into EN AW-6082: two error checks apply
/// (surface pressure, thread engagement).
fn aluminium() -> Value {
    json!({"thread": "M8", "property_class": "8.8", "finish": "zinc-electroplated",
           "lubricant": "none", "tightening_method": "dc-nutrunner",
           "joint_type": "tapped-hole", "clamped_material": "aluminium-6082",
           "engagement_length": {"value": 12, "unit": "mm"}})
}

fn accepts() -> Value {
    json!([
        {"code": "surface_pressure_exceeded", "reason": "hardened washer fitted (demo)"},
        {"code": "thread_engagement_too_short", "reason": "thread insert per drawing (demo)"}
    ])
}

async fn post(app: &Instance, token: Option<&str>, path: &str, body: Value) -> (StatusCode, Value) {
    let r = app.post_json(token, path, &body).await;
    let st = r.status();
    (st, r.json().await.unwrap_or(Value::Null))
}

async fn define(app: &Instance, editor: &str, id: &str, request: Value) {
    let (st, p) = post(app, Some(editor), "/v1/joints", definition(id, request)).await;
    assert_eq!(st, StatusCode::CREATED, "{p}");
}

async fn release_count(app: &Instance, id: &str) -> usize {
    app.get_json(&format!("/v1/joints/{id}/releases")).await["releases"]
        .as_array()
        .unwrap()
        .len()
}

async fn released_events(db: &TestDb) -> Vec<String> {
    let store = Store::open(Some(&db.url)).await.expect("store");
    let events = store.outbox_after(0, 1000).await.expect("outbox");
    store.close().await;
    events
        .into_iter()
        .filter(|e| e.event.kind == "joint.released")
        .map(|e| e.event.subject)
        .collect()
}

async fn bulk_release_is_all_or_nothing(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let reader = token(db, "hollowmere-line-12", Role::Reader).await;
    define(&app, &editor, A, plain()).await;
    define(&app, &editor, B, plain()).await;
    define(&app, &editor, C, aluminium()).await;
    let why = "door line start of production (demo)";

    // Roles: anonymous and readers may not release.
    let body = json!({"ids": [A, B], "reason": why});
    assert_eq!(
        post(&app, None, BULK, body.clone()).await.0,
        StatusCode::UNAUTHORIZED
    );
    assert_eq!(
        post(&app, Some(&reader), BULK, body).await.0,
        StatusCode::FORBIDDEN
    );

    // An unknown id and a joint with error checks not accepted: one 422
    // listing both, nothing written for the joints that would release.
    let (st, p) = post(
        &app,
        Some(&editor),
        BULK,
        json!({"ids": [A, B, C, "HW-K5-DR-110"], "reason": why}),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    let fields = problem_fields(&p);
    assert!(fields.contains(&"ids[3]".to_string()), "{p}");
    let refused_c = format!("joints[{C}].accept_checks");
    assert_eq!(
        fields.iter().filter(|f| **f == refused_c).count(),
        2,
        "both error checks of {C} listed: {p}"
    );
    let reasons = p["errors"].to_string();
    assert!(
        reasons.contains("surface_pressure_exceeded")
            && reasons.contains("thread_engagement_too_short"),
        "{p}"
    );
    for id in [A, B, C] {
        assert_eq!(release_count(&app, id).await, 0, "nothing written for {id}");
    }
    assert!(released_events(db).await.is_empty());

    // Bad bodies name their fields.
    for (body, field) in [
        (
            json!({"ids": [A], "tag": "station-50", "reason": why}),
            "tag",
        ),
        (json!({"tag": "station-99", "reason": why}), "tag"),
        (json!({"ids": [A, A], "reason": why}), "ids[1]"),
        (json!({"ids": [A]}), "reason"),
        (
            json!({"ids": [A, B], "reason": why, "accept_checks": accepts()}),
            "accept_checks[0].code",
        ),
    ] {
        let (st, p) = post(&app, Some(&editor), BULK, body).await;
        assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
        assert_eq!(problem_fields(&p)[0], field, "{p}");
    }
    assert_eq!(release_count(&app, A).await, 0);

    // By tag, with C's checks accepted: every joint released at once, the
    // acceptance recorded on the joint it applies to.
    let (st, done) = post(
        &app,
        Some(&editor),
        BULK,
        json!({"tag": "station-50", "reason": why, "accept_checks": accepts()}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{done}");
    assert_eq!(
        (done["count"].as_u64(), done["status"].as_str()),
        (Some(3), Some("released"))
    );
    let releases = done["releases"].as_array().unwrap();
    let ids: Vec<&str> = releases
        .iter()
        .map(|r| r["joint_id"].as_str().unwrap())
        .collect();
    assert_eq!(ids, [A, B, C]);
    assert_eq!(releases[0]["accepted_checks"], json!([]));
    assert_eq!(releases[2]["accepted_checks"], accepts());
    let revision = app.revision().await;
    for r in releases {
        assert_eq!(
            (r["release"].as_i64(), r["status"].as_str()),
            (Some(1), Some("released"))
        );
        assert_eq!(r["catalogue_revision"], revision);
        assert_eq!(r["reason"], why);
    }
    let fetched = app.get_json(&format!("/v1/joints/{A}/setpoints")).await;
    assert_eq!(
        (fetched["release"].as_i64(), fetched["status"].as_str()),
        (Some(1), Some("released"))
    );
    assert_eq!(fetched["spec_hash"], releases[0]["spec_hash"]);
    let mut events = released_events(db).await;
    events.sort();
    assert_eq!(events, [A, B, C], "one joint.released event per joint");

    // Again by ids: release 2 of each, release 1 superseded.
    let (st, again) = post(
        &app,
        Some(&editor),
        BULK,
        json!({"ids": [B, A], "reason": "second shift (demo)"}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{again}");
    assert_eq!(again["releases"][0]["joint_id"], A);
    assert_eq!(again["releases"][0]["release"], 2);
    let one = app.get_json(&format!("/v1/joints/{B}/releases/1")).await;
    assert_eq!(one["status"], "superseded");
    assert_eq!(released_events(db).await.len(), 5);
}

async fn bulk_release_under_four_eyes_makes_drafts(db: &TestDb) {
    let app = start_with(&db.url, |c| c.four_eyes = true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let anna = token(db, "hollowmere-approver-a", Role::Approver).await;
    let ben = token(db, "hollowmere-approver-b", Role::Approver).await;
    define(&app, &editor, A, plain()).await;
    define(&app, &editor, B, plain()).await;

    let (st, done) = post(
        &app,
        Some(&anna),
        BULK,
        json!({"ids": [A, B], "reason": "pilot build (demo)"}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{done}");
    assert_eq!(done["status"], "draft");
    for r in done["releases"].as_array().unwrap() {
        assert_eq!(r["status"], "draft");
    }
    let r = app.get(&format!("/v1/joints/{A}/setpoints")).await;
    assert_eq!(r.status(), StatusCode::CONFLICT, "a draft is not active");
    assert!(
        released_events(db).await.is_empty(),
        "a draft writes no event"
    );

    let approve = format!("/v1/joints/{A}/releases/1/approve");
    let why = json!({"reason": "values checked against drawing HW-5120 (demo)"});
    let (st, p) = post(&app, Some(&anna), &approve, why.clone()).await;
    assert_eq!(
        st,
        StatusCode::FORBIDDEN,
        "the requester may not approve: {p}"
    );
    let (st, p) = post(&app, Some(&ben), &approve, why).await;
    assert_eq!(
        (st, p["status"].as_str()),
        (StatusCode::OK, Some("released")),
        "{p}"
    );
    assert_eq!(p["approved_by"], "hollowmere-approver-b");
    assert_eq!(
        app.get(&format!("/v1/joints/{A}/setpoints")).await.status(),
        StatusCode::OK
    );
    assert_eq!(
        app.get(&format!("/v1/joints/{B}/setpoints")).await.status(),
        StatusCode::CONFLICT,
        "B still waits for its approval"
    );
    assert_eq!(released_events(db).await, [A]);
}

async fn bulk_release_from_the_command_line(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    define(&app, &editor, A, plain()).await;
    define(&app, &editor, B, plain()).await;
    define(&app, &editor, C, aluminium()).await;
    let run = |args: &[&str]| {
        Command::new(env!("CARGO_BIN_EXE_tightspec"))
            .args([
                "joint",
                "release",
                "--by",
                "hw-planning",
                "--reason",
                "night shift (demo)",
            ])
            .args(args)
            .env("DATABASE_URL", &db.url)
            .env_remove("RUST_LOG")
            .env_remove("TIGHTSPEC_FOUR_EYES")
            .output()
            .expect("run tightspec")
    };
    // C's checks are not accepted: refused, every joint listed, nothing written.
    let o = run(&["--tag", "station-50"]);
    let err = String::from_utf8_lossy(&o.stderr).to_string();
    assert!(!o.status.success());
    assert!(err.contains(&format!("joints[{C}].accept_checks")), "{err}");
    assert_eq!(release_count(&app, A).await, 0);

    let o = run(&[A, B]);
    let out = String::from_utf8_lossy(&o.stdout).to_string();
    assert!(
        o.status.success(),
        "{out}{}",
        String::from_utf8_lossy(&o.stderr)
    );
    assert!(out.contains("2 joints, each released"), "{out}");
    assert_eq!(release_count(&app, A).await, 1);
    assert_eq!(release_count(&app, B).await, 1);
    assert_eq!(release_count(&app, C).await, 0);
}
