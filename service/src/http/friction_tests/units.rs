//! Quantities of the friction-test endpoints: reading `{"value","unit"}` into
//! uom values (naming the field when the unit is wrong for it) and writing
//! uom values in SI (N, N·m, mm, degrees) or US customary (lbf, lbf·in, in,
//! degrees). Torque in US units is given in lbf·in, the unit torque–tension
//! rigs for inch bolts usually report.
//!
//! Conversion factors: 1 lbf = 4.448 221 615 260 5 N and 1 in = 25.4 mm
//! (exact by definition, NIST SP 811 Appendix B). Torque in lbf·in and
//! lbf·ft is converted with these exact factors rather than uom's
//! rounded `pound_force` and `pound_force_inch`.

use uom::si::angle::{degree, radian};
use uom::si::f64::{Angle, Force, Length, Torque};
use uom::si::force::{kilonewton, meganewton, newton};
use uom::si::length::{centimeter, foot, inch, meter, millimeter};
use uom::si::torque::newton_meter;

use crate::engine::EngineError;

pub use crate::http::quantity::{Quantity, Units as UnitSystem};

/// 1 lbf in N (exact, NIST SP 811 Appendix B).
const LBF: f64 = 4.448_221_615_260_5;
/// 1 lbf·in in N·m: 4.448 221 615 260 5 N × 0.0254 m (exact, NIST SP 811).
const LBF_IN: f64 = 4.448_221_615_260_5 * 0.0254;
/// 1 lbf·ft in N·m: 4.448 221 615 260 5 N × 0.3048 m (exact, NIST SP 811).
const LBF_FT: f64 = 4.448_221_615_260_5 * 0.3048;

/// `si` or `us` (field `units`), for the command line.
pub fn parse_units(s: Option<&str>) -> Result<UnitSystem, EngineError> {
    match s.map(str::trim) {
        None | Some("si") | Some("SI") => Ok(UnitSystem::Si),
        Some("us") | Some("US") => Ok(UnitSystem::Us),
        Some(other) => Err(EngineError::Unknown {
            field: "units".into(),
            kind: "unit system",
            given: other.into(),
            suggestions: vec!["si".into(), "us".into()],
        }),
    }
}

/// Unit spellings compared without spaces, case kept (mN vs MN matters).
fn norm(unit: &str) -> String {
    unit.chars()
        .filter(|c| !c.is_whitespace())
        .map(|c| match c {
            '⋅' | '·' | '*' | '.' | '-' => '·',
            c => c,
        })
        .collect()
}

fn wrong_unit(q: &Quantity, field: &str, kind: &str, use_: &str) -> EngineError {
    EngineError::invalid(
        field,
        format!("unit '{}' is not a {kind} unit; use {use_}", q.unit),
    )
}

fn finite(q: &Quantity, field: &str) -> Result<f64, EngineError> {
    if q.value.is_finite() {
        Ok(q.value)
    } else {
        Err(EngineError::invalid(
            field,
            "the value must be a finite number",
        ))
    }
}

pub fn to_force(q: &Quantity, field: &str) -> Result<Force, EngineError> {
    let v = finite(q, field)?;
    Ok(match norm(&q.unit).as_str() {
        "N" => Force::new::<newton>(v),
        "kN" => Force::new::<kilonewton>(v),
        "MN" => Force::new::<meganewton>(v),
        "lbf" => Force::new::<newton>(v * LBF),
        "kip" | "klbf" => Force::new::<newton>(v * 1000.0 * LBF),
        _ => return Err(wrong_unit(q, field, "force", "N, kN or lbf")),
    })
}

pub fn to_torque(q: &Quantity, field: &str) -> Result<Torque, EngineError> {
    let v = finite(q, field)?;
    Ok(match norm(&q.unit).as_str() {
        "N·m" | "Nm" => Torque::new::<newton_meter>(v),
        "kN·m" | "kNm" => Torque::new::<newton_meter>(v * 1000.0),
        "lbf·in" | "in·lbf" | "lbfin" => Torque::new::<newton_meter>(v * LBF_IN),
        "lbf·ft" | "ft·lbf" | "lbfft" => Torque::new::<newton_meter>(v * LBF_FT),
        _ => return Err(wrong_unit(q, field, "torque", "N·m, lbf·in or lbf·ft")),
    })
}

pub fn to_length(q: &Quantity, field: &str) -> Result<Length, EngineError> {
    let v = finite(q, field)?;
    Ok(match norm(&q.unit).as_str() {
        "mm" => Length::new::<millimeter>(v),
        "cm" => Length::new::<centimeter>(v),
        "m" => Length::new::<meter>(v),
        "in" => Length::new::<inch>(v),
        "ft" => Length::new::<foot>(v),
        _ => return Err(wrong_unit(q, field, "length", "mm or in")),
    })
}

pub fn to_angle(q: &Quantity, field: &str) -> Result<Angle, EngineError> {
    let v = finite(q, field)?;
    Ok(match norm(&q.unit).as_str() {
        "°" | "deg" | "degree" | "degrees" => Angle::new::<degree>(v),
        "rad" => Angle::new::<radian>(v),
        _ => return Err(wrong_unit(q, field, "angle", "degrees or rad")),
    })
}

fn q(value: f64, unit: &str) -> Quantity {
    Quantity {
        value,
        unit: unit.to_owned(),
    }
}

pub fn force(f: Force, units: UnitSystem) -> Quantity {
    match units {
        UnitSystem::Si => q(f.get::<newton>(), "N"),
        UnitSystem::Us => q(f.get::<newton>() / LBF, "lbf"),
    }
}

pub fn torque(t: Torque, units: UnitSystem) -> Quantity {
    match units {
        UnitSystem::Si => q(t.get::<newton_meter>(), "N·m"),
        UnitSystem::Us => q(t.get::<newton_meter>() / LBF_IN, "lbf·in"),
    }
}

pub fn length(l: Length, units: UnitSystem) -> Quantity {
    match units {
        UnitSystem::Si => q(l.get::<millimeter>(), "mm"),
        UnitSystem::Us => q(l.get::<inch>(), "in"),
    }
}

pub fn angle(a: Angle) -> Quantity {
    q(a.get::<degree>(), "degrees")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_the_usual_spellings() {
        let nm = |u: &str| to_torque(&q(10.0, u), "t").unwrap().get::<newton_meter>();
        for u in ["N·m", "N*m", "Nm", "N.m", "N m"] {
            assert_eq!(nm(u), 10.0, "{u}");
        }
        // 1 lbf·in = 0.112 984 829 N·m (NIST SP 811 Appendix B).
        assert!(
            (nm("lbf·in") - 1.129_848_29).abs() < 1e-8,
            "{}",
            nm("lbf·in")
        );
        let f = to_force(&q(1.0, "lbf"), "f").unwrap().get::<newton>();
        assert!((f - 4.448_221_615_260_5).abs() < 1e-12);
    }

    #[test]
    fn a_unit_of_the_wrong_kind_names_the_field() {
        let e = to_force(&q(10.0, "N·m"), "specimens[2].clamp_force").unwrap_err();
        assert_eq!(e.field(), "specimens[2].clamp_force");
        assert!(e.to_string().contains("not a force unit"));
        assert!(to_length(&q(f64::NAN, "mm"), "x").is_err());
        assert!(parse_units(Some("metric")).is_err());
    }
}
