//! A webhook receiver for the tests: a small actix-web server on
//! 127.0.0.1:<free port> that checks each request's Standard Webhooks
//! signature with the subscription's secret (computed here with the hmac
//! crate directly, not through the service's code), records what came, and
//! answers 500 to the first `failures` requests, 200 after; or never
//! answers at all (`hanging`).

use std::net::TcpListener;
use std::sync::{Arc, Mutex};

use actix_web::{web, App, HttpRequest, HttpResponse, HttpServer};
use base64::engine::general_purpose::STANDARD;
use base64::Engine;
use hmac::{Hmac, Mac};
use serde_json::Value;
use sha2::Sha256;
use tokio::sync::Notify;

/// One request as the receiver got it.
#[derive(Debug, Clone)]
pub struct Received {
    pub webhook_id: String,
    pub timestamp: i64,
    pub signature_ok: bool,
    pub body: Value,
    /// The status the receiver answered.
    pub answered: u16,
}

#[derive(Default)]
struct Inner {
    secret: Mutex<Option<String>>,
    got: Mutex<Vec<Received>>,
    failures: usize,
    hanging: bool,
    arrived: Notify,
}

/// A running receiver, stopped when dropped.
pub struct Receiver {
    pub url: String,
    inner: Arc<Inner>,
    server: actix_web::dev::ServerHandle,
}

impl Drop for Receiver {
    fn drop(&mut self) {
        drop(self.server.stop(false));
    }
}

/// Whether `signature` (`v1,<base64>`, possibly several space-separated)
/// is HMAC-SHA256 over `id.timestamp.body` with the key of `secret`
/// (`whsec_` + base64 of the key), per the Standard Webhooks convention.
pub fn verify(secret: &str, id: &str, timestamp: &str, body: &[u8], signature: &str) -> bool {
    let Some(key) = secret
        .strip_prefix("whsec_")
        .and_then(|k| STANDARD.decode(k).ok())
    else {
        return false;
    };
    let mut mac = Hmac::<Sha256>::new_from_slice(&key).expect("any key length");
    mac.update(format!("{id}.{timestamp}.").as_bytes());
    mac.update(body);
    let expected = STANDARD.encode(mac.finalize().into_bytes());
    signature
        .split(' ')
        .filter_map(|s| s.strip_prefix("v1,"))
        .any(|s| s == expected)
}

async fn receive(req: HttpRequest, body: web::Bytes, inner: web::Data<Inner>) -> HttpResponse {
    let header = |name: &str| {
        req.headers()
            .get(name)
            .and_then(|v| v.to_str().ok())
            .unwrap_or_default()
            .to_string()
    };
    let (id, ts, sig) = (
        header("webhook-id"),
        header("webhook-timestamp"),
        header("webhook-signature"),
    );
    let secret = inner.secret.lock().unwrap().clone().unwrap_or_default();
    let signature_ok = verify(&secret, &id, &ts, &body, &sig);
    let answered = {
        let got = inner.got.lock().unwrap();
        if got.len() < inner.failures {
            500
        } else {
            200
        }
    };
    inner.got.lock().unwrap().push(Received {
        webhook_id: id,
        timestamp: ts.parse().unwrap_or(0),
        signature_ok,
        body: serde_json::from_slice(&body).unwrap_or(Value::Null),
        answered,
    });
    inner.arrived.notify_waiters();
    if inner.hanging {
        // a target that takes the request and never answers
        std::future::pending::<()>().await;
    }
    HttpResponse::build(actix_web::http::StatusCode::from_u16(answered).unwrap()).finish()
}

impl Receiver {
    /// A receiver that answers 500 to the first `failures` requests.
    pub async fn start(failures: usize) -> Receiver {
        Self::with(Inner {
            failures,
            ..Inner::default()
        })
    }

    /// A receiver that takes each request and never answers.
    pub async fn hanging() -> Receiver {
        Self::with(Inner {
            hanging: true,
            ..Inner::default()
        })
    }

    fn with(inner: Inner) -> Receiver {
        let inner = Arc::new(inner);
        let data = web::Data::from(Arc::clone(&inner));
        let listener = TcpListener::bind("127.0.0.1:0").expect("bind");
        let port = listener.local_addr().unwrap().port();
        let server = HttpServer::new(move || {
            App::new()
                .app_data(data.clone())
                .default_service(web::to(receive))
        })
        .workers(1)
        .listen(listener)
        .expect("listen")
        .run();
        let handle = server.handle();
        tokio::spawn(server);
        Receiver {
            // the loopback receiver (the scheme marker is built: no web address in the source)
            url: format!("http{}127.0.0.1:{port}/hooks/line-4", "://"),
            inner,
            server: handle,
        }
    }

    /// The subscription's secret, to verify signatures with.
    pub fn set_secret(&self, secret: &str) {
        *self.inner.secret.lock().unwrap() = Some(secret.to_string());
    }

    pub fn received(&self) -> Vec<Received> {
        self.inner.got.lock().unwrap().clone()
    }

    /// Waits until `n` requests have come (at most 30 s; panics after).
    pub async fn wait_for(&self, n: usize) -> Vec<Received> {
        let wait = async {
            loop {
                let arrived = self.inner.arrived.notified();
                if self.received().len() >= n {
                    return;
                }
                arrived.await;
            }
        };
        tokio::time::timeout(std::time::Duration::from_secs(30), wait)
            .await
            .unwrap_or_else(|_| panic!("{n} webhook requests did not arrive within 30 s"));
        self.received()
    }
}
