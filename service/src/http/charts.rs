//! The chart routes: each takes the input of its JSON counterpart and
//! answers `image/svg+xml`, with an ETag (304 on a matching
//! `If-None-Match`) and Cache-Control by the rules of `specs::caching`. Bad
//! input gets the same problem (`application/problem+json`) as the JSON
//! route. The handlers only extract, call one `app` use case and write the
//! picture.

use actix_web::http::header::{CACHE_CONTROL, CONTENT_TYPE, ETAG};
use actix_web::{get, web, HttpRequest, HttpResponse};
use serde::Deserialize;
use utoipa::IntoParams;

use crate::app::charts::{spec_angle_chart, spec_joint_diagram, spec_window_chart, SpecChart};
use crate::app::quantity::Units;
use crate::app::spec::SpecQuery;
use crate::app::AppError;
use crate::http::auth::Reader;
use crate::http::catalogue::wire::NoQuery;
use crate::http::error::ApiError;
use crate::http::extract::{parse_query, Query};
use crate::http::releases::ReleaseQuery;
use crate::http::specs::caching::{cache_control, etag, not_modified, CACHE_UNPINNED};
use crate::http::specs::handlers::snapshot_for;
use crate::http::state::AppState;

/// The media type of every chart.
pub const SVG: &str = "image/svg+xml";

const TAG: &str = "charts";

/// Registers the chart routes (fixed paths first, then those with an id).
pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(window_chart)
        .service(angle_chart)
        .service(joint_diagram)
        .service(release_window_chart)
        .service(friction_test_chart)
        .service(entry_history_chart);
}

/// `?units=si|us`.
#[derive(Debug, Clone, Default, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
#[into_params(parameter_in = Query)]
pub struct ChartUnitsQuery {
    /// `si` (default) or `us`.
    #[param(value_type = Option<String>, pattern = "^(si|us)$")]
    pub units: Option<Units>,
}

/// A picture with its ETag: 304 when a GET's `If-None-Match` names it.
fn picture(http: &HttpRequest, tag: String, cache: &'static str, svg: String) -> HttpResponse {
    if not_modified(http.headers(), &tag) {
        return HttpResponse::NotModified()
            .insert_header((ETAG, tag))
            .insert_header((CACHE_CONTROL, cache))
            .finish();
    }
    HttpResponse::Ok()
        .insert_header((ETAG, tag))
        .insert_header((CACHE_CONTROL, cache))
        .insert_header((CONTENT_TYPE, SVG))
        .body(svg)
}

fn units_tag(u: Units) -> &'static str {
    match u {
        Units::Si => "si",
        Units::Us => "us",
    }
}

/// A spec chart's ETag: the spec's content hash with the chart and units
/// as its presentation (as a spec answer's ETag is made).
fn spec_picture(http: &HttpRequest, kind: &str, chart: SpecChart) -> HttpResponse {
    let tag = etag(
        &chart.content_hash,
        &format!("{kind}|{}", units_tag(chart.units)),
    );
    picture(http, tag, cache_control(chart.pinned), chart.svg)
}

/// The request of a spec chart: the spec GET query, read the same way.
async fn spec_input(
    http: &HttpRequest,
    state: &AppState,
) -> Result<
    (
        crate::app::spec::SpecRequest,
        std::sync::Arc<crate::catalogue::Snapshot>,
    ),
    ApiError,
> {
    let query: SpecQuery = parse_query(http.query_string())?;
    let req = query.to_request().map_err(AppError::Fields)?;
    let snapshot = snapshot_for(state, req.catalogue_revision).await?;
    Ok((req, snapshot))
}

/// The tightening window as a picture: clamp force against torque with
/// the lines at minimum, nominal and maximum friction, the torque window,
/// preload min/max, F_M,zul, the yield-limited torque and the required
/// clamp load when given. Same parameters as `GET /v1/tightening-specs`;
/// axes in SI or US units per `units`.
#[utoipa::path(
    tag = TAG,
    params(SpecQuery),
    responses(
        (status = 200, description = "The chart (SVG); ETag and Cache-Control set", content_type = "image/svg+xml", body = String),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 400, description = "Malformed input or unknown parameter"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant, method or revision, with suggestions"),
        (status = 422, description = "Invalid engineering input; every problem listed"),
    )
)]
#[get("/v1/tightening-specs/chart.svg")]
pub async fn window_chart(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
) -> Result<HttpResponse, ApiError> {
    let (req, snapshot) = spec_input(&http, &state).await?;
    let chart = spec_window_chart(&req, &snapshot)?;
    Ok(spec_picture(&http, "window.svg", chart))
}

