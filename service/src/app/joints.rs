//! Joint use cases: define a joint, read one, list them (by tag, by a due
//! review, in pages of ids) and change a definition from the version the
//! editor read. A definition is read by `registry::JointDefinition` and its
//! `request` must also be a spec request that computes against the current
//! catalogue, and its `setpoints` ones a tool can be given; every problem is
//! named under its body field (`request.thread`, `setpoints.resolution`)
//! and nothing is written when one is found. [`JointView`] is the joint as
//! both adapters render it.

use serde::Serialize;
use serde_json::Value;
use utoipa::ToSchema;

use super::reading::suggest;
use super::spec::rounding::check_resolution;
use super::spec::tool::torque_unit;
use super::spec::{compute_one, SpecRequest};
use super::{App, AppError, FieldProblem};

mod request;
use crate::catalogue::ChangeProblem;
use crate::registry::joint::TAG_MAX;
use crate::registry::{Joint, JointDefinition, JointId, Page, RegistryError, ReleaseStatus};
use crate::store::joints::JointFilter;
use crate::store::{RegistryStoreError, StoreError};
pub(crate) use request::joint_spec_request;
use request::{readable_tags, request_field, with_tags};

/// Ids read to find the near ones of an unknown id.
pub const NEAR_IDS_SCANNED: u32 = 200;

/// Joints in a page when the request names no `limit`.
pub const DEFAULT_LIMIT: u32 = 50;

/// What a joint's history records as the reason of a create and an update
/// (the definition body has no reason field; the version says which).
const CREATED: &str = "joint defined";
const CHANGED: &str = "joint definition changed";

/// A catalogue revision after which the joint's released spec would
/// compute differently, and since when the mark stands.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ReviewDueView {
    /// The catalogue revision that caused the mark.
    pub revision: i64,
    /// When the joint was marked (RFC 3339).
    pub since: String,
}

/// A joint as the API serves it: the definition as it was sent, its version
/// (the `If-Match` of the next change) and its review mark.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct JointView {
    /// The plant's key: 1–64 of `A–Z a–z 0–9 . _ -`; not `export`, `import` or `releases`.
    pub id: String,
    pub title: String,
    pub tags: Vec<String>,
    /// The spec request, as `POST /v1/tightening-specs` takes it.
    #[schema(value_type = Object)]
    pub request: Value,
    /// The tool presentation: `torque_unit`, `resolution`, `angle_resolution`.
    #[schema(value_type = Object)]
    pub setpoints: Value,
    /// 1 on create, one more with each change.
    pub version: i64,
    /// Set while a catalogue change would move the released spec.
    pub review_due: Option<ReviewDueView>,
}

impl JointView {
    /// The joint's ETag: its id and version in the catalogue's tag scheme
    /// (`"<kind>-<id>-r<n>"`), so an `If-Match` is read the same way.
    pub fn etag(&self) -> String {
        format!("\"joint-{}-r{}\"", self.id, self.version)
    }
}

impl From<&Joint> for JointView {
    fn from(j: &Joint) -> Self {
        JointView {
            id: j.id.to_string(),
            title: j.title.clone(),
            tags: j.tags.clone(),
            request: j.request.clone(),
            setpoints: serde_json::to_value(&j.setpoints).unwrap_or(Value::Null),
            version: j.version,
            review_due: j.review_due.as_ref().map(|r| ReviewDueView {
                revision: r.revision,
                since: r.since.to_rfc3339(),
            }),
        }
    }
}

/// Which joints a listing asks for.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct JointQuery {
    pub tag: Option<String>,
    /// Only joints with a release now at this status (`draft`, `released`,
    /// `superseded`, `withdrawn`).
    pub status: Option<String>,
    /// Only joints whose review is due.
    pub review_due: bool,
    pub limit: Option<u32>,
    pub after: Option<String>,
}

/// One page of joints and the cursor of the next (`None` on the last).
#[derive(Debug, Clone, PartialEq)]
pub struct JointPage {
    pub joints: Vec<Joint>,
    pub next: Option<String>,
}

/// The registry's problems as 422 field problems; one about the whole
/// body (no field) names `body`.
fn invalid(problems: Vec<ChangeProblem>) -> AppError {
    AppError::Fields(
        problems
            .into_iter()
            .map(|p| {
                let field = if p.field.is_empty() {
                    "body".into()
                } else {
                    p.field
                };
                FieldProblem::invalid(field, p.reason).with_suggestions(p.suggestions)
            })
            .collect(),
    )
}

