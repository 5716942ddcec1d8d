//! Thin handlers: fetch the catalogue snapshot, run the shared parse step
//! and the engine, render with ETag and Cache-Control.

use crate::http::extract::Query;
use std::collections::hash_map::Entry;
use std::collections::HashMap;
use std::sync::Arc;

use actix_web::http::header::{CACHE_CONTROL, ETAG};
use actix_web::{get, post, web, HttpRequest, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use crate::catalogue::Snapshot;
use crate::engine::spec::{compute, Spec};
use crate::http::auth::Reader;
use crate::http::error::{ApiError, Problem};
use crate::http::quantity::{TorqueUnit, Units};
use crate::http::state::AppState;

use super::caching::{cache_control, etag, not_modified};
use super::item_error::{ItemError, ItemErrors};
use super::request::{SetpointQuery, SpecQuery, SpecRequest};
use super::resolve::{from_engine, resolve, Resolved};
use super::response::{spec_response, SpecResponse};
use super::setpoints::{setpoints, SetpointResponse};

/// Most items one batch may hold.
pub const BATCH_MAX_ITEMS: usize = 10_000;

/// The catalogue snapshot a request is answered from: the live one, or the
/// pinned revision (held in memory, else read from the store).
pub async fn snapshot_for(
    state: &AppState,
    revision: Option<i64>,
) -> Result<Arc<Snapshot>, ApiError> {
    let current = state.snapshot();
    let Some(r) = revision else {
        return Ok(current);
    };
    if r == current.revision {
        return Ok(current);
    }
    if r < 1 {
        return Err(ApiError::invalid(
            "catalogue_revision",
            format!("catalogue revisions start at 1, got {r}"),
        ));
    }
    state.catalogue_service.snapshot(Some(r)).await
}

/// Resolve and compute one request against a snapshot.
pub fn compute_one(req: &SpecRequest, snapshot: &Snapshot) -> Result<(Resolved, Spec), ItemErrors> {
    let resolved = resolve(req, snapshot)?;
    let spec = compute(&resolved.input).map_err(|e| ItemErrors::from(from_engine(e)))?;
    Ok((resolved, spec))
}

fn units_tag(u: Units) -> &'static str {
    match u {
        Units::Si => "si",
        Units::Us => "us",
    }
}

/// 200 with ETag and Cache-Control, or (for GET) 304 when `If-None-Match`
/// matches. POST answers carry the ETag too but are never 304 (RFC 9110
/// §13.1.2 reserves 304 for GET and HEAD).
fn cached<T: Serialize>(
    http: &HttpRequest,
    tag: String,
    pinned: bool,
    body: impl FnOnce() -> Result<T, ItemErrors>,
) -> Result<HttpResponse, ApiError> {
    let cc = cache_control(pinned);
    let get = http.method() == actix_web::http::Method::GET;
    if get && not_modified(http.headers(), &tag) {
        return Ok(HttpResponse::NotModified()
            .insert_header((ETAG, tag))
            .insert_header((CACHE_CONTROL, cc))
            .finish());
    }
    let body = body()?;
    Ok(HttpResponse::Ok()
        .insert_header((ETAG, tag))
        .insert_header((CACHE_CONTROL, cc))
        .json(body))
}

async fn spec_for(
    http: &HttpRequest,
    state: &AppState,
    req: &SpecRequest,
) -> Result<HttpResponse, ApiError> {
    let snapshot = snapshot_for(state, req.catalogue_revision).await?;
    let (resolved, spec) = compute_one(req, &snapshot)?;
    let stale = state.catalogue.is_stale();
    let tag = etag(&resolved.content_hash, units_tag(resolved.units));
    cached(http, tag, resolved.pinned, || {
        Ok(spec_response(&spec, &resolved, stale))
    })
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
        (status = 400, description = "Malformed input or unknown parameter", body = Problem, content_type = "application/problem+json"),
        (status = 404, description = "Unknown thread, grade, finish, lubricant, method or revision, with suggestions", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Invalid engineering input; every problem listed", body = Problem, content_type = "application/problem+json"),
    )
)]
#[get("/v1/tightening-specs")]
pub async fn get_spec(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    query: Query<SpecQuery>,
) -> Result<HttpResponse, ApiError> {
    let req = query.to_request().map_err(ItemErrors::from)?;
    spec_for(&http, &state, &req).await
}

