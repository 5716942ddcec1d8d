//! The application layer: the use cases, between the adapters (`http`,
//! `cli`) and the domain (`engine`, `catalogue`, `store`). Adapters
//! translate their input into the types here, call one use case and render
//! its answer; they never call the engine or the store themselves.
//!
//! - `catalogue` — catalogue use cases: entries, finishes and lubricants
//!   (one item kind), revisions, history, diff, export, import.
//! - `context` — [`App`], the store and the live catalogue, opened once at
//!   start-up; [`App::snapshot`] gives the catalogue at a revision.
//! - `error` — [`AppError`], the one error of every use case, with field
//!   paths; `http` maps it to a problem response in one place.
//! - `spec` — the tightening-spec and setpoint use cases, their request
//!   declaration and the views both adapters render.
//! - `quantity` — wire quantities `{"value", "unit"}` and units, read into
//!   engine quantities (a misread is a [`FieldProblem`]).
//! - `reading` — nearest-name suggestions and JSON Schema integers.
//! - `reference` — the engine's reference tables and lists as served.
//! - `friction_tests` — friction test series: their wire types, parsing
//!   and evaluation (ISO 16047 method), store and read a series, propose
//!   and apply the entry change a series supports.
//! - `joints` — the joint registry's definitions: define, read, list (by
//!   tag, due review, pages of ids) and change from an expected version;
//!   [`joints::JointView`] as both adapters render it.
//! - `releases` — joint releases: release (compute and freeze the spec
//!   and setpoints), approve (four-eyes rule), withdraw, list, read, and
//!   the frozen answer the line fetches by joint id.
//! - `charts` — the charts as SVG: tightening window, torque–angle, a
//!   friction test series, a friction entry's history (drawn by `chart`).
//! - `subscriptions` — webhook subscriptions: create (URL and event types
//!   checked, the signing secret shown once), read, list, delete, and each
//!   one's delivery log.
//! - `delivery` — webhook delivery: the [`delivery::Deliverer`] claims due
//!   deliveries, POSTs the signed CloudEvents JSON (Standard Webhooks
//!   headers), records every attempt and retries on the back-off schedule;
//!   its worker is started by `startup`.
//! - `mqtt` — each joint's active setpoints as a retained MQTT message
//!   (optional): the [`mqtt::Publisher`] reconciles the broker with the
//!   active releases (publish what changed, clear what was withdrawn);
//!   started by `startup` when a broker is configured.
//! - `tokens` — API tokens: create, list, revoke, find by secret.

pub mod catalogue;
pub mod charts;
pub mod context;
pub mod delivery;
pub mod error;
pub mod friction_tests;
pub mod impact;
pub mod joints;
pub mod joints_bulk;
pub mod mqtt;
pub mod quantity;
pub mod reading;
pub mod reference;
pub mod releases;
pub mod spec;
pub mod subscriptions;
pub mod tokens;

pub use context::App;
pub use error::{AppError, FieldProblem, ProblemClass};
