//! A joint: the plant's definition of one tightening operation, kept under
//! the plant's own key. The definition is read from the JSON body
//! `{"id", "title", "tags", "request", "setpoints"}` field by field, every
//! problem named; the spec request stays opaque here (the application layer
//! reads it as a spec request), the tool presentation is kept as given.

use chrono::{DateTime, Utc};
use serde::{Deserialize, Serialize};
use serde_json::{Map, Value};

use super::error::RegistryError;
use crate::catalogue::ChangeProblem;

/// Longest joint id, in characters.
pub const ID_MAX: usize = 64;
/// Longest title, in characters.
pub const TITLE_MAX: usize = 200;
/// Most tags on one joint.
pub const TAGS_MAX: usize = 32;
/// Longest tag, in characters.
pub const TAG_MAX: usize = 64;
/// Most joints in one page of a listing.
pub const PAGE_MAX: u32 = 500;

/// The plant's key for a joint: 1–64 characters of `A–Z a–z 0–9 . _ -`,
/// case kept as given, usable as one URL path segment as it is (an id of
/// dots only is refused: `.` and `..` are path steps, not names).
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(try_from = "String", into = "String")]
pub struct JointId(String);

impl JointId {
    /// Reads an id; the refusal names `field`.
    pub fn parse(field: &str, given: &str) -> Result<JointId, ChangeProblem> {
        let n = given.chars().count();
        if n == 0 || n > ID_MAX {
            return Err(ChangeProblem::new(
                field,
                format!("a joint id has 1 to {ID_MAX} characters, this one {n}"),
            ));
        }
        if let Some(c) = given
            .chars()
            .find(|c| !(c.is_ascii_alphanumeric() || matches!(c, '.' | '_' | '-')))
        {
            return Err(ChangeProblem::new(
                field,
                format!(
                    "'{}' may not be in a joint id: use A-Z, a-z, 0-9, '.', '_' and '-'",
                    c.escape_default()
                ),
            ));
        }
        if given.chars().all(|c| c == '.') {
            return Err(ChangeProblem::new(
                field,
                "a joint id of dots only would be read as a path step",
            ));
        }
        Ok(JointId(given.to_string()))
    }

    pub fn as_str(&self) -> &str {
        &self.0
    }

    /// Refuses, for a new definition, an id that is one of the fixed path
    /// words under `/v1/joints/` ([`RESERVED_IDS`]): such a joint could
    /// not be read by its own path. Ids already stored are read as they are.
    pub fn not_reserved(self) -> Result<JointId, ChangeProblem> {
        if RESERVED_IDS.contains(&self.0.as_str()) {
            return Err(ChangeProblem::new(
                "id",
                format!(
                    "'{}' is a fixed path under /v1/joints/ ({}); choose another id",
                    self.0,
                    RESERVED_IDS.join(", ")
                ),
            ));
        }
        Ok(self)
    }
}

/// Path words under `/v1/joints/` that name a route, not a joint.
pub const RESERVED_IDS: [&str; 3] = ["export", "import", "releases"];

impl std::fmt::Display for JointId {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.0)
    }
}

impl TryFrom<String> for JointId {
    type Error = String;
    fn try_from(s: String) -> Result<Self, Self::Error> {
        JointId::parse("id", &s).map_err(|p| p.reason)
    }
}

impl From<JointId> for String {
    fn from(id: JointId) -> String {
        id.0
    }
}

/// How the tool is given the values: the unit its torque is set in and the
/// steps it can hold, as the integration sent them (the application layer
/// reads the unit; here the steps are only held to be finite and positive).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Setpoints {
    #[serde(skip_serializing_if = "Option::is_none")]
    pub torque_unit: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub resolution: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub angle_resolution: Option<f64>,
}

/// What an editor defines: everything but the version and the review mark.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct JointDefinition {
    pub id: JointId,
    pub title: String,
    pub tags: Vec<String>,
    /// The spec request, as `POST /v1/tightening-specs` takes it (opaque here).
    pub request: Value,
    pub setpoints: Setpoints,
}

