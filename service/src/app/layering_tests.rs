//! The edges this layer removed stay removed: read from the `use` lines and
//! paths of the source files (`http` uses no `config`; the catalogue and
//! token subcommands use neither `http` nor the store; `http` never opens
//! the store).

use std::path::{Path, PathBuf};

fn sources(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            sources(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs") {
            out.push(path);
        }
    }
}

fn src() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("src")
}

/// Every line of the files under `dir` that holds `needle`, as `file:line`.
fn lines_with(dir: &Path, needle: &str) -> Vec<String> {
    let mut files = Vec::new();
    sources(dir, &mut files);
    if dir.is_file() {
        files.push(dir.to_path_buf());
    }
    assert!(!files.is_empty(), "no source files under {}", dir.display());
    let mut found = Vec::new();
    for f in files {
        let text = std::fs::read_to_string(&f).unwrap_or_default();
        for (n, line) in text.lines().enumerate() {
            if line.contains(needle) {
                found.push(format!("{}:{}", f.display(), n + 1));
            }
        }
    }
    found
}

#[test]
fn http_uses_no_config() {
    let found = lines_with(&src().join("http"), "crate::config");
    assert!(found.is_empty(), "http uses config: {found:?}");
}

#[test]
fn catalogue_and_token_subcommands_call_the_app_only() {
    for file in ["cli/catalogue.rs", "cli/token.rs"] {
        let path = src().join(file);
        for needle in ["crate::http", "Store::open", "store::Store"] {
            let found = lines_with(&path, needle);
            assert!(found.is_empty(), "{file} uses {needle}: {found:?}");
        }
    }
}

#[test]
fn http_never_opens_the_store() {
    let found = lines_with(&src().join("http"), "Store::open");
    assert!(found.is_empty(), "http opens the store: {found:?}");
}

#[test]
fn the_search_finds_what_it_looks_for() {
    // The checks above would pass on an empty or unread tree: make sure the
    // walk reads files and finds a line known to be there.
    let found = lines_with(&src().join("app"), "pub struct App {");
    assert!(found.iter().any(|f| f.contains("context.rs")), "{found:?}");
}
