//! Releases of a joint: written in one transaction with their first event
//! and their outbox event (numbered 1, 2, … per joint under the joint's row
//! lock, unique (joint_id, number) behind it), status events appended after
//! checking the transition, the active release and release N read back.
//! When a release becomes active the joint's earlier active release gets a
//! `superseded` event and its review mark is cleared, in the same
//! transaction. Releases and their events are append-only in the database.

use chrono::{DateTime, Utc};

use super::backend::{dispatch, Tx};
use super::error::RegistryStoreError;
use super::{joints, outbox, Store, StoreError};
use crate::registry::{JointId, NewRelease, OutboxEvent, Release, ReleaseEventKind, ReleaseStatus};

/// One status event of a release, as `joint_release_events` holds it.
#[derive(Debug, Clone, PartialEq, sqlx::FromRow)]
pub struct ReleaseEventRecord {
    pub seq: i64,
    pub event: String,
    pub status: String,
    pub actor: String,
    pub reason: String,
    pub created_at: DateTime<Utc>,
}

#[derive(sqlx::FromRow)]
pub(super) struct ReleaseRow {
    joint_id: String,
    number: i64,
    spec_hash: String,
    catalogue_revision: i64,
    service_version: String,
    method_version: String,
    requested_by: String,
    reason: String,
    accepted_checks: String,
    spec: String,
    setpoints: String,
    created_at: DateTime<Utc>,
    status: Option<String>,
    approved_by: Option<String>,
}

impl TryFrom<ReleaseRow> for Release {
    type Error = StoreError;
    fn try_from(r: ReleaseRow) -> Result<Release, StoreError> {
        let corrupt = |what: &str| {
            StoreError::Internal(format!("release {} of '{}': {what}", r.number, r.joint_id))
        };
        let status = r
            .status
            .as_deref()
            .and_then(ReleaseStatus::parse)
            .ok_or_else(|| corrupt("no readable status event"))?;
        let joint_id = JointId::parse("id", &r.joint_id).map_err(|p| corrupt(&p.reason))?;
        Ok(Release {
            joint_id,
            number: r.number,
            status,
            spec_hash: r.spec_hash,
            catalogue_revision: r.catalogue_revision,
            service_version: r.service_version,
            method_version: r.method_version,
            requested_by: r.requested_by,
            approved_by: r.approved_by,
            reason: r.reason,
            accepted_checks: serde_json::from_str(&r.accepted_checks)?,
            spec: r.spec,
            setpoints: r.setpoints,
            created_at: r.created_at,
        })
    }
}

/// Every release column, its current status (that of its latest event)
/// and who approved it, over every joint's releases.
macro_rules! select_releases {
    () => {
        "SELECT r.joint_id, r.number, r.spec_hash, r.catalogue_revision, \
     r.service_version, r.method_version, r.requested_by, r.reason, r.accepted_checks, r.spec, \
     r.setpoints, r.created_at, \
     (SELECT e.status FROM joint_release_events e WHERE e.joint_id = r.joint_id \
      AND e.number = r.number ORDER BY e.seq DESC LIMIT 1) AS status, \
     (SELECT e.actor FROM joint_release_events e WHERE e.joint_id = r.joint_id \
      AND e.number = r.number AND e.event = 'approved' ORDER BY e.seq DESC LIMIT 1) AS approved_by \
     FROM joint_releases r"
    };
}
pub(super) use select_releases;

const SELECT: &str = concat!(select_releases!(), " WHERE r.joint_id = $1");

const NEXT_NUMBER: &str =
    "SELECT COALESCE(MAX(number), 0) + 1 FROM joint_releases WHERE joint_id = $1";

const INSERT: &str = "INSERT INTO joint_releases (joint_id, number, spec_hash, \
     catalogue_revision, service_version, method_version, requested_by, reason, accepted_checks, \
     spec, setpoints, created_at) VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12)";

const INSERT_EVENT: &str = "INSERT INTO joint_release_events (joint_id, number, event, status, \
     actor, reason, created_at) VALUES ($1, $2, $3, $4, $5, $6, $7)";

const EVENTS: &str = "SELECT seq, event, status, actor, reason, created_at \
     FROM joint_release_events WHERE joint_id = $1 AND number = $2 ORDER BY seq";

fn release_not_found(id: &JointId, number: i64) -> StoreError {
    StoreError::NotFound {
        field: "release".into(),
        reason: format!("joint '{id}' has no release {number}"),
    }
}

/// Which releases of a joint to read.
enum Which {
    /// Release N alone.
    Number(i64),
    /// Those whose current status is this one, newest first.
    Status(ReleaseStatus),
    /// Every one, newest first.
    All,
}

