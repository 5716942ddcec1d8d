//! Request hardening, black-box: a stalled or trickling body is answered
//! 408 and its connection closed within the body-read deadline, a request
//! past its deadline gets 503, and a flood of idle connections beyond the
//! connection cap leaves `/healthz` answering. Deadlines are shortened to
//! a second through the builder; every wait is bounded.

use std::time::{Duration, Instant};

use tokio::io::{AsyncReadExt, AsyncWriteExt};
use tokio::net::TcpStream;

use crate::support::TestApp;

/// Generous upper bound for anything that should happen within a deadline
/// of one second (it only keeps a regression from hanging the suite).
const BOUND: Duration = Duration::from_secs(6);

/// The head of a JSON POST announcing `len` body bytes.
fn post_head(path: &str, len: usize) -> String {
    format!(
        "POST {path} HTTP/1.1\r\nHost: localhost\r\nContent-Type: application/json\r\n\
         Content-Length: {len}\r\n\r\n"
    )
}

/// Reads until the server closes the connection (or `BOUND` passes).
async fn read_until_closed(stream: &mut TcpStream) -> (String, bool) {
    let mut got = Vec::new();
    let mut buf = [0u8; 4096];
    let deadline = tokio::time::Instant::now() + BOUND;
    loop {
        match tokio::time::timeout_at(deadline, stream.read(&mut buf)).await {
            Ok(Ok(0)) | Ok(Err(_)) => return (String::from_utf8_lossy(&got).into(), true),
            Ok(Ok(n)) => got.extend_from_slice(&buf[..n]),
            Err(_) => return (String::from_utf8_lossy(&got).into(), false),
        }
    }
}

async fn short_deadlines(body_secs: u64, request_secs: u64) -> TestApp {
    TestApp::builder()
        .limits(|l| {
            l.body_read_timeout_secs = body_secs;
            l.request_timeout_secs = request_secs;
        })
        .spawn()
        .await
}

