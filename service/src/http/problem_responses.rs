//! The problem responses every route shares, defined once under
//! `components/responses` and referenced from each operation of the
//! OpenAPI document by one rule set, so no route can forget a status it
//! can answer:
//!
//! - every operation: 406 (the `Accept` header admits none of its types)
//!   and 503 (also when the request outlives `--request-timeout-secs`);
//! - an operation with parameters or a body: 400 (unreadable value,
//!   unknown query parameter) and 422 (well-formed but invalid input);
//! - an operation with a body: 408 (not received within
//!   `--body-read-timeout-secs`), 413 (over the limit) and 415 (not JSON);
//! - every `/v1/` operation and `/metrics`: 401 and 403 (a token is
//!   checked whenever one is sent, and reads need one when anonymous reads
//!   are off) and 503 (checking a token, or writing, needs the database);
//!   a `/v1/` operation with parameters or a body also 404 (unknown name,
//!   id or revision);
//! - a write (an operation with a security requirement): 409 (conflicts
//!   with the current catalogue);
//! - an operation taking `If-Match`: 412 (stale) and 428 (missing).
//!
//! 405 (another method on a known path, with `Allow`) concerns no single
//! operation; its shared response is defined here for reference and the
//! document's description says when it is answered. Route-specific
//! descriptions written in a `#[utoipa::path]` stay (a route writes only
//! its status and description, e.g. `(status = 404, description = "No
//! such entry")`); the rules give every error response without a body the
//! problem body (`application/problem+json`, schema `Problem`) and add
//! the shared responses a route did not describe.

use utoipa::openapi::path::{Operation, ParameterIn};
use utoipa::openapi::{ContentBuilder, OpenApi, Ref, RefOr, ResponseBuilder};

use super::problem::PROBLEM_JSON;

/// Status, component name and description of each shared response.
const SHARED: [(u16, &str, &str); 14] = [
    (400, "BadRequest", "Malformed request: a value cannot be read, or an unknown query parameter or body field (named in `errors`)"),
    (401, "Unauthorized", "No token where one is needed, or the token is malformed, unknown, revoked or expired"),
    (403, "Forbidden", "The token's role may not do this"),
    (404, "NotFound", "Unknown resource, name or revision; nearest known names in `errors[].suggestions`"),
    (405, "MethodNotAllowed", "The path exists but not with this method; the `Allow` header lists the methods it answers"),
    (406, "NotAcceptable", "The `Accept` header admits none of the types this route answers with"),
    (408, "RequestTimeout", "The body was not received completely within the body-read deadline; the connection is closed"),
    (409, "Conflict", "The change conflicts with the current catalogue"),
    (412, "PreconditionFailed", "`If-Match` is stale; the current state is in `current`"),
    (413, "PayloadTooLarge", "The body is larger than the configured limit (stated in `detail`)"),
    (415, "UnsupportedMediaType", "The body is not JSON (send `Content-Type: application/json`)"),
    (422, "UnprocessableContent", "Well-formed but invalid input; every problem listed in `errors`"),
    (428, "PreconditionRequired", "`If-Match` is missing; send the ETag from a GET of this resource"),
    (503, "ServiceUnavailable", "The database is unavailable, or the request outlived its deadline; retry after `Retry-After` seconds"),
];

/// Adds the shared responses to `components/responses` and references them
/// from every operation by the rules above.
pub struct ProblemResponses;

impl utoipa::Modify for ProblemResponses {
    fn modify(&self, openapi: &mut OpenApi) {
        let components = openapi.components.get_or_insert_with(Default::default);
        for (_, name, description) in SHARED {
            let content = ContentBuilder::new()
                .schema(Some(Ref::from_schema_name("Problem")))
                .build();
            let response = ResponseBuilder::new()
                .description(description)
                .content(PROBLEM_JSON, content)
                .build();
            components
                .responses
                .insert(name.to_string(), RefOr::T(response));
        }
        for (path, item) in openapi.paths.paths.iter_mut() {
            let operations = [
                &mut item.get,
                &mut item.put,
                &mut item.post,
                &mut item.delete,
                &mut item.patch,
            ];
            for op in operations.into_iter().flatten() {
                give_problem_bodies(op);
                for status in statuses(path, op) {
                    add(op, status);
                }
            }
        }
    }
}