/// A catalogue revision after which the joint's active release would
/// compute differently, and since when the mark stands.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReviewDue {
    pub revision: i64,
    pub since: DateTime<Utc>,
}

/// A stored joint: its definition, its version (1 on create, one more with
/// each update; the `If-Match` of an edit) and its review mark.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Joint {
    pub id: JointId,
    pub title: String,
    pub tags: Vec<String>,
    pub request: Value,
    pub setpoints: Setpoints,
    pub version: i64,
    pub review_due: Option<ReviewDue>,
}

impl Joint {
    /// The definition part (what the history records before and after).
    pub fn definition(&self) -> JointDefinition {
        JointDefinition {
            id: self.id.clone(),
            title: self.title.clone(),
            tags: self.tags.clone(),
            request: self.request.clone(),
            setpoints: self.setpoints.clone(),
        }
    }
}

/// One page of a listing: joints after `after` (by id), at most `limit`.
#[derive(Debug, Clone, PartialEq)]
pub struct Page {
    pub after: Option<JointId>,
    pub limit: u32,
}

impl Page {
    /// A page; `limit` 1–500 (the refusal names `limit`), `after` an id.
    pub fn new(after: Option<&str>, limit: u32) -> Result<Page, RegistryError> {
        let mut problems = Vec::new();
        if limit == 0 || limit > PAGE_MAX {
            problems.push(ChangeProblem::new(
                "limit",
                format!("a page holds 1 to {PAGE_MAX} joints, not {limit}"),
            ));
        }
        let after = match after.map(|a| JointId::parse("after", a)).transpose() {
            Ok(a) => a,
            Err(p) => {
                problems.push(p);
                None
            }
        };
        if problems.is_empty() {
            Ok(Page { after, limit })
        } else {
            Err(RegistryError::Invalid { problems })
        }
    }
}

const FIELDS: [&str; 5] = ["id", "title", "tags", "request", "setpoints"];
const SETPOINT_FIELDS: [&str; 3] = ["torque_unit", "resolution", "angle_resolution"];

impl JointDefinition {
    /// Reads a definition from its JSON body; every problem is listed with
    /// its field, an unknown key is refused (it would be ignored).
    pub fn from_json(body: &Value) -> Result<JointDefinition, RegistryError> {
        let Some(obj) = body.as_object() else {
            return Err(RegistryError::invalid_one(
                "",
                "a joint is a JSON object with id, title, tags, request and setpoints",
            ));
        };
        let mut problems = Vec::new();
        unknown_keys(obj, "", &FIELDS, &mut problems);
        let id = match obj.get("id") {
            Some(Value::String(s)) => JointId::parse("id", s)
                .and_then(JointId::not_reserved)
                .map_err(|p| problems.push(p))
                .ok(),
            other => {
                problems.push(required(other, "id", "a string"));
                None
            }
        };
        let title = match obj.get("title") {
            Some(Value::String(s)) => {
                text(s, "title", TITLE_MAX, &mut problems);
                Some(s.clone())
            }
            other => {
                problems.push(required(other, "title", "a string"));
                None
            }
        };
        let tags = tags(obj.get("tags"), &mut problems);
        let request = match obj.get("request") {
            Some(v @ Value::Object(_)) => Some(v.clone()),
            other => {
                problems.push(required(other, "request", "an object: the spec request"));
                None
            }
        };
        let setpoints = setpoints(obj.get("setpoints"), &mut problems);
        match (id, title, request) {
            (Some(id), Some(title), Some(request)) if problems.is_empty() => Ok(JointDefinition {
                id,
                title,
                tags,
                request,
                setpoints,
            }),
            _ => Err(RegistryError::Invalid { problems }),
        }
    }
}

