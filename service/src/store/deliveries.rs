//! Delivery of outbox events to subscriptions: claim the due deliveries
//! (a lease, so that with several replicas each delivery is attempted by
//! one of them: `FOR UPDATE SKIP LOCKED` on PostgreSQL, the single writer
//! of `BEGIN IMMEDIATE` on SQLite), then record each attempt in the log and
//! the delivery's new state in one transaction. Deliveries themselves are
//! written with their event (`outbox::insert_in`).

use chrono::{DateTime, Utc};

use super::backend::{dispatch, Tx};
use super::outbox::new_event_id;
use super::{Store, StoreError};

/// A delivery claimed by one worker until `locked_until`.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct ClaimedDelivery {
    pub event_seq: i64,
    pub subscription_id: i64,
    /// Attempts made before this one.
    pub attempts: i64,
    pub lease_token: String,
    pub url: String,
    pub secret: String,
    pub event_id: String,
    pub event_type: String,
    /// The CloudEvents JSON, byte for byte as sent and signed.
    pub payload: String,
}

/// What became of a delivery after an attempt.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum DeliveryOutcome {
    /// The target answered 2xx.
    Delivered,
    /// Not accepted; tried again at this time.
    Retry(DateTime<Utc>),
    /// Not accepted and the back-off schedule is spent: given up.
    Failed,
}

impl DeliveryOutcome {
    pub fn as_str(self) -> &'static str {
        match self {
            DeliveryOutcome::Delivered => "delivered",
            DeliveryOutcome::Retry(_) => "retry",
            DeliveryOutcome::Failed => "failed",
        }
    }
}

/// One attempt as it went.
#[derive(Debug, Clone, PartialEq)]
pub struct Attempt {
    pub attempted_at: DateTime<Utc>,
    /// The status the target answered, if it answered.
    pub status_code: Option<u16>,
    /// Why no acceptable answer came (timeout, refused, redirect, 500).
    pub error: Option<String>,
    pub duration_ms: i64,
    pub outcome: DeliveryOutcome,
}

const ANY_DUE: &str = "SELECT COUNT(*) FROM deliveries WHERE state = 'pending' \
     AND next_attempt_at <= $1 AND (locked_until IS NULL OR locked_until <= $1)";

/// The claim: due, unleased deliveries, oldest due first; on PostgreSQL
/// rows another transaction holds are skipped.
macro_rules! claim_sql {
    ($lock:literal) => {
        concat!(
            "UPDATE deliveries SET lease_token = $1, locked_until = $2 \
             WHERE (event_seq, subscription_id) IN (\
             SELECT event_seq, subscription_id FROM deliveries \
             WHERE state = 'pending' AND next_attempt_at <= $3 \
             AND (locked_until IS NULL OR locked_until <= $3) \
             ORDER BY next_attempt_at, event_seq LIMIT $4",
            $lock,
            ")"
        )
    };
}
const CLAIM_POSTGRES: &str = claim_sql!(" FOR UPDATE SKIP LOCKED");
const CLAIM_SQLITE: &str = claim_sql!("");

const CLAIMED: &str = "SELECT d.event_seq, d.subscription_id, d.attempts, d.lease_token, \
     s.url, s.secret, o.event_id, o.event_type, o.payload \
     FROM deliveries d JOIN subscriptions s ON s.id = d.subscription_id \
     JOIN outbox o ON o.seq = d.event_seq \
     WHERE d.lease_token = $1 ORDER BY d.next_attempt_at, d.event_seq";

const LOG_ATTEMPT: &str = "INSERT INTO delivery_attempts (subscription_id, event_seq, attempt, \
     attempted_at, status_code, error, duration_ms, outcome, next_attempt_at) \
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)";

const SETTLE: &str = "UPDATE deliveries SET attempts = $3, state = $4, next_attempt_at = $5, \
     last_status = $6, delivered_at = $7, lease_token = NULL, locked_until = NULL \
     WHERE event_seq = $1 AND subscription_id = $2 AND lease_token = $8 AND state = 'pending'";

