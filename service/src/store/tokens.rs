//! API tokens: roles, secrets and their hashes. A secret is 256 random
//! bits from the operating system's generator, shown once; only its
//! SHA-256 is stored, and a presented secret is compared in constant time.
//! The `api_tokens` queries are at the end, in `impl Store`.

use chrono::{DateTime, Utc};
use rand::RngCore;
use serde::{Deserialize, Serialize};
use sha2::{Digest, Sha256};
use subtle::ConstantTimeEq;

use super::backend::dispatch;
use super::{Store, StoreError};
use crate::catalogue::CatalogueError;

/// What a token may do. Each role includes the ones below it.
#[derive(
    Debug,
    Clone,
    Copy,
    PartialEq,
    Eq,
    PartialOrd,
    Ord,
    Hash,
    Serialize,
    Deserialize,
    utoipa::ToSchema,
)]
#[serde(rename_all = "lowercase")]
pub enum Role {
    /// Read the catalogue and specifications.
    Reader,
    /// Change the catalogue, define joints and request releases.
    Editor,
    /// Everything an editor may, and approve a joint's release requested by
    /// someone else (the four-eyes rule).
    Approver,
    /// Manage tokens.
    Admin,
}

impl Role {
    pub fn as_str(self) -> &'static str {
        match self {
            Role::Reader => "reader",
            Role::Editor => "editor",
            Role::Approver => "approver",
            Role::Admin => "admin",
        }
    }

    pub fn parse(s: &str) -> Option<Role> {
        match s.trim().to_ascii_lowercase().as_str() {
            "reader" => Some(Role::Reader),
            "editor" => Some(Role::Editor),
            "approver" => Some(Role::Approver),
            "admin" => Some(Role::Admin),
            _ => None,
        }
    }

    /// True when this role may act where `needed` is required.
    pub fn allows(self, needed: Role) -> bool {
        self >= needed
    }
}

/// A stored token, without its secret.
#[derive(Debug, Clone, PartialEq, Serialize, utoipa::ToSchema)]
pub struct TokenInfo {
    pub id: i64,
    pub name: String,
    pub role: Role,
    #[schema(value_type = String, format = DateTime)]
    pub created_at: DateTime<Utc>,
    #[schema(value_type = Option<String>, format = DateTime)]
    pub expires_at: Option<DateTime<Utc>>,
    #[schema(value_type = Option<String>, format = DateTime)]
    pub revoked_at: Option<DateTime<Utc>>,
}

impl TokenInfo {
    /// Why this token may not be used at `now`, if it may not.
    pub fn refusal(&self, now: DateTime<Utc>) -> Option<&'static str> {
        if self.revoked_at.is_some() {
            Some("the token has been revoked")
        } else if self.expires_at.is_some_and(|t| t <= now) {
            Some("the token has expired")
        } else {
            None
        }
    }
}

/// Prefix that makes a secret recognisable in logs and secret scanners.
pub const SECRET_PREFIX: &str = "tsk_";

/// A new secret: the prefix and 32 random bytes (256 bits) as hex.
pub fn new_secret() -> String {
    let mut bytes = [0u8; 32];
    rand::rngs::OsRng.fill_bytes(&mut bytes);
    format!("{SECRET_PREFIX}{}", hex::encode(bytes))
}

/// SHA-256 of the secret, hex encoded: what the database stores.
pub fn hash_secret(secret: &str) -> String {
    hex::encode(Sha256::digest(secret.as_bytes()))
}

/// Constant-time comparison of a stored hash with the hash of a presented
/// secret (subtle crate), so timing reveals nothing about either.
pub fn hashes_match(stored: &str, presented_hash: &str) -> bool {
    stored.as_bytes().ct_eq(presented_hash.as_bytes()).into()
}

/// Token names become history authors: keep them readable and stable.
pub fn valid_name(name: &str) -> Result<(), String> {
    let ok = !name.is_empty()
        && name.len() <= 64
        && name
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || matches!(c, '-' | '_' | '.' | '@'));
    if ok {
        Ok(())
    } else {
        Err("a token name is 1–64 characters of letters, digits, '-', '_', '.', '@'".into())
    }
}

const TOKEN_COLUMNS: &str = "id, name, role, created_at, expires_at, revoked_at";

/// An `api_tokens` row (without the hash unless asked for).
#[derive(sqlx::FromRow)]
struct TokenRow {
    id: i64,
    name: String,
    role: String,
    created_at: DateTime<Utc>,
    expires_at: Option<DateTime<Utc>>,
    revoked_at: Option<DateTime<Utc>>,
    #[sqlx(default)]
    secret_hash: Option<String>,
}

impl TryFrom<TokenRow> for TokenInfo {
    type Error = StoreError;

    fn try_from(r: TokenRow) -> Result<Self, StoreError> {
        let role = &r.role;
        Ok(TokenInfo {
            id: r.id,
            name: r.name,
            role: Role::parse(role)
                .ok_or_else(|| StoreError::Internal(format!("unknown role {role}")))?,
            created_at: r.created_at,
            expires_at: r.expires_at,
            revoked_at: r.revoked_at,
        })
    }
}

