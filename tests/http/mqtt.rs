//! Each joint's active setpoints as a retained MQTT message (`app::mqtt`),
//! against the broker on 127.0.0.1:1883 (CI runs one; without it these
//! tests fail, they are never skipped). Every test publishes under a topic
//! prefix of its own, so runs do not see each other's messages: a value
//! left retained for a joint without an active release is cleared, a
//! release is published byte for byte as fetched (and given to a late
//! subscriber), a review mark publishes again, a withdrawal clears it; the
//! service serves while the broker cannot be reached. The plant and its
//! joints are invented for the test (demo data).

use std::time::{Duration, Instant};

use reqwest::StatusCode;
use rumqttc::{AsyncClient, Event, MqttOptions, Packet, QoS};
use serde_json::{json, Value};
use tightspec::config::Broker;
use tightspec::store::Role;
use tokio::sync::mpsc;

use crate::catalogue_support::{demo_joint, start_with, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    a_release_is_retained_and_a_withdrawal_clears_it,
    the_service_serves_while_the_broker_is_unreachable,
);

pub const ID: &str = "HW-K4-RA-041";

/// Longest wait for a message (a pass runs on the registry's change
/// counter, at most 5 s after a change as the fallback).
pub const WITHIN: Duration = Duration::from_secs(15);

pub fn definition() -> Value {
    demo_joint(
        ID,
        "Lower control arm to subframe, left (demo)",
        &["hollowmere-demo"],
        json!({"thread": "M10", "property_class": "8.8", "finish": "zinc-electroplated", "lubricant": "none"}),
    )
}

fn broker() -> Broker {
    Broker {
        host: "127.0.0.1".into(),
        port: 1883,
    }
}

/// A topic prefix no other run uses.
pub fn unique_prefix() -> String {
    format!("tightspec-test/{:016x}", rand::random::<u64>())
}

/// One message as a subscriber receives it.
#[derive(Debug)]
enum Seen {
    Subscribed,
    Message {
        topic: String,
        payload: Vec<u8>,
        retain: bool,
    },
    Lost(String),
}

/// A test's own MQTT client, subscribed to `filter`.
pub struct Subscriber {
    pub client: AsyncClient,
    seen: mpsc::UnboundedReceiver<Seen>,
    task: tokio::task::JoinHandle<()>,
}

impl Drop for Subscriber {
    fn drop(&mut self) {
        self.task.abort();
    }
}

fn client(tag: &str) -> (AsyncClient, rumqttc::EventLoop) {
    let id = format!("tightspec-test-{tag}-{:016x}", rand::random::<u64>());
    let mut o = MqttOptions::new(id, "127.0.0.1", 1883);
    o.set_max_packet_size(1 << 20, 1 << 20);
    AsyncClient::new(o, 16)
}

fn unreachable(why: &str) -> ! {
    panic!(
        "the MQTT broker on 127.0.0.1:1883 is not reachable ({why}); these tests need it \
         (CI runs one)"
    )
}

impl Subscriber {
    /// Connects and subscribes; fails the test when the broker does not
    /// answer within the bound.
    pub async fn to(filter: &str) -> Subscriber {
        let (client, mut events) = client("sub");
        client
            .subscribe(filter, QoS::AtLeastOnce)
            .await
            .expect("subscribe queued");
        let (tx, seen) = mpsc::unbounded_channel();
        let task = tokio::spawn(async move {
            loop {
                let s = match events.poll().await {
                    Ok(Event::Incoming(Packet::SubAck(_))) => Seen::Subscribed,
                    Ok(Event::Incoming(Packet::Publish(p))) => Seen::Message {
                        topic: p.topic.clone(),
                        payload: p.payload.to_vec(),
                        retain: p.retain,
                    },
                    Ok(_) => continue,
                    Err(e) => {
                        let _ = tx.send(Seen::Lost(e.to_string()));
                        return;
                    }
                };
                if tx.send(s).is_err() {
                    return;
                }
            }
        });
        let mut sub = Subscriber { client, seen, task };
        match tokio::time::timeout(WITHIN, sub.seen.recv()).await {
            Ok(Some(Seen::Subscribed)) => sub,
            Ok(Some(Seen::Lost(e))) => unreachable(&e),
            Ok(other) => panic!("expected the subscription's acknowledgement, got {other:?}"),
            Err(_) => unreachable("no acknowledgement of the subscription"),
        }
    }

    /// The next message on `topic` that `want` accepts (others are
    /// passed over), within [`WITHIN`].
    pub async fn next(&mut self, topic: &str, want: impl Fn(&[u8]) -> bool) -> (Vec<u8>, bool) {
        let start = Instant::now();
        loop {
            let left = WITHIN.saturating_sub(start.elapsed());
            match tokio::time::timeout(left, self.seen.recv()).await {
                Ok(Some(Seen::Message {
                    topic: t,
                    payload,
                    retain,
                })) if t == topic && want(&payload) => return (payload, retain),
                Ok(Some(Seen::Lost(e))) => unreachable(&e),
                Ok(Some(_)) => continue,
                Ok(None) => panic!("the subscriber stopped"),
                Err(_) => panic!("no matching message on {topic} within {WITHIN:?}"),
            }
        }
    }
}

