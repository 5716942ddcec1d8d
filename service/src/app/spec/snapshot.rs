//! The catalogue snapshot a spec is answered from outside the server (the
//! `tightspec spec` command): the built-in seed catalogue, or the one a
//! database holds, at its current or a named revision; and [`pinned`], the
//! rule a spec request's `catalogue_revision` adds to `App::snapshot`
//! (revisions start at 1), which the server's spec routes use too.

use std::sync::Arc;

use crate::app::{App, AppError, FieldProblem};
use crate::catalogue::Snapshot;

/// Where the catalogue comes from.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum CatalogueSource {
    /// The built-in seed catalogue; no database is touched.
    Builtin,
    /// The database at this URL (`None`: the embedded SQLite store).
    Database(Option<String>),
}

/// The snapshot at `revision` (default the current one) of `source`.
pub async fn snapshot(
    source: &CatalogueSource,
    revision: Option<i64>,
) -> Result<Arc<Snapshot>, AppError> {
    let url = match source {
        CatalogueSource::Builtin => {
            let seed = Snapshot::seed();
            return match revision {
                None => Ok(Arc::new(seed)),
                Some(r) if r == seed.revision => Ok(Arc::new(seed)),
                Some(r) => Err(FieldProblem::unknown(
                    "catalogue_revision",
                    format!(
                        "the built-in catalogue is revision {}, not {r}",
                        seed.revision
                    ),
                )
                .into()),
            };
        }
        CatalogueSource::Database(url) => url.as_deref(),
    };
    let app = App::open(url).await?;
    let snap = pinned(&app, revision).await;
    app.close().await;
    snap
}

/// The catalogue a spec request names by `catalogue_revision` (the
/// current one when `None`); a revision below 1 is refused (422) before the
/// store is asked.
pub async fn pinned(app: &App, revision: Option<i64>) -> Result<Arc<Snapshot>, AppError> {
    if let Some(r) = revision.filter(|r| *r < 1) {
        return Err(FieldProblem::invalid(
            "catalogue_revision",
            format!("catalogue revisions start at 1, got {r}"),
        )
        .into());
    }
    app.snapshot(revision).await
}
