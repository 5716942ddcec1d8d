//! Issue 12 items 7/9: metric sizes M42–M64 (grades of ASTM A193M / A320M,
//! ISO 4014/4017 and ISO 4032 faces, ISO 7089 / ISO 7090 washers), inch nut
//! faces (ASME B18.2.2) and flange faces (ISO 4161 / ISO 4162), each with
//! its standard named and its size range enforced. Both backends.

use serde_json::Value;

use crate::support::{error_fields, expect_problem, TestApp};

const FRICTION: &str = "thread_friction=0.12&bearing_friction=0.12";

fn value(v: &Value) -> f64 {
    v["value"]
        .as_f64()
        .unwrap_or_else(|| panic!("no value in {v}"))
}

fn text(v: &Value) -> String {
    v.as_str()
        .unwrap_or_else(|| panic!("no text in {v}"))
        .to_string()
}

async fn m48_b7(app: &TestApp) {
    // ASTM A193M B7 to M64: Rp0.2 720 MPa (recalled from memory); M48 A_s by
    // the ISO 898-1 formula π/4·((d2 + d3)/2)² = 1473 mm² (ISO 898-1 table
    // value 1473 mm², recalled from memory). Head ISO 4014/4017 grade B
    // d_w,min 69.45 mm; ISO 7089 washer M48 d1 52, d2 92, h 8 mm.
    let spec = app
        .get_json(&format!(
            "/v1/tightening-specs?thread=M48&property_class=astm-a193m-b7&{FRICTION}\
             &washer=plain&clamp_length=120mm&clamped_material=steel-s355&joint_outer_diameter=140mm"
        ))
        .await;
    let f = &spec["fastener"];
    assert!((value(&f["stress_area"]) - 1473.0).abs() < 1.0, "{f}");
    let g = f.to_string();
    assert!(g.contains("A193/A193M") && g.contains("up to M64"), "{g}");
    let b = &f["bearing"];
    assert!((value(&b["outer_diameter"]) - 69.45).abs() < 1e-9, "{b}");
    assert!((value(&b["inner_diameter"]) - 52.0).abs() < 1e-9, "{b}");
    assert!(
        text(&b["source"]).contains("d1 52 mm, d2 92 mm, h 8 mm"),
        "{b}"
    );
    let t = &spec["torque"];
    for k in ["lower", "target", "upper"] {
        let v = value(&t[k]);
        assert!(v.is_finite() && v > 1000.0, "{k}: {t}");
    }
    // The angle needs the joint: given, it is computed.
    assert!(
        value(&spec["angle"]["max"]) > value(&spec["angle"]["min"]),
        "{}",
        spec["angle"]
    );
    // The same as POST.
    let body = serde_json::json!({
        "thread": "M48",
        "property_class": "astm-a193m-b7",
        "thread_friction": {"min": 0.12, "max": 0.12},
        "bearing_friction": {"min": 0.12, "max": 0.12},
        "washer": "plain",
        "clamp_length": {"value": 120, "unit": "mm"},
        "clamped_material": "steel-s355",
        "joint_outer_diameter": {"value": 140, "unit": "mm"}
    });
    let r = app.post_json("/v1/tightening-specs", &body).await;
    assert_eq!(r.status(), 200);
    let posted: Value = r.json().await.unwrap();
    assert_eq!(posted["torque"], spec["torque"]);
}

async fn m56_stainless(app: &TestApp) {
    // ISO 3506-1 stops at M39: A4-70 on M56 is refused naming that and the
    // grades that cover the size.
    let p = app
        .get(&format!(
            "/v1/tightening-specs?thread=M56&property_class=A4-70&{FRICTION}"
        ))
        .await;
    let problem = expect_problem(p, 422).await;
    assert_eq!(error_fields(&problem), ["property_class"]);
    let e = problem["errors"][0].to_string();
    assert!(e.contains("ISO 3506-1 covers metric bolts to M39"), "{e}");
    assert!(e.contains("astm-a193m-b8m-1"), "{e}");
    // ISO 898-1 likewise, naming its M39 limit.
    let p = app
        .get(&format!(
            "/v1/tightening-specs?thread=M48&property_class=10.9&{FRICTION}"
        ))
        .await;
    let problem = expect_problem(p, 422).await;
    let e = problem["errors"][0].to_string();
    assert!(e.contains("ISO 898-1 covers metric bolts to M39"), "{e}");
    assert!(e.contains("astm-a193m-b7"), "{e}");
    // A193M B8M class 1 (Rp0.2 205 MPa) computes at M56 with a turned nut
    // (ISO 4032, d_w,min 78.66 mm) on an ISO 7090 washer; a stainless
    // fastener.
    let spec = app
        .get_json(&format!(
            "/v1/tightening-specs?thread=M56&property_class=astm-a193m-b8m-1&{FRICTION}\
             &head=hexagon-nut&washer=plain-chamfered"
        ))
        .await;
    let b = &spec["fastener"]["bearing"];
    assert!((value(&b["outer_diameter"]) - 78.66).abs() < 1e-9, "{b}");
    assert!(text(&b["source"]).contains("ISO 7090"), "{b}");
    assert!(value(&spec["torque"]["target"]).is_finite());
}

