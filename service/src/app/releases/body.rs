//! The bodies of the release routes, read field by field with every
//! problem named: a release `{"reason", "accept_checks": [{"code",
//! "reason"}]}`, a bulk release (the same with `ids` or `tag`) and a
//! status change (approve, withdraw) `{"reason"}`.

use serde_json::{Map, Value};

use crate::app::reading::suggest;
use crate::app::{AppError, FieldProblem};
use crate::engine::checks::CODES;
use crate::registry::joint::TAG_MAX;
use crate::registry::{AcceptedCheck, JointId};

/// Longest reason, in characters.
pub const REASON_MAX: usize = 1000;
/// Most accepted checks in one release (there are fewer check codes).
pub const ACCEPTED_MAX: usize = 64;

/// What a release request asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct ReleaseAsk {
    pub reason: String,
    pub accept_checks: Vec<AcceptedCheck>,
}

fn object<'a>(body: &'a Value, known: &[&str]) -> Result<&'a Map<String, Value>, AppError> {
    let Some(obj) = body.as_object() else {
        return Err(FieldProblem::invalid(
            "body",
            format!("must be a JSON object with {}", known.join(", ")),
        )
        .into());
    };
    Ok(obj)
}

fn unknown_keys(obj: &Map<String, Value>, known: &[&str], out: &mut Vec<FieldProblem>) {
    for key in obj.keys().filter(|k| !known.contains(&k.as_str())) {
        out.push(FieldProblem::invalid(
            key.clone(),
            format!("unknown field; known are {}", known.join(", ")),
        ));
    }
}

/// A reason: a string of 1 to [`REASON_MAX`] characters, not blank.
fn reason(given: Option<&Value>, field: &str, out: &mut Vec<FieldProblem>) -> String {
    match given {
        Some(Value::String(s)) => {
            let n = s.chars().count();
            if s.trim().is_empty() || n > REASON_MAX {
                out.push(FieldProblem::invalid(
                    field,
                    format!("must have 1 to {REASON_MAX} characters and not be blank ({n} given)"),
                ));
            }
            s.clone()
        }
        None | Some(Value::Null) => {
            out.push(FieldProblem::invalid(field, "required: say why"));
            String::new()
        }
        Some(_) => {
            out.push(FieldProblem::invalid(field, "must be a string"));
            String::new()
        }
    }
}

fn accepted(given: Option<&Value>, out: &mut Vec<FieldProblem>) -> Vec<AcceptedCheck> {
    let items = match given {
        None | Some(Value::Null) => return Vec::new(),
        Some(Value::Array(items)) if items.len() <= ACCEPTED_MAX => items,
        Some(Value::Array(items)) => {
            out.push(FieldProblem::invalid(
                "accept_checks",
                format!("at most {ACCEPTED_MAX} checks, {} given", items.len()),
            ));
            return Vec::new();
        }
        Some(_) => {
            out.push(FieldProblem::invalid(
                "accept_checks",
                "must be a list of {\"code\", \"reason\"} objects",
            ));
            return Vec::new();
        }
    };
    let known: Vec<String> = CODES.iter().map(|c| c.to_string()).collect();
    let mut checks = Vec::with_capacity(items.len());
    for (i, item) in items.iter().enumerate() {
        let at = format!("accept_checks[{i}]");
        let Some(obj) = item.as_object() else {
            out.push(FieldProblem::invalid(
                at,
                "must be an object with code and reason",
            ));
            continue;
        };
        for key in obj
            .keys()
            .filter(|k| !["code", "reason"].contains(&k.as_str()))
        {
            out.push(FieldProblem::invalid(
                format!("{at}.{key}"),
                "unknown field; known are code, reason",
            ));
        }
        let code = match obj.get("code").and_then(Value::as_str) {
            Some(code) if CODES.contains(&code) => code.to_string(),
            Some(code) => {
                out.push(
                    FieldProblem::invalid(
                        format!("{at}.code"),
                        format!("'{code}' is not a check code"),
                    )
                    .with_suggestions(suggest(code, &known)),
                );
                continue;
            }
            None => {
                out.push(FieldProblem::invalid(
                    format!("{at}.code"),
                    "required: the code of the error check accepted",
                ));
                continue;
            }
        };
        let why = reason(obj.get("reason"), &format!("{at}.reason"), out);
        if let Some(j) = checks.iter().position(|c: &AcceptedCheck| c.code == code) {
            out.push(FieldProblem::invalid(
                format!("{at}.code"),
                format!("repeats accept_checks[{j}]"),
            ));
        }
        checks.push(AcceptedCheck { code, reason: why });
    }
    checks
}

