//! Error handlers for actix's JSON, query and path extractors, so that
//! every deserialisation failure becomes a problem response naming the
//! field: 400 for unreadable input and unknown query parameters, 413 for
//! bodies over the limit (stated), 415 for a wrong media type.
//!
//! Query structs use `#[serde(deny_unknown_fields)]`; serde then reports
//! "unknown field `thred`, expected one of `thread`, ...", which is turned
//! into a 400 naming `thred` and suggesting `thread`.

use actix_web::error::{JsonPayloadError, PathError, QueryPayloadError};
use actix_web::{web, HttpRequest};

use super::error::{ApiError, FieldError};

/// JSON body extractor settings with the body limit and our error handler.
pub fn json_config(limit_bytes: usize) -> web::JsonConfig {
    web::JsonConfig::default()
        .limit(limit_bytes)
        .error_handler(move |err, _req: &HttpRequest| json_error(err, limit_bytes).into())
}

/// Query-string extractor settings with our error handler.
pub fn query_config() -> web::QueryConfig {
    web::QueryConfig::default()
        .error_handler(|err, req: &HttpRequest| query_error_in(err, req.query_string()).into())
}

/// Path-segment extractor settings with our error handler. A segment that
/// does not parse may be a literal path asked with another method
/// (`GET /v1/friction-tests/evaluate` reaches `/v1/friction-tests/{id}`):
/// that is 405 with `Allow`, not a bad id.
pub fn path_config() -> web::PathConfig {
    web::PathConfig::default().error_handler(|err, req: &HttpRequest| {
        let method = req.method().as_str();
        match super::routes_table::allowed_methods(req.path()) {
            Some(allowed) if !allowed.contains(&method) => ApiError::MethodNotAllowed {
                method: method.to_string(),
                allowed,
            }
            .into(),
            _ => path_error(err).into(),
        }
    })
}

/// Body-size limit for raw `web::Bytes`/`String` bodies.
pub fn payload_config(limit_bytes: usize) -> web::PayloadConfig {
    web::PayloadConfig::new(limit_bytes)
}

pub fn json_error(err: JsonPayloadError, limit_bytes: usize) -> ApiError {
    match err {
        JsonPayloadError::Overflow { limit }
        | JsonPayloadError::OverflowKnownLength { limit, .. } => {
            ApiError::PayloadTooLarge { limit_bytes: limit }
        }
        JsonPayloadError::ContentType => ApiError::UnsupportedMediaType {
            detail: "the request body must be JSON: send Content-Type: application/json".into(),
        },
        JsonPayloadError::Deserialize(e) => {
            let message = e.to_string();
            let field = field_in_message(&message).unwrap_or_else(|| "body".to_string());
            ApiError::malformed(field, message)
        }
        JsonPayloadError::Payload(e) => payload_error(e, limit_bytes),
        other => ApiError::malformed("body", other.to_string()),
    }
}

fn payload_error(e: actix_web::error::PayloadError, limit_bytes: usize) -> ApiError {
    if matches!(e, actix_web::error::PayloadError::Overflow) {
        ApiError::PayloadTooLarge { limit_bytes }
    } else if super::deadline::is_body_timeout(&e) {
        ApiError::RequestTimeout {
            detail: e.to_string(),
        }
    } else {
        ApiError::malformed("body", format!("could not read the body: {e}"))
    }
}

/// A raw body read whole, with the same problems as a JSON body: over
/// `limit_bytes` is 413, not received within the body-read deadline is 408
/// (`web::Bytes` would answer actix's own plain-text errors instead).
pub async fn body_bytes(
    mut payload: web::Payload,
    limit_bytes: usize,
) -> Result<web::Bytes, ApiError> {
    use futures_util::StreamExt;
    let mut body = web::BytesMut::new();
    while let Some(chunk) = payload.next().await {
        let chunk = chunk.map_err(|e| payload_error(e, limit_bytes))?;
        if body.len() + chunk.len() > limit_bytes {
            return Err(ApiError::PayloadTooLarge { limit_bytes });
        }
        body.extend_from_slice(&chunk);
    }
    Ok(body.freeze())
}

/// [`query_error`], naming the parameter whose value serde refused when
/// the message quotes the value (e.g. "unknown variant `imperial`").
pub fn query_error_in(err: QueryPayloadError, query: &str) -> ApiError {
    let api = query_error(err);
    let ApiError::Malformed { detail, mut errors } = api else {
        return api;
    };
    if let Some(e) = errors.first_mut().filter(|e| e.field == "query") {
        let quoted = backticked(&e.reason);
        let pairs: Vec<(String, String)> = serde_urlencoded::from_str(query).unwrap_or_default();
        let named = pairs
            .into_iter()
            .find(|(_, v)| quoted.first() == Some(v))
            .map(|(k, _)| k);
        if let Some(name) = named {
            e.field = name;
        }
    }
    ApiError::Malformed { detail, errors }
}

/// Query-string extractor used by every handler in place of `web::Query`:
/// the same `serde_urlencoded` reading, but a refused value names its
/// parameter (serde's own message for, say, a bad number names none), so the
/// problem says `thread_friction: invalid float literal`, not `query`.
pub struct Query<T>(pub T);

impl<T> Query<T> {
    pub fn into_inner(self) -> T {
        self.0
    }
}

impl<T> std::ops::Deref for Query<T> {
    type Target = T;
    fn deref(&self) -> &T {
        &self.0
    }
}

