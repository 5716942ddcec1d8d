use super::*;
use crate::engine::EngineError;
use proptest::prelude::*;
use uom::si::area::{square_inch, square_millimeter};

fn mm(x: &Length) -> f64 {
    x.get::<millimeter>()
}

fn parsed(text: &str) -> ThreadGeometry {
    match parse_designation(text) {
        Ok(g) => g,
        Err(e) => panic!("{text:?} did not parse: {e}"),
    }
}

/// Rounds to `sig` significant figures, half away from zero.
fn round_sig(x: f64, sig: i32) -> f64 {
    let mag = 10f64.powi(sig - 1 - x.abs().log10().floor() as i32);
    (x * mag).round() / mag
}

#[test]
fn iso_898_1_nominal_stress_areas_coarse_m3_to_m39() {
    // ISO 898-1 nominal stress areas As,nom (mm²), as reproduced by supplier
    // tables of EN ISO 898-1 ("minimum ultimate tensile loads for metric coarse
    // pitch thread EN ISO 898-1"; a second supplier's table agrees).
    // Printed to 3 significant figures (M3–M8 to 2 decimals below 10 mm²).
    let table: &[(&str, f64, i32)] = &[
        ("M3", 5.03, 3),
        ("M3.5", 6.78, 3),
        ("M4", 8.78, 3),
        ("M5", 14.2, 3),
        ("M6", 20.1, 3),
        ("M7", 28.9, 3),
        ("M8", 36.6, 3),
        ("M10", 58.0, 3),
        ("M12", 84.3, 3),
        ("M14", 115.0, 3),
        ("M16", 157.0, 3),
        ("M18", 192.0, 3),
        ("M20", 245.0, 3),
        ("M22", 303.0, 3),
        ("M24", 353.0, 3),
        ("M27", 459.0, 3),
        ("M30", 561.0, 3),
        ("M33", 694.0, 3),
        ("M36", 817.0, 3),
        ("M39", 976.0, 3),
    ];
    for (text, printed, sig) in table {
        let g = parsed(text);
        let a = g.stress_area.get::<square_millimeter>();
        assert_eq!(round_sig(a, *sig), *printed, "{text}: As = {a}");
        assert_eq!(g.series, ThreadSeries::Coarse);
    }
}

#[test]
fn asme_b1_1_tensile_stress_areas_within_half_percent() {
    // ASME B1.1 tensile stress areas (in²), printed values: UNC from the
    // ASTM A574 data table as reproduced in a supplier's technical tables (per
    // Handbook H-28), UNF from the ASME B1.1 table as reproduced in another
    // supplier's technical tables.
    let table: &[(&str, f64)] = &[
        ("1/4-20 UNC", 0.0318),
        ("5/16-18 UNC", 0.0524),
        ("3/8-16 UNC", 0.0775),
        ("7/16-14 UNC", 0.1063),
        ("1/2-13 UNC", 0.1419),
        ("9/16-12 UNC", 0.182),
        ("5/8-11 UNC", 0.226),
        ("3/4-10 UNC", 0.334),
        ("7/8-9 UNC", 0.462),
        ("1-8 UNC", 0.606),
        ("1-1/8-7 UNC", 0.763),
        ("1-1/4-7 UNC", 0.969),
        ("1-3/8-6 UNC", 1.155),
        ("1-1/2-6 UNC", 1.405),
        ("1/4-28 UNF", 0.0364),
        ("5/16-24 UNF", 0.058),
        ("3/8-24 UNF", 0.0878),
        ("7/16-20 UNF", 0.1187),
        ("1/2-20 UNF", 0.1599),
        ("9/16-18 UNF", 0.203),
        ("5/8-18 UNF", 0.256),
        ("3/4-16 UNF", 0.373),
        ("7/8-14 UNF", 0.509),
        ("1-12 UNF", 0.663),
        ("1-1/8-12 UNF", 0.856),
        ("1-1/4-12 UNF", 1.073),
        ("1-3/8-12 UNF", 1.315),
        ("1-1/2-12 UNF", 1.581),
    ];
    for (text, printed) in table {
        let a = parsed(text).stress_area.get::<square_inch>();
        assert!(
            (a / printed - 1.0).abs() <= 0.005,
            "{text}: As = {a} in², printed {printed}"
        );
    }
}

