//! `/v1/finishes` and `/v1/lubricants`: catalogue items with the same
//! versioning as friction entries (ETag, If-Match, reason, history).
//! Retire one with PUT and `"status": "retired"` (refused while an active
//! friction entry uses it).

use crate::http::extract::Query;
use actix_web::http::{header, StatusCode};
use actix_web::{get, post, put, web, HttpRequest, HttpResponse};

use super::wire::{
    FinishList, FinishView, FinishWrite, HistoryView, LubricantList, LubricantView, LubricantWrite,
    NoQuery, RevisionQuery,
};
use super::{if_match, CatalogueService};
use crate::catalogue::{item_etag, Change, ChangeSet, EntityKind, Finish, Lubricant, Snapshot};
use crate::http::auth::{Editor, Reader};
use crate::http::error::{ApiError, Problem};

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

fn finish_response(
    svc: &CatalogueService,
    snap: &Snapshot,
    id: &str,
    status: StatusCode,
) -> Result<HttpResponse, ApiError> {
    let finish: Finish = snap.finish(id)?.clone();
    let mut b = HttpResponse::build(status);
    b.insert_header((
        header::ETAG,
        item_etag("finish", &finish.id, finish.revision),
    ));
    if status == StatusCode::CREATED {
        b.insert_header((header::LOCATION, format!("/v1/finishes/{}", finish.id)));
    }
    Ok(b.json(FinishView {
        finish,
        catalogue_revision: snap.revision,
        catalogue_may_be_stale: svc.stale(),
    }))
}

fn lubricant_response(
    svc: &CatalogueService,
    snap: &Snapshot,
    id: &str,
    status: StatusCode,
) -> Result<HttpResponse, ApiError> {
    let lubricant: Lubricant = snap.lubricant(id)?.clone();
    let mut b = HttpResponse::build(status);
    b.insert_header((
        header::ETAG,
        item_etag("lubricant", &lubricant.id, lubricant.revision),
    ));
    if status == StatusCode::CREATED {
        b.insert_header((header::LOCATION, format!("/v1/lubricants/{}", lubricant.id)));
    }
    Ok(b.json(LubricantView {
        lubricant,
        catalogue_revision: snap.revision,
        catalogue_may_be_stale: svc.stale(),
    }))
}

async fn history(
    svc: &CatalogueService,
    kind: EntityKind,
    id: &str,
) -> Result<HttpResponse, ApiError> {
    let history = svc.store.history(kind, id).await?;
    if history.is_empty() {
        return Err(ApiError::not_found(format!("no {} '{id}'", kind.as_str())));
    }
    Ok(HttpResponse::Ok().json(HistoryView {
        entity: kind.as_str().into(),
        id: id.into(),
        catalogue_revision: svc.live.revision(),
        history,
    }))
}

/// Surface finishes in the catalogue (current or at `catalogue_revision`).
#[utoipa::path(tag = "catalogue", params(RevisionQuery), responses((status = 200, description = "Finishes", body = FinishList), (status = 404, description = "No such revision", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/finishes")]
async fn list_finishes(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    let snap = svc.snapshot(q.catalogue_revision).await?;
    Ok(HttpResponse::Ok().json(FinishList {
        catalogue_revision: snap.revision,
        catalogue_may_be_stale: svc.stale(),
        finishes: snap.finishes.clone(),
    }))
}

/// One finish, with its ETag.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Finish id"), RevisionQuery), responses((status = 200, description = "The finish", body = FinishView), (status = 404, description = "Unknown finish (with suggestions)", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/finishes/{id}")]
async fn get_finish(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    id: web::Path<String>,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    let snap = svc.snapshot(q.catalogue_revision).await?;
    finish_response(&svc, &snap, &id, StatusCode::OK)
}

/// Adds a finish (editor), e.g. a plant's own coating.
#[utoipa::path(tag = "catalogue", request_body = FinishWrite, security(("bearer" = [])), responses((status = 201, description = "Created", body = FinishView), (status = 422, description = "Every problem listed", body = Problem, content_type = "application/problem+json")))]
#[post("/v1/finishes")]
async fn create_finish(
    svc: web::Data<CatalogueService>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<FinishWrite>,
) -> Result<HttpResponse, ApiError> {
    let (input, reason) = body.into_inner().into_input(None)?;
    let id = input.id.clone();
    let applied = svc
        .store
        .apply_live(
            &svc.live,
            &ChangeSet::single(&who.0.name, &reason, Change::CreateFinish(input)),
        )
        .await?;
    finish_response(&svc, &applied.snapshot, &id, StatusCode::CREATED)
}

