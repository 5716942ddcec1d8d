//! `/v1/subscriptions` over HTTP on SQLite and PostgreSQL: an administrator
//! subscribes (the secret shown once, never on later reads), reads, lists,
//! deletes; other roles are refused; bad URLs and event types are 422
//! naming the field (`url`, `events[1]` with the nearest type), nothing
//! written. The plant and its hosts are invented for the test.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    an_administrator_subscribes_reads_lists_and_deletes,
    refused_subscriptions_name_their_fields_and_write_nothing,
);

/// A target URL on an invented host (the scheme marker is built, so this
/// file holds no web address itself).
fn hook(scheme: &str, rest: &str) -> String {
    format!("{scheme}{}{rest}", "://")
}

async fn send(
    app: &Instance,
    method: reqwest::Method,
    token: Option<&str>,
    path: &str,
) -> reqwest::Response {
    let mut rq = app.client.request(method, app.url(path));
    if let Some(t) = token {
        rq = rq.bearer_auth(t);
    }
    rq.send().await.expect("request")
}

async fn list(app: &Instance, admin: &str) -> Vec<Value> {
    let r = send(app, reqwest::Method::GET, Some(admin), "/v1/subscriptions").await;
    assert_eq!(r.status(), StatusCode::OK);
    let v: Value = r.json().await.unwrap();
    v["subscriptions"].as_array().unwrap().clone()
}

async fn an_administrator_subscribes_reads_lists_and_deletes(db: &TestDb) {
    let app = start(&db.url, true).await;
    let admin = token(db, "hollowmere-integration", Role::Admin).await;
    let body = json!({"url": hook("https", "tools.hollowmere.example/hooks/line-4"),
                      "events": ["joint.released", "joint.withdrawn"]});
    let r = app
        .post_json(Some(&admin), "/v1/subscriptions", &body)
        .await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let location = r.headers()["location"].to_str().unwrap().to_string();
    let created: Value = r.json().await.unwrap();
    let id = created["id"].as_i64().expect("id");
    assert_eq!(location, format!("/v1/subscriptions/{id}"));
    let secret = created["secret"].as_str().expect("secret shown on create");
    assert!(secret.starts_with("whsec_"), "{secret}");
    assert_eq!(created["url"], body["url"]);
    assert_eq!(created["events"], body["events"]);
    assert_eq!(created["created_by"], "hollowmere-integration");
    assert_eq!(created["active"], true);

    // later reads never show the secret
    let r = send(&app, reqwest::Method::GET, Some(&admin), &location).await;
    assert_eq!(r.status(), StatusCode::OK);
    let read: Value = r.json().await.unwrap();
    assert!(read.get("secret").is_none(), "{read}");
    assert!(!read.to_string().contains(secret));
    assert_eq!(read["events"], body["events"]);
    let all = list(&app, &admin).await;
    assert_eq!(all.len(), 1);
    assert!(!Value::Array(all).to_string().contains(secret));

    // a new subscription's log is empty
    let log_path = format!("{location}/deliveries");
    let r = send(&app, reqwest::Method::GET, Some(&admin), &log_path).await;
    assert_eq!(r.status(), StatusCode::OK);
    let log: Value = r.json().await.unwrap();
    assert_eq!(log["attempts"], json!([]));
    assert_eq!(log["subscription"], id);

    // delete: 204, then inactive but readable; a second delete is 404
    let r = send(&app, reqwest::Method::DELETE, Some(&admin), &location).await;
    assert_eq!(r.status(), StatusCode::NO_CONTENT);
    let read: Value = send(&app, reqwest::Method::GET, Some(&admin), &location)
        .await
        .json()
        .await
        .unwrap();
    assert_eq!(read["active"], false);
    assert!(read["deleted_at"].is_string());
    let r = send(&app, reqwest::Method::DELETE, Some(&admin), &location).await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    let r = send(
        &app,
        reqwest::Method::GET,
        Some(&admin),
        "/v1/subscriptions/9999",
    )
    .await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["id"]);
}

async fn refused_subscriptions_name_their_fields_and_write_nothing(db: &TestDb) {
    let app = start(&db.url, true).await;
    let admin = token(db, "hollowmere-integration", Role::Admin).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let target = hook("https", "tools.hollowmere.example/hooks");
    let good = json!({"url": target, "events": ["joint.released"]});

    // roles: anonymous 401, reader and editor 403, on every route
    let r = app.post_json(None, "/v1/subscriptions", &good).await;
    assert_eq!(r.status(), StatusCode::UNAUTHORIZED);
    let r = app
        .post_json(Some(&editor), "/v1/subscriptions", &good)
        .await;
    assert_eq!(r.status(), StatusCode::FORBIDDEN);
    for path in [
        "/v1/subscriptions",
        "/v1/subscriptions/1",
        "/v1/subscriptions/1/deliveries",
    ] {
        let r = send(&app, reqwest::Method::GET, None, path).await;
        assert_eq!(r.status(), StatusCode::UNAUTHORIZED, "anonymous GET {path}");
        let r = send(&app, reqwest::Method::GET, Some(&editor), path).await;
        assert_eq!(r.status(), StatusCode::FORBIDDEN, "editor GET {path}");
    }
    let r = send(
        &app,
        reqwest::Method::DELETE,
        Some(&editor),
        "/v1/subscriptions/1",
    )
    .await;
    assert_eq!(r.status(), StatusCode::FORBIDDEN);

    // bad URLs: each a 422 naming url
    for url in [
        "tools.hollowmere.example/hooks".to_string(),
        hook("ftp", "tools.hollowmere.example/hooks"),
        hook("https", "ops:hunter2@tools.hollowmere.example/hooks"),
        hook("https", "tools.hollowmere.example/hooks#frag"),
    ] {
        let body = json!({"url": url, "events": ["joint.released"]});
        let r = app
            .post_json(Some(&admin), "/v1/subscriptions", &body)
            .await;
        assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY, "{url}");
        let p: Value = r.json().await.unwrap();
        assert_eq!(problem_fields(&p), ["url"], "{url}");
    }
    let long = format!("{target}/{}", "h".repeat(2100));
    let r = app
        .post_json(
            Some(&admin),
            "/v1/subscriptions",
            &json!({"url": long, "events": ["joint.released"]}),
        )
        .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);

    // event types: unknown (with the nearest), twice, none; with a bad URL too
    let body = json!({"url": "mailto:ops@hollowmere.example",
                      "events": ["joint.released", "joint.relesed", "joint.released"]});
    let r = app
        .post_json(Some(&admin), "/v1/subscriptions", &body)
        .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["url", "events[1]", "events[2]"]);
    assert_eq!(p["errors"][1]["suggestions"][0], "joint.released");
    let body = json!({"url": target, "events": []});
    let r = app
        .post_json(Some(&admin), "/v1/subscriptions", &body)
        .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["events"]);
    // an unknown field or a missing one: 400 naming it
    let body = json!({"url": target, "events": ["joint.released"], "secret": "mine"});
    let r = app
        .post_json(Some(&admin), "/v1/subscriptions", &body)
        .await;
    assert_eq!(r.status(), StatusCode::BAD_REQUEST);
    // a bad page size is named
    let r = send(
        &app,
        reqwest::Method::GET,
        Some(&admin),
        "/v1/subscriptions?limit=0",
    )
    .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["limit"]);

    // nothing was written
    assert!(list(&app, &admin).await.is_empty());
}
