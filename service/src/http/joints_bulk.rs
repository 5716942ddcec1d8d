//! `/v1/joints/import` (editor) and `/v1/joints/export`: joint definitions
//! in bulk, as JSON or CSV. Each handler extracts, calls one use case of
//! `app::joints_bulk` and renders. Registered before `/v1/joints/{id}` so
//! the fixed paths are not read as joint ids.

use actix_web::http::header;
use actix_web::{get, post, web, HttpRequest, HttpResponse};
use serde::Deserialize;
use utoipa::IntoParams;

use super::catalogue::wire::ExportFormat;
use crate::app::joints_bulk::{csv_form, export_json, ImportReport};
use crate::http::auth::{Editor, Reader};
use crate::http::error::ApiError;
use crate::http::extract::Query;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(import_joints).service(export_joints);
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct ImportQuery {
    /// CSV only: why, recorded in each joint's history (JSON bodies carry
    /// it as `reason`).
    pub reason: Option<String>,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct JointExportQuery {
    /// `json` (default) or `csv`.
    #[param(inline)]
    pub format: Option<ExportFormat>,
    /// CSV only: start with a UTF-8 byte order mark, for spreadsheets
    /// (default false).
    pub bom: Option<bool>,
    /// Only joints carrying this tag.
    pub tag: Option<String>,
}

/// Imports joint definitions (editor): JSON `{"joints": [definition, …],
/// "reason"}` or CSV (`text/csv`, a header row, one joint per row, UTF-8
/// with or without a byte order mark; `?reason=`). Every row is checked as
/// `POST /v1/joints` checks a body and every problem is listed
/// (`joints[i].field`, `rows[i].column`); any problem imports nothing.
/// New ids are created, changed definitions replaced (no If-Match: the
/// import is the change), equal ones left unchanged. At most 5,000 joints.
#[utoipa::path(
    tag = "joints",
    params(ImportQuery),
    request_body(content((Object = "application/json"), (String = "text/csv"))),
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Imported: counts and ids created, updated, unchanged", body = ImportReport),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not define joints"),
        (status = 413, description = "Body over the size limit"),
        (status = 415, description = "Neither JSON nor CSV"),
        (status = 422, description = "Every problem of every row listed; nothing written"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/joints/import")]
async fn import_joints(
    state: web::Data<AppState>,
    who: Editor,
    q: Query<ImportQuery>,
    req: HttpRequest,
    body: web::Bytes,
) -> Result<HttpResponse, ApiError> {
    let media = req
        .headers()
        .get(header::CONTENT_TYPE)
        .and_then(|v| v.to_str().ok())
        .and_then(|v| v.split(';').next())
        .map(|v| v.trim().to_ascii_lowercase())
        .unwrap_or_default();
    let report = match media.as_str() {
        "application/json" => {
            let value: serde_json::Value = serde_json::from_slice(&body)
                .map_err(|e| ApiError::malformed("body", format!("not JSON: {e}")))?;
            state.app.import_joints_json(&who.0.name, &value).await?
        }
        "text/csv" => {
            let text = std::str::from_utf8(&body)
                .map_err(|e| ApiError::malformed("body", format!("the CSV is not UTF-8: {e}")))?;
            state
                .app
                .import_joints_csv(&who.0.name, text, q.reason.as_deref())
                .await?
        }
        _ => {
            return Err(ApiError::UnsupportedMediaType {
                detail: "send the joints as application/json or text/csv".into(),
            })
        }
    };
    Ok(HttpResponse::Ok().json(report))
}

/// Every joint's definition (optionally those with `tag`), in id order, as
/// JSON `{"joints": [definition, …]}` or CSV in the import's columns: an
/// export re-imports unchanged.
#[utoipa::path(
    tag = "joints",
    params(JointExportQuery),
    responses(
        (status = 200, description = "The definitions", content((Object = "application/json"), (String = "text/csv"))),
        (status = 401, description = "Token required or not accepted"),
        (status = 422, description = "Bad tag, or a joint with no CSV form (named)"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints/export")]
async fn export_joints(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<JointExportQuery>,
) -> Result<HttpResponse, ApiError> {
    let defs = state.app.export_joints(q.tag.as_deref()).await?;
    Ok(match q.format.unwrap_or(ExportFormat::Json) {
        ExportFormat::Json => HttpResponse::Ok()
            .insert_header((
                header::CONTENT_DISPOSITION,
                "attachment; filename=\"tightspec-joints.json\"",
            ))
            .json(export_json(&defs)),
        ExportFormat::Csv => HttpResponse::Ok()
            .content_type("text/csv; charset=utf-8")
            .insert_header((
                header::CONTENT_DISPOSITION,
                "attachment; filename=\"tightspec-joints.csv\"",
            ))
            .body(csv_form::export_csv(&defs, q.bom.unwrap_or(false))?),
    })
}
