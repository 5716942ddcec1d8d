//! A refusal as the page shows it: the same fields and reasons as the
//! API's RFC 9457 problem, in the page instead of as JSON.

use actix_web::http::StatusCode;
use maud::{html, Markup};

use crate::app::{AppError, ProblemClass};

/// One refused field.
#[derive(Debug, Clone)]
pub struct FieldLine {
    pub field: String,
    pub reason: String,
    pub suggestions: Vec<String>,
}

/// What went wrong, with the status the page answers with.
#[derive(Debug, Clone)]
pub struct Problem {
    pub status: StatusCode,
    pub title: String,
    pub detail: String,
    pub errors: Vec<FieldLine>,
}

impl Problem {
    /// A refusal naming one field.
    pub fn refusal(
        status: StatusCode,
        title: &str,
        field: &str,
        reason: impl Into<String>,
    ) -> Self {
        let reason = reason.into();
        Self {
            status,
            title: title.into(),
            detail: format!("{field}: {reason}"),
            errors: vec![FieldLine {
                field: field.into(),
                reason,
                suggestions: Vec::new(),
            }],
        }
    }

    /// A use case's refusal, with the status the API gives it.
    pub fn from_app(e: &AppError) -> Self {
        let (status, title) = match e {
            AppError::Fields(p) => match AppError::class(p) {
                ProblemClass::Malformed => (StatusCode::BAD_REQUEST, "Input not readable"),
                ProblemClass::Unknown => (StatusCode::NOT_FOUND, "Not known"),
                ProblemClass::Invalid => (StatusCode::UNPROCESSABLE_ENTITY, "Input refused"),
            },
            AppError::ChecksNotAccepted { .. } => {
                (StatusCode::UNPROCESSABLE_ENTITY, "Error checks apply")
            }
            AppError::Stale { .. } | AppError::JointStale { .. } => {
                (StatusCode::PRECONDITION_FAILED, "Changed meanwhile")
            }
            AppError::Conflict { .. } => (StatusCode::CONFLICT, "Conflict"),
            AppError::Forbidden { .. } => (StatusCode::FORBIDDEN, "Not allowed"),
            AppError::Unavailable { .. } => {
                (StatusCode::SERVICE_UNAVAILABLE, "Database unavailable")
            }
            AppError::Internal(cause) => {
                tracing::error!(%cause, "page request failed");
                return Self {
                    status: StatusCode::INTERNAL_SERVER_ERROR,
                    title: "Internal failure".into(),
                    detail: "the service failed; the failure is logged".into(),
                    errors: Vec::new(),
                };
            }
        };
        let mut errors: Vec<FieldLine> = e
            .problems()
            .iter()
            .map(|p| FieldLine {
                field: p.field.clone(),
                reason: p.reason.clone(),
                suggestions: p.suggestions.clone(),
            })
            .collect();
        if let AppError::Conflict { field, reason } = e {
            errors.push(FieldLine {
                field: field.clone(),
                reason: reason.clone(),
                suggestions: Vec::new(),
            });
        }
        Self {
            status,
            title: title.into(),
            detail: e.to_string(),
            errors,
        }
    }

    /// Whether this problem names `field` (the form marks it).
    pub fn names(&self, field: &str) -> bool {
        self.errors.iter().any(|e| {
            e.field == field
                || e.field.starts_with(&format!("{field}."))
                || e.field.starts_with(&format!("{field}["))
        })
    }

    pub fn render(&self) -> Markup {
        html! {
            section.problem role="alert" {
                h2 { (self.title) " (" (self.status.as_u16()) ")" }
                p { (self.detail) }
                @if !self.errors.is_empty() {
                    table.fields {
                        thead { tr { th { "Field" } th { "Reason" } th { "Did you mean" } } }
                        tbody {
                            @for e in &self.errors {
                                tr {
                                    td { code.field-name { (e.field) } }
                                    td { (e.reason) }
                                    td { (e.suggestions.join(", ")) }
                                }
                            }
                        }
                    }
                }
            }
        }
    }
}
