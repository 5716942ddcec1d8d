//! The pure rule that applies a batch of changes to a snapshot: everything
//! is checked first (every problem listed), then the batch becomes exactly
//! one new revision with one history record per changed item. The store
//! persists the result; it adds no rules of its own. Friction entries have
//! their own steps; finishes and lubricants share one ([`Batch::item`], over
//! [`CatalogueItem`]).

use super::change::{Action, Applied, Change, ChangeSet, EntityKind, EntryInput, HistoryRecord};
use super::error::{CatalogueError, ChangeProblem, CurrentState};
use super::item::CatalogueItem;
use super::rules::{check_item_names, check_whole, entry_from, json, stale};
use super::types::{Finish, FrictionEntry, Lubricant, Status};
use super::Snapshot;

/// Applies a batch to `current`, producing revision `current.revision + 1`.
/// Order of precedence: a stale item (412) is reported first; then, for a
/// single change to an id that does not exist, not-found (404); otherwise
/// every problem found is returned together (422).
pub fn apply(current: &Snapshot, set: &ChangeSet) -> Result<Applied, CatalogueError> {
    let mut batch = Batch::new(current, set);
    for item in &set.items {
        let at = item.at.as_str();
        match &item.change {
            Change::CreateEntry(input) => batch.create_entry(at, input),
            Change::UpdateEntry {
                id,
                expected_revision,
                entry,
            } => batch.change_entry(at, *id, *expected_revision, Some(entry))?,
            Change::RetireEntry {
                id,
                expected_revision,
            } => batch.change_entry(at, *id, *expected_revision, None)?,
            Change::CreateFinish(f) => batch.item::<Finish>(at, f, None)?,
            Change::UpdateFinish {
                expected_revision,
                finish,
            } => batch.item::<Finish>(at, finish, Some(*expected_revision))?,
            Change::CreateLubricant(l) => batch.item::<Lubricant>(at, l, None)?,
            Change::UpdateLubricant {
                expected_revision,
                lubricant,
            } => batch.item::<Lubricant>(at, lubricant, Some(*expected_revision))?,
        }
    }
    batch.finish()
}

/// A batch being applied: the catalogue as it becomes, the problems found
/// so far and the history records of the changes made.
struct Batch {
    next: Snapshot,
    revision: i64,
    problems: Vec<ChangeProblem>,
    records: Vec<HistoryRecord>,
    /// Prefix and id of every entry created or changed (checked as a whole
    /// at the end).
    touched_entries: Vec<(String, i64)>,
    /// A single change answers not-found (404) for an unknown id.
    single: bool,
    next_id: i64,
}

impl Batch {
    /// Checks what concerns the batch as a whole: reason, author, not empty.
    fn new(current: &Snapshot, set: &ChangeSet) -> Self {
        let revision = current.revision + 1;
        let mut next = current.clone();
        next.revision = revision;
        let mut problems = Vec::new();
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
        let next_id = next.entries.iter().map(|e| e.id).max().unwrap_or(0) + 1;
        Self {
            next,
            revision,
            problems,
            records: Vec::new(),
            touched_entries: Vec::new(),
            single: set.items.len() == 1,
            next_id,
        }
    }

    fn record(
        &mut self,
        entity: EntityKind,
        id: String,
        action: Action,
        before: Option<serde_json::Value>,
        after: serde_json::Value,
    ) {
        self.records.push(HistoryRecord {
            entity,
            entity_id: id,
            action,
            before,
            after,
        });
    }

    /// Not-found for an id a change addresses: the error of a single
    /// change, a listed problem in a batch.
    fn missing(&mut self, at: &str, kind: &'static str, id: String) -> Result<(), CatalogueError> {
        if self.single {
            return Err(CatalogueError::NotFound {
                field: "id".into(),
                kind,
                id,
            });
        }
        let what = match kind {
            "friction entry" => format!("no friction entry with id {id}"),
            _ => format!("no {kind} '{id}'"),
        };
        self.problems
            .push(ChangeProblem::new(format!("{at}id"), what));
        Ok(())
    }

    fn create_entry(&mut self, at: &str, input: &EntryInput) {
        let e = entry_from(
            at,
            input,
            &self.next,
            self.next_id,
            Status::Active,
            self.revision,
            &mut self.problems,
        );
        self.next_id += 1;
        self.touched_entries.push((at.to_string(), e.id));
        self.record(
            EntityKind::FrictionEntry,
            e.id.to_string(),
            Action::Create,
            None,
            json(&e),
        );
        self.next.entries.push(e);
    }

