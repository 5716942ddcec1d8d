//! Friction tests on the page: a series as a CSV file (pasted, or read
//! from a chosen file by the page's script) with the fastener it tested;
//! "Evaluate" shows the ISO 16047 evaluation, "Record" stores it (a write:
//! editor token, CSRF checks) and opens the stored series with its chart
//! and the catalogue change it supports.

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::{html, Markup};
use serde::Deserialize;

use super::layout::{number, opt_qty, page, qty, Nav};
use super::problem::Problem;
use super::session::{csrf_field, problem_page, Visit};
use super::UiState;
use crate::app::friction_tests::csv_series::specimens_from_csv;
use crate::app::friction_tests::wire::{EvaluationResponse, SeriesRequest};
use crate::app::quantity::Units;
use crate::app::tokens::Role;
use crate::app::{AppError, FieldProblem};

const TITLE: &str = "Friction tests";

/// The upload form as posted (every field text; blank means not given).
#[derive(Debug, Default, Deserialize)]
pub struct SeriesForm {
    #[serde(default)]
    csrf: String,
    #[serde(default)]
    action: String,
    #[serde(default)]
    thread: String,
    #[serde(default)]
    property_class: String,
    #[serde(default)]
    finish: String,
    #[serde(default)]
    lubricant: String,
    #[serde(default)]
    head: String,
    #[serde(default)]
    thrust_bearing: Option<String>,
    #[serde(default)]
    units: String,
    #[serde(default)]
    csv: String,
    #[serde(default)]
    notes: String,
}

fn given(s: &str) -> Option<String> {
    let s = s.trim();
    (!s.is_empty()).then(|| s.to_owned())
}

impl SeriesForm {
    fn units(&self) -> Units {
        if self.units == "us" {
            Units::Us
        } else {
            Units::Si
        }
    }

    /// The series request, or the problems naming the form's fields.
    fn request(&self) -> Result<SeriesRequest, AppError> {
        let specimens = specimens_from_csv(&self.csv)
            .map_err(|reason| AppError::field(FieldProblem::malformed("csv", reason)))?;
        let thrust_bearing = self.thrust_bearing.is_some();
        Ok(SeriesRequest {
            thread: self.thread.trim().to_owned(),
            property_class: given(&self.property_class),
            finish: given(&self.finish),
            lubricant: given(&self.lubricant),
            head: given(&self.head).or_else(|| (!thrust_bearing).then(|| "hexagon-head".into())),
            washer: None,
            hole: None,
            bearing: None,
            thrust_bearing,
            evaluation_clamp_force: None,
            specimens,
            notes: given(&self.notes),
        })
    }
}

const EXAMPLE_CSV: &str = "clamp_force [kN],total_torque [N·m],thread_torque [N·m]\n";

fn form(visit: &Visit, f: &SeriesForm, problem: Option<&Problem>) -> Markup {
    let wrong = |name: &str| problem.is_some_and(|p| p.names(name));
    let text = |name: &str, label: &str, value: &str, help: &str| {
        html! {
            div.field.wrong[wrong(name)] {
                label for=(name) { (label) }
                input id=(name) name=(name) value=(value);
                small { (help) }
            }
        }
    };
    html! {
        form.series method="post" action="/ui/friction-tests" {
            (csrf_field(visit))
            fieldset.grid {
                legend { "Tested fastener" }
                (text("thread", "Thread (required)", &f.thread, "designation, e.g. M10 or 1/2-13 UNC"))
                (text("property_class", "Property class", &f.property_class, "of the tested bolts, e.g. 8.8"))
                (text("finish", "Finish", &f.finish, "catalogue finish id; required to record"))
                (text("lubricant", "Lubricant", &f.lubricant, "catalogue lubricant id; required to record"))
                (text("head", "Head type", &f.head, "default hexagon-head on a medium clearance hole"))
                div.field {
                    label { input type="checkbox" name="thrust_bearing" value="on" checked[f.thrust_bearing.is_some()];
                        " Thrust bearing under the turned part" }
                    small { "the measured torque is then thread torque only" }
                }
                div.field {
                    label for="units" { "Units of the answer" }
                    select id="units" name="units" {
                        option value="si" selected[f.units != "us"] { "SI (N, N·m, mm)" }
                        option value="us" selected[f.units == "us"] { "US (lbf, lbf·ft, in)" }
                    }
                }
            }
            fieldset.wrong[wrong("csv")] {
                legend { "Series (CSV)" }
                p { "One header row with each column's unit in brackets, then one row per specimen in test order: "
                    code { "clamp_force [kN]" } " (or N, lbf), " code { "total_torque [N·m]" } " (or lbf·in, lbf·ft) and, optionally, "
                    code { "thread_torque [N·m]" } " (an empty cell: not measured)." }
                input type="file" id="csv-file" accept=".csv,text/csv" data-into="csv" hidden;
                label.file-pick for="csv-file" hidden { "Read a CSV file into the box" }
                textarea id="csv" name="csv" rows="10" cols="60" placeholder=(EXAMPLE_CSV) { (f.csv) }
                div.field { label for="notes" { "Notes" } input id="notes" name="notes" value=(f.notes); }
            }
            div.actions {
                button type="submit" name="action" value="evaluate" id="evaluate" { "Evaluate" }
                button type="submit" name="action" value="record" id="record" class="secondary" { "Record (editor token)" }
            }
        }
    }
}

