//! `POST /v1/tightening-specs/batch`: many spec requests in one, answered in
//! order, each item a spec or a problem of its own so that one bad item
//! does not fail the others.
//!
//! The answer is streamed: items are read, computed and written a chunk at a
//! time while the client reads, so a batch holds its raw items and one chunk
//! in memory rather than every spec at once (a 1,000-item answer is about
//! 6 MB). The counts come after the items. Every item without a
//! `catalogue_revision` is answered from the catalogue revision that was
//! live when the batch arrived.

use std::collections::HashMap;
use std::sync::Arc;
use std::time::Instant;

use actix_web::http::header::ContentType;
use actix_web::web::Bytes;
use actix_web::{post, web, HttpResponse};
use futures_util::stream;
use serde::{Deserialize, Serialize};
use serde_json::value::RawValue;
use utoipa::ToSchema;

use crate::catalogue::Snapshot;
use crate::http::auth::Reader;
use crate::http::error::{ApiError, Problem};
use crate::http::state::AppState;

use super::handlers::{compute_one, snapshot_for};
use super::request::SpecRequest;
use super::response::{spec_response, SpecResponse};

/// Most items one batch may hold.
pub const BATCH_MAX_ITEMS: usize = 10_000;

/// Items computed and written per chunk of the streamed answer (about
/// 200 KB of JSON).
pub const CHUNK_ITEMS: usize = 32;

/// Room for one item's JSON (a spec is about 5 KB in SI units).
pub const ITEM_JSON_BYTES: usize = 6 * 1024;

/// Body of a batch: up to 10,000 spec requests (each as the POST body).
#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BatchRequest {
    /// Each item is read on its own, so a malformed one becomes that item's
    /// problem.
    #[schema(value_type = Vec<SpecRequest>)]
    pub items: Vec<Box<RawValue>>,
}

/// One result of a batch, in request order: a spec or a problem.
#[derive(Debug, Serialize, ToSchema)]
pub struct BatchItem {
    /// Position in the request's `items`.
    pub index: usize,
    /// 200, or the status the item would have had on its own.
    pub status: u16,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub spec: Option<SpecResponse>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub problem: Option<Problem>,
}

// Documents the streamed answer in the OpenAPI document; `Batch` below
// writes it.
/// The answer to a batch (written as `items` first, then the counts).
#[derive(Debug, ToSchema)]
pub struct BatchResponse {
    pub items: Vec<BatchItem>,
    pub count: usize,
    pub succeeded: usize,
    pub failed: usize,
}

/// Many specs in one request: results in the same order, each a spec or a
/// problem object; one bad item does not fail the batch.
#[utoipa::path(
    tag = "specs",
    request_body = BatchRequest,
    responses(
        (status = 200, description = "One result per item, in order (streamed; the counts follow the items)", body = BatchResponse),
        (status = 400, description = "The body is not a batch", body = Problem, content_type = "application/problem+json"),
        (status = 413, description = "Body over the limit", body = Problem, content_type = "application/problem+json"),
        (status = 422, description = "More than 10,000 items", body = Problem, content_type = "application/problem+json"),
    )
)]
#[post("/v1/tightening-specs/batch")]
pub async fn post_batch(
    _reader: Reader,
    state: web::Data<AppState>,
    body: web::Json<BatchRequest>,
) -> Result<HttpResponse, ApiError> {
    let items = body.into_inner().items;
    if items.len() > BATCH_MAX_ITEMS {
        return Err(ApiError::invalid(
            "items",
            format!(
                "a batch holds at most {BATCH_MAX_ITEMS} items; this one has {}",
                items.len()
            ),
        ));
    }
    let batch = Batch::new(state.into_inner(), items);
    Ok(HttpResponse::Ok()
        .content_type(ContentType::json())
        .streaming(stream::unfold(batch, Batch::next_chunk)))
}

/// The first `name` in backticks of a serde message ("unknown field `thred`").
fn backticked(message: &str) -> Option<String> {
    let rest = message.split_once('`')?.1;
    Some(rest.split_once('`')?.0.to_string())
}

/// One raw item read as a spec request; a malformed one names its field:
/// the path serde was at, else the name an unknown-field message quotes,
/// else `item` (a quoted value such as a bad variant is never taken for a
/// field name).
pub fn read_item(raw: &RawValue) -> Result<SpecRequest, ApiError> {
    let mut de = serde_json::Deserializer::from_str(raw.get());
    serde_path_to_error::deserialize(&mut de).map_err(|e| {
        let path = e.path().to_string();
        let message = e.inner().to_string();
        let field = if path.is_empty() || path == "." {
            Some(message.as_str())
                .filter(|m| m.starts_with("unknown field"))
                .and_then(backticked)
                .filter(|f| !f.is_empty())
                .unwrap_or_else(|| "item".to_string())
        } else {
            path
        };
        ApiError::malformed(field, message)
    })
}

fn failed(index: usize, problem: Problem) -> BatchItem {
    BatchItem {
        index,
        status: problem.status,
        spec: None,
        problem: Some(problem),
    }
}

/// An item read and paired with the snapshot it is answered from, or its
/// problem.
pub type ReadItem = (usize, Result<(SpecRequest, Arc<Snapshot>), Problem>);

