//! Webhook delivery: the [`Deliverer`] claims due deliveries from the
//! store, POSTs each event's CloudEvents JSON to its subscription's URL
//! with the Standard Webhooks headers (`webhook-id`, `webhook-timestamp`,
//! `webhook-signature`), and records the attempt. Only a 2xx answer
//! delivers; redirects are not followed (a 3xx is a failed attempt), each
//! attempt has a timeout, and failed attempts are retried on the back-off
//! schedule ([`schedule`]). Deliveries run concurrently and off the request
//! path (a task started by `startup`), so a hanging or failing target
//! slows neither requests nor other subscriptions. At-least-once: a
//! receiver de-duplicates on `webhook-id` (the event id).
//!
//! Time is passed in ([`Deliverer::deliver_due`] takes `now`), so tests
//! drive the back-off without waiting.

pub mod schedule;
pub mod signature;

use std::sync::Arc;
use std::time::{Duration, Instant};

use chrono::{DateTime, Utc};
use futures_util::future::join_all;

use super::{App, AppError};
use crate::store::deliveries::{Attempt, ClaimedDelivery, DeliveryOutcome};

/// How an instance delivers.
#[derive(Debug, Clone)]
pub struct DeliverySettings {
    /// Time between looks for due deliveries (the worker).
    pub interval: Duration,
    /// Longest one attempt may take: connect, send, answer.
    pub timeout: Duration,
    /// Attempts in flight at once on this instance.
    pub concurrency: usize,
}

impl Default for DeliverySettings {
    fn default() -> Self {
        Self {
            interval: Duration::from_secs(1),
            timeout: Duration::from_secs(10),
            concurrency: 16,
        }
    }
}

/// What one attempt came to.
#[derive(Debug, Clone, PartialEq)]
pub struct AttemptReport {
    pub event_id: String,
    pub subscription_id: i64,
    /// The attempt's number (1 for the first).
    pub attempt: i64,
    pub status_code: Option<u16>,
    pub outcome: DeliveryOutcome,
}

/// Claims, sends and records webhook deliveries.
#[derive(Debug, Clone)]
pub struct Deliverer {
    app: App,
    client: reqwest::Client,
    settings: DeliverySettings,
}

/// Extra time a claim is held beyond the attempt's timeout, so a slow
/// database write after the answer does not let another instance claim
/// the delivery again.
const LEASE_MARGIN: Duration = Duration::from_secs(60);

impl App {
    /// A deliverer over this application's store.
    pub fn deliverer(&self, settings: DeliverySettings) -> Result<Deliverer, AppError> {
        let client = reqwest::Client::builder()
            .redirect(reqwest::redirect::Policy::none())
            .timeout(settings.timeout)
            .connect_timeout(settings.timeout.min(Duration::from_secs(5)))
            .no_proxy()
            .user_agent(concat!("tightspec-webhooks/", env!("CARGO_PKG_VERSION")))
            .build()
            .map_err(|e| AppError::Internal(format!("webhook client: {e}")))?;
        Ok(Deliverer {
            app: self.clone(),
            client,
            settings,
        })
    }
}

impl Deliverer {
    /// Claims the deliveries due at `now` (at most the concurrency) and
    /// attempts them concurrently, each with its timeout; returns what each
    /// attempt came to. Several instances may call this at once: each
    /// delivery is claimed by one.
    pub async fn deliver_due(&self, now: DateTime<Utc>) -> Result<Vec<AttemptReport>, AppError> {
        let claims = self.claim(now, self.settings.concurrency).await?;
        let attempts = claims.into_iter().map(|c| self.attempt(c, now));
        Ok(join_all(attempts).await.into_iter().flatten().collect())
    }

    async fn claim(
        &self,
        now: DateTime<Utc>,
        limit: usize,
    ) -> Result<Vec<ClaimedDelivery>, AppError> {
        let store = self.app.store();
        if !store.deliveries_due(now).await? {
            return Ok(Vec::new());
        }
        let lease = chrono::Duration::from_std(self.settings.timeout + LEASE_MARGIN)
            .unwrap_or_else(|_| chrono::Duration::minutes(5));
        let limit = i64::try_from(limit).unwrap_or(1000);
        Ok(store.claim_deliveries(now, now + lease, limit).await?)
    }

