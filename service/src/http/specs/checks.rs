//! Checks on the wire, and the rule that keeps a tool from being given a
//! window with a failed check: an answer meant for a tool (setpoints) is
//! refused with 422 while any error-severity check applies, unless the
//! request names every one of them in `accept_checks`; the answer then
//! records which it accepted.

use serde::Serialize;
use utoipa::ToSchema;

use crate::engine::checks::{Check, Severity, CODES};
use crate::http::error::{ApiError, FieldError};
use crate::http::extract::suggest;

use super::item_error::ItemError;

/// The request field that accepts error checks.
pub const ACCEPT_FIELD: &str = "accept_checks";

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

/// Check codes named by a request, each one a known code; an unknown one
/// is refused (400) naming `field`, with the nearest known codes.
pub fn known_codes<'a>(
    field: &str,
    given: impl IntoIterator<Item = &'a str>,
) -> Result<Vec<&'static str>, ItemError> {
    let mut out: Vec<&'static str> = Vec::new();
    for code in given {
        let code = code.trim();
        match CODES.iter().find(|k| **k == code) {
            Some(known) if !out.contains(known) => out.push(known),
            Some(_) => {}
            None => {
                let all: Vec<String> = CODES.iter().map(|c| c.to_string()).collect();
                return Err(ItemError::malformed(
                    field,
                    format!(
                        "'{code}' is not a check code; name the codes of the error checks \
                         to accept, separated by commas"
                    ),
                )
                .with_suggestions(suggest(code, &all)));
            }
        }
    }
    Ok(out)
}

/// The codes of a query value `code1,code2` (empty parts are refused).
pub fn codes_from_query(text: &str) -> Result<Vec<&'static str>, ItemError> {
    if text.split(',').any(|c| c.trim().is_empty()) {
        return Err(ItemError::malformed(
            ACCEPT_FIELD,
            "an empty code; write the check codes separated by commas, e.g. \
             surface_pressure_exceeded,thread_engagement_too_short",
        ));
    }
    known_codes(ACCEPT_FIELD, text.split(','))
}

/// Lets an answer for a tool through when every error check that applies
/// is accepted; returns the accepted codes that applied (in the order of
/// the checks). Otherwise a 422 listing every warning and error check,
/// with one `accept_checks` field error per error check not accepted.
pub fn gate(checks: &[CheckOut], accepted: &[&'static str]) -> Result<Vec<&'static str>, ApiError> {
    let errors: Vec<&CheckOut> = checks.iter().filter(|c| c.is_error()).collect();
    let refused: Vec<FieldError> = errors
        .iter()
        .filter(|c| !accepted.contains(&c.code))
        .map(|c| {
            FieldError::new(
                ACCEPT_FIELD,
                format!(
                    "error check {} applies and was not accepted: {}",
                    c.code, c.message
                ),
            )
        })
        .collect();
    if refused.is_empty() {
        return Ok(errors.iter().map(|c| c.code).collect());
    }
    let codes: Vec<&str> = errors.iter().map(|c| c.code).collect();
    Err(ApiError::ChecksNotAccepted {
        detail: format!(
            "{} error check{} appl{} to these values ({}); they are not given to a tool \
             unless every one is named in {ACCEPT_FIELD}",
            errors.len(),
            if errors.len() == 1 { "" } else { "s" },
            if errors.len() == 1 { "ies" } else { "y" },
            codes.join(", ")
        ),
        errors: refused,
        checks: checks
            .iter()
            .filter(|c| c.severity != severity(Severity::Info))
            .cloned()
            .collect(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn check(code: &'static str, s: &'static str) -> CheckOut {
        CheckOut {
            code,
            severity: s,
            message: format!("{code} sentence."),
        }
    }

    #[test]
    fn errors_pass_only_when_each_is_accepted() {
        let checks = [
            check("surface_pressure_exceeded", "error"),
            check("thread_engagement_too_short", "error"),
            check("hydrogen_embrittlement_risk", "warning"),
            check("surface_pressure_not_checked", "info"),
        ];
        let e = gate(&checks, &["surface_pressure_exceeded"]).unwrap_err();
        let p = e.problem();
        assert_eq!(p.status, 422);
        assert_eq!(p.errors.len(), 1);
        assert!(p.errors[0].reason.contains("thread_engagement_too_short"));
        assert_eq!(p.checks.len(), 3, "warnings and errors listed");
        let both = ["thread_engagement_too_short", "surface_pressure_exceeded"];
        assert_eq!(
            gate(&checks, &both).unwrap(),
            ["surface_pressure_exceeded", "thread_engagement_too_short"]
        );
        assert!(gate(&checks[2..], &[]).unwrap().is_empty());
    }

    #[test]
    fn unknown_or_empty_codes_are_refused_naming_the_field() {
        let e = codes_from_query("surface_pressure_exceded").unwrap_err();
        assert_eq!(e.field, ACCEPT_FIELD);
        assert_eq!(e.suggestions[0], "surface_pressure_exceeded");
        assert!(codes_from_query("surface_pressure_exceeded,").is_err());
        assert_eq!(
            codes_from_query("clamp_load_not_reached,clamp_load_not_reached").unwrap(),
            ["clamp_load_not_reached"]
        );
    }
}
