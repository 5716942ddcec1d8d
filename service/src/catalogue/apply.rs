//! The pure rule that applies a batch of changes to a snapshot: everything
//! is checked first (every problem listed), then the batch becomes exactly
//! one new revision with one history record per changed item. The store
//! persists the result; it adds no rules of its own.

use super::change::{Action, Applied, Change, ChangeSet, EntityKind, HistoryRecord};
use super::error::{CatalogueError, ChangeProblem, CurrentState};
use super::rules::{check_item_names, check_whole, entry_from, json, stale};
use super::types::{Finish, FrictionEntry, Lubricant, Status};
use super::Snapshot;

/// Applies a batch to `current`, producing revision `current.revision + 1`.
/// Order of precedence: a stale item (412) is reported first; then, for a
/// single change to an id that does not exist, not-found (404); otherwise
/// every problem found is returned together (422).
pub fn apply(current: &Snapshot, set: &ChangeSet) -> Result<Applied, CatalogueError> {
    let revision = current.revision + 1;
    let mut next = current.clone();
    next.revision = revision;
    let mut problems = Vec::new();
    let mut records = Vec::new();
    let mut touched_entries: Vec<(String, i64)> = Vec::new();
    let single = set.items.len() == 1;
    if set.reason.trim().is_empty() {
        problems.push(ChangeProblem::new(
            "reason",
            "a reason is required for every catalogue change",
        ));
    }
    if set.actor.trim().is_empty() {
        problems.push(ChangeProblem::new(
            "actor",
            "the author of the change is unknown",
        ));
    }
    if set.items.is_empty() {
        problems.push(ChangeProblem::new("changes", "nothing to change"));
    }
    let mut next_id = next.entries.iter().map(|e| e.id).max().unwrap_or(0) + 1;
    for item in &set.items {
        let at = item.at.as_str();
        match &item.change {
            Change::CreateEntry(input) => {
                let e = entry_from(
                    at,
                    input,
                    &next,
                    next_id,
                    Status::Active,
                    revision,
                    &mut problems,
                );
                next_id += 1;
                touched_entries.push((at.to_string(), e.id));
                records.push(HistoryRecord {
                    entity: EntityKind::FrictionEntry,
                    entity_id: e.id.to_string(),
                    action: Action::Create,
                    before: None,
                    after: json(&e),
                });
                next.entries.push(e);
            }
            Change::UpdateEntry {
                id,
                expected_revision,
                ..
            }
            | Change::RetireEntry {
                id,
                expected_revision,
            } => {
                let Some(pos) = next.entries.iter().position(|e| e.id == *id) else {
                    if single {
                        return Err(CatalogueError::NotFound {
                            field: "id".into(),
                            kind: "friction entry",
                            id: id.to_string(),
                        });
                    }
                    problems.push(ChangeProblem::new(
                        format!("{at}id"),
                        format!("no friction entry with id {id}"),
                    ));
                    continue;
                };
                let before = next.entries[pos].clone();
                if let Some(x) = expected_revision {
                    if *x != before.revision {
                        return Err(stale(
                            at,
                            CurrentState::Entry(Box::new(before.clone())),
                            id.to_string(),
                            "friction entry",
                            *x,
                            before.revision,
                        ));
                    }
                }
                let after = match &item.change {
                    Change::UpdateEntry { entry, .. } => entry_from(
                        at,
                        entry,
                        &next,
                        *id,
                        before.status,
                        revision,
                        &mut problems,
                    ),
                    _ => {
                        if !before.status.is_active() {
                            problems.push(ChangeProblem::new(
                                format!("{at}id"),
                                format!("friction entry {id} is already retired"),
                            ));
                        }
                        FrictionEntry {
                            status: Status::Retired,
                            revision,
                            ..before.clone()
                        }
                    }
                };
                if (FrictionEntry {
                    revision: before.revision,
                    ..after.clone()
                }) == before
                {
                    problems.push(ChangeProblem::new(format!("{at}id"), format!("friction entry {id}: the submitted entry is identical to the current one; nothing to change")));
                }
                let action = if after.status == Status::Retired && before.status.is_active() {
                    Action::Retire
                } else {
                    Action::Update
                };
                touched_entries.push((at.to_string(), *id));
                records.push(HistoryRecord {
                    entity: EntityKind::FrictionEntry,
                    entity_id: id.to_string(),
                    action,
                    before: Some(json(&before)),
                    after: json(&after),
                });
                next.entries[pos] = after;
            }
            Change::CreateFinish(f) | Change::UpdateFinish { finish: f, .. } => {
                check_item_names(at, &f.id, &f.name, &mut problems);
                let existing = next.finishes.iter().position(|x| x.id == f.id);
                let expected = match &item.change {
                    Change::UpdateFinish {
                        expected_revision, ..
                    } => Some(*expected_revision),
                    _ => None,
                };
                let mut after = Finish {
                    id: f.id.clone(),
                    name: f.name.trim().to_string(),
                    electroplated: f.electroplated,
                    stainless: f.stainless,
                    notes: f.notes.clone(),
                    status: f.status.unwrap_or(Status::Active),
                    revision,
                };
                match (existing, expected) {
                    (Some(_), None) => problems.push(ChangeProblem::new(
                        format!("{at}id"),
                        format!("finish '{}' already exists", f.id),
                    )),
                    (None, None) => {
                        records.push(HistoryRecord {
                            entity: EntityKind::Finish,
                            entity_id: f.id.clone(),
                            action: Action::Create,
                            before: None,
                            after: json(&after),
                        });
                        next.finishes.push(after);
                    }
                    (None, Some(_)) => {
                        if single {
                            return Err(CatalogueError::NotFound {
                                field: "id".into(),
                                kind: "finish",
                                id: f.id.clone(),
                            });
                        }
                        problems.push(ChangeProblem::new(
                            format!("{at}id"),
                            format!("no finish '{}'", f.id),
                        ));
                    }
                    (Some(pos), Some(exp)) => {
                        let before = next.finishes[pos].clone();
                        if let Some(x) = exp {
                            if x != before.revision {
                                return Err(stale(
                                    at,
                                    CurrentState::Finish(Box::new(before.clone())),
                                    f.id.clone(),
                                    "finish",
                                    x,
                                    before.revision,
                                ));
                            }
                        }
                        after.status = f.status.unwrap_or(before.status);
                        if (Finish {
                            revision: before.revision,
                            ..after.clone()
                        }) == before
                        {
                            problems.push(ChangeProblem::new(
                                format!("{at}id"),
                                format!("finish '{}': nothing to change", f.id),
                            ));
                        }
                        let action = if after.status == Status::Retired && before.status.is_active()
                        {
                            Action::Retire
                        } else {
                            Action::Update
                        };
                        records.push(HistoryRecord {
                            entity: EntityKind::Finish,
                            entity_id: f.id.clone(),
                            action,
                            before: Some(json(&before)),
                            after: json(&after),
                        });
                        next.finishes[pos] = after;
                    }
                }
            }
            Change::CreateLubricant(l) | Change::UpdateLubricant { lubricant: l, .. } => {
                check_item_names(at, &l.id, &l.name, &mut problems);
                let existing = next.lubricants.iter().position(|x| x.id == l.id);
                let expected = match &item.change {
                    Change::UpdateLubricant {
                        expected_revision, ..
                    } => Some(*expected_revision),
                    _ => None,
                };
                let mut after = Lubricant {
                    id: l.id.clone(),
                    name: l.name.trim().to_string(),
                    dry: l.dry,
                    notes: l.notes.clone(),
                    status: l.status.unwrap_or(Status::Active),
                    revision,
                };
                match (existing, expected) {
                    (Some(_), None) => problems.push(ChangeProblem::new(
                        format!("{at}id"),
                        format!("lubricant '{}' already exists", l.id),
                    )),
                    (None, None) => {
                        records.push(HistoryRecord {
                            entity: EntityKind::Lubricant,
                            entity_id: l.id.clone(),
                            action: Action::Create,
                            before: None,
                            after: json(&after),
                        });
                        next.lubricants.push(after);
                    }
                    (None, Some(_)) => {
                        if single {
                            return Err(CatalogueError::NotFound {
                                field: "id".into(),
                                kind: "lubricant",
                                id: l.id.clone(),
                            });
                        }
                        problems.push(ChangeProblem::new(
                            format!("{at}id"),
                            format!("no lubricant '{}'", l.id),
                        ));
                    }
                    (Some(pos), Some(exp)) => {
                        let before = next.lubricants[pos].clone();
                        if let Some(x) = exp {
                            if x != before.revision {
                                return Err(stale(
                                    at,
                                    CurrentState::Lubricant(Box::new(before.clone())),
                                    l.id.clone(),
                                    "lubricant",
                                    x,
                                    before.revision,
                                ));
                            }
                        }
                        after.status = l.status.unwrap_or(before.status);
                        if (Lubricant {
                            revision: before.revision,
                            ..after.clone()
                        }) == before
                        {
                            problems.push(ChangeProblem::new(
                                format!("{at}id"),
                                format!("lubricant '{}': nothing to change", l.id),
                            ));
                        }
                        let action = if after.status == Status::Retired && before.status.is_active()
                        {
                            Action::Retire
                        } else {
                            Action::Update
                        };
                        records.push(HistoryRecord {
                            entity: EntityKind::Lubricant,
                            entity_id: l.id.clone(),
                            action,
                            before: Some(json(&before)),
                            after: json(&after),
                        });
                        next.lubricants[pos] = after;
                    }
                }
            }
        }
    }
    check_whole(&next, &touched_entries, &mut problems);
    if !problems.is_empty() {
        return Err(CatalogueError::Invalid { problems });
    }
    next.normalise();
    Ok(Applied {
        snapshot: next,
        records,
    })
}

#[cfg(test)]
#[path = "change_tests.rs"]
mod tests;
