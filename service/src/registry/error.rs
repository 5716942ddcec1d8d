//! Why the registry refused a definition, a look-up or a status change.
//! Every variant names the request field it concerns (a path such as
//! `tags[3]` or `setpoints.resolution`), as `catalogue::CatalogueError` does.

use super::joint::Joint;
use super::release::ReleaseStatus;
use crate::catalogue::ChangeProblem;

#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum RegistryError {
    /// Well-formed but invalid input: every problem listed, nothing written.
    #[error("{} problem(s) in the submitted joint or release", problems.len())]
    Invalid { problems: Vec<ChangeProblem> },
    /// The definition was changed from an older version; carries the
    /// current joint so the client can merge.
    #[error("{field}: stale: joint '{}' is at version {}, not {expected}", current.id, current.version)]
    Stale {
        field: String,
        expected: i64,
        current: Box<Joint>,
    },
    /// A status change the release's current status does not allow.
    #[error("{field}: a {} release cannot become {to}", from.map(|s| s.as_str()).unwrap_or("new"))]
    Transition {
        field: String,
        from: Option<ReleaseStatus>,
        to: ReleaseStatus,
    },
}

impl RegistryError {
    pub fn invalid_one(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::Invalid {
            problems: vec![ChangeProblem::new(field, reason)],
        }
    }

    /// The (first) request field this error concerns.
    pub fn field(&self) -> &str {
        match self {
            Self::Invalid { problems } => problems.first().map(|p| p.field.as_str()).unwrap_or(""),
            Self::Stale { field, .. } | Self::Transition { field, .. } => field,
        }
    }

    /// Every problem as a list (one item for the single-field variants).
    pub fn problems(&self) -> Vec<ChangeProblem> {
        match self {
            Self::Invalid { problems } => problems.clone(),
            other => vec![ChangeProblem::new(other.field(), other.to_string())],
        }
    }
}
