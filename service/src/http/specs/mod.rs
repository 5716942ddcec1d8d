//! The tightening-spec API: `GET`/`POST /v1/tightening-specs`,
//! `POST /v1/tightening-specs/batch` and `GET /v1/setpoints`.
//!
//! Reading a request is one step, shared by every endpoint and the
//! `tightspec spec` command: wire request ([`request`]) → names resolved
//! through the engine's look-ups and the catalogue snapshot ([`friction`],
//! [`resolve`]) → the engine's validated `SpecInput`. Handlers only fetch the
//! snapshot, call that step and the engine, and render.

pub mod friction;
pub mod item_error;
pub mod request;
pub mod rounding;
mod wire_quantity;

pub use item_error::{ErrorClass, ItemError, ItemErrors};
