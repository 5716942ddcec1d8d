//! What releasing a joint now would change: the joint computed against the
//! current catalogue (every check reported, none refusing) compared with
//! its active release, the way the catalogue impact compares them. The
//! page shows it above the release form; it writes nothing.

use super::compare::{answers, compare_with, figures_of};
use super::{ImpactFigures, JointImpact};
use crate::app::spec::view::CheckOut;
use crate::app::{App, AppError};

/// A joint's release preview.
#[derive(Debug, Clone, PartialEq)]
pub struct ReleasePreview {
    /// The catalogue revision computed against (the one a release freezes).
    pub catalogue_revision: i64,
    /// The joint's figures now, or why its definition no longer computes.
    pub now: Result<ImpactFigures, String>,
    /// Every check of the computation now, with its severity.
    pub checks: Vec<CheckOut>,
    /// The active release compared with now; absent without one.
    pub against_active: Option<JointImpact>,
}

impl ReleasePreview {
    /// The error-severity checks a release has to accept by code.
    pub fn error_checks(&self) -> impl Iterator<Item = &CheckOut> {
        self.checks.iter().filter(|c| c.is_error())
    }
}

impl App {
    /// The release preview of joint `id` (unknown joint: 404 with near
    /// ids). Reads only.
    pub async fn release_preview(&self, id: &str) -> Result<ReleasePreview, AppError> {
        let joint = self.joint(id).await?;
        let active = self.store().active_release(&joint.id).await?;
        let snap = self.current();
        let computed = answers(&joint, &snap);
        let checks = computed
            .as_ref()
            .map(|(a, _)| a.checks.clone())
            .unwrap_or_default();
        let figures = computed.and_then(|(a, spec)| figures_of(&a, &spec));
        let against_active = active
            .as_ref()
            .map(|r| compare_with(&joint, r, figures.clone()));
        Ok(ReleasePreview {
            catalogue_revision: snap.revision,
            now: figures.map(|(f, _)| f),
            checks,
            against_active,
        })
    }
}
