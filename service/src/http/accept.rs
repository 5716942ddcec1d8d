//! Content negotiation: the service answers JSON (problems as
//! `application/problem+json`), `/metrics` as `text/plain` and catalogue
//! exports as `text/csv`. A request whose `Accept` header admits none of
//! these gets 406 (RFC 9110 §12.5.1); no `Accept` header means anything.

use actix_web::body::MessageBody;
use actix_web::dev::{ServiceRequest, ServiceResponse};
use actix_web::http::header::ACCEPT;
use actix_web::middleware::Next;
use actix_web::ResponseError;

use super::error::ApiError;

/// Media types the service can produce.
const PRODUCED: [&str; 4] = [
    "application/json",
    "application/problem+json",
    "text/plain",
    "text/csv",
];

/// Whether an `Accept` header value admits something we produce.
pub fn acceptable(accept: &str) -> bool {
    accept.split(',').any(|range| {
        let mut parts = range.split(';');
        let media = parts.next().unwrap_or("").trim().to_ascii_lowercase();
        let refused = parts.any(|p| {
            let p = p.trim();
            p.strip_prefix("q=")
                .and_then(|q| q.trim().parse::<f64>().ok())
                .is_some_and(|q| q <= 0.0)
        });
        if refused || media.is_empty() {
            return false;
        }
        if media == "*/*" {
            return true;
        }
        match media.strip_suffix("/*") {
            Some(kind) => PRODUCED.iter().any(|p| p.starts_with(&format!("{kind}/"))),
            None => PRODUCED.contains(&media.as_str()),
        }
    })
}

/// Middleware: 406 before any work when nothing we produce is acceptable.
pub async fn middleware(
    req: ServiceRequest,
    next: Next<impl MessageBody + 'static>,
) -> Result<ServiceResponse<impl MessageBody>, actix_web::Error> {
    let header = req
        .headers()
        .get(ACCEPT)
        .map(|v| v.to_str().map(str::to_owned));
    let refused = match header {
        None => None,
        Some(Ok(text)) if acceptable(&text) || text.trim().is_empty() => None,
        Some(Ok(text)) => Some(text),
        Some(Err(_)) => Some("(not readable)".to_string()),
    };
    if let Some(text) = refused {
        let err = ApiError::NotAcceptable {
            detail: format!(
                "Accept: {text} admits none of the types this service answers with: {}",
                PRODUCED.join(", ")
            ),
        };
        return Ok(req
            .into_response(err.error_response())
            .map_into_right_body());
    }
    Ok(next.call(req).await?.map_into_left_body())
}

#[cfg(test)]
mod tests {
    use super::acceptable;

    #[test]
    fn common_accept_headers() {
        assert!(acceptable("*/*"));
        assert!(acceptable("application/json"));
        assert!(acceptable(
            "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8"
        ));
        assert!(acceptable("application/*"));
        assert!(acceptable("text/csv"));
        assert!(!acceptable("text/html"));
        assert!(!acceptable("application/xml"));
        assert!(!acceptable("application/json;q=0"));
    }
}
