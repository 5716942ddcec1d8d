//! Joint releases over HTTP on SQLite and PostgreSQL: release and fetch by
//! joint id from the stored bytes (unchanged after a catalogue change),
//! 304, `?release=N`, 409 without an active release, supersede, withdraw,
//! the four-eyes flow (the requester refused, another approver accepted),
//! refusal on error checks and the recorded acceptance, roles, and the
//! outbox rows a release writes. The plant and its joints are invented for
//! the test (demo data).

use reqwest::{Response, StatusCode};
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::{demo_joint, problem_fields, start, start_with, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    release_fetch_supersede_and_withdraw,
    four_eyes_needs_a_second_approver,
    error_checks_are_refused_until_accepted_with_a_reason,
);

const ID: &str = "HW-K4-RA-017";

fn definition(id: &str, request: Value) -> Value {
    demo_joint(
        id,
        "Rear axle carrier to subframe, left (demo)",
        &["hollowmere-demo", "station-40"],
        request,
    )
}

/// M10 8.8 with the catalogue's friction for zinc-electroplated, dry.
fn catalogue_request() -> Value {
    json!({"thread": "M10", "property_class": "8.8",
           "finish": "zinc-electroplated", "lubricant": "none"})
}

async fn status_of(r: Response) -> (StatusCode, Value) {
    let st = r.status();
    (st, r.json().await.unwrap_or(Value::Null))
}

async fn post(app: &Instance, token: Option<&str>, path: &str, body: Value) -> (StatusCode, Value) {
    status_of(app.post_json(token, path, &body).await).await
}

async fn fetch(app: &Instance, path: &str, etag: Option<&str>) -> (StatusCode, String, String) {
    let mut rq = app.client.get(app.url(path));
    if let Some(tag) = etag {
        rq = rq.header("If-None-Match", tag);
    }
    let r = rq.send().await.expect("GET");
    let st = r.status();
    let tag = r
        .headers()
        .get("etag")
        .map(|v| v.to_str().unwrap().to_string())
        .unwrap_or_default();
    (st, tag, r.text().await.unwrap_or_default())
}

async fn outbox_types(db: &TestDb) -> Vec<(String, String)> {
    let store = Store::open(Some(&db.url)).await.expect("store");
    let events = store.outbox_after(0, 100).await.expect("outbox");
    store.close().await;
    events
        .into_iter()
        .map(|e| (e.event.kind, e.event.subject))
        .collect()
}

