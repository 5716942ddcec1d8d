//! Rounding a torque (or angle) window to a tool's resolution without ever
//! leaving the window: the lower limit rounds up, the upper limit rounds
//! down, the target rounds to the nearest step and is then clamped inside
//! the rounded limits.
//!
//! Steps are counted as integers (`k · resolution`) and each candidate is
//! re-checked after it has been rounded to the resolution's decimal places,
//! so binary floating point can never push a printed value outside the
//! window by a hair. The step count starts at the nearest whole step and is
//! corrected by at most [`CORRECTIONS`] steps, so the work is the same for
//! every input; a window more than [`MAX_STEPS`] steps from zero is refused
//! (beyond it `f64` no longer counts whole steps exactly).

/// Smallest resolution accepted (finer than any tool display).
pub const RESOLUTION_MIN: f64 = 1e-6;
/// Largest resolution accepted.
pub const RESOLUTION_MAX: f64 = 1000.0;

/// Most steps of the resolution a window limit may lie from zero (well
/// below 2^53, where `f64` stops holding every whole number).
pub const MAX_STEPS: f64 = 1e12;
/// Most corrections of the nearest step: rounding to the nearest step is
/// at most half a step off, and the decimal re-rounding at most one more.
const CORRECTIONS: usize = 3;

/// A window rounded to a resolution, limits inside the exact window.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RoundedWindow {
    pub lower: f64,
    pub target: f64,
    pub upper: f64,
}

/// Why a window could not be rounded.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum RoundingError {
    #[error(
        "resolution must be a finite number from {RESOLUTION_MIN} to {RESOLUTION_MAX}, got {0}"
    )]
    BadResolution(f64),
    #[error(
        "the window {lower}–{upper} holds no multiple of the resolution {resolution}; \
         use a finer tool resolution"
    )]
    NoStepInside {
        lower: f64,
        upper: f64,
        resolution: f64,
    },
    #[error("the window to round is not finite or its lower limit is above its upper limit")]
    BadWindow,
    #[error(
        "the window {lower}–{upper} lies more than {MAX_STEPS:e} steps of the resolution \
         {resolution} from zero; use a coarser resolution"
    )]
    TooManySteps {
        lower: f64,
        upper: f64,
        resolution: f64,
    },
}

/// Number of decimal places of `resolution` (0.1 → 1, 0.25 → 2, 5 → 0),
/// at most 9.
pub fn decimals(resolution: f64) -> u32 {
    let mut scale = 1.0_f64;
    for d in 0..=9 {
        let scaled = resolution * scale;
        if (scaled - scaled.round()).abs() < 1e-9 * scale.max(1.0) {
            return d;
        }
        scale *= 10.0;
    }
    9
}

/// `k · resolution` rounded to the resolution's decimal places.
fn step_value(k: f64, resolution: f64, decimals: u32) -> f64 {
    let scale = 10f64.powi(decimals as i32);
    (k * resolution * scale).round() / scale
}

/// Checks a resolution and returns it.
pub fn check_resolution(resolution: f64) -> Result<f64, RoundingError> {
    if resolution.is_finite() && (RESOLUTION_MIN..=RESOLUTION_MAX).contains(&resolution) {
        Ok(resolution)
    } else {
        Err(RoundingError::BadResolution(resolution))
    }
}

