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
    let m = app.get_json("/v1/tightening-methods").await;
    let click = find(&m, "id", "click-wrench");
    assert!(click["default_scatter"].as_f64().expect("scatter") > 0.0);
    assert_eq!(click["torque_controlled"], true);
    let angle = find(&m, "id", "torque-angle");
    assert_eq!(angle["torque_controlled"], false);
    let mats = app.get_json("/v1/materials").await;
    let steel = find(&mats, "id", "steel");
    assert_eq!(steel["elastic_modulus"]["unit"], "MPa");
    let mats_us = app.get_json("/v1/materials?units=us").await;
    assert_eq!(
        find(&mats_us, "id", "steel")["elastic_modulus"]["unit"],
        "ksi"
    );
}
