//! The RFC 9457 problem details object and its field errors: the body of
//! every error answer (see [`super::error::ApiError`]).

use serde::Serialize;
use utoipa::ToSchema;

use crate::app::spec::view::CheckOut;

/// Media type of every error body (RFC 9457 §3).
pub const PROBLEM_JSON: &str = "application/problem+json";

/// One bad field and why.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct FieldError {
    /// The request field, as the client wrote it (`thread`, `body`,
    /// `torque_unit`, a JSON path such as `thread_friction.min`, ...).
    pub field: String,
    /// Why the value was refused, in plain words.
    pub reason: String,
    /// Nearest known names, best first (only for unknown names).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub suggestions: Vec<String>,
}

impl FieldError {
    pub fn new(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self {
            field: field.into(),
            reason: reason.into(),
            suggestions: Vec::new(),
        }
    }

    pub fn with_suggestions(mut self, suggestions: Vec<String>) -> Self {
        self.suggestions = suggestions;
        self
    }
}

/// An RFC 9457 problem details object. Also used in place of a result
/// inside batch responses.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct Problem {
    /// Relative URI reference `/problems/<slug>` identifying the problem type.
    #[serde(rename = "type")]
    pub problem_type: String,
    /// Short, fixed summary of the problem type.
    pub title: String,
    /// The HTTP status code.
    pub status: u16,
    /// What went wrong with this request.
    pub detail: String,
    /// The request path this problem occurred on.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub instance: Option<String>,
    /// The request id (same as the `X-Request-Id` header).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub request_id: Option<String>,
    /// Every bad field and why.
    pub errors: Vec<FieldError>,
    /// For 412: the current state of the resource, so the client can merge.
    #[serde(skip_serializing_if = "Option::is_none")]
    #[schema(value_type = Option<Object>)]
    pub current: Option<serde_json::Value>,
    /// For a refusal because error checks apply (`/problems/checks-not-accepted`):
    /// every warning and error check of the answer, with code, severity and sentence.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub checks: Vec<CheckOut>,
}
