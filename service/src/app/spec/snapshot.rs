//! The catalogue snapshot a spec is answered from outside the server (the
//! `tightspec spec` command): the built-in seed catalogue, or the one a
//! database holds, at its current or a named revision. The server answers
//! from its live catalogue instead (`http::specs::handlers::snapshot_for`).

use std::sync::Arc;

use crate::app::{AppError, FieldProblem};
use crate::catalogue::Snapshot;
use crate::store::Store;

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
    let store = Store::open(url).await?;
    let snap = match revision {
        None => store.load_current().await?,
        Some(r) => store.load_at(r).await?,
    };
    Ok(Arc::new(snap))
}