impl Store {
    /// Creates a token; returns it with its secret, which is never stored
    /// (only its SHA-256) and cannot be shown again.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn create_token(
        &self,
        name: &str,
        role: Role,
        expires_at: Option<DateTime<Utc>>,
    ) -> Result<(TokenInfo, String), StoreError> {
        valid_name(name)
            .map_err(|reason| StoreError::Catalogue(CatalogueError::invalid_one("name", reason)))?;
        let secret = new_secret();
        let hash = hash_secret(&secret);
        let sql = format!(
            "INSERT INTO api_tokens (name, role, secret_hash, created_at, expires_at) \
             VALUES ($1, $2, $3, $4, $5) RETURNING {TOKEN_COLUMNS}"
        );
        let inserted: Result<TokenRow, sqlx::Error> = dispatch!(Store, self, |pool| {
            sqlx::query_as(&sql)
                .bind(name)
                .bind(role.as_str())
                .bind(&hash)
                .bind(Utc::now())
                .bind(expires_at)
                .fetch_one(pool)
                .await
        });
        let row = inserted.map_err(|e| match StoreError::from(e) {
            StoreError::Conflict { .. } => StoreError::Conflict {
                field: "name".into(),
                reason: format!(
                    "a token named '{name}' already exists (names identify authors in history)"
                ),
            },
            other => other,
        })?;
        Ok((row.try_into()?, secret))
    }

    /// Every token, oldest first.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn list_tokens(&self) -> Result<Vec<TokenInfo>, StoreError> {
        let sql = format!("SELECT {TOKEN_COLUMNS} FROM api_tokens ORDER BY id");
        let rows: Vec<TokenRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .fetch_all(pool)
            .await?);
        rows.into_iter().map(TokenInfo::try_from).collect()
    }

    /// Revokes by name or numeric id; revoking twice keeps the first time.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn revoke_token(&self, name_or_id: &str) -> Result<TokenInfo, StoreError> {
        let sql = format!(
            "UPDATE api_tokens SET revoked_at = $1 WHERE (name = $2 OR CAST(id AS TEXT) = $2) \
             AND revoked_at IS NULL RETURNING {TOKEN_COLUMNS}"
        );
        let revoked: Option<TokenRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(Utc::now())
            .bind(name_or_id)
            .fetch_optional(pool)
            .await?);
        if let Some(row) = revoked {
            return row.try_into();
        }
        let sql = format!(
            "SELECT {TOKEN_COLUMNS} FROM api_tokens WHERE name = $1 OR CAST(id AS TEXT) = $1"
        );
        let found: Option<TokenRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(name_or_id)
            .fetch_optional(pool)
            .await?);
        match found {
            Some(row) => row.try_into(),
            None => Err(StoreError::NotFound {
                field: "token".into(),
                reason: format!("no token named or numbered '{name_or_id}'"),
            }),
        }
    }

    /// The token whose secret this is (revoked and expired ones too: the
    /// caller decides), or `None`. Looked up by hash, then compared in
    /// constant time.
    #[tracing::instrument(skip_all, level = "debug")]
    pub async fn find_token(&self, secret: &str) -> Result<Option<TokenInfo>, StoreError> {
        let hash = hash_secret(secret);
        let sql =
            format!("SELECT {TOKEN_COLUMNS}, secret_hash FROM api_tokens WHERE secret_hash = $1");
        let found: Option<TokenRow> = dispatch!(Store, self, |pool| sqlx::query_as(&sql)
            .bind(&hash)
            .fetch_optional(pool)
            .await?);
        let Some(row) = found else {
            return Ok(None);
        };
        match &row.secret_hash {
            Some(stored) if hashes_match(stored, &hash) => Ok(Some(row.try_into()?)),
            _ => Ok(None),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn secrets_are_256_bit_and_distinct() {
        let a = new_secret();
        let b = new_secret();
        assert_ne!(a, b);
        let hex_part = a.strip_prefix(SECRET_PREFIX).unwrap();
        assert_eq!(hex_part.len(), 64);
        assert_eq!(hex::decode(hex_part).unwrap().len(), 32);
    }

    #[test]
    fn hash_is_sha256_hex() {
        // FIPS 180-2 test vector: SHA-256("abc").
        assert_eq!(
            hash_secret("abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
        assert!(hashes_match(&hash_secret("x"), &hash_secret("x")));
        assert!(!hashes_match(&hash_secret("x"), &hash_secret("y")));
        assert!(!hashes_match("ab", "abc"));
    }

    #[test]
    fn roles_are_ordered() {
        assert!(Role::Admin.allows(Role::Editor));
        assert!(Role::Editor.allows(Role::Reader));
        assert!(!Role::Reader.allows(Role::Editor));
        assert!(!Role::Editor.allows(Role::Admin));
        assert!(Role::Approver.allows(Role::Editor));
        assert!(!Role::Editor.allows(Role::Approver));
        assert!(Role::Admin.allows(Role::Approver));
        assert_eq!(Role::parse("approver"), Some(Role::Approver));
        assert_eq!(Role::parse("Editor"), Some(Role::Editor));
        assert_eq!(Role::parse("root"), None);
    }

    #[test]
    fn expiry_and_revocation() {
        let now = Utc::now();
        let mut t = TokenInfo {
            id: 1,
            name: "n".into(),
            role: Role::Editor,
            created_at: now,
            expires_at: None,
            revoked_at: None,
        };
        assert!(t.refusal(now).is_none());
        t.expires_at = Some(now);
        assert!(t.refusal(now).is_some());
        t.expires_at = None;
        t.revoked_at = Some(now);
        assert_eq!(t.refusal(now), Some("the token has been revoked"));
        assert!(valid_name("hollowmere-line-3").is_ok());
        assert!(valid_name("bad name").is_err());
    }
}
