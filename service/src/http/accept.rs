//! Content negotiation, per route: `/metrics` answers `text/plain`, the
//! catalogue export `application/json` or `text/csv`, the charts (`*.svg`)
//! `image/svg+xml`, `/` a redirect to the page for `text/html`, the page
//! (`/ui/`) `text/html` (its assets CSS and JavaScript), every other route
//! `application/json`. A request whose `Accept` header admits none of its
//! route's types gets 406 (RFC 9110 §15.5.7) as a problem (error bodies are
//! always `application/problem+json`, RFC 9110 §12.1 lets a server send
//! an error in a type the client did not ask for); no `Accept` header
//! means anything.

use actix_web::body::MessageBody;
use actix_web::dev::{ServiceRequest, ServiceResponse};
use actix_web::http::header::ACCEPT;
use actix_web::middleware::Next;
use actix_web::ResponseError;

use super::error::ApiError;

/// The media types a successful answer on `path` can have.
pub fn produced(path: &str) -> &'static [&'static str] {
    match path {
        "/metrics" => &["text/plain"],
        "/v1/catalogue/export" | "/v1/joints/export" => &["application/json", "text/csv"],
        // `/` answers a browser with a redirect to the page (`root`).
        "/" => &["application/json", "text/html"],
        p if p.ends_with(".svg") => &["image/svg+xml"],
        "/ui/assets/ui.css" => &["text/css"],
        "/ui/assets/ui.js" => &["text/javascript"],
        p if p == "/ui" || p.starts_with("/ui/") => &["text/html"],
        _ => &["application/json"],
    }
}

/// Whether an `Accept` header value admits one of `produced`.
pub fn acceptable(accept: &str, produced: &[&str]) -> bool {
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
            Some(kind) => produced.iter().any(|p| p.starts_with(&format!("{kind}/"))),
            None => produced.contains(&media.as_str()),
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
    let produced = produced(req.path());
    let refused = match header {
        None => None,
        Some(Ok(text)) if acceptable(&text, produced) || text.trim().is_empty() => None,
        Some(Ok(text)) => Some(text),
        Some(Err(_)) => Some("(not readable)".to_string()),
    };
    if let Some(text) = refused {
        let err = ApiError::NotAcceptable {
            detail: format!(
                "Accept: {text} admits none of the types this route answers with: {}",
                produced.join(", ")
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
    use super::{acceptable, produced};

    #[test]
    fn common_accept_headers() {
        let json = produced("/v1/tightening-specs");
        assert!(acceptable("*/*", json));
        assert!(acceptable("application/json", json));
        assert!(acceptable(
            "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8",
            json
        ));
        assert!(acceptable("application/*", json));
        assert!(!acceptable("text/csv", json));
        assert!(!acceptable("text/*", json));
        assert!(!acceptable("text/html", json));
        assert!(!acceptable("application/xml", json));
        assert!(!acceptable("application/json;q=0", json));
        assert!(acceptable("text/csv", produced("/v1/catalogue/export")));
        assert!(acceptable("text/*", produced("/metrics")));
        assert!(!acceptable("application/json", produced("/metrics")));
    }
}
