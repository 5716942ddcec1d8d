//! API-token use cases: create (the secret shown once), list, revoke, and
//! find the token a presented secret belongs to (the HTTP authenticator).

use chrono::{DateTime, Utc};

use super::{App, AppError, FieldProblem};
use crate::store::tokens;
pub use crate::store::tokens::hash_secret;
pub use crate::store::{Role, TokenInfo};

impl App {
    /// Creates a token named `name` with `role`; returns it and its secret
    /// (never stored, only its SHA-256). A bad name is refused naming
    /// `name` before anything is written.
    pub async fn create_token(
        &self,
        name: &str,
        role: Role,
        expires_at: Option<DateTime<Utc>>,
    ) -> Result<(TokenInfo, String), AppError> {
        tokens::valid_name(name).map_err(|reason| FieldProblem::invalid("name", reason))?;
        Ok(self.store().create_token(name, role, expires_at).await?)
    }

    /// Every token, oldest first (never their secrets).
    pub async fn tokens(&self) -> Result<Vec<TokenInfo>, AppError> {
        Ok(self.store().list_tokens().await?)
    }

    /// Revokes the token with this name or numeric id (permanent).
    pub async fn revoke_token(&self, name_or_id: &str) -> Result<TokenInfo, AppError> {
        Ok(self.store().revoke_token(name_or_id).await?)
    }

    /// The token this secret belongs to (revoked and expired ones too: the
    /// caller decides), or `None`.
    pub async fn find_token(&self, secret: &str) -> Result<Option<TokenInfo>, AppError> {
        Ok(self.store().find_token(secret).await?)
    }
}
