//! Thread forms, designations and basic geometry.
//!
//! Public surface:
//! - [`parse_designation`] reads what people type (`M10`, `M10x1.25`,
//!   `m10 x 1,25`, `1/2-13 UNC`, `#10-24`, `0.500-13 UNC`, `3/4-10 UNC-2A`,
//!   `1-1/4-7 UNC`, `1-8 UN`) into a tabulated [`ThreadGeometry`];
//! - [`custom_thread`] builds geometry from an explicit d and P (flagged custom);
//! - [`standard_threads`] lists every tabulated thread.
//!
//! Geometry formulas:
//! - ISO metric (ISO 68-1 basic profile, ISO 724): d2 = d − 0.649519·P,
//!   d3 = d − 1.226869·P, As = π/4·((d2 + d3)/2)² (the ISO 898-1 nominal
//!   stress area).
//! - Unified (ASME B1.1): d2 = D − 0.649519·P; As = 0.7854·(D − 0.9743/n)²
//!   (ASME B1.1 / Handbook H-28 tensile stress area); the external minor
//!   diameter d3 is the UNR rounded-root minor D − 1.190619·P (ASME B1.1,
//!   constant recalled from memory), used for resilience and thread areas only.

mod parse;
mod table;
#[cfg(test)]
mod tests;

pub use parse::parse_designation;

use std::f64::consts::PI;

use uom::si::angle::degree;
use uom::si::f64::{Angle, Area, Length};
use uom::si::length::{inch, millimeter};

use super::EngineError;
use table::{METRIC, UNIFIED};

/// The thread form: profile standard and its flank angle.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ThreadForm {
    /// ISO metric, basic profile ISO 68-1, 60° included flank angle.
    IsoMetric,
    /// Unified inch, ASME B1.1, 60° included flank angle.
    Unified,
}

impl ThreadForm {
    /// Included flank angle of the form in degrees (ISO 68-1; ASME B1.1).
    pub fn included_flank_angle_degrees(self) -> f64 {
        match self {
            Self::IsoMetric | Self::Unified => 60.0,
        }
    }
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

impl ThreadGeometry {
    /// Half the included flank angle (30° for 60° threads).
    pub fn half_flank_angle(&self) -> Angle {
        self.flank_angle / 2.0
    }

    /// Area at the minor diameter, A_d3 = π/4·d3².
    pub fn minor_diameter_area(&self) -> Area {
        self.minor_diameter * self.minor_diameter * (PI / 4.0)
    }

    /// Nominal cross-section, A_N = π/4·d².
    pub fn nominal_area(&self) -> Area {
        self.nominal_diameter * self.nominal_diameter * (PI / 4.0)
    }

    /// Nominal diameter in millimetres (handy for table look-ups).
    pub fn nominal_diameter_mm(&self) -> f64 {
        self.nominal_diameter.get::<millimeter>()
    }