/// Leaves a retained message on `topic` as an earlier run would have.
pub async fn leave_retained(topic: &str, payload: &[u8]) {
    let (client, mut events) = client("pub");
    client
        .publish(topic, QoS::AtLeastOnce, true, payload.to_vec())
        .await
        .expect("publish queued");
    let start = Instant::now();
    loop {
        let left = WITHIN.saturating_sub(start.elapsed());
        match tokio::time::timeout(left, events.poll()).await {
            Ok(Ok(Event::Incoming(Packet::PubAck(_)))) => break,
            Ok(Ok(_)) => continue,
            Ok(Err(e)) => unreachable(&e.to_string()),
            Err(_) => unreachable("no acknowledgement of a publish"),
        }
    }
    let _ = client.disconnect().await;
}

pub async fn post(app: &Instance, token: &str, path: &str, body: Value) {
    let r = app.post_json(Some(token), path, &body).await;
    let status = r.status();
    assert!(status.is_success(), "POST {path}: {status}");
}

async fn a_release_is_retained_and_a_withdrawal_clears_it(db: &TestDb) {
    let prefix = unique_prefix();
    let topic = format!("{prefix}/joints/{ID}/setpoints");
    // a value left on the broker for a joint that has no active release
    let ghost = format!("{prefix}/joints/HW-K4-RA-999/setpoints");
    leave_retained(&ghost, b"{\"release\":1}").await;
    let mut line = Subscriber::to(&format!("{prefix}/joints/+/setpoints")).await;
    let app = start_with(&db.url, |c| {
        c.mqtt.broker = Some(broker());
        c.mqtt.topic_prefix = prefix.clone();
    })
    .await;
    // the publisher clears what it finds retained for no active release
    let (cleared, _) = line.next(&ghost, <[u8]>::is_empty).await;
    assert!(cleared.is_empty());

    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    post(&app, &editor, "/v1/joints", definition()).await;
    let releases = format!("/v1/joints/{ID}/releases");
    post(&app, &editor, &releases, json!({"reason": "first release"})).await;
    let fetched = app.get(&format!("/v1/joints/{ID}/setpoints")).await;
    assert_eq!(fetched.status(), StatusCode::OK);
    let body = fetched.text().await.expect("body");

    // the subscribed line receives exactly the fetched bytes
    let (payload, _) = line.next(&topic, |p| !p.is_empty()).await;
    assert_eq!(String::from_utf8(payload).expect("UTF-8"), body);
    let answer: Value = serde_json::from_str(&body).expect("JSON");
    assert_eq!(answer["release"], 1);
    assert!(answer["setpoints"]["checks"].is_array(), "{answer}");
    assert!(!answer["setpoints"]["cautions"].is_null(), "{answer}");

    // a tool that subscribes later is given the retained value at once
    let mut late = Subscriber::to(&topic).await;
    let (payload, retain) = late.next(&topic, |p| !p.is_empty()).await;
    assert!(retain, "a late subscriber's message is the retained one");
    assert_eq!(String::from_utf8(payload).expect("UTF-8"), body);

    // a catalogue change that moves the joint's values marks it for
    // review: the answer says so, and is published again
    review_mark(&app, &editor).await;
    let fetched = app.get(&format!("/v1/joints/{ID}/setpoints")).await;
    let marked = fetched.text().await.expect("body");
    let answer: Value = serde_json::from_str(&marked).expect("JSON");
    assert_eq!(answer["review_due"], true, "{answer}");
    let (payload, _) = line
        .next(&topic, |p| {
            p.windows(17).any(|w| w == b"\"review_due\":true")
        })
        .await;
    assert_eq!(String::from_utf8(payload).expect("UTF-8"), marked);

    // withdrawn: the retained message is cleared (an empty retained payload)
    let withdraw = format!("{releases}/1/withdraw");
    post(
        &app,
        &editor,
        &withdraw,
        json!({"reason": "drawing changed"}),
    )
    .await;
    let (payload, _) = line.next(&topic, <[u8]>::is_empty).await;
    assert!(payload.is_empty());
    let _ = line.client.disconnect().await;
    let _ = late.client.disconnect().await;
}

/// Raises the lower thread friction of the friction entry the joint uses
/// (a new catalogue revision), which marks the joint for review.
async fn review_mark(app: &Instance, editor: &str) {
    let entries = app
        .get_json("/v1/friction-entries?finish=zinc-electroplated&lubricant=none")
        .await;
    let id = entries["entries"][0]["id"].as_i64().expect("entry id");
    let (entry, etag) = app.entry(id).await;
    let min = entry["thread_friction"]["min"].as_f64().expect("min");
    let r = app
        .put_thread_min(editor, id, Some(&etag), min + 0.02)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
}

async fn the_service_serves_while_the_broker_is_unreachable(db: &TestDb) {
    // a port nothing listens on
    let port = std::net::TcpListener::bind("127.0.0.1:0")
        .and_then(|l| l.local_addr())
        .expect("free port")
        .port();
    let app = start_with(&db.url, |c| {
        c.mqtt.broker = Some(Broker {
            host: "127.0.0.1".into(),
            port,
        });
        c.mqtt.topic_prefix = unique_prefix();
    })
    .await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    post(&app, &editor, "/v1/joints", definition()).await;
    let releases = format!("/v1/joints/{ID}/releases");
    post(&app, &editor, &releases, json!({"reason": "first release"})).await;
    assert_eq!(app.get("/readyz").await.status(), StatusCode::OK);
    let fetched = app.get(&format!("/v1/joints/{ID}/setpoints")).await;
    assert_eq!(fetched.status(), StatusCode::OK);
}
