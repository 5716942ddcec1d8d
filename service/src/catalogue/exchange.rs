//! Export and import of the catalogue as JSON (the whole catalogue) or CSV
//! (friction entries only, one per row). An export imported again changes
//! nothing; an edited export becomes one batch of changes.

use serde::{Deserialize, Serialize};

use super::change::{Change, ChangeItem, EntryInput, FinishInput, LubricantInput};
use super::error::Problem;
use super::types::{RangeInput, Status};
use super::{Finish, FrictionEntry, Lubricant, Snapshot};

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

/// The JSON export: the whole catalogue at one revision.
#[derive(Debug, Clone, Serialize)]
pub struct Export<'a> {
    pub catalogue_revision: i64,
    pub finishes: &'a [Finish],
    pub lubricants: &'a [Lubricant],
    pub entries: &'a [FrictionEntry],
}

pub fn export(s: &Snapshot) -> Export<'_> {
    Export {
        catalogue_revision: s.revision,
        finishes: &s.finishes,
        lubricants: &s.lubricants,
        entries: &s.entries,
    }
}

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

/// An entry in an import file: with `id` it updates that entry, without it
/// creates one. `revision` (as exported) is ignored.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ImportEntry {
    #[serde(default)]
    pub id: Option<i64>,
    pub finish: String,
    pub lubricant: String,
    #[serde(default)]
    pub bearing_surface: Option<String>,
    pub thread_friction: RangeInput,
    pub bearing_friction: RangeInput,
    #[serde(default)]
    pub total_friction: Option<RangeInput>,
    pub source: String,
    #[serde(default)]
    pub notes: String,
    #[serde(default)]
    pub status: Option<Status>,
    #[serde(default)]
    #[allow(dead_code)]
    revision: Option<i64>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct ImportItem {
    id: String,
    name: String,
    #[serde(default)]
    electroplated: bool,
    #[serde(default)]
    stainless: bool,
    #[serde(default)]
    dry: bool,
    #[serde(default)]
    notes: String,
    #[serde(default)]
    status: Option<Status>,
    #[serde(default)]
    #[allow(dead_code)]
    revision: Option<i64>,
}

/// A parsed import file.
#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ImportFile {
    #[serde(default)]
    #[allow(dead_code)]
    catalogue_revision: Option<i64>,
    /// A reason given in the file (the command line may give one instead).
    #[serde(default)]
    pub reason: Option<String>,
    #[serde(default)]
    finishes: Vec<ImportItem>,
    #[serde(default)]
    lubricants: Vec<ImportItem>,
    #[serde(default)]
    pub entries: Vec<ImportEntry>,
}

