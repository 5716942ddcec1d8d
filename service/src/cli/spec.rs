//! `tightspec spec`: the spec endpoint's computation from the shell. The
//! flags are the query parameters of `GET /v1/tightening-specs` (with `-`
//! for `_`), read by the same parse step, computed by the same engine call
//! and rendered from the same wire response: a readable table by default,
//! the API's JSON with `--json`.
//!
//! The catalogue is the service's: the configured database
//! (`--database-url` / `DATABASE_URL`, default the embedded SQLite store),
//! or with `--builtin-catalogue` the built-in seed catalogue (revision 1)
//! without touching any database.

use std::fmt::Write as _;
use std::sync::Arc;

use clap::Args;

use crate::catalogue::Snapshot;
use crate::engine::bearing::{HeadType, HoleSeries, Washer};
use crate::http::quantity::{Quantity, Units};
use crate::http::specs::checks::error_count;
use crate::http::specs::request::SpecQuery;
use crate::http::specs::response::{spec_response, SpecResponse};
use crate::http::specs::{compute_one, ItemErrors};
use crate::store::Store;

/// Flags of `tightspec spec` (the `GET /v1/tightening-specs` parameters).
/// Help text listing every value of a `--head`, `--washer` or `--hole`
/// option (the same lists `/v1/bearing-types` serves).
fn choices<T: Copy>(what: &str, all: &[T], id: fn(T) -> &'static str) -> String {
    let ids: Vec<&str> = all.iter().map(|v| id(*v)).collect();
    format!("{what}: {} (see GET /v1/bearing-types)", ids.join(", "))
}

#[derive(Debug, Clone, Args)]
pub struct SpecArgs {
    /// Thread designation, e.g. M10, M10x1.25, "1/2-13 UNC".
    #[arg(long)]
    pub thread: String,
    /// Property class or grade, e.g. 8.8, 10.9, A2-70, sae-j429-5.
    #[arg(long)]
    pub property_class: String,
    /// Finish id from the friction catalogue.
    #[arg(long)]
    pub finish: Option<String>,
    /// Lubricant id from the friction catalogue.
    #[arg(long)]
    pub lubricant: Option<String>,
    /// One thread friction value μ_G (replaces the catalogue's).
    #[arg(long)]
    pub thread_friction: Option<f64>,
    #[arg(long)]
    pub thread_friction_min: Option<f64>,
    #[arg(long)]
    pub thread_friction_max: Option<f64>,
    /// One bearing friction value μ_K (replaces the catalogue's).
    #[arg(long)]
    pub bearing_friction: Option<f64>,
    #[arg(long)]
    pub bearing_friction_min: Option<f64>,
    #[arg(long)]
    pub bearing_friction_max: Option<f64>,
    /// Tightening method id (click-wrench, dc-nutrunner, torque-angle, ...).
    #[arg(long)]
    pub tightening_method: Option<String>,
    /// Tool scatter as a fraction (0.05 = ±5 %).
    #[arg(long)]
    pub tool_scatter: Option<f64>,
    #[arg(long, help = choices("Head type", HeadType::ALL, HeadType::id))]
    pub head: Option<String>,
    #[arg(long, help = choices("Washer", Washer::ALL, Washer::id))]
    pub washer: Option<String>,
    #[arg(long, help = choices("Clearance-hole series", HoleSeries::ALL, HoleSeries::id))]
    pub hole: Option<String>,
    /// Explicit outer bearing diameter with unit, e.g. 16.6mm.
    #[arg(long)]
    pub bearing_outer_diameter: Option<String>,
    /// Explicit inner bearing diameter with unit, e.g. 11mm.
    #[arg(long)]
    pub bearing_inner_diameter: Option<String>,
    /// Utilisation ν of the minimum yield strength (default 0.9).
    #[arg(long)]
    pub utilisation: Option<f64>,
    /// With unit, e.g. 2N·m.
    #[arg(long)]
    pub prevailing_torque: Option<String>,
    /// With unit, e.g. 40mm.
    #[arg(long)]
    pub clamp_length: Option<String>,
    #[arg(long)]
    pub clamped_material: Option<String>,
    /// With unit, e.g. 30mm.
    #[arg(long)]
    pub joint_outer_diameter: Option<String>,
    /// through-bolted (default) or tapped-hole.
    #[arg(long)]
    pub joint_type: Option<String>,
    /// With unit, e.g. 15mm.
    #[arg(long)]
    pub engagement_length: Option<String>,
    /// With unit, e.g. 15kN.
    #[arg(long)]
    pub required_clamp_load: Option<String>,
    /// maximum-preload (default) or minimum-clamp-load.
    #[arg(long)]
    pub window_mode: Option<String>,
    /// With unit, e.g. 10N·m.
    #[arg(long)]
    pub snug_torque: Option<String>,
    /// si (default) or us.
    #[arg(long, value_parser = parse_units)]
    pub units: Option<Units>,
    /// Catalogue revision to answer from (default: current).
    #[arg(long)]
    pub catalogue_revision: Option<i64>,
    /// Print the API's JSON instead of the table.
    #[arg(long)]
    pub json: bool,
    /// Use the built-in seed catalogue (revision 1), no database.
    #[arg(long)]
    pub builtin_catalogue: bool,
    /// `postgres://…` or `sqlite://path`; default: the embedded SQLite store.
    #[arg(long, env = "DATABASE_URL")]
    pub database_url: Option<String>,
}

