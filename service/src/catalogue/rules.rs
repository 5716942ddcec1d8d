//! The checks `apply` runs on each item and on the catalogue as a whole:
//! friction ranges, known and active finish and lubricant, slugs, a named
//! source, one active entry per key, nothing active on a retired item.

use serde::Serialize;
use serde_json::Value;

use super::change::EntryInput;
use super::error::{suggest, CatalogueError, ChangeProblem, CurrentState};
use super::item::CatalogueItem;
use super::types::{
    is_slug, joint_tag_problem, Finish, FrictionEntry, Lubricant, RangeInput, Status,
    TabulatedFriction,
};
use super::Snapshot;

pub(super) fn json<T: Serialize>(v: &T) -> Value {
    serde_json::to_value(v).unwrap_or(Value::Null)
}

pub(super) fn range(
    at: &str,
    name: &str,
    raw: &RangeInput,
    problems: &mut Vec<ChangeProblem>,
) -> TabulatedFriction {
    match TabulatedFriction::new(raw.min, raw.max) {
        Ok(r) => r,
        Err(ps) => {
            for (sub, reason) in ps {
                problems.push(ChangeProblem::new(format!("{at}{name}.{sub}"), reason));
            }
            TabulatedFriction {
                min: raw.min,
                max: raw.max,
            }
        }
    }
}

pub(super) fn stale(
    at: &str,
    current: CurrentState,
    id: String,
    kind: &'static str,
    expected: i64,
    rev: i64,
) -> CatalogueError {
    CatalogueError::Stale {
        field: format!("{at}If-Match"),
        kind,
        id,
        expected,
        current_revision: rev,
        current,
    }
}

/// Checks an entry input against the catalogue being built and turns it
/// into an entry (problems are collected, never short-circuited).
pub(super) fn entry_from(
    at: &str,
    input: &EntryInput,
    next: &Snapshot,
    id: i64,
    status: Status,
    revision: i64,
    problems: &mut Vec<ChangeProblem>,
) -> FrictionEntry {
    for (field, value, known) in [
        (
            "finish",
            &input.finish,
            next.finishes
                .iter()
                .map(|f| (f.id.as_str(), f.status))
                .collect::<Vec<_>>(),
        ),
        (
            "lubricant",
            &input.lubricant,
            next.lubricants
                .iter()
                .map(|l| (l.id.as_str(), l.status))
                .collect::<Vec<_>>(),
        ),
    ] {
        match known.iter().find(|(k, _)| *k == value.as_str()) {
            Some((_, Status::Active)) => {}
            Some((_, Status::Retired)) => problems.push(ChangeProblem::new(
                format!("{at}{field}"),
                format!("{field} '{value}' is retired"),
            )),
            None => problems.push(
                ChangeProblem::new(format!("{at}{field}"), format!("unknown {field} '{value}'"))
                    .with_suggestions(suggest(
                        value,
                        known.iter().filter(|(_, s)| s.is_active()).map(|(k, _)| *k),
                    )),
            ),
        }
    }
    if let Some(s) = &input.bearing_surface {
        if !is_slug(s) {
            problems.push(ChangeProblem::new(
                format!("{at}bearing_surface"),
                "must be a slug: lower-case letters, digits and hyphens, at most 64",
            ));
        }
    }
    if let Some(problem) = input.joint_tag.as_deref().and_then(joint_tag_problem) {
        problems.push(ChangeProblem::new(format!("{at}joint_tag"), problem));
    }
    if input.source.trim().is_empty() {
        problems.push(ChangeProblem::new(
            format!("{at}source"),
            "the source is required (a published table, a handbook, or a test series id)",
        ));
    }
    let thread_friction = range(at, "thread_friction", &input.thread_friction, problems);
    let bearing_friction = range(at, "bearing_friction", &input.bearing_friction, problems);
    let total_friction = input
        .total_friction
        .as_ref()
        .map(|t| range(at, "total_friction", t, problems));
    FrictionEntry {
        id,
        finish: input.finish.clone(),
        lubricant: input.lubricant.clone(),
        bearing_surface: input.bearing_surface.clone(),
        joint_tag: input.joint_tag.clone(),
        thread_friction,
        bearing_friction,
        total_friction,
        source: input.source.trim().to_string(),
        notes: input.notes.clone(),
        status: input.status.unwrap_or(status),
        revision,
    }
}

pub(super) fn check_item_names(at: &str, id: &str, name: &str, problems: &mut Vec<ChangeProblem>) {
    if !is_slug(id) {
        problems.push(ChangeProblem::new(
            format!("{at}id"),
            "must be a slug: lower-case letters, digits and hyphens, at most 64",
        ));
    }
    if name.trim().is_empty() {
        problems.push(ChangeProblem::new(
            format!("{at}name"),
            "a name is required",
        ));
    }
}

/// Rules over the catalogue as a whole after the batch: one active entry
/// per key, and no active entry on a retired finish or lubricant.
pub(super) fn check_whole(
    next: &Snapshot,
    touched: &[(String, i64)],
    problems: &mut Vec<ChangeProblem>,
) {
    for (at, id) in touched {
        let Some(e) = next.entries.iter().find(|e| e.id == *id) else {
            continue;
        };
        if !e.status.is_active() {
            continue;
        }
        if let Some(other) = next
            .active_entries()
            .find(|o| o.id != e.id && o.key() == e.key())
        {
            problems.push(ChangeProblem::new(
                format!("{at}lubricant"),
                format!(
                    "an active friction entry (id {}) already exists for finish '{}', lubricant '{}', bearing surface '{}', {}; update or retire it instead",
                    other.id, e.finish, e.lubricant, e.bearing_surface.as_deref().unwrap_or("any"),
                    e.joint_tag.as_deref().map_or("for every joint".to_string(), |t| format!("joint tag '{t}'"))
                ),
            ));
        }
    }
    retired_in_use::<Finish>(next, |e| &e.finish, problems);
    retired_in_use::<Lubricant>(next, |e| &e.lubricant, problems);
}

/// A retired item of kind `I` that an active entry still uses (`uses`:
/// the entry's field naming that kind) is a problem under the kind's name.
fn retired_in_use<I: CatalogueItem>(
    next: &Snapshot,
    uses: impl Fn(&FrictionEntry) -> &str,
    problems: &mut Vec<ChangeProblem>,
) {
    for item in I::all(next).iter().filter(|i| !i.status().is_active()) {
        if let Some(e) = next.active_entries().find(|e| uses(e) == item.id()) {
            problems.push(ChangeProblem::new(
                I::NAME,
                format!(
                    "{} '{}' cannot be retired while friction entry {} uses it; retire the entry first",
                    I::NAME,
                    item.id(),
                    e.id
                ),
            ));
        }
    }
}
