//! Releases as both adapters render them: a release with its status (and
//! its events when read alone), and a frozen answer as the line fetches it
//! — the stored bytes of the spec or the setpoints, verbatim, inside an
//! envelope that says which release it is, from which catalogue revision,
//! and whether a review is due.

use serde::Serialize;
use serde_json::value::RawValue;
use utoipa::ToSchema;

use crate::app::joints::ReviewDueView;
use crate::app::AppError;
use crate::registry::{AcceptedCheck, Release, ReviewDue};
use crate::store::releases::ReleaseEventRecord;

/// An error check a release went ahead with, and why.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct AcceptedCheckView {
    pub code: String,
    pub reason: String,
}

/// One status change of a release.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ReleaseEventView {
    /// `requested`, `released`, `approved`, `superseded` or `withdrawn`.
    pub event: String,
    /// The status it left the release in.
    pub status: String,
    /// The token name of who did it.
    pub by: String,
    pub reason: String,
    /// RFC 3339.
    pub at: String,
}

/// A release of a joint: what was frozen, by whom and why, and where it
/// stands now.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ReleaseView {
    pub joint_id: String,
    /// The release number (1, 2, … per joint).
    pub release: i64,
    /// `draft`, `released` (the active one), `superseded` or `withdrawn`.
    pub status: String,
    /// The frozen setpoints' `spec_hash`: every input of the answer,
    /// including the tool's unit and resolutions, the method and service
    /// versions.
    pub spec_hash: String,
    /// The catalogue revision the values were computed at.
    pub catalogue_revision: i64,
    pub service_version: String,
    pub method_version: String,
    pub requested_by: String,
    /// Who approved it (four-eyes rule); `null` otherwise.
    pub approved_by: Option<String>,
    pub reason: String,
    /// The error checks accepted by code, each with its reason.
    pub accepted_checks: Vec<AcceptedCheckView>,
    /// When it was requested (RFC 3339).
    pub created_at: String,
    /// Its status changes, oldest first (only when one release is read).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub events: Option<Vec<ReleaseEventView>>,
}

impl ReleaseView {
    pub fn of(r: &Release, events: Option<&[ReleaseEventRecord]>) -> ReleaseView {
        ReleaseView {
            joint_id: r.joint_id.to_string(),
            release: r.number,
            status: r.status.as_str().to_string(),
            spec_hash: r.spec_hash.clone(),
            catalogue_revision: r.catalogue_revision,
            service_version: r.service_version.clone(),
            method_version: r.method_version.clone(),
            requested_by: r.requested_by.clone(),
            approved_by: r.approved_by.clone(),
            reason: r.reason.clone(),
            accepted_checks: r.accepted_checks.iter().map(accepted).collect(),
            created_at: r.created_at.to_rfc3339(),
            events: events.map(|e| {
                e.iter()
                    .map(|e| ReleaseEventView {
                        event: e.event.clone(),
                        status: e.status.clone(),
                        by: e.actor.clone(),
                        reason: e.reason.clone(),
                        at: e.created_at.to_rfc3339(),
                    })
                    .collect()
            }),
        }
    }

    /// The release's path.
    pub fn location(&self) -> String {
        format!("/v1/joints/{}/releases/{}", self.joint_id, self.release)
    }
}

fn accepted(c: &AcceptedCheck) -> AcceptedCheckView {
    AcceptedCheckView {
        code: c.code.clone(),
        reason: c.reason.clone(),
    }
}

/// Which frozen answer of a release.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum FrozenAnswer {
    /// The full spec answer (`GET /v1/tightening-specs`'s shape).
    Spec,
    /// The setpoint answer (`GET /v1/setpoints`'s shape).
    Setpoints,
}

impl FrozenAnswer {
    pub fn key(self) -> &'static str {
        match self {
            FrozenAnswer::Spec => "spec",
            FrozenAnswer::Setpoints => "setpoints",
        }
    }
}

/// A release's frozen answer and what the line needs to know beside it.
#[derive(Debug, Clone, PartialEq)]
pub struct ReleasedAnswer {
    pub release: Release,
    pub review_due: Option<ReviewDue>,
}

/// The envelope around a frozen answer; the answer's stored bytes go in
/// as they are (a raw JSON value), never re-serialised.
#[derive(Serialize)]
struct Envelope<'a> {
    joint_id: &'a str,
    release: i64,
    status: &'a str,
    catalogue_revision: i64,
    spec_hash: &'a str,
    service_version: &'a str,
    method_version: &'a str,
    review_due: bool,
    review: Option<ReviewDueView>,
    #[serde(skip_serializing_if = "Option::is_none")]
    spec: Option<&'a RawValue>,
    #[serde(skip_serializing_if = "Option::is_none")]
    setpoints: Option<&'a RawValue>,
}

impl ReleasedAnswer {
    /// The answer's JSON: the envelope with the stored bytes inside.
    pub fn json(&self, which: FrozenAnswer) -> Result<String, AppError> {
        let r = &self.release;
        let stored = match which {
            FrozenAnswer::Spec => &r.spec,
            FrozenAnswer::Setpoints => &r.setpoints,
        };
        let raw: &RawValue = serde_json::from_str(stored).map_err(|e| {
            AppError::Internal(format!(
                "release {} of '{}': stored {} is not JSON: {e}",
                r.number,
                r.joint_id,
                which.key()
            ))
        })?;
        let id = r.joint_id.to_string();
        let envelope = Envelope {
            joint_id: &id,
            release: r.number,
            status: r.status.as_str(),
            catalogue_revision: r.catalogue_revision,
            spec_hash: &r.spec_hash,
            service_version: &r.service_version,
            method_version: &r.method_version,
            review_due: self.review_due.is_some(),
            review: self.review_due.as_ref().map(|d| ReviewDueView {
                revision: d.revision,
                since: d.since.to_rfc3339(),
            }),
            spec: (which == FrozenAnswer::Spec).then_some(raw),
            setpoints: (which == FrozenAnswer::Setpoints).then_some(raw),
        };
        serde_json::to_string(&envelope)
            .map_err(|e| AppError::Internal(format!("release envelope: {e}")))
    }

    /// The answer's strong ETag: the release hash with what else the
    /// envelope says (which answer, the number, the status, a review mark),
    /// so a status change or a review mark is never hidden by a 304.
    pub fn etag(&self, which: FrozenAnswer) -> String {
        let r = &self.release;
        answer_etag(
            &r.spec_hash,
            which,
            r.number,
            r.status.as_str(),
            self.review_due.as_ref().map(|d| d.revision),
        )
    }
}

/// The ETag of a release's answer from what it is made of (the release
/// hash, which answer, the number, the status, the review mark's revision);
/// [`ReleasedAnswer::etag`], and what the MQTT publisher compares without
/// reading the answer's bytes.
pub fn answer_etag(
    spec_hash: &str,
    which: FrozenAnswer,
    number: i64,
    status: &str,
    review_revision: Option<i64>,
) -> String {
    let hash: String = spec_hash.chars().take(32).collect();
    let review = review_revision
        .map(|r| format!("-review{r}"))
        .unwrap_or_default();
    format!("\"{hash}-{}-r{number}-{status}{review}\"", which.key())
}
