//! `POST /v1/joints/releases`: release many joints in one call (editor),
//! all or nothing. The handler extracts, calls `app::releases::bulk` and
//! renders; [`BulkReleaseWrite`] only documents the body. Registered before
//! `/v1/joints/{id}` so the fixed path is not read as a joint id.

use actix_web::http::header;
use actix_web::{post, web, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use super::catalogue::wire::NoQuery;
use super::releases::AcceptCheckWrite;
use crate::app::releases::bulk::BulkReleaseView;
use crate::http::auth::Editor;
use crate::http::error::ApiError;
use crate::http::extract::Query;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(release_joints);
}

/// A bulk release: the joints by `ids` or by `tag` (one of the two), with
/// one reason and the error checks accepted.
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BulkReleaseWrite {
    /// The joints' ids, 1–1000, no repeats.
    pub ids: Option<Vec<String>>,
    /// Every joint carrying this tag (1–1000 joints).
    pub tag: Option<String>,
    /// Why these releases are made (recorded on each), 1–1000 characters.
    pub reason: String,
    /// Error-severity checks accepted by code with a reason, recorded on
    /// each joint they apply to; a code that applies to none is refused.
    pub accept_checks: Option<Vec<AcceptCheckWrite>>,
}

/// Releases many joints at once (editor), all or nothing: every joint is
/// computed at the current catalogue revision and frozen as a single
/// release would be. If any joint is refused — an unknown id (`ids[i]`),
/// a definition that no longer computes or an error check not accepted
/// (`joints[<id>].…`) — the answer is one 422 listing every refused joint
/// and nothing is written. Otherwise every release, its history and its
/// `joint.released` event are written in one transaction. With the
/// four-eyes rule on each is a `draft` until an approver approves it. At
/// most 1,000 joints.
#[utoipa::path(
    tag = "joints",
    request_body = BulkReleaseWrite,
    security(("bearer" = [])),
    responses(
        (status = 201, description = "Every joint released (or a draft under the four-eyes rule), in joint id order", body = BulkReleaseView),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not release"),
        (status = 409, description = "A joint changed while it was being released; nothing written"),
        (status = 413, description = "Body over the size limit"),
        (status = 422, description = "Bad body, or every refused joint listed with its reasons; nothing written"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/joints/releases")]
async fn release_joints(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let released = state.app.release_joints(&who.0.name, &body).await?;
    Ok(HttpResponse::Created()
        .insert_header((header::CACHE_CONTROL, "no-cache"))
        .json(BulkReleaseView::of(&released, state.app.four_eyes())))
}
