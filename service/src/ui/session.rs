//! Who is using the page and whether a form post may act for them.
//!
//! - The API token: the token form (`/ui/token`) checks it through the
//!   application (`App::find_token`, the same tokens and roles as the API)
//!   and keeps it in the `tightspec_token` cookie: HttpOnly (no script
//!   reads it), SameSite=Strict (no other site's page sends it), path
//!   `/ui`, Secure when served over HTTPS, eight hours.
//! - Cross-site request forgery: every page sets a random per-browser
//!   value in the `tightspec_csrf` cookie (HttpOnly, SameSite=Strict) and
//!   every form carries it in the hidden `csrf` field; a post is refused
//!   (403) unless the two agree (compared in constant time) and an
//!   `Origin` header, when sent, names this server.
//!
//! A write without a token is refused (401) before anything is read from
//! the form; a token whose role is too low is refused (403).

use actix_web::http::{header, StatusCode};
use actix_web::{web, HttpRequest, HttpResponse};
use chrono::Utc;
use maud::{html, Markup};
use rand::RngCore;
use serde::Deserialize;
use subtle::ConstantTimeEq;

use super::layout::{page, Nav};
use super::problem::Problem;
use super::UiState;
use crate::app::tokens::Role;

const TOKEN_COOKIE: &str = "tightspec_token";
const CSRF_COOKIE: &str = "tightspec_csrf";
/// Seconds the token cookie lasts (one shift, common practice).
const TOKEN_COOKIE_SECONDS: u32 = 8 * 3600;

/// The page's settings, from the service's configuration.
#[derive(Debug, Clone, Copy)]
pub struct UiSettings {
    /// Whether reading needs no token (as for the API).
    pub anonymous_reads: bool,
    /// Largest form body read (the service's `--max-body-bytes`).
    pub max_form_bytes: usize,
}

/// One request's view of the browser: its cookies and whether it is new.
#[derive(Debug, Clone)]
pub struct Visit {
    /// The value forms must echo in `csrf`.
    pub csrf: String,
    /// True when the CSRF cookie has to be set on this answer.
    fresh: bool,
    /// The API token the browser keeps, if any.
    token: Option<String>,
    /// Whether the answer goes out over HTTPS (cookies then get Secure).
    secure: bool,
}

fn cookie<'a>(req: &'a HttpRequest, name: &str) -> Option<&'a str> {
    let text = req.headers().get(header::COOKIE)?.to_str().ok()?;
    text.split(';')
        .filter_map(|pair| pair.trim().split_once('='))
        .find(|(k, _)| *k == name)
        .map(|(_, v)| v.trim())
        .filter(|v| !v.is_empty())
}

/// A cookie value this page wrote (and may write): visible ASCII without
/// separators (RFC 6265 §4.1.1 `cookie-octet`), at most 512 bytes.
fn cookie_safe(v: &str) -> bool {
    !v.is_empty()
        && v.len() <= 512
        && v.bytes()
            .all(|b| b.is_ascii_graphic() && !matches!(b, b'"' | b',' | b';' | b'\\'))
}

impl Visit {
    pub fn of(req: &HttpRequest) -> Self {
        let existing = cookie(req, CSRF_COOKIE)
            .filter(|v| v.len() == 64 && v.bytes().all(|b| b.is_ascii_hexdigit()));
        let (csrf, fresh) = match existing {
            Some(v) => (v.to_string(), false),
            None => {
                let mut bytes = [0u8; 32];
                rand::thread_rng().fill_bytes(&mut bytes);
                (hex::encode(bytes), true)
            }
        };
        Self {
            csrf,
            fresh,
            token: cookie(req, TOKEN_COOKIE)
                .filter(|v| cookie_safe(v))
                .map(str::to_owned),
            secure: req.connection_info().scheme() == "https",
        }
    }

    pub fn has_token(&self) -> bool {
        self.token.is_some()
    }

    fn set_cookie(&self, name: &str, value: &str, max_age: u32) -> String {
        format!(
            "{name}={value}; Path=/ui; HttpOnly; SameSite=Strict; Max-Age={max_age}{}",
            if self.secure { "; Secure" } else { "" }
        )
    }

    /// An HTML answer; sets the CSRF cookie when this browser had none.
    pub fn html(&self, status: StatusCode, body: Markup) -> HttpResponse {
        let mut r = HttpResponse::build(status);
        r.insert_header((header::CONTENT_TYPE, "text/html; charset=utf-8"))
            .insert_header((header::CACHE_CONTROL, "no-store"));
        if self.fresh {
            r.append_header((
                header::SET_COOKIE,
                self.set_cookie(CSRF_COOKIE, &self.csrf, 7 * 24 * 3600),
            ));
        }
        r.body(body.into_string())
    }

    /// 303 to `to` (after a post that worked).
    pub fn see_other(&self, to: &str) -> HttpResponse {
        HttpResponse::SeeOther()
            .insert_header((header::LOCATION, to))
            .finish()
    }

