//! Friction entries limited to a joint tag, over HTTP on SQLite and
//! PostgreSQL: the impact of creating one lists only the joints carrying
//! the tag, applying it marks exactly those for review, a tagged joint's
//! release and the calculator (with `joint_tags`) use the scoped entry and
//! say why, an untagged joint keeps the generic entry, a second active
//! entry for the same scope is refused as any duplicate is, two scoped
//! entries for two tags of one joint are refused naming both, and the
//! page and the export show the scope. Friction values are demo data.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(a_tag_scoped_entry_applies_to_the_joints_carrying_the_tag);

const TAG: &str = "kestrel-k4";
const SPEC: &str = "/v1/tightening-specs";
const QUERY: &str = "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none";

async fn post(app: &Instance, token: Option<&str>, path: &str, body: Value) -> (StatusCode, Value) {
    let r = app.post_json(token, path, &body).await;
    let st = r.status();
    (st, r.json().await.unwrap_or(Value::Null))
}

fn joint(id: &str, tags: &[&str]) -> Value {
    json!({
        "id": id,
        "title": "Carrier to subframe (demo)",
        "tags": tags,
        "request": {"thread": "M10", "property_class": "8.8",
                    "finish": "zinc-electroplated", "lubricant": "none"},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.1, "angle_resolution": 1.0},
    })
}

fn scoped_entry(tag: &str) -> Value {
    json!({
        "finish": "zinc-electroplated", "lubricant": "none", "joint_tag": tag,
        "thread_friction": {"min": 0.10, "max": 0.14},
        "bearing_friction": {"min": 0.10, "max": 0.14},
        "source": "Hollowmere Works test series HW-31 on the part family (demo data)",
        "reason": "the part family's own friction",
    })
}

async fn due(app: &Instance) -> Vec<String> {
    app.get_json("/v1/joints?review=due&limit=500").await["joints"]
        .as_array()
        .expect("joints")
        .iter()
        .map(|j| j["id"].as_str().unwrap().to_string())
        .collect()
}

