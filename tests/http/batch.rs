//! `POST /v1/tightening-specs/batch`: order kept, a spec or a problem in
//! place for each item, the 10,000-item limit.

use serde_json::{json, Value};

use crate::specs_support::{json, spawn};

fn good(thread: &str) -> Value {
    json!({"thread": thread, "property_class": "8.8", "finish": "zinc-electroplated", "lubricant": "none"})
}

#[tokio::test]
async fn mixed_batch_keeps_order_with_problems_in_place() {
    let app = spawn().await;
    let body = json!({"items": [
        good("M8"),
        {"thread": "M10", "property_class": "8.8", "thred": "M12"},
        {"thread": "M10", "property_class": "8.9", "thread_friction": 0.12, "bearing_friction": 0.12},
        {"thread": "M10", "property_class": "8.8", "thread_friction": {"min": 0.2, "max": 0.1}, "bearing_friction": 0.12},
        good("M12"),
        {"thread": "M10", "property_class": "8.8", "finish": "plain", "lubricant": "none", "catalogue_revision": 42},
        "not an object"
    ]});
    let (st, b) = json(app.post_json("/v1/tightening-specs/batch", &body).await).await;
    assert_eq!(st, 200, "{b}");
    let items = b["items"].as_array().unwrap();
    let statuses: Vec<i64> = items
        .iter()
        .map(|i| i["status"].as_i64().unwrap())
        .collect();
    assert_eq!(statuses, [200, 400, 404, 422, 200, 404, 400]);
    for (n, item) in items.iter().enumerate() {
        assert_eq!(item["index"], n);
        if item["status"] == 200 {
            assert!(item["spec"]["torque"]["upper"]["value"].is_f64());
            assert!(item.get("problem").is_none());
        } else {
            assert_eq!(item["problem"]["status"], item["status"]);
            assert!(item["problem"]["type"]
                .as_str()
                .unwrap()
                .starts_with("/problems/"));
            assert!(item.get("spec").is_none());
        }
    }
    assert_eq!(items[1]["problem"]["errors"][0]["field"], "thred");
    assert_eq!(items[2]["problem"]["errors"][0]["field"], "property_class");
    assert_eq!(
        items[3]["problem"]["errors"][0]["field"],
        "thread_friction.min"
    );
    assert_eq!(
        items[5]["problem"]["errors"][0]["field"],
        "catalogue_revision"
    );
    assert_eq!(
        (
            b["count"].as_i64(),
            b["succeeded"].as_i64(),
            b["failed"].as_i64()
        ),
        (Some(7), Some(2), Some(5))
    );
}

#[tokio::test]
async fn batch_items_equal_single_answers() {
    let app = spawn().await;
    let body = json!({"items": [good("M8"), good("M10"), good("M8")]});
    let (_, b) = json(app.post_json("/v1/tightening-specs/batch", &body).await).await;
    let (_, single) = json(app.post_json("/v1/tightening-specs", &good("M10")).await).await;
    assert_eq!(b["items"][1]["spec"], single);
    assert_eq!(b["items"][0]["spec"], b["items"][2]["spec"]);
}

#[tokio::test]
async fn ten_thousand_items_accepted_more_refused() {
    let app = spawn().await;
    let item = good("M10");
    let full = json!({"items": vec![item.clone(); 10_000]});
    let (st, b) = json(app.post_json("/v1/tightening-specs/batch", &full).await).await;
    assert_eq!(st, 200);
    assert_eq!(b["succeeded"], 10_000);
    let over = json!({"items": vec![item; 10_001]});
    let (st, p) = json(app.post_json("/v1/tightening-specs/batch", &over).await).await;
    assert_eq!(st, 422, "{p}");
    assert_eq!(p["errors"][0]["field"], "items");
    assert!(p["detail"].as_str().unwrap().contains("10000"), "{p}");
    let (st, p) = json(
        app.post_json("/v1/tightening-specs/batch", &json!([good("M10")]))
            .await,
    )
    .await;
    assert_eq!(st, 400, "{p}");
}
