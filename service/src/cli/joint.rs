//! `tightspec joint list|show|release|approve|withdraw|import|export`: the joint
//! registry on the configured database, through the same use cases as the
//! API (`app::joints`, `app::releases`), so the same rules hold: a release
//! is refused while an error check applies that is not accepted by code
//! with a reason; under the four-eyes rule (`--four-eyes` or
//! `TIGHTSPEC_FOUR_EYES`) a release starts as a draft and the person who
//! requested it may not approve it. The command line has no tokens: who
//! acts is named with `--by` and recorded, and whoever can run it on the
//! database holds every role.

use std::io::Write;

use serde_json::{json, Value};

use super::joint_release::Releasing;
use crate::app::joints::{JointQuery, JointView};
use crate::app::joints_bulk::{csv_form, export_json, ImportReport};
use crate::app::releases::view::ReleaseView;
use crate::app::{App, AppError};

pub type CliResult = Result<(), Box<dyn std::error::Error + Send + Sync>>;

#[derive(Debug, Clone, clap::Args)]
pub struct JointArgs {
    /// The four-eyes rule: a release is a draft until someone else
    /// approves it.
    #[arg(
        long,
        env = "TIGHTSPEC_FOUR_EYES",
        default_value_t = false,
        action = clap::ArgAction::Set
    )]
    pub four_eyes: bool,
    /// Print the API's JSON instead of lines.
    #[arg(long, global = true)]
    pub json: bool,
    #[command(subcommand)]
    pub command: JointCommand,
}

#[derive(Debug, Clone, clap::Subcommand)]
pub enum JointCommand {
    /// List joints in id order, a page at a time.
    List {
        /// Only joints carrying this tag.
        #[arg(long)]
        tag: Option<String>,
        /// Only joints with a release at this status (draft, released,
        /// superseded, withdrawn).
        #[arg(long)]
        status: Option<String>,
        /// Only joints whose review is due.
        #[arg(long)]
        review_due: bool,
        /// Joints per page, 1–500 (default 50).
        #[arg(long)]
        limit: Option<u32>,
        /// List the joints after this id (the `next` of the previous page).
        #[arg(long)]
        after: Option<String>,
    },
    /// Show a joint and its releases.
    Show {
        /// The joint's id.
        id: String,
    },
    /// Release a joint: compute and freeze its spec and setpoints at the
    /// current catalogue revision. Several ids, or `--tag`, release every
    /// one of them at once, all or nothing (at most 1,000).
    Release {
        /// The joint's id (or several).
        #[arg(required_unless_present = "tag", conflicts_with = "tag")]
        ids: Vec<String>,
        /// Release every joint carrying this tag instead.
        #[arg(long)]
        tag: Option<String>,
        /// Who releases (recorded).
        #[arg(long)]
        by: String,
        /// Why (recorded).
        #[arg(long)]
        reason: String,
        /// An error check accepted, as `CODE=REASON` (repeat for each).
        #[arg(long = "accept", value_name = "CODE=REASON")]
        accept: Vec<String>,
    },
    /// Approve a draft release (four-eyes rule: not the requester).
    Approve {
        id: String,
        /// The release number.
        release: i64,
        #[arg(long)]
        by: String,
        #[arg(long)]
        reason: String,
    },
    /// Import joint definitions from a JSON file (`{"joints": [...]}`,
    /// as `joint export` writes it) or a CSV file (`.csv`, the columns of
    /// `GET /v1/joints/export?format=csv`): all rows or none.
    Import {
        /// The file; read as CSV when its name ends in `.csv`.
        file: std::path::PathBuf,
        /// Who imports (recorded).
        #[arg(long)]
        by: String,
        /// Why (recorded in each joint's history; replaces a JSON file's).
        #[arg(long)]
        reason: Option<String>,
    },
    /// Write every joint's definition (or those with `--tag`) to stdout.
    Export {
        /// `json` (default) or `csv`.
        #[arg(long, default_value = "json", value_parser = ["json", "csv"])]
        format: String,
        /// CSV only: start with a UTF-8 byte order mark (spreadsheets).
        #[arg(long)]
        bom: bool,
        /// Only joints carrying this tag.
        #[arg(long)]
        tag: Option<String>,
    },
    /// Withdraw a draft or the active release.
    Withdraw {
        id: String,
        /// The release number.
        release: i64,
        #[arg(long)]
        by: String,
        #[arg(long)]
        reason: String,
    },
}

/// A refusal as lines: the detail, then each field and its reason.
pub(super) fn refusal(e: AppError) -> String {
    let mut lines = vec![e.to_string()];
    for p in e.problems() {
        let near = if p.suggestions.is_empty() {
            String::new()
        } else {
            format!(" (did you mean {}?)", p.suggestions.join(", "))
        };
        lines.push(format!("  {}: {}{near}", p.field, p.reason));
    }
    lines.join("\n")
}

pub(super) fn release_line(r: &ReleaseView) -> String {
    let approved = r
        .approved_by
        .as_deref()
        .map(|a| format!(", approved by {a}"))
        .unwrap_or_default();
    format!(
        "{} release {}  {:<10} catalogue revision {}  spec hash {}  by {}{approved}  {}",
        r.joint_id,
        r.release,
        r.status,
        r.catalogue_revision,
        r.spec_hash.get(..16).unwrap_or(&r.spec_hash),
        r.requested_by,
        r.reason
    )
}

