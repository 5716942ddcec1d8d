//! One crate-wide HTTP error, rendered as RFC 9457 problem details
//! (`application/problem+json`).
//!
//! Problem `type` values are relative URI references of the form
//! `/problems/<slug>` (RFC 9457 §3.1.1 allows relative references; they
//! resolve against the service's own base URL). Every body carries
//! `type`, `title`, `status`, `detail`, `instance` (the request path),
//! `request_id` (the same value as the `X-Request-Id` response header) and
//! `errors`: one entry per bad field with the reason and, for unknown
//! names, the nearest known ones.
//!
//! 5xx errors are logged with their cause; the client only ever sees a
//! generic detail.

use actix_web::http::header::{self, HeaderValue};
use actix_web::http::StatusCode;
use actix_web::{HttpResponse, ResponseError};

use crate::app::spec::view::CheckOut;

pub use super::problem::{FieldError, Problem};

pub use super::problem::PROBLEM_JSON;

/// Every way a request can fail.
#[derive(Debug, thiserror::Error)]
pub enum ApiError {
    /// 400: the request cannot be read (bad JSON, bad number, bad unit).
    #[error("malformed request: {detail}")]
    Malformed {
        detail: String,
        errors: Vec<FieldError>,
    },
    /// 400: a query parameter the endpoint does not know (a typo such as
    /// `thred=` must never be silently ignored).
    #[error("unknown query parameter '{name}'")]
    UnknownParameter {
        name: String,
        suggestions: Vec<String>,
    },
    /// 401: no credentials or credentials not accepted.
    #[error("unauthorized: {detail}")]
    Unauthorized { detail: String },
    /// 403: authenticated but not allowed.
    #[error("forbidden: {detail}")]
    Forbidden { detail: String },
    /// 404: the resource or a named thing does not exist.
    #[error("not found: {detail}")]
    NotFound {
        detail: String,
        errors: Vec<FieldError>,
    },
    /// 405: the path exists but not with this method; `allowed` lists the
    /// methods it answers (sent as the `Allow` header).
    #[error("method not allowed: {method}")]
    MethodNotAllowed {
        method: String,
        allowed: Vec<&'static str>,
    },
    /// 406: no acceptable representation for the `Accept` header.
    #[error("not acceptable: {detail}")]
    NotAcceptable { detail: String },
    /// 408: the request body did not arrive within the body-read deadline
    /// (the connection is closed after this answer).
    #[error("request timeout: {detail}")]
    RequestTimeout { detail: String },
    /// 409: the change conflicts with the current state.
    #[error("conflict: {detail}")]
    Conflict {
        detail: String,
        errors: Vec<FieldError>,
    },
    /// 412: `If-Match` did not match; `current` may carry the current state.
    #[error("precondition failed: {detail}")]
    PreconditionFailed {
        detail: String,
        current: Option<serde_json::Value>,
    },
    /// 413: the body is larger than the stated limit.
    #[error("payload too large: limit {limit_bytes} bytes")]
    PayloadTooLarge { limit_bytes: usize },
    /// 415: the body's media type is not accepted.
    #[error("unsupported media type: {detail}")]
    UnsupportedMediaType { detail: String },
    /// 422: well-formed but invalid (engineering) input; every problem listed.
    #[error("unprocessable: {detail}")]
    Unprocessable {
        detail: String,
        errors: Vec<FieldError>,
    },
    /// 422: the answer is meant for a tool and error-severity checks apply
    /// that the request did not accept (`accept_checks`).
    #[error("error checks not accepted: {detail}")]
    ChecksNotAccepted {
        detail: String,
        errors: Vec<FieldError>,
        checks: Vec<CheckOut>,
    },
    /// 428: the request must be conditional (`If-Match` missing).
    #[error("precondition required: {detail}")]
    PreconditionRequired { detail: String },
    /// 503: a dependency (the database) is unavailable; retry later.
    #[error("service unavailable: {detail}")]
    Unavailable {
        detail: String,
        retry_after_secs: u64,
    },
    /// 500: a fault on our side. The message is logged, never sent.
    #[error("internal error: {0}")]
    Internal(String),
}

impl ApiError {
    /// 400 for one field.
    pub fn malformed(field: impl Into<String>, reason: impl Into<String>) -> Self {
        let e = FieldError::new(field, reason);
        Self::Malformed {
            detail: format!("{}: {}", e.field, e.reason),
            errors: vec![e],
        }
    }

    /// 422 for one field.
    pub fn invalid(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::unprocessable(vec![FieldError::new(field, reason)])
    }