async fn releases_in(tx: &mut Tx, id: &JointId, which: Which) -> Result<Vec<Release>, StoreError> {
    let rows: Vec<ReleaseRow> = match which {
        Which::Number(number) => {
            let sql = format!("{SELECT} AND r.number = $2");
            dispatch!(Tx, tx, |c| sqlx::query_as(&sql)
                .bind(id.as_str())
                .bind(number)
                .fetch_all(&mut **c)
                .await?)
        }
        Which::Status(status) => {
            let sql =
                format!("SELECT * FROM ({SELECT}) x WHERE x.status = $2 ORDER BY x.number DESC");
            dispatch!(Tx, tx, |c| sqlx::query_as(&sql)
                .bind(id.as_str())
                .bind(status.as_str())
                .fetch_all(&mut **c)
                .await?)
        }
        Which::All => {
            let sql = format!("{SELECT} ORDER BY r.number DESC");
            dispatch!(Tx, tx, |c| sqlx::query_as(&sql)
                .bind(id.as_str())
                .fetch_all(&mut **c)
                .await?)
        }
    };
    rows.into_iter().map(Release::try_from).collect()
}

async fn insert_event(
    tx: &mut Tx,
    id: &JointId,
    number: i64,
    kind: ReleaseEventKind,
    actor: &str,
    reason: &str,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    dispatch!(Tx, tx, |c| sqlx::query(INSERT_EVENT)
        .bind(id.as_str())
        .bind(number)
        .bind(kind.as_str())
        .bind(kind.status().as_str())
        .bind(actor)
        .bind(reason)
        .bind(now)
        .execute(&mut **c)
        .await
        .map(drop)?);
    Ok(())
}

/// Release `number` became active: every other released one of the joint
/// is superseded, and the joint's review mark is cleared.
async fn activate(
    tx: &mut Tx,
    id: &JointId,
    number: i64,
    actor: &str,
    now: DateTime<Utc>,
) -> Result<(), StoreError> {
    let active = releases_in(tx, id, Which::Status(ReleaseStatus::Released)).await?;
    for old in active.iter().filter(|r| r.number != number) {
        let reason = format!("superseded by release {number}");
        insert_event(
            tx,
            id,
            old.number,
            ReleaseEventKind::Superseded,
            actor,
            &reason,
            now,
        )
        .await?;
    }
    dispatch!(Tx, tx, |c| sqlx::query(joints::CLEAR)
        .bind(id.as_str())
        .execute(&mut **c)
        .await
        .map(drop)?);
    Ok(())
}

/// Release `number` of the joint read in the transaction, or `NotFound`.
async fn one_in(tx: &mut Tx, id: &JointId, number: i64) -> Result<Release, StoreError> {
    releases_in(tx, id, Which::Number(number))
        .await?
        .into_iter()
        .next()
        .ok_or_else(|| release_not_found(id, number))
}

/// Writes one release inside `tx` (see [`Store::write_release`]; `new`
/// already checked): the joint's row locked, the next number, the release,
/// its first event, the activation, the outbox event. With `version`, a
/// joint no longer at that definition version is a conflict naming
/// `joints[<id>]` (it changed after it was read).
pub(super) async fn write_in(
    tx: &mut Tx,
    new: &NewRelease,
    first: ReleaseEventKind,
    version: Option<i64>,
    event: impl FnOnce(&Release) -> Option<OutboxEvent>,
) -> Result<Release, StoreError> {
    let id = &new.joint_id;
    match (tx.lock_joint(id.as_str()).await?, version) {
        (None, _) => return Err(joints::not_found(id)),
        (Some(now), Some(read)) if now != read => {
            return Err(StoreError::Conflict {
                field: format!("joints[{id}]"),
                reason: format!(
                    "joint '{id}' changed while it was being released (version {read} read, \
                     {now} now); release again"
                ),
            })
        }
        _ => {}
    }
    let number: i64 = dispatch!(Tx, tx, |c| sqlx::query_scalar(NEXT_NUMBER)
        .bind(id.as_str())
        .fetch_one(&mut **c)
        .await?);
    let now = Utc::now();
    let accepted = serde_json::to_string(&new.accepted_checks)?;
    dispatch!(Tx, tx, |c| sqlx::query(INSERT)
        .bind(id.as_str())
        .bind(number)
        .bind(&new.spec_hash)
        .bind(new.catalogue_revision)
        .bind(&new.service_version)
        .bind(&new.method_version)
        .bind(&new.requested_by)
        .bind(&new.reason)
        .bind(&accepted)
        .bind(&new.spec)
        .bind(&new.setpoints)
        .bind(now)
        .execute(&mut **c)
        .await
        .map(drop)?);
    insert_event(tx, id, number, first, &new.requested_by, &new.reason, now).await?;
    if first.status() == ReleaseStatus::Released {
        activate(tx, id, number, &new.requested_by, now).await?;
    }
    let release = one_in(tx, id, number).await?;
    if let Some(event) = event(&release) {
        outbox::insert_in(tx, &event).await?;
    }
    Ok(release)
}

