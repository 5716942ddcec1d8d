//! Webhook delivery on SQLite and PostgreSQL: a catalogue revision writes
//! `catalogue.revision_created` to the outbox and a delivery to each
//! subscription to it; a receiver that fails three times gets the event on
//! the fourth attempt, signed, with the back-off growing between attempts
//! (driven by passing the time in, no waiting); a subscription made after
//! an event does not receive it; the worker started with the service
//! delivers while another target hangs; and on PostgreSQL two deliverers
//! claiming at once deliver each event once. Hosts and people are invented.

use chrono::{DateTime, Duration, Utc};
use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::app::delivery::{Deliverer, DeliverySettings};
use tightspec::app::App;
use tightspec::store::deliveries::DeliveryOutcome;
use tightspec::store::Role;

use crate::catalogue_support::{start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;
use crate::webhook_receiver::Receiver;

on_both_backends!(
    a_receiver_failing_three_times_gets_the_event_on_the_fourth_attempt,
    the_worker_delivers_while_another_target_hangs,
);

/// Subscribes `url` to `events`; the subscription's id and secret.
pub async fn subscribe(app: &Instance, admin: &str, url: &str, events: &[&str]) -> (i64, String) {
    let r = app
        .post_json(
            Some(admin),
            "/v1/subscriptions",
            &json!({"url": url, "events": events}),
        )
        .await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let v: Value = r.json().await.unwrap();
    (
        v["id"].as_i64().unwrap(),
        v["secret"].as_str().unwrap().to_string(),
    )
}

/// Writes a catalogue revision (the first entry's thread friction minimum
/// moved); the new revision.
pub async fn new_revision(app: &Instance, editor: &str) -> i64 {
    let entries = app.get_json("/v1/friction-entries").await;
    let id = entries["entries"][0]["id"].as_i64().expect("an entry");
    let (body, etag) = app.entry(id).await;
    let min = body["thread_friction"]["min"].as_f64().unwrap();
    let next = if min > 0.1 { min - 0.01 } else { min + 0.01 };
    let r = app
        .put_thread_min(editor, id, Some(&etag), (next * 100.0).round() / 100.0)
        .await;
    assert_eq!(r.status(), StatusCode::OK, "{}", r.text().await.unwrap());
    app.revision().await
}

pub fn settings(concurrency: usize) -> DeliverySettings {
    DeliverySettings {
        concurrency,
        timeout: std::time::Duration::from_secs(10),
        ..DeliverySettings::default()
    }
}

pub async fn deliverer(db: &TestDb, concurrency: usize) -> Deliverer {
    let app = App::open(Some(&db.url)).await.expect("app");
    app.deliverer(settings(concurrency)).expect("deliverer")
}

async fn log(app: &Instance, admin: &str, id: i64) -> Vec<Value> {
    let r = app
        .client
        .get(app.url(&format!("/v1/subscriptions/{id}/deliveries")))
        .bearer_auth(admin)
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::OK);
    r.json::<Value>().await.unwrap()["attempts"]
        .as_array()
        .unwrap()
        .clone()
}

fn time(v: &Value) -> DateTime<Utc> {
    DateTime::parse_from_rfc3339(v.as_str().expect("a time"))
        .unwrap()
        .with_timezone(&Utc)
}

