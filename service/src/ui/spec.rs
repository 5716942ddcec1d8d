//! `GET /ui/spec`: the calculator. A GET form with every parameter of the
//! spec query (the same declaration as `GET /v1/tightening-specs`, read
//! from its `IntoParams` so the form cannot miss one), each with its
//! meaning and unit; the answer as a table with the checks and cautions
//! first and the chart beside it. The page's address is the permalink.

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::{html, Markup};
use utoipa::IntoParams;

use super::layout::{coefficient, number, opt_qty, page, qty, Nav};
use super::problem::Problem;
use super::session::{problem_page, Visit};
use super::UiState;
use crate::app::spec::view::{spec_response, SpecResponse};
use crate::app::spec::{compute_one, SpecQuery};
use crate::app::tokens::Role;
use crate::app::{AppError, FieldProblem};

/// The form's sections: a title and the parameters in it, in order. A
/// parameter of the query named in none of them goes under "More".
const SECTIONS: [(&str, &[&str]); 5] = [
    (
        "Fastener and friction",
        &[
            "thread",
            "property_class",
            "finish",
            "lubricant",
            "thread_friction",
            "thread_friction_min",
            "thread_friction_max",
            "bearing_friction",
            "bearing_friction_min",
            "bearing_friction_max",
            "joint_tags",
        ],
    ),
    (
        "Tightening",
        &[
            "tightening_method",
            "tool_scatter",
            "utilisation",
            "prevailing_torque",
            "snug_torque",
            "window_mode",
            "required_clamp_load",
        ],
    ),
    (
        "Bearing surface",
        &[
            "head",
            "washer",
            "hole",
            "bearing_outer_diameter",
            "bearing_inner_diameter",
        ],
    ),
    (
        "Joint and bolt",
        &[
            "clamp_length",
            "clamped_material",
            "joint_outer_diameter",
            "joint_type",
            "engagement_length",
            "bolt_standard",
            "bolt_length",
            "bolt_thread_length",
        ],
    ),
    ("Answer", &["units", "catalogue_revision"]),
];

/// One form field: the query parameter's name, whether it is required and
/// its documentation.
struct Field {
    name: String,
    required: bool,
    doc: String,
}

fn fields() -> Vec<Field> {
    SpecQuery::into_params(|| None)
        .into_iter()
        .map(|p| Field {
            required: matches!(p.required, utoipa::openapi::Required::True),
            doc: p.description.unwrap_or_default(),
            name: p.name,
        })
        .collect()
}

/// Documentation text with `code` spans (the doc comments' backticks).
fn doc_markup(doc: &str) -> Markup {
    html! {
        @for (i, part) in doc.split('`').enumerate() {
            @if i % 2 == 1 { code { (part) } } @else { (part) }
        }
    }
}

/// The first example a doc names (`e.g. \`40mm\``), as a placeholder.
fn example(doc: &str) -> Option<&str> {
    doc.split('`').nth(1)
}

/// The query's pairs with blank values left out (an empty form field is
/// "not given"), at most 64 of them.
fn given_pairs(query: &str) -> Vec<(String, String)> {
    form_urlencoded::parse(query.as_bytes())
        .filter(|(_, v)| !v.trim().is_empty())
        .take(64)
        .map(|(k, v)| (k.into_owned(), v.trim().to_owned()))
        .collect()
}

fn encode(pairs: &[(String, String)]) -> String {
    form_urlencoded::Serializer::new(String::new())
        .extend_pairs(pairs)
        .finish()
}

/// The serde message's backticked field name, if it names one.
fn named_field(message: &str) -> Option<String> {
    ["missing field `", "unknown field `", "duplicate field `"]
        .iter()
        .find_map(|lead| message.split(lead).nth(1))
        .and_then(|rest| rest.split('`').next())
        .map(str::to_owned)
}

/// Reads the given pairs as the spec query, naming the refused field.
fn read_query(encoded: &str) -> Result<SpecQuery, AppError> {
    let pairs = serde_urlencoded::Deserializer::new(form_urlencoded::parse(encoded.as_bytes()));
    serde_path_to_error::deserialize(pairs).map_err(|e| {
        let path = e.path().to_string();
        let message = e.into_inner().to_string();
        let field = named_field(&message)
            .or_else(|| (path != "." && !path.is_empty()).then_some(path))
            .unwrap_or_else(|| "query".into());
        AppError::field(FieldProblem::malformed(field, message))
    })
}

async fn answer(state: &UiState, encoded: &str) -> Result<SpecResponse, AppError> {
    let query = read_query(encoded)?;
    let req = query.to_request().map_err(AppError::Fields)?;
    let snapshot = crate::app::spec::snapshot::pinned(&state.app, req.catalogue_revision).await?;
    let (resolved, spec) = compute_one(&req, &snapshot)?;
    Ok(spec_response(&spec, &resolved, state.app.stale()))
}

