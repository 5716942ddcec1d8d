//! The engineer's web page at `/ui/`: server-rendered HTML (maud) over the
//! application layer, an adapter beside `http` and `cli` that calls `app`
//! only. Reading works without JavaScript; the one small script
//! (`assets/ui.js`) only reads a chosen CSV file into the upload form.
//! Writes need the caller's API token (kept in an HttpOnly, SameSite=Strict
//! cookie by the token form) with the same roles as the API, and pass the
//! cross-site request forgery checks in [`session`].

mod catalogue;
mod friction;
mod impact;
mod joint_release;
mod joints;
mod layout;
mod problem;
mod proposal;
mod session;
mod spec;

use actix_web::http::header;
use actix_web::{web, HttpResponse};

use crate::app::App;

pub use session::UiSettings;

/// What the page's handlers reach through `web::Data<UiState>`.
#[derive(Clone)]
pub struct UiState {
    pub app: App,
    pub settings: UiSettings,
}

const CSS: &str = include_str!("assets/ui.css");
const JS: &str = include_str!("assets/ui.js");

/// Registers the page's routes (not part of the API or its OpenAPI
/// document) and its state.
pub fn configure(cfg: &mut web::ServiceConfig, state: UiState) {
    let limit = state.settings.max_form_bytes;
    cfg.app_data(web::Data::new(state))
        .app_data(web::FormConfig::default().limit(limit))
        .route("/ui", web::get().to(to_home))
        .route("/ui/", web::get().to(layout::home))
        .route("/ui/assets/ui.css", web::get().to(css))
        .route("/ui/assets/ui.js", web::get().to(js))
        .route("/ui/spec", web::get().to(spec::calculator))
        .route("/ui/catalogue", web::get().to(catalogue::entries))
        .route(
            "/ui/catalogue/entries/{id}",
            web::get().to(catalogue::entry),
        )
        .route("/ui/catalogue/diff", web::get().to(catalogue::diff))
        .route("/ui/friction-tests", web::get().to(friction::form_page))
        .route("/ui/friction-tests", web::post().to(friction::submit))
        .route("/ui/friction-tests/{id}", web::get().to(friction::stored))
        .route(
            "/ui/friction-tests/{id}/apply",
            web::post().to(proposal::apply),
        )
        .route("/ui/joints", web::get().to(joints::list))
        .route("/ui/joints/{id}", web::get().to(joints::one))
        .route(
            "/ui/joints/{id}/release",
            web::post().to(joint_release::release),
        )
        .route(
            "/ui/joints/{id}/releases/{n}/approve",
            web::post().to(joint_release::approve),
        )
        .route(
            "/ui/joints/{id}/releases/{n}/withdraw",
            web::post().to(joint_release::withdraw),
        )
        .route(
            "/ui/joints/{id}/review/confirm",
            web::post().to(joint_release::confirm),
        )
        .route("/ui/token", web::get().to(session::token_form))
        .route("/ui/token", web::post().to(session::token_submit));
}

async fn to_home() -> HttpResponse {
    HttpResponse::PermanentRedirect()
        .insert_header((header::LOCATION, "/ui/"))
        .finish()
}

fn asset(body: &'static str, content_type: &'static str) -> HttpResponse {
    HttpResponse::Ok()
        .insert_header((header::CONTENT_TYPE, content_type))
        .insert_header((header::CACHE_CONTROL, "public, max-age=3600"))
        .body(body)
}

async fn css() -> HttpResponse {
    asset(CSS, "text/css; charset=utf-8")
}

async fn js() -> HttpResponse {
    asset(JS, "text/javascript; charset=utf-8")
}