#[test]
fn metric_spellings() {
    let cases: &[(&str, &str, ThreadSeries, f64, f64)] = &[
        ("M10", "M10", ThreadSeries::Coarse, 10.0, 1.5),
        ("M10x1.25", "M10x1.25", ThreadSeries::Fine, 10.0, 1.25),
        ("M10×1.25", "M10x1.25", ThreadSeries::Fine, 10.0, 1.25),
        ("m10 x 1,25", "M10x1.25", ThreadSeries::Fine, 10.0, 1.25),
        ("M10x1.5", "M10", ThreadSeries::Coarse, 10.0, 1.5),
        ("  M12X1.5 ", "M12x1.5", ThreadSeries::Fine, 12.0, 1.5),
        ("M1.6", "M1.6", ThreadSeries::Coarse, 1.6, 0.35),
        ("M64x4", "M64x4", ThreadSeries::Fine, 64.0, 4.0),
        ("M8-6g", "M8", ThreadSeries::Coarse, 8.0, 1.25),
    ];
    for (text, norm, series, d, p) in cases {
        let g = parsed(text);
        assert_eq!(g.designation, *norm, "{text}");
        assert_eq!(g.series, *series, "{text}");
        assert_eq!(g.form, ThreadForm::IsoMetric);
        assert!((mm(&g.nominal_diameter) - d).abs() < 1e-9, "{text}");
        assert!((mm(&g.pitch) - p).abs() < 1e-9, "{text}");
        assert!(!g.custom);
    }
}

#[test]
fn unified_spellings() {
    let cases: &[(&str, &str, ThreadSeries, f64, f64)] = &[
        ("1/2-13 UNC", "1/2-13 UNC", ThreadSeries::Unc, 0.5, 13.0),
        ("1/2-13", "1/2-13 UNC", ThreadSeries::Unc, 0.5, 13.0),
        ("1/2-13UNC", "1/2-13 UNC", ThreadSeries::Unc, 0.5, 13.0),
        ("#10-24", "#10-24 UNC", ThreadSeries::Unc, 0.19, 24.0),
        ("10-24 UNC", "#10-24 UNC", ThreadSeries::Unc, 0.19, 24.0),
        ("#10-32", "#10-32 UNF", ThreadSeries::Unf, 0.19, 32.0),
        ("0.500-13 UNC", "1/2-13 UNC", ThreadSeries::Unc, 0.5, 13.0),
        ("3/4-10 UNC-2A", "3/4-10 UNC", ThreadSeries::Unc, 0.75, 10.0),
        ("1-8 UNC", "1-8 UNC", ThreadSeries::Unc, 1.0, 8.0),
        ("1-1/4-7 UNC", "1-1/4-7 UNC", ThreadSeries::Unc, 1.25, 7.0),
        ("1-8 UN", "1-8 UN", ThreadSeries::Un8, 1.0, 8.0),
        ("1-1/4-8 UN", "1-1/4-8 UN", ThreadSeries::Un8, 1.25, 8.0),
        ("1-1/4-8", "1-1/4-8 UN", ThreadSeries::Un8, 1.25, 8.0),
        ("2-8 UN", "2-8 UN", ThreadSeries::Un8, 2.0, 8.0),
        ("2-56", "#2-56 UNC", ThreadSeries::Unc, 0.086, 56.0),
        ("1/4-28 unf 3a", "1/4-28 UNF", ThreadSeries::Unf, 0.25, 28.0),
    ];
    for (text, norm, series, d, tpi) in cases {
        let g = parsed(text);
        assert_eq!(g.designation, *norm, "{text}");
        assert_eq!(g.series, *series, "{text}");
        assert_eq!(g.form, ThreadForm::Unified);
        assert!(
            (g.nominal_diameter.get::<inch>() - d).abs() < 1e-9,
            "{text}"
        );
        assert!((1.0 / g.pitch.get::<inch>() - tpi).abs() < 1e-9, "{text}");
    }
}

#[test]
fn numbered_size_diameter_rule() {
    // ASME B1.1: number-size basic major diameter = 0.060 + 0.013·N in.
    for (n, tpi) in [(2, 56), (4, 40), (6, 32), (8, 32), (12, 24)] {
        let g = parsed(&format!("#{n}-{tpi}"));
        let expected = 0.060 + 0.013 * f64::from(n);
        assert!((g.nominal_diameter.get::<inch>() - expected).abs() < 1e-9);
    }
}

fn suggestions_of(text: &str) -> Vec<String> {
    match parse_designation(text) {
        Err(EngineError::Invalid {
            field, suggestions, ..
        }) => {
            assert_eq!(field, "thread");
            suggestions
        }
        other => panic!("{text:?}: expected Invalid, got {other:?}"),
    }
}

