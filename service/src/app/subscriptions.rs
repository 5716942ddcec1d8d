//! Webhook subscriptions: create (the URL and event types checked, the
//! signing secret made and shown once), read, list, delete, and a
//! subscription's delivery log. Delivery itself is `app::delivery`.

use chrono::{DateTime, Utc};
use serde::Serialize;
use utoipa::ToSchema;

use super::quantity::Quantity;
use super::reading::suggest;
use super::{App, AppError, FieldProblem};
use crate::registry::event::EVENT_TYPES;
use crate::store::subscriptions::{AttemptRecord, NewSubscription, Subscription};

/// Longest accepted target URL.
pub const MAX_URL_CHARS: usize = 2048;

/// Most active subscriptions (each event is delivered to every one).
pub const MAX_ACTIVE: i64 = 100;

/// A subscription as served (never its secret).
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct SubscriptionView {
    pub id: i64,
    /// Where events are POSTed.
    pub url: String,
    /// The event types it receives.
    pub events: Vec<String>,
    /// The token name that created it.
    pub created_by: String,
    #[schema(value_type = String, format = DateTime)]
    pub created_at: DateTime<Utc>,
    /// `false` once deleted (its log stays readable).
    pub active: bool,
    #[schema(value_type = Option<String>, format = DateTime)]
    pub deleted_at: Option<DateTime<Utc>>,
}

impl From<Subscription> for SubscriptionView {
    fn from(s: Subscription) -> Self {
        Self {
            id: s.id,
            url: s.url,
            events: s.events,
            created_by: s.created_by,
            created_at: s.created_at,
            active: s.active,
            deleted_at: s.deleted_at,
        }
    }
}

/// A new subscription with its signing secret (shown in this answer only).
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct CreatedSubscription {
    pub id: i64,
    pub url: String,
    pub events: Vec<String>,
    pub created_by: String,
    #[schema(value_type = String, format = DateTime)]
    pub created_at: DateTime<Utc>,
    pub active: bool,
    /// `whsec_` + base64 of the HMAC-SHA256 key: verify `webhook-signature`
    /// with it. Shown once; later reads never show it.
    pub secret: String,
}

/// One delivery attempt in a subscription's log.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct DeliveryAttemptView {
    /// Position in the log (the `after` of the next page).
    pub seq: i64,
    /// The event's id (`webhook-id`).
    pub event_id: String,
    pub event_type: String,
    /// 1 for the first attempt of this event to this subscription.
    pub attempt: i64,
    #[schema(value_type = String, format = DateTime)]
    pub attempted_at: DateTime<Utc>,
    /// The HTTP status the target answered; `null` when none came.
    pub status_code: Option<i64>,
    /// Why the attempt did not deliver (no answer in time, a redirect,
    /// a non-2xx status).
    pub error: Option<String>,
    /// How long the attempt took, in ms.
    pub duration: Quantity,
    /// `delivered`, `retry` (tried again at `next_attempt_at`) or `failed`
    /// (the back-off schedule is spent).
    pub outcome: String,
    #[schema(value_type = Option<String>, format = DateTime)]
    pub next_attempt_at: Option<DateTime<Utc>>,
}

impl From<AttemptRecord> for DeliveryAttemptView {
    fn from(a: AttemptRecord) -> Self {
        Self {
            seq: a.seq,
            event_id: a.event_id,
            event_type: a.event_type,
            attempt: a.attempt,
            attempted_at: a.attempted_at,
            status_code: a.status_code,
            error: a.error,
            // durations are milliseconds well within f64's exact integers
            duration: Quantity::new(a.duration_ms as f64, "ms"),
            outcome: a.outcome,
            next_attempt_at: a.next_attempt_at,
        }
    }
}