    /// 422 listing every problem found.
    pub fn unprocessable(errors: Vec<FieldError>) -> Self {
        let detail = summarise("the request is not valid", &errors);
        Self::Unprocessable { detail, errors }
    }

    /// 404 for an unknown name in a field, with the nearest known names.
    pub fn unknown(
        field: impl Into<String>,
        kind: &str,
        given: &str,
        suggestions: Vec<String>,
    ) -> Self {
        let field = field.into();
        let reason = format!("unknown {kind} '{given}'");
        Self::NotFound {
            detail: format!("{field}: {reason}"),
            errors: vec![FieldError::new(field, reason).with_suggestions(suggestions)],
        }
    }

    /// 404 for a resource addressed by the path.
    pub fn not_found(detail: impl Into<String>) -> Self {
        Self::NotFound {
            detail: detail.into(),
            errors: Vec::new(),
        }
    }

    fn slug_and_title(&self) -> (&'static str, &'static str) {
        match self {
            Self::Malformed { .. } => ("malformed-request", "Malformed request"),
            Self::UnknownParameter { .. } => ("unknown-parameter", "Unknown query parameter"),
            Self::Unauthorized { .. } => ("unauthorized", "Authentication required"),
            Self::Forbidden { .. } => ("forbidden", "Not allowed"),
            Self::NotFound { .. } => ("not-found", "Not found"),
            Self::MethodNotAllowed { .. } => ("method-not-allowed", "Method not allowed"),
            Self::NotAcceptable { .. } => ("not-acceptable", "Not acceptable"),
            Self::RequestTimeout { .. } => ("request-timeout", "Request timeout"),
            Self::Conflict { .. } => ("conflict", "Conflict"),
            Self::PreconditionFailed { .. } => ("precondition-failed", "Precondition failed"),
            Self::PayloadTooLarge { .. } => ("payload-too-large", "Payload too large"),
            Self::UnsupportedMediaType { .. } => {
                ("unsupported-media-type", "Unsupported media type")
            }
            Self::Unprocessable { .. } => ("invalid-input", "Invalid input"),
            Self::ChecksNotAccepted { .. } => ("checks-not-accepted", "Error checks not accepted"),
            Self::PreconditionRequired { .. } => ("precondition-required", "Precondition required"),
            Self::Unavailable { .. } => ("unavailable", "Service unavailable"),
            Self::Internal(_) => ("internal-error", "Internal error"),
        }
    }

    /// The problem object for this error, without request context. Batch
    /// endpoints put it in place of a failed item.
    pub fn problem(&self) -> Problem {
        let (slug, title) = self.slug_and_title();
        let status = self.status_code().as_u16();
        let mut errors = Vec::new();
        let mut current = None;
        let mut checks = Vec::new();
        let detail = match self {
            Self::Malformed { detail, errors: e }
            | Self::NotFound { detail, errors: e }
            | Self::Conflict { detail, errors: e }
            | Self::Unprocessable { detail, errors: e } => {
                errors = e.clone();
                detail.clone()
            }
            Self::ChecksNotAccepted {
                detail,
                errors: e,
                checks: c,
            } => {
                errors = e.clone();
                checks = c.clone();
                detail.clone()
            }
            Self::UnknownParameter { name, suggestions } => {
                let reason = "unknown query parameter; it would be ignored, so it is refused";
                errors.push(
                    FieldError::new(name.clone(), reason).with_suggestions(suggestions.clone()),
                );
                format!("unknown query parameter '{name}'")
            }
            Self::Unauthorized { detail }
            | Self::Forbidden { detail }
            | Self::NotAcceptable { detail }
            | Self::UnsupportedMediaType { detail } => detail.clone(),
            // Both preconditions concern the If-Match request header.
            Self::PreconditionRequired { detail } => {
                errors.push(FieldError::new(
                    "If-Match",
                    "missing: send the ETag from a GET of this resource",
                ));
                detail.clone()
            }
            Self::PreconditionFailed { detail, current: c } => {
                errors.push(FieldError::new(
                    "If-Match",
                    "stale: the resource changed since that ETag; its current state is in `current`",
                ));
                current = c.clone();
                detail.clone()
            }
            Self::PayloadTooLarge { limit_bytes } => {
                errors.push(FieldError::new(
                    "body",
                    format!("larger than the limit of {limit_bytes} bytes"),
                ));
                format!("the request body is larger than the limit of {limit_bytes} bytes")
            }
            Self::RequestTimeout { detail } => {
                errors.push(FieldError::new(
                    "body",
                    "not received completely within the body-read deadline",
                ));
                detail.clone()
            }
            Self::MethodNotAllowed { method, allowed } => {
                errors.push(FieldError::new(
                    "method",
                    format!(
                        "{method} is not answered here; allowed: {}",
                        allowed.join(", ")
                    ),
                ));
                format!("this path answers {} only", allowed.join(", "))
            }
            Self::Unavailable { detail, .. } => detail.clone(),
            Self::Internal(_) => {
                "an internal error occurred; it has been logged with the request id".to_string()
            }
        };
        Problem {
            problem_type: format!("/problems/{slug}"),
            title: title.to_string(),
            status,
            detail,
            instance: None,
            request_id: None,
            errors,
            current,
            checks,
        }
    }
}