fn joint_line(j: &JointView) -> String {
    let review = j
        .review_due
        .as_ref()
        .map(|r| format!("  review due (catalogue revision {})", r.revision))
        .unwrap_or_default();
    format!(
        "{:<24} v{}  {}  [{}]{review}",
        j.id,
        j.version,
        j.title,
        j.tags.join(", ")
    )
}

pub async fn run(args: &JointArgs, database_url: Option<&str>, out: &mut dyn Write) -> CliResult {
    let app = App::open(database_url)
        .await?
        .with_four_eyes(args.four_eyes);
    let result = run_on(&app, args, out).await;
    app.close().await;
    result
}

pub async fn run_on(app: &App, args: &JointArgs, out: &mut dyn Write) -> CliResult {
    let print_release = |out: &mut dyn Write, r: ReleaseView| -> CliResult {
        if args.json {
            writeln!(out, "{}", serde_json::to_string_pretty(&r)?)?;
        } else {
            writeln!(out, "{}", release_line(&r))?;
        }
        Ok(())
    };
    match &args.command {
        JointCommand::List {
            tag,
            status,
            review_due,
            limit,
            after,
        } => {
            let page = app
                .joints(&JointQuery {
                    tag: tag.clone(),
                    status: status.clone(),
                    review_due: *review_due,
                    limit: *limit,
                    after: after.clone(),
                })
                .await
                .map_err(refusal)?;
            let views: Vec<JointView> = page.joints.iter().map(JointView::from).collect();
            if args.json {
                let list = json!({"joints": views, "next": page.next});
                writeln!(out, "{}", serde_json::to_string_pretty(&list)?)?;
            } else {
                if views.is_empty() {
                    writeln!(out, "no joints")?;
                }
                for j in &views {
                    writeln!(out, "{}", joint_line(j))?;
                }
                if let Some(next) = page.next {
                    writeln!(out, "more: --after {next}")?;
                }
            }
        }
        JointCommand::Show { id } => {
            let joint = JointView::from(&app.joint(id).await.map_err(refusal)?);
            let releases: Vec<ReleaseView> = app
                .releases(id)
                .await
                .map_err(refusal)?
                .iter()
                .map(|r| ReleaseView::of(r, None))
                .collect();
            if args.json {
                let both = json!({"joint": joint, "releases": releases});
                writeln!(out, "{}", serde_json::to_string_pretty(&both)?)?;
            } else {
                writeln!(out, "{}", joint_line(&joint))?;
                if releases.is_empty() {
                    writeln!(out, "  no releases")?;
                }
                for r in &releases {
                    writeln!(out, "  {}", release_line(r))?;
                }
            }
        }
        JointCommand::Release {
            ids,
            tag,
            by,
            reason,
            accept,
        } => {
            let who = Releasing { by, reason, accept };
            super::joint_release::release(app, args.json, ids, tag.as_deref(), &who, out).await?;
        }
        JointCommand::Approve {
            id,
            release,
            by,
            reason,
        } => {
            let body = json!({ "reason": reason });
            let r = app
                .approve_release(by, id, *release, &body)
                .await
                .map_err(refusal)?;
            print_release(out, ReleaseView::of(&r, None))?;
        }
        JointCommand::Withdraw {
            id,
            release,
            by,
            reason,
        } => {
            let body = json!({ "reason": reason });
            let r = app
                .withdraw_release(by, id, *release, &body)
                .await
                .map_err(refusal)?;
            print_release(out, ReleaseView::of(&r, None))?;
        }
        JointCommand::Import { file, by, reason } => {
            let report = import(app, file, by, reason.as_deref()).await?;
            if args.json {
                writeln!(out, "{}", serde_json::to_string_pretty(&report)?)?;
            } else {
                let c = &report.counts;
                writeln!(
                    out,
                    "created {}, updated {}, unchanged {}",
                    c.created, c.updated, c.unchanged
                )?;
                for (what, ids) in [("created", &report.created), ("updated", &report.updated)] {
                    for id in ids {
                        writeln!(out, "  {what} {id}")?;
                    }
                }
            }
        }
        JointCommand::Export { format, bom, tag } => {
            let defs = app.export_joints(tag.as_deref()).await.map_err(refusal)?;
            if format == "csv" {
                write!(
                    out,
                    "{}",
                    csv_form::export_csv(&defs, *bom).map_err(refusal)?
                )?;
            } else {
                writeln!(
                    out,
                    "{}",
                    serde_json::to_string_pretty(&export_json(&defs))?
                )?;
            }
        }
    }
    Ok(())
}

/// Largest import file read, as the API's default body limit.
const IMPORT_FILE_MAX: u64 = crate::config::DEFAULT_MAX_BODY_BYTES as u64;

async fn import(
    app: &App,
    file: &std::path::Path,
    by: &str,
    reason: Option<&str>,
) -> Result<ImportReport, Box<dyn std::error::Error + Send + Sync>> {
    let size = std::fs::metadata(file)?.len();
    if size > IMPORT_FILE_MAX {
        return Err(format!(
            "{}: {size} bytes, at most {IMPORT_FILE_MAX}",
            file.display()
        )
        .into());
    }
    let text = std::fs::read_to_string(file)?;
    let csv = file
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("csv"));
    let report = if csv {
        app.import_joints_csv(by, &text, reason).await
    } else {
        let mut body: Value = serde_json::from_str(text.trim_start_matches('\u{feff}'))
            .map_err(|e| format!("{}: not JSON: {e}", file.display()))?;
        if let (Some(r), Some(obj)) = (reason, body.as_object_mut()) {
            obj.insert("reason".into(), json!(r));
        }
        app.import_joints_json(by, &body).await
    };
    Ok(report.map_err(refusal)?)
}
