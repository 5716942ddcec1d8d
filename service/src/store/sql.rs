//! The SQL both backends share, written once and expanded per backend by
//! `backend!` in `pg.rs` and `sqlite.rs`. The queries are portable
//! (`$n` placeholders work in both); only how a write transaction starts,
//! how the head row is locked, and how other instances are told differ.

macro_rules! backend {
    (db = $db:ty, write_begin = $begin:literal, read_begin = $read:literal,
     lock_head = $lock:literal, notify = $notify:expr) => {
        use chrono::{DateTime, Utc};
        use sqlx::Row;

        use crate::catalogue::{
            self, Applied, CatalogueError, ChangeSet, EntityKind, Snapshot,
        };
        use crate::store::tokens::{hash_secret, hashes_match, Role, TokenInfo};
        use crate::store::{HistoryItem, RevisionInfo, StoreError};

        pub type Pool = sqlx::Pool<$db>;
        type Conn = <$db as sqlx::Database>::Connection;
        type DbRow = <$db as sqlx::Database>::Row;

        const HEAD: &str = "SELECT revision FROM catalogue_head WHERE id = 1";

        pub async fn head(pool: &Pool) -> Result<i64, StoreError> {
            Ok(sqlx::query_scalar::<_, i64>(HEAD).fetch_one(pool).await?)
        }

        async fn current_in(conn: &mut Conn, revision: i64) -> Result<Snapshot, StoreError> {
            let mut s = Snapshot { revision, finishes: vec![], lubricants: vec![], entries: vec![] };
            for body in sqlx::query_scalar::<_, String>("SELECT body FROM finishes")
                .fetch_all(&mut *conn)
                .await?
            {
                s.finishes.push(serde_json::from_str(&body)?);
            }
            for body in sqlx::query_scalar::<_, String>("SELECT body FROM lubricants")
                .fetch_all(&mut *conn)
                .await?
            {
                s.lubricants.push(serde_json::from_str(&body)?);
            }
            for body in sqlx::query_scalar::<_, String>("SELECT body FROM friction_entries")
                .fetch_all(&mut *conn)
                .await?
            {
                s.entries.push(serde_json::from_str(&body)?);
            }
            s.normalise();
            Ok(s)
        }

        /// The current catalogue, read in one consistent transaction.
        pub async fn load_current(pool: &Pool) -> Result<Snapshot, StoreError> {
            let mut tx = pool.begin_with($read).await?;
            let revision = sqlx::query_scalar::<_, i64>(HEAD).fetch_one(&mut *tx).await?;
            let s = current_in(&mut tx, revision).await?;
            tx.commit().await?;
            Ok(s)
        }

        /// The catalogue as it was at `revision`, rebuilt from history: for
        /// every item, its state after its last change at or before it.
        pub async fn load_at(pool: &Pool, revision: i64) -> Result<Snapshot, StoreError> {
            let mut tx = pool.begin_with($read).await?;
            let current = sqlx::query_scalar::<_, i64>(HEAD).fetch_one(&mut *tx).await?;
            if revision < 1 || revision > current {
                return Err(CatalogueError::UnknownRevision {
                    field: "catalogue_revision".into(),
                    revision,
                    current,
                }
                .into());
            }
            let rows = sqlx::query(
                "SELECT h.entity_kind, h.after_json FROM catalogue_history h \
                 JOIN (SELECT MAX(seq) AS seq FROM catalogue_history WHERE revision <= $1 \
                       GROUP BY entity_kind, entity_id) last ON last.seq = h.seq",
            )
            .bind(revision)
            .fetch_all(&mut *tx)
            .await?;
            tx.commit().await?;
            let mut s = Snapshot { revision, finishes: vec![], lubricants: vec![], entries: vec![] };
            for row in rows {
                let kind: String = row.try_get("entity_kind")?;
                let after: String = row.try_get("after_json")?;
                match EntityKind::parse(&kind) {
                    Some(EntityKind::Finish) => s.finishes.push(serde_json::from_str(&after)?),
                    Some(EntityKind::Lubricant) => s.lubricants.push(serde_json::from_str(&after)?),
                    Some(EntityKind::FrictionEntry) => s.entries.push(serde_json::from_str(&after)?),
                    None => return Err(StoreError::Internal(format!("unknown entity kind {kind}"))),
                }
            }
            s.normalise();
            Ok(s)
        }

        async fn write(conn: &mut Conn, set: &ChangeSet, applied: &Applied) -> Result<(), StoreError> {
            let now = Utc::now();
            let revision = applied.snapshot.revision;
            sqlx::query(
                "INSERT INTO catalogue_revisions (revision, created_at, actor, reason, evidence) \
                 VALUES ($1, $2, $3, $4, $5)",
            )
            .bind(revision)
            .bind(now)
            .bind(&set.actor)
            .bind(set.reason.trim())
            .bind(&set.evidence)
            .execute(&mut *conn)
            .await?;
            for rec in &applied.records {
                let after = serde_json::to_string(&rec.after)?;
                let before = rec.before.as_ref().map(serde_json::to_string).transpose()?;
                sqlx::query(
                    "INSERT INTO catalogue_history (revision, entity_kind, entity_id, action, \
                     before_json, after_json, actor, reason, created_at) \
                     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)",
                )
                .bind(revision)
                .bind(rec.entity.as_str())
                .bind(&rec.entity_id)
                .bind(rec.action.as_str())
                .bind(before)
                .bind(&after)
                .bind(&set.actor)
                .bind(set.reason.trim())
                .bind(now)
                .execute(&mut *conn)
                .await?;
                let status = rec.after["status"].as_str().unwrap_or("active").to_string();
                let item_revision = rec.after["revision"].as_i64().unwrap_or(revision);
                match rec.entity {
                    EntityKind::Finish | EntityKind::Lubricant => {
                        let sql = if rec.entity == EntityKind::Finish {
                            "INSERT INTO finishes (id, status, revision, body) VALUES ($1, $2, $3, $4) \
                             ON CONFLICT (id) DO UPDATE SET status = excluded.status, \
                             revision = excluded.revision, body = excluded.body"
                        } else {
                            "INSERT INTO lubricants (id, status, revision, body) VALUES ($1, $2, $3, $4) \
                             ON CONFLICT (id) DO UPDATE SET status = excluded.status, \
                             revision = excluded.revision, body = excluded.body"
                        };
                        sqlx::query(sql)
                            .bind(&rec.entity_id)
                            .bind(&status)
                            .bind(item_revision)
                            .bind(&after)
                            .execute(&mut *conn)
                            .await?;
                    }
                    EntityKind::FrictionEntry => {
                        let id: i64 = rec.entity_id.parse().map_err(|_| {
                            StoreError::Internal(format!("entry id {} is not a number", rec.entity_id))
                        })?;
                        sqlx::query(
                            "INSERT INTO friction_entries (id, finish, lubricant, bearing_surface, status, \
                             revision, body) VALUES ($1, $2, $3, $4, $5, $6, $7) \
                             ON CONFLICT (id) DO UPDATE SET finish = excluded.finish, \
                             lubricant = excluded.lubricant, bearing_surface = excluded.bearing_surface, \
                             status = excluded.status, revision = excluded.revision, body = excluded.body",
                        )
                        .bind(id)
                        .bind(rec.after["finish"].as_str().unwrap_or_default())
                        .bind(rec.after["lubricant"].as_str().unwrap_or_default())
                        .bind(rec.after["bearing_surface"].as_str())
                        .bind(&status)
                        .bind(item_revision)
                        .bind(&after)
                        .execute(&mut *conn)
                        .await?;
                    }
                }
            }
            sqlx::query("UPDATE catalogue_head SET revision = $1 WHERE id = 1")
                .bind(revision)
                .execute(&mut *conn)
                .await?;
            let notify: Option<&str> = $notify;
            if let Some(sql) = notify {
                sqlx::query(sql).bind(revision.to_string()).execute(&mut *conn).await?;
            }
            Ok(())
        }

        /// Checks and writes a batch as one new revision in one transaction.
        /// `only_if_empty` is for the seed: it is written only at revision 0.
        pub async fn apply(pool: &Pool, set: &ChangeSet, only_if_empty: bool) -> Result<Option<Applied>, StoreError> {
            let mut tx = pool.begin_with($begin).await?;
            let revision = sqlx::query_scalar::<_, i64>($lock).fetch_one(&mut *tx).await?;
            if only_if_empty && revision > 0 {
                // release the write lock now, not when the pool next uses
                // the connection (a migration may be about to write)
                tx.rollback().await?;
                return Ok(None);
            }
            let current = current_in(&mut tx, revision).await?;
            let applied = match catalogue::apply(&current, set) {
                Ok(applied) => applied,
                Err(e) => {
                    // a refused change releases the write lock at once
                    tx.rollback().await?;
                    return Err(e.into());
                }
            };
            write(&mut tx, set, &applied).await?;
            tx.commit().await?;
            Ok(Some(applied))
        }

        fn revision_info(row: &DbRow) -> Result<RevisionInfo, StoreError> {
            Ok(RevisionInfo {
                revision: row.try_get("revision")?,
                created_at: row.try_get("created_at")?,
                actor: row.try_get("actor")?,
                reason: row.try_get("reason")?,
                evidence: row.try_get("evidence")?,
                change_count: row.try_get("changes")?,
            })
        }

        const REVISION_COLUMNS: &str = "SELECT r.revision, r.created_at, r.actor, r.reason, r.evidence, \
             (SELECT COUNT(*) FROM catalogue_history h WHERE h.revision = r.revision) AS changes \
             FROM catalogue_revisions r";

        /// Revisions, newest first, older than `before`, at most `limit`.
        pub async fn revisions(pool: &Pool, before: i64, limit: i64) -> Result<Vec<RevisionInfo>, StoreError> {
            let sql = format!("{REVISION_COLUMNS} WHERE r.revision < $1 ORDER BY r.revision DESC LIMIT $2");
            let rows = sqlx::query(&sql).bind(before).bind(limit).fetch_all(pool).await?;
            rows.iter().map(revision_info).collect()
        }

        fn history_item(row: &DbRow) -> Result<HistoryItem, StoreError> {
            let kind: String = row.try_get("entity_kind")?;
            let action: String = row.try_get("action")?;
            let before: Option<String> = row.try_get("before_json")?;
            let after: String = row.try_get("after_json")?;
            Ok(HistoryItem {
                seq: row.try_get("seq")?,
                revision: row.try_get("revision")?,
                entity: EntityKind::parse(&kind)
                    .ok_or_else(|| StoreError::Internal(format!("unknown entity kind {kind}")))?,
                entity_id: row.try_get("entity_id")?,
                action: catalogue::Action::parse(&action)
                    .ok_or_else(|| StoreError::Internal(format!("unknown action {action}")))?,
                before: before.map(|b| serde_json::from_str(&b)).transpose()?,
                after: serde_json::from_str(&after)?,
                actor: row.try_get("actor")?,
                reason: row.try_get("reason")?,
                evidence: row.try_get("evidence")?,
                created_at: row.try_get("created_at")?,
            })
        }

        const HISTORY_COLUMNS: &str = "SELECT h.seq, h.revision, h.entity_kind, h.entity_id, h.action, \
             h.before_json, h.after_json, h.actor, h.reason, r.evidence, h.created_at \
             FROM catalogue_history h JOIN catalogue_revisions r ON r.revision = h.revision";

        /// One revision and every change it made.
        pub async fn revision(pool: &Pool, n: i64) -> Result<(RevisionInfo, Vec<HistoryItem>), StoreError> {
            let sql = format!("{REVISION_COLUMNS} WHERE r.revision = $1");
            let Some(row) = sqlx::query(&sql).bind(n).fetch_optional(pool).await? else {
                let current = head(pool).await?;
                return Err(CatalogueError::UnknownRevision { field: "revision".into(), revision: n, current }.into());
            };
            let info = revision_info(&row)?;
            let sql = format!("{HISTORY_COLUMNS} WHERE h.revision = $1 ORDER BY h.seq");
            let rows = sqlx::query(&sql).bind(n).fetch_all(pool).await?;
            Ok((info, rows.iter().map(history_item).collect::<Result<_, _>>()?))
        }

        /// Every change to one item, oldest first.
        pub async fn history(pool: &Pool, kind: EntityKind, id: &str) -> Result<Vec<HistoryItem>, StoreError> {
            let sql = format!("{HISTORY_COLUMNS} WHERE h.entity_kind = $1 AND h.entity_id = $2 ORDER BY h.seq");
            let rows = sqlx::query(&sql).bind(kind.as_str()).bind(id).fetch_all(pool).await?;
            rows.iter().map(history_item).collect()
        }

        fn token_info(row: &DbRow) -> Result<TokenInfo, StoreError> {
            let role: String = row.try_get("role")?;
            Ok(TokenInfo {
                id: row.try_get("id")?,
                name: row.try_get("name")?,
                role: Role::parse(&role).ok_or_else(|| StoreError::Internal(format!("unknown role {role}")))?,
                created_at: row.try_get("created_at")?,
                expires_at: row.try_get("expires_at")?,
                revoked_at: row.try_get("revoked_at")?,
            })
        }

        const TOKEN_COLUMNS: &str = "id, name, role, created_at, expires_at, revoked_at";

        pub async fn create_token(pool: &Pool, name: &str, role: Role, expires_at: Option<DateTime<Utc>>, secret_hash: &str) -> Result<TokenInfo, StoreError> {
            let sql = format!(
                "INSERT INTO api_tokens (name, role, secret_hash, created_at, expires_at) \
                 VALUES ($1, $2, $3, $4, $5) RETURNING {TOKEN_COLUMNS}"
            );
            let row = sqlx::query(&sql)
                .bind(name)
                .bind(role.as_str())
                .bind(secret_hash)
                .bind(Utc::now())
                .bind(expires_at)
                .fetch_one(pool)
                .await
                .map_err(|e| match StoreError::from(e) {
                    StoreError::Conflict { .. } => StoreError::Conflict {
                        field: "name".into(),
                        reason: format!("a token named '{name}' already exists (names identify authors in history)"),
                    },
                    other => other,
                })?;
            token_info(&row)
        }

        pub async fn list_tokens(pool: &Pool) -> Result<Vec<TokenInfo>, StoreError> {
            let sql = format!("SELECT {TOKEN_COLUMNS} FROM api_tokens ORDER BY id");
            let rows = sqlx::query(&sql).fetch_all(pool).await?;
            rows.iter().map(token_info).collect()
        }

        /// Revokes by name or numeric id; revoking twice keeps the first time.
        pub async fn revoke_token(pool: &Pool, name_or_id: &str) -> Result<TokenInfo, StoreError> {
            let sql = format!(
                "UPDATE api_tokens SET revoked_at = $1 WHERE (name = $2 OR CAST(id AS TEXT) = $2) \
                 AND revoked_at IS NULL RETURNING {TOKEN_COLUMNS}"
            );
            if let Some(row) = sqlx::query(&sql).bind(Utc::now()).bind(name_or_id).fetch_optional(pool).await? {
                return token_info(&row);
            }
            let sql = format!("SELECT {TOKEN_COLUMNS} FROM api_tokens WHERE name = $1 OR CAST(id AS TEXT) = $1");
            match sqlx::query(&sql).bind(name_or_id).fetch_optional(pool).await? {
                Some(row) => token_info(&row),
                None => Err(StoreError::NotFound { field: "token".into(), reason: format!("no token named or numbered '{name_or_id}'") }),
            }
        }

        /// The token whose secret this is (revoked and expired ones too: the
        /// caller decides), or `None`.
        pub async fn find_token(pool: &Pool, secret: &str) -> Result<Option<TokenInfo>, StoreError> {
            let hash = hash_secret(secret);
            let sql = format!("SELECT {TOKEN_COLUMNS}, secret_hash FROM api_tokens WHERE secret_hash = $1");
            let Some(row) = sqlx::query(&sql).bind(&hash).fetch_optional(pool).await? else {
                return Ok(None);
            };
            let stored: String = row.try_get("secret_hash")?;
            if !hashes_match(&stored, &hash) {
                return Ok(None);
            }
            Ok(Some(token_info(&row)?))
        }
    };
}

pub(crate) use backend;
