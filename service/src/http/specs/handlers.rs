//! Thin handlers: extract the query or body, fetch the catalogue snapshot,
//! call the spec use case (`app::spec`), write its view as JSON with ETag
//! and Cache-Control. GET look-ups go
//! through the route's answer cache ([`super::answer_cache`]).

use std::sync::Arc;

use actix_web::http::header::{HeaderValue, CACHE_CONTROL, CONTENT_TYPE, ETAG};
use actix_web::{get, post, web, HttpRequest, HttpResponse};
use serde::Serialize;

use crate::app::quantity::Units;
use crate::app::spec::setpoints::setpoints;
use crate::app::spec::view::{spec_response, SetpointResponse, SpecResponse};
use crate::app::spec::{compute_one, SetpointQuery, SpecQuery, SpecRequest};
use crate::app::AppError;
use crate::catalogue::Snapshot;
use crate::http::auth::Reader;
use crate::http::error::ApiError;
use crate::http::extract::parse_query;
use crate::http::metrics::CachedRoute;
use crate::http::state::AppState;

use super::answer_cache::Rendered;
use super::caching::{cache_control, etag, not_modified};

/// The catalogue snapshot a request is answered from: the live one, or the
/// pinned revision (held in memory, else read from the store).
pub async fn snapshot_for(
    state: &AppState,
    revision: Option<i64>,
) -> Result<Arc<Snapshot>, ApiError> {
    Ok(crate::app::spec::snapshot::pinned(&state.app, revision).await?)
}

fn units_tag(u: Units) -> &'static str {
    match u {
        Units::Si => "si",
        Units::Us => "us",
    }
}

/// Room for one spec's JSON (about 5 KB in SI, a little more in US units),
/// so the buffer is not grown and copied while it is written.
pub const SPEC_JSON_CAPACITY: usize = 8 * 1024;

/// A response body as JSON bytes, written into a buffer of `capacity`.
pub fn json_bytes<T: Serialize>(body: &T, capacity: usize) -> Result<Vec<u8>, ApiError> {
    let mut buf = Vec::with_capacity(capacity);
    serde_json::to_writer(&mut buf, body)
        .map_err(|e| ApiError::Internal(format!("response could not be written as JSON: {e}")))?;
    Ok(buf)
}

/// Content type of spec and setpoint answers.
const JSON: &str = "application/json";

/// A rendered answer as a response: 304 when a GET's `If-None-Match` names
/// its ETag, else 200 with the JSON body.
fn respond(http: &HttpRequest, answer: &Rendered) -> HttpResponse {
    let cc = HeaderValue::from_static(cache_control(answer.pinned));
    let get = http.method() == actix_web::http::Method::GET;
    if get && not_modified(http.headers(), answer.etag.to_str().unwrap_or_default()) {
        return HttpResponse::NotModified()
            .insert_header((ETAG, answer.etag.clone()))
            .insert_header((CACHE_CONTROL, cc))
            .finish();
    }
    HttpResponse::Ok()
        .insert_header((ETAG, answer.etag.clone()))
        .insert_header((CACHE_CONTROL, cc))
        .insert_header((CONTENT_TYPE, HeaderValue::from_static(JSON)))
        .body(answer.body.clone())
}

/// The catalogue state an answer is computed under: the live revision and
/// the may-be-stale flag, read once so that the answer's body and its cache
/// entry agree.
#[derive(Debug, Clone, Copy)]
struct Served {
    revision: i64,
    stale: bool,
}

impl Served {
    fn now(state: &AppState) -> Self {
        Self {
            revision: state.app.revision(),
            stale: state.app.stale(),
        }
    }

    /// An answer's ETag and body as a [`Rendered`] of this state. A pinned
    /// look-up is answered from another revision but kept under the live
    /// one, like every other entry.
    fn rendered(self, pinned: bool, tag: String, mut body: Vec<u8>) -> Result<Rendered, ApiError> {
        // The answer may be kept: hold only its bytes, not the whole buffer
        // it was written into (glibc shrinks in place).
        body.shrink_to_fit();
        let etag = HeaderValue::try_from(tag)
            .map_err(|e| ApiError::Internal(format!("ETag is not a header value: {e}")))?;
        Ok(Rendered {
            revision: self.revision,
            stale: self.stale,
            pinned,
            etag,
            body: body.into(),
        })
    }
}

/// A GET look-up through the route's answer cache: a kept answer for the
/// same query string, catalogue revision and stale flag is sent as it is;
/// otherwise `compute` answers it and a successful answer is kept.
async fn look_up<F, Fut>(
    http: &HttpRequest,
    state: &AppState,
    route: CachedRoute,
    compute: F,
) -> Result<HttpResponse, ApiError>
where
    F: FnOnce(Served) -> Fut,
    Fut: std::future::Future<Output = Result<Rendered, ApiError>>,
{
    let cache = match route {
        CachedRoute::Spec => &state.spec_answers,
        CachedRoute::Setpoints => &state.setpoint_answers,
    };
    let query = http.query_string();
    let served = Served::now(state);
    let hit = cache.get(query, served.revision, served.stale);
    state.metrics.answer_cache_lookup(route, hit.is_some());
    if let Some(answer) = hit {
        return Ok(respond(http, &answer));
    }
    let answer = Arc::new(compute(served).await?);
    cache.put(query, Arc::clone(&answer));
    Ok(respond(http, &answer))
}

