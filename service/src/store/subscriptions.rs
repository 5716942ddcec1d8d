//! Webhook subscriptions: create (with the event types they receive),
//! read, list in pages of ids, delete (the row stays, inactive, with its
//! log; its pending deliveries are cancelled), and the delivery log of one
//! subscription. The secret is read only by the delivery claim
//! (`deliveries`), never by these reads.

use chrono::{DateTime, Utc};

use super::backend::{dispatch, Tx};
use super::{Store, StoreError};

/// A subscription to create; `secret` is the signing secret.
#[derive(Debug, Clone)]
pub struct NewSubscription {
    pub url: String,
    pub events: Vec<String>,
    pub secret: String,
    pub created_by: String,
    pub created_at: DateTime<Utc>,
}

/// A subscription as stored, without its secret.
#[derive(Debug, Clone, PartialEq)]
pub struct Subscription {
    pub id: i64,
    pub url: String,
    pub events: Vec<String>,
    pub created_by: String,
    pub created_at: DateTime<Utc>,
    pub active: bool,
    pub deleted_at: Option<DateTime<Utc>>,
}

/// One attempt to deliver one event to one subscription, as logged.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct AttemptRecord {
    pub seq: i64,
    pub event_id: String,
    pub event_type: String,
    pub attempt: i64,
    pub attempted_at: DateTime<Utc>,
    pub status_code: Option<i64>,
    pub error: Option<String>,
    pub duration_ms: i64,
    pub outcome: String,
    pub next_attempt_at: Option<DateTime<Utc>>,
}

#[derive(sqlx::FromRow)]
struct SubscriptionRow {
    id: i64,
    url: String,
    events: String,
    created_by: String,
    created_at: DateTime<Utc>,
    active: bool,
    deleted_at: Option<DateTime<Utc>>,
}

impl TryFrom<SubscriptionRow> for Subscription {
    type Error = StoreError;
    fn try_from(r: SubscriptionRow) -> Result<Self, StoreError> {
        Ok(Subscription {
            id: r.id,
            url: r.url,
            events: serde_json::from_str(&r.events)?,
            created_by: r.created_by,
            created_at: r.created_at,
            active: r.active,
            deleted_at: r.deleted_at,
        })
    }
}

const COLUMNS: &str = "id, url, events, created_by, created_at, active, deleted_at";

const INSERT: &str = "INSERT INTO subscriptions (url, events, secret, created_by, created_at) \
     VALUES ($1, $2, $3, $4, $5) RETURNING id";

const INSERT_EVENT: &str =
    "INSERT INTO subscription_events (subscription_id, event_type) VALUES ($1, $2)";

const COUNT_ACTIVE: &str = "SELECT COUNT(*) FROM subscriptions WHERE active";

const DEACTIVATE: &str = "UPDATE subscriptions SET active = FALSE, deleted_at = $2 \
     WHERE id = $1 AND active";

const CANCEL_PENDING: &str = "UPDATE deliveries SET state = 'cancelled', lease_token = NULL, \
     locked_until = NULL WHERE subscription_id = $1 AND state = 'pending'";

const LOG: &str = "SELECT a.seq, o.event_id, o.event_type, a.attempt, a.attempted_at, \
     a.status_code, a.error, a.duration_ms, a.outcome, a.next_attempt_at \
     FROM delivery_attempts a JOIN outbox o ON o.seq = a.event_seq \
     WHERE a.subscription_id = $1 AND a.seq > $2 ORDER BY a.seq LIMIT $3";

/// Most rows one page of subscriptions or of a delivery log holds.
pub const PAGE_MAX: i64 = 500;

impl Store {
    /// Writes a subscription and its event types in one transaction,
    /// unless `max_active` active subscriptions exist already (then
    /// `Ok(None)`, nothing written).
    #[tracing::instrument(skip(self, new), level = "debug", fields(url = %new.url))]
    pub async fn create_subscription(
        &self,
        new: &NewSubscription,
        max_active: i64,
    ) -> Result<Option<Subscription>, StoreError> {
        let events = serde_json::to_string(&new.events)?;
        let mut tx = Tx::write(self).await?;
        let active: i64 = dispatch!(Tx, &mut tx, |c| sqlx::query_scalar(COUNT_ACTIVE)
            .fetch_one(&mut **c)
            .await?);
        if active >= max_active {
            tx.rollback().await?;
            return Ok(None);
        }
        let id: i64 = dispatch!(Tx, &mut tx, |c| sqlx::query_scalar(INSERT)
            .bind(&new.url)
            .bind(&events)
            .bind(&new.secret)
            .bind(&new.created_by)
            .bind(new.created_at)
            .fetch_one(&mut **c)
            .await?);
        for kind in &new.events {
            dispatch!(Tx, &mut tx, |c| sqlx::query(INSERT_EVENT)
                .bind(id)
                .bind(kind)
                .execute(&mut **c)
                .await
                .map(drop)?);
        }
        tx.commit().await?;
        self.subscription(id).await
    }

    /// The subscription `id` (deleted ones too), or `None`.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn subscription(&self, id: i64) -> Result<Option<Subscription>, StoreError> {
        let sql = format!("SELECT {COLUMNS} FROM subscriptions WHERE id = $1");
        let row: Option<SubscriptionRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(id)
            .fetch_optional(pool)
            .await?);
        row.map(Subscription::try_from).transpose()
    }

    /// Subscriptions with ids after `after`, in id order, at most `limit`
    /// (1–[`PAGE_MAX`]).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn subscriptions(
        &self,
        after: i64,
        limit: i64,
    ) -> Result<Vec<Subscription>, StoreError> {
        let sql = format!("SELECT {COLUMNS} FROM subscriptions WHERE id > $1 ORDER BY id LIMIT $2");
        let rows: Vec<SubscriptionRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(after)
            .bind(limit.clamp(1, PAGE_MAX))
            .fetch_all(pool)
            .await?);
        rows.into_iter().map(Subscription::try_from).collect()
    }

    /// Deletes subscription `id`: inactive from now on, its pending
    /// deliveries cancelled, its row and log kept. `false` when there is no
    /// active subscription `id`.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn delete_subscription(
        &self,
        id: i64,
        at: DateTime<Utc>,
    ) -> Result<bool, StoreError> {
        let mut tx = Tx::write(self).await?;
        let changed = dispatch!(Tx, &mut tx, |c| sqlx::query(DEACTIVATE)
            .bind(id)
            .bind(at)
            .execute(&mut **c)
            .await?
            .rows_affected());
        if changed == 0 {
            tx.rollback().await?;
            return Ok(false);
        }
        dispatch!(Tx, &mut tx, |c| sqlx::query(CANCEL_PENDING)
            .bind(id)
            .execute(&mut **c)
            .await
            .map(drop)?);
        tx.commit().await?;
        Ok(true)
    }

    /// The delivery log of subscription `id`: attempts after log position
    /// `after`, oldest first, at most `limit` (1–[`PAGE_MAX`]).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn delivery_log(
        &self,
        id: i64,
        after: i64,
        limit: i64,
    ) -> Result<Vec<AttemptRecord>, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_as(LOG)
            .bind(id)
            .bind(after)
            .bind(limit.clamp(1, PAGE_MAX))
            .fetch_all(pool)
            .await?))
    }
}
