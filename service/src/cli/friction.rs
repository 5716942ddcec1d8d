//! `tightspec friction evaluate FILE.csv`: evaluate a torque–tension test
//! series from a CSV file and print the table (or `--json`, the answer of
//! `POST /v1/friction-tests/evaluate`). It calls the same use case
//! (`app::friction_tests::evaluate`) as the HTTP endpoint.
//!
//! CSV layout: one header row, then one row per specimen, in test order.
//! Columns (the unit in square brackets is required in the header):
//! - `clamp_force [kN]` (or `[N]`, `[lbf]`): clamp force at the evaluation point;
//! - `total_torque [N·m]` (or `[N*m]`, `[Nm]`, `[lbf·in]`, `[lbf·ft]`): wrench torque;
//! - `thread_torque [N·m]` (optional column; an empty cell means not measured).
//!
//! Example:
//! ```text
//! clamp_force [kN],total_torque [N·m],thread_torque [N·m]
//! 25.3,47.1,21.4
//! 25.3,49.8,
//! ```

use std::path::PathBuf;

use crate::app::friction_tests;
use crate::app::friction_tests::wire::{BearingRequest, EvaluationResponse, SeriesRequest};
use crate::app::quantity::{Quantity, Units};
use crate::app::AppError;

/// `tightspec friction ...`
#[derive(Debug, Clone, clap::Subcommand)]
pub enum FrictionCommand {
    /// Evaluate a test series from a CSV file (ISO 16047 method).
    ///
    /// The CSV has one header row, then one row per specimen in test order.
    /// Columns, each with its unit in square brackets: `clamp_force [kN]`
    /// (or N, lbf), `total_torque [N·m]` (or N*m, Nm, lbf·in, lbf·ft) and,
    /// optionally, `thread_torque [N·m]` (an empty cell: not measured).
    /// Without a thread-torque reading a row is a shop-form record (total
    /// friction only); with --thrust-bearing the torque is thread torque.
    Evaluate(EvaluateArgs),
}

#[derive(Debug, Clone, clap::Args)]
pub struct EvaluateArgs {
    /// CSV file: header `clamp_force [kN],total_torque [N·m][,thread_torque [N·m]]`.
    pub file: PathBuf,
    /// Thread designation, e.g. M10 or "3/4-10 UNC".
    #[arg(long)]
    pub thread: String,
    /// Property class of the tested bolts, e.g. 8.8.
    #[arg(long)]
    pub property_class: Option<String>,
    /// Catalogue finish id (reported only).
    #[arg(long)]
    pub finish: Option<String>,
    /// Catalogue lubricant id (reported only).
    #[arg(long)]
    pub lubricant: Option<String>,
    /// Head type, e.g. hexagon-head (default when no bearing diameters are given).
    #[arg(long)]
    pub head: Option<String>,
    /// Washer: none or plain.
    #[arg(long)]
    pub washer: Option<String>,
    /// Clearance hole series: fine, medium or coarse.
    #[arg(long)]
    pub hole: Option<String>,
    /// Outer bearing diameter with unit, e.g. "16 mm" (with --bearing-inner).
    #[arg(long, requires = "bearing_inner")]
    pub bearing_outer: Option<String>,
    /// Inner bearing diameter with unit, e.g. "10.5 mm".
    #[arg(long, requires = "bearing_outer")]
    pub bearing_inner: Option<String>,
    /// A thrust bearing under the turned part (measured torque = thread torque).
    #[arg(long)]
    pub thrust_bearing: bool,
    /// Units of the answer: si or us.
    #[arg(long, value_enum, ignore_case = true, default_value = "si")]
    pub units: Units,
    /// Print the API's JSON instead of the table.
    #[arg(long)]
    pub json: bool,
}

/// Run a friction command; the text to print, or the error to report.
pub fn run(cmd: &FrictionCommand) -> Result<String, String> {
    match cmd {
        FrictionCommand::Evaluate(args) => evaluate(args),
    }
}

fn evaluate(args: &EvaluateArgs) -> Result<String, String> {
    let text =
        std::fs::read_to_string(&args.file).map_err(|e| format!("{}: {e}", args.file.display()))?;
    let specimens = friction_tests::csv_series::specimens_from_csv(&text)?;
    let bearing = match (&args.bearing_outer, &args.bearing_inner) {
        (Some(o), Some(i)) => Some(BearingRequest {
            outer_diameter: quantity_text(o, "--bearing-outer")?,
            inner_diameter: quantity_text(i, "--bearing-inner")?,
        }),
        _ => None,
    };
    let named = args.head.is_some() || args.hole.is_some() || args.washer.is_some();
    let req = SeriesRequest {
        thread: args.thread.clone(),
        property_class: args.property_class.clone(),
        finish: args.finish.clone(),
        lubricant: args.lubricant.clone(),
        // Default bearing: hexagon head on a medium hole, as the API's spec default.
        head: args.head.clone().or_else(|| {
            (bearing.is_none() && !args.thrust_bearing && !named).then(|| "hexagon-head".into())
        }),
        washer: args.washer.clone(),
        hole: args.hole.clone(),
        bearing,
        thrust_bearing: args.thrust_bearing,
        evaluation_clamp_force: None,
        specimens,
        notes: None,
    };
    let answer = friction_tests::evaluate(&req, args.units).map_err(|e| list(&e))?;
    if args.json {
        serde_json::to_string_pretty(&answer).map_err(|e| e.to_string())
    } else {
        Ok(table(&answer))
    }
}