    /// Sends one claimed delivery at `now` and records the attempt; `None`
    /// when the record could not be written (logged; the lease runs out
    /// and the delivery is claimed again).
    async fn attempt(&self, claim: ClaimedDelivery, now: DateTime<Utc>) -> Option<AttemptReport> {
        let number = claim.attempts + 1;
        let started = Instant::now();
        let (status_code, error) = self.send(&claim, now).await;
        let duration_ms = i64::try_from(started.elapsed().as_millis()).unwrap_or(i64::MAX);
        let outcome = match (status_code, &error) {
            (Some(code), None) if (200..300).contains(&code) => DeliveryOutcome::Delivered,
            _ => match schedule::next_attempt(number, now) {
                Some(at) => DeliveryOutcome::Retry(at),
                None => DeliveryOutcome::Failed,
            },
        };
        let attempt = Attempt {
            attempted_at: now,
            status_code,
            error,
            duration_ms,
            outcome,
        };
        if let Err(e) = self.app.store().settle_delivery(&claim, &attempt).await {
            tracing::warn!(event = %claim.event_id, subscription = claim.subscription_id, error = %e, "webhook attempt not recorded");
            return None;
        }
        tracing::info!(event = %claim.event_id, subscription = claim.subscription_id, attempt = number, outcome = outcome.as_str(), "webhook attempt");
        Some(AttemptReport {
            event_id: claim.event_id,
            subscription_id: claim.subscription_id,
            attempt: number,
            status_code,
            outcome,
        })
    }

    /// POSTs the event: the status answered (if any) and why it does not
    /// count as delivered (if it does not).
    async fn send(
        &self,
        claim: &ClaimedDelivery,
        now: DateTime<Utc>,
    ) -> (Option<u16>, Option<String>) {
        let timestamp = now.timestamp();
        let Some(signature) = signature::sign(
            &claim.secret,
            &claim.event_id,
            timestamp,
            claim.payload.as_bytes(),
        ) else {
            return (None, Some("the subscription's secret is malformed".into()));
        };
        let sent = self
            .client
            .post(&claim.url)
            .header("content-type", "application/json")
            .header("webhook-id", &claim.event_id)
            .header("webhook-timestamp", timestamp.to_string())
            .header("webhook-signature", signature)
            .body(claim.payload.clone())
            .send()
            .await;
        match sent {
            Ok(answer) => {
                let status = answer.status();
                let why = if status.is_success() {
                    None
                } else if status.is_redirection() {
                    Some(format!("redirect ({}) not followed", status.as_u16()))
                } else {
                    Some(format!("the target answered {}", status.as_u16()))
                };
                (Some(status.as_u16()), why)
            }
            Err(e) if e.is_timeout() => (
                None,
                Some(format!(
                    "no answer within {} s",
                    self.settings.timeout.as_secs_f64()
                )),
            ),
            Err(e) if e.is_connect() => (None, Some("could not connect to the target".into())),
            Err(e) => (None, Some(format!("sending failed: {}", e.without_url()))),
        }
    }

    /// Starts the worker: every interval it claims as many due deliveries
    /// as it has free slots and attempts each in its own task, so a slow
    /// target holds only its own slot. Abort the handle to stop it; an
    /// attempt cut short is claimed again when its lease runs out.
    pub fn spawn(self) -> tokio::task::JoinHandle<()> {
        let me = Arc::new(self);
        tokio::spawn(async move {
            let slots = Arc::new(tokio::sync::Semaphore::new(me.settings.concurrency.max(1)));
            let mut tick = tokio::time::interval(me.settings.interval);
            tick.set_missed_tick_behavior(tokio::time::MissedTickBehavior::Delay);
            loop {
                tick.tick().await;
                let free = slots.available_permits();
                if free == 0 {
                    continue;
                }
                let claims = match me.claim(Utc::now(), free).await {
                    Ok(claims) => claims,
                    Err(e) => {
                        tracing::warn!(error = %e, "webhook deliveries not claimed");
                        continue;
                    }
                };
                for claim in claims {
                    // only this loop takes slots, and it claimed no more than were free
                    let Ok(slot) = Arc::clone(&slots).try_acquire_owned() else {
                        break;
                    };
                    let me = Arc::clone(&me);
                    tokio::spawn(async move {
                        me.attempt(claim, Utc::now()).await;
                        drop(slot);
                    });
                }
            }
        })
    }
}
