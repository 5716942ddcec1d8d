//! The CSV form of the catalogue: friction entries only, one per row, with
//! a header row of [`CSV_COLUMNS`]. Export writes it; import reads it back
//! reporting every bad cell.

use super::error::Problem;
use super::exchange::{ImportEntry, ImportFile};
use super::types::{RangeInput, Status};
use super::Snapshot;

/// Column order of the CSV form.
pub const CSV_COLUMNS: [&str; 14] = [
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
];

fn num(v: Option<f64>) -> String {
    v.map(|x| x.to_string()).unwrap_or_default()
}

/// The CSV export of the friction entries (header row first).
pub fn to_csv(s: &Snapshot) -> Result<String, String> {
    let mut w = csv::Writer::from_writer(Vec::new());
    w.write_record(CSV_COLUMNS).map_err(|e| e.to_string())?;
    for e in &s.entries {
        w.write_record([
            e.id.to_string(),
            e.finish.clone(),
            e.lubricant.clone(),
            e.bearing_surface.clone().unwrap_or_default(),
            e.thread_friction.min.to_string(),
            e.thread_friction.max.to_string(),
            e.bearing_friction.min.to_string(),
            e.bearing_friction.max.to_string(),
            num(e.total_friction.map(|t| t.min)),
            num(e.total_friction.map(|t| t.max)),
            e.source.clone(),
            e.notes.clone(),
            e.status.as_str().to_string(),
            e.revision.to_string(),
        ])
        .map_err(|e| e.to_string())?;
    }
    let bytes = w.into_inner().map_err(|e| e.to_string())?;
    String::from_utf8(bytes).map_err(|e| e.to_string())
}

/// Reads a CSV import file (entries only; header row with [`CSV_COLUMNS`],
/// `revision` optional). Every bad cell is reported.
pub fn parse_csv(text: &str) -> Result<ImportFile, Vec<Problem>> {
    let mut r = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let headers = match r.headers() {
        Ok(h) => h.clone(),
        Err(e) => return Err(vec![Problem::new("header", e.to_string())]),
    };
    let mut problems = Vec::new();
    for required in &CSV_COLUMNS[1..12] {
        if !headers.iter().any(|h| h == *required) {
            problems.push(Problem::new(
                "header",
                format!("missing column '{required}'"),
            ));
        }
    }
    for h in headers.iter() {
        if !CSV_COLUMNS.contains(&h) {
            problems.push(Problem::new("header", format!("unknown column '{h}'")));
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
                problems.push(Problem::new(format!("entries[{i}]"), e.to_string()));
                continue;
            }
        };
        let cell = |name: &str| -> &str {
            headers
                .iter()
                .position(|h| h == name)
                .and_then(|p| rec.get(p))
                .unwrap_or("")
        };
        let mut number = |name: &str, required: bool| -> Option<f64> {
            let v = cell(name);
            if v.is_empty() {
                if required {
                    problems.push(Problem::new(format!("{at}{name}"), "a number is required"));
                }
                return None;
            }
            match v.parse::<f64>() {
                Ok(x) => Some(x),
                Err(_) => {
                    problems.push(Problem::new(
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
                    problems.push(Problem::new(
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
                problems.push(Problem::new(
                    format!("{at}status"),
                    format!("'{v}' is neither active nor retired"),
                ));
                None
            }
        };
        if omin.is_some() != omax.is_some() {
            problems.push(Problem::new(
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