impl From<RegistryError> for AppError {
    fn from(e: RegistryError) -> Self {
        let reason = e.to_string();
        match e {
            RegistryError::Invalid { problems } => invalid(problems),
            RegistryError::Stale {
                expected, current, ..
            } => AppError::JointStale {
                detail: format!(
                    "joint '{}' is at version {}, not {expected}",
                    current.id, current.version
                ),
                current: Box::new(JointView::from(current.as_ref())),
            },
            RegistryError::Transition { field, .. } => AppError::Conflict { field, reason },
        }
    }
}

impl From<RegistryStoreError> for AppError {
    fn from(e: RegistryStoreError) -> Self {
        match e {
            RegistryStoreError::Registry(r) => r.into(),
            RegistryStoreError::Store(s) => s.into(),
        }
    }
}

impl App {
    /// Every problem of a definition body: the registry's reading, then the
    /// request as a spec request computed against the current catalogue,
    /// then the tool presentation. `Ok` only when there is none.
    pub(super) fn definition(&self, body: &Value) -> Result<JointDefinition, AppError> {
        let read = JointDefinition::from_json(body);
        let mut problems: Vec<FieldProblem> = match &read {
            Err(RegistryError::Invalid { problems }) => match invalid(problems.clone()) {
                AppError::Fields(p) => p,
                _ => Vec::new(),
            },
            Err(other) => return Err(other.clone().into()),
            Ok(_) => Vec::new(),
        };
        if let Some(request @ Value::Object(_)) = body.get("request") {
            let tags: Vec<String> = match &read {
                Ok(def) => def.tags.clone(),
                Err(_) => readable_tags(body),
            };
            problems.extend(self.request_problems(request, &tags));
        }
        if let Some(setpoints) = body.get("setpoints").and_then(Value::as_object) {
            problems.extend(setpoint_problems(setpoints));
        }
        match read {
            Ok(def) if problems.is_empty() => Ok(def),
            _ => Err(AppError::Fields(problems)),
        }
    }

    /// The problems of a joint's spec request: unreadable fields, a
    /// `joint_tags` of its own (the joint's `tags` are its tags), then what
    /// keeps it from computing with the joint's tags at the current
    /// catalogue revision (a problem of the tags is named under `tags`).
    fn request_problems(&self, request: &Value, tags: &[String]) -> Vec<FieldProblem> {
        let mut req: SpecRequest = match serde_path_to_error::deserialize(request) {
            Ok(r) => r,
            Err(e) => {
                let field = request_field(&e.path().to_string(), &e.inner().to_string());
                return vec![FieldProblem::invalid(field, e.into_inner().to_string())];
            }
        };
        if req.joint_tags.is_some() {
            return vec![FieldProblem::invalid(
                "request.joint_tags",
                "a joint's request takes no joint_tags: the joint's own tags choose the \
                 friction entries limited to a tag; give them in tags",
            )];
        }
        req.joint_tags = with_tags(tags);
        match compute_one(&req, &self.current()) {
            Ok(_) => Vec::new(),
            Err(e) => {
                let found: Vec<FieldProblem> = e
                    .problems()
                    .iter()
                    .map(|p| FieldProblem {
                        class: super::ProblemClass::Invalid,
                        field: if p.field.is_empty() {
                            "request".into()
                        } else if let Some(rest) = p.field.strip_prefix("joint_tags") {
                            format!("tags{rest}")
                        } else {
                            format!("request.{}", p.field)
                        },
                        reason: p.reason.clone(),
                        suggestions: p.suggestions.clone(),
                    })
                    .collect();
                if found.is_empty() {
                    vec![FieldProblem::invalid("request", e.to_string())]
                } else {
                    found
                }
            }
        }
    }

    /// Defines a joint (version 1). A taken id is a conflict naming `id`.
    pub async fn create_joint(&self, actor: &str, body: &Value) -> Result<Joint, AppError> {
        let def = self.definition(body)?;
        let written = self.store().create_joint(&def, actor, CREATED).await;
        self.fetch_cache().registry_written();
        Ok(written?)
    }

    /// One joint (unknown: 404 naming `id`, with near ids).
    pub async fn joint(&self, id: &str) -> Result<Joint, AppError> {
        let id = JointId::parse("id", id).map_err(|p| invalid(vec![p]))?;
        match self.store().joint(&id).await {
            Ok(joint) => Ok(joint),
            Err(StoreError::NotFound { field, reason }) => {
                let near = self.near_ids(&id).await;
                Err(FieldProblem::unknown(field, reason)
                    .with_suggestions(near)
                    .into())
            }
            Err(e) => Err(e.into()),
        }
    }

