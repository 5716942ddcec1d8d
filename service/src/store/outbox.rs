//! The outbox: events (CloudEvents JSON) written in the transaction of the
//! change they announce, read in order by whatever delivers them.

use chrono::{DateTime, Utc};

use super::backend::{dispatch, Tx};
use super::{Store, StoreError};
use crate::registry::OutboxEvent;

/// Most events one read of the outbox returns.
pub const OUTBOX_PAGE_MAX: i64 = 1000;

/// An event as the outbox holds it, with its place in the order.
#[derive(Debug, Clone, PartialEq)]
pub struct StoredEvent {
    pub seq: i64,
    pub event: OutboxEvent,
}

#[derive(sqlx::FromRow)]
struct EventRow {
    seq: i64,
    event_id: String,
    event_type: String,
    subject: String,
    payload: String,
    created_at: DateTime<Utc>,
}

const INSERT: &str = "INSERT INTO outbox (event_id, event_type, subject, payload, created_at) \
     VALUES ($1, $2, $3, $4, $5) RETURNING seq";

/// One delivery per active subscription to the event's type, due at once.
const FAN_OUT: &str = "INSERT INTO deliveries (event_seq, subscription_id, next_attempt_at) \
     SELECT $1, s.id, $2 FROM subscriptions s \
     JOIN subscription_events e ON e.subscription_id = s.id \
     WHERE s.active AND e.event_type = $3";

const AFTER: &str = "SELECT seq, event_id, event_type, subject, payload, created_at FROM outbox \
     WHERE seq > $1 ORDER BY seq LIMIT $2";

/// Writes `event` inside the open transaction, with a delivery for every
/// active subscription to its type (so a subscription receives exactly the
/// events committed after it, and an event is never without its deliveries).
pub(super) async fn insert_in(tx: &mut Tx, event: &OutboxEvent) -> Result<(), StoreError> {
    let payload = serde_json::to_string(&event.payload)?;
    let seq: i64 = dispatch!(Tx, &mut *tx, |c| sqlx::query_scalar(INSERT)
        .bind(&event.id)
        .bind(&event.kind)
        .bind(&event.subject)
        .bind(&payload)
        .bind(event.created_at)
        .fetch_one(&mut **c)
        .await?);
    dispatch!(Tx, &mut *tx, |c| sqlx::query(FAN_OUT)
        .bind(seq)
        .bind(event.created_at.timestamp_millis())
        .bind(&event.kind)
        .execute(&mut **c)
        .await
        .map(drop)?);
    Ok(())
}

/// A fresh event id: 128 random bits as hex (receivers de-duplicate on it).
pub fn new_event_id() -> String {
    let bits: u128 = rand::random();
    format!("{bits:032x}")
}

impl Store {
    /// Outbox events after `seq` in order, at most `limit` (1–1000).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn outbox_after(&self, seq: i64, limit: i64) -> Result<Vec<StoredEvent>, StoreError> {
        let limit = limit.clamp(1, OUTBOX_PAGE_MAX);
        let rows: Vec<EventRow> = dispatch!(Store, self, |pool| sqlx::query_as(AFTER)
            .bind(seq)
            .bind(limit)
            .fetch_all(pool)
            .await?);
        rows.into_iter()
            .map(|r| {
                Ok(StoredEvent {
                    seq: r.seq,
                    event: OutboxEvent {
                        id: r.event_id,
                        kind: r.event_type,
                        subject: r.subject,
                        payload: serde_json::from_str(&r.payload)?,
                        created_at: r.created_at,
                    },
                })
            })
            .collect()
    }
}
