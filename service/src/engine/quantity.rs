//! Validated numbers for the computations: friction ranges, utilisation,
//! tool scatter and positive finite quantities. Parse, don't validate: once a
//! value has one of these types, the formulas can trust it.

use super::EngineError;

/// Lowest friction coefficient the engine accepts (common practice: below
/// this no real lubricated steel joint has been reported; it is a typing error).
pub const FRICTION_PLAUSIBLE_MIN: f64 = 0.02;
/// Highest friction coefficient the engine accepts (common practice: dry,
/// galling stainless is about 0.5; above 0.6 the joint is seizing).
pub const FRICTION_PLAUSIBLE_MAX: f64 = 0.6;

/// A friction coefficient range [min, max], plausible and ordered.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FrictionRange {
    min: f64,
    max: f64,
}

impl FrictionRange {
    /// Validate a friction range. `field` is the request field, e.g.
    /// `thread_friction`; errors name `thread_friction.min` / `.max`.
    pub fn new(min: f64, max: f64, field: &str) -> Result<Self, EngineError> {
        let min = friction_value(min, field, "min")?;
        let max = friction_value(max, field, "max")?;
        if min > max {
            return Err(EngineError::invalid(
                format!("{field}.min"),
                format!("minimum friction {min} is above the maximum {max}"),
            ));
        }
        Ok(Self { min, max })
    }

    /// A single friction value (min = max).
    pub fn single(value: f64, field: &str) -> Result<Self, EngineError> {
        let v = friction_value(value, field, "min")?;
        Ok(Self { min: v, max: v })
    }

    pub fn min(&self) -> f64 {
        self.min
    }

    pub fn max(&self) -> f64 {
        self.max
    }

    /// True when `self` lies inside `other` (both ends).
    pub fn within(&self, other: &FrictionRange) -> bool {
        self.min >= other.min && self.max <= other.max
    }
}

fn friction_value(v: f64, field: &str, end: &str) -> Result<f64, EngineError> {
    if !v.is_finite() {
        return Err(EngineError::invalid(
            format!("{field}.{end}"),
            "friction coefficient must be a finite number",
        ));
    }
    if !(FRICTION_PLAUSIBLE_MIN..=FRICTION_PLAUSIBLE_MAX).contains(&v) {
        return Err(EngineError::invalid(
            format!("{field}.{end}"),
            format!(
                "friction coefficient {v} is outside the plausible range \
                 {FRICTION_PLAUSIBLE_MIN} to {FRICTION_PLAUSIBLE_MAX}"
            ),
        ));
    }
    Ok(v)
}

/// Utilisation ν of the minimum yield strength during tightening, in (0, 1].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Utilisation(f64);

impl Utilisation {
    /// VDI 2230 Part 1 default utilisation ν = 0.9 (the basis of its Table A1).
    pub const DEFAULT: Utilisation = Utilisation(0.9);

    pub fn new(v: f64, field: &str) -> Result<Self, EngineError> {
        if !v.is_finite() || v <= 0.0 || v > 1.0 {
            return Err(EngineError::invalid(
                field,
                format!("utilisation must be greater than 0 and at most 1, got {v}"),
            ));
        }
        Ok(Self(v))
    }

    pub fn value(&self) -> f64 {
        self.0
    }
}

/// Tool scatter ±s of the controlled quantity, in [0, 0.5).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Scatter(f64);

impl Scatter {
    pub fn new(v: f64, field: &str) -> Result<Self, EngineError> {
        if !v.is_finite() || !(0.0..0.5).contains(&v) {
            return Err(EngineError::invalid(
                field,
                format!("tool scatter must be at least 0 and below 0.5 (±50 %), got {v}"),
            ));
        }
        Ok(Self(v))
    }

    pub fn value(&self) -> f64 {
        self.0
    }
}

/// Refuse NaN, infinite, zero and negative values; returns the value.
pub fn positive(v: f64, field: &str) -> Result<f64, EngineError> {
    if !v.is_finite() {
        return Err(EngineError::invalid(field, "must be a finite number"));
    }
    if v <= 0.0 {
        return Err(EngineError::invalid(
            field,
            format!("must be greater than zero, got {v}"),
        ));
    }
    Ok(v)
}

/// Refuse NaN, infinite and negative values (zero allowed).
pub fn non_negative(v: f64, field: &str) -> Result<f64, EngineError> {
    if !v.is_finite() {
        return Err(EngineError::invalid(field, "must be a finite number"));
    }
    if v < 0.0 {
        return Err(EngineError::invalid(
            field,
            format!("must not be negative, got {v}"),
        ));
    }
    Ok(v)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn friction_range_refuses_bad_values_naming_the_field() {
        let e = FrictionRange::new(f64::NAN, 0.1, "thread_friction").unwrap_err();
        assert_eq!(e.field(), "thread_friction.min");
        let e = FrictionRange::new(0.1, f64::INFINITY, "bearing_friction").unwrap_err();
        assert_eq!(e.field(), "bearing_friction.max");
        let e = FrictionRange::new(0.0, 0.1, "thread_friction").unwrap_err();
        assert_eq!(e.field(), "thread_friction.min");
        let e = FrictionRange::new(-0.1, 0.1, "thread_friction").unwrap_err();
        assert_eq!(e.field(), "thread_friction.min");
        let e = FrictionRange::new(0.1, 0.7, "thread_friction").unwrap_err();
        assert_eq!(e.field(), "thread_friction.max");
        let e = FrictionRange::new(0.2, 0.1, "thread_friction").unwrap_err();
        assert_eq!(e.field(), "thread_friction.min");
        assert!(e.to_string().contains("above the maximum"));
        let ok = FrictionRange::new(0.1, 0.16, "thread_friction").unwrap();
        assert_eq!((ok.min(), ok.max()), (0.1, 0.16));
    }

    #[test]
    fn utilisation_and_scatter_bounds() {
        assert!(Utilisation::new(1.0, "utilisation").is_ok());
        for bad in [0.0, -0.5, 1.01, f64::NAN, f64::INFINITY] {
            assert_eq!(
                Utilisation::new(bad, "utilisation").unwrap_err().field(),
                "utilisation"
            );
        }
        assert!(Scatter::new(0.0, "scatter").is_ok());
        for bad in [0.5, -0.01, f64::NAN] {
            assert_eq!(Scatter::new(bad, "scatter").unwrap_err().field(), "scatter");
        }
        assert!(positive(0.0, "x").is_err());
        assert!(non_negative(0.0, "x").is_ok());
        assert!(non_negative(-1e-9, "x").is_err());
    }
}
