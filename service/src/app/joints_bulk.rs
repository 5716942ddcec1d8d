//! Bulk import and export of joint definitions, as JSON
//! (`{"joints": [definition, …], "reason"}`) or CSV (one row per joint,
//! columns in `csv`). Every definition is read as one `POST /v1/joints`
//! body would be (the spec request must compute against the current
//! catalogue), every problem of every row is reported under its row
//! (`joints[i].field`, `rows[i].column`), and the import is written in one
//! transaction: all rows or none. A definition equal to the stored one is
//! counted `unchanged` and not written, so an export re-imports unchanged.

use serde::Serialize;
use serde_json::{Map, Value};
use utoipa::ToSchema;

use super::spec::SpecRequest;
use super::{App, AppError, FieldProblem, ProblemClass};
use crate::registry::joint::PAGE_MAX;
use crate::registry::{Joint, JointDefinition, Page};
use crate::store::joints::JointFilter;

pub mod csv_form;

/// Most joints in one import (JSON items or CSV rows).
pub const IMPORT_MAX: usize = 5_000;
/// Most joints in one export (a plant larger than this exports by tag).
pub const EXPORT_MAX: usize = 50_000;
/// Longest import reason, in characters.
pub const REASON_MAX: usize = 500;

/// How many joints an import created, updated and left unchanged.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ImportCounts {
    pub created: usize,
    pub updated: usize,
    pub unchanged: usize,
}

/// What an import did: the counts and the ids of each kind, in the order
/// given.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ImportReport {
    pub counts: ImportCounts,
    /// Joints defined by this import (version 1).
    pub created: Vec<String>,
    /// Joints whose definition this import replaced (one version more).
    pub updated: Vec<String>,
    /// Joints already holding the definition given (not written).
    pub unchanged: Vec<String>,
}

/// The spec request as the service reads it (defaults left out, numbers
/// as read), so a request sent in another spelling compares equal.
pub(crate) fn normalized(request: &Value) -> Value {
    serde_json::from_value::<SpecRequest>(request.clone())
        .ok()
        .and_then(|r| serde_json::to_value(r).ok())
        .unwrap_or_else(|| request.clone())
}

/// Whether a stored joint already holds a definition.
fn same(joint: &Joint, def: &JointDefinition) -> bool {
    joint.title == def.title
        && joint.tags == def.tags
        && joint.setpoints == def.setpoints
        && normalized(&joint.request) == normalized(&def.request)
}

/// The problems of one item, each renamed under `at` (all 422: a bulk
/// import refuses well-formed input it cannot take as a whole).
pub(super) fn under(at: &str, problems: Vec<FieldProblem>) -> Vec<FieldProblem> {
    problems
        .into_iter()
        .map(|mut p| {
            p.class = ProblemClass::Invalid;
            p.field = format!("{at}.{}", p.field);
            p
        })
        .collect()
}

/// The import reason: 1–500 characters, not blank.
fn reason(given: Option<&str>, field: &str) -> Result<String, FieldProblem> {
    let r = given.unwrap_or("");
    let n = r.chars().count();
    if r.trim().is_empty() || n > REASON_MAX {
        return Err(FieldProblem::invalid(
            field,
            format!("the joint history records why: give 1 to {REASON_MAX} characters ({n} given)"),
        ));
    }
    Ok(r.to_string())
}

impl App {
    /// Imports `{"joints": [definition, …], "reason"}`.
    pub async fn import_joints_json(
        &self,
        actor: &str,
        body: &Value,
    ) -> Result<ImportReport, AppError> {
        let Some(obj) = body.as_object() else {
            return Err(FieldProblem::invalid("body", "an object with joints and reason").into());
        };
        let mut problems = Vec::new();
        for key in obj
            .keys()
            .filter(|k| !["joints", "reason"].contains(&k.as_str()))
        {
            problems.push(FieldProblem::invalid(
                key.clone(),
                "unknown field; known are joints, reason",
            ));
        }
        let reason = reason(obj.get("reason").and_then(Value::as_str), "reason")
            .map_err(|p| problems.push(p))
            .ok();
        let items = match obj.get("joints") {
            Some(Value::Array(items)) => items.as_slice(),
            _ => {
                problems.push(FieldProblem::invalid(
                    "joints",
                    "required: a list of joint definitions",
                ));
                &[]
            }
        };
        let items: Vec<(String, &Value)> = items
            .iter()
            .enumerate()
            .map(|(i, v)| (format!("joints[{i}]"), v))
            .collect();
        self.import_checked(actor, &items, reason, problems).await
    }

