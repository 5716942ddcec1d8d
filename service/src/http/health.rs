//! Operations endpoints: `/healthz` (alive), `/readyz` (store reachable and
//! catalogue loaded), `/metrics` (Prometheus text format).
//!
//! With anonymous reads off: `/healthz` and `/readyz` stay open for probes
//! (an orchestrator's probe carries no token), but `/readyz` then shows a
//! caller without a reader token only the status and which checks passed,
//! not the catalogue revision or entry count; `/metrics` needs a reader
//! token (scrapers send one as a bearer token).

use actix_web::{get, web, HttpRequest, HttpResponse};
use serde::Serialize;
use utoipa::ToSchema;
use utoipa_actix_web::service_config::ServiceConfig;

use super::auth::Reader;
use super::error::ApiError;
use super::state::AppState;
use crate::app::tokens::Role;

pub fn configure(cfg: &mut ServiceConfig) {
    cfg.service(healthz).service(readyz).service(metrics);
}

/// The process is alive.
#[derive(Debug, Serialize, ToSchema)]
pub struct Health {
    /// Always `ok`.
    pub status: &'static str,
}

/// One readiness check.
#[derive(Debug, Serialize, ToSchema)]
pub struct ReadinessCheck {
    /// What was checked (`catalogue`, `store`, ...).
    pub name: String,
    pub ok: bool,
    pub detail: String,
}

/// Whether the instance should receive traffic.
#[derive(Debug, Serialize, ToSchema)]
pub struct Readiness {
    /// `ready` or `not ready`.
    pub status: &'static str,
    /// Catalogue revision served. Left out, with the checks' details, for a
    /// caller without a reader token when anonymous reads are off.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub catalogue_revision: Option<i64>,
    /// True while the database cannot be reached: answers come from the
    /// catalogue held in memory and may be stale.
    pub catalogue_may_be_stale: bool,
    pub checks: Vec<ReadinessCheck>,
}

/// Liveness: answers as long as the process serves HTTP.
#[utoipa::path(tag = "operations", responses((status = 200, description = "Alive", body = Health)))]
#[get("/healthz")]
async fn healthz() -> HttpResponse {
    HttpResponse::Ok().json(Health { status: "ok" })
}

/// How long the readiness probe waits for the database.
const STORE_PROBE_TIMEOUT: std::time::Duration = std::time::Duration::from_secs(2);

/// The readiness checks of this instance: the catalogue is loaded and the
/// store answers.
pub async fn readiness(state: &AppState) -> Readiness {
    let snapshot = state.app.current();
    let loaded = snapshot.revision >= 1 && !snapshot.entries.is_empty();
    let store = &state.app;
    let store_check = match tokio::time::timeout(STORE_PROBE_TIMEOUT, store.head()).await {
        Ok(Ok(head)) => ReadinessCheck {
            name: "store".into(),
            ok: true,
            detail: format!("{} reachable, head revision {head}", store.backend()),
        },
        Ok(Err(e)) => ReadinessCheck {
            name: "store".into(),
            ok: false,
            detail: if matches!(e, crate::app::AppError::Unavailable { .. }) {
                format!("{} unavailable", store.backend())
            } else {
                tracing::error!(error = %e, "readiness: store check failed");
                format!("{} check failed", store.backend())
            },
        },
        Err(_) => ReadinessCheck {
            name: "store".into(),
            ok: false,
            detail: format!(
                "{} did not answer within {} s",
                store.backend(),
                STORE_PROBE_TIMEOUT.as_secs()
            ),
        },
    };
    let checks = vec![
        ReadinessCheck {
            name: "catalogue".into(),
            ok: loaded,
            detail: format!(
                "revision {} with {} friction entries loaded",
                snapshot.revision,
                snapshot.entries.len()
            ),
        },
        store_check,
    ];
    let ready = checks.iter().all(|c| c.ok);
    Readiness {
        status: if ready { "ready" } else { "not ready" },
        catalogue_revision: Some(snapshot.revision),
        catalogue_may_be_stale: state.app.stale(),
        checks,
    }
}

/// Readiness: 200 when the catalogue is loaded (and the store reachable),
/// 503 otherwise, with the checks either way.
#[utoipa::path(
    tag = "operations",
    responses(
        (status = 200, description = "Ready", body = Readiness),
        (status = 503, description = "Not ready", body = Readiness)
    )
)]
#[get("/readyz")]
async fn readyz(state: web::Data<AppState>, req: HttpRequest) -> HttpResponse {
    let mut r = readiness(&state).await;
    if !may_read(&req).await {
        r.catalogue_revision = None;
        for check in &mut r.checks {
            check.detail = "details need a reader token (anonymous reads are off)".into();
        }
    }
    if r.status == "ready" {
        HttpResponse::Ok().json(r)
    } else {
        HttpResponse::ServiceUnavailable().json(r)
    }
}

/// Whether the caller may see what the catalogue holds: anonymous reads
/// on, or a token of role reader or above. Probes stay answered either way.
async fn may_read(req: &HttpRequest) -> bool {
    let Some(auth) = req.app_data::<web::Data<AppState>>().map(|s| &s.auth) else {
        return false;
    };
    let header = req
        .headers()
        .get(actix_web::http::header::AUTHORIZATION)
        .and_then(|v| v.to_str().ok());
    auth.check(header, Role::Reader).await.is_ok()
}

/// Prometheus metrics in the text exposition format.
#[utoipa::path(
    tag = "operations",
    responses((status = 200, description = "Prometheus text format", content_type = "text/plain; version=0.0.4", body = String))
)]
#[get("/metrics")]
async fn metrics(_reader: Reader, state: web::Data<AppState>) -> Result<HttpResponse, ApiError> {
    state.metrics.set_catalogue_revision(state.app.revision());
    let text = state.metrics.render().map_err(ApiError::Internal)?;
    Ok(HttpResponse::Ok()
        .content_type("text/plain; version=0.0.4; charset=utf-8")
        .body(text))
}
