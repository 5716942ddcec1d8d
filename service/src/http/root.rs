//! `/` for a browser: a `GET` or `HEAD` of `/` whose `Accept` names
//! `text/html` (or `application/xhtml+xml`) with a weight above zero is
//! sent on to the engineer's page with 303 See Other (RFC 9110 §15.4.4).
//! Every other request of `/` is answered as before (the fallback's 404
//! problem), so JSON clients see no change.

use actix_web::http::header::{ACCEPT, LOCATION};
use actix_web::http::Method;
use actix_web::{HttpRequest, HttpResponse};

/// Where a browser asking for `/` is sent.
pub const PAGE: &str = "/ui/";

/// True when an `Accept` value names an HTML type with q > 0.
pub fn wants_html(accept: &str) -> bool {
    accept.split(',').any(|range| {
        let mut parts = range.split(';');
        let media = parts.next().unwrap_or("").trim().to_ascii_lowercase();
        let refused = parts.any(|p| {
            p.trim()
                .strip_prefix("q=")
                .and_then(|q| q.trim().parse::<f64>().ok())
                .is_some_and(|q| q <= 0.0)
        });
        !refused && (media == "text/html" || media == "application/xhtml+xml")
    })
}

/// The redirect for a browser asking for `/`, or `None`.
pub fn browser_redirect(req: &HttpRequest) -> Option<HttpResponse> {
    if req.path() != "/" || !(req.method() == Method::GET || req.method() == Method::HEAD) {
        return None;
    }
    let accept = req.headers().get(ACCEPT)?.to_str().ok()?;
    wants_html(accept).then(|| {
        HttpResponse::SeeOther()
            .insert_header((LOCATION, PAGE))
            .finish()
    })
}

#[cfg(test)]
mod tests {
    use super::wants_html;

    #[test]
    fn browsers_want_html_and_json_clients_do_not() {
        assert!(wants_html(
            "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8"
        ));
        assert!(wants_html("application/xhtml+xml"));
        assert!(!wants_html("application/json"));
        assert!(!wants_html("*/*"));
        assert!(!wants_html("text/html;q=0, application/json"));
        assert!(!wants_html(""));
    }
}