#[tokio::test]
async fn a_stalled_body_gets_408_and_the_connection_is_closed() {
    let app = short_deadlines(1, 30).await;
    let mut s = TcpStream::connect(("127.0.0.1", app.port)).await.unwrap();
    let started = Instant::now();
    s.write_all(post_head("/v1/tightening-specs", 100_000).as_bytes())
        .await
        .unwrap();
    s.write_all(br#"{"thread":"M10","#).await.unwrap();
    let (answer, closed) = read_until_closed(&mut s).await;
    assert!(closed, "the connection stayed open: {answer}");
    assert!(started.elapsed() < BOUND, "{:?}", started.elapsed());
    assert!(answer.starts_with("HTTP/1.1 408"), "{answer}");
    assert!(answer.contains("application/problem+json"), "{answer}");
    assert!(answer.contains("/problems/request-timeout"), "{answer}");
    assert!(answer.contains(r#""field":"body""#), "{answer}");
    // The service is unaffected.
    assert_eq!(app.get("/healthz").await.status(), 200);
}

#[tokio::test]
async fn a_trickling_body_is_cut_off_at_the_deadline() {
    let app = short_deadlines(1, 30).await;
    let s = TcpStream::connect(("127.0.0.1", app.port)).await.unwrap();
    let (mut rd, mut wr) = s.into_split();
    let started = Instant::now();
    wr.write_all(post_head("/v1/tightening-specs", 100_000).as_bytes())
        .await
        .unwrap();
    // One byte every 50 ms: always some progress, never the whole body.
    let trickle = tokio::spawn(async move {
        let mut tick = tokio::time::interval(Duration::from_millis(50));
        for _ in 0..200 {
            tick.tick().await;
            if wr.write_all(b" ").await.is_err() {
                break;
            }
        }
    });
    let mut got = Vec::new();
    let mut buf = [0u8; 4096];
    let deadline = tokio::time::Instant::now() + BOUND;
    let closed = loop {
        match tokio::time::timeout_at(deadline, rd.read(&mut buf)).await {
            Ok(Ok(0)) | Ok(Err(_)) => break true,
            Ok(Ok(n)) => got.extend_from_slice(&buf[..n]),
            Err(_) => break false,
        }
    };
    trickle.abort();
    let answer = String::from_utf8_lossy(&got);
    assert!(closed, "the connection stayed open: {answer}");
    assert!(started.elapsed() < BOUND, "{:?}", started.elapsed());
    assert!(answer.starts_with("HTTP/1.1 408"), "{answer}");
}

#[tokio::test]
async fn a_request_past_its_deadline_gets_503() {
    // The body deadline is longer, so the request deadline acts first.
    let app = short_deadlines(30, 1).await;
    let mut s = TcpStream::connect(("127.0.0.1", app.port)).await.unwrap();
    let started = Instant::now();
    s.write_all(post_head("/v1/tightening-specs", 1000).as_bytes())
        .await
        .unwrap();
    let (answer, _) = read_until_closed(&mut s).await;
    assert!(started.elapsed() < BOUND, "{:?}", started.elapsed());
    assert!(answer.starts_with("HTTP/1.1 503"), "{answer}");
    assert!(answer.contains("application/problem+json"), "{answer}");
    assert!(answer.contains("request deadline"), "{answer}");
}

#[tokio::test]
async fn a_whole_body_in_time_is_not_affected() {
    let app = short_deadlines(1, 1).await;
    let body = serde_json::json!({
        "thread": "M10", "property_class": "8.8", "finish": "plain",
        "lubricant": "light-oil", "tightening_method": "dc-nutrunner"
    });
    let r = app.post_json("/v1/tightening-specs", &body).await;
    assert_eq!(r.status(), 200, "{}", r.text().await.unwrap_or_default());
}

#[tokio::test]
async fn a_flood_of_idle_connections_leaves_healthz_answering() {
    // Two workers with two connections each; idle connections are closed
    // after the one-second header deadline, so the queue keeps moving.
    let app = TestApp::builder()
        .limits(|l| {
            l.max_connections = 4;
            l.header_read_timeout_secs = 1;
        })
        .spawn()
        .await;
    let mut flood = Vec::new();
    for _ in 0..16 {
        flood.push(TcpStream::connect(("127.0.0.1", app.port)).await.unwrap());
    }
    let started = Instant::now();
    let client = reqwest::Client::builder()
        .timeout(Duration::from_secs(15))
        .build()
        .unwrap();
    let r = client.get(app.url("/healthz")).send().await;
    let r = r.unwrap_or_else(|e| panic!("healthz did not answer under the flood: {e}"));
    assert_eq!(r.status(), 200);
    assert!(started.elapsed() < Duration::from_secs(15));
    // The server closed the idle connections it accepted (none is held
    // open for good).
    let mut first = flood.swap_remove(0);
    let (_, closed) = read_until_closed(&mut first).await;
    assert!(closed, "an idle connection was kept open");
}

#[tokio::test]
async fn a_stalled_retirement_body_gets_408_and_retires_nothing() {
    // The one route that reads its body raw (DELETE with an optional
    // reason) answers the same problem as the JSON routes.
    let app = short_deadlines(1, 30).await;
    let secret = crate::catalogue_support::token(
        &app.db,
        "hollowmere-retirer",
        tightspec::store::Role::Editor,
    )
    .await;
    let entry = app.get_json("/v1/friction-entries/1").await;
    let mut s = TcpStream::connect(("127.0.0.1", app.port)).await.unwrap();
    let started = Instant::now();
    let head = format!(
        "DELETE /v1/friction-entries/1 HTTP/1.1\r\nHost: localhost\r\n\
         Authorization: Bearer {secret}\r\nIf-Match: \"entry-1-r{}\"\r\n\
         Content-Type: application/json\r\nContent-Length: 1000\r\n\r\n",
        entry["revision"]
    );
    s.write_all(head.as_bytes()).await.unwrap();
    s.write_all(br#"{"reason":"#).await.unwrap();
    let (answer, closed) = read_until_closed(&mut s).await;
    assert!(closed, "the connection stayed open: {answer}");
    assert!(started.elapsed() < BOUND, "{:?}", started.elapsed());
    assert!(answer.starts_with("HTTP/1.1 408"), "{answer}");
    assert!(answer.contains("/problems/request-timeout"), "{answer}");
    let after = app.get_json("/v1/friction-entries/1").await;
    assert_eq!(after["status"], "active", "{after}");
    assert_eq!(after["revision"], entry["revision"]);
}
