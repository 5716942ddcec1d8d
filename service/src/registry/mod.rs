//! The joint registry as domain types, with no database or network I/O:
//! a joint (the plant's definition of one tightening operation) and its
//! identifier, read from a JSON body field by field (`joint`); the
//! releases that freeze a joint's spec, their status and the transitions
//! between them (`release`); the CloudEvents a change publishes through the
//! outbox (`event`); and the registry's refusals, each naming its field
//! (`error`). The store persists these; the application layer computes the
//! spec a release freezes.

pub mod error;
pub mod event;
pub mod joint;
pub mod release;

pub use error::RegistryError;
pub use event::OutboxEvent;
pub use joint::{Joint, JointDefinition, JointId, Page, ReviewDue, Setpoints};
pub use release::{AcceptedCheck, NewRelease, Release, ReleaseEventKind, ReleaseStatus};
