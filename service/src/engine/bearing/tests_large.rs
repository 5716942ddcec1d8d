//! M42–M64 heads, nuts and washers; inch nut faces; flange faces; every
//! size range enforced with a problem naming the standard's range.

use super::*;
use crate::engine::thread::parse_designation;

fn thread(t: &str) -> ThreadGeometry {
    parse_designation(t).unwrap_or_else(|e| panic!("{t}: {e}"))
}

fn surface(t: &str, head: HeadType, washer: Washer) -> Result<BearingSurface, EngineError> {
    bearing_surface(&thread(t), head, washer, HoleSeries::Medium)
}

fn mm(l: Length) -> f64 {
    l.get::<millimeter>()
}

fn inches(l: Length) -> f64 {
    l.get::<inch>()
}

fn refusal(r: Result<BearingSurface, EngineError>, field: &str) -> String {
    match r {
        Err(EngineError::Invalid {
            field: f, reason, ..
        }) => {
            assert_eq!(f, field, "{reason}");
            reason
        }
        other => panic!("expected Invalid on {field}, got {other:?}"),
    }
}

#[test]
fn hexagon_heads_and_nuts_m42_to_m64() {
    // ISO 4014/4017 and ISO 4032 product grade B (recalled from memory):
    // (size, s, d_w,min).
    for (t, s, dw) in [
        ("M42", 65.0, 59.95),
        ("M48", 75.0, 69.45),
        ("M56", 85.0, 78.66),
        ("M64", 95.0, 88.16),
        ("M48x3", 75.0, 69.45),
    ] {
        for head in [HeadType::HexagonHead, HeadType::HexagonNut] {
            let b = surface(t, head, Washer::None).unwrap();
            assert!((mm(b.outer_diameter) - dw).abs() < 1e-9, "{t} {b:?}");
            assert!(b.source.contains(&format!("s {s} mm")), "{}", b.source);
            assert!(b.source.contains("product grade B"), "{}", b.source);
        }
    }
    // ISO 273 medium M48: 52 mm (recalled from memory).
    let b = surface("M48", HeadType::HexagonHead, Washer::None).unwrap();
    assert!((mm(b.inner_diameter) - 52.0).abs() < 1e-9);
}

#[test]
fn washers_above_m36() {
    // ISO 7089 / ISO 7090 (recalled from memory): (size, d1, d2, h).
    for (t, d1, d2, h) in [
        ("M39", 42.0, 72.0, 6.0),
        ("M42", 45.0, 78.0, 8.0),
        ("M48", 52.0, 92.0, 8.0),
        ("M56", 62.0, 105.0, 10.0),
        ("M64", 70.0, 115.0, 10.0),
    ] {
        for washer in [Washer::Plain, Washer::PlainChamfered] {
            let b = surface(t, HeadType::HexagonHead, washer).unwrap();
            assert!((mm(b.inner_diameter) - d1).abs() < 1e-9, "{t} {b:?}");
            let text = format!("d1 {d1} mm, d2 {d2} mm, h {h} mm");
            assert!(b.source.contains(&text), "{text} in {}", b.source);
            let w = washer_bearing(&thread(t), washer, HoleSeries::Medium)
                .unwrap()
                .unwrap();
            assert!((mm(w.outer_diameter) - d2).abs() < 1e-9);
        }
    }
    // ISO 7090 starts at M5; ISO 7089 at M1.6.
    let r = refusal(
        surface("M4", HeadType::HexagonHead, Washer::PlainChamfered),
        "washer",
    );
    assert!(r.contains("ISO 7090") && r.contains("M5 to M64"), "{r}");
    assert!(surface("M4", HeadType::HexagonHead, Washer::Plain).is_ok());
    let r = refusal(
        surface("1/2-13 UNC", HeadType::HexagonHead, Washer::PlainChamfered),
        "washer",
    );
    assert!(r.contains("ISO 7090"), "{r}");
}

#[test]
fn head_ranges_are_enforced_naming_the_standard() {
    let r = refusal(surface("M48", HeadType::SocketHead, Washer::None), "head");
    assert!(r.contains("ISO 4762") && r.contains("M3 to M39"), "{r}");
    let r = refusal(
        surface("M24", HeadType::HexagonFlange, Washer::None),
        "head",
    );
    assert!(r.contains("ISO 4162") && r.contains("M5 to M20"), "{r}");
    let r = refusal(
        surface("M4", HeadType::HexagonFlangeNut, Washer::None),
        "head",
    );
    assert!(r.contains("ISO 4161") && r.contains("M5 to M20"), "{r}");
    let r = refusal(surface("M20", HeadType::HeavyHexNut, Washer::None), "head");
    assert!(r.contains("Unified inch threads only"), "{r}");
    let r = refusal(
        surface("1/2-13 UNC", HeadType::HexagonFlangeNut, Washer::None),
        "head",
    );
    assert!(r.contains("metric"), "{r}");
    let r = refusal(
        surface("#10-24 UNC", HeadType::HexagonNut, Washer::None),
        "head",
    );
    assert!(
        r.contains("ASME B18.2.2") && r.contains("1/4 to 1-1/2 in"),
        "{r}"
    );
}

