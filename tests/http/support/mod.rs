//! Test harness: `TestApp` starts the real service (`Application::build`)
//! on 127.0.0.1:0 in a tokio task, with its own database, and gives a
//! reqwest client. Build one with `TestApp::builder()`:
//!
//! ```ignore
//! let app = TestApp::builder().spawn().await;                 // temp SQLite
//! let app = TestApp::builder().postgres().await.spawn().await; // fresh PG database
//! let app = TestApp::builder().anonymous_reads(false).spawn().await;
//! ```
//! The database is dropped with the `TestApp`.

pub mod db;

use std::sync::Once;

use reqwest::{Client, Response};
use serde_json::Value;
use tightspec::config::Config;
use tightspec::startup::Application;

use db::TestDb;

/// Logging for tests: silent unless `TEST_LOG` is set (its value is the
/// filter, e.g. `TEST_LOG=debug`).
pub fn init_test_logging() {
    static ONCE: Once = Once::new();
    ONCE.call_once(|| {
        if let Ok(filter) = std::env::var("TEST_LOG") {
            let filter = if filter.is_empty() || filter == "1" || filter == "true" {
                "info".to_string()
            } else {
                filter
            };
            tightspec::startup::init_logging_with(tracing_subscriber::EnvFilter::new(filter));
        }
    });
}

/// Options for a test instance; every option is additive.
pub struct TestAppBuilder {
    config: Config,
    db: Option<TestDb>,
}

impl TestAppBuilder {
    /// Run on a fresh PostgreSQL database (TEST_DATABASE_URL's server).
    pub async fn postgres(mut self) -> Self {
        self.db = Some(TestDb::postgres().await);
        self
    }

    /// Run on this database (the caller keeps it alive).
    pub fn database(mut self, db: TestDb) -> Self {
        self.db = Some(db);
        self
    }

    pub fn anonymous_reads(mut self, yes: bool) -> Self {
        self.config.anonymous_reads = yes;
        self
    }

    pub fn max_body_bytes(mut self, limit: usize) -> Self {
        self.config.max_body_bytes = limit;
        self
    }

    /// Connection and time limits (request hardening); tests shorten the
    /// deadlines to a second or so.
    pub fn limits(mut self, set: impl FnOnce(&mut tightspec::config::Limits)) -> Self {
        set(&mut self.config.limits);
        self
    }

    /// Rendered look-up answers kept per route (0 keeps none).
    pub fn answer_cache_entries(mut self, entries: usize) -> Self {
        self.config.answer_cache_entries = entries;
        self
    }

    /// Starts the service and waits until it answers.
    pub async fn spawn(self) -> TestApp {
        init_test_logging();
        let db = self.db.unwrap_or_else(TestDb::sqlite);
        let mut config = self.config;
        config.database_url = Some(db.url.clone());
        let app = Application::build(config)
            .await
            .unwrap_or_else(|e| panic!("the service did not start: {e}"));
        let port = app.port();
        let handle = app.server_handle();
        tokio::spawn(app.run_until_stopped());
        TestApp {
            base: loopback_base(port),
            port,
            client: Client::new(),
            handle: Some(handle),
            db,
        }
    }
}

/// The base URL of a service listening on the loopback interface (tests
/// only ever talk to their own instance on this machine).
pub fn loopback_base(port: u16) -> String {
    format!("http://127.0.0.1:{port}")
}

/// A running service instance, stopped when dropped.
pub struct TestApp {
    pub base: String,
    pub port: u16,
    pub client: Client,
    handle: Option<actix_web::dev::ServerHandle>,
    pub db: TestDb,
}

impl Drop for TestApp {
    fn drop(&mut self) {
        if let Some(h) = self.handle.take() {
            drop(h.stop(false));
        }
    }
}

impl TestApp {
    pub fn builder() -> TestAppBuilder {
        TestAppBuilder {
            config: Config::local(),
            db: None,
        }
    }

    /// An instance with the defaults (temporary SQLite database).
    pub async fn spawn() -> TestApp {
        Self::builder().spawn().await
    }

    pub fn url(&self, path: &str) -> String {
        format!("{}{path}", self.base)
    }

    pub async fn get(&self, path: &str) -> Response {
        self.client
            .get(self.url(path))
            .send()
            .await
            .unwrap_or_else(|e| panic!("GET {path}: {e}"))
    }

    /// GET expecting 200 and a JSON body.
    pub async fn get_json(&self, path: &str) -> Value {
        let r = self.get(path).await;
        let status = r.status();
        let body = r.text().await.unwrap_or_default();
        assert_eq!(status, 200, "GET {path}: {body}");
        serde_json::from_str(&body).unwrap_or_else(|e| panic!("GET {path}: not JSON ({e}): {body}"))
    }

    pub async fn post_json(&self, path: &str, body: &Value) -> Response {
        self.client
            .post(self.url(path))
            .json(body)
            .send()
            .await
            .unwrap_or_else(|e| panic!("POST {path}: {e}"))
    }
}

/// Asserts a problem+json response with `status` and returns its body.
pub async fn expect_problem(r: Response, status: u16) -> Value {
    let got = r.status().as_u16();
    let ct = r
        .headers()
        .get("content-type")
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string();
    let rid = r
        .headers()
        .get("x-request-id")
        .and_then(|v| v.to_str().ok())
        .map(str::to_owned);
    let body = r.text().await.unwrap_or_default();
    assert_eq!(got, status, "status; body: {body}");
    assert_eq!(ct, "application/problem+json", "content type; body: {body}");
    let v: Value = serde_json::from_str(&body).unwrap_or_else(|e| panic!("not JSON ({e}): {body}"));
    assert_eq!(v["status"], status, "status field: {body}");
    for key in ["type", "title", "detail"] {
        assert!(v[key].is_string(), "problem lacks {key}: {body}");
    }
    assert!(
        v["type"].as_str().unwrap_or("").starts_with("/problems/"),
        "{body}"
    );
    assert!(v["errors"].is_array(), "problem lacks errors: {body}");
    if let Some(rid) = rid {
        if v.get("request_id").is_some() {
            assert_eq!(
                v["request_id"],
                rid.as_str(),
                "request id in body matches header"
            );
        }
    }
    v
}

/// The `field` of every entry in a problem's `errors`.
pub fn error_fields(problem: &Value) -> Vec<String> {
    problem["errors"]
        .as_array()
        .map(|a| {
            a.iter()
                .filter_map(|e| e["field"].as_str().map(str::to_owned))
                .collect()
        })
        .unwrap_or_default()
}
