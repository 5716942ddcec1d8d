//! Series statistics per coefficient, and the outlier rule.

use super::{Coefficient, SpecimenResult};

/// How the standard deviation is computed.
pub const STD_DEV_RULE: &str =
    "sample standard deviation (divisor n − 1); not given for fewer than 2 values";

/// The outlier rule, stated as it is applied.
pub const OUTLIER_RULE: &str = "modified z-score |0.6745·(x − median)/MAD| > 3.5 (Iglewicz and \
     Hoaglin 1993, recalled from memory); when the MAD is zero, (x − median)/(1.2533·mean \
     absolute deviation) > 3.5 is used instead; applied to 3 or more values";

/// Threshold of the modified z-score (Iglewicz and Hoaglin, "How to Detect
/// and Handle Outliers", ASQC 1993; recalled from memory).
pub const OUTLIER_THRESHOLD: f64 = 3.5;
/// 0.6745 = Φ⁻¹(0.75): scales the MAD to σ for normal data (recalled from memory).
const MAD_SCALE: f64 = 0.6745;
/// √(π/2): scales the mean absolute deviation to σ for normal data
/// (recalled from memory).
const MEAN_AD_SCALE: f64 = 1.253_314;
/// Smallest number of values the outlier rule is applied to (common practice).
const OUTLIER_MIN_COUNT: usize = 3;

/// Spread of one coefficient over the specimens that give it.
#[derive(Debug, Clone, PartialEq)]
pub struct CoefficientStatistics {
    pub count: usize,
    pub mean: f64,
    /// Sample standard deviation (n − 1); `None` for a single value.
    pub std_dev: Option<f64>,
    pub min: f64,
    pub max: f64,
    pub mean_minus_3_sigma: Option<f64>,
    pub mean_plus_3_sigma: Option<f64>,
    /// Indexes (in the series) of the specimens flagged by [`OUTLIER_RULE`].
    pub outliers: Vec<usize>,
}

/// Statistics of every coefficient; `None` where no specimen gives it.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct SeriesStatistics {
    pub thread_friction: Option<CoefficientStatistics>,
    pub bearing_friction: Option<CoefficientStatistics>,
    pub total_friction: Option<CoefficientStatistics>,
    pub nut_factor: Option<CoefficientStatistics>,
    pub efficiency: Option<CoefficientStatistics>,
}

impl SeriesStatistics {
    pub fn get(&self, c: Coefficient) -> Option<&CoefficientStatistics> {
        match c {
            Coefficient::ThreadFriction => self.thread_friction.as_ref(),
            Coefficient::BearingFriction => self.bearing_friction.as_ref(),
            Coefficient::TotalFriction => self.total_friction.as_ref(),
            Coefficient::NutFactor => self.nut_factor.as_ref(),
            Coefficient::Efficiency => self.efficiency.as_ref(),
        }
    }

    fn slot(&mut self, c: Coefficient) -> &mut Option<CoefficientStatistics> {
        match c {
            Coefficient::ThreadFriction => &mut self.thread_friction,
            Coefficient::BearingFriction => &mut self.bearing_friction,
            Coefficient::TotalFriction => &mut self.total_friction,
            Coefficient::NutFactor => &mut self.nut_factor,
            Coefficient::Efficiency => &mut self.efficiency,
        }
    }
}

/// Statistics for every coefficient; marks outliers on the specimens.
pub(super) fn summarise(specimens: &mut [SpecimenResult]) -> SeriesStatistics {
    let mut stats = SeriesStatistics::default();
    for c in Coefficient::ALL {
        let values: Vec<(usize, f64)> = specimens
            .iter()
            .enumerate()
            .filter_map(|(i, s)| s.coefficient(c).map(|v| (i, v)))
            .collect();
        let Some(summary) = describe(&values) else {
            continue;
        };
        for &i in &summary.outliers {
            if let Some(s) = specimens.get_mut(i) {
                s.outlier_in.push(c);
            }
        }
        *stats.slot(c) = Some(summary);
    }
    stats
}

/// Count, mean, sample standard deviation, extremes, mean ± 3σ and
/// outliers of `(index, value)` pairs; `None` when empty.
pub fn describe(values: &[(usize, f64)]) -> Option<CoefficientStatistics> {
    let n = values.len();
    if n == 0 {
        return None;
    }
    let mean = values.iter().map(|(_, v)| v).sum::<f64>() / n as f64;
    let std_dev = (n >= 2).then(|| {
        let ss: f64 = values.iter().map(|(_, v)| (v - mean).powi(2)).sum();
        (ss / (n - 1) as f64).sqrt()
    });
    let min = values.iter().map(|(_, v)| *v).fold(f64::INFINITY, f64::min);
    let max = values
        .iter()
        .map(|(_, v)| *v)
        .fold(f64::NEG_INFINITY, f64::max);
    Some(CoefficientStatistics {
        count: n,
        mean,
        std_dev,
        min,
        max,
        mean_minus_3_sigma: std_dev.map(|s| mean - 3.0 * s),
        mean_plus_3_sigma: std_dev.map(|s| mean + 3.0 * s),
        outliers: outliers(values),
    })
}

fn median(sorted: &[f64]) -> f64 {
    let n = sorted.len();
    if n % 2 == 1 {
        sorted[n / 2]
    } else {
        (sorted[n / 2 - 1] + sorted[n / 2]) / 2.0
    }
}

fn outliers(values: &[(usize, f64)]) -> Vec<usize> {
    if values.len() < OUTLIER_MIN_COUNT {
        return Vec::new();
    }
    let mut sorted: Vec<f64> = values.iter().map(|(_, v)| *v).collect();
    sorted.sort_by(f64::total_cmp);
    let med = median(&sorted);
    let mut deviations: Vec<f64> = sorted.iter().map(|v| (v - med).abs()).collect();
    deviations.sort_by(f64::total_cmp);
    let mad = median(&deviations);
    // Spreads below this are rounding noise, not scatter.
    let negligible = 1e-9 * med.abs().max(f64::MIN_POSITIVE);
    let scale = if mad > negligible {
        mad / MAD_SCALE
    } else {
        let mean_ad = deviations.iter().sum::<f64>() / deviations.len() as f64;
        if mean_ad <= negligible {
            return Vec::new();
        }
        MEAN_AD_SCALE * mean_ad
    };
    values
        .iter()
        .filter(|(_, v)| ((v - med) / scale).abs() > OUTLIER_THRESHOLD)
        .map(|(i, _)| *i)
        .collect()
}
