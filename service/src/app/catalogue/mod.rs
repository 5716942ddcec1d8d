//! Catalogue use cases: friction entries (`entries`), finishes and
//! lubricants as one item kind (`items`), and revisions, history, diff,
//! export and import (`revisions`). Reads answer from the live catalogue or
//! a past revision; every change becomes one revision through the store.

mod entries;
mod items;
mod revisions;

pub use crate::store::{HistoryItem, RevisionInfo};
pub use entries::EntryFilter;
pub use revisions::{CatalogueExport, History, Imported, RevisionPage};

use crate::catalogue::{Applied, Change, ChangeSet};

use super::{App, AppError};

/// A catalogue read or change: what it gives and the catalogue revision it
/// was answered from (the new revision after a change).
#[derive(Debug, Clone, PartialEq)]
pub struct AtRevision<T> {
    pub value: T,
    pub revision: i64,
}

/// Who asks for a change and why (recorded in history).
#[derive(Debug, Clone, Copy)]
pub struct Author<'a> {
    /// The token name, or `cli:<user>`.
    pub actor: &'a str,
    pub reason: &'a str,
}

impl App {
    /// Applies one change as a new revision and makes it the live one.
    async fn change(&self, by: Author<'_>, change: Change) -> Result<Applied, AppError> {
        let set = ChangeSet::single(by.actor, by.reason, change);
        self.apply(&set).await
    }

    /// Applies a batch as one new revision (or nothing, every problem
    /// listed) and makes it the live one.
    /// Right after, every joint whose active release would now compute
    /// differently is marked for review (see [`crate::app::impact`]); a
    /// failure there is logged, the revision stands.
    pub async fn apply(&self, set: &ChangeSet) -> Result<Applied, AppError> {
        let applied = self.store().apply_live(self.live(), set).await?;
        match self.mark_reviews(&applied.snapshot).await {
            Ok(marked) if !marked.is_empty() => {
                tracing::info!(
                    revision = applied.snapshot.revision,
                    joints = marked.len(),
                    "joints marked for review"
                );
            }
            Ok(_) => {}
            Err(e) => {
                tracing::error!(revision = applied.snapshot.revision, error = %e, "review marks not written");
            }
        }
        Ok(applied)
    }
}
