//! The HTTP contract the OpenAPI document states: 405 with `Allow` for
//! another method on a known path, 406 when `Accept` admits none of a
//! route's types, integral floats read as integers, a retirement body with
//! an unknown field refused before anything is retired, and what stays
//! open when anonymous reads are off.

use reqwest::{Method, StatusCode};
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{start, token};
use crate::support::db::TestDb;
use crate::support::{error_fields, expect_problem, TestApp};

#[tokio::test]
async fn other_methods_on_known_paths_answer_405_with_allow() {
    let app = TestApp::spawn().await;
    let cases = [
        (Method::TRACE, "/v1/tightening-specs", "GET, POST"),
        (Method::OPTIONS, "/healthz", "GET"),
        (Method::PATCH, "/v1/friction-entries/1", "GET, PUT, DELETE"),
        (Method::GET, "/v1/tightening-specs/batch", "POST"),
        (Method::GET, "/v1/friction-tests/evaluate", "POST"),
        (Method::DELETE, "/openapi.json", "GET"),
    ];
    for (method, path, allow) in cases {
        let r = app
            .client
            .request(method.clone(), app.url(path))
            .send()
            .await
            .expect("request");
        let header = r
            .headers()
            .get("allow")
            .and_then(|v| v.to_str().ok())
            .unwrap_or("")
            .to_string();
        let p = expect_problem(r, 405).await;
        assert_eq!(header, allow, "{method} {path}");
        assert_eq!(p["type"], "/problems/method-not-allowed");
        assert_eq!(error_fields(&p), ["method"], "{method} {path}");
    }
    // An unknown path is still 404.
    let r = app
        .client
        .request(Method::TRACE, app.url("/v1/no-such-thing"))
        .send()
        .await
        .expect("request");
    expect_problem(r, 404).await;
}

#[tokio::test]
async fn accept_admitting_no_representation_answers_406() {
    let app = TestApp::spawn().await;
    let spec =
        "/v1/tightening-specs?thread=M10&property_class=8.8&finish=plain&lubricant=light-oil";
    for (path, accept, status) in [
        (spec, "text/csv", 406),
        (spec, "text/html", 406),
        (spec, "application/json", 200),
        (spec, "*/*", 200),
        ("/v1/catalogue/export?format=csv", "text/csv", 200),
        ("/metrics", "application/json", 406),
        ("/metrics", "text/plain", 200),
    ] {
        let r = app
            .client
            .get(app.url(path))
            .header("accept", accept)
            .send()
            .await
            .expect("GET");
        if status == 406 {
            let p = expect_problem(r, 406).await;
            assert!(
                p["detail"].as_str().unwrap_or("").contains(accept),
                "{path}: {p}"
            );
        } else {
            assert_eq!(r.status().as_u16(), status, "{path} Accept: {accept}");
        }
    }
}

#[tokio::test]
async fn integral_float_reads_as_an_integer() {
    let app = TestApp::spawn().await;
    let current = app.get_json("/v1/catalogue/revisions").await["catalogue_revision"]
        .as_i64()
        .expect("revision");
    let body = |rev: Value| {
        json!({"thread": "M10", "property_class": "8.8", "finish": "plain",
               "lubricant": "light-oil", "catalogue_revision": rev})
    };
    let r = app
        .post_json("/v1/tightening-specs", &body(json!(current as f64)))
        .await;
    let status = r.status();
    let spec: Value = r.json().await.expect("JSON");
    assert_eq!(status, StatusCode::OK, "{spec}");
    assert_eq!(spec["catalogue_revision"], current);
    let p = expect_problem(
        app.post_json("/v1/tightening-specs", &body(json!(current as f64 + 0.5)))
            .await,
        400,
    )
    .await;
    assert!(
        p["detail"].as_str().unwrap_or("").contains("integer"),
        "{p}"
    );
    // The same in a query string.
    let r = app
        .get(&format!(
            "/v1/tightening-specs?thread=M10&property_class=8.8&finish=plain&lubricant=light-oil&catalogue_revision={current}.0"
        ))
        .await;
    assert_eq!(r.status(), StatusCode::OK);
}

#[tokio::test]
async fn retire_with_unknown_body_field_is_refused_before_retiring() {
    let db = TestDb::sqlite();
    let app = start(&db.url, true).await;
    let editor = token(&db, "contract-editor", Role::Editor).await;
    let id = app.get_json("/v1/friction-entries").await["entries"][0]["id"]
        .as_i64()
        .expect("an entry");
    let (_, etag) = app.entry(id).await;
    let r = app
        .client
        .delete(app.url(&format!("/v1/friction-entries/{id}?reason=worn")))
        .bearer_auth(&editor)
        .header("If-Match", &etag)
        .json(&json!({"reason": "worn tool", "sure": true}))
        .send()
        .await
        .expect("DELETE");
    let p = expect_problem(r, 400).await;
    assert_eq!(error_fields(&p), ["sure"]);
    let (after, same) = app.entry(id).await;
    assert_eq!(same, etag, "nothing retired");
    assert_eq!(after["status"], "active");
    // A body of the right shape retires.
    let r = app
        .client
        .delete(app.url(&format!("/v1/friction-entries/{id}")))
        .bearer_auth(&editor)
        .header("If-Match", &etag)
        .json(&json!({"reason": "worn tool"}))
        .send()
        .await
        .expect("DELETE");
    assert_eq!(r.status(), StatusCode::OK);
}

async fn anonymous_reads_off_leaves_only_probes_open(db: &TestDb) {
    let app = start(&db.url, false).await;
    let reader = token(db, "contract-reader", Role::Reader).await;
    for path in [
        "/metrics",
        "/v1/threads",
        "/v1/threads/M10",
        "/v1/property-classes",
        "/v1/property-classes/8.8",
        "/v1/tightening-methods",
        "/v1/materials",
        "/v1/bearing-types",
    ] {
        let r = app.get(path).await;
        assert_eq!(r.status(), StatusCode::UNAUTHORIZED, "{path} anonymous");
        let r = app
            .client
            .get(app.url(path))
            .bearer_auth(&reader)
            .send()
            .await
            .expect("GET");
        assert_eq!(r.status(), StatusCode::OK, "{path} with a reader token");
    }
    // Open: liveness, the API description, and readiness without details.
    assert_eq!(app.get("/healthz").await.status(), StatusCode::OK);
    assert_eq!(app.get("/openapi.json").await.status(), StatusCode::OK);
    let ready = app.get_json("/readyz").await;
    assert_eq!(ready["status"], "ready");
    assert!(ready.get("catalogue_revision").is_none(), "{ready}");
    assert!(!ready.to_string().contains("friction entries"), "{ready}");
    let r = app
        .client
        .get(app.url("/readyz"))
        .bearer_auth(&reader)
        .send()
        .await
        .expect("GET");
    let full: Value = r.json().await.expect("JSON");
    assert!(full["catalogue_revision"].as_i64().is_some(), "{full}");
}

#[tokio::test]
async fn anonymous_reads_off_sqlite() {
    anonymous_reads_off_leaves_only_probes_open(&TestDb::sqlite()).await;
}

#[tokio::test]
async fn anonymous_reads_off_postgres() {
    anonymous_reads_off_leaves_only_probes_open(&TestDb::postgres().await).await;
}
