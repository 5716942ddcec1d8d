//! `/v1/subscriptions` (admin): webhook subscriptions — create one (its
//! signing secret in the 201 answer only), read, list, delete, and its
//! delivery log. Each handler extracts, calls one use case of
//! `app::subscriptions` and renders.

use actix_web::http::header;
use actix_web::{delete, get, post, web, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::{IntoParams, ToSchema};

use super::catalogue::wire::NoQuery;
use crate::app::subscriptions::{CreatedSubscription, DeliveryAttemptView, SubscriptionView};
use crate::http::auth::Admin;
use crate::http::error::ApiError;
use crate::http::extract::Query;
use crate::http::state::AppState;

pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    cfg.service(list_subscriptions)
        .service(create_subscription)
        .service(get_subscription)
        .service(delete_subscription)
        .service(delivery_log);
}

/// A subscription as an administrator sends it.
#[derive(Debug, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct SubscriptionWrite {
    /// Absolute `http`/`https` URL with a host, no user name or password,
    /// at most 2048 characters. Redirects from it are not followed.
    pub url: String,
    /// Event types: `joint.released`, `joint.withdrawn`, `joint.review_due`,
    /// `catalogue.revision_created` (at least one, each once).
    pub events: Vec<String>,
}

/// A page: `limit` 1–500 (default 50), `after` the previous page's `next`.
#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct PageQuery {
    /// Rows per page, 1–500 (default 50).
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub limit: Option<i64>,
    /// The `next` of the previous page.
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub after: Option<i64>,
}

/// A page of subscriptions in id order (deleted ones too, `active: false`).
#[derive(Debug, Serialize, ToSchema)]
pub struct SubscriptionList {
    pub subscriptions: Vec<SubscriptionView>,
    /// Send as `after` for the next page; `null` on the last.
    pub next: Option<i64>,
}

/// A page of a subscription's delivery log, oldest attempt first.
#[derive(Debug, Serialize, ToSchema)]
pub struct DeliveryLog {
    pub subscription: i64,
    pub attempts: Vec<DeliveryAttemptView>,
    /// Send as `after` for the next page; `null` on the last.
    pub next: Option<i64>,
}

/// The webhook subscriptions, a page at a time (admin).
#[utoipa::path(
    tag = "subscriptions",
    params(PageQuery),
    security(("bearer" = [])),
    responses(
        (status = 200, description = "A page of subscriptions", body = SubscriptionList),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Only an administrator reads subscriptions"),
        (status = 422, description = "Bad limit"),
    )
)]
#[get("/v1/subscriptions")]
async fn list_subscriptions(
    state: web::Data<AppState>,
    _who: Admin,
    q: Query<PageQuery>,
) -> Result<HttpResponse, ApiError> {
    let q = q.into_inner();
    let (subscriptions, next) = state.app.subscriptions(q.after, q.limit).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "no-store"))
        .json(SubscriptionList {
            subscriptions,
            next,
        }))
}

/// Subscribes a URL to event types (admin). The answer holds the signing
/// secret, shown this once: keep it to verify `webhook-signature`. The
/// subscription receives the events created after it.
#[utoipa::path(
    tag = "subscriptions",
    request_body = SubscriptionWrite,
    security(("bearer" = [])),
    responses(
        (status = 201, description = "Subscribed; `secret` shown once", body = CreatedSubscription, headers(("Location" = String, description = "The subscription's path"))),
        (status = 401, description = "Token required or not accepted"),
        (status = 403, description = "Only an administrator subscribes"),
        (status = 409, description = "Too many active subscriptions"),
        (status = 422, description = "Bad URL or event types, each named (`url`, `events[1]`); nothing written"),
    )
)]
#[post("/v1/subscriptions")]
async fn create_subscription(
    state: web::Data<AppState>,
    who: Admin,
    _q: Query<NoQuery>,
    body: web::Json<SubscriptionWrite>,
) -> Result<HttpResponse, ApiError> {
    let created = state
        .app
        .create_subscription(&who.0.name, &body.url, &body.events)
        .await?;
    Ok(HttpResponse::Created()
        .insert_header((
            header::LOCATION,
            format!("/v1/subscriptions/{}", created.id),
        ))
        .insert_header((header::CACHE_CONTROL, "no-store"))
        .json(created))
}

/// One subscription (admin), never its secret.
#[utoipa::path(
    tag = "subscriptions",
    params(("id" = i64, Path, description = "Subscription id")),
    security(("bearer" = [])),
    responses(
        (status = 200, description = "The subscription", body = SubscriptionView),
        (status = 403, description = "Only an administrator reads subscriptions"),
        (status = 404, description = "No such subscription"),
    )
)]
#[get("/v1/subscriptions/{id}")]
async fn get_subscription(
    state: web::Data<AppState>,
    _who: Admin,
    _q: Query<NoQuery>,
    id: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    let s = state.app.subscription(id.into_inner()).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "no-store"))
        .json(s))
}

/// Deletes a subscription (admin): nothing more is delivered to it and
/// its pending deliveries are cancelled; it and its log stay readable
/// (`active: false`).
#[utoipa::path(
    tag = "subscriptions",
    params(("id" = i64, Path, description = "Subscription id")),
    security(("bearer" = [])),
    responses(
        (status = 204, description = "Deleted"),
        (status = 403, description = "Only an administrator deletes subscriptions"),
        (status = 404, description = "No active subscription with this id"),
    )
)]
#[delete("/v1/subscriptions/{id}")]
async fn delete_subscription(
    state: web::Data<AppState>,
    _who: Admin,
    _q: Query<NoQuery>,
    id: web::Path<i64>,
) -> Result<HttpResponse, ApiError> {
    state.app.delete_subscription(id.into_inner()).await?;
    Ok(HttpResponse::NoContent().finish())
}

/// A subscription's delivery log (admin): every attempt, oldest first,
/// with the status answered or why none came, its duration and outcome.
#[utoipa::path(
    tag = "subscriptions",
    params(("id" = i64, Path, description = "Subscription id"), PageQuery),
    security(("bearer" = [])),
    responses(
        (status = 200, description = "A page of the log", body = DeliveryLog),
        (status = 403, description = "Only an administrator reads delivery logs"),
        (status = 404, description = "No such subscription"),
        (status = 422, description = "Bad limit"),
    )
)]
#[get("/v1/subscriptions/{id}/deliveries")]
async fn delivery_log(
    state: web::Data<AppState>,
    _who: Admin,
    id: web::Path<i64>,
    q: Query<PageQuery>,
) -> Result<HttpResponse, ApiError> {
    let id = id.into_inner();
    let q = q.into_inner();
    let (attempts, next) = state.app.delivery_log(id, q.after, q.limit).await?;
    Ok(HttpResponse::Ok()
        .insert_header((header::CACHE_CONTROL, "no-store"))
        .json(DeliveryLog {
            subscription: id,
            attempts,
            next,
        }))
}