/// Reads a release body; every problem named, `accept_checks` optional.
pub fn release_ask(body: &Value) -> Result<ReleaseAsk, AppError> {
    const KNOWN: [&str; 2] = ["reason", "accept_checks"];
    let obj = object(body, &KNOWN)?;
    let mut problems = Vec::new();
    unknown_keys(obj, &KNOWN, &mut problems);
    let reason = reason(obj.get("reason"), "reason", &mut problems);
    let accept_checks = accepted(obj.get("accept_checks"), &mut problems);
    if problems.is_empty() {
        Ok(ReleaseAsk {
            reason,
            accept_checks,
        })
    } else {
        Err(AppError::Fields(problems))
    }
}

/// Most joints in one bulk release.
pub const BULK_RELEASE_MAX: usize = 1_000;

/// Which joints a bulk release takes.
#[derive(Debug, Clone, PartialEq)]
pub enum Selection {
    /// These joints, in the order given (1 to [`BULK_RELEASE_MAX`], no
    /// repeats).
    Ids(Vec<JointId>),
    /// Every joint carrying this tag.
    Tag(String),
}

/// What a bulk release asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct BulkReleaseAsk {
    pub joints: Selection,
    pub ask: ReleaseAsk,
}

fn ids(items: &[Value], out: &mut Vec<FieldProblem>) -> Vec<JointId> {
    let mut ids: Vec<JointId> = Vec::with_capacity(items.len());
    let mut seen = std::collections::HashMap::with_capacity(items.len());
    for (i, item) in items.iter().enumerate() {
        let at = format!("ids[{i}]");
        let Some(text) = item.as_str() else {
            out.push(FieldProblem::invalid(at, "must be a joint id (a string)"));
            continue;
        };
        match JointId::parse(&at, text) {
            Ok(id) => {
                if let Some(j) = seen.insert(text.to_string(), i) {
                    out.push(FieldProblem::invalid(at, format!("repeats ids[{j}]")));
                } else {
                    ids.push(id);
                }
            }
            Err(p) => out.push(FieldProblem::invalid(p.field, p.reason)),
        }
    }
    ids
}

fn selection(obj: &Map<String, Value>, out: &mut Vec<FieldProblem>) -> Option<Selection> {
    match (obj.get("ids"), obj.get("tag")) {
        (Some(_), Some(_)) => {
            out.push(FieldProblem::invalid(
                "tag",
                "give the joints by ids or by tag, not both",
            ));
            None
        }
        (None, None) => {
            out.push(FieldProblem::invalid(
                "ids",
                "required: the joints' ids, or a tag that selects them",
            ));
            None
        }
        (Some(Value::Array(items)), None) if (1..=BULK_RELEASE_MAX).contains(&items.len()) => {
            Some(Selection::Ids(ids(items, out)))
        }
        (Some(Value::Array(items)), None) => {
            out.push(FieldProblem::invalid(
                "ids",
                format!(
                    "1 to {BULK_RELEASE_MAX} joint ids in one bulk release, {} given",
                    items.len()
                ),
            ));
            None
        }
        (Some(_), None) => {
            out.push(FieldProblem::invalid("ids", "must be a list of joint ids"));
            None
        }
        (None, Some(Value::String(tag))) => {
            let n = tag.chars().count();
            if tag.trim().is_empty() || n > TAG_MAX {
                out.push(FieldProblem::invalid(
                    "tag",
                    format!("a tag has 1 to {TAG_MAX} characters and is not blank ({n} given)"),
                ));
                return None;
            }
            Some(Selection::Tag(tag.clone()))
        }
        (None, Some(_)) => {
            out.push(FieldProblem::invalid("tag", "must be a string"));
            None
        }
    }
}

