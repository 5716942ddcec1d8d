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
//!   memory). Hexagon nut: ISO 4032 d_w,min, equal to grade A up to M16 and
//!   grade B above (recalled from memory). Socket head: ISO 4762 d_w,min.
//!   Hexagon flange: ISO 4162 d_w,min (recalled from memory).
//! - Inch: hex cap screw and heavy hex per ASME B18.2.1 with the bearing
//!   face taken as the width across flats F min (assumption); socket head
//!   per ASME B18.3 with the bearing face taken as head diameter A max (an
//!   upper estimate). Inch hexagon nuts and flange heads are not tabulated.
//! - With a plain washer the head turns on the washer: outer = min(head d_w,
//!   washer outer diameter), inner = washer inner diameter. The clearance
//!   hole does not bound this face, because the washer bridges it.
//! - Countersunk heads (ISO 10642; ISO 2009 / ISO 7046-1) bear on a 90°
//!   cone: see [`countersunk`] for the friction diameter and pressure.
//! - A size with no table row is Invalid and asks for `bearing` diameters.

mod countersunk;
mod explicit;
mod names;
mod small_heads;
mod table;
#[cfg(test)]
mod tests;
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
        /// ISO 4014/4017; ASME B18.2.1 hex cap screw.
        HexagonHead => "hexagon-head", "hexagon head bolt or screw (ISO 4014/4017; ASME B18.2.1 hex cap screw)";
        /// ASME B18.2.1 heavy hex screw (inch only).
        HeavyHexHead => "heavy-hex-head", "heavy hex screw (ASME B18.2.1; inch only)";
        /// ISO 4762; ASME B18.3.
        SocketHead => "socket-head", "hexagon socket head cap screw (ISO 4762; ASME B18.3)";
        /// ISO 4162 (metric only).
        HexagonFlange => "hexagon-flange", "hexagon flange bolt (ISO 4162; metric only)";
        /// ISO 4032 (metric only).
        HexagonNut => "hexagon-nut", "hexagon nut turned, bolt held (ISO 4032; metric only)";
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
        Plain => "plain", "plain washer (ISO 7089 normal series; inch: ASME B18.22.1 type A narrow)";
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

/// Outer bearing diameter of the head or nut alone, with its source.
fn head_diameter(thread: &ThreadGeometry, head: HeadType) -> Result<(f64, String), EngineError> {
    let d = table_diameter(thread);
    let missing = |what: &str| {
        EngineError::invalid(
            "head",
            format!(
                "{what} has no table row for {}; {EXPLICIT}",
                thread.designation
            ),
        )
    };
    if thread.is_inch() {
        let (tab, what, basis) = match head {
            HeadType::HexagonHead => (
                table::B18_2_1_HEX,
                "ASME B18.2.1 hex cap screw",
                "F min taken as bearing face (assumption)",
            ),
            HeadType::HeavyHexHead => (
                table::B18_2_1_HEAVY,
                "ASME B18.2.1 heavy hex screw",
                "F min taken as bearing face (assumption)",
            ),
            HeadType::SocketHead => (
                table::B18_3,
                "ASME B18.3 socket head cap screw",
                "head diameter A max taken as bearing face (upper estimate), recalled from memory",
            ),
            HeadType::HexagonFlange
            | HeadType::HexagonNut
            | HeadType::PanHead
            | HeadType::ButtonHead
            | HeadType::CountersunkSocket
            | HeadType::CountersunkSlotted => return Err(missing(head.description())),
        };
        let (_, dw) = table::row(tab, d, |r| r.0).ok_or_else(|| missing(what))?;
        return Ok((dw, format!("d_w {dw} in: {what}, {basis}")));
    }
    match head {
        HeadType::HexagonHead | HeadType::HexagonNut => {
            let (what, grade_a_to) = if head == HeadType::HexagonHead {
                ("ISO 4014/4017", 24.0)
            } else {
                ("ISO 4032", 16.0)
            };
            let (_, _, a, b) =
                table::row(table::ISO4017, d, |r| r.0).ok_or_else(|| missing(what))?;
            let (dw, grade) = if d <= grade_a_to && a > 0.0 {
                (a, "A")
            } else {
                (b, "B")
            };
            let recalled = !table::iso4017_published(d) || head == HeadType::HexagonNut;
            Ok((
                dw,
                format!(
                    "d_w {dw} mm: {what} d_w,min product grade {grade}{}",
                    mem(recalled)
                ),
            ))
        }
        HeadType::SocketHead => {
            let (_, _, dw) =
                table::row(table::ISO4762, d, |r| r.0).ok_or_else(|| missing("ISO 4762"))?;
            Ok((
                dw,
                format!("d_w {dw} mm: ISO 4762 d_w,min, recalled from memory"),
            ))
        }
        HeadType::HexagonFlange => {
            let (_, dw) =
                table::row(table::ISO4162, d, |r| r.0).ok_or_else(|| missing("ISO 4162"))?;
            Ok((
                dw,
                format!("d_w {dw} mm: ISO 4162 d_w,min, recalled from memory"),
            ))
        }
        HeadType::PanHead | HeadType::ButtonHead => small_heads::diameter(thread, head),
        HeadType::CountersunkSocket | HeadType::CountersunkSlotted => {
            countersunk::diameter(thread, head)
        }
        HeadType::HeavyHexHead => Err(EngineError::invalid(
            "head",
            format!(
                "heavy-hex-head is tabulated for Unified inch threads only (ASME B18.2.1), not for {}; {EXPLICIT}",
                thread.designation
            ),
        )),
    }
}

/// The bearing surface from the head, washer and hole tables.
pub fn bearing_surface(
    thread: &ThreadGeometry,
    head: HeadType,
    washer: Washer,
    hole: HoleSeries,
) -> Result<BearingSurface, EngineError> {
    let (dw, head_source) = head_diameter(thread, head)?;
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
        Washer::Plain if conical_seat => Err(EngineError::invalid(
            "washer",
            format!(
                "a {} seats in a countersink; a plain washer cannot sit under it (give washer none)",
                head.id()
            ),
        )),
        Washer::Plain => {
            let d = table_diameter(thread);
            let (tab, what) = if thread.is_inch() {
                (table::B18_22_1, "ASME B18.22.1 type A narrow")
            } else {
                (table::ISO7089, "ISO 7089")
            };
            let (_, inner, outer) = table::row(tab, d, |r| r.0).ok_or_else(|| {
                EngineError::invalid(
                    "washer",
                    format!(
                        "{what} plain washers have no table row for {}; {EXPLICIT}",
                        thread.designation
                    ),
                )
            })?;
            let unit = if thread.is_inch() { "in" } else { "mm" };
            Ok(BearingSurface {
                outer_diameter: length(thread, dw.min(outer)),
                inner_diameter: length(thread, inner),
                source: format!(
                    "{head_source}; head turns on a plain washer {what} (inner {inner} {unit}, outer {outer} {unit}, recalled from memory): outer = min(d_w, washer outer), inner = washer inner"
                ),
                conical_seat: false,
            })
        }
    }
}
