//! The tightening-spec API: `GET`/`POST /v1/tightening-specs`,
//! `POST /v1/tightening-specs/batch` and `GET /v1/setpoints`.
//!
//! Reading a request is one step, shared by every endpoint and the
//! `tightspec spec` command: wire request ([`request`]) → names resolved
//! through the engine's look-ups and the catalogue snapshot ([`friction`],
//! [`resolve`]) → the engine's validated `SpecInput`. Handlers
//! ([`handlers`]) only fetch the snapshot, call that step and the engine,
//! and render ([`response`], [`setpoints`], [`cautions`]) with ETag and
//! Cache-Control ([`caching`]), the window rounded to a tool's resolution
//! ([`rounding`]) and checks on the wire ([`checks`]). Problems found while
//! reading a request are collected in [`item_error`]. Repeated GET look-ups
//! are answered from [`answer_cache`]; [`batch`] streams the answer of many
//! requests.

pub mod answer_cache;
pub mod batch;
pub mod caching;
pub mod cautions;
pub mod checks;
pub mod friction;
pub mod handlers;
pub mod item_error;
pub mod request;
pub mod resolve;
pub mod response;
pub mod rounding;
pub mod setpoints;

pub use handlers::compute_one;
pub use item_error::{ErrorClass, ItemError, ItemErrors};

use utoipa_actix_web::service_config::ServiceConfig;

/// Registers the spec, batch and setpoint routes.
pub fn configure(cfg: &mut ServiceConfig) {
    cfg.service(handlers::get_spec)
        .service(handlers::post_spec)
        .service(batch::post_batch)
        .service(handlers::get_setpoints);
}
