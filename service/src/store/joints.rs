//! The joint registry's definitions: create, update from an expected
//! version, read one, list by tag, release status and review mark in pages
//! of ids, and mark or clear the review mark. Every definition change writes
//! its `joint_history` row (before, after, actor, reason) in the same
//! transaction; the history is append-only in the database.

use chrono::{DateTime, Utc};

use super::backend::{dispatch, Tx};
use super::error::RegistryStoreError;
use super::{outbox, Store, StoreError};
use crate::registry::{
    Joint, JointDefinition, JointId, OutboxEvent, Page, RegistryError, ReleaseStatus, ReviewDue,
};

/// Which joints a listing shows: those with `tag`, those with a release
/// now at `status` (`released`: an active release; `draft`: one waiting for
/// approval), and those whose review is (or is not) due.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct JointFilter {
    pub tag: Option<String>,
    pub status: Option<ReleaseStatus>,
    pub review_due: Option<bool>,
}

/// A joint to mark for review, and the event that announces it.
#[derive(Debug, Clone, PartialEq)]
pub struct ReviewMark {
    pub joint: JointId,
    pub event: OutboxEvent,
}

/// One change of a definition, as `joint_history` holds it.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct JointChange {
    pub seq: i64,
    pub joint_id: String,
    /// `create`, `update` or `delete`.
    pub action: String,
    pub version: i64,
    pub before_json: Option<String>,
    pub after_json: Option<String>,
    pub actor: String,
    pub reason: String,
    pub created_at: DateTime<Utc>,
}

#[derive(sqlx::FromRow)]
struct JointRow {
    id: String,
    title: String,
    tags: String,
    request: String,
    setpoints: String,
    version: i64,
    review_due_revision: Option<i64>,
    review_due_since: Option<DateTime<Utc>>,
}

impl TryFrom<JointRow> for Joint {
    type Error = StoreError;
    fn try_from(r: JointRow) -> Result<Joint, StoreError> {
        let id = JointId::parse("id", &r.id).map_err(|p| {
            StoreError::Internal(format!("stored joint id '{}': {}", r.id, p.reason))
        })?;
        let review_due = match (r.review_due_revision, r.review_due_since) {
            (Some(revision), Some(since)) => Some(ReviewDue { revision, since }),
            _ => None,
        };
        Ok(Joint {
            id,
            title: r.title,
            tags: serde_json::from_str(&r.tags)?,
            request: serde_json::from_str(&r.request)?,
            setpoints: serde_json::from_str(&r.setpoints)?,
            version: r.version,
            review_due,
        })
    }
}

const COLUMNS: &str = "SELECT id, title, tags, request, setpoints, version, review_due_revision, \
     review_due_since FROM joints";

pub(super) const INSERT: &str =
    "INSERT INTO joints (id, title, tags, request, setpoints, version, \
     created_at, updated_at) VALUES ($1, $2, $3, $4, $5, 1, $6, $6)";

pub(super) const UPDATE: &str =
    "UPDATE joints SET title = $2, tags = $3, request = $4, setpoints = $5, \
     version = $6, updated_at = $7 WHERE id = $1";

const DELETE_TAGS: &str = "DELETE FROM joint_tags WHERE joint_id = $1";
const INSERT_TAG: &str = "INSERT INTO joint_tags (joint_id, tag) VALUES ($1, $2)";

pub(super) const INSERT_HISTORY: &str =
    "INSERT INTO joint_history (joint_id, action, version, before_json, \
     after_json, actor, reason, created_at) VALUES ($1, $2, $3, $4, $5, $6, $7, $8)";

const HISTORY: &str = "SELECT seq, joint_id, action, version, before_json, after_json, actor, \
     reason, created_at FROM joint_history WHERE joint_id = $1 ORDER BY seq";

const MARK: &str = "UPDATE joints SET review_due_revision = $2, review_due_since = $3 \
     WHERE id = $1 AND review_due_revision IS NULL";

pub(super) const CLEAR: &str =
    "UPDATE joints SET review_due_revision = NULL, review_due_since = NULL WHERE id = $1";

pub(super) fn not_found(id: &JointId) -> StoreError {
    StoreError::NotFound {
        field: "id".into(),
        reason: format!("no joint with id '{id}'"),
    }
}

/// Joint `id` read inside the open transaction.
pub(super) async fn joint_in(tx: &mut Tx, id: &JointId) -> Result<Option<Joint>, StoreError> {
    let sql = format!("{COLUMNS} WHERE id = $1");
    let row: Option<JointRow> = dispatch!(Tx, tx, |c| sqlx::query_as(&sql)
        .bind(id.as_str())
        .fetch_optional(&mut **c)
        .await?);
    row.map(Joint::try_from).transpose()
}

