//! `tightspec spec`: the spec use case from the shell. The flags are the
//! query parameters of `GET /v1/tightening-specs` (with `-` for `_`, the
//! same declaration flattened), read by the same parse step, computed by
//! the same use case and rendered from the same view: a readable table by default,
//! the API's JSON with `--json`.
//!
//! The catalogue is the service's: the configured database
//! (`--database-url` / `DATABASE_URL`, default the embedded SQLite store),
//! or with `--builtin-catalogue` the built-in seed catalogue (what a fresh database holds)
//! without touching any database.

use std::fmt::Write as _;

use clap::Args;

use crate::app::quantity::Quantity;
use crate::app::spec::snapshot::{snapshot, CatalogueSource};
use crate::app::spec::view::{error_count, spec_response, SpecResponse};
use crate::app::spec::{compute_one, SpecQuery};
use crate::app::{AppError, ProblemClass};

/// Flags of `tightspec spec`: the `GET /v1/tightening-specs` parameters
/// (declared once, in `app::spec::request`) and the command's own three.
#[derive(Debug, Clone, Args)]
pub struct SpecArgs {
    #[command(flatten)]
    pub query: SpecQuery,
    /// Print the API's JSON instead of the table.
    #[arg(long)]
    pub json: bool,
    /// Use the built-in seed catalogue (what a fresh database holds), no database.
    #[arg(long)]
    pub builtin_catalogue: bool,
    /// `postgres://…` or `sqlite://path`; default: the embedded SQLite store.
    #[arg(long, env = "DATABASE_URL")]
    pub database_url: Option<String>,
}

/// The status the API answers the same refusal with, so that the shell and
/// the API read alike.
fn status(class: ProblemClass) -> u16 {
    match class {
        ProblemClass::Malformed => 400,
        ProblemClass::Unknown => 404,
        ProblemClass::Invalid => 422,
    }
}

/// A refusal as lines a person reads: every field problem with its
/// suggestions, or the one sentence of any other error.
pub fn problems_text(e: &AppError) -> String {
    let problems = e.problems();
    if problems.is_empty() {
        return e.to_string();
    }
    let class = AppError::class(problems);
    let mut out = format!("the request was refused ({}):", status(class));
    for p in problems {
        let _ = write!(out, "\n  {}: {}", p.field, p.reason);
        if !p.suggestions.is_empty() {
            let _ = write!(out, " (did you mean: {})", p.suggestions.join(", "));
        }
    }
    out
}

/// Runs `tightspec spec`; returns the text to print.
pub async fn run(args: &SpecArgs) -> Result<String, String> {
    let refused = |e: AppError| problems_text(&e);
    let request = args
        .query
        .to_request()
        .map_err(|p| refused(AppError::Fields(p)))?;
    let source = if args.builtin_catalogue {
        CatalogueSource::Builtin
    } else {
        CatalogueSource::Database(args.database_url.clone())
    };
    let snapshot = snapshot(&source, request.catalogue_revision)
        .await
        .map_err(refused)?;
    let (resolved, spec) = compute_one(&request, &snapshot).map_err(refused)?;
    let response = spec_response(&spec, &resolved, false);
    if args.json {
        serde_json::to_string_pretty(&response)
            .map(|mut s| {
                s.push('\n');
                s
            })
            .map_err(|e| e.to_string())
    } else {
        Ok(table(&response))
    }
}

fn q(v: &Quantity, decimals: usize) -> String {
    format!("{:.*} {}", decimals, v.value, v.unit)
}

/// Forces in kN (SI) or lbf (US), with sensible precision.
fn force(v: &Quantity) -> String {
    if v.unit == "N" {
        format!("{:.2} kN", v.value / 1000.0)
    } else {
        q(v, 0)
    }
}

