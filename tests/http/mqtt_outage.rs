//! The MQTT publisher through a broker outage: the service reaches the
//! broker on 127.0.0.1:1883 through a small TCP relay the test can cut.
//! While cut, the service keeps serving; after the relay is back, the
//! publisher reconnects and publishes everything again, so a retained value
//! that changed on the broker meanwhile is put right. The plant and its
//! joint are invented for the test (demo data).

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use reqwest::StatusCode;
use serde_json::json;
use tightspec::config::Broker;
use tightspec::store::Role;
use tokio::net::{TcpListener, TcpStream};

use crate::catalogue_support::{start_with, token};
use crate::mqtt::{definition, leave_retained, post, unique_prefix, Subscriber, ID, WITHIN};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(after_an_outage_everything_is_published_again);

/// A TCP relay to the broker that can be cut (open connections closed,
/// new ones closed at once) and restored.
struct Relay {
    port: u16,
    up: Arc<AtomicBool>,
    /// Connections closed at once while cut.
    turned_away: Arc<AtomicUsize>,
    open: Arc<Mutex<Vec<tokio::task::JoinHandle<()>>>>,
    task: tokio::task::JoinHandle<()>,
}

impl Drop for Relay {
    fn drop(&mut self) {
        self.cut();
        self.task.abort();
    }
}

impl Relay {
    async fn start() -> Relay {
        let listener = TcpListener::bind("127.0.0.1:0").await.expect("bind");
        let port = listener.local_addr().expect("address").port();
        let up = Arc::new(AtomicBool::new(true));
        let turned_away = Arc::new(AtomicUsize::new(0));
        let open = Arc::new(Mutex::new(Vec::new()));
        let (u, t, o) = (up.clone(), turned_away.clone(), open.clone());
        let task = tokio::spawn(async move {
            while let Ok((mut inbound, _)) = listener.accept().await {
                if !u.load(Ordering::SeqCst) {
                    t.fetch_add(1, Ordering::SeqCst);
                    continue; // dropped: closed at once
                }
                let relay = tokio::spawn(async move {
                    if let Ok(mut broker) = TcpStream::connect("127.0.0.1:1883").await {
                        let _ = tokio::io::copy_bidirectional(&mut inbound, &mut broker).await;
                    }
                });
                o.lock().unwrap().push(relay);
            }
        });
        Relay {
            port,
            up,
            turned_away,
            open,
            task,
        }
    }

    fn cut(&self) {
        self.up.store(false, Ordering::SeqCst);
        for c in self.open.lock().unwrap().drain(..) {
            c.abort();
        }
    }

    fn restore(&self) {
        self.up.store(true, Ordering::SeqCst);
    }

    /// Waits until the publisher has tried to reconnect while cut.
    async fn until_turned_away(&self) {
        let start = Instant::now();
        while self.turned_away.load(Ordering::SeqCst) == 0 {
            assert!(start.elapsed() < WITHIN, "no reconnection attempt");
            tokio::time::sleep(Duration::from_millis(20)).await;
        }
    }
}

async fn after_an_outage_everything_is_published_again(db: &TestDb) {
    let prefix = unique_prefix();
    let topic = format!("{prefix}/joints/{ID}/setpoints");
    let mut line = Subscriber::to(&topic).await;
    let relay = Relay::start().await;
    let app = start_with(&db.url, |c| {
        c.mqtt.broker = Some(Broker {
            host: "127.0.0.1".into(),
            port: relay.port,
        });
        c.mqtt.topic_prefix = prefix.clone();
    })
    .await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    post(&app, &editor, "/v1/joints", definition()).await;
    let releases = format!("/v1/joints/{ID}/releases");
    post(&app, &editor, &releases, json!({"reason": "first release"})).await;
    let body = app
        .get(&format!("/v1/joints/{ID}/setpoints"))
        .await
        .text()
        .await
        .expect("body");
    let (payload, _) = line.next(&topic, |p| !p.is_empty()).await;
    assert_eq!(payload, body.as_bytes());

    // the broker is cut off: the service keeps serving
    relay.cut();
    relay.until_turned_away().await;
    assert_eq!(app.get("/readyz").await.status(), StatusCode::OK);
    let fetched = app.get(&format!("/v1/joints/{ID}/setpoints")).await;
    assert_eq!(fetched.status(), StatusCode::OK);
    // meanwhile the retained value changes on the broker
    leave_retained(&topic, b"{\"release\":0}").await;
    let (payload, _) = line.next(&topic, |p| p == b"{\"release\":0}").await;
    assert!(!payload.is_empty());

    // back: everything is published again
    relay.restore();
    let (payload, _) = line.next(&topic, |p| p == body.as_bytes()).await;
    assert_eq!(payload, body.as_bytes());

    // leave nothing retained behind
    let withdraw = format!("{releases}/1/withdraw");
    post(&app, &editor, &withdraw, json!({"reason": "test over"})).await;
    line.next(&topic, <[u8]>::is_empty).await;
    let _ = line.client.disconnect().await;
}
