//! Batch items that ask for setpoints (`"answer": "setpoints"`): the same
//! answer as `GET /v1/setpoints`, the same refusal while an error check is
//! not accepted, options refused on spec items. Both backends.

use serde_json::{json, Value};

use crate::support::TestApp;

/// M8 8.8 screwed 12 mm into EN AW-6082 (two error checks).
fn aluminium() -> Value {
    json!({"thread": "M8", "property_class": "8.8", "finish": "zinc-electroplated",
           "lubricant": "none", "tightening_method": "dc-nutrunner", "joint_type": "tapped-hole",
           "clamped_material": "aluminium-6082",
           "engagement_length": {"value": 12, "unit": "mm"}})
}

fn with(mut item: Value, extra: Value) -> Value {
    let (Some(o), Some(e)) = (item.as_object_mut(), extra.as_object()) else {
        panic!("objects")
    };
    o.extend(e.clone());
    item
}

async fn batch_answers_setpoints(app: TestApp) {
    let clean = json!({"thread": "M10", "property_class": "8.8", "finish": "zinc-electroplated",
                       "lubricant": "none", "tightening_method": "dc-nutrunner"});
    let both = json!(["thread_engagement_too_short", "surface_pressure_exceeded"]);
    let body = json!({"items": [
        aluminium(),
        with(aluminium(), json!({"answer": "setpoints"})),
        with(aluminium(), json!({"answer": "setpoints", "accept_checks": both})),
        with(clean.clone(), json!({"answer": "setpoints", "torque_unit": "lbf.ft", "resolution": 0.5})),
        with(aluminium(), json!({"answer": "setpoints", "accept_checks": ["surface_pressure_exeeded"]})),
        with(clean.clone(), json!({"resolution": 0.5})),
        with(clean.clone(), json!({"answer": "spec"})),
    ]});
    let r = app.post_json("/v1/tightening-specs/batch", &body).await;
    assert_eq!(r.status(), 200);
    let b: Value = r.json().await.unwrap();
    let items = b["items"].as_array().unwrap();
    let statuses: Vec<i64> = items
        .iter()
        .map(|i| i["status"].as_i64().unwrap())
        .collect();
    assert_eq!(statuses, [200, 422, 200, 200, 400, 400, 200], "{b}");
    assert_eq!(
        (b["succeeded"].as_i64(), b["failed"].as_i64()),
        (Some(4), Some(3))
    );

    // A spec item by default: the spec, with its error checks and cautions.
    assert!(items[0]["spec"]["torque"].is_object() && items[0].get("setpoints").is_none());
    let cautions = items[0]["spec"]["cautions"].to_string();
    assert!(cautions.contains("safety-critical"), "{cautions}");

    // Refused like the GET: the checks listed.
    let p = &items[1]["problem"];
    assert_eq!(p["type"], "/problems/checks-not-accepted", "{p}");
    let codes: Vec<&str> = p["checks"]
        .as_array()
        .unwrap()
        .iter()
        .map(|c| c["code"].as_str().unwrap())
        .collect();
    assert!(codes.contains(&"surface_pressure_exceeded"), "{p}");
    assert!(codes.contains(&"thread_engagement_too_short"), "{p}");
    assert!(p["errors"]
        .as_array()
        .unwrap()
        .iter()
        .all(|e| e["field"] == "accept_checks"));

    // Accepted: the same answer as the GET with the same options.
    let sp = &items[2]["setpoints"];
    assert_eq!(sp["has_errors"], true, "{sp}");
    let get = app
        .get_json(
            "/v1/setpoints?thread=M8&property_class=8.8&finish=zinc-electroplated&lubricant=none\
             &tightening_method=dc-nutrunner&joint_type=tapped-hole&clamped_material=aluminium-6082\
             &engagement_length=12mm&accept_checks=thread_engagement_too_short,surface_pressure_exceeded",
        )
        .await;
    assert_eq!(sp, &get);
    let get = app
        .get_json(
            "/v1/setpoints?thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none\
             &tightening_method=dc-nutrunner&torque_unit=lbf.ft&resolution=0.5",
        )
        .await;
    assert_eq!(&items[3]["setpoints"], &get);
    assert_eq!(get["torque_unit"], "lbf·ft");

    // Bad options name their field.
    assert_eq!(items[4]["problem"]["errors"][0]["field"], "accept_checks");
    assert_eq!(
        items[4]["problem"]["errors"][0]["suggestions"][0],
        "surface_pressure_exceeded"
    );
    assert_eq!(items[5]["problem"]["errors"][0]["field"], "resolution");
    assert!(items[6]["spec"].is_object());
}

#[tokio::test]
async fn batch_answers_setpoints_sqlite() {
    batch_answers_setpoints(TestApp::spawn().await).await;
}

#[tokio::test]
async fn batch_answers_setpoints_postgres() {
    batch_answers_setpoints(TestApp::builder().postgres().await.spawn().await).await;
}
