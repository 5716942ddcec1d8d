//! `/v1/catalogue/revisions`, `/v1/catalogue/revisions/{n}`,
//! `/v1/catalogue/diff` and `/v1/catalogue/export`: each extracts, calls
//! one use case of `app::catalogue` and renders.

use crate::http::extract::Query;
use actix_web::http::header;
use actix_web::{get, web, HttpResponse};

use super::wire::{
    DiffQuery, DiffView, ExportFormat, ExportQuery, NoQuery, RevisionDetail, RevisionList,
    RevisionsQuery,
};
use crate::app::catalogue::CatalogueExport;
use crate::catalogue::exchange;
use crate::http::auth::Reader;
use crate::http::error::ApiError;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(list_revisions)
        .service(get_revision)
        .service(diff_revisions)
        .service(export_catalogue);
}

/// Catalogue revisions, newest first: who, when, why, how many changes.
#[utoipa::path(tag = "catalogue", params(RevisionsQuery), responses((status = 200, description = "Revisions", body = RevisionList), (status = 503, description = "Database unavailable")))]
#[get("/v1/catalogue/revisions")]
async fn list_revisions(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<RevisionsQuery>,
) -> Result<HttpResponse, ApiError> {
    let page = state.app.revisions(q.before, q.limit).await?;
    Ok(HttpResponse::Ok().json(RevisionList {
        catalogue_revision: page.revision,
        revisions: page.value.revisions,
        next_before: page.value.next_before,
    }))
}

/// One revision: who, when, why, and every change with before and after.
#[utoipa::path(tag = "catalogue", params(("n" = i64, Path, description = "Revision number")), responses((status = 200, description = "The revision", body = RevisionDetail), (status = 404, description = "No such revision")))]
#[get("/v1/catalogue/revisions/{n}")]
async fn get_revision(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    n: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let (info, changes) = state.app.revision_detail(*n).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "public, max-age=86400, immutable"))
        .json(RevisionDetail { info, changes }))
}

/// What differs between revisions `from` and `to`, item by item.
#[utoipa::path(tag = "catalogue", params(DiffQuery), responses((status = 200, description = "The difference", body = DiffView), (status = 404, description = "No such revision")))]
#[get("/v1/catalogue/diff")]
async fn diff_revisions(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<DiffQuery>,
) -> Result<HttpResponse, ApiError> {
    let changes = state.app.diff(q.from, q.to).await?;
    Ok(HttpResponse::Ok().json(DiffView {
        from: q.from,
        to: q.to,
        changes,
    }))
}

/// The catalogue as JSON (everything) or CSV (friction entries), current
/// or at `catalogue_revision`; `tightspec catalogue import` reads both.
#[utoipa::path(tag = "catalogue", params(ExportQuery), responses((status = 200, description = "The catalogue", content((Object = "application/json"), (String = "text/csv"))), (status = 404, description = "No such revision")))]
#[get("/v1/catalogue/export")]
async fn export_catalogue(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<ExportQuery>,
) -> Result<HttpResponse, ApiError> {
    let csv_bom = match q.format.unwrap_or(ExportFormat::Json) {
        ExportFormat::Json => None,
        ExportFormat::Csv => Some(q.bom.unwrap_or(false)),
    };
    let export = state.app.export(q.catalogue_revision, csv_bom).await?;
    let name = format!("tightspec-catalogue-r{}", export.revision());
    Ok(match export {
        CatalogueExport::Json(snap) => HttpResponse::Ok()
            .insert_header((
                header::CONTENT_DISPOSITION,
                format!("attachment; filename=\"{name}.json\""),
            ))
            .json(exchange::export(&snap)),
        CatalogueExport::Csv { text, .. } => HttpResponse::Ok()
            .content_type("text/csv; charset=utf-8")
            .insert_header((
                header::CONTENT_DISPOSITION,
                format!("attachment; filename=\"{name}.csv\""),
            ))
            .body(text),
    })
}
