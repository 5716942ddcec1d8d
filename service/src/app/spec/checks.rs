//! The rule that keeps a tool from being given a window with a failed
//! check: an answer meant for a tool (setpoints) is refused while any
//! error-severity check applies, unless the request names every one of them
//! in `accept_checks`; the answer then records which it accepted. Also the
//! reading of those codes from a request.

use crate::app::reading::suggest;
use crate::app::{AppError, FieldProblem};
use crate::engine::checks::{Check, Severity, CODES};

/// The request field that accepts error checks.
pub const ACCEPT_FIELD: &str = "accept_checks";

/// Check codes named by a request, each one a known code; an unknown one
/// is refused (malformed) naming `field`, with the nearest known codes.
pub fn known_codes<'a>(
    field: &str,
    given: impl IntoIterator<Item = &'a str>,
) -> Result<Vec<&'static str>, FieldProblem> {
    let mut out: Vec<&'static str> = Vec::new();
    for code in given {
        let code = code.trim();
        match CODES.iter().find(|k| **k == code) {
            Some(known) if !out.contains(known) => out.push(known),
            Some(_) => {}
            None => {
                let all: Vec<String> = CODES.iter().map(|c| c.to_string()).collect();
                return Err(FieldProblem::malformed(
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
pub fn codes_from_query(text: &str) -> Result<Vec<&'static str>, FieldProblem> {
    if text.split(',').any(|c| c.trim().is_empty()) {
        return Err(FieldProblem::malformed(
            ACCEPT_FIELD,
            "an empty code; write the check codes separated by commas, e.g. \
             surface_pressure_exceeded,thread_engagement_too_short",
        ));
    }
    known_codes(ACCEPT_FIELD, text.split(','))
}

/// Lets an answer for a tool through when every error check that applies
/// is accepted; returns the accepted codes that applied (in the order of
/// the checks). Otherwise [`AppError::ChecksNotAccepted`] with every
/// warning and error check and one `accept_checks` problem per error check
/// not accepted.
pub fn gate(checks: &[Check], accepted: &[&'static str]) -> Result<Vec<&'static str>, AppError> {
    let errors: Vec<&Check> = checks
        .iter()
        .filter(|c| c.severity == Severity::Error)
        .collect();
    let unaccepted: Vec<FieldProblem> = errors
        .iter()
        .filter(|c| !accepted.contains(&c.code))
        .map(|c| {
            FieldProblem::invalid(
                ACCEPT_FIELD,
                format!(
                    "error check {} applies and was not accepted: {}",
                    c.code, c.message
                ),
            )
        })
        .collect();
    if unaccepted.is_empty() {
        return Ok(errors.iter().map(|c| c.code).collect());
    }
    let codes: Vec<&str> = errors.iter().map(|c| c.code).collect();
    Err(AppError::ChecksNotAccepted {
        detail: format!(
            "{} error check{} appl{} to these values ({}); they are not given to a tool \
             unless every one is named in {ACCEPT_FIELD}",
            errors.len(),
            if errors.len() == 1 { "" } else { "s" },
            if errors.len() == 1 { "ies" } else { "y" },
            codes.join(", ")
        ),
        checks: checks
            .iter()
            .filter(|c| c.severity != Severity::Info)
            .cloned()
            .collect(),
        unaccepted,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn check(code: &'static str, severity: Severity) -> Check {
        Check {
            code,
            severity,
            message: format!("{code} sentence."),
        }
    }

    #[test]
    fn errors_pass_only_when_each_is_accepted() {
        let checks = [
            check("surface_pressure_exceeded", Severity::Error),
            check("thread_engagement_too_short", Severity::Error),
            check("hydrogen_embrittlement_risk", Severity::Warning),
            check("surface_pressure_not_checked", Severity::Info),
        ];
        let e = gate(&checks, &["surface_pressure_exceeded"]).unwrap_err();
        let AppError::ChecksNotAccepted {
            checks: listed,
            unaccepted,
            ..
        } = e
        else {
            panic!("not a checks refusal: {e:?}");
        };
        assert_eq!(unaccepted.len(), 1);
        assert_eq!(unaccepted[0].field, ACCEPT_FIELD);
        assert!(unaccepted[0].reason.contains("thread_engagement_too_short"));
        assert_eq!(listed.len(), 3, "warnings and errors listed");
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
