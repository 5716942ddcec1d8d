//! Wire types of finishes and lubricants, one item kind: their views and
//! lists, their write bodies (declared once by `item_write!`), and the two
//! traits the generic handlers in `items.rs` are written over.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use super::required;
use crate::catalogue::{CatalogueItem, Finish, FinishInput, Lubricant, LubricantInput, Status};
use crate::http::error::{ApiError, FieldError};

#[derive(Debug, Serialize, ToSchema)]
pub struct FinishList {
    pub catalogue_revision: i64,
    pub catalogue_may_be_stale: bool,
    pub finishes: Vec<Finish>,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct FinishView {
    #[serde(flatten)]
    pub finish: Finish,
    pub catalogue_revision: i64,
    pub catalogue_may_be_stale: bool,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct LubricantList {
    pub catalogue_revision: i64,
    pub catalogue_may_be_stale: bool,
    pub lubricants: Vec<Lubricant>,
}

#[derive(Debug, Serialize, ToSchema)]
pub struct LubricantView {
    #[serde(flatten)]
    pub lubricant: Lubricant,
    pub catalogue_revision: i64,
    pub catalogue_may_be_stale: bool,
}

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

impl ItemWire for Finish {
    type View = FinishView;
    type List = FinishList;
    const COLLECTION: &'static str = "/v1/finishes";
    fn view(finish: Self, catalogue_revision: i64, catalogue_may_be_stale: bool) -> FinishView {
        FinishView {
            finish,
            catalogue_revision,
            catalogue_may_be_stale,
        }
    }
    fn list(
        finishes: Vec<Self>,
        catalogue_revision: i64,
        catalogue_may_be_stale: bool,
    ) -> FinishList {
        FinishList {
            catalogue_revision,
            catalogue_may_be_stale,
            finishes,
        }
    }
}

impl ItemWire for Lubricant {
    type View = LubricantView;
    type List = LubricantList;
    const COLLECTION: &'static str = "/v1/lubricants";
    fn view(
        lubricant: Self,
        catalogue_revision: i64,
        catalogue_may_be_stale: bool,
    ) -> LubricantView {
        LubricantView {
            lubricant,
            catalogue_revision,
            catalogue_may_be_stale,
        }
    }
    fn list(
        lubricants: Vec<Self>,
        catalogue_revision: i64,
        catalogue_may_be_stale: bool,
    ) -> LubricantList {
        LubricantList {
            catalogue_revision,
            catalogue_may_be_stale,
            lubricants,
        }
    }
}

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