/// The readable table.
pub fn table(s: &SpecResponse) -> String {
    let mut o = String::new();
    let t = &s.fastener.thread;
    let g = &s.fastener.property_class;
    let _ = writeln!(
        o,
        "Tightening specification: {} {} ({})",
        t.designation, g.id, g.standard
    );
    let _ = writeln!(o, "{}", "-".repeat(72));
    // Before the window, where it cannot be missed.
    let errors = error_count(&s.checks);
    if errors > 0 {
        let _ = writeln!(
            o,
            "!!! {errors} error check{} — do not use these values (see Checks below)",
            if errors == 1 { "" } else { "s" }
        );
        for c in s.checks.iter().filter(|c| c.is_error()) {
            let _ = writeln!(o, "!!! {}", c.code);
        }
        let _ = writeln!(o, "{}", "-".repeat(72));
    }
    let _ = writeln!(
        o,
        "Torque      lower {:<14} target {:<14} upper {}",
        q(&s.torque.lower, 2),
        q(&s.torque.target, 2),
        q(&s.torque.upper, 2)
    );
    if s.torque.role == "monitoring" {
        let _ = writeln!(
            o,
            "            a monitoring band, not the setting ({} sets the preload)",
            s.method.name
        );
    }
    let _ = writeln!(
        o,
        "Preload     min {:<16} max {:<17} F_M,zul {}",
        force(&s.preload.min),
        force(&s.preload.max),
        force(&s.preload.permissible)
    );
    if s.angle.computed {
        if let (Some(min), Some(max)) = (&s.angle.min, &s.angle.max) {
            let snug = s
                .angle
                .snug_torque
                .as_ref()
                .map(|v| q(v, 2))
                .unwrap_or_default();
            let _ = writeln!(
                o,
                "Angle       {:.1}° to {:.1}° from snug torque {snug} ({}){}",
                min.value,
                max.value,
                s.angle.snug_torque_source.unwrap_or(""),
                s.angle
                    .at_yield
                    .as_ref()
                    .map(|a| format!("; the bolt may yield from {:.1}°", a.value))
                    .unwrap_or_default()
            );
        }
    } else {
        let _ = writeln!(
            o,
            "Angle       not computed: {}",
            s.angle.reason.as_deref().unwrap_or("")
        );
    }
    let _ = writeln!(
        o,
        "Tightening factor α_A {:.2}   ({})",
        s.tightening_factor, s.governing
    );
    let _ = writeln!(
        o,
        "Method      {} ({}), tool scatter ±{:.1} % ({})",
        s.method.name,
        s.method.id,
        s.method.tool_scatter * 100.0,
        s.method.tool_scatter_source
    );
    let f = &s.friction;
    let _ = writeln!(
        o,
        "Friction    thread μ {:.3}–{:.3} ({}), bearing μ {:.3}–{:.3} ({}), catalogue revision {}",
        f.thread.min,
        f.thread.max,
        f.thread.origin,
        f.bearing.min,
        f.bearing.max,
        f.bearing.origin,
        f.catalogue_revision
    );
    let b = &s.fastener.bearing;
    let _ = writeln!(
        o,
        "Fastener    A_s {}, proof load {}, bearing d_w {} / d_h {}",
        q(&s.fastener.stress_area, 2),
        force(&s.fastener.proof_load),
        q(&b.outer_diameter, 2),
        q(&b.inner_diameter, 2)
    );
    let lo = &s.figures.at_min_friction;
    let hi = &s.figures.at_max_friction;
    let _ = writeln!(
        o,
        "Nut factor  K {:.3} to {:.3}; share making preload {:.0} % to {:.0} %",
        lo.nut_factor,
        hi.nut_factor,
        hi.torque_split.pitch * 100.0,
        lo.torque_split.pitch * 100.0
    );
    if let Some(c) = &s.clamp_load {
        let _ = writeln!(
            o,
            "Clamp load  required {}, lowest clamp load {}{}: {}",
            force(&c.required),
            force(&c.achieved_min),
            c.embedding_loss
                .as_ref()
                .map(|l| format!(" (after embedding loss {})", force(l)))
                .unwrap_or_default(),
            if c.met { "met" } else { "NOT met" }
        );
    }
    if let Some(j) = &s.joint {
        joint_table::lines(j, &mut o);
    }
    if !s.checks.is_empty() {
        let _ = writeln!(o, "\nChecks");
        for c in &s.checks {
            let _ = writeln!(o, "  [{}] {}: {}", c.severity, c.code, c.message);
        }
    }
    let _ = writeln!(o, "\nAssumptions");
    for a in &s.assumptions {
        let _ = writeln!(o, "  - {a}");
    }
    let _ = writeln!(o, "\nCautions");
    for c in s.cautions.texts() {
        let _ = writeln!(o, "  ! {c}");
    }
    let _ = writeln!(o, "\nspec hash {}", s.spec_hash);
    o
}

mod joint_table;
#[cfg(test)]
mod parameters;
#[cfg(test)]
mod tests;
