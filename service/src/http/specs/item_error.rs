//! Problems found while reading one spec request, before or during the
//! computation. A request can have several; they are collected so the
//! client sees every bad field at once. The response status is that of the
//! most basic class present: malformed (400) before unknown (404) before
//! invalid (422).

use crate::catalogue::CatalogueError;
use crate::engine::EngineError;
use crate::http::error::{ApiError, FieldError};

/// The class of a problem, ordered from most to least basic.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum ErrorClass {
    /// Cannot be read at all (400).
    Malformed,
    /// Names something that does not exist (404).
    Unknown,
    /// Well formed but invalid engineering (422).
    Invalid,
}

impl ErrorClass {
    pub fn status(self) -> u16 {
        match self {
            ErrorClass::Malformed => 400,
            ErrorClass::Unknown => 404,
            ErrorClass::Invalid => 422,
        }
    }
}

/// One bad field and why.
#[derive(Debug, Clone, PartialEq)]
pub struct ItemError {
    pub class: ErrorClass,
    pub field: String,
    pub reason: String,
    pub suggestions: Vec<String>,
}

impl ItemError {
    pub fn malformed(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::new(ErrorClass::Malformed, field, reason)
    }

    pub fn invalid(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::new(ErrorClass::Invalid, field, reason)
    }

    pub fn new(class: ErrorClass, field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self {
            class,
            field: field.into(),
            reason: reason.into(),
            suggestions: Vec::new(),
        }
    }

    pub fn with_suggestions(mut self, suggestions: Vec<String>) -> Self {
        self.suggestions = suggestions;
        self
    }

    /// The field problems of an HTTP-layer error (e.g. a quantity with an
    /// unknown unit), classed by its status.
    pub fn from_api(e: &ApiError) -> Vec<ItemError> {
        let problem = e.problem();
        let class = match problem.status {
            404 => ErrorClass::Unknown,
            422 => ErrorClass::Invalid,
            _ => ErrorClass::Malformed,
        };
        if problem.errors.is_empty() {
            return vec![ItemError::new(class, "body", problem.detail)];
        }
        problem
            .errors
            .into_iter()
            .map(|f| ItemError::new(class, f.field, f.reason).with_suggestions(f.suggestions))
            .collect()
    }

    pub fn field_error(&self) -> FieldError {
        FieldError::new(self.field.clone(), self.reason.clone())
            .with_suggestions(self.suggestions.clone())
    }
}

impl From<EngineError> for ItemError {
    fn from(e: EngineError) -> Self {
        match e {
            EngineError::Malformed { field, reason } => Self::malformed(field, reason),
            EngineError::Unknown {
                field,
                kind,
                given,
                suggestions,
            } => Self::new(
                ErrorClass::Unknown,
                field,
                format!("unknown {kind} '{given}'"),
            )
            .with_suggestions(suggestions),
            EngineError::Invalid {
                field,
                reason,
                suggestions,
            } => Self::invalid(field, reason).with_suggestions(suggestions),
        }
    }
}

impl From<CatalogueError> for ItemError {
    fn from(e: CatalogueError) -> Self {
        let class = match &e {
            CatalogueError::Unknown { .. }
            | CatalogueError::NoFrictionEntry { .. }
            | CatalogueError::NotFound { .. }
            | CatalogueError::UnknownRevision { .. } => ErrorClass::Unknown,
            CatalogueError::Stale { .. } | CatalogueError::Invalid { .. } => ErrorClass::Invalid,
        };
        let reason = match &e {
            CatalogueError::Unknown { kind, given, .. } => format!("unknown {kind} '{given}'"),
            CatalogueError::NoFrictionEntry {
                finish, lubricant, ..
            } => format!(
                "the catalogue has no active friction entry for finish '{finish}' with \
                 lubricant '{lubricant}'; choose another lubricant or give thread_friction \
                 and bearing_friction"
            ),
            other => other.to_string(),
        };
        Self::new(class, e.field(), reason).with_suggestions(e.suggestions().to_vec())
    }
}

/// Every problem of one request (never empty when returned as an error).
#[derive(Debug, Clone, PartialEq)]
pub struct ItemErrors(pub Vec<ItemError>);

impl ItemErrors {
    /// The class deciding the status: the most basic one present.
    pub fn class(&self) -> ErrorClass {
        self.0
            .iter()
            .map(|e| e.class)
            .min()
            .unwrap_or(ErrorClass::Invalid)
    }

    /// A one-sentence summary for the problem's `detail`.
    pub fn detail(&self) -> String {
        match self.0.as_slice() {
            [one] => format!("{}: {}", one.field, one.reason),
            many => format!(
                "{} problems in the request: {}",
                many.len(),
                many.iter()
                    .map(|e| e.field.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        }
    }
}

impl From<ItemErrors> for ApiError {
    fn from(e: ItemErrors) -> Self {
        let detail = e.detail();
        let errors: Vec<FieldError> = e.0.iter().map(ItemError::field_error).collect();
        match e.class() {
            ErrorClass::Malformed => ApiError::Malformed { detail, errors },
            ErrorClass::Unknown => ApiError::NotFound { detail, errors },
            ErrorClass::Invalid => ApiError::Unprocessable { detail, errors },
        }
    }
}

impl From<ItemError> for ItemErrors {
    fn from(e: ItemError) -> Self {
        ItemErrors(vec![e])
    }
}

impl From<Vec<ItemError>> for ItemErrors {
    fn from(v: Vec<ItemError>) -> Self {
        ItemErrors(v)
    }
}
