//! Changes to the catalogue: what a client or file submits (`EntryInput`,
//! `FinishInput`, `LubricantInput`), batches of them (`ChangeSet`), and
//! what applying one produced (`Applied`, `HistoryRecord`). The rule that
//! applies a batch is in `apply.rs`.

use serde::{Deserialize, Serialize};
use serde_json::Value;
use utoipa::ToSchema;

use super::types::{FrictionEntry, RangeInput, Status};
use super::Snapshot;

/// A friction entry as a client submits it (POST, or PUT with the entry
/// as GET returned it: `id` and `revision` there are read-only and ignored).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct EntryInput {
    pub finish: String,
    pub lubricant: String,
    #[serde(default)]
    pub bearing_surface: Option<String>,
    /// Limits the entry to joints carrying this tag; absent: generic.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub joint_tag: Option<String>,
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

impl From<&FrictionEntry> for EntryInput {
    /// The entry as input, e.g. to resubmit it changed.
    fn from(e: &FrictionEntry) -> Self {
        EntryInput {
            finish: e.finish.clone(),
            lubricant: e.lubricant.clone(),
            bearing_surface: e.bearing_surface.clone(),
            joint_tag: e.joint_tag.clone(),
            thread_friction: e.thread_friction.into(),
            bearing_friction: e.bearing_friction.into(),
            total_friction: e.total_friction.map(Into::into),
            source: e.source.clone(),
            notes: e.notes.clone(),
            status: Some(e.status),
        }
    }
}
