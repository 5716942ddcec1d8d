//! Typed engine errors. Every variant names the request field it concerns,
//! so the HTTP layer can render a problem response without guessing.

/// Why the engine refused an input.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum EngineError {
    /// The input is not well formed (cannot be read at all), e.g. a thread
    /// designation with no recognisable size. Rendered as 400.
    #[error("{field}: {reason}")]
    Malformed { field: String, reason: String },
    /// A name the engine does not know (thread, grade, head, material...).
    /// `suggestions` lists the nearest known names. Rendered as 404.
    #[error("{field}: unknown {kind} '{given}'")]
    Unknown {
        field: String,
        kind: &'static str,
        given: String,
        suggestions: Vec<String>,
    },
    /// Well-formed but invalid engineering input (grade outside its size
    /// range, min above max, friction implausible, ...). `suggestions` may
    /// name valid alternatives. Rendered as 422.
    #[error("{field}: {reason}")]
    Invalid {
        field: String,
        reason: String,
        suggestions: Vec<String>,
    },
}

impl EngineError {
    pub fn malformed(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::Malformed {
            field: field.into(),
            reason: reason.into(),
        }
    }

    pub fn invalid(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::Invalid {
            field: field.into(),
            reason: reason.into(),
            suggestions: Vec::new(),
        }
    }

    /// The request field this error concerns.
    pub fn field(&self) -> &str {
        match self {
            Self::Malformed { field, .. }
            | Self::Unknown { field, .. }
            | Self::Invalid { field, .. } => field,
        }
    }
}
