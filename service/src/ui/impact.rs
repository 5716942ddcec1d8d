//! A change's impact on the released joints as a table: each joint (a link
//! to its page) with its target torque and preload window before → after,
//! the largest change in percent, the checks added and removed, and why a
//! joint no longer computes; then the summary in words and the caution.

use maud::{html, Markup};

use super::layout::{number, qty};
use crate::app::impact::{figures::ImpactFigures, ImpactResponse, JointImpact};
use crate::app::quantity::Quantity;

fn arrow(
    before: Option<&ImpactFigures>,
    after: Option<&ImpactFigures>,
    pick: fn(&ImpactFigures) -> &Quantity,
) -> String {
    let side = |f: Option<&ImpactFigures>| f.map_or_else(|| "—".to_owned(), |f| qty(pick(f)));
    format!("{} → {}", side(before), side(after))
}

fn codes(list: &[String]) -> String {
    if list.is_empty() {
        "—".into()
    } else {
        list.join(", ")
    }
}

fn row(j: &JointImpact) -> Markup {
    let (b, a) = (j.before.as_ref(), j.after.as_ref());
    let pct = j
        .change_percent
        .map_or_else(|| "—".to_owned(), |p| format!("{} %", number(p)));
    html! {
        tr.changed[j.changed] {
            td { a href={ "/ui/joints/" (j.id) } { (j.id) } }
            td.num { (j.release) }
            td.num { (arrow(b, a, |f| &f.target)) }
            td.num { (arrow(b, a, |f| &f.preload_min)) }
            td.num { (arrow(b, a, |f| &f.preload_max)) }
            td.num { (pct) }
            td { (codes(&j.checks_added)) }
            td { (codes(&j.checks_removed)) }
            td.note { (j.problem.as_deref().unwrap_or("")) }
        }
    }
}

/// The impact table, its summary in words and its caution.
pub fn impact_table(i: &ImpactResponse) -> Markup {
    html! {
        div.impact id="impact" {
            h3 { "Impact on the released joints" }
            p.note { (i.note) " Catalogue revision " (i.catalogue_revision) "." }
            @if !i.joints.is_empty() {
                table.list {
                    thead { tr {
                        th { "Joint" } th { "Release" } th { "Target torque before → after" }
                        th { "Preload min before → after" } th { "Preload max before → after" }
                        th { "Largest change" } th { "Checks added" } th { "Checks removed" } th { "Problem after" }
                    } }
                    tbody { @for j in &i.joints { (row(j)) } }
                }
            }
            ul.cautions { li { (i.caution) } }
        }
    }
}
