//! Strength grades of fasteners: ISO 898-1, ISO 3506-1, SAE J429, ASTM A574.

use uom::si::f64::Pressure;

/// Which minimum yield value a grade's standard specifies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum YieldBasis {
    /// Lower yield strength ReL.
    LowerYield,
    /// 0.2 % proof strength Rp0.2.
    ProofStrength02,
    /// Stress at 0.0048·d non-proportional elongation, full-size fastener Rpf.
    FullSizeRpf,
    /// Yield strength as the inch standards state it.
    InchYield,
}

/// The strengths of one grade at one size.
#[derive(Debug, Clone, PartialEq)]
pub struct Strength {
    /// Grade identifier as the API spells it, e.g. `8.8`, `A2-70`, `sae-j429-5`.
    pub id: String,
    /// Standard the values come from, e.g. `ISO 898-1:2013 Table 3`.
    pub standard: String,
    /// Minimum tensile strength Rm,min.
    pub tensile_strength_min: Pressure,
    /// Minimum yield strength used for preload (ReL, Rp0.2, Rpf...).
    pub yield_strength_min: Pressure,
    pub yield_basis: YieldBasis,
    /// Proof stress Sp (proof load = Sp·As).
    pub proof_stress: Pressure,
}
