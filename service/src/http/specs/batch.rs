//! `POST /v1/tightening-specs/batch`: many spec requests in one, answered in
//! order, each item a spec, setpoints (`"answer": "setpoints"`, see
//! [`item`]) or a problem of its own so that one bad item does not fail the
//! others. A setpoint item follows the rule of `GET /v1/setpoints`: while
//! an error check applies that it does not accept, it is a 422 problem
//! listing the checks.
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

use super::handlers::snapshot_for;
use crate::app::spec::compute_one;
use crate::app::spec::setpoints::setpoints;
use crate::app::spec::view::{spec_response, SetpointResponse, SpecResponse};

pub mod item;
pub use item::{read_item, Answer, BatchItemRequest, ItemRequest};

/// Most items one batch may hold.
pub const BATCH_MAX_ITEMS: usize = 10_000;

/// Items computed and written per chunk of the streamed answer (about
/// 200 KB of JSON).
pub const CHUNK_ITEMS: usize = 32;

/// Room for one item's JSON (a spec is about 5 KB in SI units).
pub const ITEM_JSON_BYTES: usize = 6 * 1024;

/// Body of a batch: up to 10,000 items, each a spec request (as the POST
/// body) with, optionally, `"answer": "setpoints"` and the setpoint options.
#[derive(Debug, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BatchRequest {
    /// Each item is read on its own, so a malformed one becomes that item's
    /// problem.
    #[schema(value_type = Vec<BatchItemRequest>)]
    pub items: Vec<Box<RawValue>>,
}

/// One result of a batch, in request order: a spec, setpoints or a problem.
#[derive(Debug, Serialize, ToSchema)]
pub struct BatchItem {
    /// Position in the request's `items`.
    pub index: usize,
    /// 200, or the status the item would have had on its own.
    pub status: u16,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub spec: Option<SpecResponse>,
    /// For an item with `"answer": "setpoints"`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub setpoints: Option<SetpointResponse>,
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

/// Many specs or setpoints in one request: results in the same order, each
/// a spec, setpoints (an item with `"answer": "setpoints"` and, optionally,
/// `torque_unit`, `resolution`, `angle_resolution` and `accept_checks`) or a
/// problem object; one bad item does not fail the batch. A setpoint item is
/// refused (422, the checks listed) while an error check applies that its
/// `accept_checks` does not name, as `GET /v1/setpoints` is.
#[utoipa::path(
    tag = "specs",
    request_body = BatchRequest,
    responses(
        (status = 200, description = "One result per item, in order (streamed; the counts follow the items)", body = BatchResponse),
        (status = 400, description = "The body is not a batch"),
        (status = 413, description = "Body over the limit"),
        (status = 422, description = "More than 10,000 items"),
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

fn failed(index: usize, problem: Problem) -> BatchItem {
    BatchItem {
        index,
        status: problem.status,
        spec: None,
        setpoints: None,
        problem: Some(problem),
    }
}

/// An item read and paired with the snapshot it is answered from, or its
/// problem.
pub type ReadItem = (usize, Result<(ItemRequest, Arc<Snapshot>), Problem>);

/// One item's answer: its spec, or its setpoints (or refusal).
fn answer_item(index: usize, item: &ItemRequest, snapshot: &Snapshot, stale: bool) -> BatchItem {
    let (resolved, spec) = match compute_one(&item.spec, snapshot) {
        Ok(r) => r,
        Err(e) => return failed(index, ApiError::from(e).problem()),
    };
    let mut out = BatchItem {
        index,
        status: 200,
        spec: None,
        setpoints: None,
        problem: None,
    };
    match &item.answer {
        Answer::Spec => out.spec = Some(spec_response(&spec, &resolved, stale)),
        Answer::Setpoints(ask) => match setpoints(&spec, &resolved, ask, stale) {
            Ok(sp) => out.setpoints = Some(sp),
            Err(e) => return failed(index, ApiError::from(e).problem()),
        },
    }
    out
}

/// Computes `items` and writes them as JSON, comma-separated; returns how
/// many succeeded.
pub fn write_items(
    items: Vec<ReadItem>,
    stale: bool,
    out: &mut Vec<u8>,
) -> Result<usize, ApiError> {
    let mut succeeded = 0;
    for (n, (index, read)) in items.into_iter().enumerate() {
        let item = match read {
            Ok((req, snapshot)) => answer_item(index, &req, &snapshot, stale),
            Err(problem) => failed(index, problem),
        };
        if item.status == 200 {
            succeeded += 1;
        }
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
        snapshots.insert(None, Ok(state.app.current()));
        Self {
            stale: state.app.stale(),
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
            let pinned = req.spec.catalogue_revision;
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
