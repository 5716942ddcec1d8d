//! Wire types of finishes and lubricants, one item kind: their views and
//! lists (declared once by `item_wire!`), their write bodies (declared once
//! by `item_write!`), and the two
//! traits the generic handlers in `items.rs` are written over.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use super::required;
use crate::catalogue::{CatalogueItem, Finish, FinishInput, Lubricant, LubricantInput, Status};
use crate::http::error::{ApiError, FieldError};

/// How a catalogue item kind goes on the wire: its collection path, the
/// view of one item and the list of them (the handlers in `items.rs` are
/// written once over it).
pub trait ItemWire: CatalogueItem {
    type View: Serialize;
    type List: Serialize;
    /// The collection's path (`/v1/finishes`).
    const COLLECTION: &'static str;
    fn view(item: Self, catalogue_revision: i64, catalogue_may_be_stale: bool) -> Self::View;
    fn list(items: Vec<Self>, catalogue_revision: i64, catalogue_may_be_stale: bool) -> Self::List;
}

/// Declares a kind's view (the item with the revision it was read at) and
/// list (the items under the kind's plural name), and their `ItemWire`.
macro_rules! item_wire {
    ($item:ident, $one:ident, $many:ident, $view:ident, $list:ident, $path:literal) => {
        #[derive(Debug, Serialize, ToSchema)]
        pub struct $list {
            pub catalogue_revision: i64,
            pub catalogue_may_be_stale: bool,
            pub $many: Vec<$item>,
        }

        #[derive(Debug, Serialize, ToSchema)]
        pub struct $view {
            #[serde(flatten)]
            pub $one: $item,
            pub catalogue_revision: i64,
            pub catalogue_may_be_stale: bool,
        }

        impl ItemWire for $item {
            type View = $view;
            type List = $list;
            const COLLECTION: &'static str = $path;
            fn view($one: Self, catalogue_revision: i64, catalogue_may_be_stale: bool) -> $view {
                $view {
                    $one,
                    catalogue_revision,
                    catalogue_may_be_stale,
                }
            }
            fn list(
                $many: Vec<Self>,
                catalogue_revision: i64,
                catalogue_may_be_stale: bool,
            ) -> $list {
                $list {
                    catalogue_revision,
                    catalogue_may_be_stale,
                    $many,
                }
            }
        }
    };
}

item_wire!(
    Finish,
    finish,
    finishes,
    FinishView,
    FinishList,
    "/v1/finishes"
);
item_wire!(
    Lubricant,
    lubricant,
    lubricants,
    LubricantView,
    LubricantList,
    "/v1/lubricants"
);

/// A write body of a catalogue item kind: the input and reason it gives
/// (`path_id`: the id in the path of a replacement).
pub trait ItemWrite {
    type Item: CatalogueItem;
    fn into_input(
        self,
        path_id: Option<&str>,
    ) -> Result<(<Self::Item as CatalogueItem>::Input, String), ApiError>;
}

/// Declares the write body of an item kind (the same conventions as
/// `EntryWrite`: read-only fields accepted and ignored, a reason required)
/// with the kind's own flags, and its [`ItemWrite`].
macro_rules! item_write {
    ($(#[$doc:meta])* $write:ident: $item:ident, $input:ident { $($flag:ident),* }) => {
        $(#[$doc])*
        #[derive(Debug, Deserialize, ToSchema)]
        #[serde(deny_unknown_fields)]
        pub struct $write {
            pub id: Option<String>,
            #[serde(default, deserialize_with = "crate::http::extract::integral")]
            pub revision: Option<i64>,
            #[serde(default, deserialize_with = "crate::http::extract::integral")]
            pub catalogue_revision: Option<i64>,
            pub catalogue_may_be_stale: Option<bool>,
            pub name: Option<String>,
            $(
                #[serde(default)]
                pub $flag: bool,
            )*
            #[serde(default)]
            pub notes: String,
            pub status: Option<Status>,
            #[serde(default)]
            pub reason: String,
        }

        impl ItemWrite for $write {
            type Item = $item;
            fn into_input(self, path_id: Option<&str>) -> Result<($input, String), ApiError> {
                let (id, name) = id_and_name(self.id, self.name, path_id, &self.reason)?;
                let input = $input {
                    id,
                    name,
                    $($flag: self.$flag,)*
                    notes: self.notes,
                    status: self.status,
                };
                Ok((input, self.reason))
            }
        }
    };
}

item_write!(
    /// A finish to create or replace (same conventions as [`EntryWrite`]).
    FinishWrite: Finish, FinishInput { electroplated, stainless }
);

item_write!(
    /// A lubricant to create or replace (same conventions as [`EntryWrite`]).
    LubricantWrite: Lubricant, LubricantInput { dry }
);

fn id_and_name(
    id: Option<String>,
    name: Option<String>,
    path_id: Option<&str>,
    reason: &str,
) -> Result<(String, String), ApiError> {
    let mut problems = Vec::new();
    let id = match (id, path_id) {
        (Some(b), Some(p)) if b != p => {
            problems.push(FieldError::new(
                "id",
                format!("'{b}' differs from the id in the path '{p}'"),
            ));
            None
        }
        (_, Some(p)) => Some(p.to_string()),
        (b, None) => required(b, "id", &mut problems),
    };
    let name = required(name, "name", &mut problems);
    if reason.trim().is_empty() {
        problems.push(FieldError::new(
            "reason",
            "a reason is required for every catalogue change",
        ));
    }
    match (id, name) {
        (Some(id), Some(name)) if problems.is_empty() => Ok((id, name)),
        _ => Err(ApiError::unprocessable(problems)),
    }
}
