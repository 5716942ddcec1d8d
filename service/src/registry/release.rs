//! Releases: a joint's spec frozen at one catalogue revision, numbered 1,
//! 2, … per joint. A release never changes; its status is the status its
//! latest event left it in, and only these steps are allowed: draft →
//! released (approved by a second person), draft → withdrawn, released →
//! superseded (by the next release), released → withdrawn.

use chrono::{DateTime, Utc};
use serde::{Deserialize, Serialize};

use super::error::RegistryError;
use super::joint::JointId;
use crate::catalogue::ChangeProblem;

/// Where a release stands.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ReleaseStatus {
    /// Requested, waiting for an approver (four-eyes rule).
    Draft,
    /// The values the line is given (the latest released one is active).
    Released,
    /// Replaced by a later release.
    Superseded,
    /// Taken back; never active again.
    Withdrawn,
}

impl ReleaseStatus {
    pub const ALL: [ReleaseStatus; 4] = [
        ReleaseStatus::Draft,
        ReleaseStatus::Released,
        ReleaseStatus::Superseded,
        ReleaseStatus::Withdrawn,
    ];

    pub fn as_str(self) -> &'static str {
        match self {
            ReleaseStatus::Draft => "draft",
            ReleaseStatus::Released => "released",
            ReleaseStatus::Superseded => "superseded",
            ReleaseStatus::Withdrawn => "withdrawn",
        }
    }

    pub fn parse(s: &str) -> Option<ReleaseStatus> {
        Self::ALL.into_iter().find(|st| st.as_str() == s)
    }

    /// The status `given` names, or the problem naming `field` with the
    /// nearest status.
    pub fn named(field: &str, given: &str) -> Result<ReleaseStatus, ChangeProblem> {
        Self::parse(given).ok_or_else(|| {
            let known = Self::ALL.map(Self::as_str);
            ChangeProblem::new(
                field,
                format!(
                    "'{given}' is not a release status; use one of {}",
                    known.join(", ")
                ),
            )
            .with_suggestions(crate::catalogue::error::suggest(given, known.into_iter()))
        })
    }

    /// Whether a release may go from `self` to `to`.
    pub fn may_become(self, to: ReleaseStatus) -> bool {
        use ReleaseStatus::*;
        matches!(
            (self, to),
            (Draft, Released) | (Draft, Withdrawn) | (Released, Superseded) | (Released, Withdrawn)
        )
    }
}

impl std::fmt::Display for ReleaseStatus {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.as_str())
    }
}

/// What happened to a release: the first event is `requested` (it starts
/// as a draft) or `released`; `approved` releases a draft.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum ReleaseEventKind {
    Requested,
    Released,
    Approved,
    Superseded,
    Withdrawn,
}

impl ReleaseEventKind {
    pub const ALL: [ReleaseEventKind; 5] = [
        ReleaseEventKind::Requested,
        ReleaseEventKind::Released,
        ReleaseEventKind::Approved,
        ReleaseEventKind::Superseded,
        ReleaseEventKind::Withdrawn,
    ];