impl Store {
    /// Whether a delivery is due at `now` (a read: an idle worker does not
    /// take SQLite's write lock).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn deliveries_due(&self, now: DateTime<Utc>) -> Result<bool, StoreError> {
        let n: i64 = dispatch!(Store, self, |pool| sqlx::query_scalar(ANY_DUE)
            .bind(now.timestamp_millis())
            .fetch_one(pool)
            .await?);
        Ok(n > 0)
    }

    /// Claims at most `limit` deliveries due at `now` until `until` (their
    /// lease), in one transaction, and returns them with what sending
    /// needs. Claimed deliveries are invisible to other claims until the
    /// lease ends or the attempt is recorded.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn claim_deliveries(
        &self,
        now: DateTime<Utc>,
        until: DateTime<Utc>,
        limit: i64,
    ) -> Result<Vec<ClaimedDelivery>, StoreError> {
        let token = new_event_id();
        let mut tx = Tx::write(self).await?;
        let claim = tx.by_backend(CLAIM_POSTGRES, CLAIM_SQLITE);
        dispatch!(Tx, &mut tx, |c| sqlx::query(claim)
            .bind(&token)
            .bind(until.timestamp_millis())
            .bind(now.timestamp_millis())
            .bind(limit.clamp(1, 1000))
            .execute(&mut **c)
            .await
            .map(drop)?);
        let claimed: Vec<ClaimedDelivery> = dispatch!(Tx, &mut tx, |c| sqlx::query_as(CLAIMED)
            .bind(&token)
            .fetch_all(&mut **c)
            .await?);
        tx.commit().await?;
        Ok(claimed)
    }

    /// Logs `attempt` of `claim` and settles the delivery (delivered, due
    /// again, or failed), in one transaction. The state changes only while
    /// the claim's lease is the delivery's (a delivery claimed again after
    /// its lease ran out is settled by the later claim); the attempt is
    /// logged either way. Returns whether the state changed.
    #[tracing::instrument(skip(self, claim), level = "debug", fields(event = %claim.event_id, subscription = claim.subscription_id))]
    pub async fn settle_delivery(
        &self,
        claim: &ClaimedDelivery,
        attempt: &Attempt,
    ) -> Result<bool, StoreError> {
        let number = claim.attempts + 1;
        let (state, next, delivered_at) = match attempt.outcome {
            DeliveryOutcome::Delivered => ("delivered", None, Some(attempt.attempted_at)),
            DeliveryOutcome::Retry(at) => ("pending", Some(at), None),
            DeliveryOutcome::Failed => ("failed", None, None),
        };
        let next_ms = next.unwrap_or(attempt.attempted_at).timestamp_millis();
        let last_status = match (attempt.status_code, &attempt.error) {
            (Some(code), _) => format!("HTTP {code}"),
            (None, Some(e)) => e.clone(),
            (None, None) => "no answer".to_string(),
        };
        let mut tx = Tx::write(self).await?;
        dispatch!(Tx, &mut tx, |c| sqlx::query(LOG_ATTEMPT)
            .bind(claim.subscription_id)
            .bind(claim.event_seq)
            .bind(number)
            .bind(attempt.attempted_at)
            .bind(attempt.status_code.map(i64::from))
            .bind(&attempt.error)
            .bind(attempt.duration_ms)
            .bind(attempt.outcome.as_str())
            .bind(next)
            .execute(&mut **c)
            .await
            .map(drop)?);
        let changed = dispatch!(Tx, &mut tx, |c| sqlx::query(SETTLE)
            .bind(claim.event_seq)
            .bind(claim.subscription_id)
            .bind(number)
            .bind(state)
            .bind(next_ms)
            .bind(&last_status)
            .bind(delivered_at)
            .bind(&claim.lease_token)
            .execute(&mut **c)
            .await?
            .rows_affected());
        tx.commit().await?;
        Ok(changed == 1)
    }
}
