//! The checks `compute` runs first on what arrives already typed: thread
//! geometry (a custom thread can be anything a client sends), the strength
//! figures of the grade and the bearing diameters.

use crate::engine::bearing::BearingSurface;
use crate::engine::grade::Strength;
use crate::engine::quantity::positive;
use crate::engine::thread::ThreadGeometry;
use crate::engine::EngineError;

fn bad_thread(reason: &str) -> EngineError {
    EngineError::invalid("thread", reason.to_string())
}

/// Geometry must be positive, finite and ordered (d3 < d2 < d); custom
/// threads can be anything a client sends.
pub(super) fn validate_thread(t: &ThreadGeometry) -> Result<(), EngineError> {
    let (d, p, d2, d3) = (
        t.nominal_diameter.value,
        t.pitch.value,
        t.pitch_diameter.value,
        t.minor_diameter.value,
    );
    let all_positive = [d, p, d2, d3, t.stress_area.value]
        .iter()
        .all(|v| v.is_finite() && *v > 0.0);
    if !all_positive {
        return Err(bad_thread(
            "thread dimensions must be finite and greater than zero",
        ));
    }
    if !(d3 < d2 && d2 < d) {
        return Err(bad_thread(
            "thread diameters must satisfy minor < pitch < nominal",
        ));
    }
    if p > d2 {
        return Err(bad_thread("the pitch is larger than the pitch diameter"));
    }
    let beta = t.flank_angle.value.to_degrees();
    if !(beta.is_finite() && beta > 0.0 && beta < 120.0) {
        return Err(bad_thread("flank angle must be between 0° and 120°"));
    }
    Ok(())
}

pub(super) fn validate_strength(s: &Strength) -> Result<(), EngineError> {
    for v in [
        s.yield_strength_min.value,
        s.tensile_strength_min.value,
        s.proof_stress.value,
    ] {
        positive(v, "property_class")?;
    }
    Ok(())
}

pub(super) fn validate_bearing(b: &BearingSurface) -> Result<(), EngineError> {
    let outer = positive(b.outer_diameter.value, "bearing.outer_diameter")?;
    let inner = positive(b.inner_diameter.value, "bearing.inner_diameter")?;
    if outer <= inner {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            "the bearing outer diameter must exceed the inner (hole) diameter",
        ));
    }
    Ok(())
}

/// True for ISO 3506 austenitic grades (A1–A5, e.g. `A2-70`) and the
/// austenitic ASTM A193M grades B8 and B8M.
pub fn is_stainless_grade(id: &str) -> bool {
    let b = id.as_bytes();
    id.starts_with("astm-a193m-b8")
        || (b.len() >= 3
            && b[0].eq_ignore_ascii_case(&b'a')
            && (b'1'..=b'5').contains(&b[1])
            && b[2] == b'-')
}
