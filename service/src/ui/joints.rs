//! The joint registry on the page: the list (by tag, release status and
//! review mark, in pages) and one joint's page: its definition, releases,
//! the active release's chart and the release flow (`joint_release`).

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::html;
use serde::Deserialize;

use super::joint_release::{release_actions, release_section, review_mark, ReleaseValues};
use super::layout::{page, Nav};
use super::problem::Problem;
use super::session::{problem_page, Visit};
use super::UiState;
use crate::app::joints::{JointQuery, JointView};
use crate::app::releases::view::ReleaseView;
use crate::app::tokens::Role;

/// The list's filters as the page's GET form sends them.
#[derive(Debug, Default, Deserialize)]
pub struct ListQuery {
    #[serde(default)]
    tag: String,
    #[serde(default)]
    status: String,
    #[serde(default)]
    review: String,
    #[serde(default)]
    after: String,
}

fn given(s: &str) -> Option<String> {
    let s = s.trim();
    (!s.is_empty()).then(|| s.to_owned())
}

/// `GET /ui/joints`.
pub async fn list(
    req: HttpRequest,
    state: web::Data<UiState>,
    query: web::Query<ListQuery>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let title = "Joints";
    if let Err(p) = visit.caller(&state, Role::Reader).await {
        return problem_page(&visit, Nav::Joints, title, &p);
    }
    let q = query.into_inner();
    let filters = html! {
        form.filters method="get" action="/ui/joints" {
            label { "Tag " input name="tag" value=(q.tag) placeholder="any"; }
            label { "Release status "
                select name="status" {
                    option value="" selected[q.status.is_empty()] { "any" }
                    @for s in ["draft", "released", "superseded", "withdrawn"] {
                        option value=(s) selected[q.status == s] { (s) }
                    }
                }
            }
            label { input type="checkbox" name="review" value="due" checked[q.review == "due"]; " review due only" }
            button type="submit" { "Show" }
        }
    };
    if !q.review.is_empty() && q.review != "due" {
        let p = Problem::refusal(
            StatusCode::UNPROCESSABLE_ENTITY,
            "Input refused",
            "review",
            "the only review filter is 'due'",
        );
        let body = html! { h1 { (title) } (p.render()) (filters) };
        return visit.html(p.status, page(title, Nav::Joints, &visit, body));
    }
    let jq = JointQuery {
        tag: given(&q.tag),
        status: given(&q.status),
        review_due: q.review == "due",
        limit: Some(50),
        after: given(&q.after),
    };
    let found = match state.app.joints(&jq).await {
        Ok(p) => p,
        Err(e) => {
            let p = Problem::from_app(&e);
            let body = html! { h1 { (title) } (p.render()) (filters) };
            return visit.html(p.status, page(title, Nav::Joints, &visit, body));
        }
    };
    let next_link = found.next.as_ref().map(|after| {
        form_urlencoded::Serializer::new(String::new())
            .append_pair("tag", &q.tag)
            .append_pair("status", &q.status)
            .append_pair("review", &q.review)
            .append_pair("after", after)
            .finish()
    });
    let body = html! {
        h1 { (title) }
        (filters)
        @if found.joints.is_empty() { p { "No joint matches." } }
        @else {
            table.list id="joints" {
                thead { tr { th { "Joint" } th { "Title" } th { "Tags" } th { "Version" } th { "Review" } } }
                tbody {
                    @for j in &found.joints {
                        @let v = JointView::from(j);
                        tr {
                            td { a href={ "/ui/joints/" (v.id) } { (v.id) } }
                            td { (v.title) } td { (v.tags.join(", ")) } td.num { (v.version) }
                            td { @if let Some(r) = &v.review_due { span.check.warning { "due (revision " (r.revision) ")" } } }
                        }
                    }
                }
            }
        }
        @if let Some(next) = next_link { p { a href={ "/ui/joints?" (next) } { "Next page" } } }
    };
    visit.html(StatusCode::OK, page(title, Nav::Joints, &visit, body))
}

/// `GET /ui/joints/{id}`.
pub async fn one(
    req: HttpRequest,
    state: web::Data<UiState>,
    id: web::Path<String>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    joint_page(&visit, &state, &id, None, ReleaseValues::default()).await
}

