//! `tightspec token create|list|revoke`: API tokens on the configured
//! database, through the application's token use cases (`app/tokens.rs`). A new token's secret is printed once and never
//! again (only its SHA-256 is stored).

use std::io::Write;

use chrono::{DateTime, Duration, Utc};

use crate::app::tokens::{Role, TokenInfo};
use crate::app::{App, AppError};

pub type CliResult = Result<(), Box<dyn std::error::Error + Send + Sync>>;

#[derive(Debug, Clone, clap::Subcommand)]
pub enum TokenCommand {
    /// Create a token and print its secret (shown only this once).
    Create {
        /// Name recorded as the author of every change made with the token.
        #[arg(long)]
        name: String,
        /// reader (reads), editor (catalogue and joint changes, releases),
        /// approver (also approves others' releases) or admin (tokens).
        #[arg(long, value_parser = parse_role)]
        role: Role,
        /// Expiry: a duration from now (`90d`, `12h`, `30m`, `2w`) or an
        /// RFC 3339 time (`2027-01-31T00:00:00Z`). Default: never.
        #[arg(long)]
        expires: Option<String>,
    },
    /// List tokens (never their secrets).
    List,
    /// Revoke a token by name or id. Revoking is permanent.
    Revoke {
        /// Token name or numeric id.
        token: String,
    },
}

pub fn parse_role(s: &str) -> Result<Role, String> {
    Role::parse(s)
        .ok_or_else(|| format!("unknown role '{s}': use reader, editor, approver or admin"))
}

/// Reads `--expires`: a duration (`90d`, `12h`, `30m`, `2w`) or an RFC 3339
/// time; it must lie in the future.
pub fn parse_expiry(s: &str, now: DateTime<Utc>) -> Result<DateTime<Utc>, String> {
    let s = s.trim();
    let at = if let Ok(t) = DateTime::parse_from_rfc3339(s) {
        t.with_timezone(&Utc)
    } else {
        let (n, unit) = s.split_at(s.find(|c: char| !c.is_ascii_digit()).unwrap_or(s.len()));
        let n: i64 = n.parse().map_err(|_| {
            format!("--expires '{s}': give e.g. 90d, 12h, 30m, 2w or an RFC 3339 time")
        })?;
        let d = match unit {
            "m" => Duration::try_minutes(n),
            "h" => Duration::try_hours(n),
            "d" => Duration::try_days(n),
            "w" => Duration::try_weeks(n),
            _ => None,
        }
        .ok_or_else(|| format!("--expires '{s}': unit must be m, h, d or w"))?;
        now.checked_add_signed(d)
            .ok_or_else(|| format!("--expires '{s}' is too far ahead"))?
    };
    if at <= now {
        return Err(format!("--expires '{s}' is not in the future"));
    }
    Ok(at)
}

fn line(t: &TokenInfo) -> String {
    let state = match (t.revoked_at, t.expires_at) {
        (Some(r), _) => format!("revoked {}", r.to_rfc3339()),
        (None, Some(e)) if e <= Utc::now() => format!("expired {}", e.to_rfc3339()),
        (None, Some(e)) => format!("expires {}", e.to_rfc3339()),
        (None, None) => "no expiry".into(),
    };
    format!(
        "{:>4}  {:<24} {:<7} created {}  {}",
        t.id,
        t.name,
        t.role.as_str(),
        t.created_at.to_rfc3339(),
        state
    )
}

pub async fn run(cmd: &TokenCommand, database_url: Option<&str>, out: &mut dyn Write) -> CliResult {
    let app = App::open(database_url).await?;
    let result = run_on(&app, cmd, out).await;
    app.close().await;
    result
}

pub async fn run_on(app: &App, cmd: &TokenCommand, out: &mut dyn Write) -> CliResult {
    match cmd {
        TokenCommand::Create {
            name,
            role,
            expires,
        } => {
            let expires_at = expires
                .as_deref()
                .map(|e| parse_expiry(e, Utc::now()))
                .transpose()?;
            // a refused name: the field and the reason, nothing written
            let (info, secret) = app
                .create_token(name, *role, expires_at)
                .await
                .map_err(|e| match e {
                    AppError::Fields(p) if p.len() == 1 => {
                        format!("--name '{name}' (field `{}`): {}", p[0].field, p[0].reason)
                    }
                    other => other.to_string(),
                })?;
            writeln!(out, "{}", line(&info))?;
            writeln!(out, "secret (shown once; store it now): {secret}")?;
        }
        TokenCommand::List => {
            let tokens = app.tokens().await?;
            if tokens.is_empty() {
                writeln!(out, "no tokens")?;
            }
            for t in tokens {
                writeln!(out, "{}", line(&t))?;
            }
        }
        TokenCommand::Revoke { token } => {
            let t = app.revoke_token(token).await?;
            writeln!(out, "{}", line(&t))?;
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn expiry_forms() {
        let now = Utc::now();
        assert_eq!(parse_expiry("90d", now).unwrap(), now + Duration::days(90));
        assert_eq!(parse_expiry("12h", now).unwrap(), now + Duration::hours(12));
        assert!(parse_expiry("2099-01-01T00:00:00Z", now).is_ok());
        assert!(parse_expiry("2000-01-01T00:00:00Z", now).is_err());
        assert!(parse_expiry("0d", now).is_err());
        assert!(parse_expiry("5y", now).is_err());
        assert!(parse_expiry("soon", now).is_err());
    }
}