/// Computes `items` and writes them as JSON, comma-separated; returns how
/// many succeeded.
pub fn write_items(
    items: Vec<ReadItem>,
    stale: bool,
    out: &mut Vec<u8>,
) -> Result<usize, ApiError> {
    let mut succeeded = 0;
    for (n, (index, read)) in items.into_iter().enumerate() {
        let computed = match read {
            Ok((req, snapshot)) => {
                compute_one(&req, &snapshot).map_err(|e| ApiError::from(e).problem())
            }
            Err(problem) => Err(problem),
        };
        let item = match computed {
            Ok((resolved, spec)) => {
                succeeded += 1;
                BatchItem {
                    index,
                    status: 200,
                    spec: Some(spec_response(&spec, &resolved, stale)),
                    problem: None,
                }
            }
            Err(problem) => failed(index, problem),
        };
        if n > 0 {
            out.push(b',');
        }
        serde_json::to_writer(&mut *out, &item).map_err(|e| {
            ApiError::Internal(format!("batch item {index} could not be written: {e}"))
        })?;
    }
    Ok(succeeded)
}

/// A batch being answered: the items not yet written and the counts so far.
struct Batch {
    state: Arc<AppState>,
    items: std::iter::Enumerate<std::vec::IntoIter<Box<RawValue>>>,
    /// The snapshot of each revision asked for (`None`: the live one when
    /// the batch arrived), fetched once.
    snapshots: HashMap<Option<i64>, Result<Arc<Snapshot>, Problem>>,
    stale: bool,
    count: usize,
    succeeded: usize,
    done: bool,
    /// When the handler took the batch, and its request's log span: the
    /// last chunk logs the server time (the stream runs outside the span).
    started: Instant,
    span: tracing::Span,
}

impl Batch {
    fn new(state: Arc<AppState>, items: Vec<Box<RawValue>>) -> Self {
        let mut snapshots = HashMap::new();
        snapshots.insert(None, Ok(state.snapshot()));
        Self {
            stale: state.catalogue.is_stale(),
            state,
            items: items.into_iter().enumerate(),
            snapshots,
            count: 0,
            succeeded: 0,
            done: false,
            started: Instant::now(),
            span: tracing::Span::current(),
        }
    }

    /// The next items read, each with its snapshot (a pinned revision not
    /// yet held is fetched here, once per batch).
    async fn read_next(&mut self) -> Vec<ReadItem> {
        let mut read = Vec::with_capacity(CHUNK_ITEMS);
        for (index, raw) in self.items.by_ref().take(CHUNK_ITEMS) {
            let req = match read_item(&raw) {
                Ok(r) => r,
                Err(e) => {
                    read.push((index, Err(e.problem())));
                    continue;
                }
            };
            let pinned = req.catalogue_revision;
            if !self.snapshots.contains_key(&pinned) {
                let snapshot = snapshot_for(&self.state, pinned).await;
                self.snapshots
                    .insert(pinned, snapshot.map_err(|e| e.problem()));
            }
            let snapshot = match self.snapshots.get(&pinned) {
                Some(Ok(s)) => Ok((req, Arc::clone(s))),
                Some(Err(problem)) => Err(problem.clone()),
                None => Err(ApiError::Internal("batch snapshot missing".into()).problem()),
            };
            read.push((index, snapshot));
        }
        read
    }

    /// The next piece of the answer: the opening and the first items, then
    /// further items, then the counts; `None` after that.
    async fn next_chunk(mut self) -> Option<(Result<Bytes, ApiError>, Self)> {
        if self.done {
            return None;
        }
        let items = self.read_next().await;
        self.done = items.len() < CHUNK_ITEMS;
        let n = items.len();
        let mut out = Vec::with_capacity(n * ITEM_JSON_BYTES + 64);
        if self.count == 0 {
            out.extend_from_slice(b"{\"items\":[");
        } else if n > 0 {
            out.push(b',');
        }
        match write_items(items, self.stale, &mut out) {
            Ok(ok) => self.succeeded += ok,
            Err(e) => return self.fail(e),
        }
        self.count += n;
        if self.done {
            self.finish(&mut out);
        }
        Some((Ok(Bytes::from(out)), self))
    }

    /// Writes the counts and logs the batch's server time.
    fn finish(&self, out: &mut Vec<u8>) {
        let failed = self.count - self.succeeded;
        let tail = format!(
            "],\"count\":{},\"succeeded\":{},\"failed\":{failed}}}",
            self.count, self.succeeded
        );
        out.extend_from_slice(tail.as_bytes());
        let elapsed_ms = (self.started.elapsed().as_secs_f64() * 1e6).round() / 1e3;
        self.span.in_scope(|| {
            tracing::info!(items = self.count, failed, elapsed_ms, "batch answered");
        });
    }

    /// Ends the stream with an error (the client sees a cut-off answer).
    fn fail(mut self, e: ApiError) -> Option<(Result<Bytes, ApiError>, Self)> {
        tracing::error!(error = %e, "batch answer cut off");
        self.done = true;
        Some((Err(e), self))
    }
}
