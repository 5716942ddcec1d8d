//! Issue 12 item 9: countersunk heads reach the spec with their conical
//! seat and size ranges; the heads reference list names them. Both backends.

use serde_json::Value;

use crate::support::{error_fields, expect_problem, TestApp};

fn spec_path(thread: &str, head: &str) -> String {
    format!(
        "/v1/tightening-specs?thread={thread}&property_class=8.8&thread_friction=0.12\
         &bearing_friction=0.12&head={head}"
    )
}

fn value(v: &Value) -> f64 {
    v["value"]
        .as_f64()
        .unwrap_or_else(|| panic!("no value in {v}"))
}

async fn countersunk(app: TestApp) {
    // ISO 10642 M8: d_k actual min 15.24 mm (recalled from memory), ISO 273
    // medium hole 9 mm, D_Km 12.12 mm; friction on the 90° cone acts at
    // D_Km/sin 45° = 17.14 mm.
    let cs = app.get_json(&spec_path("M8", "countersunk-socket")).await;
    let b = &cs["fastener"]["bearing"];
    assert!((value(&b["outer_diameter"]) - 15.24).abs() < 1e-6, "{b}");
    assert!(
        (value(&b["mean_diameter"]) - 12.12 * 2f64.sqrt()).abs() < 1e-3,
        "{b}"
    );
    assert!(
        b["source"].as_str().unwrap().contains("conical seat"),
        "{b}"
    );
    // The same M8 with a hexagon head (d_w 11.63 mm, D_Km 10.315 mm) needs
    // less torque for the same preload at the same friction.
    let hex = app.get_json(&spec_path("M8", "hexagon-head")).await;
    let t = |s: &Value| value(&s["torque"]["target"]);
    assert!(t(&cs) > t(&hex), "{} vs {}", t(&cs), t(&hex));
    // Outside ISO 10642's M3–M20: refused naming the head.
    let p = app.get(&spec_path("M24", "countersunk-socket")).await;
    assert_eq!(error_fields(&expect_problem(p, 422).await), ["head"]);
    // No plain washer under a countersunk head.
    let p = app
        .get(&format!(
            "{}&washer=plain",
            spec_path("M8", "countersunk-slotted")
        ))
        .await;
    assert_eq!(error_fields(&expect_problem(p, 422).await), ["washer"]);
    // Listed in the heads reference list with their standards.
    let types = app.get_json("/v1/bearing-types").await;
    let heads = types["head_types"].to_string();
    for s in [
        "countersunk-socket",
        "ISO 10642",
        "countersunk-slotted",
        "ISO 2009",
    ] {
        assert!(heads.contains(s), "{s}: {heads}");
    }
}

#[tokio::test]
async fn countersunk_heads_sqlite() {
    countersunk(TestApp::spawn().await).await;
}

#[tokio::test]
async fn countersunk_heads_postgres() {
    countersunk(TestApp::builder().postgres().await.spawn().await).await;
}
