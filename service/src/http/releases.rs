//! `/v1/joints/{id}/releases` (release, list, read, approve, withdraw) and
//! what the line fetches by joint id: `/v1/joints/{id}/spec` and
//! `/v1/joints/{id}/setpoints`, the active release's (or release N's)
//! frozen answer from its stored bytes, with an ETag and 304 on
//! `If-None-Match`. Each handler extracts, calls one use case of
//! `app::releases` and renders; [`ReleaseWrite`], [`StatusWrite`],
//! [`ReleasedSpec`] and [`ReleasedSetpoints`] only document the bodies.

use actix_web::http::header::{self, HeaderValue};
use actix_web::{get, post, web, HttpRequest, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::{IntoParams, ToSchema};

use super::catalogue::wire::NoQuery;
use super::specs::caching::not_modified;
use crate::app::joints::ReviewDueView;
use crate::app::releases::view::{FrozenAnswer, ReleaseView};
use crate::app::spec::view::{SetpointResponse, SpecResponse};
use crate::http::auth::{Approver, Editor, Reader};
use crate::http::error::ApiError;
use crate::http::extract::Query;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(released_setpoints)
        .service(released_spec)
        .service(list_releases)
        .service(create_release)
        .service(get_release)
        .service(approve_release)
        .service(withdraw_release);
}

/// An error check the release goes ahead with.
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct AcceptCheckWrite {
    /// The check's code (see `checks[].code` of the spec).
    pub code: String,
    /// Why it is accepted (recorded with the release), 1–1000 characters.
    pub reason: String,
}

/// A release request.
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ReleaseWrite {
    /// Why this release is made (recorded), 1–1000 characters.
    pub reason: String,
    /// Each error-severity check that applies, accepted by code with a
    /// reason; a code that does not apply is refused.
    pub accept_checks: Option<Vec<AcceptCheckWrite>>,
}

/// An approval or a withdrawal.
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct StatusWrite {
    /// Why (recorded), 1–1000 characters.
    pub reason: String,
}

