//! Shared application state: cheap to clone (everything behind `Arc`s).

use std::sync::Arc;

use actix_web::web;

use crate::catalogue::{Live, Snapshot};
use crate::config::Config;

use super::auth::Authenticator;
use super::catalogue::CatalogueService;
use super::metrics::Metrics;
use super::specs::answer_cache::AnswerCache;

/// What every handler can reach, via `web::Data<AppState>`.
#[derive(Clone)]
pub struct AppState {
    /// The settings the service was started with.
    pub config: Arc<Config>,
    /// Prometheus metrics.
    pub metrics: Metrics,
    /// The friction catalogue being served (current revision plus cached
    /// past revisions).
    pub catalogue: Arc<Live>,
    /// The OpenAPI document, serialised once at start-up.
    pub openapi_json: Arc<str>,
    /// The store and live catalogue for the catalogue routes (registered as
    /// its own app data; `catalogue` above is the same `Live`).
    pub catalogue_service: web::Data<CatalogueService>,
    /// Bearer-token authentication (registered as its own app data).
    pub auth: web::Data<Authenticator>,
    /// Rendered answers to repeated `GET /v1/tightening-specs` look-ups.
    pub spec_answers: Arc<AnswerCache>,
    /// Rendered answers to repeated `GET /v1/setpoints` look-ups.
    pub setpoint_answers: Arc<AnswerCache>,
}

impl AppState {
    /// State serving the catalogue of `catalogue_service`.
    pub fn new(
        config: Config,
        metrics: Metrics,
        openapi_json: Arc<str>,
        catalogue_service: web::Data<CatalogueService>,
        auth: web::Data<Authenticator>,
    ) -> Self {
        let catalogue = Arc::clone(&catalogue_service.live);
        metrics.set_catalogue_revision(catalogue.revision());
        let entries = config.answer_cache_entries;
        Self {
            spec_answers: Arc::new(AnswerCache::new(entries)),
            setpoint_answers: Arc::new(AnswerCache::new(entries)),
            config: Arc::new(config),
            metrics,
            catalogue,
            openapi_json,
            catalogue_service,
            auth,
        }
    }

    /// The catalogue snapshot to answer the current request from.
    pub fn snapshot(&self) -> Arc<Snapshot> {
        self.catalogue.current()
    }
}
