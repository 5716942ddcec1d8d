//! Authentication: every write without a token, with an unknown, revoked
//! or expired token, or with too small a role is refused (401/403) and
//! nothing changes; anonymous reads follow the configuration.

use reqwest::{Method, StatusCode};
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::{start, token};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    every_refused_write_changes_nothing,
    anonymous_reads_can_be_forbidden
);

fn entry_body() -> Value {
    json!({
        "finish": "plain", "lubricant": "light-oil",
        "thread_friction": {"min": 0.09, "max": 0.15}, "bearing_friction": {"min": 0.09, "max": 0.15},
        "source": "Hollowmere Works test series HW-20 (demo data)", "reason": "attempt"
    })
}

async fn every_refused_write_changes_nothing(db: &TestDb) {
    let app = start(&db.url, true).await;
    let reader = token(db, "hollowmere-viewer", Role::Reader).await;
    let base = app.revision().await;
    let store = Store::open(Some(&db.url)).await.unwrap();
    let (_, revoked) = store
        .create_token("hollowmere-former", Role::Editor, None)
        .await
        .unwrap();
    store.revoke_token("hollowmere-former").await.unwrap();
    let (_, expired) = store
        .create_token(
            "hollowmere-temp",
            Role::Admin,
            Some(chrono::Utc::now() + chrono::Duration::seconds(1)),
        )
        .await
        .unwrap();
    store.close().await;
    tokio::time::sleep(std::time::Duration::from_millis(1100)).await;

    let (_, entry_tag) = app.entry(2).await;
    let finish_tag = app.get("/v1/finishes/plain").await.headers()["etag"]
        .to_str()
        .unwrap()
        .to_string();
    let lube_tag = app.get("/v1/lubricants/wax").await.headers()["etag"]
        .to_str()
        .unwrap()
        .to_string();
    let writes: Vec<(Method, &str, Option<&str>, Value)> = vec![
        (Method::POST, "/v1/friction-entries", None, entry_body()),
        (
            Method::PUT,
            "/v1/friction-entries/2",
            Some(&entry_tag),
            entry_body(),
        ),
        (
            Method::DELETE,
            "/v1/friction-entries/2?reason=attempt",
            Some(&entry_tag),
            Value::Null,
        ),
        (
            Method::POST,
            "/v1/finishes",
            None,
            json!({"id": "hw-x", "name": "x", "reason": "attempt"}),
        ),
        (
            Method::PUT,
            "/v1/finishes/plain",
            Some(&finish_tag),
            json!({"name": "x", "reason": "attempt"}),
        ),
        (
            Method::POST,
            "/v1/lubricants",
            None,
            json!({"id": "hw-y", "name": "y", "reason": "attempt"}),
        ),
        (
            Method::PUT,
            "/v1/lubricants/wax",
            Some(&lube_tag),
            json!({"name": "y", "reason": "attempt"}),
        ),
    ];
    let credentials: Vec<(Option<String>, StatusCode, &str)> = vec![
        (None, StatusCode::UNAUTHORIZED, "no token"),
        (
            Some("Bearer tsk_0000".into()),
            StatusCode::UNAUTHORIZED,
            "unknown token",
        ),
        (
            Some("Basic aGk6aGk=".into()),
            StatusCode::UNAUTHORIZED,
            "not a bearer token",
        ),
        (
            Some(format!("Bearer {revoked}")),
            StatusCode::UNAUTHORIZED,
            "revoked token",
        ),
        (
            Some(format!("Bearer {expired}")),
            StatusCode::UNAUTHORIZED,
            "expired token",
        ),
        (
            Some(format!("Bearer {reader}")),
            StatusCode::FORBIDDEN,
            "reader role",
        ),
    ];
    for (method, path, tag, body) in &writes {
        for (auth, expected, what) in &credentials {
            let mut req = app.client.request(method.clone(), app.url(path));
            if let Some(a) = auth {
                req = req.header("Authorization", a);
            }
            if let Some(t) = tag {
                req = req.header("If-Match", *t);
            }
            if !body.is_null() {
                req = req.json(body);
            }
            let r = req.send().await.unwrap();
            assert_eq!(r.status(), *expected, "{method} {path} with {what}");
            assert_eq!(r.headers()["content-type"], "application/problem+json");
            if *expected == StatusCode::UNAUTHORIZED {
                assert!(
                    r.headers().contains_key("www-authenticate"),
                    "{method} {path} {what}"
                );
            }
        }
    }
    // nothing changed
    assert_eq!(app.revision().await, base);
    let revs = app.get_json("/v1/catalogue/revisions").await;
    assert_eq!(revs["revisions"].as_array().unwrap().len() as i64, base);
    // and an editor may
    let editor = token(db, "hollowmere-editor", Role::Editor).await;
    let r = app.client.post(app.url("/v1/friction-entries")).bearer_auth(&editor).json(&json!({
        "finish": "zinc-nickel", "lubricant": "wax",
        "thread_friction": {"min": 0.05, "max": 0.1}, "bearing_friction": {"min": 0.05, "max": 0.1},
        "source": "Hollowmere Works test series HW-21 (demo data)", "reason": "new combination"
    })).send().await.unwrap();
    assert_eq!(r.status(), StatusCode::CREATED);
    let h = app
        .get_json(&format!("/v1/catalogue/revisions/{}", base + 1))
        .await;
    assert_eq!(h["actor"], "hollowmere-editor");
}

async fn anonymous_reads_can_be_forbidden(db: &TestDb) {
    let app = start(&db.url, false).await;
    let r = app.get("/v1/friction-entries").await;
    assert_eq!(r.status(), StatusCode::UNAUTHORIZED);
    let reader = token(db, "hollowmere-viewer", Role::Reader).await;
    for path in [
        "/v1/friction-entries",
        "/v1/finishes",
        "/v1/lubricants",
        "/v1/catalogue/revisions",
        "/v1/friction-entries/1/history",
    ] {
        let r = app
            .client
            .get(app.url(path))
            .bearer_auth(&reader)
            .send()
            .await
            .unwrap();
        assert_eq!(r.status(), StatusCode::OK, "{path}");
        assert_eq!(
            app.get(path).await.status(),
            StatusCode::UNAUTHORIZED,
            "{path} anonymous"
        );
    }
}