/// A tightening specification from a JSON body with the full set of options.
#[utoipa::path(
    tag = "specs",
    request_body = SpecRequest,
    responses(
        (status = 200, description = "The spec", body = SpecResponse),
        (status = 400, description = "Malformed body or unknown field", body = Problem, content_type = "application/problem+json"),
        (status = 404, description = "Unknown name, with suggestions", body = Problem, content_type = "application/problem+json"),
        (status = 413, description = "Body over the limit", body = Problem, content_type = "application/problem+json"),
        (status = 415, description = "Body is not JSON", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Invalid engineering input; every problem listed", body = Problem, content_type = "application/problem+json"),
    )
)]
#[post("/v1/tightening-specs")]
pub async fn post_spec(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    body: web::Json<SpecRequest>,
) -> Result<HttpResponse, ApiError> {
    spec_for(&http, &state, &body).await
}

/// Tool setpoints: torque window in the tool's unit, rounded to its
/// resolution without ever leaving the window (lower rounds up, upper
/// rounds down, target to the nearest step inside), the angle window for
/// angle- and yield-controlled methods, the catalogue revision and the
/// spec hash. Same parameters as `GET /v1/tightening-specs` plus
/// `torque_unit`, `resolution` and `angle_resolution`.
#[utoipa::path(
    tag = "specs",
    params(SetpointQuery),
    responses(
        (status = 200, description = "The setpoints; ETag and Cache-Control set", body = SetpointResponse),
        (status = 304, description = "Not modified (If-None-Match matched)"),
        (status = 400, description = "Malformed input or unknown parameter", body = Problem, content_type = "application/problem+json"),
        (status = 404, description = "Unknown name, with suggestions", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "Invalid input, or no step of the resolution inside the window", body = Problem, content_type = "application/problem+json"),
    )
)]
#[get("/v1/setpoints")]
pub async fn get_setpoints(
    _reader: Reader,
    http: HttpRequest,
    state: web::Data<AppState>,
    query: Query<SetpointQuery>,
) -> Result<HttpResponse, ApiError> {
    let mut problems: Vec<ItemError> = Vec::new();
    let unit = match query.torque_unit.as_deref() {
        None => Some(TorqueUnit::NewtonMetre),
        Some(t) => match TorqueUnit::parse("torque_unit", t) {
            Ok(u) => Some(u),
            Err(e) => {
                problems.extend(ItemError::from_api(&e));
                None
            }
        },
    };
    let req = match query.to_request() {
        Ok(r) => Some(r),
        Err(e) => {
            problems.extend(e);
            None
        }
    };
    let (Some(unit), Some(req)) = (unit, req) else {
        return Err(ItemErrors(problems).into());
    };
    let snapshot = snapshot_for(&state, req.catalogue_revision).await?;
    let (resolved, spec) = compute_one(&req, &snapshot)?;
    let stale = state.catalogue.is_stale();
    let presentation = format!(
        "setpoints|{}|{:?}|{:?}",
        unit.symbol(),
        query.resolution,
        query.angle_resolution
    );
    let tag = etag(&resolved.content_hash, &presentation);
    cached(&http, tag, resolved.pinned, || {
        setpoints(
            &spec,
            &resolved,
            unit,
            query.resolution,
            query.angle_resolution,
            stale,
        )
    })
}

/// Body of a batch: up to 10,000 spec requests (each as the POST body).
#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BatchRequest {
    #[schema(value_type = Vec<SpecRequest>)]
    pub items: Vec<serde_json::Value>,
}

