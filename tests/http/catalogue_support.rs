//! Helpers for the catalogue black-box tests: a running service on a given
//! database, tokens made directly in that database, and small request
//! shortcuts.

use reqwest::{Client, Response, StatusCode};
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::support::db::TestDb;

/// A service instance on 127.0.0.1:<free port>, stopped when dropped.
pub struct Instance {
    pub base: String,
    pub client: Client,
    server: Option<actix_web::dev::ServerHandle>,
    task: tokio::task::JoinHandle<std::io::Result<()>>,
}

impl Drop for Instance {
    fn drop(&mut self) {
        if let Some(h) = self.server.take() {
            drop(h.stop(false));
        }
        self.task.abort();
    }
}

pub async fn start(database_url: &str, anonymous_reads: bool) -> Instance {
    start_with(database_url, |c| c.anonymous_reads = anonymous_reads).await
}

/// A service instance on `database_url` with settings changed by `set`.
pub async fn start_with(
    database_url: &str,
    set: impl FnOnce(&mut tightspec::config::Config),
) -> Instance {
    let mut config = tightspec::config::Config::local();
    config.database_url = Some(database_url.to_string());
    set(&mut config);
    let app = tightspec::startup::Application::build(config)
        .await
        .unwrap_or_else(|e| panic!("service did not start on {database_url}: {e}"));
    let base = crate::support::loopback_base(app.port());
    let server = app.server_handle();
    let task = tokio::spawn(app.run_until_stopped());
    Instance {
        base,
        client: Client::new(),
        server: Some(server),
        task,
    }
}

/// A token with `role`, made directly in the database (like `tightspec token create`).
pub async fn token(db: &TestDb, name: &str, role: Role) -> String {
    let store = Store::open(Some(&db.url)).await.expect("store");
    let (_, secret) = store.create_token(name, role, None).await.expect("token");
    store.close().await;
    secret
}

impl Instance {
    pub fn url(&self, path: &str) -> String {
        format!("{}{path}", self.base)
    }

    pub async fn get(&self, path: &str) -> Response {
        self.client.get(self.url(path)).send().await.expect("GET")
    }

    pub async fn get_json(&self, path: &str) -> Value {
        let r = self.get(path).await;
        assert_eq!(r.status(), StatusCode::OK, "GET {path}");
        r.json().await.expect("JSON")
    }

    /// POST a JSON body, anonymously or with a bearer token.
    pub async fn post_json(&self, token: Option<&str>, path: &str, body: &Value) -> Response {
        let mut rq = self.client.post(self.url(path)).json(body);
        if let Some(t) = token {
            rq = rq.bearer_auth(t);
        }
        rq.send().await.expect("POST")
    }

    /// GET an entry: its body and ETag.
    pub async fn entry(&self, id: i64) -> (Value, String) {
        let r = self.get(&format!("/v1/friction-entries/{id}")).await;
        assert_eq!(r.status(), StatusCode::OK);
        let etag = r
            .headers()
            .get("etag")
            .and_then(|v| v.to_str().ok())
            .expect("ETag")
            .to_string();
        (r.json().await.expect("JSON"), etag)
    }

    /// PUT an entry back with `thread_friction.min` changed.
    pub async fn put_thread_min(
        &self,
        token: &str,
        id: i64,
        etag: Option<&str>,
        min: f64,
    ) -> Response {
        let (mut body, _) = self.entry(id).await;
        body["thread_friction"]["min"] = min.into();
        body["reason"] = "Hollowmere Works test series HW-17 (demo data)".into();
        let mut req = self
            .client
            .put(self.url(&format!("/v1/friction-entries/{id}")))
            .bearer_auth(token)
            .json(&body);
        if let Some(tag) = etag {
            req = req.header("If-Match", tag);
        }
        req.send().await.expect("PUT")
    }

    /// The current catalogue revision as the service reports it.
    pub async fn revision(&self) -> i64 {
        self.get_json("/v1/friction-entries").await["catalogue_revision"]
            .as_i64()
            .expect("catalogue_revision")
    }
}

/// The fields named in a problem response.
pub fn problem_fields(v: &Value) -> Vec<String> {
    v["errors"]
        .as_array()
        .map(|a| {
            a.iter()
                .filter_map(|e| e["field"].as_str().map(String::from))
                .collect()
        })
        .unwrap_or_default()
}

/// Runs a test function on a fresh SQLite file and on a fresh PostgreSQL
/// database (one `#[tokio::test]` each).
#[macro_export]
macro_rules! on_both_backends {
    ($($name:ident),* $(,)?) => {$(
        mod $name {
            #[tokio::test(flavor = "multi_thread", worker_threads = 4)]
            async fn sqlite() {
                let db = $crate::support::db::TestDb::sqlite();
                super::$name(&db).await;
            }
            #[tokio::test(flavor = "multi_thread", worker_threads = 4)]
            async fn postgres() {
                let db = $crate::support::db::TestDb::postgres().await;
                super::$name(&db).await;
            }
        }
    )*};
}

/// A joint definition of the invented demo plant: `id`, `title`, `tags`,
/// the spec request, and setpoints in N·m to 0.1 with angles to 1°.
pub fn demo_joint(id: &str, title: &str, tags: &[&str], request: Value) -> Value {
    json!({
        "id": id,
        "title": title,
        "tags": tags,
        "request": request,
        "setpoints": {"torque_unit": "N·m", "resolution": 0.1, "angle_resolution": 1.0},
    })
}
