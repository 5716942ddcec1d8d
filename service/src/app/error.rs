//! [`AppError`]: the one error every use case returns. Engine, catalogue
//! and store errors become one of its variants here (and nowhere else);
//! each field problem names the request field (a path such as
//! `thread_friction.min` or `entries[3].finish`). The HTTP adapter maps an
//! `AppError` to a problem response in one place (`http/error.rs`); the CLI
//! prints it.

use crate::catalogue::{CatalogueError, CurrentState};
use crate::engine::checks::Check;
use crate::engine::EngineError;
use crate::store::StoreError;

/// Seconds a client should wait before retrying a write while the
/// database is unavailable.
pub use crate::store::RETRY_AFTER_SECS;

/// The class of a field problem, ordered from most to least basic; a
/// request's answer takes the most basic class present.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum ProblemClass {
    /// Cannot be read at all (HTTP 400).
    Malformed,
    /// Names something that does not exist (HTTP 404).
    Unknown,
    /// Well formed but invalid engineering input (HTTP 422).
    Invalid,
}

/// One bad field and why, with the nearest known names where it named an
/// unknown one.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldProblem {
    pub class: ProblemClass,
    pub field: String,
    pub reason: String,
    pub suggestions: Vec<String>,
}

impl FieldProblem {
    pub fn new(class: ProblemClass, field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self {
            class,
            field: field.into(),
            reason: reason.into(),
            suggestions: Vec::new(),
        }
    }

    pub fn malformed(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::new(ProblemClass::Malformed, field, reason)
    }

    pub fn unknown(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::new(ProblemClass::Unknown, field, reason)
    }

    pub fn invalid(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::new(ProblemClass::Invalid, field, reason)
    }

    pub fn with_suggestions(mut self, suggestions: Vec<String>) -> Self {
        self.suggestions = suggestions;
        self
    }
}

/// Why a use case refused or failed.
#[derive(Debug, thiserror::Error)]
pub enum AppError {
    /// Bad fields in the request, every one found (never empty).
    #[error("{}", summary(.0))]
    Fields(Vec<FieldProblem>),
    /// The answer is meant for a tool and error-severity checks apply that
    /// the request did not accept by code.
    #[error("{detail}")]
    ChecksNotAccepted {
        /// One sentence naming the error checks that apply.
        detail: String,
        /// The warning and error checks of the answer.
        checks: Vec<Check>,
        /// The error checks the request did not accept, as field problems
        /// naming the accepting field.
        unaccepted: Vec<FieldProblem>,
    },
    /// A change made against an older state; `current` is the state now.
    #[error("{detail}")]
    Stale {
        detail: String,
        current: CurrentState,
    },
    /// A joint changed from an older version; `current` is the joint now.
    #[error("{detail}")]
    JointStale {
        detail: String,
        current: Box<super::joints::JointView>,
    },
    /// A uniqueness rule or the current state refused the change.
    #[error("{field}: {reason}")]
    Conflict { field: String, reason: String },
    /// The caller's role allows the action in general, but a rule forbids
    /// it to this caller (the four-eyes rule: no one approves their own
    /// release).
    #[error("{detail}")]
    Forbidden { detail: String },
    /// The database cannot be reached; retry later.
    #[error("the catalogue database is unavailable: {reason}")]
    Unavailable { reason: String },
    /// A defect or a corrupt database: logged, never shown.
    #[error("internal failure: {0}")]
    Internal(String),
}

fn summary(problems: &[FieldProblem]) -> String {
    let pairs: Vec<(&str, &str)> = problems
        .iter()
        .map(|p| (p.field.as_str(), p.reason.as_str()))
        .collect();
    problems_summary(&pairs)
}

/// The one-sentence `detail` of a list of `(field, reason)` problems, the
/// same wherever a refusal lists fields: one problem is `field: reason`,
/// several are `N problems in the request: field, field`.
pub fn problems_summary(problems: &[(&str, &str)]) -> String {
    match problems {
        // A reason that already leads with its field is not prefixed again.
        [(field, reason)] if reason.starts_with(&format!("{field}: ")) => reason.to_string(),
        [(field, reason)] => format!("{field}: {reason}"),
        many => format!(
            "{} problems in the request: {}",
            many.len(),
            many.iter().map(|(f, _)| *f).collect::<Vec<_>>().join(", ")
        ),
    }
}

