//! Friction-test use cases: evaluate a torque–tension test series (ISO 16047
//! method) without storing it, keep a series as evidence, propose and apply
//! the catalogue change it supports.
//!
//! Layout: `wire` (the series as posted and its evaluation as answered; both
//! adapters use them), `units` (a quantity read as an invalid field, torque
//! in lbf·in for US units), `parse` (wire → engine input), `view` (engine →
//! wire), `proposal` (the catalogue change a series supports) and `series`
//! (the use cases over the store: record, read, propose with the impact on
//! the released joints, apply). [`evaluate`] here runs the parse
//! and engine steps both adapters share.

pub mod csv_series;
pub mod parse;
pub mod proposal;
pub mod series;
pub mod units;
pub mod view;
pub mod wire;

use super::{AppError, FieldProblem};
use crate::app::quantity::Units;
use crate::engine::calibration::{evaluate_series, SeriesEvaluation};

use parse::ParsedSeries;
pub use proposal::ProposalResponse;
pub use series::{ApplyResponse, PendingApply, StoredSeriesResponse};
use wire::{EvaluationResponse, SeriesRequest};

/// Parse and evaluate a series. Every problem is listed, reading problems
/// and engineering problems together, in specimen order.
pub fn run(req: &SeriesRequest) -> Result<(ParsedSeries, SeriesEvaluation), AppError> {
    let parsed = parse::parse(req)?;
    let mut problems = parsed.problems.clone();
    let result = if parsed.input.specimens.is_empty() && !problems.is_empty() {
        None
    } else {
        Some(evaluate_series(&parsed.input))
    };
    match result {
        Some(Ok(eval)) if problems.is_empty() => return Ok((parsed, eval)),
        Some(Err(e)) => problems.extend(
            e.0.into_iter()
                .map(|e| renumber(FieldProblem::from(e), &parsed.original_index)),
        ),
        _ => {}
    }
    problems.sort_by_key(|p| specimen_index(&p.field));
    Err(AppError::Fields(problems))
}

/// Parse, evaluate and render a series: the whole of
/// `POST /v1/friction-tests/evaluate` but the catalogue name check, and
/// `tightspec friction evaluate`.
pub fn evaluate(req: &SeriesRequest, units: Units) -> Result<EvaluationResponse, AppError> {
    let (parsed, eval) = run(req)?;
    Ok(view::evaluation(req, &parsed, &eval, units))
}

/// `specimens[k]…` → k; other fields sort first.
fn specimen_index(field: &str) -> Option<usize> {
    let rest = field.strip_prefix("specimens[")?;
    rest[..rest.find(']')?].parse().ok()
}

/// The engine numbers the specimens it was given; put back the posted index.
fn renumber(mut p: FieldProblem, original: &[usize]) -> FieldProblem {
    if let Some(k) = specimen_index(&p.field) {
        let tail = &p.field[p.field.find(']').map_or(p.field.len(), |i| i + 1)..];
        p.field = format!("specimens[{}]{tail}", original.get(k).copied().unwrap_or(k));
    }
    p
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn engine_specimen_numbers_become_posted_ones() {
        let p = renumber(
            FieldProblem::invalid("specimens[1].total_torque", "negative"),
            &[0, 3, 4],
        );
        assert_eq!(p.field, "specimens[3].total_torque");
        let p = renumber(FieldProblem::invalid("specimens", "empty"), &[2]);
        assert_eq!(p.field, "specimens");
        assert_eq!(specimen_index("specimens[12].curve[0]"), Some(12));
    }
}
