//! A frozen PostgreSQL (connections open, no byte answered: a hung server
//! or a silent network): writes get 503 within the request deadline,
//! `/readyz` says not ready within its probe timeout, `/healthz` and reads
//! go on, and the service recovers by itself once the database answers
//! again. The stopped-database case is `catalogue_instances::
//! database_outage_reads_continue_writes_503_then_recovery`.

use std::time::{Duration, Instant};

use reqwest::{Client, StatusCode};
use serde_json::json;
use tightspec::config::Config;
use tightspec::startup::Application;
use tightspec::store::Role;

use crate::catalogue_support::token;
use crate::support::db::{host_port, via_port, Relay, TestDb};
use crate::support::expect_problem;

/// Upper bound for answers that have a 2 s deadline (hang guard only).
const BOUND: Duration = Duration::from_secs(8);

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn frozen_database_writes_503_then_recovery() {
    let db = TestDb::postgres().await;
    let relay = Relay::start(&host_port(&db.url)).await;
    let editor = token(&db, "hollowmere-editor", Role::Editor).await;
    let mut config = Config::local();
    config.database_url = Some(via_port(&db.url, relay.port));
    config.limits.request_timeout_secs = 2;
    let app = Application::build(config).await.expect("service starts");
    let base = crate::support::loopback_base(app.port());
    let handle = app.server_handle();
    tokio::spawn(app.run_until_stopped());
    let client = Client::builder().timeout(BOUND).build().unwrap();
    let write = |n: &str| {
        client
            .post(format!("{base}/v1/finishes"))
            .bearer_auth(&editor)
            .json(&json!({"id": n, "name": n, "reason": "outage test (demo)"}))
            .send()
    };
    let get = |path: &str| client.get(format!("{base}{path}")).send();
    assert_eq!(
        write("before-freeze").await.unwrap().status(),
        StatusCode::CREATED
    );

    relay.freeze();
    let started = Instant::now();
    let r = write("during-freeze").await.expect("answered, not hung");
    let p = expect_problem(r, 503).await;
    assert!(p["detail"].as_str().unwrap().contains("deadline"), "{p}");
    assert!(started.elapsed() < BOUND);
    let r = get("/readyz").await.expect("readyz answers");
    assert_eq!(r.status(), StatusCode::SERVICE_UNAVAILABLE);
    assert_eq!(get("/healthz").await.unwrap().status(), StatusCode::OK);
    assert_eq!(
        get("/v1/friction-entries").await.unwrap().status(),
        StatusCode::OK
    );

    relay.thaw();
    let deadline = Instant::now() + Duration::from_secs(20);
    loop {
        let ready = get("/readyz")
            .await
            .is_ok_and(|r| r.status() == StatusCode::OK);
        if ready {
            break;
        }
        assert!(Instant::now() < deadline, "no recovery after the thaw");
        tokio::time::sleep(Duration::from_millis(100)).await;
    }
    let r = write("after-thaw").await.unwrap();
    assert_eq!(r.status(), StatusCode::CREATED);
    // The refused write left nothing behind.
    let r = get("/v1/finishes/during-freeze").await.unwrap();
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    drop(handle.stop(false));
}