/// Rounds `lower ≤ target ≤ upper` to `resolution` so that the rounded
/// lower and upper lie inside `[lower, upper]` and the target lies between
/// them.
pub fn round_window(
    lower: f64,
    target: f64,
    upper: f64,
    resolution: f64,
) -> Result<RoundedWindow, RoundingError> {
    let resolution = check_resolution(resolution)?;
    if !(lower.is_finite() && target.is_finite() && upper.is_finite()) || lower > upper {
        return Err(RoundingError::BadWindow);
    }
    let d = decimals(resolution);
    let no_step = || RoundingError::NoStepInside {
        lower,
        upper,
        resolution,
    };

    if lower.abs() / resolution > MAX_STEPS || upper.abs() / resolution > MAX_STEPS {
        return Err(RoundingError::TooManySteps {
            lower,
            upper,
            resolution,
        });
    }

    let mut k_low = (lower / resolution).round();
    for _ in 0..CORRECTIONS {
        if step_value(k_low, resolution, d) < lower {
            k_low += 1.0;
        }
    }
    let mut k_up = (upper / resolution).round();
    for _ in 0..CORRECTIONS {
        if step_value(k_up, resolution, d) > upper {
            k_up -= 1.0;
        }
    }
    if step_value(k_low, resolution, d) < lower || step_value(k_up, resolution, d) > upper {
        // Not reachable for windows within MAX_STEPS; refused rather than
        // rounded outward if it ever were.
        return Err(RoundingError::BadWindow);
    }
    if k_low > k_up {
        return Err(no_step());
    }
    let k_target = (target / resolution).round().clamp(k_low, k_up);
    Ok(RoundedWindow {
        lower: step_value(k_low, resolution, d),
        target: step_value(k_target, resolution, d),
        upper: step_value(k_up, resolution, d),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    #[test]
    fn rounds_inward() {
        let w = round_window(40.04, 45.56, 51.06, 0.1).unwrap();
        assert_eq!(w.lower, 40.1);
        assert_eq!(w.target, 45.6);
        assert_eq!(w.upper, 51.0);
    }

    #[test]
    fn exact_steps_stay() {
        let w = round_window(12.3, 12.5, 12.7, 0.1).unwrap();
        assert_eq!((w.lower, w.target, w.upper), (12.3, 12.5, 12.7));
    }

    #[test]
    fn coarse_resolution() {
        let w = round_window(41.0, 46.2, 49.0, 5.0).unwrap();
        assert_eq!((w.lower, w.target, w.upper), (45.0, 45.0, 45.0));
        assert!(matches!(
            round_window(41.0, 42.0, 44.0, 5.0),
            Err(RoundingError::NoStepInside { .. })
        ));
    }

    #[test]
    fn target_clamped_inside() {
        // Target nearer a step outside the rounded window.
        let w = round_window(10.01, 10.02, 10.19, 0.1).unwrap();
        assert_eq!((w.lower, w.target, w.upper), (10.1, 10.1, 10.1));
    }

    #[test]
    fn decimals_of_resolutions() {
        assert_eq!(decimals(0.1), 1);
        assert_eq!(decimals(0.25), 2);
        assert_eq!(decimals(5.0), 0);
        assert_eq!(decimals(0.001), 3);
    }

    #[test]
    fn bad_resolution_refused() {
        for r in [0.0, -0.1, f64::NAN, f64::INFINITY, 1e-9, 1e6] {
            assert!(matches!(
                round_window(1.0, 2.0, 3.0, r),
                Err(RoundingError::BadResolution(_))
            ));
        }
    }

    #[test]
    fn huge_windows_are_refused_at_once() {
        // A window far beyond any tool: answered with an error, never a
        // loop that stops counting (above 2^53 `k - 1 == k`) or a step
        // that overflows to infinity.
        for (lo, hi) in [(3e16, 3.1e16), (1e300, 1e305), (1e308, f64::MAX)] {
            for res in [RESOLUTION_MIN, 0.1, RESOLUTION_MAX] {
                assert!(
                    matches!(
                        round_window(lo, lo, hi, res),
                        Err(RoundingError::TooManySteps { .. })
                    ),
                    "{lo} {hi} {res}"
                );
            }
        }
    }

    #[test]
    fn the_largest_accepted_window_still_rounds_inward() {
        let (lo, hi) = (MAX_STEPS * 0.1 * 0.5, MAX_STEPS * 0.1);
        let w = round_window(lo + 0.03, lo + 1.0, hi - 0.03, 0.1).unwrap();
        assert!(w.lower >= lo + 0.03 && w.upper <= hi - 0.03, "{w:?}");
    }

    proptest! {
        #[test]
        fn never_leaves_the_window(
            lower in 0.01f64..5000.0,
            width in 0.0f64..2.0,
            t in 0.0f64..=1.0,
            res_idx in 0usize..8,
        ) {
            let resolutions = [0.001, 0.01, 0.05, 0.1, 0.2, 0.25, 0.5, 1.0];
            let res = resolutions[res_idx];
            let upper = lower * (1.0 + width);
            let target = lower + (upper - lower) * t;
            match round_window(lower, target, upper, res) {
                Ok(w) => {
                    prop_assert!(w.lower >= lower, "{w:?} vs {lower}");
                    prop_assert!(w.upper <= upper, "{w:?} vs {upper}");
                    prop_assert!(w.lower <= w.target && w.target <= w.upper, "{w:?}");
                    prop_assert!(w.lower - lower < res + 1e-9);
                    prop_assert!(upper - w.upper < res + 1e-9);
                }
                Err(RoundingError::NoStepInside { .. }) => prop_assert!(upper - lower < res),
                Err(e) => prop_assert!(false, "unexpected {e}"),
            }
        }
    }
}