fn parse_units(s: &str) -> Result<Units, String> {
    match s {
        "si" => Ok(Units::Si),
        "us" => Ok(Units::Us),
        other => Err(format!("'{other}' is not a unit system; use si or us")),
    }
}

impl SpecArgs {
    fn query(&self) -> SpecQuery {
        SpecQuery {
            thread: self.thread.clone(),
            property_class: self.property_class.clone(),
            finish: self.finish.clone(),
            lubricant: self.lubricant.clone(),
            thread_friction: self.thread_friction,
            thread_friction_min: self.thread_friction_min,
            thread_friction_max: self.thread_friction_max,
            bearing_friction: self.bearing_friction,
            bearing_friction_min: self.bearing_friction_min,
            bearing_friction_max: self.bearing_friction_max,
            tightening_method: self.tightening_method.clone(),
            tool_scatter: self.tool_scatter,
            head: self.head.clone(),
            washer: self.washer.clone(),
            hole: self.hole.clone(),
            bearing_outer_diameter: self.bearing_outer_diameter.clone(),
            bearing_inner_diameter: self.bearing_inner_diameter.clone(),
            utilisation: self.utilisation,
            prevailing_torque: self.prevailing_torque.clone(),
            clamp_length: self.clamp_length.clone(),
            clamped_material: self.clamped_material.clone(),
            joint_outer_diameter: self.joint_outer_diameter.clone(),
            joint_type: self.joint_type.clone(),
            engagement_length: self.engagement_length.clone(),
            required_clamp_load: self.required_clamp_load.clone(),
            window_mode: self.window_mode.clone(),
            snug_torque: self.snug_torque.clone(),
            units: self.units,
            catalogue_revision: self.catalogue_revision,
        }
    }
}

/// The catalogue snapshot the command answers from.
async fn snapshot(args: &SpecArgs) -> Result<Arc<Snapshot>, String> {
    if args.builtin_catalogue {
        let seed = Snapshot::seed();
        return match args.catalogue_revision {
            None => Ok(Arc::new(seed)),
            Some(r) if r == seed.revision => Ok(Arc::new(seed)),
            Some(r) => Err(format!(
                "catalogue_revision: the built-in catalogue is revision {}, not {r}",
                seed.revision
            )),
        };
    }
    let store = Store::open(args.database_url.as_deref())
        .await
        .map_err(|e| e.to_string())?;
    let snap = match args.catalogue_revision {
        None => store.load_current().await,
        Some(r) => store.load_at(r).await,
    };
    snap.map(Arc::new).map_err(|e| e.to_string())
}

/// Problems as lines a person reads.
pub fn problems_text(e: &ItemErrors) -> String {
    let mut out = format!("the request was refused ({}):", e.class().status());
    for p in &e.0 {
        let _ = write!(out, "\n  {}: {}", p.field, p.reason);
        if !p.suggestions.is_empty() {
            let _ = write!(out, " (did you mean: {})", p.suggestions.join(", "));
        }
    }
    out
}

/// Runs `tightspec spec`; returns the text to print.
pub async fn run(args: &SpecArgs) -> Result<String, String> {
    let request = args
        .query()
        .to_request()
        .map_err(|e| problems_text(&ItemErrors(e)))?;
    let snapshot = snapshot(args).await?;
    let (resolved, spec) = compute_one(&request, &snapshot).map_err(|e| problems_text(&e))?;
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
                "Angle       {:.0}° to {:.0}° from snug torque {snug} ({})",
                min.value,
                max.value,
                s.angle.snug_torque_source.unwrap_or("")
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
            "Clamp load  required {}, lowest preload {}: {}",
            force(&c.required),
            force(&c.achieved_min),
            if c.met { "met" } else { "NOT met" }
        );
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

#[cfg(test)]
mod tests;
