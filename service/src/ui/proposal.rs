//! The catalogue change a stored friction test supports, on the page: the
//! ranges now and proposed, the impact on the released joints, and the
//! form that applies it (editor token, CSRF checks, the entry's ETag as
//! shown, so a change made meanwhile is refused as with `If-Match`).

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::{html, Markup};
use serde::Deserialize;

use super::layout::{coefficient, Nav};
use super::problem::Problem;
use super::session::{csrf_field, problem_page, Visit};
use super::UiState;
use crate::app::friction_tests::proposal::{ProposalResponse, RangeResponse};
use crate::app::tokens::Role;

pub fn proposal(visit: &Visit, p: &ProposalResponse) -> Markup {
    let range = |r: &Option<RangeResponse>| {
        r.as_ref().map_or_else(
            || "—".into(),
            |r| format!("{} – {}", coefficient(r.min), coefficient(r.max)),
        )
    };
    html! {
        section.proposal id="proposal" {
            h2 { "Proposed catalogue change (" (p.basis) ")" }
            p { "Entry " a href={ "/ui/catalogue/entries/" (p.entry_id) } { "#" (p.entry_id) } ": " (p.finish) " with " (p.lubricant)
                ", catalogue revision " (p.catalogue_revision) "." }
            table.list {
                thead { tr { th { "Coefficient" } th { "Now" } th { "Proposed" } th { "Note" } } }
                tbody { @for c in &p.changes { tr.changed[c.changed] { td { (c.coefficient) } td.num { (range(&c.current)) } td.num { (range(&c.proposed)) } td.note { (c.note) } } } }
            }
            (super::impact::impact_table(&p.impact))
            ul.cautions { @for c in &p.cautions { li { (c) } } }
            form.apply method="post" action={ "/ui/friction-tests/" (p.series_id) "/apply" } {
                (csrf_field(visit))
                input type="hidden" name="basis" value=(p.basis);
                input type="hidden" name="entry_etag" value=(p.entry_etag);
                div.field {
                    label for="reason" { "Reason for the catalogue change (required)" }
                    input id="reason" name="reason" size="60";
                }
                div.actions { button type="submit" id="apply" { "Apply to the catalogue (editor token)" } }
            }
        }
    }
}

/// The apply form as posted.
#[derive(Debug, Default, Deserialize)]
pub struct ApplyForm {
    #[serde(default)]
    csrf: String,
    #[serde(default)]
    basis: String,
    #[serde(default)]
    reason: String,
    /// The entry's ETag when the proposal was shown (`"entry-<id>-r<n>"`):
    /// a change made meanwhile is refused (412), as with `If-Match`.
    #[serde(default)]
    entry_etag: String,
}

/// The revision `n` of an entry ETag `"entry-<id>-r<n>"` for `entry_id`.
fn etag_revision(etag: &str, entry_id: i64) -> Option<i64> {
    etag.trim()
        .trim_matches('"')
        .strip_prefix(&format!("entry-{entry_id}-r"))?
        .parse()
        .ok()
}

/// `POST /ui/friction-tests/{id}/apply`: the proposal becomes a catalogue
/// revision with the series as evidence (editor token, CSRF checks); 303
/// to the entry's history.
pub async fn apply(
    req: HttpRequest,
    state: web::Data<UiState>,
    id: web::Path<String>,
    form_data: web::Form<ApplyForm>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let title = format!("Friction test {id}");
    let refuse = |p: &Problem| problem_page(&visit, Nav::FrictionTests, &title, p);
    if let Err(p) = visit.check_post(&req, &form_data.csrf) {
        return refuse(&p);
    }
    let actor = match visit.caller(&state, Role::Editor).await {
        Ok(a) => a,
        Err(p) => return refuse(&p),
    };
    let Ok(n) = id.parse::<i64>() else {
        return refuse(&Problem::refusal(
            StatusCode::NOT_FOUND,
            "Not known",
            "id",
            format!("'{id}' is not a friction test id"),
        ));
    };
    let pending = match state
        .app
        .prepare_apply(n, Some(&form_data.basis), Some(&form_data.reason))
        .await
    {
        Ok(p) => p,
        Err(e) => return refuse(&Problem::from_app(&e)),
    };
    let entry_id = pending.entry_id();
    let Some(expected) = etag_revision(&form_data.entry_etag, entry_id) else {
        return refuse(&Problem::refusal(
            StatusCode::UNPROCESSABLE_ENTITY,
            "Input refused",
            "entry_etag",
            format!("not the ETag of entry {entry_id}; reload the series page"),
        ));
    };
    match state.app.apply_series(&actor, pending, expected).await {
        Ok(_) => visit.see_other(&format!("/ui/catalogue/entries/{entry_id}")),
        Err(e) => refuse(&Problem::from_app(&e)),
    }
}
