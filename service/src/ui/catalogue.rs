//! The friction catalogue pages: the entries (filtered by finish,
//! lubricant and status, at the current or a named revision), one entry's
//! history with its chart, the difference between two revisions, and the
//! export links (the API's own export routes).

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::{html, Markup};
use serde::Deserialize;
use serde_json::Value;

use super::layout::{coefficient, page, Nav};
use super::problem::Problem;
use super::session::{problem_page, Visit};
use super::UiState;
use crate::app::catalogue::EntryFilter;
use crate::app::tokens::Role;
use crate::catalogue::{DiffKind, EntityKind};

/// The entry list's filters, as the page's GET form sends them (blank
/// fields mean "any").
#[derive(Debug, Default, Deserialize)]
pub struct EntriesQuery {
    #[serde(default)]
    finish: String,
    #[serde(default)]
    lubricant: String,
    #[serde(default)]
    status: String,
    #[serde(default)]
    revision: String,
}

fn blank_none(s: &str) -> Option<String> {
    let s = s.trim();
    (!s.is_empty()).then(|| s.to_owned())
}

fn revision_number(text: &str, field: &str) -> Result<Option<i64>, Problem> {
    match blank_none(text) {
        None => Ok(None),
        Some(t) => t.parse::<i64>().map(Some).map_err(|_| {
            Problem::refusal(
                StatusCode::BAD_REQUEST,
                "Input not readable",
                field,
                format!("'{t}' is not a revision number"),
            )
        }),
    }
}

fn range(min: f64, max: f64) -> String {
    format!("{} – {}", coefficient(min), coefficient(max))
}

fn filter_form(q: &EntriesQuery) -> Markup {
    html! {
        form.filters method="get" action="/ui/catalogue" {
            label { "Finish " input name="finish" value=(q.finish) placeholder="any"; }
            label { "Lubricant " input name="lubricant" value=(q.lubricant) placeholder="any"; }
            label { "Status "
                select name="status" {
                    option value="" selected[q.status.is_empty()] { "any" }
                    option value="active" selected[q.status == "active"] { "active" }
                    option value="retired" selected[q.status == "retired"] { "retired" }
                }
            }
            label { "Revision " input name="revision" value=(q.revision) placeholder="current" size="6"; }
            button type="submit" { "Show" }
        }
    }
}

/// `GET /ui/catalogue`.
pub async fn entries(
    req: HttpRequest,
    state: web::Data<UiState>,
    query: web::Query<EntriesQuery>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let title = "Friction catalogue";
    if let Err(p) = visit.caller(&state, Role::Reader).await {
        return problem_page(&visit, Nav::Catalogue, title, &p);
    }
    let q = query.into_inner();
    let active = match q.status.as_str() {
        "" => None,
        "active" => Some(true),
        "retired" => Some(false),
        other => {
            let p = Problem::refusal(
                StatusCode::UNPROCESSABLE_ENTITY,
                "Input refused",
                "status",
                format!("'{other}' is not a status; use active or retired"),
            );
            return problem_page(&visit, Nav::Catalogue, title, &p);
        }
    };
    let revision = match revision_number(&q.revision, "revision") {
        Ok(r) => r,
        Err(p) => return problem_page(&visit, Nav::Catalogue, title, &p),
    };
    let filter = EntryFilter {
        active,
        finish: blank_none(&q.finish),
        lubricant: blank_none(&q.lubricant),
    };
    let listed = match state.app.entries(&filter, revision).await {
        Ok(l) => l,
        Err(e) => return problem_page(&visit, Nav::Catalogue, title, &Problem::from_app(&e)),
    };
    let rev = listed.revision;
    let body = html! {
        h1 { (title) }
        p.lead { "Revision " strong { (rev) } ": " (listed.value.len()) " entries. Friction coefficients are dimensionless ranges (min – max)." }
        (filter_form(&q))
        table.list id="entries" {
            thead { tr { th { "Entry" } th { "Finish" } th { "Lubricant" } th { "Bearing surface" }
                         th { "Scope" } th { "Thread μ_G" } th { "Bearing μ_K" } th { "Status" } th { "Source" } } }
            tbody {
                @for e in &listed.value {
                    tr {
                        td { a href={ "/ui/catalogue/entries/" (e.id) } { "#" (e.id) } }
                        td { (e.finish) } td { (e.lubricant) }
                        td { (e.bearing_surface.as_deref().unwrap_or("any")) }
                        td.scope { (scope_words(e.joint_tag.as_deref())) }
                        td.num { (range(e.thread_friction.min, e.thread_friction.max)) }
                        td.num { (range(e.bearing_friction.min, e.bearing_friction.max)) }
                        td { (e.status.as_str()) }
                        td.note { (e.source) }
                    }
                }
            }
        }
        h2 { "Compare and export" }
        form.filters method="get" action="/ui/catalogue/diff" {
            label { "From revision " input name="from" value=(if rev > 1 { rev - 1 } else { 1 }) size="6"; }
            label { "to revision " input name="to" value=(rev) size="6"; }
            button type="submit" { "Show the difference" }
        }
        p { "Export revision " (rev) ": "
            a href={ "/v1/catalogue/export?revision=" (rev) } download { "JSON" } " · "
            a href={ "/v1/catalogue/export?revision=" (rev) "&format=csv" } download { "CSV" } }
    };
    visit.html(StatusCode::OK, page(title, Nav::Catalogue, &visit, body))
}