#[test]
fn non_standard_pairs_name_the_nearest_standard_ones() {
    let s = suggestions_of("M10x1.3");
    assert!(s.contains(&"M10".to_string()) && s.contains(&"M10x1.25".to_string()));
    let s = suggestions_of("M11");
    assert_eq!(s, vec!["M10".to_string(), "M12".to_string()]);
    let s = suggestions_of("1/2-14");
    assert_eq!(s, vec!["1/2-13 UNC".to_string(), "1/2-20 UNF".to_string()]);
    let s = suggestions_of("1/2-20 UNC");
    assert!(s.contains(&"1/2-20 UNF".to_string()));
    let s = suggestions_of("0.51-13");
    assert!(s.contains(&"1/2-13 UNC".to_string()));
    // 8-UN is tabulated only from 1 in.
    assert!(suggestions_of("3/4-8 UN").contains(&"3/4-10 UNC".to_string()));
}

#[test]
fn unreadable_text_is_malformed() {
    for text in [
        "",
        "   ",
        "bolt",
        "M",
        "Mx1.5",
        "M10x",
        "M10 fine",
        "1/2",
        "1/2-",
        "1/2-13 UNC extra",
        "1/0-13",
        "#-24",
    ] {
        match parse_designation(text) {
            Err(EngineError::Malformed { field, .. }) => assert_eq!(field, "thread", "{text}"),
            other => panic!("{text:?}: expected Malformed, got {other:?}"),
        }
    }
    assert!(matches!(
        parse_designation("1/4-32 UNEF"),
        Err(EngineError::Unknown { .. })
    ));
}

#[test]
fn geometry_formulas_and_areas() {
    // ISO 68-1 / ISO 724 basic dimensions: M12 d2 = 10.863, d3 = 9.853 mm.
    let g = parsed("M12");
    assert!((mm(&g.pitch_diameter) - 10.863).abs() < 5e-4);
    assert!((mm(&g.minor_diameter) - 9.853).abs() < 5e-4);
    let d3 = mm(&g.minor_diameter);
    let a3 = g.minor_diameter_area().get::<square_millimeter>();
    assert!((a3 - std::f64::consts::PI / 4.0 * d3 * d3).abs() < 1e-9);
    let an = g.nominal_area().get::<square_millimeter>();
    assert!((an - std::f64::consts::PI * 36.0).abs() < 1e-9);
    assert!((g.half_flank_angle().get::<degree>() - 30.0).abs() < 1e-12);
}

#[test]
fn custom_threads_are_flagged_and_validated() {
    let g = custom_thread(
        ThreadForm::IsoMetric,
        Length::new::<millimeter>(10.5),
        Length::new::<millimeter>(1.1),
    )
    .expect("valid custom thread");
    assert!(g.custom);
    assert_eq!(g.series, ThreadSeries::Custom);
    assert_eq!(g.designation, "M10.5x1.1");
    let g = custom_thread(
        ThreadForm::Unified,
        Length::new::<inch>(0.5),
        Length::new::<inch>(1.0 / 14.0),
    )
    .expect("valid custom inch thread");
    assert_eq!(g.designation, "0.5-14 UN");
    let bad = [
        (f64::NAN, 1.0, "thread.nominal_diameter"),
        (-3.0, 1.0, "thread.nominal_diameter"),
        (10.0, 0.0, "thread.pitch"),
        (10.0, f64::INFINITY, "thread.pitch"),
        (10.0, 3.0, "thread.pitch"),
    ];
    for (d, p, field) in bad {
        let e = custom_thread(
            ThreadForm::IsoMetric,
            Length::new::<millimeter>(d),
            Length::new::<millimeter>(p),
        )
        .expect_err("must refuse");
        assert_eq!(e.field(), field);
    }
}

#[test]
fn every_standard_thread_round_trips_through_the_parser() {
    let mut count = 0;
    for g in standard_threads() {
        let again = parsed(&g.designation);
        assert_eq!(again, g, "{}", g.designation);
        count += 1;
    }
    assert!(count > 100, "{count} threads");
}

proptest! {
    #[test]
    fn parser_never_panics(s in "\\PC{0,40}") {
        let _ = parse_designation(&s);
    }

    #[test]
    fn parser_never_panics_on_designation_like_text(s in "[Mm#0-9 ./,x×\\-UNCFRAB]{0,24}") {
        let _ = parse_designation(&s);
    }
}

proptest! {
    #[test]
    fn custom_thread_never_panics(d in proptest::num::f64::ANY, p in proptest::num::f64::ANY, inch_form in any::<bool>()) {
        let form = if inch_form { ThreadForm::Unified } else { ThreadForm::IsoMetric };
        if let Ok(g) = custom_thread(form, Length::new::<millimeter>(d), Length::new::<millimeter>(p)) {
            prop_assert!(g.custom);
            prop_assert!(g.stress_area.get::<square_millimeter>() > 0.0);
            prop_assert!(g.minor_diameter < g.pitch_diameter);
        }
    }
}
