//! A joint's spec request: the field a refusal names under `request.`, and
//! the stored request read with the joint's tags as its `joint_tags` (so
//! the friction entries limited to one of them apply).

use serde_json::Value;

use crate::app::spec::SpecRequest;
use crate::catalogue::types::joint_tag_problem;

/// The field a serde refusal of the spec request names, under `request.`:
/// the path serde was at, or the key an unknown-field message quotes.
pub(super) fn request_field(path: &str, message: &str) -> String {
    let quoted = || {
        let rest = message.split_once('`')?.1;
        Some(rest.split_once('`')?.0.to_string())
    };
    let inner = if path.is_empty() || path == "." {
        message
            .starts_with("unknown field")
            .then(quoted)
            .flatten()
            .unwrap_or_default()
    } else {
        path.to_string()
    };
    if inner.is_empty() {
        "request".into()
    } else {
        format!("request.{inner}")
    }
}

/// A joint's tags as a spec request's `joint_tags` (none: `None`).
pub(crate) fn with_tags(tags: &[String]) -> Option<Vec<String>> {
    (!tags.is_empty()).then(|| tags.to_vec())
}

/// A joint's stored request as a spec request computed with the joint's
/// tags: the friction entries limited to one of them apply.
pub(crate) fn joint_spec_request(
    request: &Value,
    tags: &[String],
) -> Result<SpecRequest, serde_json::Error> {
    let mut req: SpecRequest = serde_json::from_value(request.clone())?;
    req.joint_tags = with_tags(tags);
    Ok(req)
}

/// The tags of a body the registry refused that it would take, each once
/// (their problems are reported under `tags[i]`, not again here).
pub(super) fn readable_tags(body: &Value) -> Vec<String> {
    let mut good: Vec<String> = Vec::new();
    for tag in body
        .get("tags")
        .and_then(Value::as_array)
        .into_iter()
        .flatten()
        .filter_map(Value::as_str)
    {
        if joint_tag_problem(tag).is_none() && !good.iter().any(|t| t == tag) {
            good.push(tag.to_string());
        }
    }
    good
}
