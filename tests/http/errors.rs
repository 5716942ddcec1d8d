//! Every error class the infrastructure produces is an RFC 9457 problem
//! naming the field and the reason; none is a 500.

use serde_json::json;

use crate::support::{error_fields, expect_problem, TestApp};

#[tokio::test]
async fn unknown_query_parameter_is_400_naming_it() {
    let app = TestApp::spawn().await;
    let p = expect_problem(app.get("/v1/property-classes?unitz=us").await, 400).await;
    assert_eq!(p["type"], "/problems/unknown-parameter");
    assert_eq!(error_fields(&p), ["unitz"]);
    assert_eq!(p["errors"][0]["suggestions"], json!(["units"]));
    assert_eq!(p["instance"], "/v1/property-classes");
}

#[tokio::test]
async fn bad_query_value_is_400() {
    let app = TestApp::spawn().await;
    let p = expect_problem(app.get("/v1/materials?units=imperial").await, 400).await;
    assert_eq!(p["type"], "/problems/malformed-request");
    assert!(
        p["detail"].as_str().unwrap_or("").contains("imperial"),
        "{p}"
    );
}

#[tokio::test]
async fn bad_number_in_query_is_400_naming_its_parameter() {
    let app = TestApp::spawn().await;
    let spec = "/v1/tightening-specs?thread=M10&property_class=8.8&bearing_friction=0.12";
    let p = expect_problem(app.get(&format!("{spec}&thread_friction=abc")).await, 400).await;
    assert_eq!(error_fields(&p), ["thread_friction"]);
    let p = expect_problem(
        app.get(&format!(
            "{spec}&thread_friction=0.12&catalogue_revision=first"
        ))
        .await,
        400,
    )
    .await;
    assert_eq!(error_fields(&p), ["catalogue_revision"]);
    let p = expect_problem(app.get("/v1/catalogue/diff?from=1&to=x").await, 400).await;
    assert_eq!(error_fields(&p), ["to"]);
}

#[tokio::test]
async fn unknown_path_is_404_problem() {
    let app = TestApp::spawn().await;
    let p = expect_problem(app.get("/v1/threadz").await, 404).await;
    assert_eq!(p["instance"], "/v1/threadz");
}

#[tokio::test]
async fn unknown_thread_and_grade_are_404_with_suggestions() {
    let app = TestApp::spawn().await;
    let p = expect_problem(app.get("/v1/property-classes/8.9").await, 404).await;
    assert_eq!(error_fields(&p), ["property_class"]);
    let s = p["errors"][0]["suggestions"]
        .as_array()
        .expect("suggestions");
    assert!(s.iter().any(|x| x == "8.8"), "{p}");
}

#[tokio::test]
async fn untabulated_metric_size_is_422_with_neighbours() {
    let app = TestApp::spawn().await;
    let p = expect_problem(app.get("/v1/threads/M11").await, 422).await;
    assert_eq!(error_fields(&p), ["thread"]);
    assert_eq!(p["errors"][0]["suggestions"], json!(["M10", "M12"]));
}

#[tokio::test]
async fn malformed_designation_is_400() {
    let app = TestApp::spawn().await;
    let p = expect_problem(app.get("/v1/threads/hello").await, 400).await;
    assert_eq!(error_fields(&p), ["thread"]);
}

#[tokio::test]
async fn bad_json_body_is_400_naming_the_body() {
    let app = TestApp::spawn().await;
    let r = app
        .client
        .post(app.url("/v1/tightening-specs"))
        .header("content-type", "application/json")
        .body("{\"thread\": \"M10\",")
        .send()
        .await
        .expect("POST");
    let p = expect_problem(r, 400).await;
    assert_eq!(error_fields(&p), ["body"]);
}

#[tokio::test]
async fn json_with_unknown_field_is_400_naming_it() {
    let app = TestApp::spawn().await;
    let r = app
        .post_json(
            "/v1/tightening-specs",
            &json!({"thread": "M10", "property_class": "8.8", "grade": "8.8"}),
        )
        .await;
    let p = expect_problem(r, 400).await;
    assert!(error_fields(&p).contains(&"grade".to_string()), "{p}");
}

#[tokio::test]
async fn wrong_media_type_is_415() {
    let app = TestApp::spawn().await;
    let r = app
        .client
        .post(app.url("/v1/tightening-specs"))
        .header("content-type", "text/plain")
        .body("thread=M10")
        .send()
        .await
        .expect("POST");
    let p = expect_problem(r, 415).await;
    assert!(p["detail"]
        .as_str()
        .unwrap_or("")
        .contains("application/json"));
}

#[tokio::test]
async fn body_over_the_limit_is_413_stating_it() {
    let app = TestApp::builder().max_body_bytes(1024).spawn().await;
    let big = json!({"thread": "M10", "property_class": "8.8", "finish": "x".repeat(4096)});
    let p = expect_problem(app.post_json("/v1/tightening-specs", &big).await, 413).await;
    assert!(p["detail"].as_str().unwrap_or("").contains("1024"), "{p}");
}

#[tokio::test]
async fn method_not_allowed_is_not_a_500() {
    let app = TestApp::spawn().await;
    let r = app
        .client
        .delete(app.url("/v1/threads"))
        .send()
        .await
        .expect("DELETE");
    assert!(r.status().is_client_error(), "{}", r.status());
}

#[tokio::test]
async fn reads_without_token_are_401_when_anonymous_reads_are_off() {
    let db = crate::support::db::TestDb::sqlite();
    let app = TestApp::builder()
        .database(db)
        .anonymous_reads(false)
        .spawn()
        .await;
    let r = app.get("/v1/friction-entries").await;
    assert_eq!(r.headers()["www-authenticate"], "Bearer");
    expect_problem(r, 401).await;
    // Reference tables need a reader token too (README "Access").
    expect_problem(app.get("/v1/threads/M10").await, 401).await;
}

#[tokio::test]
async fn accept_admitting_nothing_we_produce_is_406() {
    let app = TestApp::spawn().await;
    let r = app
        .client
        .get(app.url("/v1/threads/M10"))
        .header("accept", "application/xml")
        .send()
        .await
        .expect("GET");
    let p = expect_problem(r, 406).await;
    assert!(
        p["detail"]
            .as_str()
            .unwrap_or("")
            .contains("application/json"),
        "{p}"
    );
    let r = app
        .client
        .get(app.url("/v1/threads/M10"))
        .header("accept", "text/html,application/xml;q=0.9,*/*;q=0.8")
        .send()
        .await
        .expect("GET");
    assert_eq!(r.status(), 200);
}