async fn release_fetch_supersede_and_withdraw(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let reader = token(db, "hollowmere-line-12", Role::Reader).await;
    let body = definition(ID, catalogue_request());
    assert_eq!(
        app.post_json(Some(&editor), "/v1/joints", &body)
            .await
            .status(),
        StatusCode::CREATED
    );

    // No release yet: a clear 409, never a computed guess.
    for what in ["spec", "setpoints"] {
        let (st, _, text) = fetch(&app, &format!("/v1/joints/{ID}/{what}"), None).await;
        assert_eq!(st, StatusCode::CONFLICT, "{text}");
        let p: Value = serde_json::from_str(&text).unwrap();
        assert_eq!(problem_fields(&p), ["release"], "{p}");
    }
    // Roles: anonymous and readers may not release.
    let path = format!("/v1/joints/{ID}/releases");
    let first = json!({"reason": "first release for the pilot build (demo)"});
    assert_eq!(
        post(&app, None, &path, first.clone()).await.0,
        StatusCode::UNAUTHORIZED
    );
    assert_eq!(
        post(&app, Some(&reader), &path, first.clone()).await.0,
        StatusCode::FORBIDDEN
    );
    // A bad body names its fields and writes nothing.
    let (st, p) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "", "colour": 1}),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert_eq!(problem_fields(&p), ["colour", "reason"]);
    assert!(app.get_json(&path).await["releases"]
        .as_array()
        .unwrap()
        .is_empty());

    let r = app.post_json(Some(&editor), &path, &first).await;
    assert_eq!(r.status(), StatusCode::CREATED);
    assert_eq!(
        r.headers()["location"],
        format!("/v1/joints/{ID}/releases/1")
    );
    let one: Value = r.json().await.unwrap();
    assert_eq!(
        (one["release"].as_i64(), one["status"].as_str()),
        (Some(1), Some("released"))
    );
    assert_eq!(one["requested_by"], "hollowmere-planning");
    assert_eq!(one["service_version"], env!("CARGO_PKG_VERSION"));
    assert_eq!(one["method_version"], tightspec::engine::METHOD_VERSION);
    let revision = app.revision().await;
    assert_eq!(one["catalogue_revision"], revision);

    // Fetch by joint id: the envelope and the setpoints as served then.
    let sp_path = format!("/v1/joints/{ID}/setpoints");
    let (st, etag, text) = fetch(&app, &sp_path, None).await;
    assert_eq!(st, StatusCode::OK, "{text}");
    let frozen: Value = serde_json::from_str(&text).unwrap();
    assert_eq!(frozen["release"], 1);
    assert_eq!(frozen["status"], "released");
    assert_eq!(frozen["review_due"], false);
    assert_eq!(frozen["catalogue_revision"], revision);
    assert_eq!(frozen["spec_hash"], one["spec_hash"]);
    assert_eq!(frozen["setpoints"]["spec_hash"], one["spec_hash"]);
    assert_eq!(frozen["setpoints"]["torque_unit"], "N·m");
    assert_eq!(frozen["setpoints"]["resolution"], 0.1);
    let live = app
        .get_json("/v1/setpoints?thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none&torque_unit=N.m&resolution=0.1&angle_resolution=1")
        .await;
    assert_eq!(frozen["setpoints"], live, "released as it was served");
    let (st, etag2, body) = fetch(&app, &sp_path, Some(&etag)).await;
    assert_eq!(
        (st, etag2.as_str(), body.as_str()),
        (StatusCode::NOT_MODIFIED, etag.as_str(), "")
    );
    let (st, spec_tag, spec_text) = fetch(&app, &format!("/v1/joints/{ID}/spec"), None).await;
    assert_eq!(st, StatusCode::OK);
    assert_ne!(spec_tag, etag, "each answer has its own tag");
    let spec: Value = serde_json::from_str(&spec_text).unwrap();
    assert_eq!(spec["spec"]["torque"], live_spec(&app).await["torque"]);

    // The catalogue changes: the fetch is byte for byte what it was.
    let entry = app
        .get_json("/v1/friction-entries?finish=zinc-electroplated&lubricant=none&status=active")
        .await["entries"][0]["id"]
        .as_i64()
        .unwrap();
    let (_, entry_tag) = app.entry(entry).await;
    let r = app
        .put_thread_min(&editor, entry, Some(&entry_tag), 0.10)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
    assert_ne!(
        live_spec(&app).await["torque"],
        spec["spec"]["torque"],
        "the change moves a computed spec"
    );
    let (st, etag3, again) = fetch(&app, &sp_path, None).await;
    // Same bytes; the tag now also names the review mark the change set.
    assert_eq!(st, StatusCode::OK);
    assert!(
        etag3.starts_with(etag.trim_end_matches('"')) && etag3.contains("-review"),
        "{etag3} after {etag}"
    );
    // The stored answers are unchanged; the envelope now shows the review
    // mark the catalogue change set.
    let json = |t: &str| serde_json::from_str::<Value>(t).unwrap();
    let (again, before) = (json(&again), json(&text));
    assert_eq!(again["setpoints"], before["setpoints"], "never recomputed");
    assert_eq!(again["review_due"], true);
    let (_, _, spec_again) = fetch(&app, &format!("/v1/joints/{ID}/spec"), None).await;
    assert_eq!(json(&spec_again)["spec"], json(&spec_text)["spec"]);

    // Release 2 supersedes release 1; release 1 stays fetchable by number.
    let (st, two) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "friction entry revised after test series (demo)"}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{two}");
    assert_eq!(
        (two["release"].as_i64(), two["status"].as_str()),
        (Some(2), Some("released"))
    );
    assert_eq!(two["catalogue_revision"], revision + 1);
    assert_ne!(two["spec_hash"], one["spec_hash"]);
    let now: Value = serde_json::from_str(&fetch(&app, &sp_path, None).await.2).unwrap();
    assert_eq!(now["release"], 2);
    let (st, old_tag, old) = fetch(&app, &format!("{sp_path}?release=1"), None).await;
    assert_eq!(st, StatusCode::OK);
    assert_ne!(old_tag, etag, "release 1 is superseded now");
    let old: Value = serde_json::from_str(&old).unwrap();
    assert_eq!(old["status"], "superseded");
    assert_eq!(old["setpoints"], frozen["setpoints"]);
    for (query, status) in [
        ("?release=9", 404),
        ("?release=0", 422),
        ("?revision=1", 400),
    ] {
        let (st, _, p) = fetch(&app, &format!("{sp_path}{query}"), None).await;
        assert_eq!(st.as_u16(), status, "{query}: {p}");
    }

    // Withdraw 2: no active release; a second withdrawal is a 409 naming the status.
    let w = format!("{path}/2/withdraw");
    let (st, p) = post(&app, Some(&editor), &w, json!({})).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (StatusCode::UNPROCESSABLE_ENTITY, vec!["reason".to_string()])
    );
    let (st, gone) = post(
        &app,
        Some(&editor),
        &w,
        json!({"reason": "wrong washer on drawing (demo)"}),
    )
    .await;
    assert_eq!(
        (st, gone["status"].as_str()),
        (StatusCode::OK, Some("withdrawn")),
        "{gone}"
    );
    assert_eq!(fetch(&app, &sp_path, None).await.0, StatusCode::CONFLICT);
    let (st, p) = post(&app, Some(&editor), &w, json!({"reason": "again"})).await;
    assert_eq!(st, StatusCode::CONFLICT);
    assert!(p["detail"].as_str().unwrap().contains("withdrawn"), "{p}");
    assert_eq!(problem_fields(&p), ["status"]);
    let (st, p) = post(
        &app,
        Some(&editor),
        &format!("{path}/1/approve"),
        json!({"reason": "x"}),
    )
    .await;
    assert_eq!(st, StatusCode::FORBIDDEN, "an editor is no approver: {p}");

    // The list and one release with its events.
    let list = app.get_json(&path).await;
    let seen: Vec<(i64, &str)> = list["releases"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| {
            (
                r["release"].as_i64().unwrap(),
                r["status"].as_str().unwrap(),
            )
        })
        .collect();
    assert_eq!(seen, [(2, "withdrawn"), (1, "superseded")]);
    let r1 = app.get_json(&format!("{path}/1")).await;
    let events: Vec<&str> = r1["events"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| e["event"].as_str().unwrap())
        .collect();
    assert_eq!(events, ["released", "superseded"]);
    let (st, p) = status_of(app.get("/v1/joints/HW-K4-RA-071/spec").await).await;
    assert_eq!(st, StatusCode::NOT_FOUND);
    assert!(
        p["errors"][0]["suggestions"]
            .as_array()
            .unwrap()
            .iter()
            .any(|s| s == ID),
        "{p}"
    );

    // The outbox holds one event per activation and withdrawal, no more.
    let mine: Vec<String> = outbox_types(db)
        .await
        .into_iter()
        .filter(|(_, subject)| subject == ID)
        .map(|(kind, _)| kind)
        .collect();
    assert_eq!(
        mine,
        [
            "joint.released",
            "joint.review_due",
            "joint.released",
            "joint.withdrawn"
        ]
    );
}

