//! The refusal of an unknown id, with the nearest ids as suggestions.

use super::super::EngineError;

pub(super) fn unknown<'a>(
    field: &str,
    kind: &'static str,
    given: &str,
    ids: impl Iterator<Item = &'a str>,
) -> EngineError {
    let lower = given.trim().to_lowercase();
    let mut scored: Vec<(f64, &str)> = ids
        .map(|id| (strsim::jaro_winkler(&lower, id), id))
        .collect();
    scored.sort_by(|a, b| b.0.total_cmp(&a.0));
    EngineError::Unknown {
        field: field.into(),
        kind,
        given: given.chars().take(64).collect(),
        suggestions: scored
            .iter()
            .take(3)
            .map(|(_, id)| id.to_string())
            .collect(),
    }
}
