//! The warnings a series evaluation carries: too few specimens, outliers
//! flagged by the outlier rule, and coefficients outside the plausible range.

use super::{
    Coefficient, SeriesStatistics, SpecimenResult, Warning, MINIMUM_SERIES_SIZE, OUTLIER_RULE,
    PLAUSIBLE_FRICTION,
};

pub(super) fn series_warnings(
    specimens: &[SpecimenResult],
    stats: &SeriesStatistics,
) -> Vec<Warning> {
    let mut warnings = Vec::new();
    if specimens.len() < MINIMUM_SERIES_SIZE {
        warnings.push(Warning {
            code: "series_too_small",
            message: format!(
                "{} specimen(s): at least {MINIMUM_SERIES_SIZE} are needed before the spread \
                 supports a catalogue friction range (common practice for torque–tension \
                 series); with fewer, mean ± 3σ is a poor estimate of the real scatter",
                specimens.len()
            ),
        });
    }
    for c in Coefficient::ALL {
        if let Some(s) = stats.get(c) {
            if !s.outliers.is_empty() {
                let list: Vec<String> = s
                    .outliers
                    .iter()
                    .map(|i| format!("specimens[{i}]"))
                    .collect();
                warnings.push(Warning {
                    code: "outliers_flagged",
                    message: format!(
                        "{}: {} flagged by {OUTLIER_RULE}; check the rig record before using \
                         the series",
                        c.name(),
                        list.join(", ")
                    ),
                });
            }
        }
    }
    let (lo, hi) = PLAUSIBLE_FRICTION;
    for c in [
        Coefficient::ThreadFriction,
        Coefficient::BearingFriction,
        Coefficient::TotalFriction,
    ] {
        if let Some(s) = stats.get(c) {
            if s.min < lo || s.max > hi {
                warnings.push(Warning {
                    code: "implausible_friction",
                    message: format!(
                        "{} ranges {:.3}–{:.3}, outside the plausible {lo}–{hi}: check units, \
                         pitch and bearing diameters",
                        c.name(),
                        s.min,
                        s.max
                    ),
                });
            }
        }
    }
    warnings
}
