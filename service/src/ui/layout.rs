//! The page shell (header, navigation, footer with the safety notes), the
//! home page and small rendering helpers shared by the pages.

use actix_web::http::StatusCode;
use actix_web::{web, HttpRequest, HttpResponse};
use maud::{html, Markup, DOCTYPE};

use super::session::Visit;
use super::UiState;
use crate::app::quantity::Quantity;

/// Which part of the page is open (marked in the navigation).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Nav {
    Home,
    Spec,
    Catalogue,
    FrictionTests,
    Joints,
    Token,
}

const LINKS: [(Nav, &str, &str); 6] = [
    (Nav::Home, "/ui/", "Overview"),
    (Nav::Spec, "/ui/spec", "Tightening spec"),
    (Nav::Catalogue, "/ui/catalogue", "Friction catalogue"),
    (Nav::FrictionTests, "/ui/friction-tests", "Friction tests"),
    (Nav::Joints, "/ui/joints", "Joints"),
    (Nav::Token, "/ui/token", "Token"),
];

/// A whole page around `body`.
pub fn page(title: &str, nav: Nav, visit: &Visit, body: Markup) -> Markup {
    html! {
        (DOCTYPE)
        html lang="en" {
            head {
                meta charset="utf-8";
                meta name="viewport" content="width=device-width, initial-scale=1";
                title { (title) " · tightspec" }
                link rel="stylesheet" href="/ui/assets/ui.css";
                script src="/ui/assets/ui.js" defer {}
            }
            body {
                header.top {
                    a.brand href="/ui/" { "tightspec" }
                    nav {
                        @for (n, href, label) in LINKS {
                            @if n == nav { a.here href=(href) aria-current="page" { (label) } }
                            @else { a href=(href) { (label) } }
                        }
                    }
                    span.who { @if visit.has_token() { "token kept" } @else { "no token" } }
                }
                main { (body) }
                footer {
                    p { "Every figure here is an engineering estimate: confirm it by joint tests (ISO 16047 for friction) "
                        "and by the capability of the tool. Drawings, local codes and licensed engineering practice take "
                        "precedence; safety-critical joints need the sign-off of the responsible engineer." }
                    p { "The same answers as JSON: " a href="/openapi.json" { "the API description" } "." }
                }
            }
        }
    }
}

/// A quantity as `12.3 N·m`, to a sensible number of significant figures.
pub fn qty(q: &Quantity) -> String {
    format!("{} {}", number(q.value), q.unit)
}

/// A number with four significant figures (no exponent for plant values).
pub fn number(v: f64) -> String {
    if !v.is_finite() {
        return "—".into();
    }
    if v == 0.0 {
        return "0".into();
    }
    let magnitude = v.abs().log10().floor() as i32;
    let decimals = (3 - magnitude).clamp(0, 6) as usize;
    format!("{v:.decimals$}")
}

/// A friction coefficient or other small ratio: up to four decimals, no
/// trailing zeros (0.09, 0.125).
pub fn coefficient(v: f64) -> String {
    if !v.is_finite() {
        return "—".into();
    }
    let text = format!("{v:.4}");
    text.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// An optional quantity, a dash when absent.
pub fn opt_qty(q: Option<&Quantity>) -> String {
    q.map_or_else(|| "—".into(), qty)
}

/// `GET /ui/`: what the page offers, the catalogue revision it serves.
pub async fn home(req: HttpRequest, state: web::Data<UiState>) -> HttpResponse {
    let visit = Visit::of(&req);
    let body = html! {
        h1 { "Tightening specifications" }
        p.lead { "Torque and angle windows for a threaded fastener and its joint, from the friction catalogue "
                 "(revision " strong { (state.app.revision()) } "), with every check and caution that applies." }
        div.cards {
            a.card href="/ui/spec" { h2 { "Tightening spec" } p { "Thread, property class, friction and joint in; torque window, preload range, angle window and checks out. The address of the answer is its permalink." } }
            a.card href="/ui/catalogue" { h2 { "Friction catalogue" } p { "Finish and lubricant pairs with their thread and bearing friction ranges, each entry's history, the difference between revisions and the export." } }
            a.card href="/ui/friction-tests" { h2 { "Friction tests" } p { "Evaluate a torque–tension series from a CSV file; record it (token needed) and see the proposed catalogue change." } }
            a.card href="/ui/joints" { h2 { "Joints" } p { "The plant's joints with their spec requests and review marks." } }
        }
    };
    visit.html(StatusCode::OK, page("Overview", Nav::Home, &visit, body))
}

#[cfg(test)]
mod tests {
    use super::number;

    #[test]
    fn numbers_keep_four_significant_figures() {
        assert_eq!(number(12.3456), "12.35");
        assert_eq!(number(0.123456), "0.1235");
        assert_eq!(number(45678.9), "45679");
        assert_eq!(number(0.0), "0");
        assert_eq!(number(f64::NAN), "—");
        assert_eq!(super::coefficient(0.09), "0.09");
        assert_eq!(super::coefficient(0.125), "0.125");
        assert_eq!(super::coefficient(1.0), "1");
    }
}
