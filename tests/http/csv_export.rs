//! The CSV export is safe to open in a spreadsheet: a text cell that would
//! be evaluated as a formula (first character `=`, `+`, `-`, `@`, tab or
//! carriage return, or a formula after leading blanks) gets a leading `'`,
//! leading whitespace kept; `bom=true` starts the file with a UTF-8 byte
//! order mark; each row carries the evidence reference of the revision
//! that last changed the entry. Runs on SQLite and PostgreSQL.

use reqwest::StatusCode;
use tightspec::catalogue::exchange;
use tightspec::catalogue::ChangeSet;
use tightspec::store::Store;

use crate::catalogue_support::start;
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(spreadsheet_formulas_are_neutralised_and_evidence_is_exported);

/// Starts of a `source` cell that a spreadsheet would evaluate.
const TRIGGERS: [&str; 7] = ["=", "+", "-", "@", "\t=", "\r=", "  ="];
const EVIDENCE: &str = "friction-test:42";

/// Gives the first entries notes and sources starting with each trigger,
/// as one revision with evidence, written before the service starts. The
/// catalogue trims a source on write (so `\t=` is stored as `=`) but keeps
/// notes as given: the notes carry the whitespace cases through.
async fn seed_formula_cells(db: &TestDb) -> Vec<Changed> {
    let store = Store::open(Some(&db.url)).await.expect("store");
    let current = store.load_current().await.expect("catalogue");
    let csv = exchange::to_csv(&current).expect("csv");
    let mut file = exchange::parse_csv(&csv).expect("own export reads back");
    let mut changed = Vec::new();
    for (entry, trigger) in file.entries.iter_mut().zip(TRIGGERS) {
        entry.source = format!("{trigger}HYPERLINK(1) demo source");
        entry.notes = format!("{trigger}HYPERLINK(2) demo note");
        changed.push(Changed {
            id: entry.id.expect("exported id"),
            source: entry.source.trim().to_string(),
            notes: entry.notes.clone(),
        });
    }
    let set = ChangeSet {
        actor: "hollowmere-quality".into(),
        reason: "demo: cells a spreadsheet would evaluate".into(),
        evidence: Some(EVIDENCE.into()),
        items: exchange::changes_for(&current, &file),
    };
    assert_eq!(set.items.len(), TRIGGERS.len());
    store.apply(&set).await.expect("applied");
    store.close().await;
    changed
}

/// An entry given formula-like cells, with the cells as stored.
struct Changed {
    id: i64,
    source: String,
    notes: String,
}

fn rows(text: &str) -> Vec<csv::StringRecord> {
    csv::ReaderBuilder::new()
        .has_headers(true)
        .from_reader(text.as_bytes())
        .records()
        .map(|r| r.expect("CSV row"))
        .collect()
}

async fn spreadsheet_formulas_are_neutralised_and_evidence_is_exported(db: &TestDb) {
    let changed = seed_formula_cells(db).await;
    let app = start(&db.url, true).await;

    let plain = app.get("/v1/catalogue/export?format=csv").await;
    assert_eq!(plain.status(), StatusCode::OK);
    let plain = plain.text().await.unwrap();
    assert!(!plain.starts_with('\u{feff}'), "no BOM unless asked");

    let r = app.get("/v1/catalogue/export?format=csv&bom=true").await;
    assert_eq!(r.status(), StatusCode::OK);
    let text = r.text().await.unwrap();
    let body = text.strip_prefix('\u{feff}').expect("starts with a BOM");
    assert_eq!(body, plain);

    let header = body.lines().next().unwrap();
    let columns: Vec<&str> = header.split(',').collect();
    let at = |name: &str| columns.iter().position(|c| *c == name).unwrap();
    let (id_col, source_col, notes_col) = (at("id"), at("source"), at("notes"));
    let evidence_col = at("evidence");
    let all = rows(body);
    let row_of = |id: i64| {
        all.iter()
            .find(|r| r.get(id_col) == Some(id.to_string().as_str()))
            .unwrap_or_else(|| panic!("entry {id} exported"))
    };
    for c in &changed {
        let row = row_of(c.id);
        let (source, notes) = (format!("'{}", c.source), format!("'{}", c.notes));
        assert_eq!(row.get(source_col), Some(source.as_str()), "{:?}", c.source);
        assert_eq!(row.get(notes_col), Some(notes.as_str()), "{:?}", c.notes);
        assert_eq!(row.get(evidence_col), Some(EVIDENCE), "entry {}", c.id);
    }
    // Entries the evidence-carrying revision did not touch have none.
    let untouched = all
        .iter()
        .find(|r| {
            !changed
                .iter()
                .any(|c| r.get(id_col) == Some(c.id.to_string().as_str()))
        })
        .expect("an untouched entry");
    assert_eq!(untouched.get(evidence_col), Some(""));
    // No exported text cell starts a formula.
    for row in &all {
        for cell in row.iter() {
            let number = cell.parse::<f64>().is_ok();
            let formula = cell.starts_with(['=', '+', '-', '@', '\t', '\r']);
            assert!(number || !formula, "{cell:?}");
        }
    }

    // The export reads back to the very same cells (the `'` is removed).
    let back = exchange::parse_csv(&text).expect("export imports");
    for c in &changed {
        let e = back.entries.iter().find(|e| e.id == Some(c.id)).unwrap();
        assert_eq!((&e.source, &e.notes), (&c.source, &c.notes));
    }
}