fn side(after: &Value, key: &str) -> String {
    let r = &after[key];
    match (r["min"].as_f64(), r["max"].as_f64()) {
        (Some(a), Some(b)) => range(a, b),
        _ => "—".into(),
    }
}

/// An entry's scope in words: the joint tag it is limited to, or generic.
fn scope_words(joint_tag: Option<&str>) -> String {
    match joint_tag {
        Some(tag) => format!("joints tagged '{tag}' only"),
        None => "every joint (generic)".into(),
    }
}

/// `GET /ui/catalogue/entries/{id}`: every change to one entry.
pub async fn entry(
    req: HttpRequest,
    state: web::Data<UiState>,
    id: web::Path<String>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let id = id.into_inner();
    let title = format!("Catalogue entry {id}");
    if let Err(p) = visit.caller(&state, Role::Reader).await {
        return problem_page(&visit, Nav::Catalogue, &title, &p);
    }
    let history = match state.app.history(EntityKind::FrictionEntry, &id).await {
        Ok(h) => h,
        Err(e) => return problem_page(&visit, Nav::Catalogue, &title, &Problem::from_app(&e)),
    };
    let last = history.value.last().map(|h| &h.after);
    let body = html! {
        h1 { "Catalogue entry #" (id) }
        @if let Some(a) = last {
            p.lead { (a["finish"].as_str().unwrap_or("?")) " with " (a["lubricant"].as_str().unwrap_or("?"))
                ": thread μ_G " (side(a, "thread_friction")) ", bearing μ_K " (side(a, "bearing_friction"))
                " (" (a["status"].as_str().unwrap_or("?")) ")." }
            p id="scope" { "Scope: " (scope_words(a["joint_tag"].as_str())) "." }
        }
        div.stack {
            table.list id="history" {
                caption { "History, oldest first (" (history.value.len()) (if history.value.len() == 1 { " change)" } else { " changes)" }) }
                thead { tr { th { "Revision" } th { "Change" } th { "Thread μ_G" } th { "Bearing μ_K" }
                             th { "By" } th { "Reason" } th { "Evidence" } th { "When (UTC)" } } }
                tbody {
                    @for h in &history.value {
                        tr {
                            td { (h.revision) }
                            td { (serde_json::to_value(h.action).ok().and_then(|v| v.as_str().map(str::to_owned)).unwrap_or_default()) }
                            td.num { (side(&h.after, "thread_friction")) }
                            td.num { (side(&h.after, "bearing_friction")) }
                            td { (h.actor) } td.note { (h.reason) }
                            td { (h.evidence.as_deref().unwrap_or("")) }
                            td { (h.created_at.format("%Y-%m-%d %H:%M")) }
                        }
                    }
                }
            }
            figure.chart {
                img id="history-chart" src={ "/v1/friction-entries/" (id) "/history.svg" }
                    alt="Thread and bearing friction range of this entry over its revisions" width="640" height="360";
                figcaption { "Friction range over the revisions." }
            }
        }
        p { a href={ "/v1/friction-entries/" (id) "/history" } { "History as JSON" } " · "
            a href="/ui/catalogue" { "All entries" } }
    };
    visit.html(StatusCode::OK, page(&title, Nav::Catalogue, &visit, body))
}