/// A page size: 1–500, 50 when not given; `field` names it when refused.
pub fn page_limit(limit: Option<i64>, field: &str) -> Result<i64, AppError> {
    match limit {
        None => Ok(50),
        Some(n) if (1..=crate::store::subscriptions::PAGE_MAX).contains(&n) => Ok(n),
        Some(_) => Err(AppError::field(FieldProblem::invalid(
            field,
            "must be 1–500",
        ))),
    }
}

/// A target URL as accepted: absolute `http`/`https` with a host, no
/// user name or password, no fragment, at most [`MAX_URL_CHARS`].
pub fn check_url(given: &str) -> Result<String, FieldProblem> {
    let bad = |reason: String| FieldProblem::invalid("url", reason);
    let given = given.trim();
    if given.chars().count() > MAX_URL_CHARS {
        return Err(bad(format!("at most {MAX_URL_CHARS} characters")));
    }
    let url = url::Url::parse(given).map_err(|e| bad(format!("not an absolute URL ({e})")))?;
    if !matches!(url.scheme(), "http" | "https") {
        return Err(bad(format!(
            "scheme must be http or https, not {}",
            url.scheme()
        )));
    }
    if url.host_str().is_none_or(str::is_empty) {
        return Err(bad("a host is required".into()));
    }
    if !url.username().is_empty() || url.password().is_some() {
        return Err(bad(
            "credentials in the URL are refused; receivers authenticate the service by the signature"
                .into(),
        ));
    }
    if url.fragment().is_some() {
        return Err(bad("a fragment is never sent; remove it".into()));
    }
    Ok(url.to_string())
}

/// The event types as accepted: at least one, each known, none twice;
/// every problem named `events[i]` (an unknown one with the nearest).
pub fn check_events(given: &[String]) -> Result<Vec<String>, Vec<FieldProblem>> {
    let known: Vec<String> = EVENT_TYPES.iter().map(|s| s.to_string()).collect();
    if given.is_empty() {
        return Err(vec![FieldProblem::invalid(
            "events",
            format!("at least one event type: {}", known.join(", ")),
        )]);
    }
    let mut problems = Vec::new();
    for (i, e) in given.iter().enumerate() {
        let field = format!("events[{i}]");
        if !known.contains(e) {
            problems.push(
                FieldProblem::invalid(
                    field,
                    format!("unknown event type; known: {}", known.join(", ")),
                )
                .with_suggestions(suggest(e, &known)),
            );
        } else if given[..i].contains(e) {
            problems.push(FieldProblem::invalid(field, "listed twice"));
        }
    }
    if problems.is_empty() {
        Ok(given.to_vec())
    } else {
        Err(problems)
    }
}

fn not_found(id: i64) -> AppError {
    AppError::field(FieldProblem::unknown("id", format!("no subscription {id}")))
}

impl App {
    /// Creates a subscription for `actor`: the URL and event types checked
    /// (every problem named; nothing written on any), a new signing secret.
    pub async fn create_subscription(
        &self,
        actor: &str,
        url: &str,
        events: &[String],
    ) -> Result<CreatedSubscription, AppError> {
        let mut problems = Vec::new();
        let url = check_url(url).map_err(|p| problems.push(p)).ok();
        let events = check_events(events)
            .map_err(|mut p| problems.append(&mut p))
            .ok();
        let (Some(url), Some(events)) = (url, events) else {
            return Err(AppError::Fields(problems));
        };
        let new = NewSubscription {
            url,
            events,
            secret: super::delivery::signature::new_secret(),
            created_by: actor.to_string(),
            created_at: Utc::now(),
        };
        let Some(s) = self.store().create_subscription(&new, MAX_ACTIVE).await? else {
            return Err(AppError::Conflict {
                field: "url".into(),
                reason: format!("at most {MAX_ACTIVE} active subscriptions; delete one first"),
            });
        };
        Ok(CreatedSubscription {
            id: s.id,
            url: s.url,
            events: s.events,
            created_by: s.created_by,
            created_at: s.created_at,
            active: s.active,
            secret: new.secret,
        })
    }

