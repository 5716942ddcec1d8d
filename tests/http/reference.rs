//! Reference endpoints: threads, property classes, methods, materials.

use serde_json::Value;

use crate::support::TestApp;

fn find<'a>(list: &'a Value, key: &str, value: &str) -> &'a Value {
    list.as_array()
        .and_then(|a| a.iter().find(|x| x[key] == value))
        .unwrap_or_else(|| panic!("no {key}={value}"))
}

fn close(q: &Value, value: f64, unit: &str, tol: f64) {
    assert_eq!(q["unit"], unit, "{q}");
    let v = q["value"].as_f64().expect("number");
    assert!((v - value).abs() <= tol, "{q} vs {value} {unit}");
}

#[tokio::test]
async fn m10_geometry_matches_iso_898_1_table() {
    let app = TestApp::spawn().await;
    let t = app.get_json("/v1/threads/M10").await;
    // EN ISO 898-1 coarse-thread table as reproduced in a supplier's
    // technical tables ("minimum ultimate tensile loads for metric coarse pitch thread"):
    // M10, P = 1.5 mm, As = 58.0 mm².
    assert_eq!(t["designation"], "M10");
    close(&t["pitch"], 1.5, "mm", 1e-9);
    close(&t["stress_area"], 58.0, "mm²", 0.05);
    let d2 = t["pitch_diameter"]["value"].as_f64().expect("d2");
    let d3 = t["minor_diameter"]["value"].as_f64().expect("d3");
    assert!(d3 < d2 && d2 < 10.0, "d3 {d3} < d2 {d2} < d");
    close(&t["flank_angle"], 60.0, "degrees", 1e-9);
}

#[tokio::test]
async fn inch_thread_by_encoded_designation_in_us_units() {
    let app = TestApp::spawn().await;
    let t = app.get_json("/v1/threads/1%2F2-13%20UNC?units=us").await;
    // ASTM A574 coarse-thread table (as reproduced in a supplier's technical tables),
    // ASME B1.1 stress area: 1/2-13 UNC As = 0.1419 in².
    assert_eq!(t["designation"], "1/2-13 UNC");
    assert_eq!(t["threads_per_inch"], 13.0);
    close(&t["nominal_diameter"], 0.5, "in", 1e-9);
    close(&t["stress_area"], 0.1419, "in²", 0.0001);
}

#[tokio::test]
async fn thread_list_filters_by_series() {
    let app = TestApp::spawn().await;
    let all = app.get_json("/v1/threads").await;
    let fine = app.get_json("/v1/threads?series=fine").await;
    let n_all = all.as_array().expect("list").len();
    let n_fine = fine.as_array().expect("list").len();
    assert!(n_fine > 0 && n_fine < n_all);
    assert!(fine
        .as_array()
        .expect("list")
        .iter()
        .all(|t| t["series"] == "fine"));
    find(&fine, "designation", "M10x1.25");
    let unc = app.get_json("/v1/threads?series=unc").await;
    find(&unc, "designation", "1/2-13 UNC");
}

#[tokio::test]
async fn reference_responses_may_be_cached() {
    let app = TestApp::spawn().await;
    let r = app.get("/v1/property-classes").await;
    assert_eq!(r.headers()["cache-control"], "public, max-age=3600");
}

#[tokio::test]
async fn property_class_8_8_strengths_per_iso_898_1() {
    let app = TestApp::spawn().await;
    let g = app.get_json("/v1/property-classes/8.8").await;
    // EN ISO 898-1:2013 as reproduced in a supplier's technical tables ("mechanical properties
    // screws and studs"): 8.8 d ≤ 16 mm Rm,min 800 MPa, Rp0.2 640 MPa,
    // Sp 580 MPa; d > 16 mm Rm,min 830 MPa, Rp0.2 660 MPa, Sp 600 MPa.
    let ranges = g["size_ranges"].as_array().expect("ranges");
    assert_eq!(ranges.len(), 2);
    close(&ranges[0]["tensile_strength_min"], 800.0, "MPa", 1e-9);
    close(&ranges[0]["yield_strength_min"], 640.0, "MPa", 1e-9);
    close(&ranges[0]["proof_stress"], 580.0, "MPa", 1e-9);
    close(&ranges[1]["tensile_strength_min"], 830.0, "MPa", 1e-9);
    close(&ranges[1]["proof_stress"], 600.0, "MPa", 1e-9);
    let us = app.get_json("/v1/property-classes/8.8?units=us").await;
    // 800 MPa = 116.03 ksi (1 ksi = 6.894 757 MPa, NIST SP 811 Appendix B).
    close(
        &us["size_ranges"][0]["tensile_strength_min"],
        116.03,
        "ksi",
        0.01,
    );
    let all = app.get_json("/v1/property-classes").await;
    for id in ["8.8", "10.9", "12.9", "A2-70"] {
        find(&all, "id", id);
    }
}