fn required(given: Option<&Value>, field: &str, what: &str) -> ChangeProblem {
    match given {
        None | Some(Value::Null) => ChangeProblem::new(field, format!("required: {what}")),
        Some(_) => ChangeProblem::new(field, format!("must be {what}")),
    }
}

fn unknown_keys(obj: &Map<String, Value>, at: &str, known: &[&str], out: &mut Vec<ChangeProblem>) {
    for key in obj.keys().filter(|k| !known.contains(&k.as_str())) {
        out.push(ChangeProblem::new(
            format!("{at}{key}"),
            format!("unknown field; known are {}", known.join(", ")),
        ));
    }
}

/// A text of 1 to `max` characters, not blank, without control characters.
fn text(s: &str, field: &str, max: usize, out: &mut Vec<ChangeProblem>) {
    let n = s.chars().count();
    if s.trim().is_empty() || n > max {
        out.push(ChangeProblem::new(
            field,
            format!("must have 1 to {max} characters and not be blank ({n} given)"),
        ));
    } else if s.chars().any(char::is_control) {
        out.push(ChangeProblem::new(field, "may not hold control characters"));
    }
}

fn tags(given: Option<&Value>, out: &mut Vec<ChangeProblem>) -> Vec<String> {
    let items = match given {
        None | Some(Value::Null) => return Vec::new(),
        Some(Value::Array(items)) => items,
        Some(_) => {
            out.push(ChangeProblem::new("tags", "must be a list of strings"));
            return Vec::new();
        }
    };
    if items.len() > TAGS_MAX {
        out.push(ChangeProblem::new(
            "tags",
            format!("at most {TAGS_MAX} tags, {} given", items.len()),
        ));
        return Vec::new();
    }
    let mut tags = Vec::with_capacity(items.len());
    for (i, item) in items.iter().enumerate() {
        let field = format!("tags[{i}]");
        let Some(tag) = item.as_str() else {
            out.push(ChangeProblem::new(field, "must be a string"));
            continue;
        };
        let before = out.len();
        text(tag, &field, TAG_MAX, out);
        if let Some(j) = items[..i].iter().position(|t| t.as_str() == Some(tag)) {
            out.push(ChangeProblem::new(&field, format!("repeats tags[{j}]")));
        }
        if out.len() == before {
            tags.push(tag.to_string());
        }
    }
    tags
}

fn setpoints(given: Option<&Value>, out: &mut Vec<ChangeProblem>) -> Setpoints {
    let obj = match given {
        None | Some(Value::Null) => return Setpoints::default(),
        Some(Value::Object(obj)) => obj,
        Some(_) => {
            out.push(ChangeProblem::new(
                "setpoints",
                "must be an object with torque_unit, resolution, angle_resolution",
            ));
            return Setpoints::default();
        }
    };
    unknown_keys(obj, "setpoints.", &SETPOINT_FIELDS, out);
    let torque_unit = match obj.get("torque_unit") {
        None | Some(Value::Null) => None,
        Some(Value::String(s)) => {
            text(s, "setpoints.torque_unit", TAG_MAX, out);
            Some(s.clone())
        }
        Some(_) => {
            out.push(ChangeProblem::new(
                "setpoints.torque_unit",
                "must be a string",
            ));
            None
        }
    };
    Setpoints {
        torque_unit,
        resolution: step(obj.get("resolution"), "setpoints.resolution", out),
        angle_resolution: step(
            obj.get("angle_resolution"),
            "setpoints.angle_resolution",
            out,
        ),
    }
}

/// A tool step: absent, or a finite number above zero.
fn step(given: Option<&Value>, field: &str, out: &mut Vec<ChangeProblem>) -> Option<f64> {
    match given {
        None | Some(Value::Null) => None,
        Some(v) => match v.as_f64() {
            Some(x) if x.is_finite() && x > 0.0 => Some(x),
            _ => {
                out.push(ChangeProblem::new(field, "must be a number above zero"));
                None
            }
        },
    }
}

#[cfg(test)]
#[path = "joint_tests.rs"]
mod tests;
