//! `/v1/catalogue/revisions`, `/v1/catalogue/revisions/{n}`,
//! `/v1/catalogue/diff` and `/v1/catalogue/export`.

use crate::http::extract::Query;
use actix_web::http::header;
use actix_web::{get, web, HttpResponse};

use super::wire::{
    DiffQuery, DiffView, ExportFormat, ExportQuery, NoQuery, RevisionDetail, RevisionList,
    RevisionsQuery,
};
use super::CatalogueService;
use crate::catalogue::{diff, exchange};
use crate::http::auth::Reader;
use crate::http::error::{ApiError, Problem};

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(list_revisions)
        .service(get_revision)
        .service(diff_revisions)
        .service(export_catalogue);
}

/// Catalogue revisions, newest first: who, when, why, how many changes.
#[utoipa::path(tag = "catalogue", params(RevisionsQuery), responses((status = 200, description = "Revisions", body = RevisionList), (status = 503, description = "Database unavailable", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/catalogue/revisions")]
async fn list_revisions(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    q: Query<RevisionsQuery>,
) -> Result<HttpResponse, ApiError> {
    let limit = q.limit.unwrap_or(100);
    if !(1..=1000).contains(&limit) {
        return Err(ApiError::invalid("limit", "must be between 1 and 1000"));
    }
    let revisions = svc.store.revisions(q.before, limit).await?;
    let next_before = if revisions.len() as i64 == limit {
        revisions.last().map(|r| r.revision)
    } else {
        None
    };
    Ok(HttpResponse::Ok().json(RevisionList {
        catalogue_revision: svc.live.revision(),
        revisions,
        next_before,
    }))
}

/// One revision: who, when, why, and every change with before and after.
#[utoipa::path(tag = "catalogue", params(("n" = i64, Path, description = "Revision number")), responses((status = 200, description = "The revision", body = RevisionDetail), (status = 404, description = "No such revision", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/catalogue/revisions/{n}")]
async fn get_revision(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    _q: Query<NoQuery>,
    n: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let (info, changes) = svc.store.revision(*n).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "public, max-age=86400, immutable"))
        .json(RevisionDetail { info, changes }))
}

/// What differs between revisions `from` and `to`, item by item.
#[utoipa::path(tag = "catalogue", params(DiffQuery), responses((status = 200, description = "The difference", body = DiffView), (status = 404, description = "No such revision", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/catalogue/diff")]
async fn diff_revisions(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    q: Query<DiffQuery>,
) -> Result<HttpResponse, ApiError> {
    let from = svc
        .snapshot(Some(q.from))
        .await
        .map_err(|e| rename(e, "from"))?;
    let to = svc
        .snapshot(Some(q.to))
        .await
        .map_err(|e| rename(e, "to"))?;
    Ok(HttpResponse::Ok().json(DiffView {
        from: q.from,
        to: q.to,
        changes: diff(&from, &to),
    }))
}

/// Names the query parameter in a not-found revision error.
fn rename(e: ApiError, field: &str) -> ApiError {
    match e {
        ApiError::NotFound { detail, mut errors } => {
            for err in &mut errors {
                err.field = field.to_string();
            }
            ApiError::NotFound {
                detail: format!("{field}: {detail}"),
                errors,
            }
        }
        other => other,
    }
}

/// The catalogue as JSON (everything) or CSV (friction entries), current
/// or at `catalogue_revision`; `tightspec catalogue import` reads both.
#[utoipa::path(tag = "catalogue", params(ExportQuery), responses((status = 200, description = "The catalogue", content((Object = "application/json"), (String = "text/csv"))), (status = 404, description = "No such revision", body = Problem, content_type = "application/problem+json")))]
#[get("/v1/catalogue/export")]
async fn export_catalogue(
    svc: web::Data<CatalogueService>,
    _who: Reader,
    q: Query<ExportQuery>,
) -> Result<HttpResponse, ApiError> {
    let snap = svc.snapshot(q.catalogue_revision).await?;
    let name = format!("tightspec-catalogue-r{}", snap.revision);
    match q.format.unwrap_or(ExportFormat::Json) {
        ExportFormat::Json => Ok(HttpResponse::Ok()
            .insert_header((
                header::CONTENT_DISPOSITION,
                format!("attachment; filename=\"{name}.json\""),
            ))
            .json(exchange::export(&snap))),
        ExportFormat::Csv => {
            let evidence = svc.store.entry_evidence(&snap).await?;
            let options = exchange::CsvOptions {
                bom: q.bom.unwrap_or(false),
                evidence: Some(&evidence),
            };
            let csv = exchange::to_csv_with(&snap, &options).map_err(ApiError::Internal)?;
            Ok(HttpResponse::Ok()
                .content_type("text/csv; charset=utf-8")
                .insert_header((
                    header::CONTENT_DISPOSITION,
                    format!("attachment; filename=\"{name}.csv\""),
                ))
                .body(csv))
        }
    }
}
