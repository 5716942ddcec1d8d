//! Each joint's active setpoints as a retained MQTT message (optional:
//! only with a broker configured). Topic `<prefix>/joints/<id>/setpoints`,
//! QoS 1, retained; the payload is exactly the bytes `GET
//! /v1/joints/{id}/setpoints` answers (the same use case renders both). A
//! joint without an active release any more gets an empty retained
//! message, which clears the retained one.
//!
//! Reconciled by state, not by event: on connecting, whenever the
//! registry's change stamp moves (this instance's writes, the database's
//! change counter the watcher reads) and every [`PASS_EVERY`] as a fallback, a
//! pass reads the active answers' ETags ([`scan`]), decides what to
//! publish and clear ([`plan`]), and sends only that. Publishing the same
//! retained value twice is harmless, so several replicas may all publish.
//! After a reconnect everything is sent again. On connecting the publisher
//! also subscribes to its own topics, so a retained value left from
//! before a restart for a joint without an active release is cleared.
//!
//! A broker that cannot be reached never affects the service: the
//! connection is retried with back-off (0.5 s doubling to 30 s), logged
//! once per outage.

pub mod plan;
pub mod scan;

use std::collections::HashSet;
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use rumqttc::{AsyncClient, Event, EventLoop, MqttOptions, Packet, QoS};
use tokio::sync::watch;

use super::releases::view::FrozenAnswer;
use super::{App, AppError};
use plan::Published;

/// Where and how often to publish.
#[derive(Debug, Clone)]
pub struct MqttSettings {
    pub host: String,
    pub port: u16,
    /// First topic levels (checked at start: no wildcard, no empty level).
    pub topic_prefix: String,
}

/// The fallback period of a pass when nothing moved.
pub const PASS_EVERY: Duration = Duration::from_secs(5);

/// Joints with an active release published per pass at most.
pub const JOINTS_MAX: usize = 20_000;

/// Largest MQTT packet sent or received (a setpoint answer is a few KB).
const PACKET_MAX: usize = 1024 * 1024;

/// Room in a packet beside the payload: the fixed header (at most 5
/// bytes), the topic's length (2) and the topic — a prefix of at most 200
/// bytes, `/joints/`, a joint id of at most 64, `/setpoints` — and the
/// packet id (2): under 300 bytes, rounded up.
const HEADER_ROOM: usize = 512;

/// How often the publisher looks whether a pass is due.
const WAKE: Duration = Duration::from_millis(200);

/// Longest wait for room to queue one message.
const QUEUE_WAIT: Duration = Duration::from_secs(10);

const BACKOFF_MIN: Duration = Duration::from_millis(500);
const BACKOFF_MAX: Duration = Duration::from_secs(30);

/// The connection as the event loop last saw it: up or not, and how many
/// connections were made (a new one means: send everything again).
#[derive(Debug, Clone, Copy, Default)]
struct Link {
    up: bool,
    connections: u64,
}

/// Publishes the active releases' setpoints; see the module.
#[derive(Debug, Clone)]
pub struct Publisher {
    app: App,
    settings: MqttSettings,
}

/// What one pass sent.
#[derive(Debug, Default, PartialEq, Eq)]
pub struct PassReport {
    pub active: usize,
    pub published: usize,
    pub cleared: usize,
    pub truncated: bool,
}

impl App {
    /// A publisher over this application.
    pub fn mqtt_publisher(&self, settings: MqttSettings) -> Publisher {
        Publisher {
            app: self.clone(),
            settings,
        }
    }
}

impl Publisher {
    /// The topic of joint `id`'s setpoints.
    pub fn topic(&self, id: &str) -> String {
        format!("{}/joints/{id}/setpoints", self.settings.topic_prefix)
    }

