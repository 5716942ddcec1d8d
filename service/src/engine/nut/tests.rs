use uom::si::pressure::{megapascal, psi};

use super::*;
use crate::engine::thread::parse_designation;

fn at(class: &str, thread: &str) -> Result<NutStrength, EngineError> {
    nut_strength(class, &parse_designation(thread).unwrap())
}

#[test]
fn iso_898_2_proof_stresses_by_size() {
    // ISO 898-2:2012 proof load stress, coarse thread (recalled from memory):
    // class 8: M8 830, M12 840, M20 920 MPa; class 10 M12 1050; class 12 M24 1200.
    let mpa = |n: NutStrength| n.proof_stress.get::<megapascal>();
    assert!((mpa(at("8", "M8").unwrap()) - 830.0).abs() < 1e-9);
    assert!((mpa(at("class 8", "M12").unwrap()) - 840.0).abs() < 1e-9);
    assert!((mpa(at("iso-898-2-8", "M20").unwrap()) - 920.0).abs() < 1e-9);
    assert!((mpa(at("10", "M12").unwrap()) - 1050.0).abs() < 1e-9);
    assert!((mpa(at("ISO 898-2 class 12", "M24").unwrap()) - 1200.0).abs() < 1e-9);
    assert!((mpa(at("5", "M5").unwrap()) - 580.0).abs() < 1e-9);
}

#[test]
fn inch_nuts_and_their_mating_bolts() {
    // SAE J995 Grade 5: 120 ksi to 1 in, 105 ksi above; A563 DH 175 ksi
    // (recalled from memory).
    let ksi = |n: &NutStrength| n.proof_stress.get::<psi>() / 1000.0;
    let g5 = at("sae j995 grade 5", "1/2-13").unwrap();
    assert!((ksi(&g5) - 120.0).abs() < 1e-9);
    assert!((ksi(&at("j995-5", "1-1/4-7").unwrap()) - 105.0).abs() < 1e-9);
    let dh = at("A563 DH", "1-8").unwrap();
    assert!((ksi(&dh) - 175.0).abs() < 1e-9);
    assert!((dh.mates_bolt_rm_up_to.get::<psi>() - 150_000.0).abs() < 1e-6);
}

#[test]
fn wrong_form_size_or_name_is_refused_naming_the_field() {
    for (class, thread) in [
        ("8", "1/2-13"),
        ("sae-j995-8", "M12"),
        ("8", "M4"),
        ("8", "M42"),
    ] {
        let e = at(class, thread).unwrap_err();
        assert_eq!(e.field(), "nut.property_class", "{class} {thread}");
    }
    let e = at("class 9", "M10").unwrap_err();
    assert!(matches!(e, EngineError::Unknown { .. }));
    assert_eq!(e.field(), "nut.property_class");
}

#[test]
fn every_class_is_listed_with_its_standard() {
    assert_eq!(nut_classes().len(), 10);
    for c in nut_classes() {
        assert!(c.standard.contains("recalled from memory"), "{}", c.id);
        assert!(!c.ranges.is_empty());
        assert_eq!(find_nut_class(c.id).unwrap().id, c.id);
    }
}