/// `lead` when no field is named, else the application's one wording for
/// a list of field problems.
fn summarise(lead: &str, errors: &[FieldError]) -> String {
    if errors.is_empty() {
        return lead.to_string();
    }
    let pairs: Vec<(&str, &str)> = errors
        .iter()
        .map(|e| (e.field.as_str(), e.reason.as_str()))
        .collect();
    crate::app::error::problems_summary(&pairs)
}

impl ResponseError for ApiError {
    fn status_code(&self) -> StatusCode {
        match self {
            Self::Malformed { .. } | Self::UnknownParameter { .. } => StatusCode::BAD_REQUEST,
            Self::Unauthorized { .. } => StatusCode::UNAUTHORIZED,
            Self::Forbidden { .. } => StatusCode::FORBIDDEN,
            Self::NotFound { .. } => StatusCode::NOT_FOUND,
            Self::MethodNotAllowed { .. } => StatusCode::METHOD_NOT_ALLOWED,
            Self::NotAcceptable { .. } => StatusCode::NOT_ACCEPTABLE,
            Self::RequestTimeout { .. } => StatusCode::REQUEST_TIMEOUT,
            Self::Conflict { .. } => StatusCode::CONFLICT,
            Self::PreconditionFailed { .. } => StatusCode::PRECONDITION_FAILED,
            Self::PayloadTooLarge { .. } => StatusCode::PAYLOAD_TOO_LARGE,
            Self::UnsupportedMediaType { .. } => StatusCode::UNSUPPORTED_MEDIA_TYPE,
            Self::Unprocessable { .. } | Self::ChecksNotAccepted { .. } => {
                StatusCode::UNPROCESSABLE_ENTITY
            }
            Self::PreconditionRequired { .. } => StatusCode::PRECONDITION_REQUIRED,
            Self::Unavailable { .. } => StatusCode::SERVICE_UNAVAILABLE,
            Self::Internal(_) => StatusCode::INTERNAL_SERVER_ERROR,
        }
    }

    fn error_response(&self) -> HttpResponse {
        let ctx = super::request_id::current();
        if let Self::Internal(cause) = self {
            tracing::error!(request_id = ctx.as_ref().map(|c| c.id.as_str()), %cause, "internal error");
        } else if let Self::Unavailable { detail, .. } = self {
            tracing::warn!(request_id = ctx.as_ref().map(|c| c.id.as_str()), %detail, "unavailable");
        }
        let mut problem = self.problem();
        if let Some(ctx) = ctx {
            problem.instance = Some(ctx.path);
            problem.request_id = Some(ctx.id);
        }
        let mut builder = HttpResponse::build(self.status_code());
        builder.insert_header((header::CONTENT_TYPE, HeaderValue::from_static(PROBLEM_JSON)));
        match self {
            Self::Unavailable {
                retry_after_secs, ..
            } => {
                builder.insert_header((header::RETRY_AFTER, retry_after_secs.to_string()));
            }
            Self::Unauthorized { .. } => {
                builder.insert_header((header::WWW_AUTHENTICATE, "Bearer"));
            }
            // The rest of the body may still be on its way: close.
            Self::RequestTimeout { .. } => {
                builder.force_close();
            }
            Self::MethodNotAllowed { allowed, .. } => {
                builder.insert_header((header::ALLOW, allowed.join(", ")));
            }
            _ => {}
        }
        match serde_json::to_vec(&problem) {
            Ok(body) => builder.body(body),
            // Serialising a struct of strings cannot fail; answer plainly if it ever does.
            Err(_) => builder.body(r#"{"type":"/problems/internal-error","title":"Internal error","status":500,"detail":"","errors":[]}"#),
        }
    }
}

mod from_app;

#[cfg(test)]
mod tests;