impl Store {
    /// Writes a release with the next number, its first event (`requested`:
    /// a draft; `released`: active at once) and the outbox event `event`
    /// makes of the written release (if any), in one transaction. With
    /// `version`, a joint whose definition is no longer at that version (it
    /// changed after the release was computed from it) is a conflict.
    #[tracing::instrument(skip(self, new, event), level = "debug", fields(id = %new.joint_id))]
    pub async fn write_release(
        &self,
        new: &NewRelease,
        version: Option<i64>,
        first: ReleaseEventKind,
        event: impl FnOnce(&Release) -> Option<OutboxEvent>,
    ) -> Result<Release, RegistryStoreError> {
        new.check()?;
        first.apply(None, "status")?;
        let mut tx = Tx::write(self).await?;
        // On a refusal the transaction is dropped, which rolls it back.
        let release = write_in(&mut tx, new, first, version, event).await?;
        tx.commit().await?;
        Ok(release)
    }

    /// Appends a status event to release `number` if its current status
    /// allows it (otherwise `Transition` naming `status`), with `event` in
    /// the outbox, in one transaction. `approved` makes a draft active.
    #[tracing::instrument(skip(self, event), level = "debug")]
    pub async fn append_release_event(
        &self,
        id: &JointId,
        number: i64,
        kind: ReleaseEventKind,
        actor: &str,
        reason: &str,
        event: Option<&OutboxEvent>,
    ) -> Result<Release, RegistryStoreError> {
        let mut tx = Tx::write(self).await?;
        if tx.lock_joint(id.as_str()).await?.is_none() {
            tx.rollback().await?;
            return Err(joints::not_found(id).into());
        }
        let current = match one_in(&mut tx, id, number).await {
            Ok(r) => r,
            Err(e) => {
                tx.rollback().await?;
                return Err(e.into());
            }
        };
        let status = match kind.apply(Some(current.status), "status") {
            Ok(s) => s,
            Err(e) => {
                tx.rollback().await?;
                return Err(e.into());
            }
        };
        let now = Utc::now();
        insert_event(&mut tx, id, number, kind, actor, reason, now).await?;
        if status == ReleaseStatus::Released {
            activate(&mut tx, id, number, actor, now).await?;
        }
        if let Some(event) = event {
            outbox::insert_in(&mut tx, event).await?;
        }
        let release = one_in(&mut tx, id, number).await?;
        tx.commit().await?;
        Ok(release)
    }

    /// Release `number` of the joint (`NotFound` naming `release`).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn release(&self, id: &JointId, number: i64) -> Result<Release, StoreError> {
        let mut tx = Tx::read(self).await?;
        let release = one_in(&mut tx, id, number).await;
        tx.commit().await?;
        release
    }

    /// The joint's active release: the latest one released and neither
    /// superseded nor withdrawn (`None` when there is none; an unknown
    /// joint is `NotFound` naming `id`).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn active_release(&self, id: &JointId) -> Result<Option<Release>, StoreError> {
        let mut tx = Tx::read(self).await?;
        if joints::joint_in(&mut tx, id).await?.is_none() {
            tx.commit().await?;
            return Err(joints::not_found(id));
        }
        let active = releases_in(&mut tx, id, Which::Status(ReleaseStatus::Released)).await?;
        tx.commit().await?;
        Ok(active.into_iter().next())
    }

    /// Every release of the joint, newest first (an unknown joint is
    /// `NotFound` naming `id`).
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn releases(&self, id: &JointId) -> Result<Vec<Release>, StoreError> {
        let mut tx = Tx::read(self).await?;
        if joints::joint_in(&mut tx, id).await?.is_none() {
            tx.commit().await?;
            return Err(joints::not_found(id));
        }
        let all = releases_in(&mut tx, id, Which::All).await?;
        tx.commit().await?;
        Ok(all)
    }

    /// The status events of release `number`, oldest first.
    #[tracing::instrument(skip(self), level = "debug")]
    pub async fn release_events(
        &self,
        id: &JointId,
        number: i64,
    ) -> Result<Vec<ReleaseEventRecord>, StoreError> {
        Ok(dispatch!(Store, self, |pool| sqlx::query_as(EVENTS)
            .bind(id.as_str())
            .bind(number)
            .fetch_all(pool)
            .await?))
    }
}
