//! The tightening-spec API: `GET`/`POST /v1/tightening-specs`,
//! `POST /v1/tightening-specs/batch` and `GET /v1/setpoints`.
//!
//! The adapter only: extraction of the query or body, the snapshot the
//! answer is computed from, the answer cache ([`answer_cache`]), ETag and
//! Cache-Control ([`caching`]), the batch stream ([`batch`]) and writing the
//! views to the wire ([`handlers`]). Reading, resolving, computing, rounding
//! and the checks gate are the spec use cases in `app::spec`.

pub mod answer_cache;
pub mod batch;
pub mod caching;
pub mod handlers;

use utoipa_actix_web::service_config::ServiceConfig;

/// Registers the spec, batch and setpoint routes.
pub fn configure(cfg: &mut ServiceConfig) {
    cfg.service(handlers::get_spec)
        .service(handlers::post_spec)
        .service(batch::post_batch)
        .service(handlers::get_setpoints);
}
