//! Edges the application layer removed stay removed, read from the source:
//! nothing in `app` uses `http` or `cli`; `cli/spec.rs` uses neither `http`
//! nor the engine; `cli/friction*` uses neither `http`, the engine nor the
//! store; `http/specs/` and `http/friction_tests/` do not call the engine
//! (the use cases do); `http` uses no `config` and never opens the store;
//! the catalogue and token subcommands use neither `http` nor the store.

use std::path::{Path, PathBuf};

fn src() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("src")
}

/// Every `.rs` file below `dir` but this one (which names what it looks
/// for).
fn rust_files(dir: &Path, out: &mut Vec<PathBuf>) {
    let entries = std::fs::read_dir(dir).expect("source folder readable");
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            rust_files(&path, out);
        } else if path.extension().is_some_and(|e| e == "rs")
            && !path.ends_with(file!().rsplit('/').next().unwrap_or_default())
        {
            out.push(path);
        }
    }
}

/// The files of `paths` (files or folders under `src/`) naming any of
/// `forbidden` in code (comments skipped).
fn offenders(paths: &[&str], forbidden: &[&str]) -> Vec<String> {
    let mut files = Vec::new();
    for p in paths {
        let path = src().join(p);
        if path.is_dir() {
            rust_files(&path, &mut files);
        } else {
            files.push(path);
        }
    }
    assert!(!files.is_empty(), "no files under {paths:?}");
    let mut out = Vec::new();
    for f in files {
        let text = std::fs::read_to_string(&f).expect("source file readable");
        for (n, line) in text.lines().enumerate() {
            let code = line.split("//").next().unwrap_or("");
            if forbidden.iter().any(|name| code.contains(name)) {
                out.push(format!("{}:{}: {}", f.display(), n + 1, line.trim()));
            }
        }
    }
    out
}

#[test]
fn app_uses_no_adapter() {
    let found = offenders(&["app"], &["crate::http", "crate::cli", "tightspec::http"]);
    assert!(found.is_empty(), "{found:#?}");
}

#[test]
fn the_spec_command_uses_only_the_application_layer() {
    let found = offenders(
        &["cli/spec.rs", "cli/spec"],
        &["crate::http", "crate::engine", "crate::store"],
    );
    assert!(found.is_empty(), "{found:#?}");
}

#[test]
fn the_spec_handlers_leave_the_engine_to_the_use_cases() {
    let found = offenders(&["http/specs"], &["crate::engine"]);
    assert!(found.is_empty(), "{found:#?}");
}

#[test]
fn http_uses_no_config_and_opens_no_store() {
    let found = offenders(&["http"], &["crate::config", "Store::open"]);
    assert!(found.is_empty(), "{found:#?}");
}

#[test]
fn catalogue_and_token_subcommands_call_the_app_only() {
    let found = offenders(
        &["cli/catalogue.rs", "cli/token.rs"],
        &["crate::http", "Store::open", "store::Store"],
    );
    assert!(found.is_empty(), "{found:#?}");
}

#[test]
fn the_search_finds_what_it_looks_for() {
    // The checks above would pass on an unread tree: the walk must find a
    // line known to be there.
    let found = offenders(&["app"], &["pub struct App {"]);
    assert!(found.iter().any(|f| f.contains("context.rs")), "{found:?}");
}

#[test]
fn the_friction_adapters_leave_the_engine_to_the_use_cases() {
    let cli = offenders(
        &["cli/friction.rs", "cli/friction"],
        &["crate::http", "crate::engine", "crate::store"],
    );
    assert!(cli.is_empty(), "{cli:#?}");
    let http = offenders(&["http/friction_tests"], &["crate::engine", "crate::store"]);
    assert!(http.is_empty(), "{http:#?}");
}
