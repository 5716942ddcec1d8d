//! Bearer-token authentication and roles. Handlers ask for what they need
//! by taking one of the extractors [`Reader`], [`Editor`], [`Approver`] or [`Admin`];
//! the [`Authenticator`] (held in `AppState`) checks the token through the
//! application (`App::find_token`): 401 for a missing, unknown, revoked or expired token, 403 for
//! a role that may not do it. Reads may be allowed anonymously by
//! configuration (`--anonymous-reads`).

use std::collections::HashMap;
use std::future::{ready, Future, Ready};
use std::pin::Pin;
use std::sync::Mutex;

use actix_web::{dev::Payload, http::header, web, FromRequest, HttpRequest};
use chrono::Utc;
use futures_util::future::Either;

use super::error::ApiError;
use super::state::AppState;
use crate::app::tokens::{self, Role, TokenInfo};
use crate::app::{App, AppError};

/// Who is making a request.
#[derive(Debug, Clone, PartialEq)]
pub struct Caller {
    /// Token name (recorded as the author of changes), or `anonymous`.
    pub name: String,
    pub role: Role,
    /// `None` for an anonymous reader.
    pub token_id: Option<i64>,
}

impl Caller {
    fn anonymous() -> Self {
        Self {
            name: "anonymous".into(),
            role: Role::Reader,
            token_id: None,
        }
    }
}

/// How many validated tokens are remembered for use while the database is
/// unreachable (reads only; writes fail with 503 then anyway).
const CACHE_LIMIT: usize = 1024;

/// Checks bearer tokens (one, in `AppState`). While the catalogue is
/// flagged stale (database unreachable), known tokens may read without
/// waiting for the database.
#[derive(Debug)]
pub struct Authenticator {
    app: App,
    anonymous_reads: bool,
    /// hash → token, as last read from the database.
    seen: Mutex<HashMap<String, TokenInfo>>,
}

impl Authenticator {
    pub fn new(app: App, anonymous_reads: bool) -> Self {
        Self {
            app,
            anonymous_reads,
            seen: Mutex::new(HashMap::new()),
        }
    }

    pub fn anonymous_reads(&self) -> bool {
        self.anonymous_reads
    }

    /// The caller for a request needing `needed` that carries no
    /// `Authorization` header: an anonymous reader when reads are open,
    /// else 401. Answered without waiting for anything.
    fn without_token(&self, needed: Role) -> Result<Caller, ApiError> {
        if needed == Role::Reader && self.anonymous_reads {
            return Ok(Caller::anonymous());
        }
        Err(ApiError::Unauthorized {
            detail: format!(
                "a bearer token is required (Authorization: Bearer <token>) with role {} or above",
                needed.as_str()
            ),
        })
    }

    /// The caller for a request needing `needed`, from its `Authorization`
    /// header value (if any).
    pub async fn check(
        &self,
        authorization: Option<&str>,
        needed: Role,
    ) -> Result<Caller, ApiError> {
        let Some(value) = authorization else {
            return self.without_token(needed);
        };
        let secret = bearer(value)?;
        let token = self.lookup(secret, needed).await?;
        if let Some(why) = token.refusal(Utc::now()) {
            return Err(ApiError::Unauthorized {
                detail: format!("{why}; ask an administrator for a new one"),
            });
        }
        if !token.role.allows(needed) {
            return Err(ApiError::Forbidden {
                detail: format!(
                    "token '{}' has role {}; this needs role {} or above",
                    token.name,
                    token.role.as_str(),
                    needed.as_str()
                ),
            });
        }
        Ok(Caller {
            name: token.name,
            role: token.role,
            token_id: Some(token.id),
        })
    }

    async fn lookup(&self, secret: &str, needed: Role) -> Result<TokenInfo, ApiError> {
        let not_recognised = || ApiError::Unauthorized {
            detail: "the bearer token is not recognised".into(),
        };
        let hash = tokens::hash_secret(secret);
        let cached = || self.seen.lock().ok().and_then(|s| s.get(&hash).cloned());
        if needed == Role::Reader && self.app.stale() {
            if let Some(t) = cached() {
                return Ok(t);
            }
        }
        match self.app.find_token(secret).await {
            Ok(Some(t)) => {
                if let Ok(mut seen) = self.seen.lock() {
                    if seen.len() >= CACHE_LIMIT {
                        seen.clear();
                    }
                    seen.insert(hash, t.clone());
                }
                Ok(t)
            }
            Ok(None) => Err(not_recognised()),
            Err(e @ AppError::Unavailable { .. }) => {
                // Reads go on from memory during an outage, for tokens seen
                // before; anything else must wait for the database.
                match cached() {
                    Some(t) if needed == Role::Reader => Ok(t),
                    _ => Err(e.into()),
                }
            }
            Err(e) => Err(e.into()),
        }
    }
}