    pub fn as_str(self) -> &'static str {
        match self {
            ReleaseEventKind::Requested => "requested",
            ReleaseEventKind::Released => "released",
            ReleaseEventKind::Approved => "approved",
            ReleaseEventKind::Superseded => "superseded",
            ReleaseEventKind::Withdrawn => "withdrawn",
        }
    }

    pub fn parse(s: &str) -> Option<ReleaseEventKind> {
        Self::ALL.into_iter().find(|k| k.as_str() == s)
    }

    /// The status the event leaves a release in.
    pub fn status(self) -> ReleaseStatus {
        match self {
            ReleaseEventKind::Requested => ReleaseStatus::Draft,
            ReleaseEventKind::Released | ReleaseEventKind::Approved => ReleaseStatus::Released,
            ReleaseEventKind::Superseded => ReleaseStatus::Superseded,
            ReleaseEventKind::Withdrawn => ReleaseStatus::Withdrawn,
        }
    }

    /// The status after this event on a release now at `from` (`None`: a
    /// new release), or the refusal naming `field`. A new release starts
    /// with `requested` or `released`; every later event is a transition
    /// [`ReleaseStatus::may_become`] allows, and only `approved` releases a
    /// draft.
    pub fn apply(
        self,
        from: Option<ReleaseStatus>,
        field: &str,
    ) -> Result<ReleaseStatus, RegistryError> {
        let to = self.status();
        let allowed = match (from, self) {
            (None, k) => matches!(k, ReleaseEventKind::Requested | ReleaseEventKind::Released),
            (Some(ReleaseStatus::Draft), ReleaseEventKind::Released) => false,
            (Some(_), ReleaseEventKind::Requested) => false,
            (Some(ReleaseStatus::Released), ReleaseEventKind::Approved) => false,
            (Some(f), _) => f.may_become(to),
        };
        if allowed {
            Ok(to)
        } else {
            Err(RegistryError::Transition {
                field: field.to_string(),
                from,
                to,
            })
        }
    }
}

/// An error check a release goes ahead with, and why it was accepted.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct AcceptedCheck {
    pub code: String,
    pub reason: String,
}

/// A release to write: the frozen answers and everything that made them.
/// `spec` and `setpoints` are the answers' JSON text exactly as served.
#[derive(Debug, Clone, PartialEq)]
pub struct NewRelease {
    pub joint_id: JointId,
    pub spec_hash: String,
    pub catalogue_revision: i64,
    pub service_version: String,
    pub method_version: String,
    pub requested_by: String,
    pub reason: String,
    pub accepted_checks: Vec<AcceptedCheck>,
    pub spec: String,
    pub setpoints: String,
}

impl NewRelease {
    /// Refuses a release without a reason, an accepted check without a code
    /// or a reason, or answers that are not JSON objects; every problem named.
    pub fn check(&self) -> Result<(), RegistryError> {
        let mut problems = Vec::new();
        if self.reason.trim().is_empty() {
            problems.push(ChangeProblem::new(
                "reason",
                "required: why this release is made",
            ));
        }
        for (i, c) in self.accepted_checks.iter().enumerate() {
            if c.code.trim().is_empty() {
                problems.push(ChangeProblem::new(
                    format!("accept_checks[{i}].code"),
                    "required: the code of the check accepted",
                ));
            }
            if c.reason.trim().is_empty() {
                problems.push(ChangeProblem::new(
                    format!("accept_checks[{i}].reason"),
                    "required: why the check is accepted",
                ));
            }
            if let Some(j) = self.accepted_checks[..i]
                .iter()
                .position(|d| d.code == c.code)
            {
                problems.push(ChangeProblem::new(
                    format!("accept_checks[{i}].code"),
                    format!("repeats accept_checks[{j}]"),
                ));
            }
        }
        for (field, text) in [("spec", &self.spec), ("setpoints", &self.setpoints)] {
            let object = serde_json::from_str::<serde_json::Value>(text)
                .map(|v| v.is_object())
                .unwrap_or(false);
            if !object {
                problems.push(ChangeProblem::new(
                    field,
                    "the frozen answer must be a JSON object",
                ));
            }
        }
        for (field, text) in [
            ("spec_hash", &self.spec_hash),
            ("requested_by", &self.requested_by),
            ("service_version", &self.service_version),
            ("method_version", &self.method_version),
        ] {
            if text.trim().is_empty() {
                problems.push(ChangeProblem::new(field, "required"));
            }
        }
        if problems.is_empty() {
            Ok(())
        } else {
            Err(RegistryError::Invalid { problems })
        }
    }
}

