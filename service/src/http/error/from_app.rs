//! The one mapping from the application's error to a problem response.

use super::{ApiError, FieldError};
use crate::app::error::RETRY_AFTER_SECS;
use crate::app::spec::view::checks_out;
use crate::app::{AppError, FieldProblem, ProblemClass};
use crate::catalogue::CurrentState;

impl From<&FieldProblem> for FieldError {
    fn from(p: &FieldProblem) -> Self {
        FieldError::new(p.field.clone(), p.reason.clone()).with_suggestions(p.suggestions.clone())
    }
}

fn current_json(c: &CurrentState) -> Option<serde_json::Value> {
    match c {
        CurrentState::Entry(e) => serde_json::to_value(e).ok(),
        CurrentState::Finish(f) => serde_json::to_value(f).ok(),
        CurrentState::Lubricant(l) => serde_json::to_value(l).ok(),
    }
}

impl From<AppError> for ApiError {
    fn from(e: AppError) -> Self {
        let detail = e.to_string();
        match e {
            AppError::Fields(problems) => {
                let errors: Vec<FieldError> = problems.iter().map(FieldError::from).collect();
                match AppError::class(&problems) {
                    ProblemClass::Malformed => ApiError::Malformed { detail, errors },
                    ProblemClass::Unknown => ApiError::NotFound { detail, errors },
                    ProblemClass::Invalid => ApiError::Unprocessable { detail, errors },
                }
            }
            AppError::ChecksNotAccepted {
                detail,
                checks,
                unaccepted,
            } => ApiError::ChecksNotAccepted {
                detail,
                errors: unaccepted.iter().map(FieldError::from).collect(),
                checks: checks_out(&checks),
            },
            AppError::Stale { detail, current } => ApiError::PreconditionFailed {
                detail: format!(
                    "{detail}; the current state is in `current`: merge and resend with its ETag"
                ),
                current: current_json(&current),
            },
            AppError::JointStale { detail, current } => ApiError::PreconditionFailed {
                detail: format!(
                    "{detail}; the current joint is in `current`: merge and resend with its ETag"
                ),
                current: serde_json::to_value(current).ok(),
            },
            AppError::Conflict { field, reason } => ApiError::Conflict {
                detail,
                errors: vec![FieldError::new(field, reason)],
            },
            AppError::Forbidden { detail } => ApiError::Forbidden { detail },
            AppError::Unavailable { reason } => {
                tracing::warn!(%reason, "catalogue database unavailable");
                ApiError::Unavailable {
                    detail: "the catalogue database is unavailable; reads continue from memory \
                             (may be stale), retry changes later"
                        .into(),
                    retry_after_secs: RETRY_AFTER_SECS,
                }
            }
            AppError::Internal(m) => ApiError::Internal(m),
        }
    }
}
