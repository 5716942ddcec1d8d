//! The release flow on a joint's page: what a new release would change
//! (the joint computed now against the active release), the checks of the
//! computation now, the release form (a reason, and for each error check
//! a reason to accept it), and the forms that approve or withdraw a
//! release and confirm a due review. Every post needs the token cookie
//! with the API's role and passes the CSRF and origin checks; a refusal
//! shows the joint's page again with the problem on it.

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::{html, Markup};
use serde_json::{json, Value};

use super::joints::joint_page;
use super::layout::{number, qty};
use super::problem::Problem;
use super::session::{csrf_field, Visit};
use super::UiState;
use crate::app::impact::figures::ImpactFigures;
use crate::app::impact::preview::ReleasePreview;
use crate::app::joints::ReviewDueView;
use crate::app::quantity::Quantity;
use crate::app::releases::view::ReleaseView;
use crate::app::tokens::Role;

/// Prefix of a release form's field accepting one error check.
const ACCEPT: &str = "accept.";

/// What the release form held, shown again after a refusal.
#[derive(Debug, Default, Clone)]
pub struct ReleaseValues {
    pub reason: String,
    /// (check code, reason) as typed.
    pub accepted: Vec<(String, String)>,
}

impl ReleaseValues {
    fn read(fields: &[(String, String)]) -> Self {
        let mut v = Self::default();
        for (name, value) in fields {
            if name == "reason" {
                v.reason = value.clone();
            } else if let Some(code) = name.strip_prefix(ACCEPT) {
                v.accepted.push((code.to_owned(), value.clone()));
            }
        }
        v
    }

    fn accepted(&self, code: &str) -> &str {
        self.accepted
            .iter()
            .find(|(c, _)| c == code)
            .map_or("", |(_, r)| r.as_str())
    }

    /// The API's release body: the reason and each check accepted with a
    /// reason (a blank one is not an acceptance).
    fn body(&self) -> Value {
        let accept: Vec<Value> = self
            .accepted
            .iter()
            .filter(|(_, r)| !r.trim().is_empty())
            .map(|(c, r)| json!({"code": c, "reason": r}))
            .collect();
        json!({"reason": self.reason, "accept_checks": accept})
    }
}

fn field<'a>(fields: &'a [(String, String)], name: &str) -> &'a str {
    fields
        .iter()
        .find(|(n, _)| n == name)
        .map_or("", |(_, v)| v.as_str())
}

type Row<'a> = (&'a str, Option<&'a Quantity>, Option<&'a Quantity>);

fn rows<'a>(before: Option<&'a ImpactFigures>, after: Option<&'a ImpactFigures>) -> Vec<Row<'a>> {
    let pick = |f: Option<&'a ImpactFigures>, g: fn(&'a ImpactFigures) -> Option<&'a Quantity>| {
        f.and_then(g)
    };
    let mut out: Vec<Row<'a>> = vec![
        (
            "Lower torque",
            pick(before, |f| Some(&f.lower)),
            pick(after, |f| Some(&f.lower)),
        ),
        (
            "Target torque",
            pick(before, |f| Some(&f.target)),
            pick(after, |f| Some(&f.target)),
        ),
        (
            "Upper torque",
            pick(before, |f| Some(&f.upper)),
            pick(after, |f| Some(&f.upper)),
        ),
        (
            "Preload min",
            pick(before, |f| Some(&f.preload_min)),
            pick(after, |f| Some(&f.preload_min)),
        ),
        (
            "Preload max",
            pick(before, |f| Some(&f.preload_max)),
            pick(after, |f| Some(&f.preload_max)),
        ),
    ];
    let angle_min = |f: &'a ImpactFigures| f.angle_min.as_ref();
    let angle_max = |f: &'a ImpactFigures| f.angle_max.as_ref();
    if pick(before, angle_min).is_some() || pick(after, angle_min).is_some() {
        out.push(("Angle min", pick(before, angle_min), pick(after, angle_min)));
        out.push(("Angle max", pick(before, angle_max), pick(after, angle_max)));
    }
    out
}

fn shown(q: Option<&Quantity>) -> String {
    q.map_or_else(|| "—".into(), qty)
}

fn codes(list: &[String]) -> String {
    if list.is_empty() {
        "none".into()
    } else {
        list.join(", ")
    }
}

