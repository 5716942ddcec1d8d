use super::*;
use crate::engine::thread::parse_designation;

fn thread(t: &str) -> ThreadGeometry {
    parse_designation(t).unwrap_or_else(|e| panic!("{t}: {e}"))
}

fn mm(l: Length) -> f64 {
    l.get::<millimeter>()
}

#[test]
fn m12_hexagon_head_medium_hole() {
    // D_Km = (16.63 + 13.5)/2: ISO 4017 product grade A d_w,min 16.63 mm
    // (recalled from memory) and ISO 273 medium 13.5 mm (as reproduced in a
    // supplier's technical tables, "conform to ISO 273").
    let b = bearing_surface(
        &thread("M12"),
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Medium,
    )
    .expect("tabulated");
    assert!((mm(b.mean_diameter()) - (16.63 + 13.5) / 2.0).abs() < 1e-9);
    assert!(b.source.contains("ISO 4014/4017") && b.source.contains("ISO 273"));
}

#[test]
fn published_rows() {
    // ISO 273 fine/medium/coarse (as reproduced in a supplier's technical tables).
    let t = thread("M8");
    let holes: Vec<f64> = HoleSeries::ALL
        .iter()
        .map(|h| (mm(clearance_hole(&t, *h).expect("row")) * 1e6).round() / 1e6)
        .collect();
    assert_eq!(holes, vec![8.4, 9.0, 10.0]);
    // ISO 4017 d_w,min grade A M10 14.63 (manufacturer's ISO 4017 table).
    let b = bearing_surface(
        &thread("M10"),
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Fine,
    )
    .expect("row");
    assert!((mm(b.outer_diameter) - 14.63).abs() < 1e-9);
    assert!((mm(b.inner_diameter) - 10.5).abs() < 1e-9);
    assert!(!b.source.contains("memory"), "{}", b.source);
}

#[test]
fn product_grade_b_above_m24_and_nut_above_m16() {
    let hb = |t: &str, h| {
        let v = mm(
            bearing_surface(&thread(t), h, Washer::None, HoleSeries::Medium)
                .expect("row")
                .outer_diameter,
        );
        (v * 1e6).round() / 1e6
    };
    assert_eq!(hb("M24", HeadType::HexagonHead), 33.61);
    assert_eq!(hb("M30", HeadType::HexagonHead), 42.75);
    assert_eq!(hb("M16", HeadType::HexagonNut), 22.49);
    assert_eq!(hb("M20", HeadType::HexagonNut), 27.7);
}

#[test]
fn washer_rules() {
    let t = thread("M12");
    let b =
        bearing_surface(&t, HeadType::HexagonHead, Washer::Plain, HoleSeries::Coarse).expect("row");
    // Head d_w 16.63 < washer outer 24: the head face bounds the outside;
    // the washer inner diameter 13 bounds the inside.
    assert!((mm(b.outer_diameter) - 16.63).abs() < 1e-9);
    assert!((mm(b.inner_diameter) - 13.0).abs() < 1e-9);
}

#[test]
fn inch_bearing() {
    let t = thread("1/2-13 UNC");
    let b =
        bearing_surface(&t, HeadType::HexagonHead, Washer::None, HoleSeries::Medium).expect("row");
    // ASME B18.2.1 F min 0.736 in (as reproduced in a supplier's technical tables).
    assert!((b.outer_diameter.get::<inch>() - 0.736).abs() < 1e-9);
    assert!(b.source.contains("assumption"));
    assert!(bearing_surface(&t, HeadType::SocketHead, Washer::Plain, HoleSeries::Fine).is_ok());
    // Inch nuts: ASME B18.2.2 (see tests_large.rs); inch flange heads are
    // not tabulated.
    assert!(bearing_surface(&t, HeadType::HexagonNut, Washer::None, HoleSeries::Fine).is_ok());
    let e = bearing_surface(&t, HeadType::HexagonFlange, Washer::None, HoleSeries::Fine)
        .expect_err("no inch flange table");
    assert_eq!(e.field(), "head");
}

#[test]
fn missing_rows_ask_for_explicit_bearing() {
    let cases = [
        ("M48", HeadType::SocketHead, Washer::None, "head"),
        ("M3", HeadType::HexagonFlange, Washer::None, "head"),
        ("M12", HeadType::HeavyHexHead, Washer::None, "head"),
        (
            "M4",
            HeadType::HexagonHead,
            Washer::PlainChamfered,
            "washer",
        ),
        ("2-8 UN", HeadType::HexagonHead, Washer::None, "head"),
    ];
    for (t, h, w, field) in cases {
        match bearing_surface(&thread(t), h, w, HoleSeries::Medium) {
            Err(EngineError::Invalid {
                field: f, reason, ..
            }) => {
                assert_eq!(f, field, "{t}");
                assert!(reason.contains("bearing.outer_diameter"), "{reason}");
            }
            other => panic!("{t}: {other:?}"),
        }
    }
}

#[test]
fn explicit_bearing_validation() {
    let l = Length::new::<millimeter>;
    assert!(explicit_bearing(l(20.0), l(13.0)).is_ok());
    for (o, i, field) in [
        (f64::NAN, 13.0, "bearing.outer_diameter"),
        (20.0, -1.0, "bearing.inner_diameter"),
        (13.0, 13.0, "bearing.outer_diameter"),
        (f64::INFINITY, 1.0, "bearing.outer_diameter"),
    ] {
        assert_eq!(
            explicit_bearing(l(o), l(i)).expect_err("refuse").field(),
            field
        );
    }
}

