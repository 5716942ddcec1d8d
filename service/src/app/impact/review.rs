//! Confirming a joint's review without a new release: an editor states
//! why the active release still holds after the catalogue change; the mark
//! is cleared and the confirmation recorded in the joint's history.

use chrono::Utc;
use serde_json::Value;

use crate::app::joints::JointView;
use crate::app::{App, AppError, FieldProblem};

/// Longest reason kept, in characters.
pub const REASON_MAX: usize = 2000;

/// The `reason` of a confirmation body `{"reason": …}` (no other field).
fn confirm_reason(body: &Value) -> Result<String, AppError> {
    let Some(obj) = body.as_object() else {
        return Err(
            FieldProblem::malformed("", "the body must be a JSON object {\"reason\": …}").into(),
        );
    };
    let mut problems: Vec<FieldProblem> = obj
        .keys()
        .filter(|k| k.as_str() != "reason")
        .map(|k| FieldProblem::invalid(k.clone(), "unknown field; the body holds only reason"))
        .collect();
    let reason = obj
        .get("reason")
        .and_then(Value::as_str)
        .map(str::trim)
        .unwrap_or("");
    if reason.is_empty() {
        problems.push(FieldProblem::invalid(
            "reason",
            "missing: say why the active release still holds after the catalogue change",
        ));
    } else if reason.chars().count() > REASON_MAX {
        problems.push(FieldProblem::invalid(
            "reason",
            format!("longer than {REASON_MAX} characters"),
        ));
    }
    if !problems.is_empty() {
        return Err(AppError::Fields(problems));
    }
    Ok(reason.to_owned())
}

impl App {
    /// Confirms joint `id`'s due review by `actor` (see the module); a
    /// joint without a due review is 409 naming `review_due`.
    pub async fn confirm_review(
        &self,
        actor: &str,
        id: &str,
        body: &Value,
    ) -> Result<JointView, AppError> {
        let reason = confirm_reason(body)?;
        let joint = self.joint(id).await?;
        let written = self
            .store()
            .confirm_review(&joint.id, actor, &reason, Utc::now())
            .await;
        self.fetch_cache().registry_written();
        let (joint, cleared) = written?;
        if cleared.is_none() {
            return Err(AppError::Conflict {
                field: "review_due".into(),
                reason: format!("joint '{}' has no review due; nothing to confirm", joint.id),
            });
        }
        Ok(JointView::from(&joint))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn a_confirmation_needs_a_reason_and_nothing_else() {
        assert_eq!(confirm_reason(&json!({"reason": " ok "})).unwrap(), "ok");
        let fields = |v: Value| -> Vec<String> {
            confirm_reason(&v)
                .unwrap_err()
                .problems()
                .iter()
                .map(|p| p.field.clone())
                .collect()
        };
        assert_eq!(fields(json!({})), ["reason"]);
        assert_eq!(fields(json!({"reason": "x", "why": 1})), ["why"]);
        assert_eq!(fields(json!({"reason": "x".repeat(2001)})), ["reason"]);
        assert!(confirm_reason(&json!([])).is_err());
    }
}
