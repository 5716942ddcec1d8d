//! The units a client may write, each with its factor to the canonical
//! unit of its kind, taken from the exact definitions in `app::quantity`.

use super::{TorqueUnit, MM_PER_IN, MPA_PER_PSI, N_PER_LBF};

/// A recognised unit with its factor to the canonical unit of its kind
/// (mm, mm², N, MPa, degrees; torques keep their own unit and a scale).
#[derive(Debug, Clone, Copy, PartialEq)]
pub(super) enum Unit {
    Length(f64),
    Area(f64),
    Force(f64),
    Torque(TorqueUnit, f64),
    Stress(f64),
    Angle(f64),
}

/// Looks a unit up after removing the separators people write between
/// factors (`·`, `⋅`, `*`, `.`, `-`, `_`, white space) and writing `²` as
/// `2`. Case is kept (mN and MN differ).
pub(super) fn lookup(text: &str) -> Option<Unit> {
    let key: String = text
        .chars()
        .filter(|c| !(c.is_whitespace() || matches!(c, '·' | '⋅' | '*' | '.' | '-' | '_')))
        .map(|c| if c == '²' { '2' } else { c })
        .collect();
    // Factors from the exact definitions above (NIST SP 811 Appendix B).
    Some(match key.as_str() {
        "mm" => Unit::Length(1.0),
        "cm" => Unit::Length(10.0),
        "m" => Unit::Length(1000.0),
        "in" | "inch" | "inches" | "\"" => Unit::Length(MM_PER_IN),
        "ft" => Unit::Length(12.0 * MM_PER_IN),
        // Micrometre (micro sign or Greek mu) and microinch, for roughness.
        "µm" | "μm" | "um" => Unit::Length(0.001),
        "µin" | "μin" | "uin" => Unit::Length(MM_PER_IN * 1e-6),
        "mm2" | "sqmm" => Unit::Area(1.0),
        "in2" | "sqin" => Unit::Area(MM_PER_IN * MM_PER_IN),
        "N" => Unit::Force(1.0),
        "kN" => Unit::Force(1000.0),
        "MN" => Unit::Force(1.0e6),
        "lbf" | "lb" => Unit::Force(N_PER_LBF),
        "kip" | "kips" | "klbf" => Unit::Force(1000.0 * N_PER_LBF),
        "Nm" => Unit::Torque(TorqueUnit::NewtonMetre, 1.0),
        "Nmm" => Unit::Torque(TorqueUnit::NewtonMetre, 0.001),
        "kNm" => Unit::Torque(TorqueUnit::NewtonMetre, 1000.0),
        "lbfft" | "lbft" | "ftlbf" | "ftlb" | "ftlbs" => {
            Unit::Torque(TorqueUnit::PoundForceFoot, 1.0)
        }
        "lbfin" | "lbin" | "inlbf" | "inlb" | "inlbs" => {
            Unit::Torque(TorqueUnit::PoundForceInch, 1.0)
        }
        "MPa" | "N/mm2" => Unit::Stress(1.0),
        "GPa" | "kN/mm2" => Unit::Stress(1000.0),
        "ksi" => Unit::Stress(1000.0 * MPA_PER_PSI),
        "psi" => Unit::Stress(MPA_PER_PSI),
        "deg" | "degree" | "degrees" | "°" => Unit::Angle(1.0),
        "rad" => Unit::Angle(180.0 / std::f64::consts::PI),
        _ => return None,
    })
}