impl AppError {
    /// One bad field.
    pub fn field(problem: FieldProblem) -> Self {
        Self::Fields(vec![problem])
    }

    /// The class deciding the status of a `Fields` error: the most basic
    /// one present.
    pub fn class(problems: &[FieldProblem]) -> ProblemClass {
        problems
            .iter()
            .map(|p| p.class)
            .min()
            .unwrap_or(ProblemClass::Invalid)
    }

    /// The field problems, when this is a request error.
    pub fn problems(&self) -> &[FieldProblem] {
        match self {
            Self::Fields(p) => p,
            Self::ChecksNotAccepted { unaccepted, .. } => unaccepted,
            _ => &[],
        }
    }
}

impl From<FieldProblem> for AppError {
    fn from(p: FieldProblem) -> Self {
        Self::field(p)
    }
}

impl From<Vec<FieldProblem>> for AppError {
    fn from(p: Vec<FieldProblem>) -> Self {
        Self::Fields(p)
    }
}

impl From<EngineError> for FieldProblem {
    fn from(e: EngineError) -> Self {
        match e {
            EngineError::Malformed { field, reason } => Self::malformed(field, reason),
            EngineError::Unknown {
                field,
                kind,
                given,
                suggestions,
            } => Self::unknown(field, format!("unknown {kind} '{given}'"))
                .with_suggestions(suggestions),
            EngineError::Invalid {
                field,
                reason,
                suggestions,
            } => Self::invalid(field, reason).with_suggestions(suggestions),
        }
    }
}

impl From<EngineError> for AppError {
    fn from(e: EngineError) -> Self {
        Self::field(e.into())
    }
}

/// The field problems of a catalogue refusal that is about the request's
/// fields (unknown names, missing entries, invalid changes).
pub fn catalogue_problems(e: &CatalogueError) -> Vec<FieldProblem> {
    let class = match e {
        CatalogueError::Unknown { .. }
        | CatalogueError::NoFrictionEntry { .. }
        | CatalogueError::NotFound { .. }
        | CatalogueError::UnknownRevision { .. } => ProblemClass::Unknown,
        CatalogueError::Stale { .. }
        | CatalogueError::Invalid { .. }
        | CatalogueError::AmbiguousFriction { .. } => ProblemClass::Invalid,
    };
    match e {
        CatalogueError::Unknown { kind, given, .. } => {
            vec![
                FieldProblem::new(class, e.field(), format!("unknown {kind} '{given}'"))
                    .with_suggestions(e.suggestions().to_vec()),
            ]
        }
        CatalogueError::NoFrictionEntry {
            finish, lubricant, ..
        } => vec![FieldProblem::new(
            class,
            e.field(),
            format!(
                "the catalogue has no active friction entry for finish '{finish}' with \
                 lubricant '{lubricant}'; choose another lubricant or give thread_friction \
                 and bearing_friction"
            ),
        )
        .with_suggestions(e.suggestions().to_vec())],
        CatalogueError::AmbiguousFriction { field, .. } => {
            let text = e.to_string();
            let reason = text
                .strip_prefix(&format!("{field}: "))
                .unwrap_or(&text)
                .to_string();
            vec![FieldProblem::new(class, field.clone(), reason)]
        }
        _ => e
            .problems()
            .into_iter()
            .map(|p| FieldProblem::new(class, p.field, p.reason).with_suggestions(p.suggestions))
            .collect(),
    }
}

impl From<CatalogueError> for AppError {
    fn from(e: CatalogueError) -> Self {
        match e {
            CatalogueError::Stale { ref current, .. } => Self::Stale {
                detail: e.to_string(),
                current: current.clone(),
            },
            other => Self::Fields(catalogue_problems(&other)),
        }
    }
}

impl From<StoreError> for AppError {
    fn from(e: StoreError) -> Self {
        match e {
            StoreError::Catalogue(c) => c.into(),
            StoreError::Unavailable { reason } => Self::Unavailable { reason },
            StoreError::Conflict { field, reason } => Self::Conflict { field, reason },
            StoreError::NotFound { field, reason } => {
                Self::field(FieldProblem::unknown(field, reason))
            }
            StoreError::Internal(m) => Self::Internal(m),
        }
    }
}