/// One result of a batch, in request order: a spec or a problem.
#[derive(Debug, Serialize, ToSchema)]
pub struct BatchItem {
    /// Position in the request's `items`.
    pub index: usize,
    /// 200, or the status the item would have had on its own.
    pub status: u16,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub spec: Option<SpecResponse>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub problem: Option<Problem>,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct BatchResponse {
    pub count: usize,
    pub succeeded: usize,
    pub failed: usize,
    pub items: Vec<BatchItem>,
}

/// The first `name` in backticks of a serde message ("unknown field `thred`").
fn backticked(message: &str) -> Option<String> {
    let rest = message.split_once('`')?.1;
    Some(rest.split_once('`')?.0.to_string())
}

fn failed(index: usize, e: ApiError) -> BatchItem {
    let problem = e.problem();
    BatchItem {
        index,
        status: problem.status,
        spec: None,
        problem: Some(problem),
    }
}

/// Many specs in one request: results in the same order, each a spec or a
/// problem object; one bad item does not fail the batch.
#[utoipa::path(
    tag = "specs",
    request_body = BatchRequest,
    responses(
        (status = 200, description = "One result per item, in order", body = BatchResponse),
        (status = 400, description = "The body is not a batch", body = Problem, content_type = "application/problem+json"),
        (status = 413, description = "Body over the limit", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "More than 10,000 items", body = Problem, content_type = "application/problem+json"),
    )
)]
#[post("/v1/tightening-specs/batch")]
pub async fn post_batch(
    _reader: Reader,
    state: web::Data<AppState>,
    body: web::Json<BatchRequest>,
) -> Result<HttpResponse, ApiError> {
    let items = body.into_inner().items;
    if items.len() > BATCH_MAX_ITEMS {
        return Err(ApiError::invalid(
            "items",
            format!(
                "a batch holds at most {BATCH_MAX_ITEMS} items; this one has {}",
                items.len()
            ),
        ));
    }
    let requests: Vec<Result<SpecRequest, ApiError>> = items
        .into_iter()
        .map(|v| {
            SpecRequest::deserialize(v).map_err(|e| {
                let message = e.to_string();
                let field = backticked(&message).unwrap_or_else(|| "item".to_string());
                ApiError::malformed(field, message)
            })
        })
        .collect();

    // Fetch each pinned revision once, then compute without awaiting.
    let mut snapshots: HashMap<Option<i64>, Result<Arc<Snapshot>, ApiError>> = HashMap::new();
    for r in requests.iter().flatten() {
        if let Entry::Vacant(slot) = snapshots.entry(r.catalogue_revision) {
            slot.insert(snapshot_for(&state, r.catalogue_revision).await);
        }
    }
    let stale = state.catalogue.is_stale();
    let mut out = Vec::with_capacity(requests.len());
    let mut succeeded = 0;
    for (index, r) in requests.into_iter().enumerate() {
        let item = match r {
            Err(e) => failed(index, e),
            Ok(req) => match snapshots.get(&req.catalogue_revision) {
                Some(Ok(snapshot)) => match compute_one(&req, snapshot) {
                    Ok((resolved, spec)) => {
                        succeeded += 1;
                        BatchItem {
                            index,
                            status: 200,
                            spec: Some(spec_response(&spec, &resolved, stale)),
                            problem: None,
                        }
                    }
                    Err(e) => failed(index, e.into()),
                },
                Some(Err(e)) => BatchItem {
                    index,
                    status: e.problem().status,
                    spec: None,
                    problem: Some(e.problem()),
                },
                None => failed(index, ApiError::Internal("batch snapshot missing".into())),
            },
        };
        out.push(item);
    }
    let count = out.len();
    Ok(HttpResponse::Ok().json(BatchResponse {
        count,
        succeeded,
        failed: count - succeeded,
        items: out,
    }))
}
