//! Torque-angle and yield-controlled tightening as methods of their own
//! (issue 12, Why 2): the preload range, α_A and the torque monitoring band
//! come from the yield-point and angle models, the setpoints say what the
//! tool controls, a window reaching the described bolt's yield angle is an
//! error check gating setpoints. Both backends.

use serde_json::Value;

use crate::support::{error_fields, expect_problem, TestApp};

/// The audit's M12 10.9 (issue 12): μ_th = μ_b = 0.12 single values, ν 0.9,
/// hexagon head without washer in a medium hole, steel plates.
const M12: &str = "thread=M12&property_class=10.9&thread_friction=0.12&bearing_friction=0.12";
/// The audit's joint: 40 mm clamp length, D_A 30 mm, ISO 4014 M12×60.
const JOINT: &str = "&clamp_length=40mm&clamped_material=steel-s355&joint_outer_diameter=30mm\
    &bolt_standard=iso-4014&bolt_length=60mm";

/// The audit joint's torque-angle window (shank-aware ISO 4014 M12×60,
/// default snug 30 % of M_A,zul, ±5 % angle scatter), degrees, and its α_A
/// (one friction value: only the angle scatter spreads the preload).
const TA_MAX: f64 = 32.16;
const TA_AT_YIELD: f64 = 37.27;
const TA_ALPHA: f64 = 1.071;

fn value(q: &Value, unit: &str) -> f64 {
    assert_eq!(q["unit"], unit, "{q}");
    q["value"].as_f64().unwrap_or(f64::NAN)
}

fn codes(v: &Value) -> Vec<String> {
    v["checks"]
        .as_array()
        .map(|a| {
            a.iter()
                .filter_map(|c| c["code"].as_str().map(str::to_owned))
                .collect()
        })
        .unwrap_or_default()
}

fn says(v: &Value, words: &str) -> bool {
    v["assumptions"].as_array().is_some_and(|a| {
        a.iter()
            .any(|t| t.as_str().is_some_and(|t| t.contains(words)))
    })
}

async fn yield_controlled(app: TestApp) {
    let q = format!("{M12}&tightening_method=yield-controlled");
    let spec = app.get_json(&format!("/v1/tightening-specs?{q}")).await;
    // Audit: 52.9–63.3 kN before; the yield point at μ_th 0.12 is 70.4 kN
    // (R_p0.2min 940 N/mm², ISO 898-1:2013 Table 3, ν = 1).
    let (fmin, fmax) = (
        value(&spec["preload"]["min"], "N") / 1e3,
        value(&spec["preload"]["max"], "N") / 1e3,
    );
    assert!(fmin >= 65.0 && (fmin - 70.4).abs() < 0.1, "{fmin}");
    // R_p0.2max defaulted to 1.2·R_p0.2min (stated in the assumptions).
    assert!((fmax / fmin - 1.2).abs() < 1e-6, "{fmax}");
    assert!((spec["tightening_factor"].as_f64().unwrap() - 1.2).abs() < 1e-6);
    assert!(
        says(&spec, "R_p0.2max taken as 1.2"),
        "{}",
        spec["assumptions"]
    );
    assert_eq!(spec["torque"]["role"], "monitoring");
    assert_eq!(spec["governing"], "yield_point");
    assert_eq!(spec["angle"]["computed"], false);
    let (lo, hi) = (
        value(&spec["torque"]["lower"], "N·m"),
        value(&spec["torque"]["upper"], "N·m"),
    );
    assert!(lo < hi && (hi / lo - 1.2).abs() < 1e-6, "{lo} {hi}");
    // The surface pressure is the model's F_M,max over A_p = π/4·(d_W² − d_h²).
    let p = value(&spec["fastener"]["bearing"]["surface_pressure"], "MPa");
    let dw = value(&spec["fastener"]["bearing"]["outer_diameter"], "mm");
    let dh = value(&spec["fastener"]["bearing"]["inner_diameter"], "mm");
    let ap = std::f64::consts::PI / 4.0 * (dw * dw - dh * dh);
    assert!((p - fmax * 1e3 / ap).abs() < 0.5, "{p}");
    assert!(codes(&spec).contains(&"torque_window_is_monitoring".to_string()));

    // Setpoints: the band to monitor, no angle; what the tool controls.
    let url = format!("/v1/setpoints?{q}&accept_checks=surface_pressure_exceeded");
    let sp = app.get_json(&url).await;
    assert_eq!(sp["controls"], "yield_point", "{sp}");
    assert_eq!(sp["torque_role"], "monitoring");
    assert!(sp.get("angle").is_none(), "{sp}");
    let (slo, shi) = (value(&sp["lower"], "N·m"), value(&sp["upper"], "N·m"));
    assert!(lo <= slo && slo < shi && shi <= hi, "{sp}");

    // The minimum-clamp-load mode does not apply to yield control.
    let r = app
        .get(&format!(
            "/v1/tightening-specs?{q}&window_mode=minimum-clamp-load&required_clamp_load=50kN"
        ))
        .await;
    let p = expect_problem(r, 422).await;
    assert_eq!(error_fields(&p), ["window_mode"], "{p}");
}

#[tokio::test]
async fn yield_controlled_preload_from_the_yield_point_sqlite() {
    yield_controlled(TestApp::spawn().await).await;
}