fn form(pairs: &[(String, String)], problem: Option<&Problem>) -> Markup {
    let all = fields();
    let value = |name: &str| {
        pairs
            .iter()
            .find(|(k, _)| k == name)
            .map_or("", |(_, v)| v.as_str())
    };
    let listed: Vec<&str> = SECTIONS
        .iter()
        .flat_map(|(_, names)| names.iter().copied())
        .collect();
    let more: Vec<&str> = all
        .iter()
        .map(|f| f.name.as_str())
        .filter(|n| !listed.contains(n))
        .collect();
    let field = |name: &str| {
        let Some(f) = all.iter().find(|f| f.name == name) else {
            return html! {};
        };
        let wrong = problem.is_some_and(|p| p.names(name));
        html! {
            div.field.wrong[wrong] {
                label for=(f.name) { code { (f.name) } @if f.required { " (required)" } }
                input id=(f.name) name=(f.name) value=(value(&f.name))
                    placeholder=[example(&f.doc)] required[f.required]
                    aria-describedby={ (f.name) "-doc" };
                small id={ (f.name) "-doc" } { (doc_markup(&f.doc)) }
            }
        }
    };
    html! {
        form.calculator method="get" action="/ui/spec" {
            @for (title, names) in SECTIONS {
                fieldset {
                    legend { (title) }
                    @for name in names.iter() { (field(name)) }
                }
            }
            @if !more.is_empty() {
                fieldset { legend { "More" } @for name in &more { (field(name)) } }
            }
            div.actions {
                button type="submit" id="compute" { "Compute" }
                a.secondary href="/ui/spec" { "Clear" }
            }
        }
    }
}

fn row(label: &str, value: String, note: &str) -> Markup {
    html! { tr { th scope="row" { (label) } td.num { (value) } td.note { (note) } } }
}

fn checks(a: &SpecResponse) -> Markup {
    html! {
        section.checks {
            h2 { "Checks" }
            @if a.checks.is_empty() { p.ok { "No check applies." } }
            @else {
                ul.found {
                    @for c in &a.checks {
                        li class={ "check " (c.severity) } {
                            strong { (c.severity.to_uppercase()) } " " code { (c.code) } " — " (c.message)
                        }
                    }
                }
            }
        }
    }
}

fn answer_table(a: &SpecResponse) -> Markup {
    let f = &a.friction;
    let range = |min: f64, max: f64| {
        if min == max {
            coefficient(min)
        } else {
            format!("{} – {}", coefficient(min), coefficient(max))
        }
    };
    html! {
        table.answer id="answer" {
            caption { "Tightening window, catalogue revision " (a.catalogue_revision) " (" (if a.units == crate::app::quantity::Units::Us { "US units" } else { "SI units" }) ")" }
            thead { tr { th { "Quantity" } th { "Value" } th { "Meaning" } } }
            tbody {
                (row("Lower torque", qty(&a.torque.lower), "lowest acceptable torque"))
                (row("Target torque", qty(&a.torque.target), "set this on the tool"))
                (row("Upper torque", qty(&a.torque.upper), "highest acceptable torque"))
                (row("Yield-limited torque", qty(&a.torque.upper_limit), "at minimum friction (VDI 2230 Part 1)"))
                (row("Preload min", qty(&a.preload.min), "at lower torque, maximum friction"))
                (row("Preload max", qty(&a.preload.max), "at upper torque, minimum friction"))
                (row("Permissible preload F_M,zul", qty(&a.preload.permissible), "VDI 2230 Part 1, at minimum thread friction"))
                (row("Tightening factor α_A", number(a.tightening_factor), "preload max / preload min"))
                @if a.angle.computed {
                    (row("Angle from snug", format!("{} – {}", opt_qty(a.angle.min.as_ref()), opt_qty(a.angle.max.as_ref())), "angle window after the snug torque"))
                    (row("Angle at yield", opt_qty(a.angle.at_yield.as_ref()), "a limit, never a target"))
                    (row("Snug torque", opt_qty(a.angle.snug_torque.as_ref()), a.angle.snug_torque_source.unwrap_or("")))
                } @else if let Some(why) = &a.angle.reason {
                    (row("Angle window", "—".into(), why))
                }
                @if let Some(c) = &a.clamp_load {
                    (row("Clamp load", serde_json::to_string(c).unwrap_or_default(), "the joint's clamp-load figures"))
                }
                (row("Thread friction μ_G", range(f.thread.min, f.thread.max), f.thread.origin))
                (row("Bearing friction μ_K", range(f.bearing.min, f.bearing.max), f.bearing.origin))
                (row("Method", a.method.name.to_string(), &format!("tool scatter ±{} % ({})", number(a.method.tool_scatter * 100.0), a.method.tool_scatter_source)))
                (row("Thread", a.fastener.thread.designation.clone(), &format!("stress area {}", qty(&a.fastener.stress_area))))
                (row("Property class", a.fastener.property_class.id.clone(), &format!("proof load {}, yield load {}", qty(&a.fastener.proof_load), qty(&a.fastener.yield_load))))
                (row("Bearing surface pressure", qty(&a.fastener.bearing.surface_pressure), &a.fastener.bearing.source))
                (row("Utilisation ν", number(a.utilisation), a.utilisation_source))
                (row("Upper torque limited by", a.governing.replace('_', " "), a.window_mode))
            }
        }
        @if let Some(e) = &f.catalogue_entry {
            p { "Friction from catalogue entry "
                a href={ "/ui/catalogue/entries/" (e.id) } { "#" (e.id) }
                " (revision " (e.revision) "; source: " (e.source) ")." }
        }
        section.cautions {
            h2 { "Cautions" }
            ul.cautions { @for t in a.cautions.texts() { li { (t) } } }
        }
        details.assumptions {
            summary { "Assumptions (" (a.assumptions.len()) ")" }
            ul { @for t in &a.assumptions { li { (t) } } }
        }
        p.hash { "Spec hash " code { (a.spec_hash) } }
        @if a.catalogue_may_be_stale {
            p.check.error { "The catalogue database is unreachable: this answer may be from a stale catalogue." }
        }
    }
}

