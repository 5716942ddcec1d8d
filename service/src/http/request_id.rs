//! Request ids: every request gets one (the client's `X-Request-Id` when it
//! is sane, otherwise a fresh random one). It is echoed on every response,
//! recorded on the request's log span and written into problem bodies.

use actix_web::body::MessageBody;
use actix_web::dev::{ServiceRequest, ServiceResponse};
use actix_web::http::header::{HeaderName, HeaderValue};
use actix_web::middleware::Next;
use actix_web::HttpMessage;
use rand::Rng;
use tracing::Instrument;

/// The header carrying the request id, both ways.
pub const REQUEST_ID_HEADER: &str = "x-request-id";

/// Longest incoming id we accept as is.
const MAX_LEN: usize = 128;

/// The id and path of the request being served, available to code running
/// inside its handler (error rendering uses it).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RequestContext {
    pub id: String,
    pub path: String,
}

/// The request id, also stored in the request's extensions.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RequestId(pub String);

tokio::task_local! {
    static CONTEXT: RequestContext;
}

/// The context of the request being served, if any.
pub fn current() -> Option<RequestContext> {
    CONTEXT.try_with(|c| c.clone()).ok()
}

/// An incoming id is kept when it is 1–128 characters of letters, digits,
/// `-`, `_`, `.` or `:`; anything else is replaced, never echoed.
pub fn is_sane(id: &str) -> bool {
    !id.is_empty()
        && id.len() <= MAX_LEN
        && id
            .bytes()
            .all(|b| b.is_ascii_alphanumeric() || matches!(b, b'-' | b'_' | b'.' | b':'))
}

/// A fresh id: 128 random bits in hex.
pub fn generate() -> String {
    let bits: u128 = rand::thread_rng().gen();
    format!("{bits:032x}")
}

/// Middleware: assign the id, run the request inside its span and context,
/// echo the id on the response.
pub async fn middleware(
    req: ServiceRequest,
    next: Next<impl MessageBody + 'static>,
) -> Result<ServiceResponse<impl MessageBody>, actix_web::Error> {
    let id = req
        .headers()
        .get(REQUEST_ID_HEADER)
        .and_then(|v| v.to_str().ok())
        .filter(|v| is_sane(v))
        .map(str::to_owned)
        .unwrap_or_else(generate);
    req.extensions_mut().insert(RequestId(id.clone()));
    let ctx = RequestContext {
        id: id.clone(),
        path: req.path().to_owned(),
    };
    let span = tracing::info_span!(
        "request",
        request_id = %id,
        method = %req.method(),
        path = %req.path()
    );
    // The request must not be cloned before routing (actix needs sole
    // ownership to record path parameters), so errors raised by inner
    // middleware pass through unchanged; handler and extractor errors are
    // rendered inside the scope and carry the id.
    let mut res = CONTEXT
        .scope(ctx, next.call(req))
        .instrument(span.clone())
        .await?;
    span.in_scope(|| {
        tracing::info!(status = res.status().as_u16(), "served");
    });
    if let Ok(value) = HeaderValue::from_str(&id) {
        res.headers_mut()
            .insert(HeaderName::from_static(REQUEST_ID_HEADER), value);
    }
    Ok(res)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sane_ids_are_kept_and_others_refused() {
        assert!(is_sane("abc-123_X.y:z"));
        assert!(!is_sane(""));
        assert!(!is_sane("has space"));
        assert!(!is_sane("<script>"));
        assert!(!is_sane(&"a".repeat(129)));
    }

    #[test]
    fn generated_ids_are_sane_and_distinct() {
        let a = generate();
        let b = generate();
        assert!(is_sane(&a));
        assert_eq!(a.len(), 32);
        assert_ne!(a, b);
    }
}