#[test]
fn flange_faces() {
    // ISO 4162 M10: d_w,min 19.6 mm, d_c max 22.3 mm; ISO 4161 M10: d_w,min
    // 19.6 mm, d_c max 21.8 mm (recalled from memory).
    let b = surface("M10", HeadType::HexagonFlange, Washer::None).unwrap();
    assert!((mm(b.outer_diameter) - 19.6).abs() < 1e-9);
    assert!(b.source.contains("d_c max 22.3 mm"), "{}", b.source);
    let n = surface("M10", HeadType::HexagonFlangeNut, Washer::None).unwrap();
    assert!((mm(n.outer_diameter) - 19.6).abs() < 1e-9);
    assert!(n.source.contains("ISO 4161") && n.source.contains("d_c max 21.8 mm"));
}

#[test]
fn inch_nut_faces() {
    // ASME B18.2.2 (recalled from memory): 1/2 hex nut F 3/4 in, min 0.736;
    // 1 in heavy hex nut F 1-5/8 in, min 1.575; 1-1/2 in heavy hex F
    // 2-3/8 in, min 2.300.
    let b = surface("1/2-13 UNC", HeadType::HexagonNut, Washer::None).unwrap();
    assert!((inches(b.outer_diameter) - 0.736).abs() < 1e-9);
    assert!(b.source.contains("ASME B18.2.2 hex nut") && b.source.contains("F 0.75 in"));
    let b = surface("1-8 UNC", HeadType::HeavyHexNut, Washer::None).unwrap();
    assert!((inches(b.outer_diameter) - 1.575).abs() < 1e-9);
    let b = surface("1-1/2-6 UNC", HeadType::HeavyHexNut, Washer::None).unwrap();
    assert!((inches(b.outer_diameter) - 2.3).abs() < 1e-9);
    // Heavy hex nuts are wider than hex nuts of the same size.
    for t in ["1/2-13 UNC", "3/4-10 UNC", "1-8 UNC", "1-1/2-6 UNC"] {
        let hex = surface(t, HeadType::HexagonNut, Washer::None).unwrap();
        let heavy = surface(t, HeadType::HeavyHexNut, Washer::None).unwrap();
        assert!(heavy.outer_diameter > hex.outer_diameter, "{t}");
    }
}

#[test]
fn tables_are_ordered_and_consistent() {
    // Within every table, d_w grows with size and stays below s or d_c.
    for w in table::ISO4017.windows(2) {
        assert!(w[0].0 < w[1].0 && w[0].3 < w[1].3, "{w:?}");
    }
    for r in table::ISO4017 {
        assert!(r.3 < r.1, "{r:?}");
    }
    for tab in [table::ISO4161, table::ISO4162] {
        for r in tab {
            assert!(r.2 < r.1, "{r:?}");
        }
    }
    for tab in [table::B18_2_2_HEX, table::B18_2_2_HEAVY] {
        for r in tab {
            assert!(r.2 < r.1 && r.1 > r.0, "{r:?}");
        }
    }
    for w in table::ISO7089.windows(2) {
        assert!(
            w[0].1 < w[1].1 && w[0].2 < w[1].2 && w[0].3 <= w[1].3,
            "{w:?}"
        );
    }
}

proptest::proptest! {
    /// No tabulated thread, head, washer and hole combination panics; each
    /// answers with finite diameters or a refusal naming its field.
    #[test]
    fn every_size_head_and_washer_answers(i in 0usize..400, h in 0usize..32, w in 0usize..8, s in 0usize..8) {
        let threads: Vec<ThreadGeometry> = crate::engine::thread::standard_threads().collect();
        let t = &threads[i % threads.len()];
        let head = HeadType::ALL[h % HeadType::ALL.len()];
        let washer = Washer::ALL[w % Washer::ALL.len()];
        let hole = HoleSeries::ALL[s % HoleSeries::ALL.len()];
        match bearing_surface(t, head, washer, hole) {
            Ok(b) => proptest::prop_assert!(
                b.outer_diameter.value.is_finite() && b.outer_diameter > b.inner_diameter
                    || washer != Washer::None
            ),
            Err(e) => proptest::prop_assert!(["head", "washer", "hole"].contains(&e.field())),
        }
        let _ = washer_bearing(t, washer, hole);
    }
}
