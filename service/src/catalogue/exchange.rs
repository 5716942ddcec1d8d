//! Export and import of the catalogue as JSON (the whole catalogue) or CSV
//! (friction entries only, one per row). An export imported again changes
//! nothing; an edited export becomes one batch of changes.

use serde::{Deserialize, Serialize};

use super::change::{Change, ChangeItem, EntryInput};
use super::error::ChangeProblem;
use super::item::CatalogueItem;
use super::types::{RangeInput, Status};
use super::{Finish, FrictionEntry, Lubricant, Snapshot};

pub use super::csv_form::{neutralise, parse_csv, to_csv, to_csv_with, CsvOptions, CSV_COLUMNS};

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
    #[serde(default)]
    pub joint_tag: Option<String>,
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
    pub(super) revision: Option<i64>,
}

/// A finish or lubricant in an import file (each kind reads its own flags;
/// `revision`, as exported, is ignored).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ImportItem {
    pub id: String,
    pub name: String,
    #[serde(default)]
    pub electroplated: bool,
    #[serde(default)]
    pub stainless: bool,
    #[serde(default)]
    pub dry: bool,
    #[serde(default)]
    pub notes: String,
    #[serde(default)]
    pub status: Option<Status>,
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
pub fn parse_json(text: &str) -> Result<ImportFile, Vec<ChangeProblem>> {
    serde_json::from_str(text).map_err(|e| {
        vec![ChangeProblem::new(
            format!("line {}, column {}", e.line(), e.column()),
            e.to_string(),
        )]
    })
}

/// The changes of one item kind (`list`: its key in the file): items not in
/// `current` created, differing ones replaced, identical ones left alone.
fn item_changes<I: CatalogueItem>(
    list: &str,
    current: &Snapshot,
    items: &[ImportItem],
    out: &mut Vec<ChangeItem>,
) {
    for (i, item) in items.iter().enumerate() {
        let input = I::import_input(item);
        let at = format!("{list}[{i}].");
        match I::all(current).iter().find(|x| x.id() == item.id) {
            None => out.push(ChangeItem {
                at,
                change: I::create(input),
            }),
            Some(x) => {
                let status = I::input_status(&input).unwrap_or(x.status());
                let same =
                    x.name() == item.name && I::from_input(&input, status, x.revision()) == *x;
                if !same {
                    out.push(ChangeItem {
                        at,
                        change: I::update(input, None),
                    });
                }
            }
        }
    }
}

/// The changes that make `current` match the file: new items created,
/// differing items updated, identical items left alone (so re-importing an
/// export yields no change). Checking is left to `catalogue::apply`.
pub fn changes_for(current: &Snapshot, file: &ImportFile) -> Vec<ChangeItem> {
    let mut out = Vec::new();
    item_changes::<Finish>("finishes", current, &file.finishes, &mut out);
    item_changes::<Lubricant>("lubricants", current, &file.lubricants, &mut out);
    for (i, e) in file.entries.iter().enumerate() {
        let input = EntryInput {
            finish: e.finish.clone(),
            lubricant: e.lubricant.clone(),
            bearing_surface: e.bearing_surface.clone(),
            joint_tag: e.joint_tag.clone(),
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