/// A stored release with its current status.
#[derive(Debug, Clone, PartialEq)]
pub struct Release {
    pub joint_id: JointId,
    pub number: i64,
    pub status: ReleaseStatus,
    pub spec_hash: String,
    pub catalogue_revision: i64,
    pub service_version: String,
    pub method_version: String,
    pub requested_by: String,
    /// Who approved it, when it was approved (four-eyes rule).
    pub approved_by: Option<String>,
    pub reason: String,
    pub accepted_checks: Vec<AcceptedCheck>,
    pub spec: String,
    pub setpoints: String,
    pub created_at: DateTime<Utc>,
}

#[cfg(test)]
mod tests {
    use super::ReleaseEventKind as K;
    use super::ReleaseStatus as S;
    use super::*;

    #[test]
    fn only_the_four_transitions_are_allowed() {
        let mut allowed = Vec::new();
        for from in S::ALL {
            for to in S::ALL {
                if from.may_become(to) {
                    allowed.push((from, to));
                }
            }
        }
        let expected = [
            (S::Draft, S::Released),
            (S::Draft, S::Withdrawn),
            (S::Released, S::Superseded),
            (S::Released, S::Withdrawn),
        ];
        assert_eq!(allowed, expected);
    }

    #[test]
    fn events_follow_the_transitions() {
        assert_eq!(K::Requested.apply(None, "status"), Ok(S::Draft));
        assert_eq!(K::Released.apply(None, "status"), Ok(S::Released));
        for k in [K::Approved, K::Superseded, K::Withdrawn] {
            assert!(k.apply(None, "status").is_err(), "{k:?} as first event");
        }
        assert_eq!(K::Approved.apply(Some(S::Draft), "s"), Ok(S::Released));
        assert_eq!(K::Withdrawn.apply(Some(S::Draft), "s"), Ok(S::Withdrawn));
        assert_eq!(
            K::Superseded.apply(Some(S::Released), "s"),
            Ok(S::Superseded)
        );
        assert_eq!(K::Withdrawn.apply(Some(S::Released), "s"), Ok(S::Withdrawn));
        // a draft is released only by approval; nothing leaves the end states
        let err = K::Released.apply(Some(S::Draft), "status").unwrap_err();
        assert_eq!(err.field(), "status");
        assert!(K::Approved.apply(Some(S::Released), "s").is_err());
        assert!(K::Superseded.apply(Some(S::Draft), "s").is_err());
        for end in [S::Superseded, S::Withdrawn] {
            for k in K::ALL {
                assert!(k.apply(Some(end), "s").is_err(), "{k:?} after {end:?}");
            }
        }
        for k in K::ALL {
            assert_eq!(K::parse(k.as_str()), Some(k));
        }
        for s in S::ALL {
            assert_eq!(S::parse(s.as_str()), Some(s));
        }
    }

    fn release() -> NewRelease {
        NewRelease {
            joint_id: JointId::parse("id", "K4-RA-017").unwrap(),
            spec_hash: "ab".into(),
            catalogue_revision: 2,
            service_version: "0.1.0".into(),
            method_version: "1".into(),
            requested_by: "editor".into(),
            reason: "first release".into(),
            accepted_checks: vec![],
            spec: "{}".into(),
            setpoints: "{}".into(),
        }
    }

    #[test]
    fn a_release_needs_a_reason_and_reasons_for_accepted_checks() {
        assert_eq!(release().check(), Ok(()));
        let mut r = release();
        r.reason = " ".into();
        r.spec = "[1]".into();
        r.accepted_checks = vec![
            AcceptedCheck {
                code: "thread_engagement_too_short".into(),
                reason: "".into(),
            },
            AcceptedCheck {
                code: "thread_engagement_too_short".into(),
                reason: "ok".into(),
            },
        ];
        let fields: Vec<String> = r
            .check()
            .unwrap_err()
            .problems()
            .into_iter()
            .map(|p| p.field)
            .collect();
        assert_eq!(
            fields,
            [
                "reason",
                "accept_checks[0].reason",
                "accept_checks[1].code",
                "spec"
            ]
        );
    }
}