async fn ranges(app: &TestApp) {
    let refused = |q: &'static str, field: &'static str, words: &'static [&'static str]| async move {
        let p = app
            .get(&format!("/v1/tightening-specs?{q}&{FRICTION}"))
            .await;
        let problem = expect_problem(p, 422).await;
        assert_eq!(error_fields(&problem), [field], "{q}");
        let e = problem["errors"][0].to_string();
        for w in words {
            assert!(e.contains(w), "{q}: {w} not in {e}");
        }
    };
    refused(
        "thread=M48&property_class=astm-a193m-b7&head=socket-head",
        "head",
        &["ISO 4762", "M3 to M39"],
    )
    .await;
    refused(
        "thread=M24&property_class=8.8&head=hexagon-flange-nut",
        "head",
        &["ISO 4161", "M5 to M20"],
    )
    .await;
    refused(
        "thread=M4&property_class=8.8&washer=plain-chamfered",
        "washer",
        &["ISO 7090", "M5 to M64"],
    )
    .await;
    refused(
        "thread=M20&property_class=8.8&head=heavy-hex-nut",
        "head",
        &["Unified inch threads only"],
    )
    .await;
    refused(
        "thread=M48&property_class=astm-a193-b7",
        "property_class",
        &["astm-a193m-b7"],
    )
    .await;
}

async fn inch_nuts_and_flanges(app: &TestApp) {
    // ASME B18.2.2 heavy hex nut 1 in: F min 1.575 in taken as the bearing
    // face (recalled from memory; assumption stated).
    let spec = app
        .get_json(&format!(
            "/v1/tightening-specs?thread=1-8%20UNC&property_class=astm-a193-b7&{FRICTION}\
             &head=heavy-hex-nut&units=us"
        ))
        .await;
    let b = &spec["fastener"]["bearing"];
    assert!((value(&b["outer_diameter"]) - 1.575).abs() < 1e-6, "{b}");
    assert!(
        text(&b["source"]).contains("ASME B18.2.2 heavy hex nut"),
        "{b}"
    );
    // ISO 4161 flange nut M10: d_w,min 19.6 mm, d_c 21.8 mm shown.
    let spec = app
        .get_json(&format!(
            "/v1/tightening-specs?thread=M10&property_class=8.8&{FRICTION}&head=hexagon-flange-nut"
        ))
        .await;
    let b = &spec["fastener"]["bearing"];
    assert!((value(&b["outer_diameter"]) - 19.6).abs() < 1e-9, "{b}");
    assert!(text(&b["source"]).contains("d_c max 21.8 mm"), "{b}");
    // Listed: the heads and washers and the metric ASTM grades.
    let types = app.get_json("/v1/bearing-types").await.to_string();
    for s in [
        "heavy-hex-nut",
        "ASME B18.2.2",
        "hexagon-flange-nut",
        "ISO 4161",
        "ISO 7090",
    ] {
        assert!(types.contains(s), "{s}: {types}");
    }
    let g = app.get_json("/v1/property-classes/astm-a193m-b7").await;
    assert_eq!(g["family"], "astm_bolting_metric");
}

async fn all(app: TestApp) {
    m48_b7(&app).await;
    m56_stainless(&app).await;
    ranges(&app).await;
    inch_nuts_and_flanges(&app).await;
}

#[tokio::test]
async fn big_sizes_sqlite() {
    all(TestApp::spawn().await).await;
}

#[tokio::test]
async fn big_sizes_postgres() {
    all(TestApp::builder().postgres().await.spawn().await).await;
}
