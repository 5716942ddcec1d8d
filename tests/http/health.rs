//! Operations endpoints: liveness, readiness, metrics, request ids.

use crate::support::TestApp;

#[tokio::test]
async fn healthz_answers_ok_with_a_request_id() {
    let app = TestApp::spawn().await;
    let r = app.get("/healthz").await;
    assert_eq!(r.status(), 200);
    let id = r.headers().get("x-request-id").expect("request id header");
    assert_eq!(id.len(), 32);
    let body: serde_json::Value = r.json().await.expect("json");
    assert_eq!(body["status"], "ok");
}

#[tokio::test]
async fn readyz_reports_catalogue_and_store() {
    let app = TestApp::spawn().await;
    let body = app.get_json("/readyz").await;
    assert_eq!(body["status"], "ready");
    let current = app.get_json("/v1/friction-entries").await["catalogue_revision"].clone();
    assert!(current.as_i64().is_some_and(|r| r >= 1), "{current}");
    assert_eq!(body["catalogue_revision"], current);
    assert_eq!(body["catalogue_may_be_stale"], false);
    let names: Vec<&str> = body["checks"]
        .as_array()
        .expect("checks")
        .iter()
        .map(|c| c["name"].as_str().unwrap_or(""))
        .collect();
    assert_eq!(names, ["catalogue", "store"]);
    assert!(body["checks"]
        .as_array()
        .expect("checks")
        .iter()
        .all(|c| c["ok"] == true));
}

#[tokio::test]
async fn readyz_on_postgres() {
    let app = TestApp::builder().postgres().await.spawn().await;
    assert!(app.db.url.starts_with("postgres"), "{}", app.db.url);
    assert!(app.base.ends_with(&app.port.to_string()));
    let body = app.get_json("/readyz").await;
    assert_eq!(body["status"], "ready");
    assert!(body["checks"][1]["detail"]
        .as_str()
        .unwrap_or("")
        .starts_with("postgres"));
}

#[tokio::test]
async fn sane_incoming_request_id_is_echoed_and_others_replaced() {
    let app = TestApp::spawn().await;
    let r = app
        .client
        .get(app.url("/healthz"))
        .header("x-request-id", "wi-station-7:0042")
        .send()
        .await
        .expect("GET");
    assert_eq!(r.headers()["x-request-id"], "wi-station-7:0042");
    let r = app
        .client
        .get(app.url("/healthz"))
        .header("x-request-id", "bad id with spaces")
        .send()
        .await
        .expect("GET");
    let echoed = r.headers()["x-request-id"].to_str().expect("ascii");
    assert_ne!(echoed, "bad id with spaces");
    assert_eq!(echoed.len(), 32);
}

#[tokio::test]
async fn metrics_count_by_route_pattern_not_raw_path() {
    let app = TestApp::spawn().await;
    assert_eq!(app.get("/v1/threads/M10").await.status(), 200);
    assert_eq!(app.get("/v1/threads/M12").await.status(), 200);
    assert_eq!(app.get("/v1/threads/M11").await.status(), 422);
    assert_eq!(app.get("/no/such/path").await.status(), 404);
    let r = app.get("/metrics").await;
    assert_eq!(r.status(), 200);
    let ct = r.headers()["content-type"]
        .to_str()
        .expect("ascii")
        .to_string();
    assert!(ct.starts_with("text/plain"), "{ct}");
    let text = r.text().await.expect("text");
    assert!(
        text.contains(
            r#"http_requests_total{method="GET",route="/v1/threads/{designation}",status="200"} 2"#
        ),
        "{text}"
    );
    assert!(text.contains(
        r#"http_requests_total{method="GET",route="/v1/threads/{designation}",status="422"} 1"#
    ));
    assert!(text.contains(r#"route="<unmatched>",status="404"} 1"#));
    assert!(!text.contains("M10"), "raw paths must not become labels");
    assert!(text.contains("http_request_duration_seconds_bucket"));
    let current = app.get_json("/v1/friction-entries").await["catalogue_revision"].clone();
    assert!(
        text.contains(&format!("tightspec_catalogue_revision {current}")),
        "{current}"
    );
}