/// Replaces a finish (editor, If-Match).
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Finish id"), ("If-Match" = String, Header, description = "ETag from GET")), request_body = FinishWrite, security(("bearer" = [])), responses((status = 200, description = "Changed", body = FinishView), (status = 412, description = "Stale ETag", body = Problem, content_type = "application/problem+json"), (status = 422, description = "Every problem listed", body = Problem, content_type = "application/problem+json"), (status = 428, description = "If-Match missing", body = Problem, content_type = "application/problem+json")))]
#[put("/v1/finishes/{id}")]
async fn update_finish(
    svc: web::Data<CatalogueService>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    req: HttpRequest,
    body: web::Json<FinishWrite>,
) -> Result<HttpResponse, ApiError> {
    let expected = if_match(req.headers(), &format!("finish-{id}"))?;
    let (finish, reason) = body.into_inner().into_input(Some(&id))?;
    let set = ChangeSet::single(
        &who.0.name,
        &reason,
        Change::UpdateFinish {
            expected_revision: Some(expected),
            finish,
        },
    );
    let applied = svc.store.apply_live(&svc.live, &set).await?;
    finish_response(&svc, &applied.snapshot, &id, StatusCode::OK)
}

/// Every change to one finish, oldest first.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Finish id")), responses((status = 200, description = "History", body = HistoryView), (status = 404, description = "No such finish", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/finishes/{id}/history")]
async fn finish_history(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    history(&svc, EntityKind::Finish, &id).await
}

/// Lubricants in the catalogue (current or at `catalogue_revision`).
#[utoipa::path(tag = "catalogue", params(RevisionQuery), responses((status = 200, description = "Lubricants", body = LubricantList), (status = 404, description = "No such revision", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/lubricants")]
async fn list_lubricants(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    let snap = svc.snapshot(q.catalogue_revision).await?;
    Ok(HttpResponse::Ok().json(LubricantList {
        catalogue_revision: snap.revision,
        catalogue_may_be_stale: svc.stale(),
        lubricants: snap.lubricants.clone(),
    }))
}

/// One lubricant, with its ETag.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Lubricant id"), RevisionQuery), responses((status = 200, description = "The lubricant", body = LubricantView), (status = 404, description = "Unknown lubricant (with suggestions)", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/lubricants/{id}")]
async fn get_lubricant(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    id: web::Path<String>,
    q: Query<RevisionQuery>,
) -> Result<HttpResponse, ApiError> {
    let snap = svc.snapshot(q.catalogue_revision).await?;
    lubricant_response(&svc, &snap, &id, StatusCode::OK)
}

/// Adds a lubricant (editor).
#[utoipa::path(tag = "catalogue", request_body = LubricantWrite, security(("bearer" = [])), responses((status = 201, description = "Created", body = LubricantView), (status = 422, description = "Every problem listed", body = Problem, content_type = "application/problem+json")))]
#[post("/v1/lubricants")]
async fn create_lubricant(
    svc: web::Data<CatalogueService>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<LubricantWrite>,
) -> Result<HttpResponse, ApiError> {
    let (input, reason) = body.into_inner().into_input(None)?;
    let id = input.id.clone();
    let applied = svc
        .store
        .apply_live(
            &svc.live,
            &ChangeSet::single(&who.0.name, &reason, Change::CreateLubricant(input)),
        )
        .await?;
    lubricant_response(&svc, &applied.snapshot, &id, StatusCode::CREATED)
}

/// Replaces a lubricant (editor, If-Match).
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Lubricant id"), ("If-Match" = String, Header, description = "ETag from GET")), request_body = LubricantWrite, security(("bearer" = [])), responses((status = 200, description = "Changed", body = LubricantView), (status = 412, description = "Stale ETag", body = Problem, content_type = "application/problem+json"), (status = 422, description = "Every problem listed", body = Problem, content_type = "application/problem+json"), (status = 428, description = "If-Match missing", body = Problem, content_type = "application/problem+json")))]
#[put("/v1/lubricants/{id}")]
async fn update_lubricant(
    svc: web::Data<CatalogueService>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    req: HttpRequest,
    body: web::Json<LubricantWrite>,
) -> Result<HttpResponse, ApiError> {
    let expected = if_match(req.headers(), &format!("lubricant-{id}"))?;
    let (lubricant, reason) = body.into_inner().into_input(Some(&id))?;
    let set = ChangeSet::single(
        &who.0.name,
        &reason,
        Change::UpdateLubricant {
            expected_revision: Some(expected),
            lubricant,
        },
    );
    let applied = svc.store.apply_live(&svc.live, &set).await?;
    lubricant_response(&svc, &applied.snapshot, &id, StatusCode::OK)
}

/// Every change to one lubricant, oldest first.
#[utoipa::path(tag = "catalogue", params(("id" = String, Path, description = "Lubricant id")), responses((status = 200, description = "History", body = HistoryView), (status = 404, description = "No such lubricant", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/lubricants/{id}/history")]
async fn lubricant_history(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    history(&svc, EntityKind::Lubricant, &id).await
}
