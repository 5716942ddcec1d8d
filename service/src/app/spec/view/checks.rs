//! Checks as the answers carry them: code, severity in words, message.

use serde::Serialize;
use utoipa::ToSchema;

use crate::engine::checks::{Check, Severity};

/// One finding of the checks.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct CheckOut {
    /// Stable machine-readable code, e.g. `surface_pressure_exceeded`.
    pub code: &'static str,
    /// `info`, `warning` or `error`.
    pub severity: &'static str,
    pub message: String,
}

impl CheckOut {
    pub fn is_error(&self) -> bool {
        self.severity == severity(Severity::Error)
    }
}

fn severity(s: Severity) -> &'static str {
    match s {
        Severity::Info => "info",
        Severity::Warning => "warning",
        Severity::Error => "error",
    }
}

/// The wire form of the engine's checks.
pub fn checks_out<'a>(checks: impl IntoIterator<Item = &'a Check>) -> Vec<CheckOut> {
    checks
        .into_iter()
        .map(|c| CheckOut {
            code: c.code,
            severity: severity(c.severity),
            message: c.message.clone(),
        })
        .collect()
}

/// How many of `checks` are errors.
pub fn error_count(checks: &[CheckOut]) -> usize {
    checks.iter().filter(|c| c.is_error()).count()
}
