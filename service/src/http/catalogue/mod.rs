//! Catalogue routes (adapters over `app::catalogue`): friction entries
//! (`entries`), finishes and lubricants as one item kind (`items`),
//! revisions, diff and export (`revisions`), and their wire types
//! (`wire`). Handlers extract, call one use case and render; rules live in
//! `catalogue::apply`, errors map through `AppError` (`http/error/from_app.rs`).

mod entries;
mod items;
mod revisions;
pub mod wire;

use actix_web::http::header::{self, HeaderMap};

use super::error::ApiError;
use crate::catalogue::revision_from_etag;

/// Registers every catalogue route.
pub fn configure(cfg: &mut utoipa_actix_web::service_config::ServiceConfig) {
    entries::configure(cfg);
    items::configure(cfg);
    revisions::configure(cfg);
}

/// The revision an `If-Match` header names for the resource whose tags
/// start with `prefix` (`entry-7`, `finish-plain`). Missing → 428; `*`, a
/// tag of another resource, or one that is not ours → 412 (a blind
/// overwrite is never allowed).
pub(crate) fn if_match(headers: &HeaderMap, prefix: &str) -> Result<i64, ApiError> {
    let Some(value) = headers.get(header::IF_MATCH) else {
        return Err(ApiError::PreconditionRequired {
            detail: "changes need If-Match with the ETag from GET (optimistic concurrency: no lost updates)".into(),
        });
    };
    let text = value.to_str().unwrap_or("").trim();
    let bare = text.strip_prefix("W/").unwrap_or(text).trim_matches('"');
    let ours = bare.rsplit_once("-r").is_some_and(|(p, _)| p == prefix);
    match revision_from_etag(text) {
        Some(rev) if ours => Ok(rev),
        _ => Err(ApiError::PreconditionFailed {
            detail: format!("If-Match '{text}' is not an ETag of this resource; GET it and resend with its ETag"),
            current: None,
        }),
    }
}