/// Reads a bulk release body `{"ids": [...]}` or `{"tag"}` with `reason`
/// and `accept_checks` as a release's; every problem named.
pub fn bulk_release_ask(body: &Value) -> Result<BulkReleaseAsk, AppError> {
    const KNOWN: [&str; 4] = ["ids", "tag", "reason", "accept_checks"];
    let obj = object(body, &KNOWN)?;
    let mut problems = Vec::new();
    unknown_keys(obj, &KNOWN, &mut problems);
    let joints = selection(obj, &mut problems);
    let reason = reason(obj.get("reason"), "reason", &mut problems);
    let accept_checks = accepted(obj.get("accept_checks"), &mut problems);
    match joints {
        Some(joints) if problems.is_empty() => Ok(BulkReleaseAsk {
            joints,
            ask: ReleaseAsk {
                reason,
                accept_checks,
            },
        }),
        _ => Err(AppError::Fields(problems)),
    }
}

/// Reads the `{"reason"}` of an approval or a withdrawal.
pub fn status_reason(body: &Value) -> Result<String, AppError> {
    let obj = object(body, &["reason"])?;
    let mut problems = Vec::new();
    unknown_keys(obj, &["reason"], &mut problems);
    let reason = reason(obj.get("reason"), "reason", &mut problems);
    if problems.is_empty() {
        Ok(reason)
    } else {
        Err(AppError::Fields(problems))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    fn fields(e: AppError) -> Vec<String> {
        e.problems().iter().map(|p| p.field.clone()).collect()
    }

    #[test]
    fn a_release_body_is_read_with_its_accepted_checks() {
        let ask = release_ask(&json!({
            "reason": "first release for the pilot line",
            "accept_checks": [{"code": "surface_pressure_exceeded", "reason": "hardened washer"}]
        }))
        .unwrap();
        assert_eq!(ask.reason, "first release for the pilot line");
        assert_eq!(ask.accept_checks[0].code, "surface_pressure_exceeded");
        assert!(release_ask(&json!({"reason": "r"}))
            .unwrap()
            .accept_checks
            .is_empty());
    }

    #[test]
    fn every_bad_field_is_named() {
        let e = release_ask(&json!({
            "reason": " ",
            "colour": 1,
            "accept_checks": [
                {"code": "surface_pressure_exeeded", "reason": "x"},
                {"code": "surface_pressure_exceeded"},
                {"code": "surface_pressure_exceeded", "reason": "again"},
                3
            ]
        }))
        .unwrap_err();
        assert_eq!(
            fields(e),
            [
                "colour",
                "reason",
                "accept_checks[0].code",
                "accept_checks[1].reason",
                "accept_checks[2].code",
                "accept_checks[3]"
            ]
        );
        assert_eq!(fields(release_ask(&json!([])).unwrap_err()), ["body"]);
        assert_eq!(fields(status_reason(&json!({})).unwrap_err()), ["reason"]);
        let long = "x".repeat(REASON_MAX + 1);
        assert_eq!(
            fields(status_reason(&json!({ "reason": long })).unwrap_err()),
            ["reason"]
        );
        assert_eq!(status_reason(&json!({"reason": "ok"})).unwrap(), "ok");
    }

    #[test]
    fn a_bulk_release_takes_ids_or_a_tag() {
        let ask = bulk_release_ask(&json!({"ids": ["K4-1", "K4-2"], "reason": "r"})).unwrap();
        assert!(matches!(ask.joints, Selection::Ids(ref v) if v.len() == 2));
        let ask = bulk_release_ask(&json!({"tag": "line-1", "reason": "r"})).unwrap();
        assert_eq!(ask.joints, Selection::Tag("line-1".into()));
        let e = bulk_release_ask(&json!({"ids": ["a", "a b", "a", 3], "reason": "r"})).unwrap_err();
        assert_eq!(fields(e), ["ids[1]", "ids[2]", "ids[3]"]);
        let e = bulk_release_ask(&json!({"ids": ["a"], "tag": "t", "reason": "r"})).unwrap_err();
        assert_eq!(fields(e), ["tag"]);
        let e = bulk_release_ask(&json!({"reason": ""})).unwrap_err();
        assert_eq!(fields(e), ["ids", "reason"]);
        let many: Vec<String> = (0..=BULK_RELEASE_MAX).map(|i| format!("J{i}")).collect();
        let e = bulk_release_ask(&json!({"ids": many, "reason": "r"})).unwrap_err();
        assert_eq!(fields(e), ["ids"]);
        let e = bulk_release_ask(&json!({"ids": [], "reason": "r"})).unwrap_err();
        assert_eq!(fields(e), ["ids"]);
    }
}
