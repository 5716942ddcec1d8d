//! Friction ranges proposed from an evaluated series.
//!
//! Two bases, the user picks: the observed range (min to max of the
//! series) or mean ± 3σ (sample σ). Every specimen counts, outliers
//! included: they are flagged in the evaluation for the engineer to judge,
//! not silently dropped. Bounds are rounded outward to 0.001 and kept
//! inside [`PLAUSIBLE_FRICTION`] (common practice).

use super::statistics::CoefficientStatistics;
use super::{Coefficient, SeriesStatistics, PLAUSIBLE_FRICTION};
use crate::engine::EngineError;

/// How a proposed range is taken from the statistics.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Basis {
    /// From the smallest to the largest value measured.
    Observed,
    /// Mean ± 3 sample standard deviations.
    ThreeSigma,
}

impl Basis {
    pub fn as_str(self) -> &'static str {
        match self {
            Self::Observed => "observed",
            Self::ThreeSigma => "three_sigma",
        }
    }

    pub fn parse(s: &str) -> Result<Self, EngineError> {
        match s {
            "observed" => Ok(Self::Observed),
            "three_sigma" => Ok(Self::ThreeSigma),
            other => Err(EngineError::Unknown {
                field: "basis".into(),
                kind: "basis",
                given: other.into(),
                suggestions: vec!["observed".into(), "three_sigma".into()],
            }),
        }
    }
}

/// A proposed friction range for one coefficient.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ProposedRange {
    pub min: f64,
    pub max: f64,
    /// True when a bound was raised or lowered to stay plausible.
    pub clamped: bool,
}

/// Proposed ranges; `None` where the series does not give the coefficient
/// (shop form: no thread or bearing friction; thrust bearing: no bearing
/// or total friction) and the catalogue value should stay as it is.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Proposal {
    pub basis: Basis,
    pub thread_friction: Option<ProposedRange>,
    pub bearing_friction: Option<ProposedRange>,
    pub total_friction: Option<ProposedRange>,
}

/// Ranges from the statistics on the chosen basis. Mean ± 3σ needs at
/// least two values of a coefficient.
pub fn propose(stats: &SeriesStatistics, basis: Basis) -> Result<Proposal, EngineError> {
    let range = |c: Coefficient| -> Result<Option<ProposedRange>, EngineError> {
        stats.get(c).map(|s| range_of(s, basis, c)).transpose()
    };
    let proposal = Proposal {
        basis,
        thread_friction: range(Coefficient::ThreadFriction)?,
        bearing_friction: range(Coefficient::BearingFriction)?,
        total_friction: range(Coefficient::TotalFriction)?,
    };
    if proposal.thread_friction.is_none()
        && proposal.bearing_friction.is_none()
        && proposal.total_friction.is_none()
    {
        return Err(EngineError::invalid(
            "specimens",
            "the series gives no friction coefficient to propose",
        ));
    }
    Ok(proposal)
}

fn range_of(
    s: &CoefficientStatistics,
    basis: Basis,
    c: Coefficient,
) -> Result<ProposedRange, EngineError> {
    let (lo, hi) = match basis {
        Basis::Observed => (s.min, s.max),
        Basis::ThreeSigma => match (s.mean_minus_3_sigma, s.mean_plus_3_sigma) {
            (Some(lo), Some(hi)) => (lo, hi),
            _ => {
                return Err(EngineError::invalid(
                    "basis",
                    format!(
                        "mean ± 3σ of {} needs at least two values; the series has {}",
                        c.name(),
                        s.count
                    ),
                ))
            }
        },
    };
    // Outward rounding to 0.001 (common practice for catalogue values);
    // the 1e-9 keeps binary noise (0.14 → 140.000…03) from adding a step.
    let (lo, hi) = (
        (lo * 1000.0 + 1e-9).floor() / 1000.0,
        (hi * 1000.0 - 1e-9).ceil() / 1000.0,
    );
    let (min_ok, max_ok) = PLAUSIBLE_FRICTION;
    let (min, max) = (lo.clamp(min_ok, max_ok), hi.clamp(min_ok, max_ok));
    Ok(ProposedRange {
        min,
        max,
        clamped: min != lo || max != hi,
    })
}

#[cfg(test)]
mod tests {
    use super::super::statistics::describe;
    use super::*;

    fn stats(values: &[f64]) -> SeriesStatistics {
        let pairs: Vec<(usize, f64)> = values.iter().copied().enumerate().collect();
        SeriesStatistics {
            thread_friction: describe(&pairs),
            ..SeriesStatistics::default()
        }
    }

    #[test]
    fn observed_range_is_rounded_outward() {
        let p = propose(&stats(&[0.1234, 0.1411, 0.1302]), Basis::Observed).unwrap();
        let r = p.thread_friction.unwrap();
        assert_eq!((r.min, r.max, r.clamped), (0.123, 0.142, false));
        assert!(p.bearing_friction.is_none() && p.total_friction.is_none());
    }

    #[test]
    fn three_sigma_range_is_clamped_to_plausible_values() {
        // mean 0.05, sample σ 0.03 → 0.05 ± 0.09 → lower bound below 0.02.
        let p = propose(&stats(&[0.02, 0.05, 0.08]), Basis::ThreeSigma).unwrap();
        let r = p.thread_friction.unwrap();
        assert_eq!((r.min, r.max, r.clamped), (0.02, 0.14, true));
    }

    #[test]
    fn three_sigma_needs_two_values() {
        let err = propose(&stats(&[0.12]), Basis::ThreeSigma).unwrap_err();
        assert_eq!(err.field(), "basis");
        assert!(Basis::parse("sigma").is_err());
        assert_eq!(Basis::parse("three_sigma").unwrap(), Basis::ThreeSigma);
    }
}
