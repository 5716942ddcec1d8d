//! Bearing geometry under head or nut, and clearance holes.
//!
//! Public surface:
//! - [`HeadType`], [`HoleSeries`], [`Washer`] with API ids, `FromStr` and
//!   listings ([`head_types`], [`hole_series`], [`washers`]);
//! - [`clearance_hole`] d_h (ISO 273 for metric; ASME B18.2.8 close /
//!   normal / loose mapped to fine / medium / coarse for inch);
//! - [`bearing_surface`] d_w and d_h from the tables, and
//!   [`explicit_bearing`] for diameters the user gives.
//!
//! Choices:
//! - Hexagon head: ISO 4017 / ISO 4014 d_w,min, product grade A for
//!   d ≤ 24 mm, grade B above (product grades: ISO 4014/4017, recalled from
//!   memory), M1.6 to M64. Hexagon nut: ISO 4032 d_w,min (ISO 4033 has the
//!   same s and d_w), equal to grade A up to M16 and grade B above (recalled
//!   from memory), M1.6 to M64. Socket head: ISO 4762 d_w,min, M3 to M39.
//!   Flange bolt ISO 4162 and flange nut ISO 4161: d_w,min with the flange
//!   diameter d_c shown, M5 to M20 (recalled from memory).
//! - Inch: hex cap screw and heavy hex per ASME B18.2.1 with the bearing
//!   face taken as the width across flats F min (assumption); socket head
//!   per ASME B18.3 with the bearing face taken as head diameter A max (an
//!   upper estimate); hex and heavy hex nuts per ASME B18.2.2, bearing face
//!   taken as F min (the same assumption). Inch flange heads are not
//!   tabulated. Every table's size range is enforced (field `head`).
//! - Washers: ISO 7089 (plain) and ISO 7090 (chamfered) d1, d2, h to M64;
//!   ASME B18.22.1 type A narrow for inch.
//! - With a plain washer the head turns on the washer: outer = min(head d_w,
//!   washer outer diameter), inner = washer inner diameter. The clearance
//!   hole does not bound this face, because the washer bridges it.
//! - Countersunk heads (ISO 10642; ISO 2009 / ISO 7046-1) bear on a 90°
//!   cone: see [`countersunk`] for the friction diameter and pressure.
//! - A size with no table row is Invalid and asks for `bearing` diameters.

mod countersunk;
mod explicit;
mod heads;
mod names;
mod small_heads;
mod table;
#[cfg(test)]
mod tests;
#[cfg(test)]
mod tests_large;
mod washer;

use names::unknown;

pub use countersunk::SEAT_HALF_ANGLE_DEG;
pub use explicit::explicit_bearing;
pub use washer::{washer_bearing, WasherBearing, PLAIN_WASHER_P_G_MPA};

use std::str::FromStr;

use uom::si::f64::Length;
use uom::si::length::{inch, millimeter};

use super::thread::ThreadGeometry;
use super::EngineError;

/// The annular surface a head or nut turns on.
#[derive(Debug, Clone, PartialEq)]
pub struct BearingSurface {
    /// Outer bearing diameter d_w.
    pub outer_diameter: Length,
    /// Inner bearing diameter: the clearance hole d_h.
    pub inner_diameter: Length,
    /// Where the diameters came from (standard and table, or "given").
    pub source: String,
    /// A 90° countersunk head's conical seat (see [`countersunk`]).
    pub conical_seat: bool,
}

impl BearingSurface {
    /// Mean bearing-friction diameter D_Km = (d_w + d_h)/2 (VDI 2230 Part 1).
    pub fn mean_diameter(&self) -> Length {
        (self.outer_diameter + self.inner_diameter) / 2.0
    }

    /// The diameter the bearing friction torque acts at: D_Km for a flat
    /// face; D_Km/sin 45° on a 90° conical seat, where the normal force is
    /// F/sin 45° (derived in [`countersunk`]).
    pub fn friction_diameter(&self) -> Length {
        if self.conical_seat {
            self.mean_diameter() / SEAT_HALF_ANGLE_DEG.to_radians().sin()
        } else {
            self.mean_diameter()
        }
    }
}

