//! Quantities of the friction-test use cases, read and written through
//! `app::quantity` (the one place for wire quantities and their exact
//! NIST SP 811 factors). Here only what differs for these use cases: a
//! quantity that cannot be read is an invalid field naming the quantity
//! itself (not its `value` or `unit`), so that every specimen problem is
//! listed in one answer; torque in US units is given in lbf·in, the unit
//! torque–tension rigs for inch bolts usually report.

use uom::si::f64::{Angle, Force, Length, Torque};

use crate::app::quantity::{Misread, Quantity, TorqueUnit, Units};
use crate::app::FieldProblem;

fn invalid(field: &str) -> impl FnOnce(Misread) -> FieldProblem + '_ {
    move |m| FieldProblem::invalid(field, m.reason())
}

pub fn to_force(q: &Quantity, field: &str) -> Result<Force, FieldProblem> {
    q.read_force().map_err(invalid(field))
}

pub fn to_torque(q: &Quantity, field: &str) -> Result<Torque, FieldProblem> {
    q.read_torque().map_err(invalid(field))
}

pub fn to_length(q: &Quantity, field: &str) -> Result<Length, FieldProblem> {
    q.read_length().map_err(invalid(field))
}

pub fn to_angle(q: &Quantity, field: &str) -> Result<Angle, FieldProblem> {
    q.read_angle().map_err(invalid(field))
}

/// N·m, or lbf·in in US units.
pub fn torque(t: Torque, units: Units) -> Quantity {
    let unit = match units {
        Units::Si => TorqueUnit::NewtonMetre,
        Units::Us => TorqueUnit::PoundForceInch,
    };
    Quantity::torque_in(t, unit)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::force::newton;
    use uom::si::torque::newton_meter;

    fn q(value: f64, unit: &str) -> Quantity {
        Quantity {
            value,
            unit: unit.to_owned().into(),
        }
    }

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
        assert_eq!(e.field, "specimens[2].clamp_force");
        assert_eq!(e.class, crate::app::ProblemClass::Invalid);
        assert!(e.reason.contains("not a force unit"), "{}", e.reason);
        assert!(to_length(&q(f64::NAN, "mm"), "x").is_err());
        assert!(to_angle(&q(1.0, "mm"), "a").is_err());
    }

    #[test]
    fn us_torque_is_in_pound_force_inches() {
        let t = to_torque(&q(1.0, "lbf·ft"), "t").unwrap();
        let out = torque(t, Units::Us);
        assert_eq!(out.unit, "lbf·in");
        assert!((out.value - 12.0).abs() < 1e-9);
    }
}