#[tokio::test]
async fn yield_controlled_preload_from_the_yield_point_postgres() {
    yield_controlled(TestApp::builder().postgres().await.spawn().await).await;
}

async fn torque_angle(app: TestApp) {
    let q = format!("{M12}&tightening_method=torque-angle{JOINT}");
    let spec = app.get_json(&format!("/v1/tightening-specs?{q}")).await;
    let a = &spec["angle"];
    assert_eq!(a["computed"], true, "{a}");
    let (min, max, at_yield) = (
        value(&a["min"], "degrees"),
        value(&a["max"], "degrees"),
        value(&a["at_yield"], "degrees"),
    );
    // Shank-aware bolt, ±5 % angle scatter, upper end at F_M,zul 63.3 kN.
    assert!(0.0 < min && min < max && max < at_yield, "{a}");
    assert!((min / max - 0.95 / 1.05).abs() < 1e-9, "{a}");
    assert!(
        (max - TA_MAX).abs() < 0.05 && (at_yield - TA_AT_YIELD).abs() < 0.05,
        "{a}"
    );
    let fmax = value(&spec["preload"]["max"], "N") / 1e3;
    assert!((fmax - 63.3).abs() < 0.1, "{fmax}");
    let alpha = spec["tightening_factor"].as_f64().unwrap();
    assert!((alpha - TA_ALPHA).abs() < 0.005, "{alpha}");
    assert_eq!(spec["torque"]["role"], "monitoring");
    assert_eq!(spec["governing"], "angle_window");
    assert!(
        says(&spec, "preload of torque-angle tightening"),
        "{}",
        spec["assumptions"]
    );
    assert!(!codes(&spec).contains(&"angle_past_bolt_yield".to_string()));

    // Setpoints: snug torque and the angle window; the torques a band. (A
    // plain hexagon head on S355 is over its surface pressure at 63 kN.)
    const PRESSURE: &str = "surface_pressure_exceeded";
    let sp = app
        .get_json(&format!(
            "/v1/setpoints?{q}&angle_resolution=0.1&accept_checks={PRESSURE}"
        ))
        .await;
    assert_eq!(sp["controls"], "angle", "{sp}");
    assert_eq!(sp["torque_role"], "monitoring");
    let sa = &sp["angle"];
    assert!(value(&sa["snug_torque"], "N·m") > 0.0, "{sa}");
    let (smin, smax) = (value(&sa["min"], "degrees"), value(&sa["max"], "degrees"));
    assert!(min <= smin && smin < smax && smax <= max, "{sa}");

    // No joint: refused naming the clamp length, on both routes.
    for route in ["tightening-specs", "setpoints"] {
        let r = app
            .get(&format!("/v1/{route}?{M12}&tightening_method=torque-angle"))
            .await;
        let p = expect_problem(r, 422).await;
        assert_eq!(error_fields(&p), ["clamp_length"], "{p}");
    }

    // ν = 1: the window's upper end reaches the described bolt's yield
    // angle, an error check: setpoints only when accepted.
    let full = format!("{q}&utilisation=1");
    let spec = app.get_json(&format!("/v1/tightening-specs?{full}")).await;
    assert!(
        codes(&spec).contains(&"angle_past_bolt_yield".to_string()),
        "{spec}"
    );
    let url = format!("/v1/setpoints?{full}&angle_resolution=0.1&accept_checks={PRESSURE}");
    let p = expect_problem(app.get(&url).await, 422).await;
    assert_eq!(p["type"], "/problems/checks-not-accepted", "{p}");
    assert!(p.to_string().contains("angle_past_bolt_yield"), "{p}");
    let ok = app.get_json(&format!("{url},angle_past_bolt_yield")).await;
    assert_eq!(ok["has_errors"], true, "{ok}");

    // Issue 12 audit: M14 10.9 torque-angle showed α_A 1.74; Table A8 of
    // VDI 2230 Part 1:2003 gives 1.2–1.4 (recalled from memory). Inputs of
    // the engine test `audit_torque_angle_m14_10_9_tightening_factor`.
    // The old torque window (±9 %) on these inputs: 1.743; the angle model
    // 1.197, at the table's lower end (resilience taken as exact).
    let m14 = "thread=M14&property_class=10.9&thread_friction_min=0.09&thread_friction_max=0.14\
        &bearing_friction_min=0.09&bearing_friction_max=0.14&clamp_length=40mm\
        &clamped_material=steel-s355&joint_outer_diameter=30mm";
    let alpha = |spec: Value| spec["tightening_factor"].as_f64().unwrap_or(f64::NAN);
    let old = app
        .get_json(&format!(
            "/v1/tightening-specs?{m14}&tightening_method=dc-nutrunner&tool_scatter=0.09"
        ))
        .await;
    assert!((alpha(old.clone()) - 1.743).abs() < 0.001, "{old}");
    let new = app
        .get_json(&format!(
            "/v1/tightening-specs?{m14}&tightening_method=torque-angle"
        ))
        .await;
    assert!((alpha(new.clone()) - 1.197).abs() < 0.001, "{new}");
}

#[tokio::test]
async fn torque_angle_preload_from_the_angle_window_sqlite() {
    torque_angle(TestApp::spawn().await).await;
}

#[tokio::test]
async fn torque_angle_preload_from_the_angle_window_postgres() {
    torque_angle(TestApp::builder().postgres().await.spawn().await).await;
}