#[test]
fn ids_parse_and_unknowns_suggest() {
    for h in head_types() {
        assert_eq!(h.id().parse::<HeadType>(), Ok(*h));
    }
    assert_eq!("Socket Head".parse::<HeadType>(), Ok(HeadType::SocketHead));
    assert_eq!(HoleSeries::try_from("MEDIUM"), Ok(HoleSeries::Medium));
    assert_eq!("plain".parse::<Washer>(), Ok(Washer::Plain));
    match "hex-head".parse::<HeadType>() {
        Err(EngineError::Unknown {
            field, suggestions, ..
        }) => {
            assert_eq!(field, "head");
            assert!(suggestions.contains(&"hexagon-head".to_string()));
        }
        other => panic!("{other:?}"),
    }
    assert_eq!(
        "huge".parse::<HoleSeries>().expect_err("unknown").field(),
        "hole"
    );
}

#[test]
fn every_tabulated_thread_either_resolves_or_refuses_cleanly() {
    for t in crate::engine::thread::standard_threads() {
        for h in head_types() {
            for w in washers() {
                for s in hole_series() {
                    match bearing_surface(&t, *h, *w, *s) {
                        Ok(b) => assert!(
                            b.outer_diameter > b.inner_diameter,
                            "{} {:?}",
                            t.designation,
                            h
                        ),
                        Err(e) => assert!(matches!(e, EngineError::Invalid { .. })),
                    }
                }
            }
        }
    }
}

#[test]
fn pan_and_button_heads_bear_on_their_head_diameter() {
    // ISO 7045 pan head M5 d_k 9.5 mm; ISO 7380-1 button head M8 d_k 14 mm
    // (recalled from memory); ISO 273 medium holes 5.5 and 9 mm.
    let m5 = parse_designation("M5").unwrap();
    let pan = bearing_surface(&m5, HeadType::PanHead, Washer::None, HoleSeries::Medium).unwrap();
    assert!((pan.outer_diameter.get::<millimeter>() - 9.5).abs() < 1e-9);
    assert!(pan.source.contains("recalled from memory"));
    let m8 = parse_designation("M8").unwrap();
    let button =
        bearing_surface(&m8, HeadType::ButtonHead, Washer::None, HoleSeries::Medium).unwrap();
    assert!((button.outer_diameter.get::<millimeter>() - 14.0).abs() < 1e-9);
    // Outside the tables, and on inch threads: refused naming `head`.
    let m20 = parse_designation("M20").unwrap();
    let e = bearing_surface(&m20, HeadType::PanHead, Washer::None, HoleSeries::Medium).unwrap_err();
    assert_eq!(e.field(), "head");
    let unc = parse_designation("1/4-20").unwrap();
    let e =
        bearing_surface(&unc, HeadType::ButtonHead, Washer::None, HoleSeries::Medium).unwrap_err();
    assert_eq!(e.field(), "head");
    assert_eq!("pan-head".parse::<HeadType>().unwrap(), HeadType::PanHead);
}

#[test]
fn countersunk_heads_seat_on_a_cone() {
    // ISO 10642 M8 d_k actual min 15.24 mm (recalled from memory), ISO 273
    // medium hole 9 mm: D_Km = 12.12 mm; on the 90° cone the friction acts
    // at D_Km/sin 45° = 17.140 mm (derived in bearing/countersunk.rs).
    let m8 = parse_designation("M8").unwrap();
    let cs = bearing_surface(
        &m8,
        HeadType::CountersunkSocket,
        Washer::None,
        HoleSeries::Medium,
    )
    .unwrap();
    assert!((cs.outer_diameter.get::<millimeter>() - 15.24).abs() < 1e-9);
    assert!((cs.mean_diameter().get::<millimeter>() - 12.12).abs() < 1e-9);
    assert!((cs.friction_diameter().get::<millimeter>() - 12.12 * 2f64.sqrt()).abs() < 1e-9);
    assert!(cs.conical_seat);
    assert!(cs.source.contains("recalled from memory"), "{}", cs.source);
    // A flat face keeps D_Km.
    let hex =
        bearing_surface(&m8, HeadType::HexagonHead, Washer::None, HoleSeries::Medium).unwrap();
    assert_eq!(hex.friction_diameter(), hex.mean_diameter());
    // ISO 2009 / ISO 7046-1 M5 d_k actual min 8.94 mm (recalled from memory).
    let m5 = parse_designation("M5").unwrap();
    let sl = bearing_surface(
        &m5,
        HeadType::CountersunkSlotted,
        Washer::None,
        HoleSeries::Medium,
    )
    .unwrap();
    assert!((sl.outer_diameter.get::<millimeter>() - 8.94).abs() < 1e-9);
    // Size ranges: ISO 10642 M3–M20, ISO 2009 M2–M10; inch refused; no
    // washer under a countersunk head.
    for (t, head) in [
        ("M24", HeadType::CountersunkSocket),
        ("M12", HeadType::CountersunkSlotted),
        ("1/4-20", HeadType::CountersunkSocket),
    ] {
        let e = bearing_surface(
            &parse_designation(t).unwrap(),
            head,
            Washer::None,
            HoleSeries::Medium,
        )
        .unwrap_err();
        assert_eq!(e.field(), "head", "{t}");
    }
    let e = bearing_surface(
        &m8,
        HeadType::CountersunkSocket,
        Washer::Plain,
        HoleSeries::Medium,
    )
    .unwrap_err();
    assert_eq!(e.field(), "washer");
}