/// The shared statuses `op` on `path` can answer.
fn statuses(path: &str, op: &Operation) -> Vec<u16> {
    let params = op.parameters.as_deref().unwrap_or_default();
    let has_input = !params.is_empty() || op.request_body.is_some();
    let versioned = path.starts_with("/v1/");
    let mut out = vec![406, 503];
    if has_input {
        out.extend([400, 422]);
    }
    if op.request_body.is_some() {
        out.extend([408, 413, 415]);
    }
    if versioned || path == "/metrics" {
        out.extend([401, 403]);
    }
    if versioned && has_input {
        out.push(404);
    }
    if op.security.as_ref().is_some_and(|s| !s.is_empty()) {
        out.push(409);
    }
    let if_match = params
        .iter()
        .any(|p| p.parameter_in == ParameterIn::Header && p.name.eq_ignore_ascii_case("if-match"));
    if if_match {
        out.extend([412, 428]);
    }
    out.sort_unstable();
    out
}

/// The problem body for every error response (4xx, 5xx) an operation
/// describes itself without content.
fn give_problem_bodies(op: &mut Operation) {
    for (status, response) in op.responses.responses.iter_mut() {
        let is_error = status.starts_with('4') || status.starts_with('5');
        if let (true, RefOr::T(response)) = (is_error, response) {
            if response.content.is_empty() {
                let content = ContentBuilder::new()
                    .schema(Some(Ref::from_schema_name("Problem")))
                    .build();
                response.content.insert(PROBLEM_JSON.to_string(), content);
            }
        }
    }
}

fn add(op: &mut Operation, status: u16) {
    let Some((_, name, _)) = SHARED.iter().find(|(s, _, _)| *s == status) else {
        return;
    };
    let key = status.to_string();
    if op.responses.responses.contains_key(&key) {
        return;
    }
    op.responses.responses.insert(
        key,
        RefOr::Ref(Ref::new(format!("#/components/responses/{name}"))),
    );
}

#[cfg(test)]
mod tests {
    fn statuses_of(path: &str, method: &str) -> Vec<String> {
        let doc = serde_json::to_value(crate::http::openapi::document()).expect("json");
        let responses = doc["paths"][path][method]["responses"]
            .as_object()
            .expect("responses");
        responses.keys().cloned().collect()
    }

    #[test]
    fn routes_state_the_shared_statuses() {
        let put = statuses_of("/v1/friction-entries/{id}", "put");
        for s in [
            "400", "401", "403", "404", "406", "408", "409", "412", "413", "415", "422", "428",
            "503",
        ] {
            assert!(put.contains(&s.to_string()), "PUT entry lacks {s}: {put:?}");
        }
        let health = statuses_of("/healthz", "get");
        assert!(health.contains(&"406".to_string()));
        assert!(health.contains(&"503".to_string()), "request deadline");
        assert!(!health.contains(&"401".to_string()));
        assert!(!health.contains(&"408".to_string()), "no body");
        let spec = statuses_of("/v1/tightening-specs", "get");
        for s in ["400", "401", "403", "404", "406", "422", "503"] {
            assert!(
                spec.contains(&s.to_string()),
                "GET spec lacks {s}: {spec:?}"
            );
        }
    }

    #[test]
    fn every_error_response_is_a_problem() {
        let doc = serde_json::to_value(crate::http::openapi::document()).expect("json");
        let mut checked = 0;
        for (path, item) in doc["paths"].as_object().expect("paths") {
            for (method, op) in item.as_object().expect("path item") {
                for (status, response) in op["responses"].as_object().expect("responses") {
                    let error = status.starts_with('4') || status.starts_with('5');
                    // `/readyz` answers 503 with its readiness checks, not a problem.
                    let readiness = path == "/readyz" && status == "503";
                    if !error || readiness || response.get("$ref").is_some() {
                        continue;
                    }
                    let schema = &response["content"]["application/problem+json"]["schema"]["$ref"];
                    assert_eq!(
                        schema, "#/components/schemas/Problem",
                        "{method} {path} {status} is not a problem response"
                    );
                    checked += 1;
                }
            }
        }
        assert!(
            checked > 50,
            "route-specific error responses checked: {checked}"
        );
    }

    #[test]
    fn spec_body_names_its_friction_source() {
        let doc = serde_json::to_value(crate::http::openapi::document()).expect("json");
        let ways = &doc["components"]["schemas"]["SpecRequest"]["allOf"][1]["anyOf"];
        let required: Vec<&serde_json::Value> = ways
            .as_array()
            .expect("anyOf")
            .iter()
            .map(|w| &w["required"])
            .collect();
        assert_eq!(
            required,
            [
                &serde_json::json!(["finish", "lubricant"]),
                &serde_json::json!(["thread_friction", "bearing_friction"])
            ]
        );
    }
}