    /// Replaces (`input` given) or retires (`None`) entry `id`.
    fn change_entry(
        &mut self,
        at: &str,
        id: i64,
        expected_revision: Option<i64>,
        input: Option<&EntryInput>,
    ) -> Result<(), CatalogueError> {
        let Some(pos) = self.next.entries.iter().position(|e| e.id == id) else {
            return self.missing(at, "friction entry", id.to_string());
        };
        let before = self.next.entries[pos].clone();
        if let Some(x) = expected_revision.filter(|x| *x != before.revision) {
            return Err(stale(
                at,
                CurrentState::Entry(Box::new(before.clone())),
                id.to_string(),
                "friction entry",
                x,
                before.revision,
            ));
        }
        let after = match input {
            Some(entry) => entry_from(
                at,
                entry,
                &self.next,
                id,
                before.status,
                self.revision,
                &mut self.problems,
            ),
            None => {
                if !before.status.is_active() {
                    self.problems.push(ChangeProblem::new(
                        format!("{at}id"),
                        format!("friction entry {id} is already retired"),
                    ));
                }
                FrictionEntry {
                    status: Status::Retired,
                    revision: self.revision,
                    ..before.clone()
                }
            }
        };
        if (FrictionEntry {
            revision: before.revision,
            ..after.clone()
        }) == before
        {
            self.problems.push(ChangeProblem::new(
                format!("{at}id"),
                format!(
                    "friction entry {id}: the submitted entry is identical to the current one; \
                     nothing to change"
                ),
            ));
        }
        let action = action(before.status, after.status);
        self.touched_entries.push((at.to_string(), id));
        self.record(
            EntityKind::FrictionEntry,
            id.to_string(),
            action,
            Some(json(&before)),
            json(&after),
        );
        self.next.entries[pos] = after;
        Ok(())
    }

    /// Creates (`expected` `None`) or replaces (`Some(expected revision)`)
    /// a finish, lubricant or other [`CatalogueItem`].
    fn item<I: CatalogueItem>(
        &mut self,
        at: &str,
        input: &I::Input,
        expected: Option<Option<i64>>,
    ) -> Result<(), CatalogueError> {
        let (id, name) = I::input_key(input);
        check_item_names(at, id, name, &mut self.problems);
        let existing = I::all(&self.next).iter().position(|x| x.id() == id);
        let status = I::input_status(input);
        let mut after = I::from_input(input, status.unwrap_or(Status::Active), self.revision);
        match (existing, expected) {
            (Some(_), None) => self.problems.push(ChangeProblem::new(
                format!("{at}id"),
                format!("{} '{id}' already exists", I::NAME),
            )),
            (None, None) => {
                self.record(
                    I::ENTITY,
                    id.to_string(),
                    Action::Create,
                    None,
                    json(&after),
                );
                I::all_mut(&mut self.next).push(after);
            }
            (None, Some(_)) => return self.missing(at, I::NAME, id.to_string()),
            (Some(pos), Some(expected)) => {
                let before = I::all(&self.next)[pos].clone();
                if let Some(x) = expected.filter(|x| *x != before.revision()) {
                    let rev = before.revision();
                    return Err(stale(
                        at,
                        before.current_state(),
                        id.to_string(),
                        I::NAME,
                        x,
                        rev,
                    ));
                }
                after = I::from_input(input, status.unwrap_or(before.status()), self.revision);
                if I::from_input(input, after.status(), before.revision()) == before {
                    self.problems.push(ChangeProblem::new(
                        format!("{at}id"),
                        format!("{} '{id}': nothing to change", I::NAME),
                    ));
                }
                let action = action(before.status(), after.status());
                self.record(
                    I::ENTITY,
                    id.to_string(),
                    action,
                    Some(json(&before)),
                    json(&after),
                );
                I::all_mut(&mut self.next)[pos] = after;
            }
        }
        Ok(())
    }

    /// The catalogue-wide checks, then the new revision or every problem.
    fn finish(mut self) -> Result<Applied, CatalogueError> {
        check_whole(&self.next, &self.touched_entries, &mut self.problems);
        if !self.problems.is_empty() {
            return Err(CatalogueError::Invalid {
                problems: self.problems,
            });
        }
        self.next.normalise();
        Ok(Applied {
            snapshot: self.next,
            records: self.records,
        })
    }
}

/// Retire when an active item becomes retired; update otherwise.
fn action(before: Status, after: Status) -> Action {
    if after == Status::Retired && before.is_active() {
        Action::Retire
    } else {
        Action::Update
    }
}

#[cfg(test)]
#[path = "change_tests.rs"]
mod tests;
