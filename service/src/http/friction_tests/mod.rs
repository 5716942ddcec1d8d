//! Friction calibration endpoints: evaluate a torque–tension test series
//! (ISO 16047 method) without storing it; store a series as evidence; propose
//! and apply the catalogue change it supports.
//!
//! Layout: `wire` (request and answer types), `units` (quantities in and
//! out), `parse` (wire → engine input), `respond` (engine → wire),
//! `proposal` (the catalogue change a stored series supports) and
//! `handlers` (the routes).

mod handlers;
pub mod parse;
pub mod proposal;
pub mod respond;
pub mod units;
pub mod wire;

use crate::engine::calibration::{evaluate_series, CalibrationErrors, SeriesEvaluation};
use crate::engine::EngineError;
use crate::http::error::{ApiError, FieldError};

pub use handlers::configure;
use parse::ParsedSeries;
use units::Units;
use wire::{EvaluationResponse, SeriesRequest};

/// Parse and evaluate a series. Every problem is listed, reading problems
/// and engineering problems together, in specimen order.
pub fn run(req: &SeriesRequest) -> Result<(ParsedSeries, SeriesEvaluation), CalibrationErrors> {
    let parsed = parse::parse(req)?;
    let mut problems = parsed.problems.clone();
    let result = if parsed.input.specimens.is_empty() && !problems.is_empty() {
        None
    } else {
        Some(evaluate_series(&parsed.input))
    };
    match result {
        Some(Ok(eval)) if problems.is_empty() => return Ok((parsed, eval)),
        Some(Err(e)) => {
            problems.extend(e.0.into_iter().map(|e| renumber(e, &parsed.original_index)))
        }
        _ => {}
    }
    problems.sort_by_key(|e| specimen_index(e.field()));
    Err(CalibrationErrors(problems))
}

/// Parse, evaluate and render a series: the whole of
/// `POST /v1/friction-tests/evaluate`, shared with the CLI.
pub fn evaluate(
    req: &SeriesRequest,
    units: Units,
) -> Result<EvaluationResponse, CalibrationErrors> {
    let (parsed, eval) = run(req)?;
    Ok(respond::evaluation(req, &parsed, &eval, units))
}

/// `specimens[k]…` → k; other fields sort first.
fn specimen_index(field: &str) -> Option<usize> {
    let rest = field.strip_prefix("specimens[")?;
    rest[..rest.find(']')?].parse().ok()
}

/// The engine numbers the specimens it was given; put back the posted index.
fn renumber(e: EngineError, original: &[usize]) -> EngineError {
    let fix = |field: String| match specimen_index(&field) {
        Some(k) => {
            let tail = &field[field.find(']').map_or(field.len(), |p| p + 1)..];
            format!("specimens[{}]{tail}", original.get(k).copied().unwrap_or(k))
        }
        None => field,
    };
    match e {
        EngineError::Malformed { field, reason } => EngineError::Malformed {
            field: fix(field),
            reason,
        },
        EngineError::Unknown {
            field,
            kind,
            given,
            suggestions,
        } => EngineError::Unknown {
            field: fix(field),
            kind,
            given,
            suggestions,
        },
        EngineError::Invalid {
            field,
            reason,
            suggestions,
        } => EngineError::Invalid {
            field: fix(field),
            reason,
            suggestions,
        },
    }
}

/// Every problem of a series in one answer: 400 when any is malformed, 404
/// when all are unknown names, else 422.
impl From<CalibrationErrors> for ApiError {
    fn from(e: CalibrationErrors) -> Self {
        let mut errors = e.0;
        if errors.len() == 1 {
            return errors.remove(0).into();
        }
        let malformed = errors
            .iter()
            .any(|e| matches!(e, EngineError::Malformed { .. }));
        let all_unknown = errors
            .iter()
            .all(|e| matches!(e, EngineError::Unknown { .. }));
        let fields: Vec<FieldError> = errors
            .into_iter()
            .map(|e| match e {
                EngineError::Malformed { field, reason } => FieldError::new(field, reason),
                EngineError::Unknown {
                    field,
                    kind,
                    given,
                    suggestions,
                } => FieldError::new(field, format!("unknown {kind} '{given}'"))
                    .with_suggestions(suggestions),
                EngineError::Invalid {
                    field,
                    reason,
                    suggestions,
                } => FieldError::new(field, reason).with_suggestions(suggestions),
            })
            .collect();
        let detail = format!(
            "{} problems in the series: {}",
            fields.len(),
            fields
                .iter()
                .map(|f| f.field.as_str())
                .collect::<Vec<_>>()
                .join(", ")
        );
        if malformed {
            ApiError::Malformed {
                detail,
                errors: fields,
            }
        } else if all_unknown {
            ApiError::NotFound {
                detail,
                errors: fields,
            }
        } else {
            ApiError::unprocessable(fields)
        }
    }
}
