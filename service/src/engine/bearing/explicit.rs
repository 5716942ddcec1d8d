//! A bearing surface from diameters the user gives.

use uom::si::f64::Length;
use uom::si::length::millimeter;

use super::super::EngineError;
use super::BearingSurface;

/// A bearing surface from diameters the user gives.
pub fn explicit_bearing(outer: Length, inner: Length) -> Result<BearingSurface, EngineError> {
    let o = outer.get::<millimeter>();
    let i = inner.get::<millimeter>();
    if !o.is_finite() || o <= 0.0 {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            "outer bearing diameter must be a positive, finite length",
        ));
    }
    if !i.is_finite() || i <= 0.0 {
        return Err(EngineError::invalid(
            "bearing.inner_diameter",
            "inner bearing diameter must be a positive, finite length",
        ));
    }
    if o <= i {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            format!("outer bearing diameter {o} mm must exceed the inner diameter {i} mm"),
        ));
    }
    Ok(BearingSurface {
        outer_diameter: outer,
        inner_diameter: inner,
        source: "given".into(),
        conical_seat: false,
    })
}
