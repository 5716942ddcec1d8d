//! Shared state of the HTTP adapter: cheap to clone (everything behind
//! `Arc`s), registered once as `web::Data<AppState>`; every handler and
//! extractor reaches the application context, the authenticator and the
//! settings through it.

use std::sync::Arc;

use crate::app::App;

use super::auth::Authenticator;
use super::metrics::Metrics;
use super::specs::answer_cache::AnswerCache;

/// The settings the HTTP layer reads while answering (plain values, passed
/// in by `startup` from the service's configuration).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct HttpSettings {
    /// Largest accepted request body in bytes (413 above).
    pub max_body_bytes: usize,
    /// Seconds a client gets to send the whole body (408 after).
    pub body_read_timeout_secs: u64,
    /// Seconds a request may take until its answer starts (503 after).
    pub request_timeout_secs: u64,
    /// Rendered look-up answers kept per cached route (0 keeps none).
    pub answer_cache_entries: usize,
}

/// What every handler can reach, via `web::Data<AppState>`.
#[derive(Clone)]
pub struct AppState {
    /// The settings the service was started with.
    pub settings: HttpSettings,
    /// Prometheus metrics.
    pub metrics: Metrics,
    /// The application context: the store and the live catalogue.
    pub app: App,
    /// The OpenAPI document, serialised once at start-up.
    pub openapi_json: Arc<str>,
    /// Bearer-token authentication.
    pub auth: Arc<Authenticator>,
    /// Rendered answers to repeated `GET /v1/tightening-specs` look-ups.
    pub spec_answers: Arc<AnswerCache>,
    /// Rendered answers to repeated `GET /v1/setpoints` look-ups.
    pub setpoint_answers: Arc<AnswerCache>,
}

impl AppState {
    /// State serving the catalogue of `app`; reads may be anonymous when
    /// `anonymous_reads`.
    pub fn new(
        settings: HttpSettings,
        metrics: Metrics,
        openapi_json: Arc<str>,
        app: App,
        anonymous_reads: bool,
    ) -> Self {
        metrics.set_catalogue_revision(app.revision());
        let entries = settings.answer_cache_entries;
        Self {
            spec_answers: Arc::new(AnswerCache::new(entries)),
            setpoint_answers: Arc::new(AnswerCache::new(entries)),
            auth: Arc::new(Authenticator::new(app.clone(), anonymous_reads)),
            settings,
            metrics,
            app,
            openapi_json,
        }
    }
}
