//! kill -9 of the real binary while joints are being released, on SQLite
//! and on PostgreSQL: after a restart every acknowledged release is there,
//! release numbers are contiguous, exactly one is active, and the outbox
//! holds one `joint.released` event per release (no half release, no
//! duplicate). Every wait is bounded. Demo data.

use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::Duration;

use reqwest::Client;
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::token;
use crate::kill9::serve;
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(every_acknowledged_release_survives_kill_9);

const ID: &str = "HW-K4-RA-017";

async fn every_acknowledged_release_survives_kill_9(db: &TestDb) {
    let editor = token(db, "release-burst", Role::Editor).await;
    let (mut child, base) = serve(db).await;
    let client = Client::builder()
        .timeout(Duration::from_secs(5))
        .build()
        .unwrap();
    let joint = json!({"id": ID, "title": "Rear axle carrier (demo)", "tags": ["hollowmere-demo"],
        "request": {"thread": "M10", "property_class": "8.8",
                    "finish": "zinc-electroplated", "lubricant": "none"},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.1}});
    let r = client
        .post(format!("{base}/v1/joints"))
        .bearer_auth(&editor)
        .json(&joint)
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), 201);

    let acknowledged = Arc::new(Mutex::new(Vec::<i64>::new()));
    let next = Arc::new(AtomicUsize::new(0));
    let mut writers = Vec::new();
    for _ in 0..4 {
        let (client, base, editor) = (client.clone(), base.clone(), editor.clone());
        let (acknowledged, next) = (Arc::clone(&acknowledged), Arc::clone(&next));
        writers.push(tokio::spawn(async move {
            // Until the server is gone (a refused connection) or 2,000 releases.
            while next.load(Ordering::SeqCst) < 2000 {
                let n = next.fetch_add(1, Ordering::SeqCst);
                let r = client
                    .post(format!("{base}/v1/joints/{ID}/releases"))
                    .bearer_auth(&editor)
                    .json(&json!({"reason": format!("release burst {n} before kill -9 (demo)")}))
                    .send()
                    .await;
                match r {
                    Ok(r) if r.status() == 201 => {
                        let v: Value = match r.json().await {
                            Ok(v) => v,
                            Err(_) => return,
                        };
                        acknowledged
                            .lock()
                            .unwrap()
                            .push(v["release"].as_i64().unwrap());
                    }
                    Ok(r) => panic!("release {n} refused: {}", r.status()),
                    Err(_) => return,
                }
            }
        }));
    }
    let deadline = tokio::time::Instant::now() + Duration::from_secs(60);
    while acknowledged.lock().unwrap().len() < 20 {
        assert!(
            tokio::time::Instant::now() < deadline,
            "the burst did not get going"
        );
        tokio::time::sleep(Duration::from_millis(10)).await;
    }
    child.0.kill().expect("SIGKILL");
    child.0.wait().expect("reaped");
    for w in writers {
        tokio::time::timeout(Duration::from_secs(10), w)
            .await
            .expect("writers stop once the server is gone")
            .expect("writer");
    }
    let acknowledged = acknowledged.lock().unwrap().clone();

    let (child, base) = serve(db).await;
    let list: Value = client
        .get(format!("{base}/v1/joints/{ID}/releases"))
        .send()
        .await
        .unwrap()
        .json()
        .await
        .unwrap();
    let releases = list["releases"].as_array().expect("releases");
    let mut numbers: Vec<i64> = releases
        .iter()
        .map(|r| r["release"].as_i64().unwrap())
        .collect();
    numbers.sort_unstable();
    let head = *numbers.last().expect("a release");
    assert_eq!(
        numbers,
        (1..=head).collect::<Vec<_>>(),
        "numbers contiguous"
    );
    for n in &acknowledged {
        assert!(
            numbers.contains(n),
            "release {n} was acknowledged but is gone"
        );
    }
    let active: Vec<i64> = releases
        .iter()
        .filter(|r| r["status"] == "released")
        .map(|r| r["release"].as_i64().unwrap())
        .collect();
    assert_eq!(active, [head], "only the latest is active");
    assert!(releases
        .iter()
        .all(|r| r["status"] == "released" || r["status"] == "superseded"));
    drop(child);

    let store = Store::open(Some(&db.url)).await.expect("store");
    let events = store.outbox_after(0, 10_000).await.expect("outbox");
    store.close().await;
    let mut released: Vec<i64> = events
        .iter()
        .filter(|e| e.event.kind == "joint.released" && e.event.subject == ID)
        .map(|e| e.event.payload["data"]["release"].as_i64().unwrap())
        .collect();
    released.sort_unstable();
    assert_eq!(released, numbers, "one outbox event per release");
    eprintln!(
        "kill -9 with {} releases acknowledged: releases 1..={head} present, one active, one event each",
        acknowledged.len()
    );
}
