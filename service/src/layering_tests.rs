//! The import graph of the crate's top-level modules, read from the source
//! text of every non-test file: which module names which (`crate::x`, or
//! `super::` chains that climb to the crate root). The graph must be the
//! one DEVELOPERS.md draws: no circles, `http` and `cli` never name each
//! other, and only `app` names the engine among the adapters' layers.

use std::collections::{BTreeMap, BTreeSet};
use std::path::{Path, PathBuf};

/// Who may use whom (the arrows of DEVELOPERS.md "Architecture").
const ALLOWED: &[(&str, &[&str])] = &[
    ("engine", &[]),
    ("catalogue", &[]),
    ("config", &[]),
    ("chart", &[]),
    ("registry", &["catalogue"]),
    ("store", &["catalogue", "registry"]),
    (
        "app",
        &["engine", "catalogue", "registry", "store", "chart"],
    ),
    ("http", &["app", "catalogue"]),
    ("cli", &["app", "catalogue", "config", "startup"]),
    ("ui", &["app", "catalogue"]),
    ("startup", &["app", "config", "http", "ui"]),
];

/// Files that are tests (whole files) and are left out of the graph.
fn is_test_file(path: &Path) -> bool {
    let name = path.file_name().and_then(|n| n.to_str()).unwrap_or("");
    name == "tests.rs"
        || name.ends_with("_tests.rs")
        || path.components().any(|c| c.as_os_str() == "tests")
}

fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            rust_files(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs") && !is_test_file(&path) {
            out.push(path);
        }
    }
}

/// The module path of a file relative to `src/` (`http/specs/batch.rs` →
/// `["http", "specs", "batch"]`; `mod.rs` names its directory).
fn module_path(rel: &Path) -> Vec<String> {
    let mut parts: Vec<String> = rel
        .iter()
        .map(|c| c.to_string_lossy().trim_end_matches(".rs").to_string())
        .collect();
    if parts.last().is_some_and(|p| p == "mod") {
        parts.pop();
    }
    parts
}

/// The code of a file without `//` comments and without its trailing
/// `#[cfg(test)] mod tests { … }` block.
fn code_of(text: &str) -> String {
    let body = match text.find("#[cfg(test)]\nmod tests {") {
        Some(at) => &text[..at],
        None => text,
    };
    body.lines()
        .map(|l| match l.find("//") {
            Some(at) => &l[..at],
            None => l,
        })
        .collect::<Vec<_>>()
        .join("\n")
}

/// The top-level modules a file's code names.
fn named_modules(code: &str, here: &[String]) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    let bytes = code.as_bytes();
    let ident = |from: usize| -> String {
        code[from..]
            .chars()
            .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
            .collect()
    };
    for (at, _) in code.match_indices("crate::") {
        if at > 0 && (bytes[at - 1].is_ascii_alphanumeric() || bytes[at - 1] == b'_') {
            continue;
        }
        out.insert(ident(at + "crate::".len()));
    }
    let mut at = 0;
    while let Some(found) = code[at..].find("super::") {
        let start = at + found;
        let mut end = start;
        let mut depth = 0;
        while code[end..].starts_with("super::") {
            depth += 1;
            end += "super::".len();
        }
        let preceded = start > 0
            && (bytes[start - 1].is_ascii_alphanumeric()
                || bytes[start - 1] == b'_'
                || bytes[start - 1] == b':');
        // A file's own module is `here`; `super` is its parent.
        if !preceded && depth == here.len() {
            out.insert(ident(end));
        }
        at = end;
    }
    out.retain(|m| !m.is_empty());
    out
}

fn graph() -> BTreeMap<String, BTreeSet<String>> {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
    let mut files = Vec::new();
    rust_files(&src, &mut files);
    let tops: BTreeSet<&str> = ALLOWED.iter().map(|(m, _)| *m).collect();
    let mut edges: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
    for file in files {
        let rel = file.strip_prefix(&src).expect("under src");
        let here = module_path(rel);
        let Some(top) = here.first().filter(|t| tops.contains(t.as_str())) else {
            continue;
        };
        let text = std::fs::read_to_string(&file).expect("readable source");
        for used in named_modules(&code_of(&text), &here) {
            if &used != top && tops.contains(used.as_str()) {
                edges.entry(top.clone()).or_default().insert(used);
            }
        }
    }
    edges
}

#[test]
fn every_edge_is_one_the_architecture_allows() {
    let allowed: BTreeMap<&str, &[&str]> = ALLOWED.iter().copied().collect();
    let graph = graph();
    // The walk must have read the tree: the adapters' edges to `app` exist.
    for adapter in ["http", "cli", "startup"] {
        assert!(
            graph.get(adapter).is_some_and(|to| to.contains("app")),
            "{adapter} → app not found: {graph:?}"
        );
    }
    let mut wrong = Vec::new();
    for (from, tos) in graph {
        for to in tos {
            if !allowed[from.as_str()].contains(&to.as_str()) {
                wrong.push(format!("{from} → {to}"));
            }
        }
    }
    assert!(
        wrong.is_empty(),
        "edges the layering does not allow: {wrong:?}"
    );
}

#[test]
fn the_import_graph_has_no_circles() {
    let edges = graph();
    // Depth-first search from every module, bounded by the module count.
    fn reaches(
        edges: &BTreeMap<String, BTreeSet<String>>,
        from: &str,
        to: &str,
        depth: usize,
    ) -> bool {
        depth > 0
            && edges.get(from).is_some_and(|next| {
                next.iter()
                    .any(|n| n == to || reaches(edges, n, to, depth - 1))
            })
    }
    let circles: Vec<&String> = edges
        .keys()
        .filter(|m| reaches(&edges, m, m, ALLOWED.len()))
        .collect();
    assert!(
        circles.is_empty(),
        "modules on an import circle: {circles:?}"
    );
}

#[test]
fn the_reader_sees_super_chains_and_crate_paths() {
    let here = ["http".to_string(), "specs".to_string(), "batch".to_string()];
    let code = "use super::super::error::ApiError;\nuse super::super::super::engine::x;\nuse crate::store::Store; // crate::cli";
    let named = named_modules(&code_of(code), &here);
    assert_eq!(
        named.into_iter().collect::<Vec<_>>(),
        ["engine", "store"],
        "super³ from http/specs/batch is the crate root; comments are not code"
    );
}