/// Joint `id`'s page; after a refused post, with the refusal on top (and
/// its status) and the release form as it was sent.
pub async fn joint_page(
    visit: &Visit,
    state: &UiState,
    id: &str,
    refused: Option<Problem>,
    values: ReleaseValues,
) -> HttpResponse {
    let title = format!("Joint {id}");
    let fail =
        |p: Problem| problem_page(visit, Nav::Joints, &title, refused.as_ref().unwrap_or(&p));
    if let Err(p) = visit.caller(state, Role::Reader).await {
        return fail(p);
    }
    let joint = match state.app.joint(id).await {
        Ok(j) => JointView::from(&j),
        Err(e) => return fail(Problem::from_app(&e)),
    };
    let releases: Vec<ReleaseView> = match state.app.releases(&joint.id).await {
        Ok(rs) => rs.iter().map(|r| ReleaseView::of(r, None)).collect(),
        Err(e) => return fail(Problem::from_app(&e)),
    };
    let preview = match state.app.release_preview(&joint.id).await {
        Ok(p) => p,
        Err(e) => return fail(Problem::from_app(&e)),
    };
    let four_eyes = state.app.four_eyes();
    let active = releases.iter().any(|r| r.status == "released");
    let pretty = |v: &serde_json::Value| serde_json::to_string_pretty(v).unwrap_or_default();
    let body = html! {
        h1 { "Joint " (joint.id) }
        p.lead { (joint.title) }
        @if let Some(p) = &refused { (p.render()) }
        @if let Some(r) = &joint.review_due { (review_mark(visit, &joint.id, r)) }
        table.answer {
            tbody {
                tr { th scope="row" { "Tags" } td { (joint.tags.join(", ")) } }
                tr { th scope="row" { "Version" } td { (joint.version) } }
                tr { th scope="row" { "Four-eyes rule" } td { @if four_eyes { "on: a release is a draft until an approver other than its requester approves it" } @else { "off: a release is active at once" } } }
            }
        }
        h2 id="releases" { "Releases" }
        @if releases.is_empty() { p id="no-release" { "Not released yet: the line has nothing to fetch for this joint." } }
        @else {
            table.list id="release-list" {
                thead { tr { th { "Release" } th { "Status" } th { "Requested by" } th { "Approved by" } th { "When" } th { "Reason" } th { "Catalogue revision" } th { "Fetch" } th { "Change" } } }
                tbody {
                    @for r in &releases {
                        @let q = format!("?release={}", r.release);
                        tr {
                            td.num { (r.release) } td.status { (r.status) } td { (r.requested_by) }
                            td { (r.approved_by.as_deref().unwrap_or("")) } td { (r.created_at) } td { (r.reason) }
                            td.num { (r.catalogue_revision) }
                            td {
                                a href={ "/v1/joints/" (joint.id) "/spec" (q) } { "spec" } " · "
                                a href={ "/v1/joints/" (joint.id) "/setpoints" (q) } { "setpoints" } " · "
                                a href={ "/v1/joints/" (joint.id) "/chart.svg" (q) } { "chart" }
                            }
                            td { (release_actions(visit, &joint.id, r, four_eyes)) }
                        }
                    }
                }
            }
        }
        @if active {
            figure.chart {
                img id="release-chart" src={ "/v1/joints/" (joint.id) "/chart.svg" }
                    alt="Tightening window of the active release: clamp force against torque" width="640" height="420";
                figcaption { "Tightening window of the active release (the values the line fetches)." }
            }
        }
        (release_section(visit, &joint.id, &preview, &values, refused.as_ref()))
        h2 { "Spec request" }
        pre.json { (pretty(&joint.request)) }
        h2 { "Tool presentation" }
        pre.json { (pretty(&joint.setpoints)) }
        p { a href={ "/v1/joints/" (joint.id) } { "As JSON" } " · " a href="/ui/joints" { "All joints" } }
    };
    let status = refused.as_ref().map_or(StatusCode::OK, |p| p.status);
    visit.html(status, page(&title, Nav::Joints, visit, body))
}