    /// Subscription `id` (404 naming `id` when there is none).
    pub async fn subscription(&self, id: i64) -> Result<SubscriptionView, AppError> {
        let s = self.store().subscription(id).await?;
        s.map(SubscriptionView::from).ok_or_else(|| not_found(id))
    }

    /// Subscriptions with ids after `after` (deleted ones too), a page of
    /// `limit` (1–500, default 50), and the cursor of the next page.
    pub async fn subscriptions(
        &self,
        after: Option<i64>,
        limit: Option<i64>,
    ) -> Result<(Vec<SubscriptionView>, Option<i64>), AppError> {
        let limit = page_limit(limit, "limit")?;
        let page = self
            .store()
            .subscriptions(after.unwrap_or(0), limit)
            .await?;
        let next = (page.len() as i64 == limit)
            .then(|| page.last().map(|s| s.id))
            .flatten();
        Ok((page.into_iter().map(Into::into).collect(), next))
    }

    /// Deletes subscription `id`: no more deliveries (pending ones are
    /// cancelled); it and its log stay readable. 404 naming `id` when no
    /// active subscription has it.
    pub async fn delete_subscription(&self, id: i64) -> Result<(), AppError> {
        if self.store().delete_subscription(id, Utc::now()).await? {
            Ok(())
        } else {
            Err(not_found(id))
        }
    }

    /// The delivery log of subscription `id`, oldest first, after log
    /// position `after`, a page of `limit`; with the next page's cursor.
    pub async fn delivery_log(
        &self,
        id: i64,
        after: Option<i64>,
        limit: Option<i64>,
    ) -> Result<(Vec<DeliveryAttemptView>, Option<i64>), AppError> {
        let limit = page_limit(limit, "limit")?;
        self.subscription(id).await?;
        let page = self
            .store()
            .delivery_log(id, after.unwrap_or(0), limit)
            .await?;
        let next = (page.len() as i64 == limit)
            .then(|| page.last().map(|a| a.seq))
            .flatten();
        Ok((page.into_iter().map(Into::into).collect(), next))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A URL on an invented host (the scheme marker is built, so the
    /// source holds no web address).
    fn hook(scheme: &str, rest: &str) -> String {
        format!("{scheme}{}{rest}", "://")
    }

    #[test]
    fn target_urls_are_absolute_http_with_a_host_and_no_credentials() {
        let good = hook("https", "tools.hollowmere.example/hooks/k4");
        assert_eq!(check_url(&good).unwrap(), good);
        assert!(check_url(&hook("http", "127.0.0.1:9000/x")).is_ok());
        for bad in [
            "/relative/path".to_string(),
            hook("ftp", "tools.hollowmere.example/x"),
            hook("https", "user:pw@tools.hollowmere.example/x"),
            hook("https", "user@tools.hollowmere.example/x"),
            hook("https", "tools.hollowmere.example/x#part"),
            hook("file", "/etc/passwd"),
            "not a url".to_string(),
        ] {
            let p = check_url(&bad).unwrap_err();
            assert_eq!(p.field, "url", "{bad}");
        }
        let long = format!("{good}/{}", "a".repeat(MAX_URL_CHARS));
        assert!(check_url(&long).unwrap_err().reason.contains("2048"));
    }

    #[test]
    fn event_types_are_known_listed_once_and_named_by_index() {
        let ok = check_events(&["joint.released".into(), "catalogue.revision_created".into()]);
        assert_eq!(ok.unwrap().len(), 2);
        let bad = check_events(&[
            "joint.released".into(),
            "joint.relesed".into(),
            "joint.released".into(),
        ])
        .unwrap_err();
        let fields: Vec<&str> = bad.iter().map(|p| p.field.as_str()).collect();
        assert_eq!(fields, ["events[1]", "events[2]"]);
        assert_eq!(
            bad[0].suggestions.first().map(String::as_str),
            Some("joint.released")
        );
        assert_eq!(check_events(&[]).unwrap_err()[0].field, "events");
    }
}