/// The secret from `Bearer <secret>` (scheme case-insensitive, RFC 6750 §2.1).
fn bearer(value: &str) -> Result<&str, ApiError> {
    let malformed = || ApiError::Unauthorized {
        detail: "the Authorization header must be 'Bearer <token>'".into(),
    };
    let (scheme, secret) = value.trim().split_once(' ').ok_or_else(malformed)?;
    let secret = secret.trim();
    if !scheme.eq_ignore_ascii_case("bearer") || secret.is_empty() || secret.len() > 512 {
        return Err(malformed());
    }
    Ok(secret)
}

/// The extractors' future: ready at once for a request without a token
/// (most reads), boxed once when a token must be looked up.
pub type Checked<T> =
    Either<Ready<Result<T, ApiError>>, Pin<Box<dyn Future<Output = Result<T, ApiError>>>>>;

fn extract<T: 'static>(req: &HttpRequest, needed: Role, wrap: fn(Caller) -> T) -> Checked<T> {
    let Some(state) = req.app_data::<web::Data<AppState>>() else {
        return Either::Left(ready(Err(ApiError::Internal(
            "no AppState registered as app data".into(),
        ))));
    };
    let header = match req.headers().get(header::AUTHORIZATION).map(|v| v.to_str()) {
        None => return Either::Left(ready(state.auth.without_token(needed).map(wrap))),
        Some(Ok(s)) => s.to_string(),
        Some(Err(_)) => {
            return Either::Left(ready(Err(ApiError::Unauthorized {
                detail: "the Authorization header is not readable text".into(),
            })))
        }
    };
    let auth = std::sync::Arc::clone(&state.auth);
    Either::Right(Box::pin(async move {
        auth.check(Some(&header), needed).await.map(wrap)
    }))
}

macro_rules! role_extractor {
    ($(#[$doc:meta])* $name:ident, $role:expr) => {
        $(#[$doc])*
        #[derive(Debug, Clone)]
        pub struct $name(pub Caller);

        impl FromRequest for $name {
            type Error = ApiError;
            type Future = Checked<Self>;

            fn from_request(req: &HttpRequest, _: &mut Payload) -> Self::Future {
                extract(req, $role, $name)
            }
        }
    };
}

role_extractor!(
    /// Any caller allowed to read (anonymous when configured).
    Reader,
    Role::Reader
);
role_extractor!(
    /// A caller allowed to change the catalogue.
    Editor,
    Role::Editor
);
role_extractor!(
    /// A caller allowed to approve a release (the four-eyes rule).
    Approver,
    Role::Approver
);
role_extractor!(
    /// A caller allowed to manage tokens.
    Admin,
    Role::Admin
);

/// Adds the `bearer` security scheme (RFC 6750) the write routes name.
pub struct BearerScheme;

impl utoipa::Modify for BearerScheme {
    fn modify(&self, openapi: &mut utoipa::openapi::OpenApi) {
        use utoipa::openapi::security::{HttpAuthScheme, HttpBuilder, SecurityScheme};
        let components = openapi.components.get_or_insert_with(Default::default);
        components.add_security_scheme(
            "bearer",
            SecurityScheme::Http(
                HttpBuilder::new()
                    .scheme(HttpAuthScheme::Bearer)
                    .description(Some(
                        "API token (tightspec token create); roles reader < editor < approver < admin",
                    ))
                    .build(),
            ),
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bearer_header_forms() {
        assert_eq!(bearer("Bearer abc").ok(), Some("abc"));
        assert_eq!(bearer("bearer  abc ").ok(), Some("abc"));
        assert!(bearer("Basic abc").is_err());
        assert!(bearer("Bearer").is_err());
        assert!(bearer("Bearer ").is_err());
    }
}
