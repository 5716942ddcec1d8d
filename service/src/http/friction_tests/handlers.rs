//! Thin handlers: parse and evaluate (the engine, through `super::run`),
//! keep and apply series through the `app` use cases, render.

use crate::http::extract::Query;
use actix_web::http::header;
use actix_web::{get, post, web, HttpRequest, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::{IntoParams, ToSchema};

use super::proposal::{self, ProposalResponse, Proposed};
use super::units::Units;
use super::wire::{EvaluationResponse, SeriesRequest};
use crate::app::catalogue::Author;
use crate::app::friction_tests::SeriesChange;
use crate::app::AppError;
use crate::catalogue::{FrictionEntry, Snapshot};
use crate::engine::calibration::proposal::Basis;
use crate::http::auth::{Editor, Reader};
use crate::http::catalogue::if_match;
use crate::http::error::{ApiError, FieldError, Problem};
use crate::http::state::AppState;
use crate::store::friction_series::{evidence, NewSeries, SeriesApplication, StoredSeries};

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

/// `?basis=observed|three_sigma&units=si|us`.
#[derive(Debug, Clone, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
#[into_params(parameter_in = Query)]
pub struct ProposalQuery {
    /// `observed` (min to max of the series) or `three_sigma` (mean ± 3σ).
    #[param(pattern = "^(observed|three_sigma)$")]
    pub basis: Option<String>,
    /// `si` (default) or `us`.
    #[param(value_type = Option<String>, pattern = "^(si|us)$")]
    pub units: Option<Units>,
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

/// A stored series: the series as posted, its evaluation as answered
/// (SI units) and the catalogue revisions made from it.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct StoredSeriesResponse {
    pub id: i64,
    pub created_at: String,
    /// Name of the token that stored it.
    pub actor: String,
    /// Catalogue revision current when it was stored.
    pub catalogue_revision: i64,
    /// Recorded with every catalogue revision made from this series.
    pub evidence: String,
    pub series: SeriesRequest,
    pub evaluation: EvaluationResponse,
    pub applications: Vec<SeriesApplication>,
}

/// The answer to an apply.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct ApplyResponse {
    pub series_id: i64,
    pub catalogue_revision: i64,
    pub evidence: String,
    pub entry: FrictionEntry,
    pub entry_etag: String,
}

fn check_names(snap: &Snapshot, req: &SeriesRequest) -> Result<(), ApiError> {
    if let Some(f) = &req.finish {
        snap.finish(f).map_err(AppError::from)?;
    }
    if let Some(l) = &req.lubricant {
        snap.lubricant(l).map_err(AppError::from)?;
    }
    Ok(())
}

fn basis(b: Option<&str>) -> Result<Basis, ApiError> {
    match b {
        None => Err(ApiError::invalid(
            "basis",
            "missing: choose observed (min to max of the series) or three_sigma (mean ± 3σ)",
        )),
        Some(b) => Ok(Basis::parse(b)?),
    }
}

/// Evaluates a torque–tension test series (ISO 16047 method): every
/// specimen's coefficients and the series statistics. Nothing is stored.
#[utoipa::path(
    tag = TAG,
    params(UnitsQuery),
    request_body = SeriesRequest,
    responses(
        (status = 200, description = "The evaluation", body = EvaluationResponse),
        (status = 400, description = "Malformed body", body = Problem, content_type = "application/problem+json"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant or head", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Every bad specimen field listed", body = Problem, content_type = "application/problem+json"),
    )
)]
#[post("/v1/friction-tests/evaluate")]
async fn evaluate(
    _who: Reader,
    state: web::Data<AppState>,
    q: Query<UnitsQuery>,
    body: web::Json<SeriesRequest>,
) -> Result<HttpResponse, ApiError> {
    check_names(&state.app.current(), &body)?;
    let answer = super::evaluate(&body, q.units.unwrap_or_default())?;
    Ok(HttpResponse::Ok().json(answer))
}

fn stored_response(
    s: &StoredSeries,
    applications: Vec<SeriesApplication>,
) -> Result<StoredSeriesResponse, ApiError> {
    let corrupt = |e: serde_json::Error| {
        ApiError::Internal(format!("stored friction test {} unreadable: {e}", s.id))
    };
    Ok(StoredSeriesResponse {
        id: s.id,
        created_at: s.created_at.to_rfc3339(),
        actor: s.actor.clone(),
        catalogue_revision: s.catalogue_revision,
        evidence: evidence(s.id),
        series: serde_json::from_str(&s.series_json).map_err(corrupt)?,
        evaluation: serde_json::from_str(&s.evaluation_json).map_err(corrupt)?,
        applications,
    })
}

