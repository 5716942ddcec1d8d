//! Changes to the catalogue and the pure rule that applies a batch of them
//! to a snapshot: everything is checked first (every problem listed), then
//! the batch becomes exactly one new revision with one history record per
//! changed item. The store persists the result; it adds no rules of its own.

use serde::{Deserialize, Serialize};
use serde_json::Value;
use utoipa::ToSchema;

use super::error::{suggest, CatalogueError, CurrentState, Problem};
use super::types::{is_slug, Finish, FrictionEntry, FrictionRange, Lubricant, RangeInput, Status};
use super::Snapshot;

/// A friction entry as a client submits it (POST, or PUT with the entry
/// as GET returned it: `id` and `revision` there are read-only and ignored).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct EntryInput {
    pub finish: String,
    pub lubricant: String,
    #[serde(default)]
    pub bearing_surface: Option<String>,
    pub thread_friction: RangeInput,
    pub bearing_friction: RangeInput,
    #[serde(default)]
    pub total_friction: Option<RangeInput>,
    pub source: String,
    #[serde(default)]
    pub notes: String,
    /// Omitted: unchanged on update, active on create.
    #[serde(default)]
    pub status: Option<Status>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct FinishInput {
    pub id: String,
    pub name: String,
    #[serde(default)]
    pub electroplated: bool,
    #[serde(default)]
    pub stainless: bool,
    #[serde(default)]
    pub notes: String,
    #[serde(default)]
    pub status: Option<Status>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct LubricantInput {
    pub id: String,
    pub name: String,
    #[serde(default)]
    pub dry: bool,
    #[serde(default)]
    pub notes: String,
    #[serde(default)]
    pub status: Option<Status>,
}

/// One change. `expected_revision` is the revision the client last saw of
/// that item (from its ETag); `None` skips the check (imports only).
#[derive(Debug, Clone, PartialEq)]
pub enum Change {
    CreateEntry(EntryInput),
    UpdateEntry {
        id: i64,
        expected_revision: Option<i64>,
        entry: EntryInput,
    },
    RetireEntry {
        id: i64,
        expected_revision: Option<i64>,
    },
    CreateFinish(FinishInput),
    UpdateFinish {
        expected_revision: Option<i64>,
        finish: FinishInput,
    },
    CreateLubricant(LubricantInput),
    UpdateLubricant {
        expected_revision: Option<i64>,
        lubricant: LubricantInput,
    },
}

/// A change and the prefix its problems are reported under (`""` for a
/// single HTTP change, `"entries[3]."` for an import file).
#[derive(Debug, Clone, PartialEq)]
pub struct ChangeItem {
    pub at: String,
    pub change: Change,
}

/// A batch submitted together: it becomes one revision or nothing.
#[derive(Debug, Clone, PartialEq)]
pub struct ChangeSet {
    /// Who: the token name (or `cli:<user>` for the command line).
    pub actor: String,
    pub reason: String,
    /// Optional evidence, e.g. `friction-test:42`; recorded with the revision.
    pub evidence: Option<String>,
    pub items: Vec<ChangeItem>,
}

impl ChangeSet {
    pub fn single(actor: &str, reason: &str, change: Change) -> Self {
        Self {
            actor: actor.into(),
            reason: reason.into(),
            evidence: None,
            items: vec![ChangeItem {
                at: String::new(),
                change,
            }],
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, ToSchema)]
#[serde(rename_all = "snake_case")]
pub enum EntityKind {
    FrictionEntry,
    Finish,
    Lubricant,
}

impl EntityKind {
    pub fn as_str(self) -> &'static str {
        match self {
            Self::FrictionEntry => "friction_entry",
            Self::Finish => "finish",
            Self::Lubricant => "lubricant",
        }
    }

    pub fn parse(s: &str) -> Option<Self> {
        match s {
            "friction_entry" => Some(Self::FrictionEntry),
            "finish" => Some(Self::Finish),
            "lubricant" => Some(Self::Lubricant),
            _ => None,
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum Action {
    Create,
    Update,
    Retire,
}

impl Action {
    pub fn as_str(self) -> &'static str {
        match self {
            Self::Create => "create",
            Self::Update => "update",
            Self::Retire => "retire",
        }
    }

    pub fn parse(s: &str) -> Option<Self> {
        match s {
            "create" => Some(Self::Create),
            "update" => Some(Self::Update),
            "retire" => Some(Self::Retire),
            _ => None,
        }
    }
}

/// What one change did: the item's state before (absent on create) and after.
#[derive(Debug, Clone, PartialEq)]
pub struct HistoryRecord {
    pub entity: EntityKind,
    pub entity_id: String,
    pub action: Action,
    pub before: Option<Value>,
    pub after: Value,
}

/// A checked batch: the catalogue as it is after the new revision, and the
/// history records to append.
#[derive(Debug, Clone, PartialEq)]
pub struct Applied {
    pub snapshot: Snapshot,
    pub records: Vec<HistoryRecord>,
}

fn json<T: Serialize>(v: &T) -> Value {
    serde_json::to_value(v).unwrap_or(Value::Null)
}

fn range(at: &str, name: &str, raw: &RangeInput, problems: &mut Vec<Problem>) -> FrictionRange {
    match FrictionRange::new(raw.min, raw.max) {
        Ok(r) => r,
        Err(ps) => {
            for (sub, reason) in ps {
                problems.push(Problem::new(format!("{at}{name}.{sub}"), reason));
            }
            FrictionRange {
                min: raw.min,
                max: raw.max,
            }
        }
    }
}

fn stale(
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
fn entry_from(
    at: &str,
    input: &EntryInput,
    next: &Snapshot,
    id: i64,
    status: Status,
    revision: i64,
    problems: &mut Vec<Problem>,
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
            Some((_, Status::Retired)) => problems.push(Problem::new(
                format!("{at}{field}"),
                format!("{field} '{value}' is retired"),
            )),
            None => problems.push(
                Problem::new(format!("{at}{field}"), format!("unknown {field} '{value}'"))
                    .with_suggestions(suggest(
                        value,
                        known.iter().filter(|(_, s)| s.is_active()).map(|(k, _)| *k),
                    )),
            ),
        }
    }
    if let Some(s) = &input.bearing_surface {
        if !is_slug(s) {
            problems.push(Problem::new(
                format!("{at}bearing_surface"),
                "must be a slug: lower-case letters, digits and hyphens, at most 64",
            ));
        }
    }
    if input.source.trim().is_empty() {
        problems.push(Problem::new(
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
        thread_friction,
        bearing_friction,
        total_friction,
        source: input.source.trim().to_string(),
        notes: input.notes.clone(),
        status: input.status.unwrap_or(status),
        revision,
    }
}

fn check_item_names(at: &str, id: &str, name: &str, problems: &mut Vec<Problem>) {
    if !is_slug(id) {
        problems.push(Problem::new(
            format!("{at}id"),
            "must be a slug: lower-case letters, digits and hyphens, at most 64",
        ));
    }
    if name.trim().is_empty() {
        problems.push(Problem::new(format!("{at}name"), "a name is required"));
    }
}

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
        problems.push(Problem::new(
            "reason",
            "a reason is required for every catalogue change",
        ));
    }
    if set.actor.trim().is_empty() {
        problems.push(Problem::new("actor", "the author of the change is unknown"));
    }
    if set.items.is_empty() {
        problems.push(Problem::new("changes", "nothing to change"));
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
                    problems.push(Problem::new(
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
                            problems.push(Problem::new(
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
                    problems.push(Problem::new(format!("{at}id"), format!("friction entry {id}: the submitted entry is identical to the current one; nothing to change")));
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
                    (Some(_), None) => problems.push(Problem::new(
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
                        problems.push(Problem::new(
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
                            problems.push(Problem::new(
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
                    (Some(_), None) => problems.push(Problem::new(
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
                        problems.push(Problem::new(
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
                            problems.push(Problem::new(
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

/// Rules over the catalogue as a whole after the batch: one active entry
/// per key, and no active entry on a retired finish or lubricant.
fn check_whole(next: &Snapshot, touched: &[(String, i64)], problems: &mut Vec<Problem>) {
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
            problems.push(Problem::new(
                format!("{at}lubricant"),
                format!(
                    "an active friction entry (id {}) already exists for finish '{}', lubricant '{}', bearing surface '{}'; update or retire it instead",
                    other.id, e.finish, e.lubricant, e.bearing_surface.as_deref().unwrap_or("any")
                ),
            ));
        }
    }
    for f in next.finishes.iter().filter(|f| !f.status.is_active()) {
        if let Some(e) = next.active_entries().find(|e| e.finish == f.id) {
            problems.push(Problem::new("finish", format!("finish '{}' cannot be retired while friction entry {} uses it; retire the entry first", f.id, e.id)));
        }
    }
    for l in next.lubricants.iter().filter(|l| !l.status.is_active()) {
        if let Some(e) = next.active_entries().find(|e| e.lubricant == l.id) {
            problems.push(Problem::new("lubricant", format!("lubricant '{}' cannot be retired while friction entry {} uses it; retire the entry first", l.id, e.id)));
        }
    }
}

#[cfg(test)]
#[path = "change_tests.rs"]
mod tests;

impl From<&FrictionEntry> for EntryInput {
    /// The entry as input, e.g. to resubmit it changed.
    fn from(e: &FrictionEntry) -> Self {
        EntryInput {
            finish: e.finish.clone(),
            lubricant: e.lubricant.clone(),
            bearing_surface: e.bearing_surface.clone(),
            thread_friction: e.thread_friction.into(),
            bearing_friction: e.bearing_friction.into(),
            total_friction: e.total_friction.map(Into::into),
            source: e.source.clone(),
            notes: e.notes.clone(),
            status: Some(e.status),
        }
    }
}
