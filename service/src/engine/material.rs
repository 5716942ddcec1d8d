//! Clamped-part materials: elastic modulus and permissible surface pressure.

use uom::si::f64::Pressure;

/// A clamped-part (or nut / tapped-part) material.
#[derive(Debug, Clone, PartialEq)]
pub struct ClampedMaterial {
    /// Identifier as the API spells it, e.g. `steel-s235`.
    pub id: String,
    pub name: String,
    /// Modulus of elasticity E.
    pub elastic_modulus: Pressure,
    /// Limiting surface pressure p_G under head or nut, where tabulated.
    pub permissible_surface_pressure: Option<Pressure>,
    /// Minimum tensile strength, used for thread-stripping checks.
    pub tensile_strength_min: Option<Pressure>,
    /// Where the values come from.
    pub source: String,
}