    /// Registered ids close to `id`, looked for among the (at most
    /// [`NEAR_IDS_SCANNED`]) ids from its first half on in id order, where a
    /// mistyped tail lies. A failed look-up gives none: it only helps.
    async fn near_ids(&self, id: &JointId) -> Vec<String> {
        let half: String = id.as_str().chars().take(id.as_str().len() / 2).collect();
        let after = (!half.is_empty())
            .then(|| JointId::parse("after", &half).ok())
            .flatten();
        let page = Page {
            after,
            limit: NEAR_IDS_SCANNED,
        };
        match self.store().joints(&JointFilter::default(), &page).await {
            Ok(joints) => {
                let known: Vec<String> = joints.iter().map(|j| j.id.to_string()).collect();
                suggest(id.as_str(), &known)
            }
            Err(_) => Vec::new(),
        }
    }

    /// Replaces the definition of joint `id` if it is still at `expected`
    /// (otherwise 412 with the current joint); the body's `id` must be `id`.
    pub async fn update_joint(
        &self,
        actor: &str,
        id: &str,
        expected: i64,
        body: &Value,
    ) -> Result<Joint, AppError> {
        let path_id = JointId::parse("id", id).map_err(|p| invalid(vec![p]))?;
        if let Some(given) = body.get("id").and_then(Value::as_str) {
            if given != path_id.as_str() {
                return Err(FieldProblem::invalid(
                    "id",
                    format!("'{given}' differs from the id in the path ('{path_id}'); ids do not change"),
                )
                .into());
            }
        }
        let def = self.definition(body)?;
        let written = self
            .store()
            .update_joint(&def, expected, actor, CHANGED)
            .await;
        self.fetch_cache().registry_written();
        Ok(written?)
    }

    /// A page of joints in id order, with the cursor of the next page.
    pub async fn joints(&self, q: &JointQuery) -> Result<JointPage, AppError> {
        let mut problems = Vec::new();
        let page = match Page::new(q.after.as_deref(), q.limit.unwrap_or(DEFAULT_LIMIT)) {
            Ok(page) => Some(page),
            Err(RegistryError::Invalid { problems: p }) => {
                problems.extend(p);
                None
            }
            Err(other) => return Err(other.into()),
        };
        if let Some(tag) = &q.tag {
            let n = tag.chars().count();
            if tag.trim().is_empty() || n > TAG_MAX {
                problems.push(ChangeProblem::new(
                    "tag",
                    format!("a tag has 1 to {TAG_MAX} characters and is not blank ({n} given)"),
                ));
            }
        }
        let status = match q
            .status
            .as_deref()
            .map(|g| ReleaseStatus::named("status", g))
        {
            Some(Err(p)) => {
                problems.push(p);
                None
            }
            Some(Ok(status)) => Some(status),
            None => None,
        };
        let Some(page) = page.filter(|_| problems.is_empty()) else {
            return Err(invalid(problems));
        };
        let filter = JointFilter {
            tag: q.tag.clone(),
            status,
            review_due: q.review_due.then_some(true),
        };
        // One more than the page: whether a next page exists.
        let probe = Page {
            after: page.after.clone(),
            limit: page.limit + 1,
        };
        let mut joints = self.store().joints(&filter, &probe).await?;
        let next = if joints.len() > page.limit as usize {
            joints.truncate(page.limit as usize);
            joints.last().map(|j| j.id.to_string())
        } else {
            None
        };
        Ok(JointPage { joints, next })
    }
}

/// The tool presentation as the setpoint answer reads it: a torque unit it
/// knows and resolutions within the rounding's bounds.
fn setpoint_problems(setpoints: &serde_json::Map<String, Value>) -> Vec<FieldProblem> {
    let mut problems = Vec::new();
    // a blank unit: already named by the registry's reading
    let unit = setpoints.get("torque_unit").and_then(Value::as_str);
    if let Some(unit) = unit.filter(|u| !u.trim().is_empty()) {
        if let Err(mut p) = torque_unit(Some(unit)) {
            p.field = "setpoints.torque_unit".into();
            p.class = super::ProblemClass::Invalid;
            problems.push(p);
        }
    }
    for name in ["resolution", "angle_resolution"] {
        let Some(x) = setpoints.get(name).and_then(Value::as_f64) else {
            continue;
        };
        // not above zero: already named by the registry's reading
        if x > 0.0 {
            if let Err(e) = check_resolution(x) {
                problems.push(FieldProblem::invalid(
                    format!("setpoints.{name}"),
                    e.to_string(),
                ));
            }
        }
    }
    problems
}

#[cfg(test)]
#[path = "joints_tests.rs"]
mod tests;
