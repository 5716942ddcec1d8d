//! The friction catalogue as domain types, with no database or network I/O:
//! finishes, lubricants and friction entries (`types`), one revision held in
//! memory (`snapshot`), the seed catalogue (`seed`), changes as submitted
//! (`change`), the rule that turns a batch of them into one new revision
//! (`apply`, with its item checks in `rules`), what finishes and
//! lubricants share as one item kind (`item`), the difference between two
//! revisions (`diff`), export and import as JSON or CSV (`exchange`,
//! `csv_form`), the live catalogue the service answers from (`live`), and
//! typed errors (`error`).

pub mod apply;
pub mod change;
mod csv_form;
pub mod diff;
pub mod error;
pub mod exchange;
pub mod item;
pub mod live;
mod rules;
pub mod seed;
pub mod snapshot;
pub mod types;

pub use apply::apply;
pub use change::{
    Action, Applied, Change, ChangeItem, ChangeSet, EntityKind, EntryInput, FinishInput,
    HistoryRecord, LubricantInput,
};
pub use diff::{diff, DiffItem, DiffKind};
pub use error::{CatalogueError, ChangeProblem, CurrentState};
pub use item::CatalogueItem;
pub use live::Live;
pub use snapshot::{FrictionMatch, Snapshot};
pub use types::{
    item_etag, revision_from_etag, Finish, FrictionEntry, Lubricant, RangeInput, Status,
    TabulatedFriction, FRICTION_MAX, FRICTION_MIN,
};
