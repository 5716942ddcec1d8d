//! Bearing geometry under head or nut, and clearance holes.

use uom::si::f64::Length;

/// The annular surface a head or nut turns on.
#[derive(Debug, Clone, PartialEq)]
pub struct BearingSurface {
    /// Outer bearing diameter d_w.
    pub outer_diameter: Length,
    /// Inner bearing diameter: the clearance hole d_h.
    pub inner_diameter: Length,
    /// Where the diameters came from (standard and table, or "given").
    pub source: String,
}

impl BearingSurface {
    /// Mean bearing-friction diameter D_Km = (d_w + d_h)/2 (VDI 2230 Part 1).
    pub fn mean_diameter(&self) -> Length {
        (self.outer_diameter + self.inner_diameter) / 2.0
    }
}
