//! Several instances on one PostgreSQL, and a database outage.

use std::time::{Duration, Instant};

use reqwest::StatusCode;
use tightspec::store::Role;

use crate::catalogue_support::{start, token};
use crate::support::db::{host_port, via_port, Relay, TestDb};

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn a_second_instance_uses_a_change_within_one_second() {
    let db = TestDb::postgres().await;
    let a = start(&db.url, true).await;
    let b = start(&db.url, true).await;
    let editor = token(&db, "hollowmere-editor", Role::Editor).await;
    let base = b.revision().await;
    assert_eq!(a.revision().await, base);
    let (_, etag) = a.entry(7).await;
    let r = a.put_thread_min(&editor, 7, Some(&etag), 0.125).await;
    assert_eq!(r.status(), StatusCode::OK);
    let changed = Instant::now();
    loop {
        let (e, _) = b.entry(7).await;
        if e["catalogue_revision"] == base + 1 {
            assert_eq!(e["thread_friction"]["min"], 0.125);
            break;
        }
        assert!(
            changed.elapsed() < Duration::from_secs(1),
            "instance b still on revision {base} after 1 s"
        );
        tokio::time::sleep(Duration::from_millis(25)).await;
    }
    // and the other way round
    let (_, etag) = b.entry(7).await;
    assert_eq!(
        b.put_thread_min(&editor, 7, Some(&etag), 0.126)
            .await
            .status(),
        StatusCode::OK
    );
    let changed = Instant::now();
    while a.revision().await < base + 2 {
        assert!(
            changed.elapsed() < Duration::from_secs(1),
            "instance a did not follow within 1 s"
        );
        tokio::time::sleep(Duration::from_millis(25)).await;
    }
}

macro_rules! wait_until {
    ($what:expr, $limit:expr, $cond:expr) => {{
        let started = Instant::now();
        while !$cond {
            assert!(
                started.elapsed() < $limit,
                "{}: not within {:?}",
                $what,
                $limit
            );
            tokio::time::sleep(Duration::from_millis(100)).await;
        }
    }};
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn database_outage_reads_continue_writes_503_then_recovery() {
    let db = TestDb::postgres().await;
    let relay = Relay::start(&host_port(&db.url)).await;
    let url = via_port(&db.url, relay.port);
    let app = start(&url, true).await;
    let closed = start(&url, false).await;
    let editor = token(&db, "hollowmere-editor", Role::Editor).await;
    let viewer = token(&db, "hollowmere-viewer", Role::Reader).await;
    let base = app.revision().await;
    let read_as_viewer = || {
        closed
            .client
            .get(closed.url("/v1/friction-entries"))
            .bearer_auth(&viewer)
            .send()
    };
    assert_eq!(read_as_viewer().await.unwrap().status(), StatusCode::OK);
    // A look-up answered (and kept by the answer cache) before the outage.
    const SPEC: &str = "/v1/tightening-specs?thread=M10&property_class=8.8\
        &finish=zinc-electroplated&lubricant=none";
    assert_eq!(app.get_json(SPEC).await["catalogue_may_be_stale"], false);
    let (_, etag) = app.entry(7).await;
    assert_eq!(
        app.put_thread_min(&editor, 7, Some(&etag), 0.121)
            .await
            .status(),
        StatusCode::OK
    );

    relay.cut();
    // reads go on from memory and say the catalogue may be stale
    wait_until!(
        "stale flag",
        Duration::from_secs(10),
        app.get_json("/v1/friction-entries").await["catalogue_may_be_stale"] == true
    );
    let (e, etag) = app.entry(7).await;
    assert_eq!(
        (
            e["thread_friction"]["min"].as_f64(),
            e["catalogue_may_be_stale"].as_bool()
        ),
        (Some(0.121), Some(true))
    );
    // the same look-up is not answered from before the outage
    assert_eq!(app.get_json(SPEC).await["catalogue_may_be_stale"], true);
    // a token already seen may still read on an instance without anonymous reads
    wait_until!("stale flag (closed instance)", Duration::from_secs(10), {
        let r = read_as_viewer().await.unwrap();
        assert_eq!(r.status(), StatusCode::OK);
        r.json::<serde_json::Value>().await.unwrap()["catalogue_may_be_stale"] == true
    });
    // writes are refused with 503 and Retry-After
    let r = app.put_thread_min(&editor, 7, Some(&etag), 0.122).await;
    assert_eq!(r.status(), StatusCode::SERVICE_UNAVAILABLE);
    let retry: u64 = r.headers()["retry-after"]
        .to_str()
        .unwrap()
        .parse()
        .unwrap();
    assert!(retry >= 1);

    relay.restore().await;
    wait_until!(
        "recovery",
        Duration::from_secs(15),
        app.get_json("/v1/friction-entries").await["catalogue_may_be_stale"] == false
    );
    assert_eq!(app.get_json(SPEC).await["catalogue_may_be_stale"], false);
    let r = app.put_thread_min(&editor, 7, Some(&etag), 0.122).await;
    assert_eq!(r.status(), StatusCode::OK);
    assert_eq!(app.revision().await, base + 2);
}
