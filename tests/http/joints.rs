//! `/v1/joints` over HTTP on SQLite and PostgreSQL: define, read with its
//! ETag, list by tag in pages, change with If-Match, and every refusal
//! (stale 412, missing If-Match 428, duplicate id 409, unknown joint 404,
//! a bad body 422 naming each field, a reader's token 403) writing nothing,
//! and a review mark shown in the `review=due` filter and in the joint.
//! The plant and its joints are invented for the test.

use chrono::Utc;
use reqwest::{Response, StatusCode};
use serde_json::{json, Value};
use tightspec::registry::{event, JointId, OutboxEvent};
use tightspec::store::joints::ReviewMark;
use tightspec::store::outbox::new_event_id;
use tightspec::store::{Role, Store};

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    engineer_defines_reads_lists_and_changes_a_joint,
    refused_joint_writes_name_their_fields_and_write_nothing,
);

fn definition(id: &str, tags: &[&str], thread: &str) -> Value {
    json!({
        "id": id,
        "title": "Rear axle carrier to subframe, left",
        "tags": tags,
        "request": {"thread": thread, "property_class": "8.8",
                    "thread_friction": 0.12, "bearing_friction": 0.12},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.5, "angle_resolution": 1.0},
    })
}

async fn put(app: &Instance, token: &str, id: &str, etag: Option<&str>, body: &Value) -> Response {
    let mut rq = app
        .client
        .put(app.url(&format!("/v1/joints/{id}")))
        .bearer_auth(token)
        .json(body);
    if let Some(tag) = etag {
        rq = rq.header("If-Match", tag);
    }
    rq.send().await.expect("PUT")
}

fn etag_of(r: &Response) -> String {
    r.headers()["etag"].to_str().expect("ETag").to_string()
}

async fn problem(r: Response, status: StatusCode) -> Value {
    assert_eq!(r.status(), status);
    let ct = r.headers()["content-type"].to_str().unwrap().to_string();
    assert_eq!(ct, "application/problem+json");
    r.json().await.expect("problem JSON")
}

async fn engineer_defines_reads_lists_and_changes_a_joint(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;

    let body = definition("K4-RA-017", &["rear-axle", "station-40"], "M10");
    let r = app.post_json(Some(&editor), "/v1/joints", &body).await;
    assert_eq!(r.status(), StatusCode::CREATED);
    assert_eq!(r.headers()["location"], "/v1/joints/K4-RA-017");
    let etag = etag_of(&r);
    assert_eq!(etag, "\"joint-K4-RA-017-r1\"");
    let created: Value = r.json().await.unwrap();
    assert_eq!(created["version"], 1);
    assert_eq!(created["review_due"], Value::Null);
    assert_eq!(created["request"], body["request"]);
    assert_eq!(created["setpoints"], body["setpoints"]);

    // read back, same ETag; the id keeps its case
    let r = app.get("/v1/joints/K4-RA-017").await;
    assert_eq!(r.status(), StatusCode::OK);
    assert_eq!(etag_of(&r), etag);
    assert_eq!(r.json::<Value>().await.unwrap(), created);

    // two more joints, one without the tag; list by tag in pages of one
    for (id, tags) in [
        ("K4-RA-018", vec!["rear-axle"]),
        ("K4-FA-001", vec!["front-axle"]),
    ] {
        let r = app
            .post_json(Some(&editor), "/v1/joints", &definition(id, &tags, "M12"))
            .await;
        assert_eq!(r.status(), StatusCode::CREATED, "{id}");
    }
    let page = app.get_json("/v1/joints?tag=rear-axle&limit=1").await;
    let ids = |p: &Value| -> Vec<String> {
        p["joints"]
            .as_array()
            .unwrap()
            .iter()
            .map(|j| j["id"].as_str().unwrap().to_string())
            .collect()
    };
    assert_eq!(ids(&page), ["K4-RA-017"]);
    assert_eq!(page["next"], "K4-RA-017");
    let page = app
        .get_json("/v1/joints?tag=rear-axle&limit=1&after=K4-RA-017")
        .await;
    assert_eq!(ids(&page), ["K4-RA-018"]);
    assert_eq!(page["next"], Value::Null);
    let all = app.get_json("/v1/joints").await;
    assert_eq!(ids(&all), ["K4-FA-001", "K4-RA-017", "K4-RA-018"]);
    let due = app.get_json("/v1/joints?review=due").await;
    assert_eq!(ids(&due), Vec::<String>::new());
    // no release yet: no joint has a released one
    let released = app.get_json("/v1/joints?status=released").await;
    assert_eq!(ids(&released), Vec::<String>::new());
    // a review mark (set in the store, as a catalogue revision will) shows
    // in the filter and in the joint
    let store = Store::open(Some(&db.url)).await.expect("store");
    let mark = ReviewMark {
        joint: JointId::parse("id", "K4-RA-018").unwrap(),
        event: OutboxEvent::cloud_event(
            new_event_id(),
            event::JOINT_REVIEW_DUE,
            "K4-RA-018",
            Utc::now(),
            json!({"revision": 7}),
        ),
    };
    store.mark_review_due(7, Utc::now(), &[mark]).await.unwrap();
    store.close().await;
    let due = app.get_json("/v1/joints?review=due").await;
    assert_eq!(ids(&due), ["K4-RA-018"]);
    assert_eq!(due["joints"][0]["review_due"]["revision"], 7);
    let marked = app.get_json("/v1/joints/K4-RA-018").await;
    assert_eq!(marked["review_due"]["revision"], 7);

    // change with If-Match: version 2, new ETag, the tag filter follows
    let mut changed = body.clone();
    changed["tags"] = json!(["rear-axle", "station-50"]);
    changed["request"]["thread"] = json!("M12");
    let r = put(&app, &editor, "K4-RA-017", Some(&etag), &changed).await;
    assert_eq!(r.status(), StatusCode::OK);
    let new_etag = etag_of(&r);
    assert_eq!(new_etag, "\"joint-K4-RA-017-r2\"");
    let after: Value = r.json().await.unwrap();
    assert_eq!(
        (after["version"].as_i64(), &after["tags"]),
        (Some(2), &changed["tags"])
    );
    let station = app.get_json("/v1/joints?tag=station-40").await;
    assert_eq!(ids(&station), Vec::<String>::new());
    let station = app.get_json("/v1/joints?tag=station-50").await;
    assert_eq!(ids(&station), ["K4-RA-017"]);

    // the old ETag is stale: 412 with the joint as it is now, nothing written
    let mut other = changed.clone();
    other["title"] = json!("written from a stale copy");
    let p = problem(
        put(&app, &editor, "K4-RA-017", Some(&etag), &other).await,
        StatusCode::PRECONDITION_FAILED,
    )
    .await;
    assert_eq!(p["current"]["version"], 2);
    assert_eq!(p["current"]["request"]["thread"], "M12");
    // no If-Match: 428
    let p = problem(
        put(&app, &editor, "K4-RA-017", None, &other).await,
        StatusCode::PRECONDITION_REQUIRED,
    )
    .await;
    assert_eq!(problem_fields(&p), ["If-Match"]);
    let now = app.get_json("/v1/joints/K4-RA-017").await;
    assert_eq!(now, after);
}

