//! Repeated GET look-ups are answered from the answer cache: the same
//! bytes and ETag as the first answer, counted in `/metrics`; refused
//! requests are never kept; a cache of size 0 keeps nothing.

use crate::support::{expect_problem, TestApp};

/// Kestrel K4 seat bracket (demo data): M8 8.8, zinc flake, no lubricant.
const SPEC: &str =
    "/v1/tightening-specs?thread=M8&property_class=8.8&finish=zinc-flake&lubricant=none";
const SETPOINTS: &str = "/v1/setpoints?thread=M8&property_class=8.8&finish=zinc-flake\
    &lubricant=none&tightening_method=dc-nutrunner&torque_unit=N%C2%B7m&resolution=0.5";

/// `(hits, misses)` of one route from `/metrics`.
async fn lookups(app: &TestApp, route: &str) -> (u64, u64) {
    let text = app.get("/metrics").await.text().await.unwrap_or_default();
    let count = |result: &str| {
        let series = format!(
            "tightspec_answer_cache_lookups_total{{result=\"{result}\",route=\"{route}\"}} "
        );
        text.lines()
            .find_map(|l| l.strip_prefix(series.as_str()))
            .and_then(|v| v.trim().parse().ok())
            .unwrap_or(0)
    };
    (count("hit"), count("miss"))
}

/// Status, ETag and body bytes of a GET.
async fn answer(app: &TestApp, path: &str) -> (u16, String, Vec<u8>) {
    let r = app.get(path).await;
    let status = r.status().as_u16();
    let etag = r
        .headers()
        .get("etag")
        .and_then(|v| v.to_str().ok())
        .unwrap_or_default()
        .to_string();
    (status, etag, r.bytes().await.unwrap_or_default().to_vec())
}

#[tokio::test]
async fn repeated_look_ups_get_the_same_answer_from_the_cache() {
    let app = TestApp::spawn().await;
    for (path, route) in [(SPEC, "/v1/tightening-specs"), (SETPOINTS, "/v1/setpoints")] {
        let first = answer(&app, path).await;
        assert_eq!(first.0, 200, "{}", String::from_utf8_lossy(&first.2));
        assert!(first.1.starts_with('"'), "ETag {}", first.1);
        assert_eq!(
            lookups(&app, route).await,
            (0, 1),
            "{route}: first is computed"
        );
        let second = answer(&app, path).await;
        assert_eq!(second, first, "{route}: same status, ETag and bytes");
        assert_eq!(
            lookups(&app, route).await,
            (1, 1),
            "{route}: second is kept"
        );

        // A kept answer still honours If-None-Match.
        let r = app
            .client
            .get(app.url(path))
            .header("if-none-match", &first.1)
            .send()
            .await
            .expect("sent");
        assert_eq!(r.status(), 304);
        assert_eq!(lookups(&app, route).await, (2, 1));
    }
    // Another query string is another answer.
    let other = answer(&app, &format!("{SPEC}&units=us")).await;
    assert_eq!(other.0, 200);
    assert_eq!(lookups(&app, "/v1/tightening-specs").await, (2, 2));
}

#[tokio::test]
async fn refused_look_ups_are_never_kept() {
    let app = TestApp::spawn().await;
    let bad = "/v1/tightening-specs?thread=M8&property_class=8.8&finish=zinc-flake&lubricant=nne";
    for _ in 0..2 {
        let p = expect_problem(app.get(bad).await, 404).await;
        assert_eq!(p["errors"][0]["field"], "lubricant", "{p}");
    }
    assert_eq!(lookups(&app, "/v1/tightening-specs").await, (0, 2));
}

#[tokio::test]
async fn a_cache_of_size_zero_keeps_nothing() {
    let app = TestApp::builder().answer_cache_entries(0).spawn().await;
    let first = answer(&app, SPEC).await;
    let second = answer(&app, SPEC).await;
    assert_eq!((first.0, &first.1), (200, &second.1));
    assert_eq!(first.2, second.2, "computed twice, same answer");
    assert_eq!(lookups(&app, "/v1/tightening-specs").await, (0, 2));
}
