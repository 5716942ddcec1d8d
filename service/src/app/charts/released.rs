//! The tightening window of a joint's release as a picture.
//!
//! A release stores its answers, not the request they came from; the joint's
//! definition may have been edited since. The chart is therefore redrawn
//! from the joint's request — the current definition first, then each
//! earlier one of its history, newest first — at the release's catalogue
//! revision, and drawn only from the definition whose spec hash is the
//! stored answer's: the chart always shows the numbers the line fetches.
//! When none matches (a definition edited beyond its recorded history) the
//! chart is refused (409) rather than drawn from other numbers.

use serde_json::Value;

use super::{served, window, SpecChart};
use crate::app::joints::joint_spec_request;
use crate::app::releases::view::{FrozenAnswer, ReleasedAnswer};
use crate::app::spec::view::spec_response;
use crate::app::spec::{compute_one, snapshot::pinned};
use crate::app::{App, AppError};

/// A release's window chart and the ETag made of the release's own.
#[derive(Debug, Clone, PartialEq)]
pub struct ReleaseChart {
    pub svg: String,
    pub etag: String,
}

/// The `spec_hash` of a stored spec answer.
fn stored_hash(answer: &ReleasedAnswer) -> Result<String, AppError> {
    let r = &answer.release;
    let spec: Value = serde_json::from_str(&r.spec).map_err(|e| {
        AppError::Internal(format!(
            "release {} of '{}': stored spec is not JSON: {e}",
            r.number, r.joint_id
        ))
    })?;
    spec.get("spec_hash")
        .and_then(Value::as_str)
        .map(str::to_string)
        .ok_or_else(|| {
            AppError::Internal(format!(
                "release {} of '{}': stored spec has no spec_hash",
                r.number, r.joint_id
            ))
        })
}

impl App {
    /// The window chart of joint `id`'s active release (409 naming
    /// `release` when there is none) or of release `number`.
    pub async fn release_window_chart(
        &self,
        id: &str,
        number: Option<i64>,
    ) -> Result<ReleaseChart, AppError> {
        let answer = self.released(id, number).await?;
        let want = stored_hash(&answer)?;
        let r = &answer.release;
        let snapshot = pinned(self, Some(r.catalogue_revision)).await?;
        let joint = self.joint(id).await?;
        let history = self.store().joint_history(&joint.id).await?;
        // The current definition, then the recorded ones newest first.
        let mut requests = vec![(joint.request.clone(), joint.tags.clone())];
        for change in history.iter().rev() {
            for json in [&change.after_json, &change.before_json]
                .into_iter()
                .flatten()
            {
                if let Ok(def) = serde_json::from_str::<Value>(json) {
                    if let Some(req) = def.get("request") {
                        let tags: Vec<String> = def
                            .get("tags")
                            .and_then(Value::as_array)
                            .map(|t| {
                                t.iter()
                                    .filter_map(Value::as_str)
                                    .map(str::to_string)
                                    .collect()
                            })
                            .unwrap_or_default();
                        let both = (req.clone(), tags);
                        if !requests.contains(&both) {
                            requests.push(both);
                        }
                    }
                }
            }
        }
        for (request, tags) in requests {
            let Ok(mut req) = joint_spec_request(&request, &tags) else {
                continue;
            };
            req.catalogue_revision = Some(r.catalogue_revision);
            let Ok((resolved, spec)) = compute_one(&req, &snapshot) else {
                continue;
            };
            if spec_response(&spec, &resolved, false).spec_hash != want {
                continue;
            }
            let chart: SpecChart = served(window::figure(&spec, &resolved), resolved);
            return Ok(ReleaseChart {
                svg: chart.svg,
                etag: answer.etag(FrozenAnswer::Spec).replace("-spec-", "-chart-"),
            });
        }
        Err(AppError::Conflict {
            field: "release".into(),
            reason: format!(
                "release {} of joint '{}' cannot be redrawn: no recorded definition of the \
                 joint gives its stored values at catalogue revision {}; fetch its values \
                 from GET /v1/joints/{}/spec?release={}",
                r.number, r.joint_id, r.catalogue_revision, r.joint_id, r.number
            ),
        })
    }
}
