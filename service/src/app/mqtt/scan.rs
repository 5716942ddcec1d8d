//! What the publisher reads through the application: the ETags of the
//! active releases' setpoint answers (pages of joints, without the
//! answers' bytes) and the registry's change stamp.

use super::super::releases::view::{answer_etag, FrozenAnswer};
use super::super::{App, AppError};
use crate::registry::{JointId, ReleaseStatus};

/// Joints read per query.
const PAGE: u32 = 1_000;

/// Pages read per pass at most (a million joints).
const PAGES_MAX: usize = 1_000;

/// The joints with an active release and their setpoint answers' ETags,
/// in id order; `truncated` when the pass's bound stopped the reading.
#[derive(Debug, Default)]
pub struct Current {
    pub answers: Vec<(String, String)>,
    pub truncated: bool,
}

impl App {
    /// The ETag `GET /v1/joints/{id}/setpoints` answers now for every
    /// joint with an active release (at most `max` joints, in id order).
    pub async fn active_setpoint_etags(&self, max: usize) -> Result<Current, AppError> {
        let mut out = Current::default();
        let mut after: Option<JointId> = None;
        for _ in 0..PAGES_MAX {
            let page = self.store().active_keys_after(after.as_ref(), PAGE).await?;
            let full = page.len() == PAGE as usize;
            let Some(last) = page.last().map(|k| k.joint_id.clone()) else {
                return Ok(out);
            };
            for key in page {
                let (Some(number), Some(hash)) = (key.number, &key.spec_hash) else {
                    continue;
                };
                // one active release per joint; the newest comes first
                if out
                    .answers
                    .last()
                    .is_some_and(|(id, _)| *id == key.joint_id)
                {
                    continue;
                }
                if out.answers.len() >= max {
                    out.truncated = true;
                    return Ok(out);
                }
                let etag = answer_etag(
                    hash,
                    FrozenAnswer::Setpoints,
                    number,
                    ReleaseStatus::Released.as_str(),
                    key.review_due_revision,
                );
                out.answers.push((key.joint_id, etag));
            }
            if !full {
                return Ok(out);
            }
            after = Some(JointId::parse("id", &last).map_err(|p| {
                AppError::Internal(format!("stored joint id '{last}': {}", p.reason))
            })?);
        }
        out.truncated = true;
        Ok(out)
    }

    /// The registry's change stamp: it moves with every registry write of
    /// this instance and with the database's change counter.
    pub fn registry_stamp(&self) -> (u64, i64) {
        self.fetch_cache().stamp()
    }
}