async fn a_receiver_failing_three_times_gets_the_event_on_the_fourth_attempt(db: &TestDb) {
    let app = start(&db.url, true).await; // no worker: this test drives delivery
    let admin = token(db, "hollowmere-integration", Role::Admin).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let receiver = Receiver::start(3).await;
    let (id, secret) =
        subscribe(&app, &admin, &receiver.url, &["catalogue.revision_created"]).await;
    receiver.set_secret(&secret);
    let revision = new_revision(&app, &editor).await;
    // made after the revision: it does not receive it
    let late = Receiver::start(0).await;
    let (late_id, _) = subscribe(&app, &admin, &late.url, &["catalogue.revision_created"]).await;

    let deliverer = deliverer(db, 4).await;
    let mut now = Utc::now();
    let mut waits = Vec::new();
    for attempt in 1..=4 {
        let reports = deliverer.deliver_due(now).await.unwrap();
        assert_eq!(reports.len(), 1, "attempt {attempt}: {reports:?}");
        let report = &reports[0];
        assert_eq!((report.subscription_id, report.attempt), (id, attempt));
        match report.outcome {
            DeliveryOutcome::Retry(next) => {
                assert!(attempt < 4, "attempt {attempt} should have delivered");
                assert_eq!(report.status_code, Some(500));
                // not due before its time: nothing is claimed a second early
                let early = deliverer
                    .deliver_due(next - Duration::seconds(1))
                    .await
                    .unwrap();
                assert!(early.is_empty(), "{early:?}");
                waits.push(next - now);
                now = next;
            }
            DeliveryOutcome::Delivered => assert_eq!(attempt, 4),
            DeliveryOutcome::Failed => panic!("given up after {attempt}"),
        }
    }
    // delivered: nothing more is due, even a day later
    assert!(deliverer
        .deliver_due(now + Duration::days(1))
        .await
        .unwrap()
        .is_empty());
    // the back-off grows: 30 s, 60 s, 120 s
    let secs: Vec<i64> = waits.iter().map(Duration::num_seconds).collect();
    assert_eq!(secs, [30, 60, 120]);

    // the receiver got four signed copies of one event, accepted the last
    let got = receiver.received();
    assert_eq!(got.len(), 4);
    assert!(got.iter().all(|r| r.signature_ok), "{got:?}");
    let event_id = &got[0].webhook_id;
    assert!(got.iter().all(|r| &r.webhook_id == event_id));
    let answered: Vec<u16> = got.iter().map(|r| r.answered).collect();
    assert_eq!(answered, [500, 500, 500, 200]);
    let body = &got[3].body;
    assert_eq!(body["specversion"], "1.0");
    assert_eq!(body["type"], "catalogue.revision_created");
    assert_eq!(body["id"], json!(event_id));
    assert_eq!(body["subject"], revision.to_string());
    assert_eq!(body["data"]["revision"], revision);
    assert_eq!(body["data"]["actor"], "hollowmere-planning");
    // the timestamp header is the attempt's time
    assert_eq!(got[3].timestamp, now.timestamp());

    // the log shows the four attempts and their outcomes
    let attempts = log(&app, &admin, id).await;
    let outcomes: Vec<&str> = attempts
        .iter()
        .map(|a| a["outcome"].as_str().unwrap())
        .collect();
    assert_eq!(outcomes, ["retry", "retry", "retry", "delivered"]);
    let codes: Vec<i64> = attempts
        .iter()
        .map(|a| a["status_code"].as_i64().unwrap())
        .collect();
    assert_eq!(codes, [500, 500, 500, 200]);
    let numbers: Vec<i64> = attempts
        .iter()
        .map(|a| a["attempt"].as_i64().unwrap())
        .collect();
    assert_eq!(numbers, [1, 2, 3, 4]);
    assert!(attempts.iter().all(|a| a["event_id"] == json!(event_id)));
    assert_eq!(attempts[0]["duration"]["unit"], "ms");
    let gaps: Vec<i64> = attempts[..3]
        .iter()
        .map(|a| (time(&a["next_attempt_at"]) - time(&a["attempted_at"])).num_seconds())
        .collect();
    assert_eq!(gaps, [30, 60, 120]);
    assert!(attempts[3]["next_attempt_at"].is_null());

    // the later subscription got nothing
    assert!(late.received().is_empty());
    assert!(log(&app, &admin, late_id).await.is_empty());
}

/// A service whose webhook worker runs (every 20 ms, 60 s per attempt).
async fn start_with_worker(url: &str) -> (tightspec::startup::Application, String) {
    let mut config = tightspec::config::Config::local();
    config.database_url = Some(url.to_string());
    config.webhooks.delivery = true;
    config.webhooks.interval_ms = 20;
    config.webhooks.timeout_secs = 60;
    let app = tightspec::startup::Application::build(config)
        .await
        .expect("start");
    let base = crate::support::loopback_base(app.port());
    (app, base)
}

