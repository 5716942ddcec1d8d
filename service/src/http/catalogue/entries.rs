//! `/v1/friction-entries`: list, read (with ETag), create, replace
//! (If-Match), retire (DELETE, If-Match), history. Each handler extracts,
//! calls one use case of `app::catalogue` and renders.

use crate::http::extract::Query;
use actix_web::http::header;
use actix_web::{delete, get, post, put, web, HttpRequest, HttpResponse};

use super::if_match;
use super::wire::{
    EntryList, EntryListQuery, EntryView, EntryWrite, HistoryView, NoQuery, ReasonBody,
    RetireQuery, RevisionQuery, StatusFilter,
};
use crate::app::catalogue::{AtRevision, Author, EntryFilter};
use crate::catalogue::{EntityKind, FrictionEntry};
use crate::http::auth::{Editor, Reader};
use crate::http::error::ApiError;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(list_entries)
        .service(get_entry)
        .service(create_entry)
        .service(update_entry)
        .service(retire_entry)
        .service(entry_history);
}

fn view(
    state: &AppState,
    at: AtRevision<FrictionEntry>,
    status: actix_web::http::StatusCode,
) -> HttpResponse {
    let AtRevision {
        value: entry,
        revision: catalogue_revision,
    } = at;
    let etag = entry.etag();
    let id = entry.id;
    let mut b = HttpResponse::build(status);
    b.insert_header((header::ETAG, etag))
        .insert_header((header::CACHE_CONTROL, "no-cache"));
    if status == actix_web::http::StatusCode::CREATED {
        b.insert_header((header::LOCATION, format!("/v1/friction-entries/{id}")));
    }
    b.json(EntryView {
        entry,
        catalogue_revision,
        catalogue_may_be_stale: state.app.stale(),
    })
}

/// The friction catalogue (current, or as it was at `catalogue_revision`).
#[utoipa::path(
    tag = "catalogue",
    params(EntryListQuery),
    responses(
        (status = 200, description = "Friction entries", body = EntryList),
        (status = 400, description = "Malformed query"),
        (status = 401, description = "Token required or not accepted"),
        (status = 404, description = "No such revision"),
    )
)]
#[get("/v1/friction-entries")]
async fn list_entries(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<EntryListQuery>,
) -> Result<HttpResponse, ApiError> {
    let q = q.into_inner();
    let filter = EntryFilter {
        active: match q.status.unwrap_or(StatusFilter::All) {
            StatusFilter::All => None,
            StatusFilter::Active => Some(true),
            StatusFilter::Retired => Some(false),
        },
        finish: q.finish,
        lubricant: q.lubricant,
    };
    let listed = state.app.entries(&filter, q.catalogue_revision).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "no-cache"))
        .json(EntryList {
            catalogue_revision: listed.revision,
            catalogue_may_be_stale: state.app.stale(),
            entries: listed.value,
        }))
}

/// One friction entry, with its ETag (send it back as If-Match to change it).
#[utoipa::path(
    tag = "catalogue",
    params(("id" = i64, Path, description = "Entry id"), RevisionQuery),
    responses(
        (status = 200, description = "The entry", body = EntryView, headers(("ETag" = String, description = "Entity tag for If-Match"))),
        (status = 404, description = "No such entry or revision"),
    )
)]
#[get("/v1/friction-entries/{id}")]
async fn get_entry(
    state: web::Data<AppState>,
    _who: Reader,
    id: web::Path<i64>,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    let entry = state.app.entry(*id, q.catalogue_revision).await?;
    Ok(view(&state, entry, actix_web::http::StatusCode::OK))
}