fn list(e: &AppError) -> String {
    let lines: Vec<String> = match e.problems() {
        [] => vec![format!("  {e}")],
        problems => problems
            .iter()
            .map(|p| format!("  {}: {}", p.field, p.reason))
            .collect(),
    };
    format!("the series was refused:\n{}", lines.join("\n"))
}

/// Reads "16 mm", "16mm" or "0.63 in" into a quantity.
fn quantity_text(s: &str, what: &str) -> Result<Quantity, String> {
    let s = s.trim();
    let split = s
        .find(|c: char| !(c.is_ascii_digit() || matches!(c, '.' | '-' | '+' | 'e' | 'E')))
        .unwrap_or(s.len());
    let (num, unit) = s.split_at(split);
    let value: f64 = num
        .trim()
        .parse()
        .map_err(|_| format!("{what}: '{s}' is not a number with a unit, e.g. \"16 mm\""))?;
    let unit = unit.trim();
    if unit.is_empty() {
        return Err(format!("{what}: '{s}' has no unit, e.g. \"16 mm\""));
    }
    Ok(Quantity {
        value,
        unit: unit.to_owned().into(),
    })
}

fn num(v: Option<f64>, width: usize) -> String {
    match v {
        Some(v) => format!("{v:>width$.4}"),
        None => format!("{:>width$}", "—"),
    }
}

/// The readable table.
pub fn table(a: &EvaluationResponse) -> String {
    let mut out = String::new();
    let line = |out: &mut String, s: String| {
        out.push_str(&s);
        out.push('\n');
    };
    line(
        &mut out,
        format!(
            "Friction test series: {} {}{}",
            a.thread,
            a.property_class.as_deref().unwrap_or("(no property class)"),
            if a.thrust_bearing {
                ", thrust bearing"
            } else {
                ""
            }
        ),
    );
    if let Some(db) = &a.geometry.bearing_mean_diameter {
        line(
            &mut out,
            format!("Mean bearing diameter D_b: {:.3} {}", db.value, db.unit),
        );
    }
    let (fu, tu) = a
        .specimens
        .first()
        .map(|s| (s.clamp_force.unit.clone(), s.total_torque.unit.clone()))
        .unwrap_or_default();
    line(
        &mut out,
        format!(
            "{:>3} {:<14} {:>10} {:>10} {:>10} {:>8} {:>8} {:>8} {:>8} {:>8}  outlier in",
            "#",
            "form",
            format!("F [{fu}]"),
            format!("T [{tu}]"),
            format!("T_th"),
            "μ_th",
            "μ_b",
            "μ_tot",
            "K",
            "η"
        ),
    );
    // numbered from 1 in test order, as on the rig sheet
    for (i, s) in a.specimens.iter().enumerate() {
        line(
            &mut out,
            format!(
                "{:>3} {:<14} {:>10.3} {:>10.3} {} {} {} {} {} {}  {}",
                i + 1,
                s.form,
                s.clamp_force.value,
                s.total_torque.value,
                match &s.thread_torque {
                    Some(t) => format!("{:>10.3}", t.value),
                    None => format!("{:>10}", "—"),
                },
                num(s.thread_friction, 8),
                num(s.bearing_friction, 8),
                num(s.total_friction, 8),
                num(Some(s.nut_factor), 8),
                num(Some(s.efficiency), 8),
                s.outlier_in.join(", ")
            ),
        );
    }
    line(
        &mut out,
        "Specimens are numbered from 1; warnings name them by position from 0 \
         (specimens[0] is specimen 1)."
            .into(),
    );
    line(&mut out, String::new());
    line(
        &mut out,
        format!(
            "{:<18} {:>5} {:>8} {:>8} {:>8} {:>8} {:>8} {:>8}",
            "coefficient", "n", "mean", "std_dev", "min", "max", "mean−3σ", "mean+3σ"
        ),
    );
    let st = &a.statistics;
    for (name, s) in [
        ("thread_friction", &st.thread_friction),
        ("bearing_friction", &st.bearing_friction),
        ("total_friction", &st.total_friction),
        ("nut_factor", &st.nut_factor),
        ("efficiency", &st.efficiency),
    ] {
        if let Some(s) = s {
            line(
                &mut out,
                format!(
                    "{name:<18} {:>5} {} {} {} {} {} {}",
                    s.count,
                    num(Some(s.mean), 8),
                    num(s.std_dev, 8),
                    num(Some(s.min), 8),
                    num(Some(s.max), 8),
                    num(s.mean_minus_3_sigma, 8),
                    num(s.mean_plus_3_sigma, 8)
                ),
            );
        }
    }
    line(&mut out, String::new());
    line(
        &mut out,
        format!("Standard deviation: {}", a.method.std_dev),
    );
    line(&mut out, format!("Outliers: {}", a.method.outliers));
    for w in &a.warnings {
        line(&mut out, format!("Warning ({}): {}", w.code, w.message));
    }
    for c in &a.cautions {
        line(&mut out, format!("Caution: {c}"));
    }
    out
}

#[cfg(test)]
mod tests;

#[cfg(test)]
mod run_tests;
