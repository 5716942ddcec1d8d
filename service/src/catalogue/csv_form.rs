//! The CSV form of the catalogue: friction entries only, one per row, with
//! a header row of [`CSV_COLUMNS`]. Export writes it; import reads it back
//! reporting every bad cell.
//!
//! Text cells a spreadsheet would evaluate as a formula (first character
//! `=`, `+`, `-`, `@`, tab or carriage return, or `=`, `+`, `-`, `@` after
//! leading blanks) are written with a leading `'`, leading whitespace kept;
//! import removes that one `'` again, so export and import round-trip
//! (common practice against CSV formula injection).

use super::error::ChangeProblem;
use super::exchange::{ImportEntry, ImportFile};
use super::types::{RangeInput, Status};
use super::Snapshot;

/// Column order of the CSV form.
/// `joint_tag` is last so that files written before it import unchanged.
pub const CSV_COLUMNS: [&str; 16] = [
    "id",
    "finish",
    "lubricant",
    "bearing_surface",
    "thread_friction_min",
    "thread_friction_max",
    "bearing_friction_min",
    "bearing_friction_max",
    "total_friction_min",
    "total_friction_max",
    "source",
    "notes",
    "status",
    "revision",
    "evidence",
    "joint_tag",
];

/// Characters that make a spreadsheet evaluate a cell when it starts with
/// one (common practice against CSV formula injection).
const FORMULA_START: [char; 6] = ['=', '+', '-', '@', '\t', '\r'];

fn would_evaluate(cell: &str) -> bool {
    cell.starts_with(FORMULA_START)
        || cell
            .trim_start()
            .starts_with(['=', '+', '-', '@'].as_slice())
}

/// A text cell as exported: `'` in front of anything a spreadsheet would
/// evaluate, otherwise unchanged (leading whitespace is never trimmed).
pub fn neutralise(cell: &str) -> String {
    if would_evaluate(cell) {
        format!("'{cell}")
    } else {
        cell.to_string()
    }
}

/// The inverse of [`neutralise`] for an imported cell.
fn restore(cell: &str) -> &str {
    match cell.strip_prefix('\'') {
        Some(rest) if would_evaluate(rest) => rest,
        _ => cell,
    }
}

/// Options of the CSV export.
#[derive(Debug, Default)]
pub struct CsvOptions<'a> {
    /// Start with a UTF-8 byte order mark (for spreadsheets that guess the
    /// encoding otherwise).
    pub bom: bool,
    /// Evidence reference of the revision that last changed each entry
    /// (e.g. `friction-test:42`), by revision number.
    pub evidence: Option<&'a std::collections::HashMap<i64, String>>,
}

fn num(v: Option<f64>) -> String {
    v.map(|x| x.to_string()).unwrap_or_default()
}

/// The CSV export of the friction entries (header row first), no BOM and
/// no evidence references.
pub fn to_csv(s: &Snapshot) -> Result<String, String> {
    to_csv_with(s, &CsvOptions::default())
}

/// The CSV export of the friction entries with `options`.
pub fn to_csv_with(s: &Snapshot, options: &CsvOptions<'_>) -> Result<String, String> {
    let start = if options.bom { "\u{feff}" } else { "" };
    let mut w = csv::Writer::from_writer(start.as_bytes().to_vec());
    w.write_record(CSV_COLUMNS).map_err(|e| e.to_string())?;
    for e in &s.entries {
        w.write_record([
            e.id.to_string(),
            neutralise(&e.finish),
            neutralise(&e.lubricant),
            neutralise(e.bearing_surface.as_deref().unwrap_or_default()),
            e.thread_friction.min.to_string(),
            e.thread_friction.max.to_string(),
            e.bearing_friction.min.to_string(),
            e.bearing_friction.max.to_string(),
            num(e.total_friction.map(|t| t.min)),
            num(e.total_friction.map(|t| t.max)),
            neutralise(&e.source),
            neutralise(&e.notes),
            e.status.as_str().to_string(),
            e.revision.to_string(),
            neutralise(
                options
                    .evidence
                    .and_then(|m| m.get(&e.revision))
                    .map_or("", String::as_str),
            ),
            neutralise(e.joint_tag.as_deref().unwrap_or_default()),
        ])
        .map_err(|e| e.to_string())?;
    }
    let bytes = w.into_inner().map_err(|e| e.to_string())?;
    String::from_utf8(bytes).map_err(|e| e.to_string())
}