    /// Reads every item (`(where, definition body)`), adds its problems to
    /// `problems` and writes all of them when there is none.
    pub(super) async fn import_checked(
        &self,
        actor: &str,
        items: &[(String, &Value)],
        reason: Option<String>,
        mut problems: Vec<FieldProblem>,
    ) -> Result<ImportReport, AppError> {
        if items.is_empty() || items.len() > IMPORT_MAX {
            problems.push(FieldProblem::invalid(
                "joints",
                format!(
                    "an import holds 1 to {IMPORT_MAX} joints, {} given",
                    items.len()
                ),
            ));
            return Err(AppError::Fields(problems));
        }
        let mut defs: Vec<JointDefinition> = Vec::with_capacity(items.len());
        let mut seen = std::collections::HashMap::new();
        for (at, item) in items {
            match self.definition(item) {
                Ok(def) => {
                    if let Some(first) = seen.insert(def.id.clone(), at.clone()) {
                        problems.push(FieldProblem::invalid(
                            format!("{at}.id"),
                            format!("'{}' is also the id of {first}", def.id),
                        ));
                    }
                    defs.push(def);
                }
                Err(AppError::Fields(p)) => problems.extend(under(at, p)),
                Err(other) => return Err(other),
            }
        }
        let Some(reason) = reason.filter(|_| problems.is_empty()) else {
            return Err(AppError::Fields(problems));
        };
        let out = self
            .store()
            .import_joints(&defs, same, actor, &reason)
            .await;
        self.fetch_cache().registry_written();
        let out = out?;
        let ids = |v: Vec<crate::registry::JointId>| -> Vec<String> {
            v.into_iter().map(String::from).collect()
        };
        Ok(ImportReport {
            counts: ImportCounts {
                created: out.created.len(),
                updated: out.updated.len(),
                unchanged: out.unchanged.len(),
            },
            created: ids(out.created),
            updated: ids(out.updated),
            unchanged: ids(out.unchanged),
        })
    }

    /// Every joint's definition in id order (with `tag`, only those).
    pub async fn export_joints(&self, tag: Option<&str>) -> Result<Vec<JointDefinition>, AppError> {
        if let Some(t) = tag {
            // the listing's reading of a tag
            self.joints(&super::joints::JointQuery {
                tag: Some(t.to_string()),
                limit: Some(1),
                ..Default::default()
            })
            .await?;
        }
        let filter = JointFilter {
            tag: tag.map(str::to_string),
            ..Default::default()
        };
        let mut out: Vec<JointDefinition> = Vec::new();
        let mut after = None;
        for _ in 0..=(EXPORT_MAX / PAGE_MAX as usize) {
            let page = Page {
                after: after.clone(),
                limit: PAGE_MAX,
            };
            let joints = self.store().joints(&filter, &page).await?;
            let last = joints.len() < PAGE_MAX as usize;
            after = joints.last().map(|j| j.id.clone());
            out.extend(joints.iter().map(Joint::definition));
            if last {
                return Ok(out);
            }
        }
        Err(FieldProblem::invalid(
            "tag",
            format!("more than {EXPORT_MAX} joints: export them by tag"),
        )
        .into())
    }
}

/// The JSON export: `{"joints": [definition, …]}`, the import's shape
/// without the reason.
pub fn export_json(defs: &[JointDefinition]) -> Value {
    let joints: Vec<Value> = defs
        .iter()
        .map(|d| serde_json::to_value(d).unwrap_or(Value::Null))
        .collect();
    let mut m = Map::new();
    m.insert("joints".into(), Value::Array(joints));
    Value::Object(m)
}