    /// True for Unified inch threads.
    pub fn is_inch(&self) -> bool {
        self.form == ThreadForm::Unified
    }
}

/// Metric geometry from d and P in mm (ISO 68-1 / ISO 724 / ISO 898-1).
pub(crate) fn metric_geometry(
    designation: String,
    series: ThreadSeries,
    d: f64,
    p: f64,
) -> ThreadGeometry {
    let d2 = d - 0.649519 * p;
    let d3 = d - 1.226869 * p;
    let ds = (d2 + d3) / 2.0;
    let mm = Length::new::<millimeter>;
    ThreadGeometry {
        designation,
        form: ThreadForm::IsoMetric,
        series,
        nominal_diameter: mm(d),
        pitch: mm(p),
        flank_angle: Angle::new::<degree>(60.0),
        pitch_diameter: mm(d2),
        minor_diameter: mm(d3),
        stress_area: mm(ds) * mm(ds) * (PI / 4.0),
        custom: series == ThreadSeries::Custom,
    }
}

/// Unified geometry from D in inches and n threads per inch (ASME B1.1).
pub(crate) fn unified_geometry(
    designation: String,
    series: ThreadSeries,
    d: f64,
    tpi: f64,
) -> ThreadGeometry {
    let p = 1.0 / tpi;
    let d2 = d - 0.649519 * p;
    let d3 = d - 1.190619 * p;
    let ds = d - 0.9743 / tpi;
    let len = Length::new::<inch>;
    ThreadGeometry {
        designation,
        form: ThreadForm::Unified,
        series,
        nominal_diameter: len(d),
        pitch: len(p),
        flank_angle: Angle::new::<degree>(60.0),
        pitch_diameter: len(d2),
        minor_diameter: len(d3),
        // 0.7854 is ASME B1.1's rounded π/4; the full π/4 is used here.
        stress_area: len(ds) * len(ds) * (PI / 4.0),
        custom: series == ThreadSeries::Custom,
    }
}

pub(crate) fn metric_designation(size: &table::MetricSize, fine: Option<&str>) -> String {
    let mut s = String::with_capacity(12);
    s.push('M');
    s.push_str(size.d_text);
    if let Some(p) = fine {
        s.push('x');
        s.push_str(p);
    }
    s
}

pub(crate) fn unified_designation(size: &table::UnifiedSize, tpi: u32, series: &str) -> String {
    let mut s = String::with_capacity(16);
    s.push_str(size.name);
    s.push('-');
    // Threads per inch are at most two or three digits; no formatter needed.
    let mut digits = [0u8; 10];
    let mut n = tpi;
    let mut len = 0;
    loop {
        digits[len] = b'0' + (n % 10) as u8;
        len += 1;
        n /= 10;
        if n == 0 {
            break;
        }
    }
    for d in digits[..len].iter().rev() {
        s.push(char::from(*d));
    }
    s.push(' ');
    s.push_str(series);
    s
}

/// Geometry from an explicit nominal diameter and pitch (series `Custom`).
///
/// Refuses non-finite or non-positive values, d outside 0.5–2000 mm,
/// pitches below 0.05 mm, and pitches above d/4 (no
/// general-purpose 60° thread is that coarse; the coarsest tabulated ratio
/// is about 0.22, M1.6x0.35).
pub fn custom_thread(
    form: ThreadForm,
    nominal_diameter: Length,
    pitch: Length,
) -> Result<ThreadGeometry, EngineError> {
    let d = nominal_diameter.get::<millimeter>();
    let p = pitch.get::<millimeter>();
    if !d.is_finite() || d <= 0.0 {
        return Err(EngineError::invalid(
            "thread.nominal_diameter",
            "nominal diameter must be a positive, finite length",
        ));
    }
    if !(0.5..=2000.0).contains(&d) {
        return Err(EngineError::invalid(
            "thread.nominal_diameter",
            "nominal diameter outside 0.5 mm to 2000 mm is outside what this service computes",
        ));
    }
    if !p.is_finite() || p <= 0.0 {
        return Err(EngineError::invalid(
            "thread.pitch",
            "pitch must be a positive, finite length",
        ));
    }
    if p < 0.05 {
        return Err(EngineError::invalid(
            "thread.pitch",
            "pitch below 0.05 mm is outside what this service computes",
        ));
    }
    if p > d / 4.0 {
        return Err(EngineError::invalid(
            "thread.pitch",
            format!("pitch {p} mm is coarser than d/4 for d = {d} mm; not a 60° fastener thread"),
        ));
    }
    Ok(match form {
        ThreadForm::IsoMetric => metric_geometry(
            format!("M{}x{}", round6(d), round6(p)),
            ThreadSeries::Custom,
            d,
            p,
        ),
        ThreadForm::Unified => {
            let d_in = d / 25.4;
            let tpi = 25.4 / p;
            unified_geometry(
                format!("{}-{} UN", round6(d_in), round6(tpi)),
                ThreadSeries::Custom,
                d_in,
                tpi,
            )
        }
    })
}

/// Rounds for display so that 10.5 prints as `10.5`, not `10.500000000001`.
fn round6(x: f64) -> f64 {
    (x * 1e6).round() / 1e6
}

/// Every tabulated thread: metric coarse and fine (ISO 261), then UNC, UNF
/// and 8-UN (ASME B1.1).
pub fn standard_threads() -> impl Iterator<Item = ThreadGeometry> {
    let metric = METRIC.iter().flat_map(|size| {
        std::iter::once(metric_geometry(
            metric_designation(size, None),
            ThreadSeries::Coarse,
            size.d,
            size.coarse,
        ))
        .chain(size.fine.iter().map(move |(p, text)| {
            metric_geometry(
                metric_designation(size, Some(text)),
                ThreadSeries::Fine,
                size.d,
                *p,
            )
        }))
    });
    let unc = UNIFIED.iter().filter_map(|s| {
        s.unc.map(|n| {
            unified_geometry(
                unified_designation(s, n, "UNC"),
                ThreadSeries::Unc,
                s.d,
                n as f64,
            )
        })
    });
    let unf = UNIFIED.iter().filter_map(|s| {
        s.unf.map(|n| {
            unified_geometry(
                unified_designation(s, n, "UNF"),
                ThreadSeries::Unf,
                s.d,
                n as f64,
            )
        })
    });
    let un8 = UNIFIED
        .iter()
        .filter(|s| s.un8)
        .map(|s| unified_geometry(unified_designation(s, 8, "UN"), ThreadSeries::Un8, s.d, 8.0));
    metric.chain(unc).chain(unf).chain(un8)
}
