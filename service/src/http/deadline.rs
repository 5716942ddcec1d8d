//! Deadlines actix-web has no setting for (request hardening):
//!
//! - **body read**: the whole request body must arrive within
//!   `--body-read-timeout-secs` of the end of the headers. The body stream
//!   is wrapped so that, once the deadline has passed, the next read fails
//!   with a timed-out error, whether the client stalls or trickles; the JSON
//!   extractor turns it into a 408 problem (see `extract::json_error`) and
//!   the connection is closed after that answer, which frees what the body
//!   had buffered.
//! - **request**: a request whose answer has not started within
//!   `--request-timeout-secs` (body read included) is dropped and answered
//!   503. A streamed answer that has started is not cut. The deadline can
//!   only take effect where the handler waits (on the body, the database);
//!   computation is bounded by the input limits instead (plausibility
//!   ranges, batch size, body size).
//!
//! Connection caps, the listen backlog, keep-alive and the header-read and
//! disconnect timeouts are actix-web's own server settings (`startup.rs`).

use std::future::Future;
use std::io;
use std::pin::Pin;
use std::task::{Context, Poll};
use std::time::Duration;

use actix_web::body::MessageBody;
use actix_web::dev::{Payload, ServiceRequest, ServiceResponse};
use actix_web::error::PayloadError;
use actix_web::middleware::Next;
use actix_web::web::{self, Bytes};
use actix_web::HttpMessage;
use futures_util::Stream;

use super::error::ApiError;
use super::state::AppState;

/// The message of the timed-out read; `extract` recognises the error kind.
const BODY_TIMEOUT: &str = "the request body was not received within the body-read deadline";

/// Whether a body read failed because its deadline passed.
pub fn is_body_timeout(e: &PayloadError) -> bool {
    matches!(e, PayloadError::Io(io) if io.kind() == io::ErrorKind::TimedOut)
}

/// A request body stream that fails once its deadline has passed.
struct DeadlinedBody {
    inner: Payload,
    deadline: Pin<Box<tokio::time::Sleep>>,
    finished: bool,
}

impl DeadlinedBody {
    fn expired(&mut self) -> Poll<Option<Result<Bytes, PayloadError>>> {
        self.finished = true;
        Poll::Ready(Some(Err(PayloadError::Io(io::Error::new(
            io::ErrorKind::TimedOut,
            BODY_TIMEOUT,
        )))))
    }
}

impl Stream for DeadlinedBody {
    type Item = Result<Bytes, PayloadError>;

    fn poll_next(self: Pin<&mut Self>, cx: &mut Context<'_>) -> Poll<Option<Self::Item>> {
        let this = self.get_mut();
        if this.finished {
            return Poll::Ready(None);
        }
        // A trickling client keeps the stream ready; check the clock first.
        if this.deadline.is_elapsed() {
            return this.expired();
        }
        match Pin::new(&mut this.inner).poll_next(cx) {
            Poll::Ready(None) => {
                this.finished = true;
                Poll::Ready(None)
            }
            Poll::Ready(Some(item)) => Poll::Ready(Some(item)),
            Poll::Pending => match this.deadline.as_mut().poll(cx) {
                Poll::Ready(()) => this.expired(),
                Poll::Pending => Poll::Pending,
            },
        }
    }
}

/// Middleware: body-read and request deadlines from the configuration.
pub async fn middleware(
    mut req: ServiceRequest,
    next: Next<impl MessageBody + 'static>,
) -> Result<ServiceResponse<impl MessageBody>, actix_web::Error> {
    let (body_limit, request_limit) = match req.app_data::<web::Data<AppState>>() {
        Some(state) => {
            let settings = &state.settings;
            (
                Duration::from_secs(settings.body_read_timeout_secs),
                Duration::from_secs(settings.request_timeout_secs),
            )
        }
        None => return next.call(req).await,
    };
    let payload = req.take_payload();
    if !matches!(payload, Payload::None) {
        let body = DeadlinedBody {
            inner: payload,
            deadline: Box::pin(tokio::time::sleep(body_limit)),
            finished: false,
        };
        req.set_payload(Payload::Stream {
            payload: Box::pin(body),
        });
    } else {
        req.set_payload(payload);
    }
    match tokio::time::timeout(request_limit, next.call(req)).await {
        Ok(result) => result,
        Err(_) => {
            tracing::warn!(seconds = request_limit.as_secs(), "request deadline passed");
            Err(ApiError::Unavailable {
                detail: format!(
                    "the request did not complete within the request deadline of {} s; retry later",
                    request_limit.as_secs()
                ),
                retry_after_secs: 1,
            }
            .into())
        }
    }
}
