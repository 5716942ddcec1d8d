//! Events a registry change publishes: CloudEvents 1.0 JSON envelopes
//! (CloudEvents specification 1.0, JSON event format), written to the outbox
//! in the same transaction as the change and delivered from there.

use chrono::{DateTime, SecondsFormat, Utc};
use serde_json::{json, Value};

/// A joint's release became active.
pub const JOINT_RELEASED: &str = "joint.released";
/// A joint's release was withdrawn.
pub const JOINT_WITHDRAWN: &str = "joint.withdrawn";
/// A catalogue revision would change a joint's active release.
pub const JOINT_REVIEW_DUE: &str = "joint.review_due";
/// A catalogue revision was written.
pub const CATALOGUE_REVISION_CREATED: &str = "catalogue.revision_created";

/// Every event type a subscription may ask for (`POST /v1/subscriptions`).
pub const EVENT_TYPES: [&str; 4] = [
    JOINT_RELEASED,
    JOINT_WITHDRAWN,
    JOINT_REVIEW_DUE,
    CATALOGUE_REVISION_CREATED,
];

/// The `source` attribute of every event this service publishes.
pub const SOURCE: &str = "/tightspec";

/// One event for the outbox: its id (receivers de-duplicate on it), its
/// type, its subject (a joint id, a revision) and the whole envelope.
#[derive(Debug, Clone, PartialEq)]
pub struct OutboxEvent {
    pub id: String,
    pub kind: String,
    pub subject: String,
    pub payload: Value,
    pub created_at: DateTime<Utc>,
}

impl OutboxEvent {
    /// The CloudEvents envelope around `data`: `specversion` 1.0, `id`,
    /// `source`, `type`, `subject`, `time` (RFC 3339), `datacontenttype`.
    pub fn cloud_event(
        id: impl Into<String>,
        kind: &str,
        subject: &str,
        time: DateTime<Utc>,
        data: Value,
    ) -> OutboxEvent {
        let id = id.into();
        let payload = json!({
            "specversion": "1.0",
            "id": id,
            "source": SOURCE,
            "type": kind,
            "subject": subject,
            "time": time.to_rfc3339_opts(SecondsFormat::Millis, true),
            "datacontenttype": "application/json",
            "data": data,
        });
        OutboxEvent {
            id,
            kind: kind.to_string(),
            subject: subject.to_string(),
            payload,
            created_at: time,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_envelope_carries_the_required_attributes() {
        let t = DateTime::parse_from_rfc3339("2026-12-03T10:00:00Z")
            .unwrap()
            .with_timezone(&Utc);
        let e =
            OutboxEvent::cloud_event("e1", JOINT_RELEASED, "K4-RA-017", t, json!({"release": 1}));
        // CloudEvents 1.0: id, source, specversion and type are required
        assert_eq!(e.payload["specversion"], "1.0");
        assert_eq!(e.payload["id"], "e1");
        assert_eq!(e.payload["source"], SOURCE);
        assert_eq!(e.payload["type"], "joint.released");
        assert_eq!(e.payload["subject"], "K4-RA-017");
        assert_eq!(e.payload["time"], "2026-12-03T10:00:00.000Z");
        assert_eq!(e.payload["data"]["release"], 1);
        assert_eq!(
            (e.kind.as_str(), e.subject.as_str()),
            ("joint.released", "K4-RA-017")
        );
    }
}