async fn refused_joint_writes_name_their_fields_and_write_nothing(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let reader = token(db, "hollowmere-line-7", Role::Reader).await;
    let body = definition("K4-RA-017", &["rear-axle"], "M10");
    let r = app.post_json(Some(&editor), "/v1/joints", &body).await;
    assert_eq!(r.status(), StatusCode::CREATED);

    // the same id again: 409 naming id
    let p = problem(
        app.post_json(Some(&editor), "/v1/joints", &body).await,
        StatusCode::CONFLICT,
    )
    .await;
    assert_eq!(problem_fields(&p), ["id"]);

    // a fixed path word under /v1/joints/ as the id: 422 naming id
    let p = problem(
        app.post_json(
            Some(&editor),
            "/v1/joints",
            &definition("export", &[], "M10"),
        )
        .await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert_eq!(problem_fields(&p), ["id"]);

    // an unknown joint: 404 naming id, on read and on change
    let p = problem(app.get("/v1/joints/K4-RA-999").await, StatusCode::NOT_FOUND).await;
    assert_eq!(problem_fields(&p), ["id"]);
    let p = problem(app.get("/v1/joints/K4-RA-071").await, StatusCode::NOT_FOUND).await;
    assert_eq!(p["errors"][0]["suggestions"], json!(["K4-RA-017"]));
    let missing = definition("K4-RA-999", &[], "M10");
    let p = problem(
        put(
            &app,
            &editor,
            "K4-RA-999",
            Some("\"joint-K4-RA-999-r1\""),
            &missing,
        )
        .await,
        StatusCode::NOT_FOUND,
    )
    .await;
    assert_eq!(problem_fields(&p), ["id"]);

    // a bad body: every field named, the registry's and the spec request's
    let mut bad = definition("K4-RA-020", &["rear-axle", ""], "M10");
    bad["request"]["thread"] = json!("M10x9");
    bad["setpoints"]["torque_unit"] = json!("furlong");
    let p = problem(
        app.post_json(Some(&editor), "/v1/joints", &bad).await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    let mut fields = problem_fields(&p);
    fields.sort();
    assert_eq!(
        fields,
        ["request.thread", "setpoints.torque_unit", "tags[1]"]
    );
    // a request field the spec request does not have
    let mut typo = definition("K4-RA-021", &[], "M10");
    typo["request"]["thred"] = json!("M10");
    let p = problem(
        app.post_json(Some(&editor), "/v1/joints", &typo).await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert_eq!(problem_fields(&p), ["request.thred"]);
    // a change whose body names another id
    let r = app.get("/v1/joints/K4-RA-017").await;
    let etag = etag_of(&r);
    let p = problem(
        put(
            &app,
            &editor,
            "K4-RA-017",
            Some(&etag),
            &definition("K4-RA-018", &[], "M10"),
        )
        .await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert_eq!(problem_fields(&p), ["id"]);
    // not an object at all
    let p = problem(
        app.post_json(Some(&editor), "/v1/joints", &json!(["K4-RA-022"]))
            .await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert_eq!(problem_fields(&p), ["body"]);
    // a bad page
    let p = problem(
        app.get("/v1/joints?limit=0").await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert_eq!(problem_fields(&p), ["limit"]);
    let p = problem(
        app.get("/v1/joints?status=relased").await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert_eq!(problem_fields(&p), ["status"]);
    assert_eq!(p["errors"][0]["suggestions"][0], "released");

    // a reader's token may read but not define
    let r = app
        .post_json(
            Some(&reader),
            "/v1/joints",
            &definition("K4-RA-030", &[], "M10"),
        )
        .await;
    problem(r, StatusCode::FORBIDDEN).await;

    // nothing of the refused writes is there
    let all = app.get_json("/v1/joints?limit=500").await;
    let listed: Vec<&str> = all["joints"]
        .as_array()
        .unwrap()
        .iter()
        .map(|j| j["id"].as_str().unwrap())
        .collect();
    assert_eq!(listed, ["K4-RA-017"]);
    assert_eq!(all["joints"][0]["version"], 1);
}
