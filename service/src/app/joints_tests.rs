use super::*;

#[test]
fn a_refused_request_field_is_named_under_request() {
    assert_eq!(
        request_field("joint.clamp_length", "invalid type"),
        "request.joint.clamp_length"
    );
    assert_eq!(
        request_field(".", "unknown field `thred`, expected one of `thread`"),
        "request.thred"
    );
    assert_eq!(request_field(".", "missing field"), "request");
}

#[test]
fn setpoints_name_their_field() {
    let given = serde_json::json!({"torque_unit": "furlong", "resolution": 5000.0, "angle_resolution": 0.5});
    let fields: Vec<String> = setpoint_problems(given.as_object().unwrap())
        .into_iter()
        .map(|p| p.field)
        .collect();
    assert_eq!(fields, ["setpoints.torque_unit", "setpoints.resolution"]);
}
