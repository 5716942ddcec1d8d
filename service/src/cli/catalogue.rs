//! `tightspec catalogue import|export` and `tightspec migrate`, directly on
//! the configured database.

use std::io::Write;
use std::path::PathBuf;

use crate::catalogue::{exchange, CatalogueError, ChangeSet};
use crate::store::{Store, StoreError};

pub use super::token::CliResult;

#[derive(Debug, Clone, clap::Subcommand)]
pub enum CatalogueCommand {
    /// Validate a whole file (JSON as exported, or CSV of friction entries)
    /// and apply it as one revision, or reject it whole listing every error.
    Import {
        /// The file; `.csv` is read as CSV, anything else as JSON.
        file: PathBuf,
        /// Why (recorded in history). Required unless the JSON file has a `reason`.
        #[arg(long)]
        reason: Option<String>,
        /// Author recorded in history (default `cli:$USER`).
        #[arg(long)]
        actor: Option<String>,
    },
    /// Print the catalogue (current, or at `--revision`) as JSON or CSV.
    Export {
        #[arg(long, default_value = "json", value_parser = ["json", "csv"])]
        format: String,
        #[arg(long)]
        revision: Option<i64>,
    },
}

fn default_actor() -> String {
    let user = std::env::var("USER").unwrap_or_else(|_| "unknown".into());
    format!("cli:{user}")
}

/// `tightspec migrate`: applies pending migrations and seeds an empty
/// catalogue.
pub async fn migrate(database_url: Option<&str>, out: &mut dyn Write) -> CliResult {
    let store = Store::open(database_url).await?;
    let head = store.head().await?;
    writeln!(
        out,
        "{} database migrated; catalogue revision {head}",
        store.backend()
    )?;
    store.close().await;
    Ok(())
}

pub async fn run(
    cmd: &CatalogueCommand,
    database_url: Option<&str>,
    out: &mut dyn Write,
) -> CliResult {
    let store = Store::open(database_url).await?;
    let result = run_on(&store, cmd, out).await;
    store.close().await;
    result
}

/// Why an import was rejected: every problem, one per line.
#[derive(Debug, thiserror::Error)]
#[error("import rejected, nothing written:\n{}", .0.iter().map(|p| format!("  {}: {}", p.field, p.reason)).collect::<Vec<_>>().join("\n"))]
pub struct ImportRejected(pub Vec<crate::catalogue::ChangeProblem>);

pub async fn run_on(store: &Store, cmd: &CatalogueCommand, out: &mut dyn Write) -> CliResult {
    match cmd {
        CatalogueCommand::Export { format, revision } => {
            let snapshot = match revision {
                Some(r) => store.load_at(*r).await?,
                None => store.load_current().await?,
            };
            if format == "csv" {
                let evidence = store.entry_evidence(&snapshot).await?;
                let options = exchange::CsvOptions {
                    bom: false,
                    evidence: Some(&evidence),
                };
                write!(out, "{}", exchange::to_csv_with(&snapshot, &options)?)?;
            } else {
                writeln!(
                    out,
                    "{}",
                    serde_json::to_string_pretty(&exchange::export(&snapshot))?
                )?;
            }
        }
        CatalogueCommand::Import {
            file,
            reason,
            actor,
        } => {
            let text =
                std::fs::read_to_string(file).map_err(|e| format!("{}: {e}", file.display()))?;
            let is_csv = file
                .extension()
                .is_some_and(|x| x.eq_ignore_ascii_case("csv"));
            let parsed = if is_csv {
                exchange::parse_csv(&text)
            } else {
                exchange::parse_json(&text)
            };
            let parsed = parsed.map_err(ImportRejected)?;
            let current = store.load_current().await?;
            let items = exchange::changes_for(&current, &parsed);
            if items.is_empty() {
                writeln!(
                    out,
                    "the file matches catalogue revision {}; nothing to import",
                    current.revision
                )?;
                return Ok(());
            }
            let set = ChangeSet {
                actor: actor.clone().unwrap_or_else(default_actor),
                reason: reason.clone().or(parsed.reason.clone()).unwrap_or_default(),
                evidence: Some(format!("import:{}", file.display())),
                items,
            };
            match store.apply(&set).await {
                Ok(applied) => {
                    writeln!(
                        out,
                        "imported {} change(s) as catalogue revision {}",
                        applied.records.len(),
                        applied.snapshot.revision
                    )?;
                }
                Err(StoreError::Catalogue(
                    e @ (CatalogueError::Invalid { .. } | CatalogueError::NotFound { .. }),
                )) => {
                    return Err(ImportRejected(e.problems()).into());
                }
                Err(e) => return Err(e.into()),
            }
        }
    }
    Ok(())
}
