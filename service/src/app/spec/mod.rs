//! The spec use cases: a tightening-spec or setpoint request and a
//! catalogue snapshot in, a computed spec (or the setpoints a tool is given)
//! or an [`AppError`] out. Both adapters call these: the HTTP handlers and
//! the batch stream, and `tightspec spec`.
//!
//! - [`request`] — the request declaration: [`SpecRequest`] (the POST body
//!   and a batch item) and the flat form declared once by `spec_query!`
//!   ([`SpecQuery`], [`SetpointQuery`]: GET query parameters and CLI flags).
//! - [`resolve`] — request → the engine's validated input, with the
//!   friction looked up in the snapshot ([`friction`]) and the content hash.
//! - [`compute_one`] — resolve and compute one request.
//! - [`setpoints`] — the window rounded to a tool's resolution
//!   ([`rounding`]), passed through the checks gate ([`checks`]), for
//!   what the tool asks ([`tool`]).
//! - [`snapshot`] — the catalogue a spec is answered from outside the
//!   server (built-in seed or a database).
//! - [`view`] — the answers as the API serves them and `--json` prints
//!   them (with [`cautions`]).

pub mod cautions;
pub mod checks;
pub mod friction;
pub mod request;
pub mod resolve;
pub mod rounding;
pub mod setpoints;
pub mod snapshot;
pub mod tool;
pub mod view;

pub use crate::engine::METHOD_VERSION;
pub use request::{SetpointQuery, SpecQuery, SpecRequest};
pub use resolve::answer_hash;

/// The service's version (the crate's, from its manifest): every spec and
/// setpoint answer carries it and its `spec_hash` covers it.
pub const SERVICE_VERSION: &str = env!("CARGO_PKG_VERSION");
pub use resolve::{resolve, Resolved};

use crate::app::AppError;
use crate::catalogue::Snapshot;
use crate::engine::spec::{compute, Spec};

/// Resolves and computes one request against a snapshot.
pub fn compute_one(req: &SpecRequest, snapshot: &Snapshot) -> Result<(Resolved, Spec), AppError> {
    let resolved = resolve(req, snapshot)?;
    let spec =
        compute(&resolved.input).map_err(|e| AppError::field(resolve::from_engine_for(req, e)))?;
    Ok((resolved, spec))
}