/// The rendered answer of one spec request.
async fn spec_answer(
    state: &AppState,
    served: Served,
    req: &SpecRequest,
) -> Result<Rendered, ApiError> {
    let snapshot = snapshot_for(state, req.catalogue_revision).await?;
    let (resolved, spec) = compute_one(req, &snapshot)?;
    let tag = etag(&resolved.content_hash, units_tag(resolved.units));
    let body = spec_response(&spec, &resolved, served.stale);
    let body = json_bytes(&body, SPEC_JSON_CAPACITY)?;
    served.rendered(resolved.pinned, tag, body)
}

/// A tightening specification from query parameters (cacheable).
///
/// Friction: `thread_friction=0.12` or `thread_friction_min=…&thread_friction_max=…`
/// (same for `bearing_friction`); given, they replace the catalogue values.
/// Dimensional parameters carry their unit (`clamp_length=40mm`). Unknown
/// parameters are refused with 400.
#[utoipa::path(
    tag = "specs",
    params(SpecQuery),
    responses(
        (status = 200, description = "The spec; ETag and Cache-Control set", body = SpecResponse),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 400, description = "Malformed input or unknown parameter"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant, method or revision, with suggestions"),
        (status = 422, description = "Invalid engineering input; every problem listed"),
    )
)]
#[get("/v1/tightening-specs")]
pub async fn get_spec(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
) -> Result<HttpResponse, ApiError> {
    let (http, state) = (&http, &state);
    look_up(http, state, CachedRoute::Spec, |served| async move {
        let query: SpecQuery = parse_query(http.query_string())?;
        let req = query.to_request().map_err(AppError::Fields)?;
        spec_answer(state, served, &req).await
    })
    .await
}

/// A tightening specification from a JSON body with the full set of options.
#[utoipa::path(
    tag = "specs",
    request_body = SpecRequest,
    responses(
        (status = 200, description = "The spec", body = SpecResponse),
        (status = 400, description = "Malformed body or unknown field"),
        (status = 404, description = "Unknown name, with suggestions"),
        (status = 413, description = "Body over the limit"),
        (status = 415, description = "Body is not JSON"),
        (status = 422, description = "Invalid engineering input; every problem listed"),
    )
)]
#[post("/v1/tightening-specs")]
pub async fn post_spec(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    body: web::Json<SpecRequest>,
) -> Result<HttpResponse, ApiError> {
    let answer = spec_answer(&state, Served::now(&state), &body).await?;
    Ok(respond(&http, &answer))
}

/// Tool setpoints: torque window in the tool's unit, rounded to its
/// resolution without ever leaving the window (lower rounds up, upper
/// rounds down, target to the nearest step inside), for torque-angle the
/// snug torque and angle window, for torque-angle and yield-controlled
/// tightening the torques as a monitoring band (`controls`, `torque_role`),
/// the catalogue revision and the spec hash, every check and every caution that applies. Same parameters
/// as `GET /v1/tightening-specs` plus `torque_unit`, `resolution`,
/// `angle_resolution` and `accept_checks`. While an error-severity check
/// applies, the setpoints are refused (422, `/problems/checks-not-accepted`,
/// listing the checks) unless `accept_checks` names each of them.
#[utoipa::path(
    tag = "specs",
    params(SetpointQuery),
    responses(
        (status = 200, description = "The setpoints; ETag and Cache-Control set", body = SetpointResponse),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 400, description = "Malformed input or unknown parameter"),
        (status = 404, description = "Unknown name, with suggestions"),
        (status = 422, description = "Invalid input, no step of the resolution inside the window, or an error check applies that `accept_checks` does not name (the problem lists the checks)"),
    )
)]
#[get("/v1/setpoints")]
pub async fn get_setpoints(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
) -> Result<HttpResponse, ApiError> {
    let (http, state) = (&http, &state);
    look_up(http, state, CachedRoute::Setpoints, |served| async move {
        let query: SetpointQuery = parse_query(http.query_string())?;
        setpoint_answer(state, served, &query).await
    })
    .await
}

/// The rendered answer of one setpoint query.
async fn setpoint_answer(
    state: &AppState,
    served: Served,
    query: &SetpointQuery,
) -> Result<Rendered, ApiError> {
    let (req, tool) = query.read()?;
    let snapshot = snapshot_for(state, req.catalogue_revision).await?;
    let (resolved, spec) = compute_one(&req, &snapshot)?;
    let presentation = format!(
        "setpoints|{}|{:?}|{:?}|{}",
        tool.unit.symbol(),
        tool.resolution,
        tool.angle_resolution,
        tool.accept.join(",")
    );
    let tag = etag(&resolved.content_hash, &presentation);
    let body = setpoints(&spec, &resolved, &tool, served.stale)?;
    let body = json_bytes(&body, SPEC_JSON_CAPACITY)?;
    served.rendered(resolved.pinned, tag, body)
}
