//! Bearing faces of the small round heads: pan head (ISO 7045 cross recess,
//! ISO 14583 hexalobular) and button head (ISO 7380-1 hexagon socket). The
//! head's outer diameter d_k is taken as the bearing face: these heads have
//! no separate d_w, and the underside is flat to the edge radius (an upper
//! estimate of the friction radius and a lower one of the surface
//! pressure). Diameters d_k max, recalled from memory.

use super::super::thread::ThreadGeometry;
use super::super::EngineError;
use super::{table, HeadType};

/// ISO 7045 / ISO 14583 pan head: (d, d_k max), mm, recalled from memory.
static PAN: &[(f64, f64)] = &[
    (2.0, 4.0),
    (2.5, 5.0),
    (3.0, 5.6),
    (4.0, 8.0),
    (5.0, 9.5),
    (6.0, 12.0),
    (8.0, 16.0),
    (10.0, 20.0),
];

/// ISO 7380-1 button head: (d, d_k max), mm, recalled from memory.
static BUTTON: &[(f64, f64)] = &[
    (3.0, 5.7),
    (4.0, 7.6),
    (5.0, 9.5),
    (6.0, 10.5),
    (8.0, 14.0),
    (10.0, 17.5),
    (12.0, 21.0),
    (16.0, 28.0),
];

/// d_k of a pan or button head for a metric thread, with its source.
pub(super) fn diameter(
    thread: &ThreadGeometry,
    head: HeadType,
) -> Result<(f64, String), EngineError> {
    let (tab, what) = match head {
        HeadType::PanHead => (PAN, "ISO 7045 / ISO 14583 pan head"),
        _ => (BUTTON, "ISO 7380-1 button head"),
    };
    let d = super::table_diameter(thread);
    let (_, dk) = table::row(tab, d, |r| r.0).ok_or_else(|| {
        EngineError::invalid(
            "head",
            format!(
                "{what} has no table row for {} (M{}–M{} tabulated); {}",
                thread.designation,
                tab[0].0,
                tab[tab.len() - 1].0,
                super::EXPLICIT
            ),
        )
    })?;
    Ok((
        dk,
        format!("d_w {dk} mm: {what} d_k max taken as the bearing face (an upper estimate), recalled from memory"),
    ))
}
