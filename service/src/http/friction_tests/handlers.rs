//! Thin handlers: extract, call one `app::friction_tests` use case,
//! render (status, `Location`, `ETag`).

use crate::http::extract::Query;
use actix_web::http::header;
use actix_web::{get, post, web, HttpRequest, HttpResponse};
use serde::Deserialize;
use utoipa::{IntoParams, ToSchema};

use crate::app::friction_tests::wire::{EvaluationResponse, SeriesRequest};
use crate::app::friction_tests::{ApplyResponse, ProposalResponse, StoredSeriesResponse};
use crate::app::quantity::Units;
use crate::http::auth::{Editor, Reader};
use crate::http::catalogue::if_match;
use crate::http::error::ApiError;
use crate::http::state::AppState;

const TAG: &str = "friction-tests";

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(evaluate)
        .service(record)
        .service(get_series)
        .service(get_proposal)
        .service(apply);
}

/// `?units=si|us`.
#[derive(Debug, Clone, Default, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
#[into_params(parameter_in = Query)]
struct UnitsQuery {
    /// `si` (default) or `us`.
    #[param(value_type = Option<String>, pattern = "^(si|us)$")]
    pub units: Option<Units>,
}

/// `?basis=observed|three_sigma`.
#[derive(Debug, Clone, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
#[into_params(parameter_in = Query)]
pub struct ProposalQuery {
    /// `observed` (min to max of the series) or `three_sigma` (mean ± 3σ).
    #[param(pattern = "^(observed|three_sigma)$")]
    pub basis: Option<String>,
}

/// Body of an apply: which basis, and why.
#[derive(Debug, Clone, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ApplyRequest {
    /// `observed` or `three_sigma`.
    pub basis: Option<String>,
    /// Why the catalogue changes; recorded in its history.
    pub reason: Option<String>,
}

/// Evaluates a torque–tension test series (ISO 16047 method): every
/// specimen's coefficients and the series statistics. Nothing is stored.
#[utoipa::path(
    tag = TAG,
    params(UnitsQuery),
    request_body = SeriesRequest,
    responses(
        (status = 200, description = "The evaluation", body = EvaluationResponse),
        (status = 400, description = "Malformed body"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant or head"),
        (status = 422, description = "Every bad specimen field listed"),
    )
)]
#[post("/v1/friction-tests/evaluate")]
async fn evaluate(
    _who: Reader,
    state: web::Data<AppState>,
    q: Query<UnitsQuery>,
    body: web::Json<SeriesRequest>,
) -> Result<HttpResponse, ApiError> {
    let answer = state
        .app
        .evaluate_series(&body, q.units.unwrap_or_default())?;
    Ok(HttpResponse::Ok().json(answer))
}

/// Stores a series and its evaluation as evidence (editor). A stored
/// series never changes. Needs `finish` and `lubricant`.
#[utoipa::path(
    tag = TAG,
    request_body = SeriesRequest,
    responses(
        (status = 201, description = "Stored", body = StoredSeriesResponse, headers(("Location" = String, description = "The stored series"))),
        (status = 401, description = "No or invalid token"),
        (status = 403, description = "Role may not store"),
        (status = 404, description = "Unknown name"),
        (status = 422, description = "Invalid series; nothing stored"),
    )
)]
#[post("/v1/friction-tests")]
async fn record(
    who: Editor,
    state: web::Data<AppState>,
    body: web::Json<SeriesRequest>,
) -> Result<HttpResponse, ApiError> {
    let stored = state.app.record_series(&who.0.name, &body).await?;
    Ok(HttpResponse::Created()
        .insert_header((
            header::LOCATION,
            format!("/v1/friction-tests/{}", stored.id),
        ))
        .json(stored))
}

/// A stored series with its evaluation and the catalogue revisions made from it.
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Series id")),
    responses(
        (status = 200, description = "The stored series", body = StoredSeriesResponse),
        (status = 404, description = "No such series"),
    )
)]
#[get("/v1/friction-tests/{id}")]
async fn get_series(
    _who: Reader,
    state: web::Data<AppState>,
    id: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let stored = state.app.stored_series(id.into_inner()).await?;
    Ok(HttpResponse::Ok().json(stored))
}

/// The catalogue change a stored series supports: new ranges for the
/// matching friction entry (observed range or mean ± 3σ), the diff, and its
/// impact on every joint with an active release (as
/// `POST /v1/catalogue/impact` answers for this test and basis; each
/// joint's figures in its own tool unit). Writes nothing.
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Series id"), ProposalQuery),
    responses(
        (status = 200, description = "The proposal", body = ProposalResponse),
        (status = 404, description = "No such series, or no matching entry"),
        (status = 422, description = "Basis missing or not possible for this series"),
    )
)]
#[get("/v1/friction-tests/{id}/proposal")]
async fn get_proposal(
    _who: Reader,
    state: web::Data<AppState>,
    id: web::Path<i64>,
    q: Query<ProposalQuery>,
) -> Result<HttpResponse, ApiError> {
    let proposal = state
        .app
        .series_proposal(id.into_inner(), q.basis.as_deref())
        .await?;
    Ok(HttpResponse::Ok().json(proposal))
}

/// Applies the proposal (editor): one catalogue revision changing the
/// matching entry, with the series recorded as its evidence. Needs
/// `If-Match` with the entry's ETag (from the proposal or the entry).
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Series id"), ("If-Match" = String, Header, description = "ETag of the friction entry")),
    request_body = ApplyRequest,
    responses(
        (status = 200, description = "Applied: the new revision and entry", body = ApplyResponse),
        (status = 401, description = "No or invalid token"),
        (status = 403, description = "Role may not change the catalogue"),
        (status = 404, description = "No such series, or no matching entry"),
        (status = 412, description = "The entry changed since its ETag was read"),
        (status = 422, description = "Basis or reason missing or invalid"),
        (status = 428, description = "If-Match missing"),
    )
)]
#[post("/v1/friction-tests/{id}/apply")]
async fn apply(
    who: Editor,
    state: web::Data<AppState>,
    id: web::Path<i64>,
    req: HttpRequest,
    body: web::Json<ApplyRequest>,
) -> Result<HttpResponse, ApiError> {
    let pending = state
        .app
        .prepare_apply(
            id.into_inner(),
            body.basis.as_deref(),
            body.reason.as_deref(),
        )
        .await?;
    let expected = if_match(req.headers(), &format!("entry-{}", pending.entry_id()))?;
    let applied = state
        .app
        .apply_series(&who.0.name, pending, expected)
        .await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::ETAG, applied.entry_etag.clone()))
        .json(applied))
}