/// The preview, the checks now and the release form.
pub fn release_section(
    visit: &Visit,
    joint_id: &str,
    p: &ReleasePreview,
    values: &ReleaseValues,
    refused: Option<&Problem>,
) -> Markup {
    let cmp = p.against_active.as_ref();
    let before = cmp.and_then(|c| c.before.as_ref());
    let after = p.now.as_ref().ok();
    let wrong = |name: &str| refused.is_some_and(|r| r.names(name));
    html! {
        section.release-flow id="release-preview" {
            h2 { "A new release now" }
            p { "Computed now against catalogue revision " strong { (p.catalogue_revision) } ", "
                @if let Some(c) = cmp { "compared with release " (c.release) ", the active one." }
                @else { "with no active release to compare with." } }
            @if let Err(why) = &p.now { p.check.error { strong { "Does not compute: " } (why) } }
            table.list id="impact" {
                thead { tr { th { "Figure" } th { "Active release" } th { "Now" } } }
                tbody {
                    @for (name, b, a) in rows(before, after) {
                        tr.changed[cmp.is_some() && b != a] { th scope="row" { (name) } td.num { (shown(b)) } td.num { (shown(a)) } }
                    }
                }
            }
            @if let Some(c) = cmp {
                ul.summary {
                    li { "Largest change: " strong { (c.change_percent.map_or_else(|| "not comparable".into(), |v| format!("{} %", number(v)))) } }
                    li { "Checks added: " (codes(&c.checks_added)) }
                    li { "Checks removed: " (codes(&c.checks_removed)) }
                    @if !c.changed { li.ok { "Nothing would change: the active release still holds." } }
                }
            }
            h3 { "Checks now" }
            @if p.checks.is_empty() { p.ok { "No check applies." } }
            @else {
                table.list id="checks-now" {
                    thead { tr { th { "Severity" } th { "Check" } th { "Message" } } }
                    tbody { @for c in &p.checks {
                        tr { td { span class={ "check " (c.severity) } { (c.severity) } } td { code { (c.code) } } td { (c.message) } }
                    } }
                }
            }
            form.release method="post" action={ "/ui/joints/" (joint_id) "/release" } {
                (csrf_field(visit))
                div.field.wrong[wrong("reason")] {
                    label for="release-reason" { "Reason for the release (required)" }
                    input id="release-reason" name="reason" size="60" value=(values.reason);
                }
                @for c in p.error_checks() {
                    div.field.wrong[wrong("accept_checks")] {
                        label for={ "accept-" (c.code) } { "Accept error check " code { (c.code) } " because (blank: not accepted)" }
                        input id={ "accept-" (c.code) } name={ (ACCEPT) (c.code) } size="60" value=(values.accepted(c.code));
                    }
                }
                div.actions { button type="submit" id="release" { "Release (editor token)" } }
            }
        }
    }
}

fn status_form(visit: &Visit, joint_id: &str, number: i64, action: &str, label: &str) -> Markup {
    html! {
        form.inline method="post" action={ "/ui/joints/" (joint_id) "/releases/" (number) "/" (action) } {
            (csrf_field(visit))
            input name="reason" placeholder="reason" size="18" aria-label={ (label) " reason" };
            button type="submit" id={ (action) "-" (number) } class="secondary" { (label) }
        }
    }
}

/// The status changes a release still allows: approve a draft (when the
/// four-eyes rule is on; approver token), withdraw a draft or the active
/// release (editor token).
pub fn release_actions(visit: &Visit, joint_id: &str, r: &ReleaseView, four_eyes: bool) -> Markup {
    html! {
        @if r.status == "draft" && four_eyes { (status_form(visit, joint_id, r.release, "approve", "Approve")) }
        @if r.status == "draft" || r.status == "released" { (status_form(visit, joint_id, r.release, "withdraw", "Withdraw")) }
    }
}

/// The review-due mark with the revision that caused it and the form that
/// confirms the active release still holds.
pub fn review_mark(visit: &Visit, joint_id: &str, r: &ReviewDueView) -> Markup {
    html! {
        section.check.warning id="review-due" {
            p { strong { "Review due: " } "catalogue revision " (r.revision) " would move this joint's spec (marked " (r.since) "). "
                "Release again below, or confirm that the active release still holds." }
            form.inline method="post" action={ "/ui/joints/" (joint_id) "/review/confirm" } {
                (csrf_field(visit))
                input name="reason" placeholder="why the active release still holds" size="40" aria-label="confirmation reason";
                button type="submit" id="confirm-review" class="secondary" { "Confirm review (editor token)" }
            }
        }
    }
}

