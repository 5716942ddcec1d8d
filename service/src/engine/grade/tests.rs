use super::*;
use crate::engine::thread::parse_designation;
use uom::si::area::{square_inch, square_millimeter};
use uom::si::force::{newton, pound_force};

fn thread(text: &str) -> ThreadGeometry {
    parse_designation(text).unwrap_or_else(|e| panic!("{text}: {e}"))
}

fn strength(id: &str, t: &str) -> Strength {
    strength_for(id, &thread(t)).unwrap_or_else(|e| panic!("{id} on {t}: {e}"))
}

fn mpa(p: Pressure) -> f64 {
    p.get::<megapascal>()
}

/// Rounds to 3 significant figures, half away from zero.
fn sig3(x: f64) -> f64 {
    let mag = 10f64.powi(2 - x.abs().log10().floor() as i32);
    (x * mag).round() / mag
}

#[test]
fn iso_898_1_proof_loads_8_8_10_9_12_9_m3_to_m39() {
    // ISO 898-1 proof loads Fp = As,nom × Sp (N), coarse thread, as reproduced
    // by supplier tables of EN ISO 898-1 ("ISO metric thread proof loads",
    // M3–M27; a second supplier's table agrees). M30–M39: ISO 898-1
    // values recalled from memory. The printed loads follow no single
    // rounding rule, so each is checked within ±0.5 % of As,nom × Sp, and
    // exactly where the printed value equals As,nom × Sp at 3 s.f.
    let table: &[(&str, [f64; 3])] = &[
        ("M3", [2920.0, 4180.0, 4880.0]),
        ("M3.5", [3940.0, 5630.0, 6580.0]),
        ("M4", [5100.0, 7290.0, 8520.0]),
        ("M5", [8230.0, 11800.0, 13800.0]),
        ("M6", [11600.0, 16700.0, 19500.0]),
        ("M7", [16800.0, 24000.0, 28000.0]),
        ("M8", [21200.0, 30400.0, 35500.0]),
        ("M10", [33700.0, 48100.0, 56300.0]),
        ("M12", [48900.0, 70000.0, 81800.0]),
        ("M14", [66700.0, 95500.0, 112000.0]),
        ("M16", [91000.0, 130000.0, 152000.0]),
        ("M18", [115000.0, 159000.0, 186000.0]),
        ("M20", [147000.0, 203000.0, 238000.0]),
        ("M22", [182000.0, 252000.0, 294000.0]),
        ("M24", [212000.0, 293000.0, 342000.0]),
        ("M27", [275000.0, 381000.0, 445000.0]),
        // recalled from memory (ISO 898-1):
        ("M30", [337000.0, 466000.0, 544000.0]),
        ("M33", [416000.0, 576000.0, 673000.0]),
        ("M36", [490000.0, 678000.0, 792000.0]),
        ("M39", [586000.0, 810000.0, 947000.0]),
    ];
    let mut exact = 0;
    for (t, loads) in table {
        let g = thread(t);
        for (id, printed) in ["8.8", "10.9", "12.9"].iter().zip(loads) {
            let s = strength(id, t);
            let fp = (s.proof_stress * g.stress_area).get::<newton>();
            // M6 8.8 is printed 11 600, 0.6 % under As×Sp = 11 672: the one
            // printed load outside ±0.5 %, allowed 0.7 %.
            let tol = if (*t, *id) == ("M6", "8.8") {
                0.007
            } else {
                0.005
            };
            assert!(
                (fp / printed - 1.0).abs() <= tol,
                "{t} {id}: As×Sp = {fp} N, printed {printed}"
            );
            // As,nom at the printed precision (3 s.f.) times Sp.
            let as_nom = sig3(g.stress_area.get::<square_millimeter>());
            if sig3(as_nom * mpa(s.proof_stress)) == *printed {
                exact += 1;
            }
        }
    }
    assert!(exact >= 50, "only {exact} of 60 loads reproduce exactly");
}

#[test]
fn iso_898_1_values_and_the_16_mm_switch() {
    // ISO 898-1:2013, as reproduced in two suppliers' technical tables.
    let small = strength("8.8", "M16");
    assert_eq!(mpa(small.yield_strength_min), 640.0);
    assert_eq!(mpa(small.proof_stress), 580.0);
    assert_eq!(mpa(small.tensile_strength_min), 800.0);
    let large = strength("8.8", "M18");
    assert_eq!(mpa(large.yield_strength_min), 660.0);
    assert_eq!(mpa(large.proof_stress), 600.0);
    assert_eq!(mpa(large.tensile_strength_min), 830.0);
    let s = strength("10.9", "M12");
    assert_eq!(
        (mpa(s.tensile_strength_min), mpa(s.yield_strength_min)),
        (1040.0, 940.0)
    );
    assert_eq!(s.yield_basis, YieldBasis::ProofStrength02);
    let s = strength("4.6", "M12");
    assert_eq!(
        (mpa(s.yield_strength_min), mpa(s.proof_stress)),
        (240.0, 225.0)
    );
    assert_eq!(s.yield_basis, YieldBasis::LowerYield);
    let s = strength("5.8", "M12");
    assert_eq!(s.yield_basis, YieldBasis::FullSizeRpf);
    assert_eq!(mpa(s.yield_strength_min), 420.0);
}

