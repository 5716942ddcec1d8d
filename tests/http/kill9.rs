//! kill -9 of the real binary during a write burst, on SQLite and on
//! PostgreSQL: after a restart on the same database every write that was
//! answered 2xx is there, and the catalogue revisions are contiguous (no
//! gap, no half-written revision). Every wait is bounded.

use std::process::{Child, Command, Stdio};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::Duration;

use reqwest::Client;
use serde_json::json;
use tightspec::store::Role;

use crate::catalogue_support::token;
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(every_acknowledged_write_survives_kill_9);

/// The running binary; killed and reaped when dropped (also when a test
/// fails half-way).
pub struct Server(pub Child);

impl Drop for Server {
    fn drop(&mut self) {
        let _ = self.0.kill();
        let _ = self.0.wait();
    }
}

/// The binary serving `db` on a free port; waits (bounded) until it answers.
pub async fn serve(db: &TestDb) -> (Server, String) {
    let port = std::net::TcpListener::bind("127.0.0.1:0")
        .and_then(|l| l.local_addr())
        .map(|a| a.port())
        .expect("a free port");
    let child = Server(
        Command::new(env!("CARGO_BIN_EXE_tightspec"))
            .args(["serve", "--listen", &format!("127.0.0.1:{port}")])
            .args(["--database-url", &db.url, "--workers", "2"])
            .stdin(Stdio::null())
            .stdout(Stdio::null())
            .stderr(Stdio::null())
            .spawn()
            .expect("the binary starts"),
    );
    let base = crate::support::loopback_base(port);
    let client = Client::new();
    let deadline = tokio::time::Instant::now() + Duration::from_secs(30);
    loop {
        let r = client.get(format!("{base}/readyz")).send().await;
        if r.is_ok_and(|r| r.status() == 200) {
            return (child, base);
        }
        assert!(
            tokio::time::Instant::now() < deadline,
            "the service did not get ready"
        );
        tokio::time::sleep(Duration::from_millis(50)).await;
    }
}

async fn every_acknowledged_write_survives_kill_9(db: &TestDb) {
    let editor = token(db, "burst-writer", Role::Editor).await;
    let (mut child, base) = serve(db).await;
    let client = Client::builder()
        .timeout(Duration::from_secs(5))
        .build()
        .unwrap();
    let acknowledged = Arc::new(Mutex::new(Vec::<String>::new()));
    let next = Arc::new(AtomicUsize::new(0));
    let mut writers = Vec::new();
    for _ in 0..4 {
        let (client, base, editor) = (client.clone(), base.clone(), editor.clone());
        let (acknowledged, next) = (Arc::clone(&acknowledged), Arc::clone(&next));
        writers.push(tokio::spawn(async move {
            // Until the server is gone (a refused connection) or 2,000 writes.
            while next.load(Ordering::SeqCst) < 2000 {
                let n = next.fetch_add(1, Ordering::SeqCst);
                let id = format!("burst-finish-{n}");
                let r = client
                    .post(format!("{base}/v1/finishes"))
                    .bearer_auth(&editor)
                    .json(&json!({"id": id, "name": format!("Burst finish {n}"),
                                  "reason": "write burst before kill -9 (demo)"}))
                    .send()
                    .await;
                match r {
                    Ok(r) if r.status().is_success() => acknowledged.lock().unwrap().push(id),
                    Ok(r) => panic!("write {n} refused: {}", r.status()),
                    Err(_) => return,
                }
            }
        }));
    }
    // Kill once some writes were acknowledged, mid-burst.
    let deadline = tokio::time::Instant::now() + Duration::from_secs(60);
    while acknowledged.lock().unwrap().len() < 50 {
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
    assert!(acknowledged.len() >= 50);

    let (child, base) = serve(db).await;
    let finishes: serde_json::Value = get_json(&client, &format!("{base}/v1/finishes")).await;
    let present: Vec<&str> = finishes["finishes"]
        .as_array()
        .expect("finishes list")
        .iter()
        .filter_map(|f| f["id"].as_str())
        .collect();
    for id in &acknowledged {
        assert!(
            present.contains(&id.as_str()),
            "{id} was acknowledged but is gone"
        );
    }
    // Revisions 1..=head, each exactly once.
    let revs: serde_json::Value = get_json(
        &client,
        &format!("{base}/v1/catalogue/revisions?limit=1000"),
    )
    .await;
    let mut numbers: Vec<i64> = revs["revisions"]
        .as_array()
        .expect("revisions")
        .iter()
        .filter_map(|r| r["revision"].as_i64())
        .collect();
    numbers.sort_unstable();
    let head = *numbers.last().expect("a revision");
    let first = numbers[0];
    assert_eq!(first, 1, "history starts at the seed");
    assert_eq!(
        numbers,
        (first..=head).collect::<Vec<_>>(),
        "revisions contiguous"
    );
    assert!(head - first + 1 >= acknowledged.len() as i64);
    eprintln!(
        "kill -9 with {} writes acknowledged: all present after restart; revisions {first}..={head} contiguous",
        acknowledged.len()
    );
    drop(child);
}

async fn get_json(client: &Client, url: &str) -> serde_json::Value {
    client.get(url).send().await.unwrap().json().await.unwrap()
}
