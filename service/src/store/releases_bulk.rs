//! Releases of many joints in ONE transaction (all or nothing): each
//! written as [`Store::write_release`] writes one (number, first event,
//! activation, outbox event), the joints locked in id order so that two
//! bulk releases over overlapping joints wait for each other instead of
//! deadlocking. A joint whose definition changed after it was read (its
//! version is not the one computed from) refuses the whole bulk release.

use super::backend::Tx;
use super::error::RegistryStoreError;
use super::releases::write_in;
use super::Store;
use crate::registry::{NewRelease, OutboxEvent, Release, ReleaseEventKind};

/// One release to write in a bulk release, with the joint's definition
/// version it was computed from.
pub struct BulkItem {
    pub new: NewRelease,
    pub version: i64,
}

impl Store {
    /// Writes every release of `items` with the first event `first` and the
    /// outbox event `event` makes of each written release, in one
    /// transaction; nothing is written on any failure. The releases come
    /// back in joint id order.
    #[tracing::instrument(skip_all, level = "debug", fields(joints = items.len()))]
    pub async fn write_releases(
        &self,
        items: &[BulkItem],
        first: ReleaseEventKind,
        event: impl Fn(&Release) -> Option<OutboxEvent>,
    ) -> Result<Vec<Release>, RegistryStoreError> {
        first.apply(None, "status")?;
        for item in items {
            item.new.check()?;
        }
        let mut order: Vec<&BulkItem> = items.iter().collect();
        order.sort_by(|a, b| a.new.joint_id.as_str().cmp(b.new.joint_id.as_str()));
        let mut tx = Tx::write(self).await?;
        let mut written = Vec::with_capacity(order.len());
        for item in order {
            // On a refusal the transaction is dropped, which rolls it back.
            let release = write_in(&mut tx, &item.new, first, Some(item.version), &event).await?;
            written.push(release);
        }
        tx.commit().await?;
        Ok(written)
    }
}