fn invalid_reason(id: &str, t: &str) -> (String, Vec<String>) {
    match strength_for(id, &thread(t)) {
        Err(EngineError::Invalid {
            field,
            reason,
            suggestions,
        }) => {
            assert_eq!(field, "property_class");
            (reason, suggestions)
        }
        other => panic!("{id} on {t}: expected Invalid, got {other:?}"),
    }
}

#[test]
fn grades_outside_their_size_range_are_refused() {
    // ISO 898-1: 9.8 only for d ≤ 16 mm.
    let (reason, sugg) = invalid_reason("9.8", "M20");
    assert!(reason.contains("M1.6 to M16"), "{reason}");
    assert!(sugg.contains(&"8.8".to_string()) && !sugg.contains(&"9.8".to_string()));
    assert!(strength_for("9.8", &thread("M16")).is_ok());
    // ISO 898-1 covers up to M39.
    assert!(invalid_reason("8.8", "M42").0.contains("over M16 to M39"));
    // ISO 3506-1:2009: classes 70 and 80 up to M24 (recalled from memory).
    assert!(strength_for("A2-70", &thread("M24")).is_ok());
    let (reason, sugg) = invalid_reason("A2-70", "M27");
    assert!(reason.contains("M1.6 to M24"), "{reason}");
    assert!(sugg.contains(&"A2-50".to_string()));
    // SAE J429 Grade 5: 85 ksi proof up to 1 in, 74 ksi over 1 in.
    let s = strength("grade 5", "1-8 UNC");
    assert!((s.proof_stress.get::<psi>() - 85_000.0).abs() < 1e-6);
    let s = strength("grade 5", "1-1/8-7 UNC");
    assert!((s.proof_stress.get::<psi>() - 74_000.0).abs() < 1e-6);
    assert!(invalid_reason("sae-j429-5", "#10-24")
        .0
        .contains("1/4 to 1 in"));
    assert!(invalid_reason("sae-j429-8", "2-8 UN")
        .0
        .contains("1-1/2 in"));
}

#[test]
fn grade_and_thread_form_must_match() {
    let (reason, sugg) = invalid_reason("8.8", "1/2-13 UNC");
    assert!(reason.contains("ISO metric"), "{reason}");
    assert!(sugg.contains(&"sae-j429-5".to_string()));
    assert!(invalid_reason("astm-a574", "M10").0.contains("Unified"));
    // ISO 898-1 fine threads start at M8x1 (recalled from memory).
    assert!(invalid_reason("8.8", "M6x0.75").0.contains("M8x1"));
    assert!(strength_for("8.8", &thread("M8x1")).is_ok());
}

#[test]
fn sae_j429_strengths() {
    // SAE J429, as reproduced in a supplier's technical tables and in the
    // tables of Shigley's Mechanical Engineering Design.
    let cases = [
        ("sae-j429-2", "1/2-13", 55_000.0, 57_000.0, 74_000.0),
        ("sae-j429-2", "7/8-9", 33_000.0, 36_000.0, 60_000.0),
        ("sae-j429-5", "1/2-13", 85_000.0, 92_000.0, 120_000.0),
        ("sae-j429-5", "1-1/4-7", 74_000.0, 81_000.0, 105_000.0),
        ("sae-j429-8", "1/2-20", 120_000.0, 130_000.0, 150_000.0),
    ];
    for (id, t, sp, sy, rm) in cases {
        let s = strength(id, t);
        assert!((s.proof_stress.get::<psi>() - sp).abs() < 1e-6, "{id} {t}");
        assert!((s.yield_strength_min.get::<psi>() - sy).abs() < 1e-6);
        assert!((s.tensile_strength_min.get::<psi>() - rm).abs() < 1e-6);
    }
}

#[test]
fn astm_a574_proof_loads() {
    // ASTM A574 coarse-thread proof loads (lbf), as reproduced in a
    // supplier's technical tables (a second supplier prints the same table).
    // Printed loads are 3 s.f. of As × Sp; checked within 0.5 %.
    let table = [
        ("#10-24", 2450.0),
        ("1/4-20", 4450.0),
        ("3/8-16", 10800.0),
        ("1/2-13", 19900.0),
        ("5/8-11", 30500.0),
        ("3/4-10", 45100.0),
        ("1-8", 81800.0),
        ("1-1/2-6", 190000.0),
    ];
    for (t, printed) in table {
        let g = thread(t);
        let s = strength("A574", t);
        let fp = (s.proof_stress * g.stress_area).get::<pound_force>();
        assert!(
            (fp / printed - 1.0).abs() <= 0.005,
            "{t}: {fp} lbf vs {printed}"
        );
        assert!(g.stress_area.get::<square_inch>() > 0.0);
    }
    // The proof stress switches from 140 to 135 ksi above 1/2 in.
    assert!((strength("astm-a574", "1/2-13").proof_stress.get::<psi>() - 140_000.0).abs() < 1e-6);
    assert!((strength("astm-a574", "9/16-12").proof_stress.get::<psi>() - 135_000.0).abs() < 1e-6);
}

