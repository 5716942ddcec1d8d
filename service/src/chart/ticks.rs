//! Round tick steps and the numbers printed at them.
//!
//! Steps are 1, 2 or 5 times a power of ten (common practice for chart
//! axes), chosen so that an axis has about five to eight ticks.

/// Most ticks an axis gets (a bound on every tick loop).
const MAX_TICKS: usize = 40;

/// A round step for `span` split in about six parts.
fn step_for(span: f64) -> f64 {
    let raw = span / 6.0;
    let magnitude = 10f64.powf(raw.log10().floor());
    let norm = raw / magnitude;
    let factor = if norm <= 1.0 {
        1.0
    } else if norm <= 2.0 {
        2.0
    } else if norm <= 5.0 {
        5.0
    } else {
        10.0
    };
    factor * magnitude
}

/// The domain `[min, max]` widened to whole steps, and the step. A zero or
/// non-finite span gets a span of its own (a tenth of the value, or 1).
pub fn nice_range(lo: f64, hi: f64) -> (f64, f64, f64) {
    let (lo, hi) = if lo.is_finite() && hi.is_finite() {
        (lo.min(hi), lo.max(hi))
    } else {
        (0.0, 1.0)
    };
    let (lo, hi) = if hi - lo > f64::EPSILON * hi.abs().max(1.0) {
        (lo, hi)
    } else {
        let pad = (lo.abs() * 0.1)
            .max(1e-9)
            .max(if lo == 0.0 { 1.0 } else { 0.0 });
        (lo - pad, hi + pad)
    };
    let step = step_for(hi - lo);
    // A value a rounding error off a whole step stays on it (0.14/0.02).
    let min = (lo / step + 1e-9).floor() * step;
    let max = (hi / step - 1e-9).ceil() * step;
    (min, max, step)
}

/// The ticks of a domain at its round step (at most [`MAX_TICKS`]).
pub fn ticks(min: f64, max: f64) -> (Vec<f64>, f64) {
    let (_, _, step) = nice_range(min, max);
    let first = (min / step - 1e-9).ceil();
    let mut out = Vec::new();
    for i in 0..MAX_TICKS {
        let v = (first + i as f64) * step;
        if v > max + step * 1e-9 {
            break;
        }
        // -0 prints as "-0"; a tick at zero is 0.
        out.push(if v.abs() < step * 1e-9 { 0.0 } else { v });
    }
    (out, step)
}

/// `v` printed with as many decimals as `step` needs (0.05 → two).
pub fn format_number(v: f64, step: f64) -> String {
    if !v.is_finite() {
        return "–".into();
    }
    let decimals = if step > 0.0 && step.is_finite() {
        (-(step.log10().floor())).clamp(0.0, 6.0) as usize
    } else {
        2
    };
    let text = format!("{v:.decimals$}");
    if text.starts_with('-') && text[1..].chars().all(|c| c == '0' || c == '.') {
        text[1..].to_string()
    } else {
        text
    }
}
