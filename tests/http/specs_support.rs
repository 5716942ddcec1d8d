//! Helpers shared by the spec, setpoint and batch tests: a running server
//! and small JSON accessors.

use reqwest::{Client, Response};
use serde_json::Value;

use crate::support::TestApp;

pub struct SpecApp {
    pub base: String,
    pub client: Client,
    /// Keeps the server and its temporary database alive.
    _app: TestApp,
}

/// Starts the real server (its own temporary SQLite catalogue at the seed
/// revision) through the shared `TestApp`.
pub async fn spawn() -> SpecApp {
    let app = TestApp::spawn().await;
    SpecApp {
        base: app.base.clone(),
        client: app.client.clone(),
        _app: app,
    }
}

impl SpecApp {
    pub async fn get(&self, path_and_query: &str) -> Response {
        self.client
            .get(format!("{}{path_and_query}", self.base))
            .send()
            .await
            .expect("request sent")
    }

    pub async fn get_with(&self, path_and_query: &str, header: (&str, &str)) -> Response {
        self.client
            .get(format!("{}{path_and_query}", self.base))
            .header(header.0, header.1)
            .send()
            .await
            .expect("request sent")
    }

    pub async fn post_json(&self, path: &str, body: &Value) -> Response {
        self.client
            .post(format!("{}{path}", self.base))
            .json(body)
            .send()
            .await
            .expect("request sent")
    }
}

/// Status and JSON body.
pub async fn json(r: Response) -> (u16, Value) {
    let status = r.status().as_u16();
    let body = r.json::<Value>().await.unwrap_or(Value::Null);
    (status, body)
}

/// The `value` of a quantity, checking it has the expected unit.
pub fn value(q: &Value, unit: &str) -> f64 {
    assert_eq!(q["unit"], unit, "unit of {q}");
    q["value"]
        .as_f64()
        .unwrap_or_else(|| panic!("no value in {q}"))
}

/// The fields a problem names, in order.
pub fn problem_fields(p: &Value) -> Vec<String> {
    p["errors"]
        .as_array()
        .map(|a| {
            a.iter()
                .map(|e| e["field"].as_str().unwrap_or_default().to_string())
                .collect()
        })
        .unwrap_or_default()
}

/// Relative difference.
pub fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs()
}