/// The torque–angle chart of a spec with an angle window: clamp force
/// against angle from snug (elastic model), the angle window, preload
/// min/max, the preload and angle at yield. Same parameters as
/// `GET /v1/tightening-specs`; a spec without an angle window is 422
/// naming what it lacks (`clamp_length`, `joint_outer_diameter`,
/// `clamped_material` or `snug_torque`).
#[utoipa::path(
    tag = TAG,
    params(SpecQuery),
    responses(
        (status = 200, description = "The chart (SVG); ETag and Cache-Control set", content_type = "image/svg+xml", body = String),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 400, description = "Malformed input or unknown parameter"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant, method or revision, with suggestions"),
        (status = 422, description = "Invalid engineering input, or a spec without an angle window; every problem listed"),
    )
)]
#[get("/v1/tightening-specs/angle-chart.svg")]
pub async fn angle_chart(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
) -> Result<HttpResponse, ApiError> {
    let (req, snapshot) = spec_input(&http, &state).await?;
    let chart = spec_angle_chart(&req, &snapshot)?;
    Ok(spec_picture(&http, "angle.svg", chart))
}

/// The joint diagram of a spec in its working state: force against
/// deformation, the bolt line (slope 1/δ_S) and the clamped-part line
/// (slope 1/δ_P) with F_M,min, F_Z, F_A, F_SA and F_KR,min as the spec's
/// `joint` block states them. Same parameters as
/// `GET /v1/tightening-specs`; a spec without a joint model under an axial
/// load is 422 naming what it lacks (`clamp_length`, `loads_axial`).
#[utoipa::path(
    tag = TAG,
    params(SpecQuery),
    responses(
        (status = 200, description = "The chart (SVG); ETag and Cache-Control set", content_type = "image/svg+xml", body = String),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 400, description = "Malformed input or unknown parameter"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant, method or revision, with suggestions"),
        (status = 422, description = "Invalid engineering input, or a spec without a joint model under an axial load; every problem listed"),
    )
)]
#[get("/v1/tightening-specs/joint-diagram.svg")]
pub async fn joint_diagram(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
) -> Result<HttpResponse, ApiError> {
    let (req, snapshot) = spec_input(&http, &state).await?;
    let chart = spec_joint_diagram(&req, &snapshot)?;
    Ok(spec_picture(&http, "joint-diagram.svg", chart))
}

/// The tightening window of a joint's active release (or release N) as a
/// picture: the same chart as `GET /v1/tightening-specs/chart.svg`, drawn
/// from the joint's request at the release's catalogue revision with the
/// very values the release stored (`GET /v1/joints/{id}/spec`). The ETag
/// is made of the release hash, number, status and review mark.
#[utoipa::path(
    tag = TAG,
    params(("id" = String, Path, description = "Joint id"), ReleaseQuery),
    responses(
        (status = 200, description = "The chart (SVG); ETag and Cache-Control set", content_type = "image/svg+xml", body = String),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 404, description = "No such joint (with suggestions) or release"),
        (status = 409, description = "The joint has no active release, or the release cannot be redrawn"),
        (status = 422, description = "A release number below 1"),
    )
)]
#[get("/v1/joints/{id}/chart.svg")]
pub async fn release_window_chart(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    id: web::Path<String>,
    q: Query<ReleaseQuery>,
) -> Result<HttpResponse, ApiError> {
    let chart = state
        .app
        .release_window_chart(&id, q.into_inner().release)
        .await?;
    Ok(picture(&http, chart.etag, "no-cache", chart.svg))
}

/// A stored friction test series as a picture: each specimen's torque
/// (total, and thread torque where measured) against clamp force with the
/// evaluation clamp force, and μ_th, μ_b, μ_tot per specimen with
/// mean ± 3σ. A stored series never changes, so its chart may be kept.
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Series id"), ChartUnitsQuery),
    responses(
        (status = 200, description = "The chart (SVG); ETag and Cache-Control set", content_type = "image/svg+xml", body = String),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 404, description = "No such series"),
    )
)]
#[get("/v1/friction-tests/{id}/chart.svg")]
pub async fn friction_test_chart(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    id: web::Path<i64>,
    q: Query<ChartUnitsQuery>,
) -> Result<HttpResponse, ApiError> {
    let svg = state
        .app
        .friction_test_chart(id.into_inner(), q.units.unwrap_or_default())
        .await?;
    let tag = etag(&svg, "friction-test.svg");
    Ok(picture(&http, tag, cache_control(true), svg))
}

/// A catalogue friction entry's thread and bearing friction ranges over
/// its revisions, as a picture (the JSON is
/// `GET /v1/friction-entries/{id}/history`).
#[utoipa::path(
    tag = TAG,
    params(("id" = i64, Path, description = "Entry id")),
    responses(
        (status = 200, description = "The chart (SVG); ETag and Cache-Control set", content_type = "image/svg+xml", body = String),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 404, description = "No such entry"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/friction-entries/{id}/history.svg")]
pub async fn entry_history_chart(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    _q: Query<NoQuery>,
    id: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let svg = state.app.entry_history_chart(id.into_inner()).await?;
    let tag = etag(&svg, "entry-history.svg");
    Ok(picture(&http, tag, CACHE_UNPINNED, svg))
}