/// A joint's releases, newest first.
#[derive(Debug, Serialize, ToSchema)]
pub struct ReleaseList {
    pub joint_id: String,
    pub releases: Vec<ReleaseView>,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct ReleaseQuery {
    /// An earlier release's number (default: the active release).
    pub release: Option<i64>,
}

/// A release's frozen spec, as the line fetches it.
#[derive(Debug, Serialize, ToSchema)]
pub struct ReleasedSpec {
    pub joint_id: String,
    /// The release number.
    pub release: i64,
    /// `released` for the active one; an earlier one's status otherwise.
    pub status: String,
    /// The catalogue revision the values were computed at.
    pub catalogue_revision: i64,
    /// The release hash (the frozen setpoints' `spec_hash`).
    pub spec_hash: String,
    pub service_version: String,
    pub method_version: String,
    /// True when a catalogue change would move these values (re-release).
    pub review_due: bool,
    /// The mark: the revision that caused it and since when.
    pub review: Option<ReviewDueView>,
    /// The spec exactly as it was served when released.
    pub spec: SpecResponse,
}

/// A release's frozen setpoints, as the tool or line fetches them.
#[derive(Debug, Serialize, ToSchema)]
pub struct ReleasedSetpoints {
    pub joint_id: String,
    pub release: i64,
    pub status: String,
    pub catalogue_revision: i64,
    pub spec_hash: String,
    pub service_version: String,
    pub method_version: String,
    pub review_due: bool,
    pub review: Option<ReviewDueView>,
    /// The setpoints exactly as they were served when released.
    pub setpoints: SetpointResponse,
}

fn release_view(view: ReleaseView, created: bool) -> HttpResponse {
    let mut b = if created {
        HttpResponse::Created()
    } else {
        HttpResponse::Ok()
    };
    if created {
        b.insert_header((header::LOCATION, view.location()));
    }
    b.insert_header((header::CACHE_CONTROL, "no-cache"))
        .json(view)
}

async fn frozen(
    state: &AppState,
    http: &HttpRequest,
    id: &str,
    q: ReleaseQuery,
    which: FrozenAnswer,
) -> Result<HttpResponse, ApiError> {
    let answer = state.app.released_answer(id, q.release, which).await?;
    let etag = HeaderValue::from_str(&answer.etag)
        .map_err(|e| ApiError::Internal(format!("ETag is not a header value: {e}")))?;
    let no_cache = HeaderValue::from_static("no-cache");
    if not_modified(http.headers(), &answer.etag) {
        return Ok(HttpResponse::NotModified()
            .insert_header((header::ETAG, etag))
            .insert_header((header::CACHE_CONTROL, no_cache))
            .finish());
    }
    Ok(HttpResponse::Ok()
        .insert_header((header::ETAG, etag))
        .insert_header((header::CACHE_CONTROL, no_cache))
        .insert_header((
            header::CONTENT_TYPE,
            HeaderValue::from_static("application/json"),
        ))
        // shared with the kept answer, not copied
        .body(answer.body.clone()))
}

/// The setpoints of a joint's active release (or `?release=N`), from the
/// bytes stored when it was released — never recomputed. 409 when the
/// joint has no active release.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id"), ReleaseQuery),
    responses(
        (status = 200, description = "The frozen setpoints", body = ReleasedSetpoints, headers(("ETag" = String, description = "The release hash with its number and status"))),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 404, description = "No such joint (with near ids) or release"),
        (status = 409, description = "The joint has no active release"),
        (status = 422, description = "Not a joint id or release number"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints/{id}/setpoints")]
async fn released_setpoints(
    state: web::Data<AppState>,
    _who: Reader,
    http: HttpRequest,
    q: Query<ReleaseQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    frozen(&state, &http, &id, q.into_inner(), FrozenAnswer::Setpoints).await
}

/// The spec of a joint's active release (or `?release=N`), from the bytes
/// stored when it was released — never recomputed. 409 when the joint has
/// no active release.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id"), ReleaseQuery),
    responses(
        (status = 200, description = "The frozen spec", body = ReleasedSpec, headers(("ETag" = String, description = "The release hash with its number and status"))),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 404, description = "No such joint (with near ids) or release"),
        (status = 409, description = "The joint has no active release"),
        (status = 422, description = "Not a joint id or release number"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints/{id}/spec")]
async fn released_spec(
    state: web::Data<AppState>,
    _who: Reader,
    http: HttpRequest,
    q: Query<ReleaseQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    frozen(&state, &http, &id, q.into_inner(), FrozenAnswer::Spec).await
}

/// A joint's releases, newest first, each with its status.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id")),
    responses(
        (status = 200, description = "The releases", body = ReleaseList),
        (status = 404, description = "No such joint (with near ids)"),
        (status = 422, description = "Not a joint id"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints/{id}/releases")]
async fn list_releases(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    let releases = state.app.releases(&id).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "no-cache"))
        .json(ReleaseList {
            joint_id: id.into_inner(),
            releases: releases.iter().map(|r| ReleaseView::of(r, None)).collect(),
        }))
}

/// Releases a joint (editor): computes its spec and setpoints at the
/// current catalogue revision with the joint's tool presentation and
/// freezes both answers. Refused (422, listing the checks) while an
/// error-severity check applies that `accept_checks` does not accept by
/// code with a reason. With the four-eyes rule on the release is a
/// `draft` until an approver approves it; otherwise it is `released` at
/// once and the previous active release is `superseded`.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id")),
    request_body = ReleaseWrite,
    security(("bearer" = [])),
    responses(
        (status = 201, description = "Released (or a draft under the four-eyes rule)", body = ReleaseView, headers(("Location" = String, description = "The release's path"))),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not release"),
        (status = 404, description = "No such joint (with near ids)"),
        (status = 422, description = "Bad body, the definition no longer computes, an error check not accepted, or an accepted check that does not apply; nothing written"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/joints/{id}/releases")]
async fn create_release(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let release = state.app.release_joint(&who.0.name, &id, &body).await?;
    Ok(release_view(ReleaseView::of(&release, None), true))
}

/// One release with its status events.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id"), ("n" = i64, Path, description = "The release number")),
    responses(
        (status = 200, description = "The release", body = ReleaseView),
        (status = 404, description = "No such joint or release"),
        (status = 422, description = "Not a joint id or release number"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints/{id}/releases/{n}")]
async fn get_release(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    path: web::Path<(String, i64)>,
) -> Result<HttpResponse, ApiError> {
    let (id, n) = path.into_inner();
    let (release, events) = state.app.release(&id, n).await?;
    Ok(release_view(
        ReleaseView::of(&release, Some(&events)),
        false,
    ))
}

/// Approves a draft release (role approver; not the person who requested
/// it): it becomes the active release and the previous one is superseded.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id"), ("n" = i64, Path, description = "The release number")),
    request_body = StatusWrite,
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Approved: now released", body = ReleaseView),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role is not approver, or the approver requested the release"),
        (status = 404, description = "No such joint or release"),
        (status = 409, description = "The release is not a draft; the problem names its status"),
        (status = 422, description = "Bad body"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/joints/{id}/releases/{n}/approve")]
async fn approve_release(
    state: web::Data<AppState>,
    who: Approver,
    _q: Query<NoQuery>,
    path: web::Path<(String, i64)>,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let (id, n) = path.into_inner();
    let release = state
        .app
        .approve_release(&who.0.name, &id, n, &body)
        .await?;
    Ok(release_view(ReleaseView::of(&release, None), false))
}

/// Withdraws a draft or the active release (editor); it is never active
/// again, and the joint has no active release until the next one.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id"), ("n" = i64, Path, description = "The release number")),
    request_body = StatusWrite,
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Withdrawn", body = ReleaseView),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not withdraw"),
        (status = 404, description = "No such joint or release"),
        (status = 409, description = "The release is superseded or withdrawn; the problem names its status"),
        (status = 422, description = "Bad body"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/joints/{id}/releases/{n}/withdraw")]
async fn withdraw_release(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    path: web::Path<(String, i64)>,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let (id, n) = path.into_inner();
    let release = state
        .app
        .withdraw_release(&who.0.name, &id, n, &body)
        .await?;
    Ok(release_view(ReleaseView::of(&release, None), false))
}