/// The form checks and the caller's role, or the refusal.
async fn allowed(
    visit: &Visit,
    req: &HttpRequest,
    state: &UiState,
    fields: &[(String, String)],
    needed: Role,
) -> Result<String, Problem> {
    visit.check_post(req, field(fields, "csrf"))?;
    visit.caller(state, needed).await
}

/// `POST /ui/joints/{id}/release`: releases the joint; 303 to its page.
pub async fn release(
    req: HttpRequest,
    state: web::Data<UiState>,
    id: web::Path<String>,
    form: web::Form<Vec<(String, String)>>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let values = ReleaseValues::read(&form);
    let outcome = match allowed(&visit, &req, &state, &form, Role::Editor).await {
        Ok(actor) => state
            .app
            .release_joint(&actor, &id, &values.body())
            .await
            .map_err(|e| Problem::from_app(&e)),
        Err(p) => Err(p),
    };
    match outcome {
        Ok(r) => visit.see_other(&format!("/ui/joints/{}#releases", r.joint_id)),
        Err(p) => joint_page(&visit, &state, &id, Some(p), values).await,
    }
}

/// Which status change a post asks for.
#[derive(Debug, Clone, Copy)]
enum StatusChange {
    Approve,
    Withdraw,
}

async fn change_status(
    req: HttpRequest,
    state: web::Data<UiState>,
    path: web::Path<(String, String)>,
    form: web::Form<Vec<(String, String)>>,
    change: StatusChange,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let (id, n) = path.into_inner();
    let needed = match change {
        StatusChange::Approve => Role::Approver,
        StatusChange::Withdraw => Role::Editor,
    };
    let outcome = async {
        let actor = allowed(&visit, &req, &state, &form, needed).await?;
        let number: i64 = n.parse().map_err(|_| {
            Problem::refusal(
                StatusCode::NOT_FOUND,
                "Not known",
                "release",
                format!("'{n}' is not a release number"),
            )
        })?;
        let body = json!({"reason": field(&form, "reason")});
        let done = match change {
            StatusChange::Approve => state.app.approve_release(&actor, &id, number, &body).await,
            StatusChange::Withdraw => state.app.withdraw_release(&actor, &id, number, &body).await,
        };
        done.map_err(|e| Problem::from_app(&e))
    }
    .await;
    match outcome {
        Ok(r) => visit.see_other(&format!("/ui/joints/{}#releases", r.joint_id)),
        Err(p) => joint_page(&visit, &state, &id, Some(p), ReleaseValues::default()).await,
    }
}

/// `POST /ui/joints/{id}/releases/{n}/approve` (approver token).
pub async fn approve(
    req: HttpRequest,
    state: web::Data<UiState>,
    path: web::Path<(String, String)>,
    form: web::Form<Vec<(String, String)>>,
) -> HttpResponse {
    change_status(req, state, path, form, StatusChange::Approve).await
}

/// `POST /ui/joints/{id}/releases/{n}/withdraw` (editor token).
pub async fn withdraw(
    req: HttpRequest,
    state: web::Data<UiState>,
    path: web::Path<(String, String)>,
    form: web::Form<Vec<(String, String)>>,
) -> HttpResponse {
    change_status(req, state, path, form, StatusChange::Withdraw).await
}

/// `POST /ui/joints/{id}/review/confirm` (editor token).
pub async fn confirm(
    req: HttpRequest,
    state: web::Data<UiState>,
    id: web::Path<String>,
    form: web::Form<Vec<(String, String)>>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let outcome = match allowed(&visit, &req, &state, &form, Role::Editor).await {
        Ok(actor) => {
            let body = json!({"reason": field(&form, "reason")});
            state
                .app
                .confirm_review(&actor, &id, &body)
                .await
                .map_err(|e| Problem::from_app(&e))
        }
        Err(p) => Err(p),
    };
    match outcome {
        Ok(j) => visit.see_other(&format!("/ui/joints/{}", j.id)),
        Err(p) => joint_page(&visit, &state, &id, Some(p), ReleaseValues::default()).await,
    }
}
