//! `/v1/joints`: define a joint (editor), read one with its ETag, list
//! them (by tag, due review, in pages of ids with a `next` cursor) and
//! change a definition (editor, `If-Match`). Each handler extracts, calls
//! one use case of `app::joints` and renders; the body is read by the
//! registry (`JointDefinition::from_json`), so [`JointWrite`] only
//! documents it.

use actix_web::http::{header, StatusCode};
use actix_web::{get, post, put, web, HttpRequest, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::{IntoParams, ToSchema};

use super::catalogue::if_match;
use super::catalogue::wire::NoQuery;
use crate::app::joints::{JointQuery, JointView};
use crate::app::spec::SpecRequest;
use crate::http::auth::{Editor, Reader};
use crate::http::error::ApiError;
use crate::http::extract::Query;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(list_joints)
        .service(create_joint)
        .service(get_joint)
        .service(update_joint);
}

/// How the tool is given the values.
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct SetpointsWrite {
    /// `N·m` (default), `lbf·ft` or `lbf·in`.
    pub torque_unit: Option<String>,
    /// Torque step of the tool, in `torque_unit`.
    pub resolution: Option<f64>,
    /// Angle step of the tool, in degrees.
    pub angle_resolution: Option<f64>,
}

/// A joint's definition as an editor sends it (create and change).
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct JointWrite {
    /// The plant's key: 1–64 of `A–Z a–z 0–9 . _ -`, case kept; not `export`, `import` or `releases` (fixed paths under `/v1/joints/`).
    pub id: String,
    /// 1–200 characters.
    pub title: String,
    /// Free strings (product, station, line), at most 32, each 1–64 characters.
    pub tags: Option<Vec<String>>,
    /// Everything `POST /v1/tightening-specs` takes; it must compute
    /// against the current catalogue.
    pub request: SpecRequest,
    pub setpoints: Option<SetpointsWrite>,
}

/// Only joints whose review is due.
#[derive(Debug, Clone, Copy, Deserialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum ReviewFilter {
    Due,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct JointListQuery {
    /// Only joints carrying this tag.
    pub tag: Option<String>,
    /// Only joints with a release now at this status: `draft`, `released`,
    /// `superseded` or `withdrawn`.
    pub status: Option<String>,
    /// `due`: only joints marked for review after a catalogue change.
    #[param(inline)]
    pub review: Option<ReviewFilter>,
    /// Joints per page, 1–500 (default 50).
    pub limit: Option<u32>,
    /// The `next` of the previous page: joints with ids after this one.
    pub after: Option<String>,
}

/// A page of joints in id order.
#[derive(Debug, Serialize, ToSchema)]
pub struct JointList {
    pub joints: Vec<JointView>,
    /// Send as `after` for the next page; `null` on the last.
    pub next: Option<String>,
}

fn view(joint: JointView, status: StatusCode) -> HttpResponse {
    let mut b = HttpResponse::build(status);
    b.insert_header((header::ETAG, joint.etag()))
        .insert_header((header::CACHE_CONTROL, "no-cache"));
    if status == StatusCode::CREATED {
        b.insert_header((header::LOCATION, format!("/v1/joints/{}", joint.id)));
    }
    b.json(joint)
}

/// The registered joints, in id order, a page at a time.
#[utoipa::path(
    tag = "joints",
    params(JointListQuery),
    responses(
        (status = 200, description = "A page of joints", body = JointList),
        (status = 400, description = "Malformed query"),
        (status = 401, description = "Token required or not accepted"),
        (status = 422, description = "Bad limit, cursor, tag or status"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints")]
async fn list_joints(
    state: web::Data<AppState>,
    _who: Reader,
    q: Query<JointListQuery>,
) -> Result<HttpResponse, ApiError> {
    let q = q.into_inner();
    let page = state
        .app
        .joints(&JointQuery {
            tag: q.tag,
            status: q.status,
            review_due: q.review.is_some(),
            limit: q.limit,
            after: q.after,
        })
        .await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "no-cache"))
        .json(JointList {
            joints: page.joints.iter().map(JointView::from).collect(),
            next: page.next,
        }))
}

/// One joint, with its ETag (send it back as If-Match to change it).
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id")),
    responses(
        (status = 200, description = "The joint", body = JointView, headers(("ETag" = String, description = "Entity tag for If-Match"))),
        (status = 404, description = "No such joint"),
        (status = 422, description = "Not a joint id"),
        (status = 503, description = "Database unavailable"),
    )
)]
#[get("/v1/joints/{id}")]
async fn get_joint(
    state: web::Data<AppState>,
    _who: Reader,
    _q: Query<NoQuery>,
    id: web::Path<String>,
) -> Result<HttpResponse, ApiError> {
    let joint = state.app.joint(&id).await?;
    Ok(view(JointView::from(&joint), StatusCode::OK))
}

/// Defines a joint (editor): its id, title, tags, spec request and tool
/// presentation. The request must compute against the current catalogue.
#[utoipa::path(
    tag = "joints",
    request_body = JointWrite,
    security(("bearer" = [])),
    responses(
        (status = 201, description = "Defined (version 1)", body = JointView, headers(("ETag" = String, description = "Entity tag for If-Match"), ("Location" = String, description = "The joint's path"))),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Role may not define joints"),
        (status = 409, description = "A joint with this id exists"),
        (status = 422, description = "Every problem listed; nothing written"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[post("/v1/joints")]
async fn create_joint(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let joint = state.app.create_joint(&who.0.name, &body).await?;
    Ok(view(JointView::from(&joint), StatusCode::CREATED))
}

/// Replaces a joint's definition (editor): the whole definition, with
/// `If-Match: <ETag>`. A stale ETag gets 412 with the current joint; a
/// missing one 428. The id does not change.
#[utoipa::path(
    tag = "joints",
    params(("id" = String, Path, description = "The joint's id"), ("If-Match" = String, Header, description = "ETag from GET")),
    request_body = JointWrite,
    security(("bearer" = [])),
    responses(
        (status = 200, description = "Changed", body = JointView, headers(("ETag" = String, description = "Entity tag for If-Match"))),
        (status = 404, description = "No such joint"),
        (status = 412, description = "Stale ETag; `current` holds the current joint"),
        (status = 422, description = "Every problem listed; nothing written"),
        (status = 428, description = "If-Match missing"),
        (status = 503, description = "Database unavailable; retry"),
    )
)]
#[put("/v1/joints/{id}")]
async fn update_joint(
    state: web::Data<AppState>,
    who: Editor,
    _q: Query<NoQuery>,
    id: web::Path<String>,
    req: HttpRequest,
    body: web::Json<serde_json::Value>,
) -> Result<HttpResponse, ApiError> {
    let expected = if_match(req.headers(), &format!("joint-{id}"))?;
    let joint = state
        .app
        .update_joint(&who.0.name, &id, expected, &body)
        .await?;
    Ok(view(JointView::from(&joint), StatusCode::OK))
}