/// Writes the definition's tag rows (after removing the old ones) and its
/// history row.
/// Writes `def` over `current` (one version more) with its tags and a
/// history row, inside `tx`.
pub(super) async fn update_in(
    tx: &mut Tx,
    def: &JointDefinition,
    current: &Joint,
    actor: &str,
    reason: &str,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let version = current.version + 1;
    let (tags, request, setpoints) = (json(&def.tags)?, json(&def.request)?, json(&def.setpoints)?);
    dispatch!(Tx, &mut *tx, |c| sqlx::query(UPDATE)
        .bind(def.id.as_str())
        .bind(&def.title)
        .bind(&tags)
        .bind(&request)
        .bind(&setpoints)
        .bind(version)
        .bind(now)
        .execute(&mut **c)
        .await
        .map(drop)?);
    let change = ("update", version, Some(current));
    write_tags_and_history(tx, def, change, actor, reason, now).await
}

pub(super) async fn write_tags_and_history(
    tx: &mut Tx,
    def: &JointDefinition,
    change: (&str, i64, Option<&Joint>),
    actor: &str,
    reason: &str,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let id = def.id.as_str();
    dispatch!(Tx, &mut *tx, |c| sqlx::query(DELETE_TAGS)
        .bind(id)
        .execute(&mut **c)
        .await
        .map(drop)?);
    for tag in &def.tags {
        dispatch!(Tx, &mut *tx, |c| sqlx::query(INSERT_TAG)
            .bind(id)
            .bind(tag)
            .execute(&mut **c)
            .await
            .map(drop)?);
    }
    let (action, version, before) = change;
    let before = before
        .map(|b| serde_json::to_string(&b.definition()))
        .transpose()?;
    let after = serde_json::to_string(def)?;
    dispatch!(Tx, tx, |c| sqlx::query(INSERT_HISTORY)
        .bind(id)
        .bind(action)
        .bind(version)
        .bind(&before)
        .bind(&after)
        .bind(actor)
        .bind(reason)
        .bind(now)
        .execute(&mut **c)
        .await
        .map(drop)?);
    Ok(())
}

fn json(v: &impl serde::Serialize) -> Result<String, StoreError> {
    Ok(serde_json::to_string(v)?)
}

impl Store {
    /// Creates a joint at version 1 (an id taken is `Conflict` naming `id`).
    #[tracing::instrument(skip(self, def), level = "debug", fields(id = %def.id))]
    pub async fn create_joint(
        &self,
        def: &JointDefinition,
        actor: &str,
        reason: &str,
    ) -> Result<Joint, RegistryStoreError> {
        let taken = || StoreError::Conflict {
            field: "id".into(),
            reason: format!("a joint with id '{}' already exists", def.id),
        };
        let mut tx = Tx::write(self).await?;
        if tx.lock_joint(def.id.as_str()).await?.is_some() {
            tx.rollback().await?;
            return Err(taken().into());
        }
        let now = Utc::now();
        let (tags, request, setpoints) =
            (json(&def.tags)?, json(&def.request)?, json(&def.setpoints)?);
        let inserted = dispatch!(Tx, &mut tx, |c| sqlx::query(INSERT)
            .bind(def.id.as_str())
            .bind(&def.title)
            .bind(&tags)
            .bind(&request)
            .bind(&setpoints)
            .bind(now)
            .execute(&mut **c)
            .await
            .map(drop));
        // a concurrent create of the same id got there first
        inserted.map_err(|e| match StoreError::from(e) {
            StoreError::Conflict { .. } => taken(),
            other => other,
        })?;
        write_tags_and_history(&mut tx, def, ("create", 1, None), actor, reason, now).await?;
        let joint = joint_in(&mut tx, &def.id)
            .await?
            .ok_or_else(|| not_found(&def.id))?;
        tx.commit().await?;
        Ok(joint)
    }

    /// Replaces a joint's definition if it is still at `expected_version`
    /// (otherwise `Stale` with the current joint); the version goes up by one.
    #[tracing::instrument(skip(self, def), level = "debug", fields(id = %def.id))]
    pub async fn update_joint(
        &self,
        def: &JointDefinition,
        expected_version: i64,
        actor: &str,
        reason: &str,
    ) -> Result<Joint, RegistryStoreError> {
        let mut tx = Tx::write(self).await?;
        let current = match tx.lock_joint(def.id.as_str()).await? {
            Some(_) => joint_in(&mut tx, &def.id).await?,
            None => None,
        };
        let Some(current) = current else {
            tx.rollback().await?;
            return Err(not_found(&def.id).into());
        };
        if current.version != expected_version {
            tx.rollback().await?;
            return Err(RegistryError::Stale {
                field: "If-Match".into(),
                expected: expected_version,
                current: Box::new(current),
            }
            .into());
        }
        update_in(&mut tx, def, &current, actor, reason, Utc::now()).await?;
        let joint = joint_in(&mut tx, &def.id)
            .await?
            .ok_or_else(|| not_found(&def.id))?;
        tx.commit().await?;
        Ok(joint)
    }

