//! The spec parameter set agrees everywhere it is written: the GET query
//! (`SpecQuery`'s `IntoParams`), the POST body (`SpecRequest`'s schema,
//! friction and bearing written as objects there), the flags of
//! `tightspec spec` (clap's argument ids, minus the command's own) and the
//! committed OpenAPI document (`bolt` standing for `bolt_standard`,
//! `bolt_length` and `bolt_thread_length`; its shank sections are body
//! only; `loads` for its `loads_*` parameters; `tapped_part` for
//! `tapped_part_material`, `nut` for `nut_property_class`; `clamped_parts` is
//! one parameter in both, an array of objects in the body and
//! `THICKNESS:MATERIAL,…` in the query); the setpoint query is the spec query plus
//! its four tool fields, in the code and in the document; and a batch item
//! is the spec body plus `answer` and the same four tool fields.

use std::collections::BTreeSet;

use clap::CommandFactory;
use utoipa::openapi::path::ParameterIn;
use utoipa::openapi::schema::Schema;
use utoipa::openapi::RefOr;
use utoipa::{IntoParams, PartialSchema};

use crate::app::spec::{SetpointQuery, SpecQuery, SpecRequest};
use crate::cli::args::Cli;

type Names = BTreeSet<String>;

/// The flags of `tightspec spec` that are not request parameters.
const COMMAND_OWN: [&str; 3] = ["json", "builtin_catalogue", "database_url"];
/// The fields the setpoint query adds to the spec query.
const SETPOINT_EXTRA: [&str; 4] = [
    "torque_unit",
    "resolution",
    "angle_resolution",
    "accept_checks",
];

fn query_names<T: IntoParams>() -> Names {
    T::into_params(|| Some(ParameterIn::Query))
        .into_iter()
        .map(|p| p.name)
        .collect()
}

/// A body property as the flat parameters it stands for.
fn flat(property: &str) -> Vec<String> {
    match property {
        "thread_friction" | "bearing_friction" => ["", "_min", "_max"]
            .iter()
            .map(|end| format!("{property}{end}"))
            .collect(),
        "bearing" => vec![
            "bearing_outer_diameter".into(),
            "bearing_inner_diameter".into(),
        ],
        // Shank sections are in the body only (the query's docs say so).
        "bolt" => vec![
            "bolt_standard".into(),
            "bolt_length".into(),
            "bolt_thread_length".into(),
        ],
        "loads" => LOADS.iter().map(|field| format!("loads_{field}")).collect(),
        "tapped_part" => vec!["tapped_part_material".into()],
        "nut" => vec!["nut_property_class".into()],
        other => vec![other.to_string()],
    }
}

/// The fields of the body's `loads` object, `loads_<field>` in the query.
const LOADS: [&str; 8] = [
    "axial",
    "axial_min",
    "transverse",
    "torsion",
    "torsion_radius",
    "interfaces",
    "interface_friction",
    "sealing_clamp_load",
];

/// The `loads` object's fields are the ones `flat` expands it to.
#[test]
fn the_loads_object_has_the_flat_fields() {
    use crate::app::spec::request::LoadsInput;
    let mut names = Names::new();
    if let RefOr::T(Schema::Object(o)) = LoadsInput::schema() {
        names.extend(o.properties.keys().cloned());
    }
    let flat: Names = LOADS.iter().map(|s| s.to_string()).collect();
    assert_eq!(names, flat);
}

fn properties(schema: &Schema, out: &mut Names) {
    match schema {
        Schema::Object(o) => out.extend(o.properties.keys().flat_map(|k| flat(k))),
        Schema::AllOf(all) => {
            for item in &all.items {
                if let RefOr::T(s) = item {
                    properties(s, out);
                }
            }
        }
        _ => {}
    }
}

fn body_names() -> Names {
    let mut out = Names::new();
    if let RefOr::T(schema) = SpecRequest::schema() {
        properties(&schema, &mut out);
    }
    out
}

