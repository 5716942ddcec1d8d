//! Tests of `app::quantity`: spellings, exact factors, refusals.

use super::*;
use crate::app::ProblemClass;

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-9 * b.abs().max(1.0)
}

#[test]
fn torque_spellings_are_accepted() {
    for s in ["N·m", "N*m", "Nm", "N.m", "N m", "N⋅m"] {
        assert_eq!(
            TorqueUnit::parse("torque_unit", s).ok(),
            Some(TorqueUnit::NewtonMetre),
            "{s}"
        );
    }
    for s in ["lbf·ft", "lbf.ft", "ft-lbf", "lbf*ft"] {
        assert_eq!(
            TorqueUnit::parse("torque_unit", s).ok(),
            Some(TorqueUnit::PoundForceFoot),
            "{s}"
        );
    }
    for s in ["lbf·in", "lbf.in", "in-lbf"] {
        assert_eq!(
            TorqueUnit::parse("torque_unit", s).ok(),
            Some(TorqueUnit::PoundForceInch),
            "{s}"
        );
    }
    assert!(TorqueUnit::parse("torque_unit", "N·mm").is_err());
}

#[test]
fn exact_inch_definition_round_trips() {
    // 1 in = 25.4 mm exactly (NIST SP 811 Appendix B).
    let l = Quantity::new(1.0, "in")
        .to_length("clamp_length")
        .expect("length");
    assert!(close(Quantity::length(l, Units::Si).value, 25.4));
    let q = Quantity::length(l, Units::Us);
    assert_eq!(q.unit, "in");
    assert!(close(q.value, 1.0));
}

#[test]
fn force_and_torque_conversions() {
    // 1 lbf = 4.448 222 N (NIST SP 811 Appendix B).
    let f = Quantity::new(1.0, "lbf")
        .to_force("required_clamp_load")
        .expect("force");
    assert!((Quantity::force(f, Units::Si).value - 4.448_222).abs() < 1e-6);
    let k = Quantity::new(20.0, "kN").to_force("f").expect("kN");
    assert!(close(Quantity::force(k, Units::Si).value, 20_000.0));
    // 1 lbf·ft = 12 lbf·in exactly.
    let t = Quantity::new(1.0, "lbf·ft").to_torque("t").expect("torque");
    assert!(close(
        Quantity::torque_in(t, TorqueUnit::PoundForceInch).value,
        12.0
    ));
    let nm = Quantity::new(1500.0, "N·mm").to_torque("t").expect("N·mm");
    assert!(close(Quantity::torque(nm, Units::Si).value, 1.5));
    assert_eq!(Quantity::torque(nm, Units::Us).unit, "lbf·ft");
}

#[test]
fn stress_area_angle() {
    // 1 ksi = 6.894 757 MPa (NIST SP 811 Appendix B, 1 psi = 6.894 757 kPa).
    let s = Quantity::new(1.0, "ksi").to_stress("s").expect("ksi");
    assert!((Quantity::stress(s, Units::Si).value - 6.894_757).abs() < 1e-5);
    let n = Quantity::new(640.0, "N/mm²").to_stress("s").expect("N/mm²");
    assert!(close(Quantity::stress(n, Units::Si).value, 640.0));
    let a = Quantity::new(1.0, "in²").to_area("a").expect("in²");
    assert!(close(Quantity::area(a, Units::Si).value, 645.16));
    assert_eq!(Quantity::area(a, Units::Si).unit, "mm²");
    let r = Quantity::new(std::f64::consts::PI, "rad")
        .to_angle("a")
        .expect("rad");
    assert!(close(Quantity::angle(r).value, 180.0));
}

#[test]
fn wrong_kind_or_unknown_unit_names_the_field() {
    let e = Quantity::new(10.0, "N")
        .to_length("clamp_length")
        .expect_err("N is no length");
    assert_eq!(e.class, ProblemClass::Malformed);
    assert_eq!(e.field, "clamp_length.unit");
    let e = Quantity::new(10.0, "furlong")
        .to_length("clamp_length")
        .expect_err("unknown");
    assert!(e.reason.contains("furlong"));
    let e = Quantity::new(f64::NAN, "mm")
        .to_length("clamp_length")
        .expect_err("nan");
    assert_eq!(e.field, "clamp_length.value");
}

#[test]
fn exact_pound_force_and_the_bare_misread() {
    // 1 lbf = 4.448 221 615 260 5 N exactly (NIST SP 811 Appendix B).
    let f = Quantity::new(1.0, "lbf").read_force().expect("lbf");
    assert!((f.get::<force::newton>() - 4.448_221_615_260_5).abs() < 1e-12);
    // 1 ft = 304.8 mm and 1 MN = 10⁶ N (NIST SP 811 Appendix B).
    let l = Quantity::new(2.0, "ft").read_length().expect("ft");
    assert!(close(Quantity::length(l, Units::Si).value, 609.6));
    let m = Quantity::new(f64::INFINITY, "N").read_force();
    assert_eq!(m, Err(Misread::NotFinite));
    let w = Quantity::new(3.0, "N·m").read_force().expect_err("torque");
    let (field, reason) = w.field_and_reason("preload");
    assert_eq!(field, "preload.unit");
    assert!(reason.contains("'N·m' is not a force unit"), "{reason}");
}

#[test]
fn conversion_noise_is_removed() {
    assert_eq!(Quantity::new(59.99999999999999, "degrees").value, 60.0);
    assert_eq!(Quantity::new(0.450037, "in").value, 0.450037);
    assert_eq!(Quantity::new(-1.5e-7, "mm").value, -1.5e-7);
}

#[test]
fn units_serialise_lowercase() {
    assert_eq!(serde_json::to_string(&Units::Us).expect("json"), "\"us\"");
    let u: Units = serde_json::from_str("\"si\"").expect("json");
    assert_eq!(u, Units::Si);
}
