//! A plain washer's own faces: the head (or nut) presses on the washer, and
//! the washer presses on the clamped part over its outer bearing area, so
//! the two surface pressures are checked against different limits.

use uom::si::f64::{Length, Pressure};
use uom::si::pressure::megapascal;

use super::super::thread::ThreadGeometry;
use super::super::EngineError;
use super::{hole_with_source, length, table, table_diameter, HoleSeries, Washer};

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
    let d = table_diameter(thread);
    let (tab, what) = if thread.is_inch() {
        (table::B18_22_1, "ASME B18.22.1 type A narrow")
    } else {
        (table::ISO7089, "ISO 7089")
    };
    let (_, _, outer) = table::row(tab, d, |r| r.0).ok_or_else(|| {
        EngineError::invalid(
            "washer",
            format!(
                "{what} plain washers have no table row for {}; give bearing diameters explicitly",
                thread.designation
            ),
        )
    })?;
    let (hole_d, hole_source) = hole_with_source(thread, hole)?;
    let unit = if thread.is_inch() { "in" } else { "mm" };
    Ok(Some(WasherBearing {
        outer_diameter: length(thread, outer),
        part_hole_diameter: hole_d,
        permissible_pressure: Pressure::new::<megapascal>(PLAIN_WASHER_P_G_MPA),
        source: format!(
            "washer {what} outer {outer} {unit} (recalled from memory) on the part's hole ({hole_source}); washer p_G {PLAIN_WASHER_P_G_MPA} MPa for 200 HV steel (between the VDI 2230 Part 1:2003 rows E295 and C45, as reproduced in a supplier's technical tables; common practice)"
        ),
    }))
}