macro_rules! named_enum {
    ($(#[$m:meta])* $name:ident, $kind:literal, $field:literal,
     { $($(#[$vm:meta])* $variant:ident => $id:literal, $desc:literal;)+ }) => {
        $(#[$m])*
        #[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
        pub enum $name { $($(#[$vm])* $variant,)+ }

        impl $name {
            /// Every value, in listing order.
            pub const ALL: &'static [$name] = &[$($name::$variant,)+];
            /// The id the API uses.
            pub fn id(self) -> &'static str {
                match self { $($name::$variant => $id,)+ }
            }
            /// What the value means, with its standard.
            pub fn description(self) -> &'static str {
                match self { $($name::$variant => $desc,)+ }
            }
        }

        impl FromStr for $name {
            type Err = EngineError;
            fn from_str(s: &str) -> Result<Self, EngineError> {
                let t = s.trim();
                $name::ALL
                    .iter()
                    .copied()
                    .find(|v| v.id().eq_ignore_ascii_case(t)
                        || v.id().replace('-', " ").eq_ignore_ascii_case(t)
                        || v.id().replace('-', "_").eq_ignore_ascii_case(t))
                    .ok_or_else(|| unknown($field, $kind, s, $name::ALL.iter().map(|v| v.id())))
            }
        }

        impl TryFrom<&str> for $name {
            type Error = EngineError;
            fn try_from(s: &str) -> Result<Self, EngineError> { s.parse() }
        }
    };
}

named_enum!(
    /// What turns on the bearing surface.
    HeadType, "head type", "head", {
        /// ISO 4014/4017 (M1.6–M64); ASME B18.2.1 hex cap screw.
        HexagonHead => "hexagon-head", "hexagon head bolt or screw (ISO 4014/4017, M1.6–M64; ASME B18.2.1 hex cap screw)";
        /// ASME B18.2.1 heavy hex screw (inch only).
        HeavyHexHead => "heavy-hex-head", "heavy hex screw (ASME B18.2.1; inch only)";
        /// ISO 4762 (M3–M39 tabulated); ASME B18.3.
        SocketHead => "socket-head", "hexagon socket head cap screw (ISO 4762, M3–M39 tabulated; ASME B18.3)";
        /// ISO 4162 (metric only, M5–M20).
        HexagonFlange => "hexagon-flange", "hexagon flange bolt (ISO 4162; metric only, M5–M20; d_w under the flange)";
        /// ISO 4032 / ISO 4033; ASME B18.2.2 hex nut.
        HexagonNut => "hexagon-nut", "hexagon nut turned, bolt held (ISO 4032 / ISO 4033, M1.6–M64; inch: ASME B18.2.2 hex nut, 1/4–1-1/2 in)";
        /// ASME B18.2.2 heavy hex nut (inch only).
        HeavyHexNut => "heavy-hex-nut", "heavy hex nut turned, bolt held (ASME B18.2.2; inch only, 1/4–1-1/2 in)";
        /// ISO 4161 (metric only, M5–M20).
        HexagonFlangeNut => "hexagon-flange-nut", "hexagon nut with flange turned, bolt held (ISO 4161; metric only, M5–M20; d_w under the flange)";
        /// ISO 7045 / ISO 14583 (metric only, M2–M10).
        PanHead => "pan-head", "pan head screw (ISO 7045 / ISO 14583; metric only, M2–M10; d_k as bearing face)";
        /// ISO 7380-1 (metric only, M3–M16).
        ButtonHead => "button-head", "hexagon socket button head screw (ISO 7380-1; metric only, M3–M16; d_k as bearing face)";
        /// ISO 10642 (metric only, M3–M20), 90° conical seat.
        CountersunkSocket => "countersunk-socket", "hexagon socket countersunk head screw (ISO 10642; metric only, M3–M20; 90° conical seat in a countersink, no washer)";
        /// ISO 2009 / ISO 7046-1 (metric only, M2–M10), 90° conical seat.
        CountersunkSlotted => "countersunk-slotted", "slotted or cross recessed countersunk head screw (ISO 2009 / ISO 7046-1; metric only, M2–M10; 90° conical seat in a countersink, no washer)";
    }
);

named_enum!(
    /// Clearance-hole series.
    HoleSeries, "hole series", "hole", {
        Fine => "fine", "ISO 273 fine (H12); inch: ASME B18.2.8 close fit";
        Medium => "medium", "ISO 273 medium (H13); inch: ASME B18.2.8 normal fit";
        Coarse => "coarse", "ISO 273 coarse (H14); inch: ASME B18.2.8 loose fit";
    }
);

named_enum!(
    /// Washer under the turned part.
    Washer, "washer", "washer", {
        None => "none", "no washer: the head or nut bears on the clamped part";
        Plain => "plain", "plain washer (ISO 7089 normal series, M1.6–M64; inch: ASME B18.22.1 type A narrow, 1/4–1-1/2 in)";
        PlainChamfered => "plain-chamfered", "plain washer, chamfered (ISO 7090 normal series, M5–M64; metric only)";
    }
);

/// Head types for the reference endpoint.
pub fn head_types() -> &'static [HeadType] {
    HeadType::ALL
}

/// Hole series for the reference endpoint.
pub fn hole_series() -> &'static [HoleSeries] {
    HoleSeries::ALL
}

/// Washer choices for the reference endpoint.
pub fn washers() -> &'static [Washer] {
    Washer::ALL
}

const EXPLICIT: &str = "give bearing.outer_diameter and bearing.inner_diameter explicitly";

/// Nominal diameter in the table unit (mm for metric, inch for Unified).
fn table_diameter(thread: &ThreadGeometry) -> f64 {
    if thread.is_inch() {
        thread.nominal_diameter.get::<inch>()
    } else {
        thread.nominal_diameter.get::<millimeter>()
    }
}

fn length(thread: &ThreadGeometry, v: f64) -> Length {
    if thread.is_inch() {
        Length::new::<inch>(v)
    } else {
        Length::new::<millimeter>(v)
    }
}

fn mem(recalled: bool) -> &'static str {
    if recalled {
        ", recalled from memory"
    } else {
        ""
    }
}

/// Clearance hole diameter d_h for the thread's nominal size.
pub fn clearance_hole(thread: &ThreadGeometry, hole: HoleSeries) -> Result<Length, EngineError> {
    hole_with_source(thread, hole).map(|(d, _)| d)
}

fn hole_with_source(
    thread: &ThreadGeometry,
    hole: HoleSeries,
) -> Result<(Length, String), EngineError> {
    let d = table_diameter(thread);
    let (table, standard) = if thread.is_inch() {
        (table::B18_2_8, "ASME B18.2.8")
    } else {
        (table::ISO273, "ISO 273")
    };
    let Some((_, fine, medium, coarse)) = table::row(table, d, |r| r.0) else {
        return Err(EngineError::invalid(
            "hole",
            format!(
                "{standard} clearance holes are not tabulated here for {}; {EXPLICIT}",
                thread.designation
            ),
        ));
    };
    let v = match hole {
        HoleSeries::Fine => fine,
        HoleSeries::Medium => medium,
        HoleSeries::Coarse => coarse,
    };
    let recalled = thread.is_inch() || !table::iso273_published(d);
    let unit = if thread.is_inch() { "in" } else { "mm" };
    let source = format!("d_h {v} {unit}: {standard} {}{}", hole.id(), mem(recalled));
    Ok((length(thread, v), source))
}

/// The bearing surface from the head, washer and hole tables.
pub fn bearing_surface(
    thread: &ThreadGeometry,
    head: HeadType,
    washer: Washer,
    hole: HoleSeries,
) -> Result<BearingSurface, EngineError> {
    let (dw, head_source) = heads::diameter(thread, head)?;
    let conical_seat = countersunk::is_countersunk(head);
    match washer {
        Washer::None => {
            let (dh, hole_source) = hole_with_source(thread, hole)?;
            Ok(BearingSurface {
                outer_diameter: length(thread, dw),
                inner_diameter: dh,
                source: format!("{head_source}; {hole_source}"),
                conical_seat,
            })
        }
        _ if conical_seat => Err(EngineError::invalid(
            "washer",
            format!(
                "a {} seats in a countersink; a plain washer cannot sit under it (give washer none)",
                head.id()
            ),
        )),
        _ => {
            let w = washer::row(thread, washer)?;
            let unit = if thread.is_inch() { "in" } else { "mm" };
            Ok(BearingSurface {
                outer_diameter: length(thread, dw.min(w.outer)),
                inner_diameter: length(thread, w.inner),
                source: format!(
                    "{head_source}; head turns on a plain washer {}: outer = min(d_w, washer outer), inner = washer inner",
                    w.describe(unit)
                ),
                conical_seat: false,
            })
        }
    }
}