/// `GET /ui/spec?<spec query>`.
pub async fn calculator(req: HttpRequest, state: web::Data<UiState>) -> HttpResponse {
    let visit = Visit::of(&req);
    if let Err(p) = visit.caller(&state, Role::Reader).await {
        return problem_page(&visit, Nav::Spec, "Tightening spec", &p);
    }
    let pairs = given_pairs(req.query_string());
    let encoded = encode(&pairs);
    let intro = html! {
        h1 { "Tightening spec" }
        p.lead { "Fill in at least the thread, the property class and either a catalogue finish and lubricant "
                 "or both friction values. Dimensional values carry their unit (" code { "40mm" } ", " code { "20kN" } ", "
                 code { "2N·m" } "); leave a field empty for its default. Example: "
                 a href="/ui/spec?thread=M10&property_class=8.8&finish=zinc-flake-lubricated&lubricant=none&tightening_method=dc-nutrunner" { "M10 8.8, zinc flake, DC nutrunner" } "." }
    };
    if pairs.is_empty() {
        let body = html! { (intro) (form(&pairs, None)) };
        return visit.html(
            StatusCode::OK,
            page("Tightening spec", Nav::Spec, &visit, body),
        );
    }
    match answer(&state, &encoded).await {
        Ok(a) => {
            let body = html! {
                (intro)
                div.result {
                    div.figures {
                        (checks(&a))
                        (answer_table(&a))
                        p.links {
                            a href={ "/ui/spec?" (encoded) } rel="bookmark" { "Permalink" } " · "
                            a href={ "/v1/tightening-specs?" (encoded) } { "JSON" } " · "
                            a href={ "/v1/setpoints?" (encoded) } { "Tool setpoints (JSON)" }
                        }
                    }
                    figure.chart {
                        img id="window-chart" src={ "/v1/tightening-specs/chart.svg?" (encoded) }
                            alt="Clamp force against torque: friction lines, the torque window and the preload limits" width="640" height="420";
                        figcaption { "Tightening window: clamp force against torque." }
                    }
                    @if a.joint.as_ref().is_some_and(|j| j.residual_clamp_load_min.is_some()) {
                        figure.chart {
                            img id="joint-diagram" src={ "/v1/tightening-specs/joint-diagram.svg?" (encoded) }
                                alt="Joint diagram: force against deformation of bolt and clamped parts with F_M, F_Z, F_A, F_SA and F_KR,min" width="640" height="420";
                            figcaption { "Joint diagram (working state): force against deformation." }
                        }
                    }
                }
                (form(&pairs, None))
            };
            visit.html(
                StatusCode::OK,
                page("Tightening spec", Nav::Spec, &visit, body),
            )
        }
        Err(e) => {
            let p = Problem::from_app(&e);
            let body = html! { (intro) (p.render()) (form(&pairs, Some(&p))) };
            visit.html(p.status, page("Tightening spec", Nav::Spec, &visit, body))
        }
    }
}
