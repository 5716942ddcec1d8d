//! The answers fetched by joint id are kept in memory per instance (see
//! `app::releases::fetch_cache`): on SQLite and PostgreSQL, the registry's
//! change counter rises with every registry write (database triggers), and
//! two instances on one database each serve a release, a withdrawal and a
//! new release made through the other, within the watcher's period, never
//! a kept answer after their own write. The plant and its joint are
//! invented for the test (demo data).

use std::time::{Duration, Instant};

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::{demo_joint, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    every_registry_write_raises_the_change_counter,
    a_second_instance_serves_what_the_first_released_and_withdrew,
);

const ID: &str = "HW-K4-RA-031";

fn definition() -> Value {
    demo_joint(
        ID,
        "Steering knuckle to strut, right (demo)",
        &["hollowmere-demo"],
        json!({"thread": "M10", "property_class": "8.8", "finish": "zinc-electroplated", "lubricant": "none"}),
    )
}

async fn status(app: &Instance, token: Option<&str>, path: &str, body: Value) -> StatusCode {
    app.post_json(token, path, &body).await.status()
}

/// The status and release number `GET …/setpoints` answers.
async fn fetched(app: &Instance) -> (StatusCode, Option<i64>) {
    let r = app
        .client
        .get(app.url(&format!("/v1/joints/{ID}/setpoints")))
        .send()
        .await
        .expect("GET");
    let st = r.status();
    let body: Value = r.json().await.unwrap_or(Value::Null);
    (st, body["release"].as_i64())
}

/// Asks `app` until it answers `want`, for at most 3 s (the watcher reads
/// the counter every 500 ms, PostgreSQL also on notification).
async fn until(app: &Instance, want: (StatusCode, Option<i64>)) {
    let start = Instant::now();
    loop {
        let got = fetched(app).await;
        if got == want {
            return;
        }
        assert!(
            start.elapsed() < Duration::from_secs(3),
            "still {got:?}, want {want:?}"
        );
        tokio::time::sleep(Duration::from_millis(20)).await;
    }
}

async fn every_registry_write_raises_the_change_counter(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let store = Store::open(Some(&db.url)).await.expect("store");
    let mut last = store.registry_generation().await.unwrap();
    let releases = format!("/v1/joints/{ID}/releases");
    let steps: [(&str, String, Value); 3] = [
        ("create", "/v1/joints".into(), definition()),
        ("release", releases.clone(), json!({"reason": "first"})),
        (
            "withdraw",
            format!("{releases}/1/withdraw"),
            json!({"reason": "drawing changed"}),
        ),
    ];
    for (what, path, body) in steps {
        let st = status(&app, Some(&editor), &path, body).await;
        assert!(st.is_success(), "{what}: {st}");
        let now = store.registry_generation().await.unwrap();
        assert!(now > last, "{what}: counter {last} → {now}");
        last = now;
    }
    // a refused write changes nothing
    let st = status(&app, Some(&editor), "/v1/joints", definition()).await;
    assert_eq!(st, StatusCode::CONFLICT);
    assert_eq!(store.registry_generation().await.unwrap(), last);
    store.close().await;
}

async fn a_second_instance_serves_what_the_first_released_and_withdrew(db: &TestDb) {
    let a = start(&db.url, true).await;
    let b = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let releases = format!("/v1/joints/{ID}/releases");
    assert!(status(&a, Some(&editor), "/v1/joints", definition())
        .await
        .is_success());
    until(&b, (StatusCode::CONFLICT, None)).await;

    // released through A: A at once (its own write), B within the period;
    // each now keeps the answer
    let first = json!({"reason": "first release"});
    assert!(status(&a, Some(&editor), &releases, first)
        .await
        .is_success());
    assert_eq!(fetched(&a).await, (StatusCode::OK, Some(1)));
    until(&b, (StatusCode::OK, Some(1))).await;
    assert_eq!(fetched(&b).await, (StatusCode::OK, Some(1)));

    // withdrawn through A: A never serves its kept answer again
    let w = format!("{releases}/1/withdraw");
    let st = status(&a, Some(&editor), &w, json!({"reason": "drawing changed"})).await;
    assert!(st.is_success(), "{st}");
    assert_eq!(fetched(&a).await, (StatusCode::CONFLICT, None));
    until(&b, (StatusCode::CONFLICT, None)).await;

    // released again through B: B at once, A within the period
    let second = json!({"reason": "drawing revision B"});
    assert!(status(&b, Some(&editor), &releases, second)
        .await
        .is_success());
    assert_eq!(fetched(&b).await, (StatusCode::OK, Some(2)));
    until(&a, (StatusCode::OK, Some(2))).await;
}
