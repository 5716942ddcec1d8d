//! The HTTP layer (actix-web): thin handlers over the application layer
//! (`app`).
//!
//! Infrastructure: `error` and `problem` (RFC 9457 problem responses),
//! `problem_responses` (the shared problem responses of the OpenAPI
//! document), `extract` (extractor error handlers), `accept` (content
//! negotiation), `auth` (bearer tokens and roles), `request_id`, `metrics`,
//! `deadline` (body-read and request deadlines), `state`, `openapi` and
//! `routes_table` (404 versus 405 from the document), `root` (a browser
//! asking for `/` is sent to the page). Routes: `health`, `reference` and `reference_lists`, and the
//! feature modules `specs`, `charts` (SVG pictures), `catalogue`, `friction_tests`, `joints`, `releases` (and
//! `releases_bulk`) and `subscriptions`, all registered
//! in `routes`.

pub mod accept;
pub mod auth;
pub mod catalogue;
pub mod charts;
pub mod deadline;
pub mod error;
pub mod extract;
pub mod friction_tests;
pub mod health;
pub mod impact;
pub mod joints;
pub mod joints_bulk;
pub mod metrics;
pub mod openapi;
pub mod problem;
pub mod problem_responses;
/// Wire quantities live in `app` (both adapters read them); kept at this
/// path for the HTTP modules.
pub mod reference;
pub mod reference_lists;
pub mod releases;
pub mod releases_bulk;
pub mod request_id;
pub mod root;
pub mod routes_table;
pub mod specs;
pub mod state;
pub mod subscriptions;

/// Every route of the service. Each HTTP module exposes
/// `pub fn configure(cfg: &mut ServiceConfig)` and is called here.
///
/// actix-web tries resources in registration order and matches each
/// pattern with a parameter (`/v1/friction-entries/{id}`) by regular
/// expression, so the hot look-ups (specs and setpoints, fixed paths) come
/// first: registered last they paid for about twenty failed regex matches
/// on every request.
pub fn routes(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    health::configure(cfg);
    specs::configure(cfg);
    // what the line fetches by joint id, right after the spec look-ups
    releases::configure(cfg);
    charts::configure(cfg);
    reference::configure(cfg);
    catalogue::configure(cfg);
    friction_tests::configure(cfg);
    joints_bulk::configure(cfg);
    releases_bulk::configure(cfg);
    joints::configure(cfg);
    impact::configure(cfg);
    subscriptions::configure(cfg);
}