fn cli_names() -> Names {
    let command = Cli::command();
    let spec = command
        .find_subcommand("spec")
        .expect("the spec subcommand exists");
    spec.get_arguments()
        .map(|a| a.get_id().to_string())
        .filter(|id| !COMMAND_OWN.contains(&id.as_str()))
        .collect()
}

fn document() -> serde_json::Value {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/../openapi/openapi.json");
    let text = std::fs::read_to_string(path).expect("the committed OpenAPI document");
    serde_json::from_str(&text).expect("the committed OpenAPI document is JSON")
}

fn document_query(doc: &serde_json::Value, path: &str) -> Names {
    doc["paths"][path]["get"]["parameters"]
        .as_array()
        .expect("query parameters in the document")
        .iter()
        .filter(|p| p["in"] == "query")
        .filter_map(|p| p["name"].as_str().map(str::to_string))
        .collect()
}

fn document_body(doc: &serde_json::Value) -> Names {
    document_schema(doc, "SpecRequest")
}

/// The flat parameters a body schema of the document names (its own
/// properties and those of its `allOf` branches).
fn document_schema(doc: &serde_json::Value, name: &str) -> Names {
    let schema = &doc["components"]["schemas"][name];
    let mut out = Names::new();
    let branches = schema["allOf"]
        .as_array()
        .cloned()
        .unwrap_or_else(|| vec![schema.clone()]);
    for branch in &branches {
        if let Some(props) = branch["properties"].as_object() {
            out.extend(props.keys().flat_map(|k| flat(k)));
        }
    }
    out
}

#[test]
fn query_body_flags_and_document_name_the_same_parameters() {
    let query = query_names::<SpecQuery>();
    assert!(
        query.len() > 20,
        "the spec query lists its parameters: {query:?}"
    );
    assert_eq!(body_names(), query, "POST body (SpecRequest) vs GET query");
    assert_eq!(cli_names(), query, "`tightspec spec` flags vs GET query");
    let doc = document();
    assert_eq!(
        document_query(&doc, "/v1/tightening-specs"),
        query,
        "committed document's GET parameters vs the code (regenerate openapi/openapi.json)"
    );
    assert_eq!(
        document_body(&doc),
        query,
        "committed document's SpecRequest vs the code (regenerate openapi/openapi.json)"
    );
}

#[test]
fn the_setpoint_query_is_the_spec_query_plus_the_tool_fields() {
    let mut expected = query_names::<SpecQuery>();
    expected.extend(SETPOINT_EXTRA.iter().map(|s| s.to_string()));
    assert_eq!(query_names::<SetpointQuery>(), expected);
    assert_eq!(document_query(&document(), "/v1/setpoints"), expected);
}

#[test]
fn a_batch_item_is_the_spec_body_plus_the_answer_and_the_tool_fields() {
    let mut expected = query_names::<SpecQuery>();
    expected.extend(SETPOINT_EXTRA.iter().map(|s| s.to_string()));
    expected.insert("answer".to_string());
    assert_eq!(
        document_schema(&document(), "BatchItemRequest"),
        expected,
        "a batch item's keys vs the setpoint query and `answer`"
    );
}

#[test]
fn a_body_property_stands_for_its_flat_parameters() {
    assert_eq!(
        flat("thread_friction"),
        [
            "thread_friction",
            "thread_friction_min",
            "thread_friction_max"
        ]
    );
    assert_eq!(
        flat("bearing"),
        ["bearing_outer_diameter", "bearing_inner_diameter"]
    );
    assert_eq!(
        flat("bolt"),
        ["bolt_standard", "bolt_length", "bolt_thread_length"]
    );
    assert_eq!(flat("tapped_part"), ["tapped_part_material"]);
    assert_eq!(flat("nut"), ["nut_property_class"]);
    assert_eq!(flat("thread"), ["thread"]);
}
