//! What the change impact and the review marks read and write: the active
//! releases of a range of joints (one query per page of joints), and the
//! confirmation of a joint's review, which clears its mark and records the
//! confirmation in the joint's history in one transaction. Also what the
//! MQTT publisher compares: a page of joints with what their active
//! release's fetched answer is made of, without the answers' bytes.

use chrono::{DateTime, Utc};

use super::backend::{dispatch, Tx};
use super::joints::{joint_in, not_found, CLEAR, INSERT_HISTORY};
use super::releases::{select_releases, ReleaseRow};
use super::{Store, StoreError};
use crate::registry::{Joint, JointId, Release};

/// The active releases of the joints with ids in `(after, upto]`, by id.
const ACTIVE_IN_RANGE: &str = concat!(
    "SELECT * FROM (",
    select_releases!(),
    " WHERE r.joint_id > $1 AND r.joint_id <= $2) x WHERE x.status = 'released' \
     ORDER BY x.joint_id, x.number DESC"
);

/// Joints after `$1` in id order (at most `$2`), each with its active
/// release's number and hash (none: `NULL`) and its review mark.
const ACTIVE_KEYS: &str = "SELECT j.id AS joint_id, j.review_due_revision, r.number, \
     r.spec_hash FROM joints j LEFT JOIN joint_releases r ON r.joint_id = j.id AND \
     (SELECT e.status FROM joint_release_events e WHERE e.joint_id = r.joint_id \
      AND e.number = r.number ORDER BY e.seq DESC LIMIT 1) = 'released' \
     WHERE j.id > $1 ORDER BY j.id, r.number DESC LIMIT $2";

/// A joint, its active release's number and hash (both `None` without
/// one) and its review mark's revision: what the ETag of its fetched
/// answer is made of.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct ActiveKey {
    pub joint_id: String,
    pub review_due_revision: Option<i64>,
    pub number: Option<i64>,
    pub spec_hash: Option<String>,
}

impl Store {
    /// A page of joints after `after` in id order (at most `limit` rows;
    /// one per joint), each with what its active release's answer is
    /// made of.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn active_keys_after(
        &self,
        after: Option<&JointId>,
        limit: u32,
    ) -> Result<Vec<ActiveKey>, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_as(ACTIVE_KEYS)
            .bind(after.map(JointId::as_str).unwrap_or(""))
            .bind(i64::from(limit))
            .fetch_all(pool)
            .await?))
    }

    /// The active release of every joint whose id lies in `(after, upto]`
    /// (`after` `None`: from the first id), ordered by joint id.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn active_releases_between(
        &self,
        after: Option<&JointId>,
        upto: &JointId,
    ) -> Result<Vec<Release>, StoreError> {
        let rows: Vec<ReleaseRow> = dispatch!(Store, self, |pool| sqlx::query_as(ACTIVE_IN_RANGE)
            .bind(after.map(JointId::as_str).unwrap_or(""))
            .bind(upto.as_str())
            .fetch_all(pool)
            .await?);
        let mut out: Vec<Release> = Vec::with_capacity(rows.len());
        for row in rows {
            let r = Release::try_from(row)?;
            // One active release per joint; the newest wins should two show.
            if out.last().is_none_or(|l| l.joint_id != r.joint_id) {
                out.push(r);
            }
        }
        Ok(out)
    }

    /// Clears joint `id`'s review mark and records the confirmation (who,
    /// why, the revision that caused the mark) in its history, in one
    /// transaction. Returns the joint as it was before (with its mark) and
    /// as it is now; `None` before when the joint had no mark (nothing
    /// written).
    #[tracing::instrument(skip(self, reason), level = "debug")]
    pub async fn confirm_review(
        &self,
        id: &JointId,
        actor: &str,
        reason: &str,
        now: DateTime<Utc>,
    ) -> Result<(Joint, Option<i64>), StoreError> {
        let mut tx = Tx::write(self).await?;
        let joint = joint_in(&mut tx, id).await?.ok_or_else(|| not_found(id))?;
        let Some(due) = joint.review_due.clone() else {
            tx.rollback().await?;
            return Ok((joint, None));
        };
        dispatch!(Tx, &mut tx, |c| sqlx::query(CLEAR)
            .bind(id.as_str())
            .execute(&mut **c)
            .await
            .map(drop)?);
        let definition = serde_json::to_string(&joint.definition())?;
        let recorded = format!(
            "review confirmed after catalogue revision {}: {reason}",
            due.revision
        );
        dispatch!(Tx, &mut tx, |c| sqlx::query(INSERT_HISTORY)
            .bind(id.as_str())
            .bind("update")
            .bind(joint.version)
            .bind(&definition)
            .bind(&definition)
            .bind(actor)
            .bind(&recorded)
            .bind(now)
            .execute(&mut **c)
            .await
            .map(drop)?);
        let after = joint_in(&mut tx, id).await?.ok_or_else(|| not_found(id))?;
        tx.commit().await?;
        Ok((after, Some(due.revision)))
    }
}
