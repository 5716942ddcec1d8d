//! A plain washer's own faces: the head (or nut) presses on the washer, and
//! the washer presses on the clamped part over its outer bearing area, so
//! the two surface pressures are checked against different limits.

use uom::si::f64::{Length, Pressure};
use uom::si::pressure::megapascal;

use super::super::thread::ThreadGeometry;
use super::super::EngineError;
use super::{hole_with_source, length, table, table_diameter, HoleSeries, Washer, EXPLICIT};

/// Limiting surface pressure p_G taken for a plain steel washer of hardness
/// class 200 HV (ISO 7089; ASME B18.22.1 type A, unhardened): 200 HV is
/// about Rm 640 MPa (ISO 18265 hardness conversion, recalled from memory),
/// between the VDI 2230 Part 1:2003 rows E295 (Rm 470, p_G 710 MPa) and C45
/// (Rm 700, p_G 630 MPa), as reproduced in a supplier's technical tables;
/// the lower of the two is taken (common practice).
pub const PLAIN_WASHER_P_G_MPA: f64 = 630.0;

/// The washer between head and clamped part.
#[derive(Debug, Clone, PartialEq)]
pub struct WasherBearing {
    /// Outer diameter of the washer: the face it presses on the part.
    pub outer_diameter: Length,
    /// The clearance hole in the part under the washer.
    pub part_hole_diameter: Length,
    /// p_G of the washer itself (the head presses on it).
    pub permissible_pressure: Pressure,
    /// Where the diameters and p_G come from.
    pub source: String,
}

/// The washer's faces for the tables' washer and hole; `None` without a
/// washer. Invalid (field `washer`) for a size with no washer row.
pub fn washer_bearing(
    thread: &ThreadGeometry,
    washer: Washer,
    hole: HoleSeries,
) -> Result<Option<WasherBearing>, EngineError> {
    if washer == Washer::None {
        return Ok(None);
    }
    let w = row(thread, washer)?;
    let outer = w.outer;
    let (hole_d, hole_source) = hole_with_source(thread, hole)?;
    let unit = if thread.is_inch() { "in" } else { "mm" };
    Ok(Some(WasherBearing {
        outer_diameter: length(thread, outer),
        part_hole_diameter: hole_d,
        permissible_pressure: Pressure::new::<megapascal>(PLAIN_WASHER_P_G_MPA),
        source: format!(
            "washer {} on the part's hole ({hole_source}); washer p_G {PLAIN_WASHER_P_G_MPA} MPa for 200 HV steel (between the VDI 2230 Part 1:2003 rows E295 and C45, as reproduced in a supplier's technical tables; common practice)",
            w.describe(unit)
        ),
    }))
}

/// One washer's dimensions from its standard's table, in the table unit.
pub(super) struct WasherRow {
    /// Inner diameter d1 (min).
    pub inner: f64,
    /// Outer diameter d2 (max).
    pub outer: f64,
    /// Thickness h (nominal); None where the table gives none here.
    pub thickness: Option<f64>,
    pub what: &'static str,
}

impl WasherRow {
    /// `ISO 7089 (d1 52 mm, d2 92 mm, h 8 mm, recalled from memory)`.
    pub fn describe(&self, unit: &str) -> String {
        let h = match self.thickness {
            Some(h) => format!(", h {h} {unit}"),
            None => String::new(),
        };
        format!(
            "{} (d1 {} {unit}, d2 {} {unit}{h}, recalled from memory)",
            self.what, self.inner, self.outer
        )
    }
}

/// The washer's row for the thread's size: ISO 7089 (M1.6 to M64) and
/// ISO 7090 (M5 to M64) for metric threads, ASME B18.22.1 type A narrow
/// (1/4 to 1-1/2 in) for inch. Invalid (field `washer`) outside the
/// standard's range, naming it.
pub(super) fn row(thread: &ThreadGeometry, washer: Washer) -> Result<WasherRow, EngineError> {
    let d = table_diameter(thread);
    let refuse = |what: &str, range: &str| {
        EngineError::invalid(
            "washer",
            format!(
                "{what} washers are tabulated for {range}; {} is outside; {EXPLICIT}",
                thread.designation
            ),
        )
    };
    match (washer, thread.is_inch()) {
        (Washer::None, _) => Err(EngineError::invalid("washer", "no washer given")),
        (Washer::Plain, true) => {
            let what = "ASME B18.22.1 type A narrow";
            let (_, inner, outer) = table::row(table::B18_22_1, d, |r| r.0)
                .ok_or_else(|| refuse(what, "1/4 to 1-1/2 in"))?;
            Ok(WasherRow {
                inner,
                outer,
                thickness: None,
                what,
            })
        }
        (Washer::PlainChamfered, true) => Err(EngineError::invalid(
            "washer",
            format!(
                "plain-chamfered is an ISO 7090 metric washer; for {} give washer plain (ASME B18.22.1)",
                thread.designation
            ),
        )),
        (Washer::Plain | Washer::PlainChamfered, false) => {
            let (what, range, from) = if washer == Washer::Plain {
                ("ISO 7089", "M1.6 to M64", 1.6)
            } else {
                ("ISO 7090", "M5 to M64", 5.0)
            };
            let (_, inner, outer, h) = table::row(table::ISO7089, d, |r| r.0)
                .filter(|_| d >= from - 1e-6)
                .ok_or_else(|| refuse(what, range))?;
            Ok(WasherRow {
                inner,
                outer,
                thickness: Some(h),
                what,
            })
        }
    }
}
