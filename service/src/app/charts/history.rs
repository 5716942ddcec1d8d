//! The chart of one catalogue friction entry over its revisions: the
//! thread and bearing friction ranges as bars at each revision that
//! changed the entry (the ranges hold until the next change).

use crate::app::{App, AppError};
use crate::catalogue::{Action, EntityKind};
use crate::chart::{pens, render, Axis, Bar, Figure, Mark, Marker, Plot, Shape};
use crate::store::HistoryItem;

/// Sideways offset of the two bars of one revision.
const OFFSET: f64 = 0.12;

/// The latest changes drawn (older ones are named in a note).
pub const MOST_CHANGES: usize = 40;

/// The `{min, max}` range at `key` of an entry's JSON.
fn range(entry: &serde_json::Value, key: &str) -> Option<(f64, f64)> {
    let r = entry.get(key)?;
    Some((r.get("min")?.as_f64()?, r.get("max")?.as_f64()?))
}

/// The figure of an entry's changes, oldest first.
pub fn figure(id: &str, all: &[HistoryItem]) -> Figure {
    let items = &all[all.len().saturating_sub(MOST_CHANGES)..];
    let mut thread = Vec::new();
    let mut bearing = Vec::new();
    let mut categories = Vec::new();
    let mut values = Vec::new();
    let mut lines = Vec::new();
    for item in items {
        let rev = item.revision as f64;
        categories.push((rev, format!("r{}", item.revision)));
        let action = match item.action {
            Action::Create => "created",
            Action::Update => "changed",
            Action::Retire => "retired",
        };
        lines.push(format!("r{}: {action}: {}", item.revision, item.reason));
        if let Some((lo, hi)) = range(&item.after, "thread_friction") {
            thread.push(Bar {
                x: rev - OFFSET,
                low: lo,
                high: hi,
                mid: Some((lo + hi) / 2.0),
            });
            values.extend([lo, hi]);
        }
        if let Some((lo, hi)) = range(&item.after, "bearing_friction") {
            bearing.push(Bar {
                x: rev + OFFSET,
                low: lo,
                high: hi,
                mid: Some((lo + hi) / 2.0),
            });
            values.extend([lo, hi]);
        }
    }
    let first = items.first().map_or(0.0, |i| i.revision as f64);
    let last = items.last().map_or(1.0, |i| i.revision as f64);
    let mut x = Axis::fit("Catalogue revision", "", &[first, last], false);
    (x.min, x.max) = (first - 0.5, last + 0.5);
    x.categories = categories;
    let after = items.last().map(|i| &i.after);
    let name = |key: &str| {
        after
            .and_then(|a| a.get(key))
            .and_then(|v| v.as_str())
            .unwrap_or("?")
            .to_string()
    };
    let marks = vec![
        Mark::new(
            "thread-friction",
            "μ_th",
            Shape::Bars {
                bars: thread,
                pen: pens::NOMINAL,
                marker: Marker::Triangle,
            },
        )
        .explained("thread friction μ_th range (min to max) from this revision on"),
        Mark::new(
            "bearing-friction",
            "μ_b",
            Shape::Bars {
                bars: bearing,
                pen: pens::DATA_ALT,
                marker: Marker::Square,
            },
        )
        .explained("bearing friction μ_b range (min to max) from this revision on"),
    ];
    let mut notes = vec![format!(
        "Ranges as recorded in the catalogue history; source of the latest: {}.",
        name("source")
    )];
    if all.len() > items.len() {
        notes.push(format!(
            "The latest {} of {} changes are drawn.",
            items.len(),
            all.len()
        ));
    }
    notes.extend(lines);
    Figure {
        title: format!(
            "Friction entry {id}: {} with {}",
            name("finish"),
            name("lubricant")
        ),
        desc: format!(
            "Thread and bearing friction ranges of catalogue friction entry {id} at each of its \
             {} recorded changes, oldest first.",
            all.len()
        ),
        plots: vec![Plot {
            heading: format!("Friction ranges of entry {id} by catalogue revision"),
            x,
            y: Axis::fit("Friction coefficient μ", "", &values, false).with_headroom(0.15),
            marks,
        }],
        notes,
    }
}

impl App {
    /// The chart of friction entry `id`'s history (404 naming `id` when it
    /// never existed).
    pub async fn entry_history_chart(&self, id: i64) -> Result<String, AppError> {
        let id = id.to_string();
        let history = self.history(EntityKind::FrictionEntry, &id).await?;
        Ok(render(&figure(&id, &history.value)))
    }
}