fn stat_row(
    name: &str,
    s: Option<&crate::app::friction_tests::wire::CoefficientStatisticsResponse>,
) -> Markup {
    html! {
        @if let Some(s) = s {
            tr { th scope="row" { (name) } td.num { (s.count) } td.num { (number(s.mean)) }
                 td.num { (s.std_dev.map_or_else(|| "—".into(), number)) }
                 td.num { (number(s.min)) } td.num { (number(s.max)) } }
        }
    }
}

fn evaluation(e: &EvaluationResponse) -> Markup {
    let s = &e.statistics;
    html! {
        section.evaluation id="evaluation" {
            h2 { "Evaluation: " (e.thread) " " (e.property_class.as_deref().unwrap_or("")) }
            @if !e.warnings.is_empty() {
                ul { @for w in &e.warnings { li.check.warning { strong { "WARNING " } code { (w.code) } " — " (w.message) } } }
            }
            table.list {
                caption { "Statistics of the series (" (e.method.evaluation) ")" }
                thead { tr { th { "Coefficient" } th { "n" } th { "Mean" } th { "Std. dev." } th { "Min" } th { "Max" } } }
                tbody {
                    (stat_row("Thread friction μ_th", s.thread_friction.as_ref()))
                    (stat_row("Bearing friction μ_b", s.bearing_friction.as_ref()))
                    (stat_row("Total friction μ_tot", s.total_friction.as_ref()))
                    (stat_row("Nut factor K", s.nut_factor.as_ref()))
                }
            }
            table.list {
                caption { "Specimens" }
                thead { tr { th { "#" } th { "Form" } th { "Clamp force" } th { "Total torque" } th { "Thread torque" } th { "μ_th" } th { "μ_b" } } }
                tbody {
                    @for (i, sp) in e.specimens.iter().enumerate() {
                        tr { td { (i + 1) } td { (sp.form) } td.num { (qty(&sp.clamp_force)) } td.num { (qty(&sp.total_torque)) }
                             td.num { (opt_qty(sp.thread_torque.as_ref())) }
                             td.num { (sp.thread_friction.map_or_else(|| "—".into(), number)) }
                             td.num { (sp.bearing_friction.map_or_else(|| "—".into(), number)) } }
                    }
                }
            }
            ul.cautions { @for c in &e.cautions { li { (c) } } }
        }
    }
}

/// `GET /ui/friction-tests`.
pub async fn form_page(req: HttpRequest) -> HttpResponse {
    let visit = Visit::of(&req);
    let body = html! {
        h1 { (TITLE) }
        p.lead { "Evaluate a torque–tension test series (ISO 16047) without storing it, or record it as evidence "
                 "for the catalogue (needs a token with role editor)." }
        (form(&visit, &SeriesForm::default(), None))
    };
    visit.html(
        StatusCode::OK,
        page(TITLE, Nav::FrictionTests, &visit, body),
    )
}