async fn a_tag_scoped_entry_applies_to_the_joints_carrying_the_tag(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    for (id, tags) in [
        ("TS-001", vec![TAG, "station-12"]),
        ("TS-002", vec!["station-12"]),
    ] {
        let (st, body) = post(&app, Some(&editor), "/v1/joints", joint(id, &tags)).await;
        assert_eq!(st, StatusCode::CREATED, "{body}");
        let path = format!("/v1/joints/{id}/releases");
        let (st, body) = post(&app, Some(&editor), &path, json!({"reason": "first"})).await;
        assert_eq!(st, StatusCode::CREATED, "{body}");
    }
    let generic = app.get_json(&format!("{SPEC}?{QUERY}")).await;
    let generic_id = generic["friction"]["catalogue_entry"]["id"]
        .as_i64()
        .unwrap();
    assert!(generic["friction"]["scope"].get("joint_tag").is_none());
    let before = app.get_json("/v1/joints/TS-001/spec").await;
    assert_eq!(
        before["spec"]["friction"]["catalogue_entry"]["id"],
        generic_id
    );

    // A joint's request may not carry joint_tags of its own.
    let mut bad = joint("TS-003", &[TAG]);
    bad["request"]["joint_tags"] = json!([TAG]);
    let (st, p) = post(&app, Some(&editor), "/v1/joints", bad).await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert_eq!(problem_fields(&p), ["request.joint_tags"]);

    // Impact of creating the scoped entry: only the tagged joint moves.
    let revision = app.revision().await;
    let (st, impact) = post(
        &app,
        None,
        "/v1/catalogue/impact",
        json!({"action": "create", "entry": scoped_entry(TAG)}),
    )
    .await;
    assert_eq!(st, StatusCode::OK, "{impact}");
    let moved: Vec<&str> = impact["joints"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|r| r["changed"] == true)
        .map(|r| r["id"].as_str().unwrap())
        .collect();
    assert_eq!(moved, ["TS-001"], "{impact}");
    assert_eq!(impact["summary"]["affected"], 1);
    assert_eq!(app.revision().await, revision, "the impact writes nothing");

    // Applying it marks exactly that joint for review.
    let (st, created) = post(
        &app,
        Some(&editor),
        "/v1/friction-entries",
        scoped_entry(TAG),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{created}");
    assert_eq!(created["joint_tag"], TAG);
    let scoped_id = created["id"].as_i64().unwrap();
    assert_eq!(due(&app).await, ["TS-001"]);
    let (entry, _) = app.entry(scoped_id).await;
    assert_eq!(entry["joint_tag"], TAG);
    let history = app
        .get_json(&format!("/v1/friction-entries/{scoped_id}/history"))
        .await;
    assert_eq!(
        history["history"][0]["after"]["joint_tag"], TAG,
        "{history}"
    );

    // The same scope again is refused as any duplicate active entry is.
    let (st, p) = post(
        &app,
        Some(&editor),
        "/v1/friction-entries",
        scoped_entry(TAG),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert_eq!(problem_fields(&p), ["lubricant"]);

    // The calculator with the joint's tags uses the scoped entry and says why.
    let body = json!({"thread": "M10", "property_class": "8.8", "finish": "zinc-electroplated",
                      "lubricant": "none", "joint_tags": [TAG, "station-12"]});
    let (st, tagged) = post(&app, None, SPEC, body).await;
    assert_eq!(st, StatusCode::OK, "{tagged}");
    assert_eq!(tagged["friction"]["catalogue_entry"]["id"], scoped_id);
    assert_eq!(tagged["friction"]["scope"]["joint_tag"], TAG);
    let why = tagged["friction"]["scope"]["reason"].as_str().unwrap();
    assert!(why.contains(TAG) && why.contains("generic"), "{why}");
    let by_query = app
        .get_json(&format!("{SPEC}?{QUERY}&joint_tags={TAG},station-12"))
        .await;
    assert_eq!(by_query["spec_hash"], tagged["spec_hash"]);
    // a tag that selects nothing leaves the answer and its hash alone
    let untagged = app
        .get_json(&format!("{SPEC}?{QUERY}&joint_tags=station-12"))
        .await;
    assert_eq!(untagged["friction"]["catalogue_entry"]["id"], generic_id);
    assert!(untagged["friction"]["scope"].get("joint_tag").is_none());
    let plain = app.get_json(&format!("{SPEC}?{QUERY}")).await;
    assert_eq!(untagged["spec_hash"], plain["spec_hash"]);
    assert_ne!(tagged["spec_hash"], plain["spec_hash"]);

    // Re-released, the tagged joint serves the scoped entry; the calculator
    // reproduces its setpoints; the untagged joint keeps the generic one.
    let (st, body) = post(
        &app,
        Some(&editor),
        "/v1/joints/TS-001/releases",
        json!({"reason": "part family friction"}),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{body}");
    assert!(due(&app).await.is_empty());
    let spec = app.get_json("/v1/joints/TS-001/spec").await;
    assert_eq!(spec["spec"]["friction"]["catalogue_entry"]["id"], scoped_id);
    assert_eq!(spec["spec"]["friction"]["scope"]["joint_tag"], TAG);
    assert_eq!(spec["spec"]["spec_hash"], tagged["spec_hash"]);
    let frozen = app.get_json("/v1/joints/TS-001/setpoints").await;
    let live = app
        .get_json(&format!(
            "/v1/setpoints?{QUERY}&joint_tags={TAG},station-12&torque_unit=N.m&resolution=0.1&angle_resolution=1"
        ))
        .await;
    assert_eq!(frozen["setpoints"], live);
    let other = app.get_json("/v1/joints/TS-002/spec").await;
    assert_eq!(
        other["spec"]["friction"]["catalogue_entry"]["id"],
        generic_id
    );

    // A second scoped entry for another tag: a joint carrying both tags is
    // ambiguous, refused naming both entries and tags.
    let (st, second) = post(
        &app,
        Some(&editor),
        "/v1/friction-entries",
        scoped_entry("rear-axle"),
    )
    .await;
    assert_eq!(st, StatusCode::CREATED, "{second}");
    let second_id = second["id"].as_i64().unwrap();
    let r = app
        .get(&format!("{SPEC}?{QUERY}&joint_tags={TAG},rear-axle"))
        .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["joint_tags"], "{p}");
    let reason = p["errors"][0]["reason"].as_str().unwrap_or_default();
    for needle in [
        format!("{scoped_id} (joint tag '{TAG}')"),
        format!("{second_id} (joint tag 'rear-axle')"),
    ] {
        assert!(reason.contains(&needle), "{needle}: {p}");
    }
    let (st, p) = post(
        &app,
        Some(&editor),
        "/v1/joints",
        joint("TS-004", &[TAG, "rear-axle"]),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert_eq!(problem_fields(&p), ["tags"]);

    // The engineer's page shows the scope in the list and on the entry.
    for path in [
        "/ui/catalogue".to_string(),
        format!("/ui/catalogue/entries/{scoped_id}"),
    ] {
        let r = app.get(&path).await;
        assert_eq!(r.status(), StatusCode::OK, "{path}");
        let page = r.text().await.unwrap();
        assert!(
            page.contains("joints tagged") && page.contains(TAG),
            "{path}"
        );
    }
    let page = app
        .get(&format!("/ui/catalogue/entries/{generic_id}"))
        .await
        .text()
        .await
        .unwrap();
    assert!(page.contains("every joint (generic)"));

    // The export carries the scope (JSON and CSV).
    let export = app.get_json("/v1/catalogue/export?format=json").await;
    let exported = export["entries"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["id"] == scoped_id)
        .cloned()
        .unwrap();
    assert_eq!(exported["joint_tag"], TAG);
    let csv = app
        .get("/v1/catalogue/export?format=csv")
        .await
        .text()
        .await
        .unwrap();
    let header = csv.lines().next().unwrap();
    assert!(header.ends_with(",joint_tag"), "{header}");
    assert!(
        csv.lines()
            .any(|l| l.starts_with(&format!("{scoped_id},")) && l.ends_with(&format!(",{TAG}"))),
        "{csv}"
    );
}