    /// Starts the publisher (its connection and its passes, in one task);
    /// abort the handle to stop it.
    pub fn spawn(self) -> tokio::task::JoinHandle<()> {
        let id = format!("tightspec-{:016x}", rand::random::<u64>());
        let mut options = MqttOptions::new(id, self.settings.host.clone(), self.settings.port);
        options
            .set_keep_alive(Duration::from_secs(30))
            .set_clean_session(true)
            .set_max_packet_size(PACKET_MAX, PACKET_MAX);
        let (client, events) = AsyncClient::new(options, 64);
        let (link_tx, link_rx) = watch::channel(Link::default());
        let seen = Arc::new(Mutex::new(HashSet::new()));
        let filter = self.topic("+");
        let broker = format!("{}:{}", self.settings.host, self.settings.port);
        let drive = drive(
            events,
            client.clone(),
            link_tx,
            filter,
            Arc::clone(&seen),
            broker,
        );
        let passes = self.run(client, link_rx, seen);
        tokio::spawn(async move {
            futures_util::future::join(drive, passes).await;
        })
    }

    /// The passes: one when connected and the registry moved, after a
    /// (re)connection, or every [`PASS_EVERY`].
    async fn run(
        self,
        client: AsyncClient,
        link: watch::Receiver<Link>,
        seen: Arc<Mutex<HashSet<String>>>,
    ) {
        let mut published = Published::default();
        let mut connection = 0;
        let mut last: Option<((u64, i64), Instant)> = None;
        let mut failing = false;
        let mut tick = tokio::time::interval(WAKE);
        tick.set_missed_tick_behavior(tokio::time::MissedTickBehavior::Delay);
        loop {
            tick.tick().await;
            let now = *link.borrow();
            if !now.up {
                continue;
            }
            if now.connections != connection {
                connection = now.connections;
                published.forget_values();
                last = None;
            }
            let retained: Vec<String> = {
                let mut s = seen.lock().unwrap_or_else(|p| p.into_inner());
                s.drain().collect()
            };
            for id in &retained {
                published.seen_on_broker(id);
            }
            let stamp = self.app.registry_stamp();
            let due = retained
                .iter()
                .any(|id| published.get(id) == Some(&plan::Held::Unknown))
                || last.is_none_or(|(s, at)| s != stamp || at.elapsed() >= PASS_EVERY);
            if !due {
                continue;
            }
            match self.pass(&client, &mut published).await {
                Ok(report) => {
                    if failing {
                        tracing::info!("mqtt publishing resumed");
                        failing = false;
                    }
                    report.log();
                }
                Err(e) => {
                    if !failing {
                        tracing::warn!(error = %e, "mqtt pass failed; retried on the next change or within the period");
                        failing = true;
                    }
                }
            }
            last = Some((stamp, Instant::now()));
        }
    }

    /// One pass: read the active answers' ETags, publish what changed,
    /// clear what is no longer active.
    pub async fn pass(
        &self,
        client: &AsyncClient,
        published: &mut Published,
    ) -> Result<PassReport, AppError> {
        let current = self.app.active_setpoint_etags(JOINTS_MAX).await?;
        let todo = published.plan(&current.answers);
        let mut report = PassReport {
            active: current.answers.len(),
            truncated: current.truncated,
            ..PassReport::default()
        };
        for id in &todo.clear {
            self.clear(client, id, published, &mut report).await?;
        }
        for id in &todo.publish {
            match self
                .app
                .released_answer(id, None, FrozenAnswer::Setpoints)
                .await
            {
                Ok(answer) if answer.body.len() + HEADER_ROOM < PACKET_MAX => {
                    self.send(client, id, answer.body.to_vec()).await?;
                    published.published(id, answer.etag.clone());
                    report.published += 1;
                }
                Ok(answer) => {
                    tracing::warn!(joint = %id, bytes = answer.body.len(), "setpoint answer too large for an MQTT message; cleared instead");
                    self.clear(client, id, published, &mut report).await?;
                }
                // withdrawn (409) or gone (404) since the ETags were read
                Err(AppError::Conflict { .. } | AppError::Fields(_)) => {
                    self.clear(client, id, published, &mut report).await?;
                }
                Err(e) => return Err(e),
            }
        }
        Ok(report)
    }

    /// Clears joint `id`'s retained message (an empty one) and notes it.
    async fn clear(
        &self,
        client: &AsyncClient,
        id: &str,
        published: &mut Published,
        report: &mut PassReport,
    ) -> Result<(), AppError> {
        self.send(client, id, Vec::new()).await?;
        published.cleared(id);
        report.cleared += 1;
        Ok(())
    }