    /// One joint (`NotFound` naming `id`).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn joint(&self, id: &JointId) -> Result<Joint, StoreError> {
        let mut tx = Tx::read(self).await?;
        let joint = joint_in(&mut tx, id).await?;
        tx.commit().await?;
        joint.ok_or_else(|| not_found(id))
    }

    /// Joints in id order after `page.after`, at most `page.limit`, with
    /// `filter.tag` and with or without a due review.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn joints(
        &self,
        filter: &JointFilter,
        page: &Page,
    ) -> Result<Vec<Joint>, StoreError> {
        let mut conditions = Vec::new();
        let mut n = 0;
        let mut next = || {
            n += 1;
            format!("${n}")
        };
        if filter.tag.is_some() {
            conditions.push(format!(
                "EXISTS (SELECT 1 FROM joint_tags t WHERE t.joint_id = joints.id AND t.tag = {})",
                next()
            ));
        }
        if filter.status.is_some() {
            conditions.push(format!(
                "EXISTS (SELECT 1 FROM joint_releases r WHERE r.joint_id = joints.id AND \
                 (SELECT e.status FROM joint_release_events e WHERE e.joint_id = r.joint_id \
                 AND e.number = r.number ORDER BY e.seq DESC LIMIT 1) = {})",
                next()
            ));
        }
        match filter.review_due {
            Some(true) => conditions.push("review_due_revision IS NOT NULL".into()),
            Some(false) => conditions.push("review_due_revision IS NULL".into()),
            None => {}
        }
        if page.after.is_some() {
            conditions.push(format!("id > {}", next()));
        }
        let mut sql = COLUMNS.to_string();
        if !conditions.is_empty() {
            sql = format!("{sql} WHERE {}", conditions.join(" AND "));
        }
        let sql = format!("{sql} ORDER BY id LIMIT {}", next());
        let limit = i64::from(page.limit);
        let rows: Vec<JointRow> = dispatch!(Store, self, |pool| {
            let mut q = sqlx::query_as(&sql);
            if let Some(tag) = &filter.tag {
                q = q.bind(tag);
            }
            if let Some(status) = filter.status {
                q = q.bind(status.as_str());
            }
            if let Some(after) = &page.after {
                q = q.bind(after.as_str());
            }
            q.bind(limit).fetch_all(pool).await?
        });
        rows.into_iter().map(Joint::try_from).collect()
    }

    /// The definition changes of one joint, oldest first.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn joint_history(&self, id: &JointId) -> Result<Vec<JointChange>, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_as(HISTORY)
            .bind(id.as_str())
            .fetch_all(pool)
            .await?))
    }

    /// Marks the joints for review after catalogue `revision` (a joint
    /// already marked keeps its first mark) and writes each newly marked
    /// joint's event, in one transaction. Returns the joints newly marked.
    #[tracing::instrument(skip(self, marks), level = "debug", fields(joints = marks.len()))]
    pub async fn mark_review_due(
        &self,
        revision: i64,
        since: DateTime<Utc>,
        marks: &[ReviewMark],
    ) -> Result<Vec<JointId>, StoreError> {
        let mut tx = Tx::write(self).await?;
        let mut marked = Vec::new();
        for m in marks {
            let done = dispatch!(Tx, &mut tx, |c| sqlx::query(MARK)
                .bind(m.joint.as_str())
                .bind(revision)
                .bind(since)
                .execute(&mut **c)
                .await?
                .rows_affected());
            if done == 1 {
                outbox::insert_in(&mut tx, &m.event).await?;
                marked.push(m.joint.clone());
            }
        }
        tx.commit().await?;
        Ok(marked)
    }

    /// Clears a joint's review mark (the review confirmed its release).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn clear_review_due(&self, id: &JointId) -> Result<Joint, StoreError> {
        let mut tx = Tx::write(self).await?;
        dispatch!(Tx, &mut tx, |c| sqlx::query(CLEAR)
            .bind(id.as_str())
            .execute(&mut **c)
            .await
            .map(drop)?);
        let joint = joint_in(&mut tx, id).await?;
        tx.commit().await?;
        joint.ok_or_else(|| not_found(id))
    }
}
