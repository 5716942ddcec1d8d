//! `/v1/finishes` and `/v1/lubricants`: catalogue items with the same
//! versioning as friction entries (ETag, If-Match, reason, history).
//! Retire one with PUT and `"status": "retired"` (refused while an active
//! friction entry uses it). Both kinds share one path: the generic steps
//! below over `CatalogueItem` and `ItemWire`; each route is one call.

use crate::http::extract::Query;
use actix_web::http::{header, StatusCode};
use actix_web::{get, post, put, web, HttpRequest, HttpResponse};

use super::if_match;
use super::wire::{
    FinishList, FinishView, FinishWrite, HistoryView, ItemWire, ItemWrite, LubricantList,
    LubricantView, LubricantWrite, NoQuery, RevisionQuery,
};
use crate::app::catalogue::{AtRevision, Author};
use crate::catalogue::{CatalogueItem, Finish, Lubricant};
use crate::http::auth::{Editor, Reader};
use crate::http::error::ApiError;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(list_finishes)
        .service(get_finish)
        .service(create_finish)
        .service(update_finish)
        .service(finish_history)
        .service(list_lubricants)
        .service(get_lubricant)
        .service(create_lubricant)
        .service(update_lubricant)
        .service(lubricant_history);
}

fn respond<I: ItemWire>(state: &AppState, at: AtRevision<I>, status: StatusCode) -> HttpResponse {
    let mut b = HttpResponse::build(status);
    b.insert_header((header::ETAG, at.value.etag()));
    if status == StatusCode::CREATED {
        let location = format!("{}/{}", I::COLLECTION, at.value.id());
        b.insert_header((header::LOCATION, location));
    }
    b.json(I::view(at.value, at.revision, state.app.stale()))
}

async fn list<I: ItemWire>(
    state: &AppState,
    revision: Option<i64>,
) -> Result<HttpResponse, ApiError> {
    let items = state.app.items::<I>(revision).await?;
    Ok(HttpResponse::Ok().json(I::list(items.value, items.revision, state.app.stale())))
}

async fn get<I: ItemWire>(
    state: &AppState,
    id: &str,
    revision: Option<i64>,
) -> Result<HttpResponse, ApiError> {
    let item = state.app.item::<I>(id, revision).await?;
    Ok(respond(state, item, StatusCode::OK))
}

async fn create<W: ItemWrite>(
    state: &AppState,
    who: &Editor,
    body: W,
) -> Result<HttpResponse, ApiError>
where
    W::Item: ItemWire,
{
    let (input, reason) = body.into_input(None)?;
    let by = Author {
        actor: &who.0.name,
        reason: &reason,
    };
    let item = state.app.create_item::<W::Item>(by, input).await?;
    Ok(respond(state, item, StatusCode::CREATED))
}

async fn update<W: ItemWrite>(
    state: &AppState,
    who: &Editor,
    id: &str,
    req: &HttpRequest,
    body: W,
) -> Result<HttpResponse, ApiError>
where
    W::Item: ItemWire,
{
    let prefix = format!("{}-{id}", <W::Item as CatalogueItem>::NAME);
    let expected = if_match(req.headers(), &prefix)?;
    let (input, reason) = body.into_input(Some(id))?;
    let by = Author {
        actor: &who.0.name,
        reason: &reason,
    };
    let item = state
        .app
        .update_item::<W::Item>(by, input, expected)
        .await?;
    Ok(respond(state, item, StatusCode::OK))
}

async fn history<I: ItemWire>(state: &AppState, id: &str) -> Result<HttpResponse, ApiError> {
    let history = state.app.history(I::ENTITY, id).await?;
    Ok(HttpResponse::Ok().json(HistoryView {
        entity: I::ENTITY.as_str().into(),
        id: id.into(),
        catalogue_revision: history.revision,
        history: history.value,
    }))
}

/// Surface finishes in the catalogue (current or at `catalogue_revision`).
#[utoipa::path(tag = "catalogue", params(RevisionQuery), responses((status = 200, description = "Finishes", body = FinishList), (status = 404, description = "No such revision")))]
#[get("/v1/finishes")]
async fn list_finishes(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    list::<Finish>(&state, q.catalogue_revision).await
}