#[derive(Debug, Default, Deserialize)]
pub struct DiffQuery {
    #[serde(default)]
    from: String,
    #[serde(default)]
    to: String,
}

/// `GET /ui/catalogue/diff?from=&to=`: what changed between two revisions.
pub async fn diff(
    req: HttpRequest,
    state: web::Data<UiState>,
    query: web::Query<DiffQuery>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let title = "Catalogue difference";
    if let Err(p) = visit.caller(&state, Role::Reader).await {
        return problem_page(&visit, Nav::Catalogue, title, &p);
    }
    let read = |text: &str, field: &str| {
        revision_number(text, field)?.ok_or_else(|| {
            Problem::refusal(
                StatusCode::BAD_REQUEST,
                "Input not readable",
                field,
                "give a revision number",
            )
        })
    };
    let (from, to) = match (read(&query.from, "from"), read(&query.to, "to")) {
        (Ok(f), Ok(t)) => (f, t),
        (Err(p), _) | (_, Err(p)) => return problem_page(&visit, Nav::Catalogue, title, &p),
    };
    let items = match state.app.diff(from, to).await {
        Ok(d) => d,
        Err(e) => return problem_page(&visit, Nav::Catalogue, title, &Problem::from_app(&e)),
    };
    let body = html! {
        h1 { "Catalogue: revision " (from) " → " (to) }
        @if items.is_empty() { p { "No difference." } }
        @else {
            table.list id="diff" {
                thead { tr { th { "Item" } th { "Id" } th { "Change" } th { "Fields" } th { "Before" } th { "After" } } }
                tbody {
                    @for d in &items {
                        tr {
                            td { (d.entity.as_str()) }
                            td { @if d.entity == EntityKind::FrictionEntry { a href={ "/ui/catalogue/entries/" (d.id) } { (d.id) } } @else { (d.id) } }
                            td { (match d.change { DiffKind::Added => "added", DiffKind::Removed => "removed", DiffKind::Changed => "changed" }) }
                            td { (d.fields.join(", ")) }
                            td.json { (picked(d.from.as_ref(), &d.fields)) }
                            td.json { (picked(d.to.as_ref(), &d.fields)) }
                        }
                    }
                }
            }
        }
        p { a href={ "/v1/catalogue/diff?from=" (from) "&to=" (to) } { "As JSON" } " · " a href="/ui/catalogue" { "All entries" } }
    };
    visit.html(StatusCode::OK, page(title, Nav::Catalogue, &visit, body))
}

/// The named fields of an item (all of it when none are named), as compact JSON.
fn picked(item: Option<&Value>, fields: &[String]) -> String {
    let Some(item) = item else {
        return "—".into();
    };
    if fields.is_empty() {
        return item.to_string();
    }
    let part: serde_json::Map<String, Value> = fields
        .iter()
        .filter_map(|f| item.get(f).map(|v| (f.clone(), v.clone())))
        .collect();
    Value::Object(part).to_string()
}