impl<T: serde::de::DeserializeOwned> actix_web::FromRequest for Query<T> {
    type Error = ApiError;
    type Future = std::future::Ready<Result<Self, ApiError>>;

    fn from_request(req: &HttpRequest, _: &mut actix_web::dev::Payload) -> Self::Future {
        std::future::ready(parse_query(req.query_string()).map(Query))
    }
}

/// Reads a query string into `T`, naming the parameter of any refused value.
pub fn parse_query<T: serde::de::DeserializeOwned>(query: &str) -> Result<T, ApiError> {
    let pairs = serde_urlencoded::Deserializer::new(form_urlencoded::parse(query.as_bytes()));
    serde_path_to_error::deserialize(pairs).map_err(|e| {
        let path = e.path().to_string();
        let mut api = query_error_in(QueryPayloadError::Deserialize(e.into_inner()), query);
        if let ApiError::Malformed { errors, .. } = &mut api {
            if let Some(first) = errors.first_mut().filter(|f| f.field == "query") {
                if path != "." && !path.is_empty() {
                    first.field = path;
                }
            }
        }
        api
    })
}

pub fn query_error(err: QueryPayloadError) -> ApiError {
    let message = match err {
        QueryPayloadError::Deserialize(e) => e.to_string(),
        other => other.to_string(),
    };
    if let Some(rest) = message.strip_prefix("unknown field `") {
        let name = rest.split('`').next().unwrap_or_default().to_string();
        let expected = backticked(rest.split_once("expected").map(|x| x.1).unwrap_or(""));
        return ApiError::UnknownParameter {
            suggestions: suggest(&name, &expected),
            name,
        };
    }
    let field = field_in_message(&message).unwrap_or_else(|| "query".to_string());
    ApiError::Malformed {
        detail: format!("the query string cannot be read: {message}"),
        errors: vec![FieldError::new(field, message)],
    }
}

pub fn path_error(err: PathError) -> ApiError {
    let message = match err {
        PathError::Deserialize(e) => e.to_string(),
        other => other.to_string(),
    };
    ApiError::malformed("path", message)
}

/// The field a serde message names: "missing field `thread`",
/// "unknown field `thred`, ...", "unknown variant `x`" (no field), ...
fn field_in_message(message: &str) -> Option<String> {
    for lead in ["missing field `", "unknown field `", "duplicate field `"] {
        if let Some(rest) = message.split(lead).nth(1) {
            return rest.split('`').next().map(str::to_owned);
        }
    }
    None
}

/// All names written in backticks.
fn backticked(text: &str) -> Vec<String> {
    text.split('`')
        .enumerate()
        .filter(|(i, _)| i % 2 == 1)
        .map(|(_, s)| s.to_string())
        .collect()
}

pub use crate::app::reading::integral;
use crate::app::reading::suggest;

#[cfg(test)]
mod tests {
    use super::*;
    use serde::Deserialize;

    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    #[allow(dead_code)]
    struct Q {
        thread: String,
        property_class: Option<String>,
    }

    #[test]
    fn unknown_query_parameter_is_named_with_suggestion() {
        let err = serde_urlencoded::from_str::<Q>("thred=M10").expect_err("unknown field");
        let api = query_error(QueryPayloadError::Deserialize(err));
        let p = api.problem();
        assert_eq!(p.status, 400);
        assert_eq!(p.errors[0].field, "thred");
        assert_eq!(p.errors[0].suggestions, vec!["thread"]);
    }

    #[test]
    fn missing_field_is_named() {
        let err = serde_urlencoded::from_str::<Q>("property_class=8.8").expect_err("missing");
        let p = query_error(QueryPayloadError::Deserialize(err)).problem();
        assert_eq!(p.errors[0].field, "thread");
    }

    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    #[allow(dead_code)]
    struct U {
        units: Option<crate::app::quantity::Units>,
    }

    #[test]
    fn refused_value_names_its_parameter() {
        let err = serde_urlencoded::from_str::<U>("units=imperial").expect_err("bad variant");
        let p = query_error_in(QueryPayloadError::Deserialize(err), "units=imperial").problem();
        assert_eq!(p.errors[0].field, "units");
        assert!(p.errors[0].reason.contains("imperial"));
    }

    #[derive(Debug, Deserialize)]
    #[serde(deny_unknown_fields)]
    #[allow(dead_code)]
    struct N {
        thread: String,
        thread_friction: Option<f64>,
        catalogue_revision: Option<i64>,
    }

    #[test]
    fn refused_number_names_its_parameter() {
        let p = parse_query::<N>("thread=M10&thread_friction=abc")
            .expect_err("not a number")
            .problem();
        assert_eq!(p.status, 400);
        assert_eq!(p.errors[0].field, "thread_friction");
        let p = parse_query::<N>("thread=M10&catalogue_revision=1.5")
            .expect_err("not an integer")
            .problem();
        assert_eq!(p.errors[0].field, "catalogue_revision");
        let p = parse_query::<N>("thred=M10")
            .expect_err("unknown")
            .problem();
        assert_eq!(p.errors[0].field, "thred");
        let ok = parse_query::<N>("thread=M10&thread_friction=0.12").expect("valid");
        assert_eq!(ok.thread_friction, Some(0.12));
    }

    #[test]
    fn json_unknown_field_is_named() {
        let err = serde_json::from_str::<Q>(r#"{"thread":"M10","grade":"8.8"}"#).expect_err("x");
        let p = json_error(JsonPayloadError::Deserialize(err), 10).problem();
        assert_eq!(p.status, 400);
        assert_eq!(p.errors[0].field, "grade");
    }
}
