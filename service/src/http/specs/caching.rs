//! Content hash, ETag and Cache-Control of spec and setpoint responses.
//!
//! - The content hash (`app::spec::resolve::content_hash`) identifies a spec: SHA-256 (hex) of the normalised
//!   request (every input after defaults, names in their normal spelling,
//!   numbers in SI) followed by the catalogue revision it was answered from.
//!   An answer's `spec_hash` (`app::spec::answer_hash`) adds its
//!   presentation and the method and service versions.
//! - The ETag adds the presentation (unit system, torque unit, resolution) to
//!   the content hash, so two representations of one spec differ:
//!   `"<first 32 hex digits of SHA-256(content hash | presentation)>"`.
//! - `If-None-Match` naming the current ETag (or `*`) gives 304 with no body.
//! - Cache-Control: a look-up pinned to a `catalogue_revision` can never
//!   change, so it may be kept for five minutes
//!   ([`CACHE_PINNED`]); an unpinned one follows the live catalogue, so a
//!   client may store it but must revalidate before each use
//!   ([`CACHE_UNPINNED`]; the revalidation is a cheap 304 while nothing
//!   changed).

use actix_web::http::header::{HeaderMap, IF_NONE_MATCH};
use sha2::{Digest, Sha256};

/// Cache-Control for look-ups pinned to a catalogue revision.
pub const CACHE_PINNED: &str = "public, max-age=300";
/// Cache-Control for look-ups that follow the live catalogue.
pub const CACHE_UNPINNED: &str = "public, max-age=0, must-revalidate";

/// The Cache-Control value for a look-up.
pub fn cache_control(pinned: bool) -> &'static str {
    if pinned {
        CACHE_PINNED
    } else {
        CACHE_UNPINNED
    }
}

/// Strong ETag of one representation of a spec.
pub fn etag(content_hash: &str, presentation: &str) -> String {
    let mut h = Sha256::new();
    h.update(content_hash.as_bytes());
    h.update(b"|");
    h.update(presentation.as_bytes());
    let digest = hex::encode(h.finalize());
    format!("\"{}\"", &digest[..32])
}

/// True when the request's `If-None-Match` matches `etag` (weak comparison,
/// RFC 9110 §13.1.2: `W/` prefixes are ignored; `*` matches anything).
pub fn not_modified(headers: &HeaderMap, etag: &str) -> bool {
    let bare = |t: &str| {
        let t = t.trim();
        t.strip_prefix("W/").unwrap_or(t).to_string()
    };
    let want = bare(etag);
    headers.get_all(IF_NONE_MATCH).any(|v| {
        v.to_str()
            .map(|s| s.split(',').any(|t| t.trim() == "*" || bare(t) == want))
            .unwrap_or(false)
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::app::spec::resolve::content_hash;
    use actix_web::http::header::HeaderValue;

    #[test]
    fn etag_depends_on_presentation() {
        let h = content_hash(b"x", 1);
        let si = etag(&h, "units=si");
        assert!(si.starts_with('"') && si.ends_with('"') && si.len() == 34);
        assert_ne!(si, etag(&h, "units=us"));
    }

    #[test]
    fn if_none_match_forms() {
        let tag = etag(&content_hash(b"x", 1), "si");
        let mut headers = HeaderMap::new();
        assert!(!not_modified(&headers, &tag));
        headers.insert(
            IF_NONE_MATCH,
            HeaderValue::from_str(&format!("\"other\", W/{tag}")).unwrap(),
        );
        assert!(not_modified(&headers, &tag));
        headers.insert(IF_NONE_MATCH, HeaderValue::from_static("*"));
        assert!(not_modified(&headers, &tag));
        headers.insert(IF_NONE_MATCH, HeaderValue::from_static("\"nope\""));
        assert!(!not_modified(&headers, &tag));
    }
}