async fn the_worker_delivers_while_another_target_hangs(db: &TestDb) {
    let (server, base) = start_with_worker(&db.url).await;
    let handle = server.server_handle();
    tokio::spawn(server.run_until_stopped());
    let app = start(&db.url, true).await; // a second instance, no worker: the API
    let admin = token(db, "hollowmere-integration", Role::Admin).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let stuck = Receiver::hanging().await;
    let good = Receiver::start(0).await;
    let (_, stuck_secret) =
        subscribe(&app, &admin, &stuck.url, &["catalogue.revision_created"]).await;
    stuck.set_secret(&stuck_secret);
    // the hanging target takes the first event and holds it
    new_revision(&app, &editor).await;
    let held = stuck.wait_for(1).await;
    assert!(held[0].signature_ok);

    let (good_id, good_secret) =
        subscribe(&app, &admin, &good.url, &["catalogue.revision_created"]).await;
    good.set_secret(&good_secret);
    let revision = new_revision(&app, &editor).await;
    // the other subscription is served while the first target still hangs
    let got = good.wait_for(1).await;
    assert!(got[0].signature_ok);
    assert_eq!(got[0].body["data"]["revision"], revision);
    assert_eq!(
        stuck.wait_for(2).await.len(),
        2,
        "the stuck target gets the second event too"
    );
    // and requests are answered meanwhile
    let r = app
        .client
        .get(format!("{base}/healthz"))
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::OK);
    // the delivered attempt is logged (the hanging ones are still open);
    // polled, each poll a request, for at most 30 s
    let logged = async {
        loop {
            let attempts = log(&app, &admin, good_id).await;
            if !attempts.is_empty() {
                return attempts;
            }
            tokio::task::yield_now().await;
        }
    };
    let attempts = tokio::time::timeout(std::time::Duration::from_secs(30), logged)
        .await
        .expect("the attempt was not logged within 30 s");
    assert_eq!(attempts.len(), 1);
    assert_eq!(attempts[0]["outcome"], "delivered");
    drop(handle.stop(false));
}

#[tokio::test(flavor = "multi_thread", worker_threads = 4)]
async fn two_deliverers_on_postgres_deliver_each_event_once() {
    let db = TestDb::postgres().await;
    let app = start(&db.url, true).await;
    let admin = token(&db, "hollowmere-integration", Role::Admin).await;
    let editor = token(&db, "hollowmere-planning", Role::Editor).await;
    let receiver = Receiver::start(0).await;
    let (id, secret) =
        subscribe(&app, &admin, &receiver.url, &["catalogue.revision_created"]).await;
    receiver.set_secret(&secret);
    const EVENTS: usize = 12;
    for _ in 0..EVENTS {
        new_revision(&app, &editor).await;
    }
    // two instances' deliverers (two pools), claiming at the same time
    let (a, b) = (deliverer(&db, 3).await, deliverer(&db, 3).await);
    let now = Utc::now();
    let mut delivered = Vec::new();
    for round in 0.. {
        assert!(
            round < 2 * EVENTS,
            "deliveries still due after {round} rounds"
        );
        let (ra, rb) = tokio::join!(a.deliver_due(now), b.deliver_due(now));
        let (ra, rb) = (ra.unwrap(), rb.unwrap());
        if ra.is_empty() && rb.is_empty() {
            break;
        }
        // what one claimed, the other did not
        for r in &ra {
            assert!(
                !rb.iter().any(|o| o.event_id == r.event_id),
                "both sent {}",
                r.event_id
            );
        }
        for r in ra.iter().chain(&rb) {
            assert_eq!(r.outcome, DeliveryOutcome::Delivered);
            delivered.push(r.event_id.clone());
        }
    }
    let got = receiver.received();
    assert_eq!(got.len(), EVENTS);
    assert!(got.iter().all(|r| r.signature_ok));
    let mut ids: Vec<String> = got.iter().map(|r| r.webhook_id.clone()).collect();
    ids.sort();
    ids.dedup();
    assert_eq!(ids.len(), EVENTS, "an event was delivered twice");
    delivered.sort();
    assert_eq!(delivered, ids);
    assert_eq!(log(&app, &admin, id).await.len(), EVENTS);
}
