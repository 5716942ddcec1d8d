use super::*;

#[test]
fn the_columns_start_with_the_definition_and_hold_the_spec_query_names() {
    let c = columns();
    assert_eq!(&c[..3], ["id", "title", "tags"]);
    for name in [
        "thread",
        "property_class",
        "finish",
        "clamped_parts",
        "loads_axial",
    ] {
        assert!(c.iter().any(|x| x == name), "{name} missing from {c:?}");
    }
}

#[test]
fn a_row_reads_into_a_definition_with_quantities_and_tags() {
    let row: BTreeMap<&str, &str> = [
        ("id", "K4-1"),
        ("title", "Demo joint"),
        ("tags", "demo; line-1"),
        ("thread", "M10"),
        ("property_class", "8.8"),
        ("clamp_length", "30mm"),
        ("resolution", "0.5"),
    ]
    .into_iter()
    .collect();
    let body = definition_from_row(&row).unwrap();
    assert_eq!(body["tags"], json!(["demo", "line-1"]));
    assert_eq!(
        body["request"]["clamp_length"],
        json!({"value": 30.0, "unit": "mm"})
    );
    assert_eq!(body["setpoints"]["resolution"], json!(0.5));
}

#[test]
fn a_bad_number_is_named_by_its_column() {
    let row: BTreeMap<&str, &str> = [
        ("id", "a"),
        ("title", "t"),
        ("thread", "M10"),
        ("property_class", "8.8"),
        ("resolution", "fine"),
        ("tool_scatter", "x"),
    ]
    .into_iter()
    .collect();
    let fields: Vec<String> = definition_from_row(&row)
        .unwrap_err()
        .into_iter()
        .map(|p| p.field)
        .collect();
    assert!(fields.contains(&"resolution".to_string()), "{fields:?}");
    assert!(fields.contains(&"tool_scatter".to_string()), "{fields:?}");
}

#[test]
fn shank_sections_have_no_csv_form() {
    let def = JointDefinition::from_json(&json!({
        "id": "a", "title": "t", "tags": [],
        "request": {"thread": "M10", "property_class": "8.8", "bolt": {"length": {"value": 40, "unit": "mm"},
            "thread_length": {"value": 26, "unit": "mm"},
            "shank_sections": [{"length": {"value": 5, "unit": "mm"}, "diameter": {"value": 8, "unit": "mm"}}]}},
        "setpoints": {}
    }))
    .unwrap();
    let p = row_of(&def, &columns()).unwrap_err();
    assert_eq!(p.field, "joints[a].request.bolt_shank_sections");
}

#[test]
fn a_definition_reads_back_from_its_row() {
    let def = JointDefinition::from_json(&json!({
        "id": "a", "title": "t, with \"quotes\"", "tags": ["x", "y"],
        "request": {"thread": "M10", "property_class": "8.8", "finish": "zinc", "lubricant": "oil",
            "thread_friction": {"min": 0.1, "max": 0.14},
            "clamped_parts": [{"thickness": {"value": 7.5, "unit": "mm"}, "material": "steel-s355"}],
            "loads": {"axial": {"value": 2, "unit": "kN"}}},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.1}
    }))
    .unwrap();
    let row = row_of(&def, &columns()).unwrap();
    assert_eq!(row[0], "a");
    assert!(row.iter().any(|c| c == "7.5mm:steel-s355"), "{row:?}");
}