/// Reads a JSON import file.
pub fn parse_json(text: &str) -> Result<ImportFile, Vec<Problem>> {
    serde_json::from_str(text).map_err(|e| {
        vec![Problem::new(
            format!("line {}, column {}", e.line(), e.column()),
            e.to_string(),
        )]
    })
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

/// The changes that make `current` match the file: new items created,
/// differing items updated, identical items left alone (so re-importing an
/// export yields no change). Checking is left to `catalogue::apply`.
pub fn changes_for(current: &Snapshot, file: &ImportFile) -> Vec<ChangeItem> {
    let mut out = Vec::new();
    for (i, f) in file.finishes.iter().enumerate() {
        let input = FinishInput {
            id: f.id.clone(),
            name: f.name.clone(),
            electroplated: f.electroplated,
            stainless: f.stainless,
            notes: f.notes.clone(),
            status: f.status,
        };
        let at = format!("finishes[{i}].");
        match current.finishes.iter().find(|x| x.id == f.id) {
            None => out.push(ChangeItem {
                at,
                change: Change::CreateFinish(input),
            }),
            Some(x) => {
                let same = x.name == input.name
                    && x.electroplated == input.electroplated
                    && x.stainless == input.stainless
                    && x.notes == input.notes
                    && input.status.map_or(true, |s| s == x.status);
                if !same {
                    out.push(ChangeItem {
                        at,
                        change: Change::UpdateFinish {
                            expected_revision: None,
                            finish: input,
                        },
                    });
                }
            }
        }
    }
    for (i, l) in file.lubricants.iter().enumerate() {
        let input = LubricantInput {
            id: l.id.clone(),
            name: l.name.clone(),
            dry: l.dry,
            notes: l.notes.clone(),
            status: l.status,
        };
        let at = format!("lubricants[{i}].");
        match current.lubricants.iter().find(|x| x.id == l.id) {
            None => out.push(ChangeItem {
                at,
                change: Change::CreateLubricant(input),
            }),
            Some(x) => {
                let same = x.name == input.name
                    && x.dry == input.dry
                    && x.notes == input.notes
                    && input.status.map_or(true, |s| s == x.status);
                if !same {
                    out.push(ChangeItem {
                        at,
                        change: Change::UpdateLubricant {
                            expected_revision: None,
                            lubricant: input,
                        },
                    });
                }
            }
        }
    }
    for (i, e) in file.entries.iter().enumerate() {
        let input = EntryInput {
            finish: e.finish.clone(),
            lubricant: e.lubricant.clone(),
            bearing_surface: e.bearing_surface.clone(),
            thread_friction: e.thread_friction,
            bearing_friction: e.bearing_friction,
            total_friction: e.total_friction,
            source: e.source.clone(),
            notes: e.notes.clone(),
            status: e.status,
        };
        let at = format!("entries[{i}].");
        match e.id {
            None => out.push(ChangeItem {
                at,
                change: Change::CreateEntry(input),
            }),
            Some(id) => {
                let unchanged = current
                    .entries
                    .iter()
                    .find(|x| x.id == id)
                    .is_some_and(|x| {
                        let mut now = EntryInput::from(x);
                        if input.status.is_none() {
                            now.status = None;
                        }
                        now == input
                    });
                if !unchanged {
                    out.push(ChangeItem {
                        at,
                        change: Change::UpdateEntry {
                            id,
                            expected_revision: None,
                            entry: input,
                        },
                    });
                }
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{apply, ChangeSet};

    #[test]
    fn export_then_import_changes_nothing_json_and_csv() {
        let s = Snapshot::seed();
        let json = serde_json::to_string(&export(&s)).unwrap();
        let file = parse_json(&json).unwrap();
        assert!(changes_for(&s, &file).is_empty());
        let csv = to_csv(&s).unwrap();
        assert!(csv.starts_with("id,finish,lubricant,"));
        let file = parse_csv(&csv).unwrap();
        assert_eq!(file.entries.len(), s.entries.len());
        assert!(changes_for(&s, &file).is_empty());
    }

    #[test]
    fn edited_csv_becomes_one_batch_and_bad_cells_are_all_listed() {
        let s = Snapshot::seed();
        let csv = to_csv(&s).unwrap();
        let edited = csv.replacen(
            "7,zinc-electroplated,none,,0.14,",
            "7,zinc-electroplated,none,,0.12,",
            1,
        );
        let file = parse_csv(&edited).unwrap();
        let items = changes_for(&s, &file);
        assert_eq!(items.len(), 1);
        let set = ChangeSet {
            actor: "cli:test".into(),
            reason: "HW-17".into(),
            evidence: None,
            items,
        };
        let applied = apply(&s, &set).unwrap();
        assert_eq!(applied.snapshot.entry(7).unwrap().thread_friction.min, 0.12);

        let bad = format!(
            "{}\n,plain,none,,abc,0.2,0.1,,,,src,,sometimes,\n",
            csv.lines().next().unwrap()
        );
        let problems = parse_csv(&bad).unwrap_err();
        let fields: Vec<&str> = problems.iter().map(|p| p.field.as_str()).collect();
        assert!(
            fields.contains(&"entries[0].thread_friction_min"),
            "{fields:?}"
        );
        assert!(
            fields.contains(&"entries[0].bearing_friction_max"),
            "{fields:?}"
        );
        assert!(fields.contains(&"entries[0].status"), "{fields:?}");
    }
}