/// Reads a CSV import file (entries only; header row with [`CSV_COLUMNS`],
/// `revision`, `evidence` and `joint_tag` optional, the latter not read: evidence
/// belongs to a revision). A leading byte order mark is skipped. Every bad
/// cell is reported.
pub fn parse_csv(text: &str) -> Result<ImportFile, Vec<ChangeProblem>> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    // Flexible: a row may leave out trailing optional cells (`revision`,
    // `evidence`); a missing cell reads as empty.
    let mut r = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .flexible(true)
        .from_reader(text.as_bytes());
    let headers = match r.headers() {
        Ok(h) => h.clone(),
        Err(e) => return Err(vec![ChangeProblem::new("header", e.to_string())]),
    };
    let mut problems = Vec::new();
    for required in &CSV_COLUMNS[1..12] {
        if !headers.iter().any(|h| h == *required) {
            problems.push(ChangeProblem::new(
                "header",
                format!("missing column '{required}'"),
            ));
        }
    }
    for h in headers.iter() {
        if !CSV_COLUMNS.contains(&h) {
            problems.push(ChangeProblem::new(
                "header",
                format!("unknown column '{h}'"),
            ));
        }
    }
    if !problems.is_empty() {
        return Err(problems);
    }
    let mut file = ImportFile::default();
    for (i, rec) in r.records().enumerate() {
        let at = format!("entries[{i}].");
        let rec = match rec {
            Ok(rec) => rec,
            Err(e) => {
                problems.push(ChangeProblem::new(format!("entries[{i}]"), e.to_string()));
                continue;
            }
        };
        let cell = |name: &str| -> &str {
            restore(
                headers
                    .iter()
                    .position(|h| h == name)
                    .and_then(|p| rec.get(p))
                    .unwrap_or(""),
            )
        };
        let mut number = |name: &str, required: bool| -> Option<f64> {
            let v = cell(name);
            if v.is_empty() {
                if required {
                    problems.push(ChangeProblem::new(
                        format!("{at}{name}"),
                        "a number is required",
                    ));
                }
                return None;
            }
            match v.parse::<f64>() {
                Ok(x) if x.is_finite() => Some(x),
                _ => {
                    problems.push(ChangeProblem::new(
                        format!("{at}{name}"),
                        format!("'{v}' is not a number"),
                    ));
                    None
                }
            }
        };
        let tmin = number("thread_friction_min", true);
        let tmax = number("thread_friction_max", true);
        let bmin = number("bearing_friction_min", true);
        let bmax = number("bearing_friction_max", true);
        let omin = number("total_friction_min", false);
        let omax = number("total_friction_max", false);
        let id = match cell("id") {
            "" => None,
            v => match v.parse::<i64>() {
                Ok(n) => Some(n),
                Err(_) => {
                    problems.push(ChangeProblem::new(
                        format!("{at}id"),
                        format!("'{v}' is not an entry id"),
                    ));
                    None
                }
            },
        };
        let status = match cell("status") {
            "" => None,
            "active" => Some(Status::Active),
            "retired" => Some(Status::Retired),
            v => {
                problems.push(ChangeProblem::new(
                    format!("{at}status"),
                    format!("'{v}' is neither active nor retired"),
                ));
                None
            }
        };
        if omin.is_some() != omax.is_some() {
            problems.push(ChangeProblem::new(
                format!("{at}total_friction_min"),
                "give both total_friction_min and total_friction_max, or neither",
            ));
        }
        let (Some(tmin), Some(tmax), Some(bmin), Some(bmax)) = (tmin, tmax, bmin, bmax) else {
            continue;
        };
        file.entries.push(ImportEntry {
            id,
            finish: cell("finish").to_string(),
            lubricant: cell("lubricant").to_string(),
            bearing_surface: Some(cell("bearing_surface").to_string()).filter(|s| !s.is_empty()),
            joint_tag: Some(cell("joint_tag").to_string()).filter(|s| !s.is_empty()),
            thread_friction: RangeInput {
                min: tmin,
                max: tmax,
            },
            bearing_friction: RangeInput {
                min: bmin,
                max: bmax,
            },
            total_friction: omin.zip(omax).map(|(min, max)| RangeInput { min, max }),
            source: cell("source").to_string(),
            notes: cell("notes").to_string(),
            status,
            revision: None,
        });
    }
    if problems.is_empty() {
        Ok(file)
    } else {
        Err(problems)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cells_a_spreadsheet_would_evaluate_get_a_quote_and_come_back() {
        for cell in ["=1+1", "+1", "-1", "@SUM(A1)", "\t=1+1", "\r=1+1", "  =1+1"] {
            let out = neutralise(cell);
            assert_eq!(out, format!("'{cell}"), "{cell:?}");
            assert_eq!(restore(&out), cell);
        }
        for cell in ["plain", " leading blank", "'quoted", "1.5", ""] {
            assert_eq!(neutralise(cell), cell);
            assert_eq!(restore(cell), cell);
        }
    }

    #[test]
    fn numbers_that_are_not_finite_are_refused() {
        let header = CSV_COLUMNS.join(",");
        for bad in ["NaN", "inf", "1e400"] {
            let text = format!("{header}\n,plain,none,,{bad},0.2,0.1,0.2,,,src,,,,\n");
            let problems = parse_csv(&text).unwrap_err();
            let fields: Vec<&str> = problems.iter().map(|p| p.field.as_str()).collect();
            assert_eq!(fields, ["entries[0].thread_friction_min"], "{bad}");
        }
    }
}