/// One finish, with its ETag.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Finish id"), RevisionQuery), responses((status = 200, description = "The finish", body = FinishView), (status = 404, description = "Unknown finish (with suggestions)")))]
#[get("/v1/finishes/{id}")]
async fn get_finish(
    state: web::Data<AppState>,
    _who: Reader,
    id: web::Path<String>,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    get::<Finish>(&state, &id, q.catalogue_revision).await
}

/// Adds a finish (editor), e.g. a plant's own coating.
#[utoipa::path(tag = "catalogue", request_body = FinishWrite, security(("bearer" = [])), responses((status = 201, description = "Created", body = FinishView), (status = 422, description = "Every problem listed")))]
#[post("/v1/finishes")]
async fn create_finish(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<FinishWrite>,
) -> Result<HttpResponse, ApiError> {
    create(&state, &who, body.into_inner()).await
}

/// Replaces a finish (editor, If-Match).
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Finish id"), ("If-Match" = String, Header, description = "ETag from GET")), request_body = FinishWrite, security(("bearer" = [])), responses((status = 200, description = "Changed", body = FinishView), (status = 412, description = "Stale ETag"), (status = 422, description = "Every problem listed"), (status = 428, description = "If-Match missing")))]
#[put("/v1/finishes/{id}")]
async fn update_finish(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    req: HttpRequest,
    body: web::Json<FinishWrite>,
) -> Result<HttpResponse, ApiError> {
    update(&state, &who, &id, &req, body.into_inner()).await
}

/// Every change to one finish, oldest first.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Finish id")), responses((status = 200, description = "History", body = HistoryView), (status = 404, description = "No such finish")))]
#[get("/v1/finishes/{id}/history")]
async fn finish_history(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    history::<Finish>(&state, &id).await
}

/// Lubricants in the catalogue (current or at `catalogue_revision`).
#[utoipa::path(tag = "catalogue", params(RevisionQuery), responses((status = 200, description = "Lubricants", body = LubricantList), (status = 404, description = "No such revision")))]
#[get("/v1/lubricants")]
async fn list_lubricants(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    list::<Lubricant>(&state, q.catalogue_revision).await
}

/// One lubricant, with its ETag.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Lubricant id"), RevisionQuery), responses((status = 200, description = "The lubricant", body = LubricantView), (status = 404, description = "Unknown lubricant (with suggestions)")))]
#[get("/v1/lubricants/{id}")]
async fn get_lubricant(
    state: web::Data<AppState>,
    _who: Reader,
    id: web::Path<String>,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    get::<Lubricant>(&state, &id, q.catalogue_revision).await
}

/// Adds a lubricant (editor).
#[utoipa::path(tag = "catalogue", request_body = LubricantWrite, security(("bearer" = [])), responses((status = 201, description = "Created", body = LubricantView), (status = 422, description = "Every problem listed")))]
#[post("/v1/lubricants")]
async fn create_lubricant(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<LubricantWrite>,
) -> Result<HttpResponse, ApiError> {
    create(&state, &who, body.into_inner()).await
}

/// Replaces a lubricant (editor, If-Match).
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Lubricant id"), ("If-Match" = String, Header, description = "ETag from GET")), request_body = LubricantWrite, security(("bearer" = [])), responses((status = 200, description = "Changed", body = LubricantView), (status = 412, description = "Stale ETag"), (status = 422, description = "Every problem listed"), (status = 428, description = "If-Match missing")))]
#[put("/v1/lubricants/{id}")]
async fn update_lubricant(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    req: HttpRequest,
    body: web::Json<LubricantWrite>,
) -> Result<HttpResponse, ApiError> {
    update(&state, &who, &id, &req, body.into_inner()).await
}

/// Every change to one lubricant, oldest first.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Lubricant id")), responses((status = 200, description = "History", body = HistoryView), (status = 404, description = "No such lubricant")))]
#[get("/v1/lubricants/{id}/history")]
async fn lubricant_history(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    history::<Lubricant>(&state, &id).await
}
