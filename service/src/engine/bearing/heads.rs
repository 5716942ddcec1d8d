//! The outer bearing diameter d_w of a head or a turned nut, read from its
//! standard's table with the standard's size range enforced (field `head`).

use super::super::thread::ThreadGeometry;
use super::super::EngineError;
use super::{countersunk, mem, small_heads, table, table_diameter, HeadType, EXPLICIT};

/// A head or nut with no row for this size: the standard and its range.
fn outside(thread: &ThreadGeometry, what: &str, range: &str, extra: &str) -> EngineError {
    EngineError::invalid(
        "head",
        format!(
            "{what} is tabulated for {range}{extra}; {} is outside; {EXPLICIT}",
            thread.designation
        ),
    )
}

/// Outer bearing diameter of the head or nut alone, with its source.
pub(super) fn diameter(
    thread: &ThreadGeometry,
    head: HeadType,
) -> Result<(f64, String), EngineError> {
    if thread.is_inch() {
        inch(thread, head)
    } else {
        metric(thread, head)
    }
}

fn inch(thread: &ThreadGeometry, head: HeadType) -> Result<(f64, String), EngineError> {
    let d = table_diameter(thread);
    const FLATS: &str = "F min taken as bearing face (assumption)";
    let (tab, what, range, basis): (&[(f64, f64)], _, _, _) = match head {
        HeadType::HexagonHead => (
            table::B18_2_1_HEX,
            "ASME B18.2.1 hex cap screw",
            "1/4 to 1-1/2 in",
            FLATS,
        ),
        HeadType::HeavyHexHead => (
            table::B18_2_1_HEAVY,
            "ASME B18.2.1 heavy hex screw",
            "3/8 to 1-1/2 in",
            FLATS,
        ),
        HeadType::SocketHead => (
            table::B18_3,
            "ASME B18.3 socket head cap screw",
            "#2 to 1-1/2 in",
            "head diameter A max taken as bearing face (upper estimate), recalled from memory",
        ),
        HeadType::HexagonNut => {
            return nut_faces(
                thread,
                table::B18_2_2_HEX,
                "ASME B18.2.2 hex nut",
                "1/4 to 1-1/2 in",
            )
        }
        HeadType::HeavyHexNut => {
            return nut_faces(
                thread,
                table::B18_2_2_HEAVY,
                "ASME B18.2.2 heavy hex nut",
                "1/4 to 1-1/2 in",
            )
        }
        HeadType::HexagonFlange
        | HeadType::HexagonFlangeNut
        | HeadType::PanHead
        | HeadType::ButtonHead
        | HeadType::CountersunkSocket
        | HeadType::CountersunkSlotted => {
            return Err(EngineError::invalid(
                "head",
                format!(
                    "{} is a metric head or nut; {} is a Unified inch thread; {EXPLICIT}",
                    head.description(),
                    thread.designation
                ),
            ))
        }
    };
    let (_, dw) = table::row(tab, d, |r| r.0).ok_or_else(|| outside(thread, what, range, ""))?;
    Ok((dw, format!("d_w {dw} in: {what}, {basis}")))
}

/// An inch nut's width across flats F (basic and min); the bearing face is
/// taken as F min, as for the inch heads.
fn nut_faces(
    thread: &ThreadGeometry,
    tab: &[(f64, f64, f64)],
    what: &str,
    range: &str,
) -> Result<(f64, String), EngineError> {
    let d = table_diameter(thread);
    let (_, f, f_min) =
        table::row(tab, d, |r| r.0).ok_or_else(|| outside(thread, what, range, ""))?;
    Ok((
        f_min,
        format!(
            "d_w {f_min} in: {what}, width across flats F {f} in (min {f_min} in), F min taken as bearing face (assumption), recalled from memory"
        ),
    ))
}

fn metric(thread: &ThreadGeometry, head: HeadType) -> Result<(f64, String), EngineError> {
    let d = table_diameter(thread);
    match head {
        HeadType::HexagonHead | HeadType::HexagonNut => {
            let (what, grade_a_to) = if head == HeadType::HexagonHead {
                ("ISO 4014/4017", 24.0)
            } else {
                ("ISO 4032 (ISO 4033: same s and d_w)", 16.0)
            };
            let (_, s, a, b) = table::row(table::ISO4017, d, |r| r.0)
                .ok_or_else(|| outside(thread, what, "M1.6 to M64", ""))?;
            let (dw, grade) = if d <= grade_a_to && a > 0.0 {
                (a, "A")
            } else {
                (b, "B")
            };
            let recalled = !table::iso4017_published(d) || head == HeadType::HexagonNut;
            Ok((
                dw,
                format!(
                    "d_w {dw} mm: {what} d_w,min product grade {grade}, width across flats s {s} mm{}",
                    mem(recalled)
                ),
            ))
        }
        HeadType::SocketHead => {
            let (_, _, dw) = table::row(table::ISO4762, d, |r| r.0).ok_or_else(|| {
                outside(
                    thread,
                    "ISO 4762 d_w,min",
                    "M3 to M39",
                    " (the standard runs to M64; its larger rows are not recalled here)",
                )
            })?;
            Ok((
                dw,
                format!("d_w {dw} mm: ISO 4762 d_w,min, recalled from memory"),
            ))
        }
        HeadType::HexagonFlange | HeadType::HexagonFlangeNut => {
            let (tab, what) = if head == HeadType::HexagonFlange {
                (table::ISO4162, "ISO 4162 hexagon flange bolt")
            } else {
                (table::ISO4161, "ISO 4161 hexagon nut with flange")
            };
            let (_, dc, dw) = table::row(tab, d, |r| r.0)
                .ok_or_else(|| outside(thread, what, "M5 to M20", ""))?;
            Ok((
                dw,
                format!(
                    "d_w {dw} mm: {what} d_w,min (flange diameter d_c max {dc} mm), recalled from memory"
                ),
            ))
        }
        HeadType::PanHead | HeadType::ButtonHead => small_heads::diameter(thread, head),
        HeadType::CountersunkSocket | HeadType::CountersunkSlotted => {
            countersunk::diameter(thread, head)
        }
        HeadType::HeavyHexHead | HeadType::HeavyHexNut => Err(EngineError::invalid(
            "head",
            format!(
                "{} is tabulated for Unified inch threads only (ASME B18.2.1 / B18.2.2), not for {}; {EXPLICIT}",
                head.id(),
                thread.designation
            ),
        )),
    }
}
