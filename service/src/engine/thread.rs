//! Thread forms, designations and basic geometry.

use uom::si::f64::{Angle, Area, Length};

/// The thread form: profile standard and its flank angle.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ThreadForm {
    /// ISO metric, basic profile ISO 68-1, 60° included flank angle.
    IsoMetric,
    /// Unified inch, ASME B1.1, 60° included flank angle.
    Unified,
}

/// Which tabulated series a thread belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ThreadSeries {
    /// ISO 261 coarse pitch.
    Coarse,
    /// ISO 261 fine pitch.
    Fine,
    /// ASME B1.1 Unified coarse.
    Unc,
    /// ASME B1.1 Unified fine.
    Unf,
    /// ASME B1.1 8-thread series (8-UN), 1 in and larger.
    Un8,
    /// Diameter and pitch given explicitly; not a tabulated size.
    Custom,
}

/// Basic geometry of one thread, with everything the torque formulas need.
#[derive(Debug, Clone, PartialEq)]
pub struct ThreadGeometry {
    /// Normalised designation, e.g. `M10x1.25`, `M10`, `1/2-13 UNC`.
    pub designation: String,
    pub form: ThreadForm,
    pub series: ThreadSeries,
    /// Nominal (major) diameter d.
    pub nominal_diameter: Length,
    /// Pitch P (for inch threads 1/n).
    pub pitch: Length,
    /// Included flank angle (60° for ISO metric and Unified).
    pub flank_angle: Angle,
    /// Pitch diameter d2.
    pub pitch_diameter: Length,
    /// Minor diameter of the external thread d3.
    pub minor_diameter: Length,
    /// Tensile stress area As.
    pub stress_area: Area,
    /// True when d and P were given explicitly rather than taken from a table.
    pub custom: bool,
}
