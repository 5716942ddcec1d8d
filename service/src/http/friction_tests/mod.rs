//! Friction calibration endpoints: evaluate a torque–tension test series
//! (ISO 16047 method) without storing it; store a series as evidence; propose
//! and apply the catalogue change it supports.
//!
//! Layout: `wire` (request and answer types), `units` (quantities in and
//! out), `parse` (wire → engine input), `respond` (engine → wire).

pub mod parse;
pub mod proposal;
pub mod respond;
pub mod units;
pub mod wire;

use crate::engine::calibration::{evaluate_series, CalibrationErrors};
use units::UnitSystem;
use wire::{EvaluationResponse, SeriesRequest};

/// Parse, evaluate and render a series: the whole of
/// `POST /v1/friction-tests/evaluate`, shared with the CLI.
pub fn evaluate(
    req: &SeriesRequest,
    units: UnitSystem,
) -> Result<EvaluationResponse, CalibrationErrors> {
    let parsed = parse::parse(req)?;
    let eval = evaluate_series(&parsed.input)?;
    Ok(respond::evaluation(req, &parsed, &eval, units))
}
