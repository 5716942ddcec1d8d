//! The tightening engine: pure computation, no I/O, no async.
//!
//! Read it top to bottom: `thread` (geometry and designations), `grade`
//! (strength of the fastener), `nut` (nut classes ISO 898-2, SAE J995,
//! ASTM A563), `bearing` (what the head or nut sits on),
//! `material` (clamped parts), `tightening` (VDI 2230 preload and torque),
//! `method` (tightening methods and their scatter), `window` (torque
//! window from friction and tool scatter), `angle` (joint resilience and
//! torque-angle), `joint` (bolt geometry and the VDI 2230 joint model
//! beyond the window), `checks` (verdicts on a window), `cautions` (the
//! cautions an answer carries), `plausible` (input ranges and plausibility warnings), and `spec`,
//! which puts them together. Beside them: `quantity` (validated numbers the
//! formulas trust), `error` (typed errors naming the request field) and
//! `calibration` (friction coefficients from a torque–tension test series).

pub mod angle;
pub mod bearing;
pub mod calibration;
pub mod cautions;
pub mod checks;
pub mod error;
pub mod grade;
pub mod joint;
pub mod material;
pub mod method;
pub mod nut;
pub mod plausible;
pub mod quantity;
pub mod spec;
pub mod thread;
pub mod tightening;
pub mod window;

pub use error::EngineError;

/// The version of the engine's method: the VDI 2230 Part 1:2015 model as
/// this engine implements it, with its tables and rules. Raised by one
/// whenever a change to the engine can change a computed answer for the
/// same request and catalogue; every spec and setpoint answer carries it
/// and its `spec_hash` covers it, so an answer computed by another method
/// version never shares a hash with this one.
pub const METHOD_VERSION: &str = "1";