/// `POST /ui/friction-tests`: evaluate, or record (then 303 to the series).
pub async fn submit(
    req: HttpRequest,
    state: web::Data<UiState>,
    form_data: web::Form<SeriesForm>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let f = form_data.into_inner();
    let again = |p: &Problem| {
        let body = html! { h1 { (TITLE) } (p.render()) (form(&visit, &f, Some(p))) };
        visit.html(p.status, page(TITLE, Nav::FrictionTests, &visit, body))
    };
    if let Err(p) = visit.check_post(&req, &f.csrf) {
        return again(&p);
    }
    let record = f.action == "record";
    let needed = if record { Role::Editor } else { Role::Reader };
    let actor = match visit.caller(&state, needed).await {
        Ok(a) => a,
        Err(p) => return again(&p),
    };
    let series = match f.request() {
        Ok(s) => s,
        Err(e) => return again(&Problem::from_app(&e)),
    };
    if record {
        return match state.app.record_series(&actor, &series).await {
            Ok(stored) => visit.see_other(&format!("/ui/friction-tests/{}", stored.id)),
            Err(e) => again(&Problem::from_app(&e)),
        };
    }
    match state.app.evaluate_series(&series, f.units()) {
        Ok(e) => {
            let body = html! { h1 { (TITLE) } (evaluation(&e)) (form(&visit, &f, None)) };
            visit.html(
                StatusCode::OK,
                page(TITLE, Nav::FrictionTests, &visit, body),
            )
        }
        Err(e) => again(&Problem::from_app(&e)),
    }
}

/// The proposal's basis on the stored series' page (`observed` when blank).
#[derive(Debug, Default, Deserialize)]
pub struct BasisQuery {
    #[serde(default)]
    basis: String,
}

/// `GET /ui/friction-tests/{id}?basis=`: a stored series, its chart and
/// the proposal on the chosen basis.
pub async fn stored(
    req: HttpRequest,
    state: web::Data<UiState>,
    id: web::Path<String>,
    query: web::Query<BasisQuery>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let title = format!("Friction test {id}");
    if let Err(p) = visit.caller(&state, Role::Reader).await {
        return problem_page(&visit, Nav::FrictionTests, &title, &p);
    }
    let Ok(n) = id.parse::<i64>() else {
        let p = Problem::refusal(
            StatusCode::NOT_FOUND,
            "Not known",
            "id",
            format!("'{id}' is not a friction test id"),
        );
        return problem_page(&visit, Nav::FrictionTests, &title, &p);
    };
    let series = match state.app.stored_series(n).await {
        Ok(s) => s,
        Err(e) => return problem_page(&visit, Nav::FrictionTests, &title, &Problem::from_app(&e)),
    };
    let basis = if query.basis.trim().is_empty() {
        "observed"
    } else {
        query.basis.trim()
    };
    let proposed = state.app.series_proposal(n, Some(basis)).await;
    let basis_form = html! {
        form.filters method="get" action={ "/ui/friction-tests/" (n) } {
            label { "Proposal basis "
                select name="basis" {
                    option value="observed" selected[basis == "observed"] { "observed: min to max of the series" }
                    option value="three_sigma" selected[basis == "three_sigma"] { "three_sigma: mean ± 3σ" }
                }
            }
            button type="submit" { "Show" }
        }
    };
    let body = html! {
        h1 { "Friction test " (n) }
        p.lead { "Recorded by " (series.actor) " at " (series.created_at) " against catalogue revision "
                 (series.catalogue_revision) "; evidence " code { (series.evidence) } "." }
        div.result {
            (evaluation(&series.evaluation))
            figure.chart {
                img id="series-chart" src={ "/v1/friction-tests/" (n) "/chart.svg" }
                    alt="Each specimen's torque against clamp force and the distribution of the friction coefficients" width="640" height="420";
                figcaption { "The series: specimens and the friction distribution." }
            }
        }
        (basis_form)
        @match &proposed {
            Ok(p) => (super::proposal::proposal(&visit, p)),
            Err(e) => (Problem::from_app(e).render()),
        }
    };
    visit.html(
        StatusCode::OK,
        page(&title, Nav::FrictionTests, &visit, body),
    )
}
