//! Why the catalogue refused a look-up or a change. Every variant names the
//! request field it concerns so the HTTP layer can render a problem
//! response without guessing.

use super::types::FrictionEntry;

/// One problem with a submitted change: the field (a path such as
/// `thread_friction.min` or `entries[3].finish`) and why.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ChangeProblem {
    pub field: String,
    pub reason: String,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub suggestions: Vec<String>,
}

impl ChangeProblem {
    pub fn new(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self {
            field: field.into(),
            reason: reason.into(),
            suggestions: Vec::new(),
        }
    }

    pub fn with_suggestions(mut self, suggestions: Vec<String>) -> Self {
        self.suggestions = suggestions;
        self
    }
}

/// The current state of something a client tried to change from a stale
/// copy (returned with 412).
#[derive(Debug, Clone, PartialEq)]
pub enum CurrentState {
    Entry(Box<FrictionEntry>),
    Finish(Box<super::Finish>),
    Lubricant(Box<super::Lubricant>),
}

#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum CatalogueError {
    /// A finish or lubricant name the catalogue does not know (404), with
    /// the nearest known ids.
    #[error("{field}: unknown {kind} '{given}'")]
    Unknown {
        field: String,
        kind: &'static str,
        given: String,
        suggestions: Vec<String>,
    },
    /// Finish and lubricant are known, but no active friction entry joins
    /// them (404). `suggestions` lists the lubricants that do have an entry
    /// for this finish.
    #[error(
        "{field}: no active friction entry for finish '{finish}' with lubricant '{lubricant}'"
    )]
    NoFrictionEntry {
        field: String,
        finish: String,
        lubricant: String,
        suggestions: Vec<String>,
    },
    /// Active friction entries limited to different tags of one joint all
    /// match (422): the service does not choose between them. `entries`
    /// holds each entry's id and tag.
    #[error(
        "{field}: friction entries {} for finish '{finish}' with lubricant '{lubricant}' are \
         each limited to a different tag of this joint, so none is more specific; retire one \
         of them or take one of the tags off the joint",
        entries.iter().map(|(id, tag)| format!("{id} (joint tag '{tag}')")).collect::<Vec<_>>().join(" and ")
    )]
    AmbiguousFriction {
        field: String,
        finish: String,
        lubricant: String,
        entries: Vec<(i64, String)>,
    },
    /// A catalogue item addressed by id does not exist (404).
    #[error("{field}: no {kind} with id '{id}'")]
    NotFound {
        field: String,
        kind: &'static str,
        id: String,
    },
    /// A revision that does not exist (yet) (404).
    #[error("{field}: catalogue revision {revision} does not exist (current is {current})")]
    UnknownRevision {
        field: String,
        revision: i64,
        current: i64,
    },
    /// The change was made against an older state (412). Carries the
    /// current state so the client can merge.
    #[error(
        "{field}: stale: {kind} '{id}' was changed in revision {current_revision}, not {expected}"
    )]
    Stale {
        field: String,
        kind: &'static str,
        id: String,
        expected: i64,
        current_revision: i64,
        current: CurrentState,
    },
    /// Well-formed but invalid change (422): every problem listed, nothing
    /// written.
    #[error("{} problem(s) in the submitted change", problems.len())]
    Invalid { problems: Vec<ChangeProblem> },
}

impl CatalogueError {
    pub fn invalid_one(field: impl Into<String>, reason: impl Into<String>) -> Self {
        Self::Invalid {
            problems: vec![ChangeProblem::new(field, reason)],
        }
    }

    /// The (first) request field this error concerns.
    pub fn field(&self) -> &str {
        match self {
            Self::Unknown { field, .. }
            | Self::NoFrictionEntry { field, .. }
            | Self::AmbiguousFriction { field, .. }
            | Self::NotFound { field, .. }
            | Self::UnknownRevision { field, .. }
            | Self::Stale { field, .. } => field,
            Self::Invalid { problems } => problems.first().map(|p| p.field.as_str()).unwrap_or(""),
        }
    }

    /// The suggested alternatives, where the error has them.
    pub fn suggestions(&self) -> &[String] {
        match self {
            Self::Unknown { suggestions, .. } | Self::NoFrictionEntry { suggestions, .. } => {
                suggestions
            }
            _ => &[],
        }
    }

    /// Every problem as a list (one item for the single-field variants).
    pub fn problems(&self) -> Vec<ChangeProblem> {
        match self {
            Self::Invalid { problems } => problems.clone(),
            other => vec![ChangeProblem::new(other.field(), other.to_string())
                .with_suggestions(other.suggestions().to_vec())],
        }
    }
}

/// Up to three known ids nearest to `given`: ids containing it or contained
/// in it first, then by Jaro-Winkler similarity (strsim) above 0.7.
pub fn suggest<'a>(given: &str, known: impl Iterator<Item = &'a str>) -> Vec<String> {
    let g = given.trim().to_ascii_lowercase().replace([' ', '_'], "-");
    let mut scored: Vec<(f64, &str)> = known
        .map(|k| {
            let score = if !g.is_empty() && (k.contains(&g) || g.contains(k)) {
                1.0 + strsim::jaro_winkler(&g, k)
            } else {
                strsim::jaro_winkler(&g, k)
            };
            (score, k)
        })
        .filter(|(s, _)| *s > 0.7)
        .collect();
    scored.sort_by(|a, b| b.0.total_cmp(&a.0).then(a.1.cmp(b.1)));
    scored
        .into_iter()
        .take(3)
        .map(|(_, k)| k.to_string())
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn suggestions_prefer_containment_then_similarity() {
        let known = [
            "zinc-electroplated",
            "zinc-nickel",
            "plain",
            "hot-dip-galvanized",
        ];
        let s = suggest("zinc", known.iter().copied());
        assert_eq!(s.len(), 2);
        assert!(s.contains(&"zinc-nickel".to_string()));
        let s = suggest("zinc-electroplatd", known.iter().copied());
        assert_eq!(s.first().map(String::as_str), Some("zinc-electroplated"));
        assert!(suggest("qqqq", known.iter().copied()).is_empty());
    }
}
