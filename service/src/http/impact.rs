//! `POST /v1/catalogue/impact`: what a proposed friction-entry change (or
//! a friction test's proposal) would do to every joint with an active
//! release, computed in memory (nothing written; the reading role is
//! enough), and `POST /v1/joints/{id}/review/confirm`: an editor confirms a
//! due review without a new release. Each handler extracts, calls
//! `app::impact` and renders.

use actix_web::{post, web, HttpResponse};
use serde::Deserialize;
use utoipa::ToSchema;

use super::catalogue::wire::{EntryWrite, NoQuery};
use crate::app::impact::{ImpactResponse, ProposedChange};
use crate::app::joints::JointView;
use crate::http::auth::{Editor, Reader};
use crate::http::error::ApiError;
use crate::http::extract::Query;
use crate::http::problem::FieldError;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(catalogue_impact).service(confirm_review);
}

/// A proposed change: `action` with `entry` (create), `entry_id` and
/// `entry` (update) or `entry_id` (retire) — or `friction_test` alone
/// (with an optional `basis`, `three_sigma` when left out).
#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ImpactWrite {
    /// `create`, `update` or `retire`.
    pub action: Option<String>,
    /// The friction entry updated or retired.
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub entry_id: Option<i64>,
    /// The friction-entry body as for create or update (`reason` optional
    /// here: nothing is recorded).
    pub entry: Option<EntryWrite>,
    /// A stored friction test whose proposal to judge.
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub friction_test: Option<i64>,
    /// `observed` or `three_sigma` (friction test only).
    pub basis: Option<String>,
}

/// The body of a review confirmation.
#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ReviewConfirmWrite {
    /// Why the active release still holds (recorded in the joint history).
    pub reason: String,
}

/// The entry body's problems named under `entry.`.
fn entry_input(entry: EntryWrite) -> Result<crate::catalogue::EntryInput, ApiError> {
    let mut entry = entry;
    if entry.reason.trim().is_empty() {
        entry.reason = "impact of a proposed change".into();
    }
    entry.into_input().map(|(e, _)| e).map_err(|e| match e {
        ApiError::Unprocessable { errors, .. } => ApiError::unprocessable(
            errors
                .into_iter()
                .map(|f| FieldError::new(format!("entry.{}", f.field), f.reason))
                .collect(),
        ),
        other => other,
    })
}

fn proposed(body: ImpactWrite) -> Result<ProposedChange, ApiError> {
    let none = |field: &str, why: &str| ApiError::invalid(field, why.to_string());
    if let Some(id) = body.friction_test {
        if body.action.is_some() || body.entry.is_some() || body.entry_id.is_some() {
            return Err(none(
                "friction_test",
                "name either a friction test or an action with its entry, not both",
            ));
        }
        return Ok(ProposedChange::FrictionTest {
            id,
            basis: body.basis.unwrap_or_else(|| "three_sigma".into()),
        });
    }
    if body.basis.is_some() {
        return Err(none("basis", "a basis goes with friction_test only"));
    }
    let Some(action) = body.action else {
        return Err(none(
            "action",
            "missing: create, update or retire (or name a friction_test)",
        ));
    };
    let need_id = || {
        body.entry_id
            .ok_or_else(|| none("entry_id", "missing: the entry to change"))
    };
    match action.as_str() {
        "create" => {
            if body.entry_id.is_some() {
                return Err(none(
                    "entry_id",
                    "a created entry gets its id from the catalogue",
                ));
            }
            let entry = body
                .entry
                .ok_or_else(|| none("entry", "missing: the entry to create"))?;
            Ok(ProposedChange::Create(entry_input(entry)?))
        }
        "update" => {
            let entry_id = need_id()?;
            let entry = body
                .entry
                .ok_or_else(|| none("entry", "missing: the entry as it would be"))?;
            Ok(ProposedChange::Update {
                entry_id,
                entry: entry_input(entry)?,
            })
        }
        "retire" => {
            let entry_id = need_id()?;
            if body.entry.is_some() {
                return Err(none("entry", "a retirement takes entry_id alone"));
            }
            Ok(ProposedChange::Retire { entry_id })
        }
        other => Err(none(
            "action",
            &format!("'{other}' is not an action; use create, update or retire"),
        )),
    }
}

/// The impact of a proposed friction-entry change (or a friction test's
/// proposal) on every joint with an active release: before (the stored
/// release) and after (computed against the catalogue with the change
/// applied in memory), the largest relative change and the checks added
/// or removed. Writes nothing.
#[utoipa::path(
    tag = "catalogue",
    request_body = ImpactWrite,
    responses(
        (status = 200, description = "The impact", body = ImpactResponse),
        (status = 401, description = "Token required or not accepted"),
        (status = 404, description = "No such entry or friction test"),
        (status = 422, description = "Bad body, naming the field"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/catalogue/impact")]
async fn catalogue_impact(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    body: web::Json<ImpactWrite>,
) -> Result<HttpResponse, ApiError> {
    let change = proposed(body.into_inner())?;
    let answer = state.app.impact(&change).await?;
    Ok(HttpResponse::Ok().json(answer))
}

/// Confirms a joint's due review without a new release (editor): the
/// reason is recorded in the joint's history and the mark cleared. A
/// joint without a due review is 409.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id")),
    request_body = ReviewConfirmWrite,
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Confirmed: the mark is cleared", body = JointView),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not confirm"),
        (status = 404, description = "No such joint (with near ids)"),
        (status = 409, description = "No review due"),
        (status = 422, description = "Reason missing or an unknown field"),
    )
)]
#[post("/v1/joints/{id}/review/confirm")]
async fn confirm_review(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let joint = state.app.confirm_review(&who.0.name, &id, &body).await?;
    Ok(HttpResponse::Ok().json(joint))
}
