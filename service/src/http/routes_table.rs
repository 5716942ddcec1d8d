//! Which methods each known path answers, read once from the OpenAPI
//! document (itself generated from the registrations in
//! [`crate::http::routes`]), so the fallback can tell "no such path"
//! (404) from "this path, another method" (405 with `Allow`, RFC 9110
//! §15.5.6).

use std::sync::OnceLock;

/// One path template (`/v1/friction-entries/{id}`) and its methods.
#[derive(Debug)]
struct Route {
    segments: Vec<Segment>,
    methods: Vec<&'static str>,
}

#[derive(Debug)]
enum Segment {
    Literal(String),
    Parameter,
}

/// Every method name the document can use, in the order `Allow` lists them.
const METHODS: [&str; 8] = [
    "GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS", "TRACE",
];

fn table() -> &'static [Route] {
    static TABLE: OnceLock<Vec<Route>> = OnceLock::new();
    TABLE.get_or_init(|| {
        let doc = super::openapi::document();
        let mut routes: Vec<Route> = doc
            .paths
            .paths
            .iter()
            .map(|(template, item)| {
                let value = serde_json::to_value(item).unwrap_or_default();
                let methods = METHODS
                    .iter()
                    .copied()
                    .filter(|m| value.get(m.to_ascii_lowercase()).is_some())
                    .collect();
                Route {
                    segments: split(template),
                    methods,
                }
            })
            .collect();
        // Served beside the document, not part of it.
        routes.push(Route {
            segments: split("/openapi.json"),
            methods: vec!["GET"],
        });
        routes
    })
}

fn split(template: &str) -> Vec<Segment> {
    template
        .trim_matches('/')
        .split('/')
        .map(|s| {
            if s.starts_with('{') && s.ends_with('}') {
                Segment::Parameter
            } else {
                Segment::Literal(s.to_string())
            }
        })
        .collect()
}

/// The methods `path` answers, or `None` when no route has this path.
/// When several templates match (`/v1/friction-tests/evaluate` and
/// `/v1/friction-tests/{id}`), the one with the fewest parameters wins, as
/// the literal path is what the client named.
pub fn allowed_methods(path: &str) -> Option<Vec<&'static str>> {
    let parts: Vec<&str> = path.trim_matches('/').split('/').collect();
    let mut best: Option<(usize, Vec<&'static str>)> = None;
    for route in table() {
        let fits = route.segments.len() == parts.len()
            && route.segments.iter().zip(&parts).all(|(s, p)| match s {
                Segment::Literal(l) => l == p,
                Segment::Parameter => !p.is_empty(),
            });
        if !fits {
            continue;
        }
        let params = route
            .segments
            .iter()
            .filter(|s| matches!(s, Segment::Parameter))
            .count();
        match &mut best {
            Some((n, methods)) if *n == params => methods.extend(route.methods.iter().copied()),
            Some((n, _)) if *n < params => {}
            _ => best = Some((params, route.methods.clone())),
        }
    }
    let found = best?.1;
    let mut allowed: Vec<&'static str> = METHODS
        .iter()
        .copied()
        .filter(|m| found.contains(m))
        .collect();
    allowed.dedup();
    Some(allowed)
}

#[cfg(test)]
mod tests {
    use super::allowed_methods;

    #[test]
    fn known_paths_list_their_methods() {
        assert_eq!(
            allowed_methods("/v1/tightening-specs/batch"),
            Some(vec!["POST"])
        );
        assert_eq!(
            allowed_methods("/v1/friction-entries/7"),
            Some(vec!["GET", "PUT", "DELETE"])
        );
        assert_eq!(allowed_methods("/openapi.json"), Some(vec!["GET"]));
        assert_eq!(
            allowed_methods("/v1/friction-tests/evaluate"),
            Some(vec!["POST"])
        );
        assert_eq!(allowed_methods("/v1/friction-tests/3"), Some(vec!["GET"]));
        assert_eq!(allowed_methods("/v1/nothing-here"), None);
        assert_eq!(allowed_methods("/v1/friction-entries/7/x/y"), None);
    }
}