    /// The caller's name when its token allows `needed`; reads pass
    /// anonymously when the service allows anonymous reads.
    pub async fn caller(&self, state: &UiState, needed: Role) -> Result<String, Problem> {
        let Some(secret) = self.token.as_deref() else {
            if needed == Role::Reader && state.settings.anonymous_reads {
                return Ok("anonymous".into());
            }
            return Err(Problem::refusal(
                StatusCode::UNAUTHORIZED,
                "Token needed",
                "token",
                format!(
                    "this needs an API token with role {} or above; enter it under Token",
                    needed.as_str()
                ),
            ));
        };
        let token = match state.app.find_token(secret).await {
            Ok(Some(t)) => t,
            Ok(None) => {
                return Err(Problem::refusal(
                    StatusCode::UNAUTHORIZED,
                    "Token not recognised",
                    "token",
                    "the kept token is not recognised; enter a current one under Token",
                ))
            }
            Err(e) => return Err(Problem::from_app(&e)),
        };
        if let Some(why) = token.refusal(Utc::now()) {
            return Err(Problem::refusal(
                StatusCode::UNAUTHORIZED,
                "Token refused",
                "token",
                format!("{why}; ask an administrator for a new one"),
            ));
        }
        if !token.role.allows(needed) {
            return Err(Problem::refusal(
                StatusCode::FORBIDDEN,
                "Role too low",
                "token",
                format!(
                    "token '{}' has role {}; this needs role {} or above",
                    token.name,
                    token.role.as_str(),
                    needed.as_str()
                ),
            ));
        }
        Ok(token.name)
    }

    /// The cross-site checks of a form post: the echoed CSRF value and the
    /// `Origin` header.
    pub fn check_post(&self, req: &HttpRequest, echoed: &str) -> Result<(), Problem> {
        let forged =
            |reason: &str| Problem::refusal(StatusCode::FORBIDDEN, "Form refused", "csrf", reason);
        if self.fresh {
            return Err(forged(
                "the browser sent no form cookie; reload the page and send the form again",
            ));
        }
        if !bool::from(self.csrf.as_bytes().ct_eq(echoed.as_bytes())) {
            return Err(forged(
                "the form's check value does not match this browser's; reload the page and send it again",
            ));
        }
        if let Some(origin) = req.headers().get(header::ORIGIN) {
            let info = req.connection_info();
            let here = format!("{}://{}", info.scheme(), info.host());
            if origin.to_str().ok() != Some(here.as_str()) {
                return Err(forged("the form was sent from another site"));
            }
        }
        Ok(())
    }
}

/// The hidden field every form carries.
pub fn csrf_field(visit: &Visit) -> Markup {
    html! { input type="hidden" name="csrf" value=(visit.csrf); }
}

/// A page answer for a refusal or failure.
pub fn problem_page(visit: &Visit, nav: Nav, title: &str, problem: &Problem) -> HttpResponse {
    visit.html(problem.status, page(title, nav, visit, problem.render()))
}

fn token_body(visit: &Visit, note: Option<Markup>) -> Markup {
    html! {
        h1 { "API token" }
        @if let Some(note) = note { (note) }
        p { "Reading needs a token only where the service requires it. Writing (recording a friction test) "
            "needs a token with role " code { "editor" } " or above, the same roles as the API. "
            "The token is kept in a cookie that scripts cannot read and other sites' pages do not send; "
            "it lasts eight hours or until you forget it here." }
        @if visit.has_token() { p.ok { "A token is kept for this browser." } }
        form method="post" action="/ui/token" class="token" {
            (csrf_field(visit))
            label for="token" { "Token" }
            input id="token" type="password" name="token" autocomplete="off" size="48";
            button type="submit" name="action" value="keep" { "Keep token" }
            button type="submit" name="action" value="forget" class="secondary" { "Forget token" }
        }
    }
}

/// `GET /ui/token`: the token form.
pub async fn token_form(req: HttpRequest) -> HttpResponse {
    let visit = Visit::of(&req);
    visit.html(
        StatusCode::OK,
        page("API token", Nav::Token, &visit, token_body(&visit, None)),
    )
}

#[derive(Debug, Deserialize)]
pub struct TokenForm {
    #[serde(default)]
    csrf: String,
    #[serde(default)]
    token: String,
    #[serde(default)]
    action: String,
}

/// `POST /ui/token`: keep (after checking it) or forget the token.
pub async fn token_submit(
    req: HttpRequest,
    state: web::Data<UiState>,
    form: web::Form<TokenForm>,
) -> HttpResponse {
    let visit = Visit::of(&req);
    let refuse = |p: Problem| {
        let body = token_body(&visit, Some(p.render()));
        visit.html(p.status, page("API token", Nav::Token, &visit, body))
    };
    if let Err(p) = visit.check_post(&req, &form.csrf) {
        return refuse(p);
    }
    if form.action == "forget" {
        return HttpResponse::SeeOther()
            .insert_header((header::LOCATION, "/ui/token"))
            .insert_header((header::SET_COOKIE, visit.set_cookie(TOKEN_COOKIE, "", 0)))
            .finish();
    }
    let secret = form.token.trim();
    if !cookie_safe(secret) {
        return refuse(Problem::refusal(
            StatusCode::BAD_REQUEST,
            "Token refused",
            "token",
            "give the token as printed by 'tightspec token create' (1–512 visible characters)",
        ));
    }
    let probe = Visit {
        token: Some(secret.to_string()),
        ..visit.clone()
    };
    if let Err(p) = probe.caller(&state, Role::Reader).await {
        return refuse(p);
    }
    HttpResponse::SeeOther()
        .insert_header((header::LOCATION, "/ui/"))
        .insert_header((
            header::SET_COOKIE,
            visit.set_cookie(TOKEN_COOKIE, secret, TOKEN_COOKIE_SECONDS),
        ))
        .finish()
}
