//! Wire types of the catalogue routes (those of finishes and lubricants in
//! `wire/items.rs`). Every response states the catalogue
//! revision it was answered from and whether the catalogue in memory may be
//! stale (database unreachable).

use serde::{Deserialize, Serialize};
use utoipa::{IntoParams, ToSchema};

use crate::app::catalogue::{HistoryItem, RevisionInfo};
use crate::catalogue::{DiffItem, EntryInput, FrictionEntry, RangeInput, Status};
use crate::http::error::{ApiError, FieldError};

mod items;
pub use items::{
    FinishList, FinishView, FinishWrite, ItemWire, ItemWrite, LubricantList, LubricantView,
    LubricantWrite,
};

#[derive(Debug, Serialize, ToSchema)]
pub struct EntryList {
    pub catalogue_revision: i64,
    pub catalogue_may_be_stale: bool,
    pub entries: Vec<FrictionEntry>,
}

/// One entry as GET returns it (and PUT takes it back, changed, with a reason).
#[derive(Debug, Serialize, ToSchema)]
pub struct EntryView {
    #[serde(flatten)]
    pub entry: FrictionEntry,
    pub catalogue_revision: i64,
    pub catalogue_may_be_stale: bool,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct HistoryView {
    /// `friction_entry`, `finish` or `lubricant`.
    pub entity: String,
    pub id: String,
    pub catalogue_revision: i64,
    /// Oldest first.
    pub history: Vec<HistoryItem>,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct RevisionList {
    pub catalogue_revision: i64,
    /// Newest first.
    pub revisions: Vec<RevisionInfo>,
    /// Pass as `before` for the next page; absent on the last page.
    pub next_before: Option<i64>,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct RevisionDetail {
    #[serde(flatten)]
    pub info: RevisionInfo,
    /// Every change the revision made, with before and after.
    pub changes: Vec<HistoryItem>,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct DiffView {
    pub from: i64,
    pub to: i64,
    pub changes: Vec<DiffItem>,
}

#[derive(Debug, Clone, Copy, Deserialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum StatusFilter {
    Active,
    Retired,
    All,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct EntryListQuery {
    /// A past revision (default: current).
    pub catalogue_revision: Option<i64>,
    /// `active`, `retired` or `all` (default).
    #[param(inline)]
    pub status: Option<StatusFilter>,
    pub finish: Option<String>,
    pub lubricant: Option<String>,
}

/// For routes without query parameters: any parameter is refused (400)
/// rather than silently ignored.
#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct NoQuery {}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct RevisionQuery {
    /// A past revision (default: current).
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub catalogue_revision: Option<i64>,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct RetireQuery {
    /// Why the entry is retired (or give `{"reason": …}` as the body).
    pub reason: Option<String>,
}

#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ReasonBody {
    pub reason: String,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct RevisionsQuery {
    /// Only revisions older than this (paging cursor).
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub before: Option<i64>,
    /// At most this many (1–1000, default 100).
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub limit: Option<i64>,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct DiffQuery {
    pub from: i64,
    pub to: i64,
}

#[derive(Debug, Clone, Copy, Deserialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum ExportFormat {
    Json,
    Csv,
}

#[derive(Debug, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
pub struct ExportQuery {
    /// `json` (default) or `csv` (friction entries).
    #[param(inline)]
    pub format: Option<ExportFormat>,
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub catalogue_revision: Option<i64>,
    /// CSV only: start with a UTF-8 byte order mark, for spreadsheets that
    /// otherwise guess the encoding (default false).
    pub bom: Option<bool>,
}

pub(super) fn required<T>(v: Option<T>, field: &str, missing: &mut Vec<FieldError>) -> Option<T> {
    if v.is_none() {
        missing.push(FieldError::new(field, "is required"));
    }
    v
}

/// A friction entry to create (POST) or replace (PUT: the entry as GET
/// returned it, changed, plus `reason`). `id`, `revision`,
/// `catalogue_revision` and `catalogue_may_be_stale` are read-only and
/// ignored, except that a PUT's `id`, when given, must match the path.
#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct EntryWrite {
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub id: Option<i64>,
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub revision: Option<i64>,
    #[serde(default, deserialize_with = "crate::http::extract::integral")]
    pub catalogue_revision: Option<i64>,
    pub catalogue_may_be_stale: Option<bool>,
    pub finish: Option<String>,
    pub lubricant: Option<String>,
    pub bearing_surface: Option<String>,
    /// Limits the entry to joints carrying this tag (e.g. one part family);
    /// absent: the generic entry for every joint.
    pub joint_tag: Option<String>,
    pub thread_friction: Option<RangeInput>,
    pub bearing_friction: Option<RangeInput>,
    pub total_friction: Option<RangeInput>,
    pub source: Option<String>,
    #[serde(default)]
    pub notes: String,
    pub status: Option<Status>,
    /// Why (required; recorded in history).
    #[serde(default)]
    pub reason: String,
}

impl EntryWrite {
    /// The input and reason; every missing required field listed (422).
    pub fn into_input(self) -> Result<(EntryInput, String), ApiError> {
        let mut missing = Vec::new();
        let finish = required(self.finish, "finish", &mut missing);
        let lubricant = required(self.lubricant, "lubricant", &mut missing);
        let thread = required(self.thread_friction, "thread_friction", &mut missing);
        let bearing = required(self.bearing_friction, "bearing_friction", &mut missing);
        let source = required(self.source, "source", &mut missing);
        if self.reason.trim().is_empty() {
            missing.push(FieldError::new(
                "reason",
                "a reason is required for every catalogue change",
            ));
        }
        match (finish, lubricant, thread, bearing, source) {
            (
                Some(finish),
                Some(lubricant),
                Some(thread_friction),
                Some(bearing_friction),
                Some(source),
            ) if missing.is_empty() => Ok((
                EntryInput {
                    finish,
                    lubricant,
                    bearing_surface: self.bearing_surface,
                    joint_tag: self.joint_tag,
                    thread_friction,
                    bearing_friction,
                    total_friction: self.total_friction,
                    source,
                    notes: self.notes,
                    status: self.status,
                },
                self.reason,
            )),
            _ => Err(ApiError::unprocessable(missing)),
        }
    }
}