/// Creates a friction entry (editor). Becomes one new catalogue revision.
#[utoipa::path(
    tag = "catalogue",
    request_body = EntryWrite,
    security(("bearer" = [])),
    responses(
        (status = 201, description = "Created", body = EntryView),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not change the catalogue"),
        (status = 422, description = "Every problem listed; nothing written"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/friction-entries")]
async fn create_entry(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<EntryWrite>,
) -> Result<HttpResponse, ApiError> {
    let body = body.into_inner();
    if body.id.is_some() {
        return Err(ApiError::invalid(
            "id",
            "ids are assigned by the catalogue; leave it out when creating",
        ));
    }
    let (input, reason) = body.into_input()?;
    let by = Author {
        actor: &who.0.name,
        reason: &reason,
    };
    let entry = state.app.create_entry(by, input).await?;
    Ok(view(&state, entry, actix_web::http::StatusCode::CREATED))
}

/// Replaces a friction entry (editor): the entry as GET returned it,
/// changed, plus `reason`, with `If-Match: <ETag>`. A stale ETag gets 412
/// with the current state; a missing one 428.
#[utoipa::path(
    tag = "catalogue",
    params(("id" = i64, Path, description = "Entry id"), ("If-Match" = String, Header, description = "ETag from GET")),
    request_body = EntryWrite,
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Changed", body = EntryView),
        (status = 404, description = "No such entry"),
        (status = 412, description = "Stale ETag; `current` holds the current entry"),
        (status = 422, description = "Every problem listed; nothing written"),
        (status = 428, description = "If-Match missing"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[put("/v1/friction-entries/{id}")]
async fn update_entry(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<i64>,
    req: HttpRequest,
    body: web::Json<EntryWrite>,
) -> Result<HttpResponse, ApiError> {
    let id = id.into_inner();
    let expected = if_match(req.headers(), &format!("entry-{id}"))?;
    let body = body.into_inner();
    if let Some(b) = body.id.filter(|b| *b != id) {
        return Err(ApiError::invalid(
            "id",
            format!("{b} differs from the id in the path ({id})"),
        ));
    }
    let (entry, reason) = body.into_input()?;
    let by = Author {
        actor: &who.0.name,
        reason: &reason,
    };
    let entry = state.app.update_entry(by, id, expected, entry).await?;
    Ok(view(&state, entry, actix_web::http::StatusCode::OK))
}

/// Retires a friction entry (editor) as a new revision; it stays in
/// history and in past revisions. Needs If-Match and a reason (`?reason=`
/// or a JSON body `{"reason": …}`).
#[utoipa::path(
    tag = "catalogue",
    params(("id" = i64, Path, description = "Entry id"), ("If-Match" = String, Header, description = "ETag from GET"), RetireQuery),
    request_body(content = Option<ReasonBody>, description = "Optional: the reason as JSON, in place of `?reason=`; unknown fields are refused"),
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Retired", body = EntryView),
        (status = 404, description = "No such entry"),
        (status = 412, description = "Stale ETag"),
        (status = 422, description = "Reason missing or already retired"),
        (status = 428, description = "If-Match missing"),
    )
)]
#[delete("/v1/friction-entries/{id}")]
async fn retire_entry(
    state: web::Data<AppState>,
    who: Editor,
    id: web::Path<i64>,
    req: HttpRequest,
    q: Query<RetireQuery>,
    payload: web::Payload,
) -> Result<HttpResponse, ApiError> {
    let id = id.into_inner();
    // Read the body before anything else: a body naming an unknown field
    // is refused (naming it) and nothing is retired.
    let limit = state.settings.max_body_bytes;
    let body = reason_body(&crate::http::extract::body_bytes(payload, limit).await?)?;
    let expected = if_match(req.headers(), &format!("entry-{id}"))?;
    let reason = q
        .into_inner()
        .reason
        .or(body.map(|b| b.reason))
        .unwrap_or_default();
    let by = Author {
        actor: &who.0.name,
        reason: &reason,
    };
    let entry = state.app.retire_entry(by, id, expected).await?;
    Ok(view(&state, entry, actix_web::http::StatusCode::OK))
}

/// The optional `{"reason": …}` body of a retirement: empty or `null`
/// means none; anything else must be that object, with no other field.
fn reason_body(bytes: &[u8]) -> Result<Option<ReasonBody>, ApiError> {
    if bytes.iter().all(u8::is_ascii_whitespace) {
        return Ok(None);
    }
    let value: serde_json::Value = serde_json::from_slice(bytes)
        .map_err(|e| ApiError::malformed("body", format!("not JSON: {e}")))?;
    if value.is_null() {
        return Ok(None);
    }
    let body = serde_path_to_error::deserialize(value).map_err(|e| {
        let path = e.path().to_string();
        let message = e.into_inner().to_string();
        let named = ["unknown field `", "missing field `"]
            .iter()
            .find_map(|lead| message.split(lead).nth(1))
            .and_then(|rest| rest.split('`').next())
            .map(str::to_owned);
        let field = named
            .or_else(|| (path != "." && !path.is_empty()).then_some(path))
            .unwrap_or_else(|| "body".to_string());
        ApiError::malformed(field, message)
    })?;
    Ok(Some(body))
}

/// Every change to one entry, oldest first: revision, before, after, who,
/// when, why (and the evidence, e.g. a friction test series).
#[utoipa::path(
    tag = "catalogue",
    params(("id" = i64, Path, description = "Entry id")),
    responses(
        (status = 200, description = "History", body = HistoryView),
        (status = 404, description = "No such entry"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/friction-entries/{id}/history")]
async fn entry_history(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let id = id.into_inner().to_string();
    let history = state.app.history(EntityKind::FrictionEntry, &id).await?;
    Ok(HttpResponse::Ok().json(HistoryView {
        entity: EntityKind::FrictionEntry.as_str().into(),
        id,
        catalogue_revision: history.revision,
        history: history.value,
    }))
}
