//! Countersunk heads: a 90° conical seat instead of a flat bearing face.
//!
//! Geometry: the head's cone bears on the part's 90° countersink between the
//! clearance hole d_h and the head's actual diameter d_k (the sharp
//! theoretical diameter is never reached). d_k actual min per size,
//! recalled from memory:
//! - ISO 10642 hexagon socket countersunk head screw, M3–M20;
//! - ISO 2009 slotted / ISO 7046-1 cross recessed countersunk head screw,
//!   M2–M10 (the two standards share the head).
//!
//! Friction on the cone (derived here from the equilibrium of the seat; the
//! relation is the one used for the thread flank, μ' = μ/cos(α/2), recalled
//! from memory): with the cone's half-angle φ = 45° measured from the bolt
//! axis, an axial force F needs a normal force N = F/sin φ on the seat, so
//! the friction torque at the mean radius D_Km/2 = (d_k + d_h)/4 is
//! M_K = μ_K·F/sin φ·D_Km/2. The engine keeps μ_K as the user states it and
//! turns the cone into a friction diameter D_Km/sin 45° = √2·D_Km.
//!
//! Surface pressure on the cone: the seat area is the projected annulus
//! A_p = π/4·(d_k² − d_h²) divided by sin φ, and the normal force is F/sin φ,
//! so the normal pressure is F/A_p — the flat-face formula on the projected
//! annulus (derived here).

use super::super::thread::ThreadGeometry;
use super::super::EngineError;
use super::{table, HeadType};

/// Half-angle of the 90° countersink, from the bolt axis (ISO 10642, ISO 2009,
/// ISO 7046-1: 90° head).
pub const SEAT_HALF_ANGLE_DEG: f64 = 45.0;

/// ISO 10642: (d, d_k actual min), mm, recalled from memory.
static ISO10642: &[(f64, f64)] = &[
    (3.0, 5.54),
    (4.0, 7.53),
    (5.0, 9.43),
    (6.0, 11.34),
    (8.0, 15.24),
    (10.0, 19.22),
    (12.0, 23.12),
    (16.0, 29.01),
    (20.0, 36.05),
];

/// ISO 2009 / ISO 7046-1: (d, d_k actual min), mm, recalled from memory.
static ISO2009: &[(f64, f64)] = &[
    (2.0, 3.5),
    (2.5, 4.4),
    (3.0, 5.2),
    (3.5, 6.94),
    (4.0, 8.04),
    (5.0, 8.94),
    (6.0, 10.87),
    (8.0, 15.37),
    (10.0, 17.78),
];

/// d_k of a countersunk head for a metric thread, with its source.
pub(super) fn diameter(
    thread: &ThreadGeometry,
    head: HeadType,
) -> Result<(f64, String), EngineError> {
    let (tab, what) = match head {
        HeadType::CountersunkSocket => (ISO10642, "ISO 10642 hexagon socket countersunk head"),
        _ => (
            ISO2009,
            "ISO 2009 slotted / ISO 7046-1 cross recessed countersunk head",
        ),
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
        format!(
            "d_w {dk} mm: {what} d_k actual min, recalled from memory; 90° conical seat: \
             friction diameter D_Km/sin 45° (derived from the seat's equilibrium), surface \
             pressure on the projected annulus"
        ),
    ))
}

/// Is this head seated on a cone?
pub(super) fn is_countersunk(head: HeadType) -> bool {
    matches!(
        head,
        HeadType::CountersunkSocket | HeadType::CountersunkSlotted
    )
}
