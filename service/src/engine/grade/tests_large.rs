//! Metric sizes above M39: the ASTM A193M / A320M grades, and the ISO
//! refusals that name them.

use super::*;
use crate::engine::thread::{parse_designation, ThreadGeometry};

fn thread(text: &str) -> ThreadGeometry {
    parse_designation(text).unwrap_or_else(|e| panic!("{text}: {e}"))
}

fn mpa(p: Pressure) -> f64 {
    p.get::<megapascal>()
}

fn refusal(id: &str, t: &str) -> (String, Vec<String>) {
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
fn a193m_b7_to_m64_and_its_larger_steps() {
    // ASTM A193/A193M B7, metric values (recalled from memory): 860/720 MPa
    // to M64, 795/655 MPa over M64 to M100.
    for t in ["M42", "M48", "M56", "M64", "M48x3", "M64x4"] {
        let s = strength_for("astm-a193m-b7", &thread(t)).unwrap();
        assert_eq!(mpa(s.tensile_strength_min), 860.0, "{t}");
        assert_eq!(mpa(s.yield_strength_min), 720.0, "{t}");
        assert_eq!(mpa(s.proof_stress), 720.0, "{t}");
        assert!(s.standard.contains("A193/A193M"), "{}", s.standard);
        assert!(s.standard.contains("up to M64"), "{}", s.standard);
    }
    let b7 = find_property_class("astm-a193m-b7").unwrap();
    let over = b7
        .size_ranges
        .iter()
        .find(|r| r.covers(Length::new::<millimeter>(80.0)))
        .unwrap();
    assert_eq!(mpa(over.tensile_strength_min), 795.0);
    assert_eq!(mpa(over.yield_strength_min), 655.0);
    // B7M 690/550 MPa, A320M L7 860/725 MPa (recalled from memory).
    let b7m = strength_for("astm-a193m-b7m", &thread("M52")).unwrap();
    assert_eq!(
        (mpa(b7m.tensile_strength_min), mpa(b7m.yield_strength_min)),
        (690.0, 550.0)
    );
    let l7 = strength_for("astm-a320m-l7", &thread("M60")).unwrap();
    assert_eq!(
        (mpa(l7.tensile_strength_min), mpa(l7.yield_strength_min)),
        (860.0, 725.0)
    );
    // B8M class 1 515/205 MPa at every diameter (recalled from memory).
    let b8m = strength_for("astm-a193m-b8m-1", &thread("M56")).unwrap();
    assert_eq!(
        (mpa(b8m.tensile_strength_min), mpa(b8m.yield_strength_min)),
        (515.0, 205.0)
    );
}

#[test]
fn spellings_of_the_metric_astm_grades() {
    for (text, id) in [
        ("ASTM A193M B7", "astm-a193m-b7"),
        ("A193M-B7M", "astm-a193m-b7m"),
        ("a320m l7", "astm-a320m-l7"),
        ("A193M B8M class 1", "astm-a193m-b8m-1"),
        ("A193M B8 class 1", "astm-a193m-b8-1"),
    ] {
        assert_eq!(find_property_class(text).unwrap().id, id, "{text}");
    }
    // Plain `B7` stays the inch grade.
    assert_eq!(find_property_class("B7").unwrap().id, "astm-a193-b7");
}

#[test]
fn iso_898_1_above_m39_names_its_scope_and_what_covers_larger_sizes() {
    for t in ["M42", "M48x3", "M64"] {
        let (reason, sugg) = refusal("10.9", t);
        assert!(
            reason.contains("ISO 898-1 covers metric bolts to M39"),
            "{reason}"
        );
        assert!(reason.contains("A193/A193M"), "{reason}");
        assert_eq!(sugg, ["astm-a193m-b7", "astm-a193m-b7m", "astm-a320m-l7"]);
    }
    // Inside M39 the old refusal stays (9.8 stops at M16).
    let (reason, _) = refusal("9.8", "M20");
    assert!(!reason.contains("A193"), "{reason}");
}

#[test]
fn iso_3506_above_m39_points_to_the_stainless_a193m_grades() {
    let (reason, sugg) = refusal("A4-70", "M56");
    assert!(
        reason.contains("ISO 3506-1 covers metric bolts to M39"),
        "{reason}"
    );
    assert_eq!(sugg, ["astm-a193m-b8-1", "astm-a193m-b8m-1"]);
    assert!(crate::engine::spec::is_stainless_grade("astm-a193m-b8m-1"));
    assert!(!crate::engine::spec::is_stainless_grade("astm-a193m-b7"));
}

#[test]
fn inch_grades_on_metric_threads_name_their_metric_edition() {
    let (reason, sugg) = refusal("astm-a193-b7", "M48");
    assert!(reason.contains("astm-a193m-b7"), "{reason}");
    assert_eq!(sugg, ["astm-a193m-b7"]);
    let (_, sugg) = refusal("astm-a449", "M48");
    assert_eq!(sugg, ["astm-a193m-b7", "astm-a193m-b7m", "astm-a320m-l7"]);
    // And the metric grades refuse inch threads.
    let (reason, _) = refusal("astm-a193m-b7", "1-8 UNC");
    assert!(reason.contains("ISO metric"), "{reason}");
}

#[test]
fn every_tabulated_thread_and_grade_answers_without_panic() {
    // Exhaustive over the thread table (M1.6 to M64 and the Unified sizes):
    // every answer is a strength with finite values or a named refusal.
    for t in crate::engine::thread::standard_threads() {
        for g in property_classes() {
            match strength_for(g.id, &t) {
                Ok(s) => assert!(
                    mpa(s.tensile_strength_min).is_finite() && mpa(s.proof_stress) > 0.0,
                    "{} {}",
                    g.id,
                    t.designation
                ),
                Err(e) => assert_eq!(e.field(), "property_class", "{e}"),
            }
        }
    }
}