/// Stores a series and its evaluation as evidence (editor). A stored
/// series never changes. Needs `finish` and `lubricant`.
#[utoipa::path(
    tag = TAG,
    request_body = SeriesRequest,
    responses(
        (status = 201, description = "Stored", body = StoredSeriesResponse, headers(("Location" = String, description = "The stored series"))),
        (status = 401, description = "No or invalid token", body = Problem, content_type = "application/problem+json"),
        (status = 403, description = "Role may not store", body = Problem, content_type = "application/problem+json"),
        (status = 404, description = "Unknown name", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Invalid series; nothing stored", body = Problem, content_type = "application/problem+json"),
    )
)]
#[post("/v1/friction-tests")]
async fn record(
    who: Editor,
    state: web::Data<AppState>,
    body: web::Json<SeriesRequest>,
) -> Result<HttpResponse, ApiError> {
    let req = body.into_inner();
    let missing: Vec<FieldError> = [("finish", &req.finish), ("lubricant", &req.lubricant)]
        .into_iter()
        .filter(|(_, v)| v.as_deref().is_none_or(|s| s.trim().is_empty()))
        .map(|(f, _)| {
            FieldError::new(
                f,
                "missing: a stored series must name the catalogue finish and lubricant it tested",
            )
        })
        .collect();
    if !missing.is_empty() {
        return Err(ApiError::unprocessable(missing));
    }
    let snap = state.app.current();
    check_names(&snap, &req)?;
    let evaluation = super::evaluate(&req, Units::Si)?;
    let new = NewSeries {
        actor: who.0.name.clone(),
        thread: evaluation.thread.clone(),
        property_class: evaluation.property_class.clone(),
        finish: req.finish.clone().unwrap_or_default(),
        lubricant: req.lubricant.clone().unwrap_or_default(),
        catalogue_revision: snap.revision,
        series_json: to_json(&req)?,
        evaluation_json: to_json(&evaluation)?,
    };
    let stored = state.app.record_series(&new).await?;
    let body = stored_response(&stored, Vec::new())?;
    Ok(HttpResponse::Created()
        .insert_header((
            header::LOCATION,
            format!("/v1/friction-tests/{}", stored.id),
        ))
        .json(body))
}

fn to_json<T: Serialize>(v: &T) -> Result<String, ApiError> {
    serde_json::to_string(v)
        .map_err(|e| ApiError::Internal(format!("serialising a friction test: {e}")))
}

/// A stored series with its evaluation and the catalogue revisions made from it.
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Series id")),
    responses(
        (status = 200, description = "The stored series", body = StoredSeriesResponse),
        (status = 404, description = "No such series", body = Problem, content_type = "application/problem+json"),
    )
)]
#[get("/v1/friction-tests/{id}")]
async fn get_series(
    _who: Reader,
    state: web::Data<AppState>,
    id: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let id = id.into_inner();
    let stored = state.app.stored_series(id).await?;
    let apps = state.app.series_applications(id).await?;
    Ok(HttpResponse::Ok().json(stored_response(&stored, apps)?))
}

/// Re-evaluates a stored series (the engine is deterministic) and builds
/// the proposal against the current catalogue.
async fn proposal_for(
    state: &AppState,
    id: i64,
    basis: Basis,
    units: Units,
) -> Result<Proposed, ApiError> {
    let stored = state.app.stored_series(id).await?;
    let req: SeriesRequest = serde_json::from_str(&stored.series_json)
        .map_err(|e| ApiError::Internal(format!("stored friction test {id} unreadable: {e}")))?;
    let (_, eval) = super::run(&req)?;
    let snap = state.app.current();
    proposal::build(
        &snap,
        id,
        &stored.finish,
        &stored.lubricant,
        &eval.statistics,
        eval.specimens.len(),
        basis,
        units,
    )
}

/// The catalogue change a stored series supports: new ranges for the
/// matching friction entry (observed range or mean ± 3σ), the diff, and how
/// the specs of M8/M10/M12 8.8 joints would move.
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Series id"), ProposalQuery),
    responses(
        (status = 200, description = "The proposal", body = ProposalResponse),
        (status = 404, description = "No such series, or no matching entry", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Basis missing or not possible for this series", body = Problem, content_type = "application/problem+json"),
    )
)]
#[get("/v1/friction-tests/{id}/proposal")]
async fn get_proposal(
    _who: Reader,
    state: web::Data<AppState>,
    id: web::Path<i64>,
    q: Query<ProposalQuery>,
) -> Result<HttpResponse, ApiError> {
    let b = basis(q.basis.as_deref())?;
    let p = proposal_for(&state, id.into_inner(), b, q.units.unwrap_or_default()).await?;
    Ok(HttpResponse::Ok().json(p.response))
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
        (status = 401, description = "No or invalid token", body = Problem, content_type = "application/problem+json"),
        (status = 403, description = "Role may not change the catalogue", body = Problem, content_type = "application/problem+json"),
        (status = 404, description = "No such series, or no matching entry", body = Problem, content_type = "application/problem+json"),
        (status = 412, description = "The entry changed since its ETag was read", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Basis or reason missing or invalid", body = Problem, content_type = "application/problem+json"),
        (status = 428, description = "If-Match missing", body = Problem, content_type = "application/problem+json"),
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
    let id = id.into_inner();
    let mut problems = Vec::new();
    let reason = body.reason.as_deref().map(str::trim).unwrap_or("");
    if reason.is_empty() {
        problems.push(FieldError::new(
            "reason",
            "missing: say why the catalogue changes",
        ));
    }
    let b = match basis(body.basis.as_deref()) {
        Ok(b) => Some(b),
        Err(ApiError::Unprocessable { errors, .. }) => {
            problems.extend(errors);
            None
        }
        Err(e) => return Err(e),
    };
    let Some(b) = b.filter(|_| problems.is_empty()) else {
        return Err(ApiError::unprocessable(problems));
    };
    let p = proposal_for(&state, id, b, Units::Si).await?;
    let entry_id = p.response.entry_id;
    let expected = if_match(req.headers(), &format!("entry-{entry_id}"))?;
    let by = Author {
        actor: &who.0.name,
        reason,
    };
    let change = SeriesChange {
        series_id: id,
        basis: b.as_str().into(),
        entry_id,
        expected_revision: expected,
        entry: p.entry,
    };
    let applied = state.app.apply_series(by, change).await?;
    let entry = applied.value;
    let etag = entry.etag();
    Ok(HttpResponse::Ok()
        .insert_header((header::ETAG, etag.clone()))
        .json(ApplyResponse {
            series_id: id,
            catalogue_revision: applied.revision,
            evidence: evidence(id),
            entry,
            entry_etag: etag,
        }))
}
