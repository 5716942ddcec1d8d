//! One catalogue item kind: what finishes and lubricants share (a slug id,
//! a name, notes, a status, the revision of their last change, and a
//! history of their own). [`CatalogueItem`] names, per kind, where its items
//! live in a snapshot and how an input becomes an item, so that the apply
//! rules, the use cases and the HTTP handlers are written once for every
//! kind; a new editable kind implements it.

use serde::Serialize;

use super::change::{Change, EntityKind, FinishInput, LubricantInput};
use super::error::{CatalogueError, CurrentState};
use super::exchange::ImportItem;
use super::types::{item_etag, Finish, Lubricant, Status};
use super::Snapshot;

/// A catalogue item other than a friction entry.
pub trait CatalogueItem: Clone + PartialEq + Serialize + Sized {
    /// What a client submits to create or replace one.
    type Input;
    /// Its kind in history.
    const ENTITY: EntityKind;
    /// Its name in messages and entity tags (`finish`, `lubricant`).
    const NAME: &'static str;

    fn id(&self) -> &str;
    fn name(&self) -> &str;
    fn revision(&self) -> i64;
    fn status(&self) -> Status;
    /// Every item of this kind in `snapshot`.
    fn all(snapshot: &Snapshot) -> &[Self];
    fn all_mut(snapshot: &mut Snapshot) -> &mut Vec<Self>;
    /// The item with this id, or an unknown-name error with suggestions.
    fn find<'s>(snapshot: &'s Snapshot, id: &str) -> Result<&'s Self, CatalogueError>;
    /// The input an item of an import file gives.
    fn import_input(item: &ImportItem) -> Self::Input;
    /// The id and name an input gives.
    fn input_key(input: &Self::Input) -> (&str, &str);
    /// The status an input asks for (`None`: unchanged, active on create).
    fn input_status(input: &Self::Input) -> Option<Status>;
    /// The item an input describes, with `status`, as of `revision`.
    fn from_input(input: &Self::Input, status: Status, revision: i64) -> Self;
    /// The item as the current state of a refused stale change.
    fn current_state(self) -> CurrentState;
    /// The change creating it, or replacing it (`expected_revision` from
    /// the client's entity tag).
    fn create(input: Self::Input) -> Change;
    fn update(input: Self::Input, expected_revision: Option<i64>) -> Change;

    /// The entity tag of this item's state (`"finish-plain-r3"`).
    fn etag(&self) -> String {
        item_etag(Self::NAME, self.id(), self.revision())
    }
}

/// Implements [`CatalogueItem`] for a kind from its names: type and input,
/// entity kind, name, snapshot list and look-up, current-state and change
/// variants, and the kind's own flags (copied from input to item).
macro_rules! catalogue_item {
    ($item:ident, $input:ident, $name:literal, $list:ident, $find:ident,
     $create:ident, $update:ident { $field:ident }, flags { $($flag:ident),* }) => {
        impl CatalogueItem for $item {
            type Input = $input;
            const ENTITY: EntityKind = EntityKind::$item;
            const NAME: &'static str = $name;

            fn id(&self) -> &str {
                &self.id
            }
            fn name(&self) -> &str {
                &self.name
            }
            fn revision(&self) -> i64 {
                self.revision
            }
            fn status(&self) -> Status {
                self.status
            }
            fn all(snapshot: &Snapshot) -> &[Self] {
                &snapshot.$list
            }
            fn all_mut(snapshot: &mut Snapshot) -> &mut Vec<Self> {
                &mut snapshot.$list
            }
            fn find<'s>(snapshot: &'s Snapshot, id: &str) -> Result<&'s Self, CatalogueError> {
                snapshot.$find(id)
            }
            fn import_input(item: &ImportItem) -> $input {
                $input {
                    id: item.id.clone(),
                    name: item.name.clone(),
                    $($flag: item.$flag,)*
                    notes: item.notes.clone(),
                    status: item.status,
                }
            }
            fn input_key(input: &$input) -> (&str, &str) {
                (&input.id, &input.name)
            }
            fn input_status(input: &$input) -> Option<Status> {
                input.status
            }
            fn from_input(input: &$input, status: Status, revision: i64) -> Self {
                $item {
                    id: input.id.clone(),
                    name: input.name.trim().to_string(),
                    $($flag: input.$flag,)*
                    notes: input.notes.clone(),
                    status,
                    revision,
                }
            }
            fn current_state(self) -> CurrentState {
                CurrentState::$item(Box::new(self))
            }
            fn create(input: $input) -> Change {
                Change::$create(input)
            }
            fn update($field: $input, expected_revision: Option<i64>) -> Change {
                Change::$update {
                    expected_revision,
                    $field,
                }
            }
        }
    };
}

catalogue_item!(
    Finish,
    FinishInput,
    "finish",
    finishes,
    finish,
    CreateFinish,
    UpdateFinish { finish },
    flags {
        electroplated,
        stainless
    }
);

catalogue_item!(
    Lubricant,
    LubricantInput,
    "lubricant",
    lubricants,
    lubricant,
    CreateLubricant,
    UpdateLubricant { lubricant },
    flags { dry }
);