#[tokio::test]
async fn methods_and_materials_are_listed() {
    let app = TestApp::spawn().await;
    // wrapped like `/v1/finishes`: an object holding one named list
    let m = app.get_json("/v1/tightening-methods").await;
    assert!(m.is_object(), "{m}");
    let m = m["tightening_methods"].clone();
    assert!(m.as_array().is_some_and(|l| l.len() >= 5), "{m}");
    let click = find(&m, "id", "click-wrench");
    assert!(click["default_scatter"].as_f64().expect("scatter") > 0.0);
    assert_eq!(click["torque_controlled"], true);
    let angle = find(&m, "id", "torque-angle");
    assert_eq!(angle["torque_controlled"], false);
    let mats = app.get_json("/v1/materials").await["materials"].clone();
    assert!(mats.as_array().is_some_and(|l| l.len() >= 3), "{mats}");
    let steel = find(&mats, "id", "steel");
    assert_eq!(steel["elastic_modulus"]["unit"], "MPa");
    let mats_us = app.get_json("/v1/materials?units=us").await["materials"].clone();
    assert_eq!(
        find(&mats_us, "id", "steel")["elastic_modulus"]["unit"],
        "ksi"
    );
}

#[tokio::test]
async fn bearing_types_lists_heads_washers_and_hole_series() {
    let app = TestApp::spawn().await;
    let r = app.get("/v1/bearing-types").await;
    assert_eq!(r.status(), 200);
    assert_eq!(r.headers()["cache-control"], "public, max-age=3600");
    let b: serde_json::Value = r.json().await.unwrap();
    let ids = |list: &str| -> Vec<String> {
        b[list]
            .as_array()
            .unwrap_or_else(|| panic!("{list} missing: {b}"))
            .iter()
            .map(|v| {
                assert!(
                    v["description"].as_str().is_some_and(|d| d.len() > 5),
                    "{v}"
                );
                v["id"].as_str().unwrap().to_string()
            })
            .collect()
    };
    let heads = ids("head_types");
    for h in [
        "hexagon-head",
        "socket-head",
        "hexagon-flange",
        "hexagon-nut",
    ] {
        assert!(heads.iter().any(|x| x == h), "{heads:?}");
    }
    assert_eq!(ids("washers"), ["none", "plain", "plain-chamfered"]);
    assert_eq!(ids("hole_series"), ["fine", "medium", "coarse"]);
    // every listed value is accepted by the spec route
    for head in &heads {
        let path = if head == "heavy-hex-head" || head == "heavy-hex-nut" {
            format!("/v1/tightening-specs?thread=1%2F2-13%20UNC&property_class=sae-j429-5&thread_friction=0.14&bearing_friction=0.14&head={head}")
        } else if [
            "pan-head",
            "button-head",
            "countersunk-socket",
            "countersunk-slotted",
        ]
        .contains(&head.as_str())
        {
            // Tabulated M2–M10 (pan, slotted countersunk), M3–M16 (button),
            // M3–M20 (socket countersunk).
            format!("/v1/tightening-specs?thread=M8&property_class=8.8&thread_friction=0.14&bearing_friction=0.14&head={head}")
        } else {
            format!("/v1/tightening-specs?thread=M12&property_class=8.8&thread_friction=0.14&bearing_friction=0.14&head={head}")
        };
        assert_eq!(app.get(&path).await.status(), 200, "{path}");
    }
    // the CLI help lists the same values
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_tightspec"))
        .args(["spec", "--help"])
        .output()
        .expect("run tightspec");
    let help = String::from_utf8_lossy(&out.stdout);
    for id in heads
        .iter()
        .chain(&ids("washers"))
        .chain(&ids("hole_series"))
    {
        assert!(help.contains(id.as_str()), "--help lacks {id}:\n{help}");
    }
    assert!(help.contains("/v1/bearing-types"), "{help}");
}
