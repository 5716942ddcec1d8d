use serde_json::json;

use super::*;

fn body() -> Value {
    json!({
        "id": "K4-RA-017",
        "title": "Rear-axle bracket, left",
        "tags": ["kestrel-k4", "station-12"],
        "request": {"thread": "M10", "property_class": "8.8"},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.5}
    })
}

fn fields(e: RegistryError) -> Vec<String> {
    e.problems().into_iter().map(|p| p.field).collect()
}

#[test]
fn a_good_body_is_read_as_given() {
    let d = JointDefinition::from_json(&body()).unwrap();
    assert_eq!(d.id.as_str(), "K4-RA-017");
    assert_eq!(d.tags, ["kestrel-k4", "station-12"]);
    assert_eq!(d.request["thread"], "M10");
    assert_eq!(d.setpoints.torque_unit.as_deref(), Some("N·m"));
    assert_eq!(d.setpoints.resolution, Some(0.5));
    assert_eq!(d.setpoints.angle_resolution, None);
    // the stored form reads back the same
    let again: JointDefinition = serde_json::from_value(serde_json::to_value(&d).unwrap()).unwrap();
    assert_eq!(again, d);
}

#[test]
fn ids_are_url_safe_and_case_preserving() {
    for good in ["K4-RA-017", "a", "x.y_z-1", &"A".repeat(64)] {
        assert_eq!(JointId::parse("id", good).unwrap().as_str(), good);
    }
    for bad in [
        "",
        "K4 RA",
        "K4/RA",
        "é",
        "..",
        ".",
        "a%20",
        &"A".repeat(65),
    ] {
        let p = JointId::parse("id", bad).unwrap_err();
        assert_eq!(p.field, "id", "{bad}");
    }
    assert!(serde_json::from_value::<JointId>(json!("a/b")).is_err());
}

#[test]
fn a_new_joint_may_not_take_a_fixed_path_word_as_its_id() {
    for word in RESERVED_IDS {
        let mut b = body();
        b["id"] = json!(word);
        let e = JointDefinition::from_json(&b).unwrap_err();
        assert_eq!(fields(e.clone()), ["id"], "{word}");
        assert!(e.problems()[0].reason.contains("fixed path"), "{word}");
    }
    // the words are path segments as written; other spellings are ids
    for id in ["Export", "exports", "import-1"] {
        let mut b = body();
        b["id"] = json!(id);
        assert_eq!(JointDefinition::from_json(&b).unwrap().id.as_str(), id);
    }
}

#[test]
fn every_bad_field_is_named() {
    let mut b = body();
    b["id"] = json!("K4/017");
    b["title"] = json!("   ");
    b["tags"] = json!(["ok", "", "ok", 3, "tab\there"]);
    b["request"] = json!([]);
    b["setpoints"] = json!({"resolution": -1, "angle_resolution": "5", "colour": "red"});
    b["extra"] = json!(true);
    let got = fields(JointDefinition::from_json(&b).unwrap_err());
    let want = [
        "extra",
        "id",
        "title",
        "tags[1]",
        "tags[2]",
        "tags[3]",
        "tags[4]",
        "request",
        "setpoints.colour",
        "setpoints.resolution",
        "setpoints.angle_resolution",
    ];
    assert_eq!(got, want);
}

#[test]
fn sizes_are_bounded() {
    let mut b = body();
    b["title"] = json!("t".repeat(201));
    b["tags"] = json!((0..33).map(|i| format!("t{i}")).collect::<Vec<_>>());
    assert_eq!(
        fields(JointDefinition::from_json(&b).unwrap_err()),
        ["title", "tags"]
    );
    b["title"] = json!("t".repeat(200));
    b["tags"] = json!(["x".repeat(65)]);
    assert_eq!(
        fields(JointDefinition::from_json(&b).unwrap_err()),
        ["tags[0]"]
    );
    b["tags"] = json!((0..32).map(|i| format!("t{i}")).collect::<Vec<_>>());
    assert_eq!(JointDefinition::from_json(&b).unwrap().tags.len(), 32);
    let missing = fields(JointDefinition::from_json(&json!({})).unwrap_err());
    assert_eq!(missing, ["id", "title", "request"]);
    assert!(JointDefinition::from_json(&json!("K4")).is_err());
}

#[test]
fn pages_hold_one_to_five_hundred() {
    assert_eq!(Page::new(None, 500).unwrap().limit, 500);
    assert_eq!(
        Page::new(Some("K4-1"), 1).unwrap().after.unwrap().as_str(),
        "K4-1"
    );
    assert_eq!(fields(Page::new(None, 0).unwrap_err()), ["limit"]);
    assert_eq!(
        fields(Page::new(Some("a b"), 501).unwrap_err()),
        ["limit", "after"]
    );
}