async fn live_spec(app: &Instance) -> Value {
    app.get_json("/v1/tightening-specs?thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none")
        .await
}

async fn four_eyes_needs_a_second_approver(db: &TestDb) {
    let app = start_with(&db.url, |c| c.four_eyes = true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let anna = token(db, "hollowmere-approver-a", Role::Approver).await;
    let ben = token(db, "hollowmere-approver-b", Role::Approver).await;
    let body = definition(ID, catalogue_request());
    assert_eq!(
        app.post_json(Some(&editor), "/v1/joints", &body)
            .await
            .status(),
        StatusCode::CREATED
    );
    let path = format!("/v1/joints/{ID}/releases");

    // An approver may request; the release waits as a draft.
    let (st, draft) = post(
        &app,
        Some(&anna),
        &path,
        json!({"reason": "pilot build (demo)"}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{draft}");
    assert_eq!(draft["status"], "draft");
    assert_eq!(
        fetch(&app, &format!("/v1/joints/{ID}/setpoints"), None)
            .await
            .0,
        StatusCode::CONFLICT
    );
    let (st, _, text) = fetch(&app, &format!("/v1/joints/{ID}/setpoints?release=1"), None).await;
    assert_eq!(st, StatusCode::OK);
    assert_eq!(
        serde_json::from_str::<Value>(&text).unwrap()["status"],
        "draft"
    );

    let approve = format!("{path}/1/approve");
    let why = json!({"reason": "values checked against drawing HW-4471 (demo)"});
    let (st, p) = post(&app, Some(&anna), &approve, why.clone()).await;
    assert_eq!(
        st,
        StatusCode::FORBIDDEN,
        "the requester may not approve: {p}"
    );
    assert!(p["detail"].as_str().unwrap().contains("four-eyes"), "{p}");
    assert_eq!(
        post(&app, Some(&editor), &approve, why.clone()).await.0,
        StatusCode::FORBIDDEN
    );
    assert_eq!(
        app.get_json(&format!("{path}/1")).await["status"],
        "draft",
        "nothing written"
    );

    let (st, done) = post(&app, Some(&ben), &approve, why.clone()).await;
    assert_eq!(st, StatusCode::OK, "{done}");
    assert_eq!(done["status"], "released");
    assert_eq!(done["approved_by"], "hollowmere-approver-b");
    assert_eq!(done["requested_by"], "hollowmere-approver-a");
    let (st, _, text) = fetch(&app, &format!("/v1/joints/{ID}/setpoints"), None).await;
    assert_eq!(st, StatusCode::OK);
    assert_eq!(serde_json::from_str::<Value>(&text).unwrap()["release"], 1);
    let (st, p) = post(&app, Some(&ben), &approve, why.clone()).await;
    assert_eq!(st, StatusCode::CONFLICT, "{p}");
    assert!(p["detail"].as_str().unwrap().contains("released"), "{p}");
    let events: Vec<String> = app.get_json(&format!("{path}/1")).await["events"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| {
            format!(
                "{} by {}",
                e["event"].as_str().unwrap(),
                e["by"].as_str().unwrap()
            )
        })
        .collect();
    assert_eq!(
        events,
        [
            "requested by hollowmere-approver-a",
            "approved by hollowmere-approver-b"
        ]
    );
    // a draft writes no event; the approval writes joint.released
    let kinds: Vec<String> = outbox_types(db)
        .await
        .into_iter()
        .filter(|(_, s)| s == ID)
        .map(|(k, _)| k)
        .collect();
    assert_eq!(kinds, ["joint.released"]);
}

/// M8 8.8 screwed 12 mm into EN AW-6082: the head presses more than the
/// aluminium takes, and 12 mm is less engagement than it needs.
fn aluminium_request() -> Value {
    json!({"thread": "M8", "property_class": "8.8", "finish": "zinc-electroplated",
           "lubricant": "none", "tightening_method": "dc-nutrunner",
           "joint_type": "tapped-hole", "clamped_material": "aluminium-6082",
           "engagement_length": {"value": 12, "unit": "mm"}})
}

async fn error_checks_are_refused_until_accepted_with_a_reason(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let id = "HW-K4-GB-003";
    let body = definition(id, aluminium_request());
    let r = app.post_json(Some(&editor), "/v1/joints", &body).await;
    assert_eq!(
        r.status(),
        StatusCode::CREATED,
        "{}",
        r.text().await.unwrap()
    );
    let path = format!("/v1/joints/{id}/releases");

    let (st, p) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "gearbox cover (demo)"}),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert_eq!(p["type"], "/problems/checks-not-accepted");
    let listed: Vec<&str> = p["checks"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|c| c["severity"] == "error")
        .map(|c| c["code"].as_str().unwrap())
        .collect();
    assert!(
        listed.contains(&"surface_pressure_exceeded")
            && listed.contains(&"thread_engagement_too_short"),
        "{p}"
    );

    // One accepted, one not: still refused. An unknown or unneeded code is a 422 too.
    let one =
        json!({"code": "surface_pressure_exceeded", "reason": "hardened washer fitted (demo)"});
    let (st, _) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "r", "accept_checks": [one]}),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY);
    let (st, p) = post(&app, Some(&editor), &path, json!({"reason": "r", "accept_checks": [{"code": "surface_presure_exceeded", "reason": "x"}]})).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (
            StatusCode::UNPROCESSABLE_ENTITY,
            vec!["accept_checks[0].code".to_string()]
        )
    );
    let two = json!({"code": "thread_engagement_too_short", "reason": "thread insert per drawing (demo)"});
    let extra = json!({"code": "clamp_load_not_reached", "reason": "x"});
    let (st, p) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "r", "accept_checks": [one, two, extra]}),
    )
    .await;
    assert_eq!(
        (st, problem_fields(&p)),
        (
            StatusCode::UNPROCESSABLE_ENTITY,
            vec!["accept_checks[2].code".to_string()]
        ),
        "{p}"
    );
    assert!(
        app.get_json(&path).await["releases"]
            .as_array()
            .unwrap()
            .is_empty(),
        "nothing written"
    );

    let (st, rel) = post(
        &app,
        Some(&editor),
        &path,
        json!({"reason": "gearbox cover (demo)", "accept_checks": [one, two]}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{rel}");
    assert_eq!(
        rel["accepted_checks"],
        json!([one, two]),
        "recorded with their reasons"
    );
    let (_, _, text) = fetch(&app, &format!("/v1/joints/{id}/setpoints"), None).await;
    let frozen: Value = serde_json::from_str(&text).unwrap();
    assert_eq!(frozen["setpoints"]["has_errors"], true);
    assert_eq!(
        frozen["setpoints"]["accepted_checks"],
        json!(["surface_pressure_exceeded", "thread_engagement_too_short"])
    );
}