    /// Queues one retained QoS 1 message (empty: a clear).
    async fn send(&self, client: &AsyncClient, id: &str, payload: Vec<u8>) -> Result<(), AppError> {
        let queued = client.publish(self.topic(id), QoS::AtLeastOnce, true, payload);
        match tokio::time::timeout(QUEUE_WAIT, queued).await {
            Ok(Ok(())) => Ok(()),
            Ok(Err(e)) => Err(AppError::Internal(format!("mqtt publish: {e}"))),
            Err(_) => Err(AppError::Internal(format!(
                "mqtt publish: no room to queue within {} s",
                QUEUE_WAIT.as_secs()
            ))),
        }
    }
}

impl PassReport {
    fn log(&self) {
        if self.truncated {
            tracing::warn!(
                joints = JOINTS_MAX,
                "more joints have an active release than one mqtt pass publishes; the rest are cleared"
            );
        }
        if self.published + self.cleared > 0 {
            tracing::info!(
                published = self.published,
                cleared = self.cleared,
                active = self.active,
                "mqtt retained setpoints sent"
            );
        }
    }
}

/// The connection: polls the event loop (which reconnects when polled
/// after an error), tells the passes when it is up, subscribes to the
/// publisher's own topics on each connection and notes the joints whose
/// retained message the broker shows.
async fn drive(
    mut events: EventLoop,
    client: AsyncClient,
    link: watch::Sender<Link>,
    filter: String,
    seen: Arc<Mutex<HashSet<String>>>,
    broker: String,
) {
    let mut backoff = BACKOFF_MIN;
    let mut outage_logged = false;
    loop {
        match events.poll().await {
            Ok(Event::Incoming(Packet::ConnAck(_))) => {
                tracing::info!(%broker, "mqtt broker connected");
                backoff = BACKOFF_MIN;
                outage_logged = false;
                if let Err(e) = client.try_subscribe(filter.as_str(), QoS::AtMostOnce) {
                    tracing::debug!(error = %e, "mqtt subscription to the own topics not queued");
                }
                link.send_modify(|l| {
                    l.up = true;
                    l.connections += 1;
                });
            }
            Ok(Event::Incoming(Packet::Publish(p))) if p.retain && !p.payload.is_empty() => {
                if let Some(id) = joint_of(&filter, &p.topic) {
                    let mut s = seen.lock().unwrap_or_else(|p| p.into_inner());
                    if s.len() < plan::HELD_MAX {
                        s.insert(id.to_string());
                    }
                }
            }
            Ok(_) => {}
            Err(e) => {
                link.send_modify(|l| l.up = false);
                if !outage_logged {
                    tracing::warn!(%broker, error = %e, "mqtt broker unreachable; retrying with back-off (the service keeps serving)");
                    outage_logged = true;
                }
                tokio::time::sleep(backoff).await;
                backoff = (backoff * 2).min(BACKOFF_MAX);
            }
        }
    }
}

/// The joint id in `topic` when it is one of `filter`'s (`…/joints/+/setpoints`).
fn joint_of<'a>(filter: &str, topic: &'a str) -> Option<&'a str> {
    let (head, tail) = filter.split_once('+')?;
    let id = topic.strip_prefix(head)?.strip_suffix(tail)?;
    (!id.is_empty() && !id.contains('/')).then_some(id)
}

#[cfg(test)]
mod tests {
    use super::joint_of;

    #[test]
    fn the_joint_id_is_read_from_the_topic() {
        let f = "hollowmere/joints/+/setpoints";
        assert_eq!(
            joint_of(f, "hollowmere/joints/HW-K4-RA-017/setpoints"),
            Some("HW-K4-RA-017")
        );
        assert_eq!(joint_of(f, "hollowmere/joints//setpoints"), None);
        assert_eq!(joint_of(f, "hollowmere/joints/a/b/setpoints"), None);
        assert_eq!(joint_of(f, "other/joints/HW-K4-RA-017/setpoints"), None);
    }
}
