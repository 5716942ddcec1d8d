//! The OpenAPI document: served at /openapi.json, printed by
//! `tightspec openapi`, committed at openapi/openapi.json — all the same.

use crate::support::TestApp;

const REGENERATE: &str = "openapi/openapi.json is out of date with the code. Regenerate it from the \
repository root with:\n\n    cargo run -q -- openapi > openapi/openapi.json\n\nand commit the result.";

fn committed() -> String {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/../openapi/openapi.json");
    std::fs::read_to_string(path)
        .unwrap_or_else(|e| panic!("cannot read {path}: {e}\n{REGENERATE}"))
}

#[test]
fn committed_document_matches_the_code() {
    let generated = tightspec::http::openapi::document_json().expect("document renders");
    if generated != committed() {
        panic!("{REGENERATE}");
    }
}

#[tokio::test]
async fn served_document_is_openapi_3_1_with_every_route() {
    let app = TestApp::spawn().await;
    let r = app.get("/openapi.json").await;
    assert_eq!(r.status(), 200);
    let text = r.text().await.expect("text");
    assert_eq!(
        text,
        tightspec::http::openapi::document_json().expect("document")
    );
    let doc: serde_json::Value = serde_json::from_str(&text).expect("json");
    assert!(
        doc["openapi"].as_str().unwrap_or("").starts_with("3.1"),
        "{}",
        doc["openapi"]
    );
    for path in [
        "/healthz",
        "/readyz",
        "/metrics",
        "/v1/threads",
        "/v1/threads/{designation}",
        "/v1/property-classes",
        "/v1/property-classes/{id}",
        "/v1/tightening-methods",
        "/v1/materials",
        "/v1/bearing-types",
        "/v1/finishes",
        "/v1/lubricants",
        "/v1/tightening-specs",
        "/v1/setpoints",
    ] {
        assert!(doc["paths"].get(path).is_some(), "missing path {path}");
    }
    assert!(doc["components"]["schemas"].get("Problem").is_some());
}