#[test]
fn spellings_of_grades() {
    let cases = [
        ("8.8", "8.8"),
        ("10.9", "10.9"),
        (" 12.9 ", "12.9"),
        ("class 8.8", "8.8"),
        ("ISO 898-1 10.9", "10.9"),
        ("A2-70", "A2-70"),
        ("a4-80", "A4-80"),
        ("A4 70", "A4-70"),
        ("SAE J429 Grade 5", "sae-j429-5"),
        ("grade 5", "sae-j429-5"),
        ("Gr 8", "sae-j429-8"),
        ("J429-8", "sae-j429-8"),
        ("sae-j429-2", "sae-j429-2"),
        ("ASTM A574", "astm-a574"),
        ("A574", "astm-a574"),
    ];
    for (text, id) in cases {
        let g = find_property_class(text).unwrap_or_else(|e| panic!("{text}: {e}"));
        assert_eq!(g.id, id, "{text}");
    }
}

#[test]
fn unknown_grades_get_suggestions() {
    for text in ["8.9", "A2-60", "grade 9", "", "x".repeat(200).as_str()] {
        match find_property_class(text) {
            Err(EngineError::Unknown {
                field, suggestions, ..
            }) => {
                assert_eq!(field, "property_class");
                assert_eq!(suggestions.len(), 3, "{text}");
            }
            other => panic!("{text:?}: expected Unknown, got {other:?}"),
        }
    }
    match find_property_class("8.9") {
        Err(EngineError::Unknown { suggestions, .. }) => {
            assert!(suggestions.contains(&"8.8".to_string()), "{suggestions:?}")
        }
        other => panic!("{other:?}"),
    }
}

#[test]
fn every_grade_has_consistent_ranges() {
    for g in property_classes() {
        assert!(!g.size_ranges.is_empty(), "{}", g.id);
        for r in &g.size_ranges {
            assert!(r.min_diameter < r.max_diameter, "{}", g.id);
            assert!(r.proof_stress < r.tensile_strength_min, "{}", g.id);
            assert!(r.yield_strength_min < r.tensile_strength_min, "{}", g.id);
        }
        assert_eq!(find_property_class(g.id).map(|x| x.id), Ok(g.id));
    }
}

proptest::proptest! {
    #[test]
    fn grade_lookup_never_panics(s in "\\PC{0,60}") {
        let _ = find_property_class(&s);
    }
}

#[test]
fn the_added_grades_are_found_by_their_usual_names_and_keep_their_sizes() {
    // Values recalled from memory (see grade/table.rs): A193 B7 125 ksi to
    // 2-1/2 in; A325 and A490 from 1/2 in; J429 Grade 8.2 to 1 in; ISO
    // 3506-1:2020 class 100 Rm 1000 MPa to M24.
    for (name, id) in [
        ("B7", "astm-a193-b7"),
        ("ASTM A193 B7M", "astm-a193-b7m"),
        ("A320 L7", "astm-a320-l7"),
        ("A325", "astm-f3125-a325"),
        ("ASTM F3125 A490", "astm-f3125-a490"),
        ("A449", "astm-a449"),
        ("SAE J429 Grade 1", "sae-j429-1"),
        ("grade 8.2", "sae-j429-8.2"),
        ("A4-100", "A4-100"),
        ("a5-70", "A5-70"),
        ("A1-50", "A1-50"),
        ("A3-80", "A3-80"),
    ] {
        assert_eq!(find_property_class(name).unwrap().id, id, "{name}");
    }
    let ksi = |g: &str, t: &str| {
        strength_for(g, &parse_designation(t).unwrap())
            .map(|s| s.tensile_strength_min.get::<psi>() / 1000.0)
    };
    assert!((ksi("B7", "1-8").unwrap() - 125.0).abs() < 1e-9);
    assert!((ksi("A490", "3/4-10").unwrap() - 150.0).abs() < 1e-9);
    assert_eq!(ksi("A325", "3/8-16").unwrap_err().field(), "property_class");
    assert_eq!(
        ksi("grade 8.2", "1-1/4-7").unwrap_err().field(),
        "property_class"
    );
    assert_eq!(ksi("B7", "M12").unwrap_err().field(), "property_class");
    let m30 = parse_designation("M30").unwrap();
    assert_eq!(
        strength_for("A4-100", &m30).unwrap_err().field(),
        "property_class"
    );
    let m20 = parse_designation("M20").unwrap();
    let s = strength_for("A4-100", &m20).unwrap();
    assert!((s.tensile_strength_min.get::<megapascal>() - 1000.0).abs() < 1e-9);
}
