//! `tightspec catalogue import|export` and `tightspec migrate` on the
//! configured database, through the application's catalogue use cases.

use std::io::Write;
use std::path::PathBuf;

use crate::app::catalogue::{CatalogueExport, Imported};
use crate::app::{App, AppError, FieldProblem};
use crate::catalogue::exchange;

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
    let app = App::open(database_url).await?;
    let head = app.head().await?;
    writeln!(
        out,
        "{} database migrated; catalogue revision {head}",
        app.backend()
    )?;
    app.close().await;
    Ok(())
}

pub async fn run(
    cmd: &CatalogueCommand,
    database_url: Option<&str>,
    out: &mut dyn Write,
) -> CliResult {
    let app = App::open(database_url).await?;
    let result = run_on(&app, cmd, out).await;
    app.close().await;
    result
}

/// Why an import was rejected: every problem, one per line.
#[derive(Debug, thiserror::Error)]
#[error("import rejected, nothing written:\n{}", .0.iter().map(|p| format!("  {}: {}", p.field, p.reason)).collect::<Vec<_>>().join("\n"))]
pub struct ImportRejected(pub Vec<FieldProblem>);

pub async fn run_on(app: &App, cmd: &CatalogueCommand, out: &mut dyn Write) -> CliResult {
    match cmd {
        CatalogueCommand::Export { format, revision } => {
            match app
                .export(*revision, (format == "csv").then_some(false))
                .await?
            {
                CatalogueExport::Csv { text, .. } => write!(out, "{text}")?,
                CatalogueExport::Json(snapshot) => writeln!(
                    out,
                    "{}",
                    serde_json::to_string_pretty(&exchange::export(&snapshot))?
                )?,
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
            let actor = actor.clone().unwrap_or_else(default_actor);
            let evidence = format!("import:{}", file.display());
            let imported = app
                .import(&text, is_csv, &actor, reason.as_deref(), &evidence)
                .await
                .map_err(|e| match e {
                    AppError::Fields(problems) => ImportRejected(problems).into(),
                    other => Box::<dyn std::error::Error + Send + Sync>::from(other),
                })?;
            match imported {
                Imported::Unchanged { revision } => writeln!(
                    out,
                    "the file matches catalogue revision {revision}; nothing to import"
                )?,
                Imported::Applied { changes, revision } => writeln!(
                    out,
                    "imported {changes} change(s) as catalogue revision {revision}"
                )?,
            }
        }
    }
    Ok(())
}
