use super::*;
use crate::app::quantity::Units;

#[test]
fn friction_single_or_range() {
    let r: SpecRequest = serde_json::from_str(
        r#"{"thread":"M10","property_class":"8.8","thread_friction":0.12,
            "bearing_friction":{"min":0.1,"max":0.16}}"#,
    )
    .unwrap();
    assert_eq!(r.thread_friction, Some(FrictionInput::Single(0.12)));
    assert_eq!(
        r.bearing_friction,
        Some(FrictionInput::Range {
            min: 0.1,
            max: 0.16
        })
    );
}

#[test]
fn friction_errors_name_the_problem() {
    let e = serde_json::from_str::<SpecRequest>(
        r#"{"thread":"M10","property_class":"8.8","thread_friction":{"min":0.1}}"#,
    )
    .unwrap_err()
    .to_string();
    assert!(e.contains("max"), "{e}");
    let e = serde_json::from_str::<SpecRequest>(
        r#"{"thread":"M10","property_class":"8.8","thread_friction":"low"}"#,
    )
    .unwrap_err()
    .to_string();
    assert!(e.contains("friction coefficient"), "{e}");
}

#[test]
fn unknown_body_field_refused() {
    let e = serde_json::from_str::<SpecRequest>(
        r#"{"thread":"M10","property_class":"8.8","thred":"M12"}"#,
    )
    .unwrap_err()
    .to_string();
    assert!(e.contains("thred"), "{e}");
}

#[test]
fn query_quantities_need_units() {
    let q = quantity_from_query("clamp_length", "40mm").unwrap();
    assert_eq!((q.value, q.unit.as_ref()), (40.0, "mm"));
    let q = quantity_from_query("clamp_length", " 1.5 in").unwrap();
    assert_eq!((q.value, q.unit.as_ref()), (1.5, "in"));
    let q = quantity_from_query("snug_torque", "1e1N·m").unwrap();
    assert_eq!((q.value, q.unit.as_ref()), (10.0, "N·m"));
    let e = quantity_from_query("clamp_length", "40").unwrap_err();
    assert_eq!(e.field, "clamp_length");
    assert!(quantity_from_query("clamp_length", "mm").is_err());
}

#[test]
fn query_to_request() {
    let q: SpecQuery = serde_urlencoded::from_str(
        "thread=M10&property_class=8.8&thread_friction_min=0.1&thread_friction_max=0.14\
         &bearing_friction=0.12&clamp_length=40mm&units=us",
    )
    .unwrap();
    let r = q.to_request().unwrap();
    assert_eq!(
        r.thread_friction,
        Some(FrictionInput::Range {
            min: 0.1,
            max: 0.14
        })
    );
    assert_eq!(r.bearing_friction, Some(FrictionInput::Single(0.12)));
    assert_eq!(r.units, Some(Units::Us));
    assert_eq!(r.clamp_length.map(|q| q.value), Some(40.0));
}

#[test]
fn query_problems_listed_together() {
    let q: SpecQuery = serde_urlencoded::from_str(
        "thread=M10&property_class=8.8&thread_friction=0.1&thread_friction_min=0.1\
         &bearing_friction_min=0.1&clamp_length=40&bearing_outer_diameter=16mm",
    )
    .unwrap();
    let e = q.to_request().unwrap_err();
    let fields: Vec<&str> = e.iter().map(|p| p.field.as_str()).collect();
    assert_eq!(
        fields,
        [
            "thread_friction",
            "bearing_friction_max",
            "clamp_length",
            "bearing_inner_diameter"
        ]
    );
}

#[test]
fn unknown_query_parameter_refused() {
    let e = serde_urlencoded::from_str::<SpecQuery>("thred=M10&property_class=8.8")
        .unwrap_err()
        .to_string();
    assert!(e.contains("thred"), "{e}");
    let e = serde_urlencoded::from_str::<SpecQuery>("thread=M10&property_class=8.8&resolution=0.1")
        .unwrap_err()
        .to_string();
    assert!(e.contains("resolution"), "{e}");
    let s: SetpointQuery = serde_urlencoded::from_str(
        "thread=M10&property_class=8.8&resolution=0.1&torque_unit=N%C2%B7m",
    )
    .unwrap();
    assert_eq!(s.torque_unit.as_deref(), Some("N·m"));
}
