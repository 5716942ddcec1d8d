//! Parser fuzzing by property tests: the thread designation parser, the
//! quantity parser, the spec query string, the JSON spec body and the CSV
//! catalogue import are fed generated input. Properties: nothing panics;
//! every refusal names a field; accepted numbers are finite (and an
//! accepted spec request computes without panicking).
//!
//! The tests are `#[ignore]`d: `scripts/fuzz` runs them in release mode
//! with 100,000 cases each (`TIGHTSPEC_FUZZ_CASES` sets another count; CI
//! runs a short pass of 300).

use proptest::prelude::*;
use proptest::test_runner::Config;

use crate::app::spec::request::quantity_from_query;
use crate::app::spec::view::spec_response;
use crate::app::spec::{compute_one, SpecQuery, SpecRequest};
use crate::app::FieldProblem;
use crate::catalogue::exchange::parse_csv;
use crate::catalogue::Snapshot;
use crate::engine::thread::parse_designation;
use crate::http::error::ApiError;
use crate::http::extract::parse_query;
use crate::http::specs::batch::read_item;

fn config() -> Config {
    let cases = std::env::var("TIGHTSPEC_FUZZ_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(100_000);
    Config {
        cases,
        failure_persistence: None,
        ..Config::default()
    }
}

fn names_fields(e: &ApiError) -> bool {
    let p = e.problem();
    !p.errors.is_empty() && p.errors.iter().all(|f| !f.field.is_empty())
}

fn items_name_fields(errors: &[FieldProblem]) -> bool {
    !errors.is_empty() && errors.iter().all(|e| !e.field.is_empty())
}

/// Computes an accepted request; a refusal must name its fields.
/// An accepted one is rendered as the spec answer, and every number in it
/// must be finite: the walk visits each value of the JSON answer, and a
/// non-finite figure would have become `null` (serde_json writes NaN and
/// infinity so), which the answer never holds otherwise.
fn computes_or_names(req: &SpecRequest, seed: &Snapshot) -> Result<(), TestCaseError> {
    match compute_one(req, seed) {
        Err(e) => prop_assert!(items_name_fields(e.problems()), "{e:?}"),
        Ok((resolved, spec)) => {
            let answer = serde_json::to_value(spec_response(&spec, &resolved, false))
                .map_err(|e| TestCaseError::fail(e.to_string()))?;
            let mut numbers = 0;
            every_number_finite(&answer, "answer", &mut numbers)?;
            prop_assert!(numbers >= 10, "only {numbers} numbers in {answer}");
        }
    }
    Ok(())
}

fn every_number_finite(
    v: &serde_json::Value,
    path: &str,
    numbers: &mut usize,
) -> Result<(), TestCaseError> {
    use serde_json::Value;
    match v {
        Value::Null => prop_assert!(false, "{path} is null (a non-finite figure?)"),
        Value::Number(n) => {
            *numbers += 1;
            prop_assert!(n.as_f64().is_some_and(f64::is_finite), "{path} = {n}");
        }
        Value::Array(items) => {
            for (i, item) in items.iter().enumerate() {
                every_number_finite(item, &format!("{path}[{i}]"), numbers)?;
            }
        }
        Value::Object(map) => {
            for (k, item) in map {
                every_number_finite(item, &format!("{path}.{k}"), numbers)?;
            }
        }
        Value::Bool(_) | Value::String(_) => {}
    }
    Ok(())
}

/// Numbers as a client might type them, including the extremes.
fn number() -> impl Strategy<Value = String> {
    prop_oneof![
        any::<f64>().prop_map(|x| x.to_string()),
        (0u32..100_000).prop_map(|x| x.to_string()),
        (-1000.0f64..1000.0).prop_map(|x| format!("{x:.3}")),
        Just("1e308".to_string()),
        Just("3e16".to_string()),
        Just("-0".to_string()),
        Just("NaN".to_string()),
        Just("inf".to_string()),
        "[0-9.eE+-]{0,12}",
    ]
}

fn unit() -> impl Strategy<Value = String> {
    prop_oneof![
        Just("mm".to_string()),
        Just("in".to_string()),
        Just("N·m".to_string()),
        Just("kN".to_string()),
        Just("lbf".to_string()),
        Just("MPa".to_string()),
        Just("°".to_string()),
        Just(String::new()),
        "[a-zA-Z·²/ ]{0,6}",
    ]
}

fn quantity_text() -> impl Strategy<Value = String> {
    prop_oneof![
        (number(), unit()).prop_map(|(n, u)| format!("{n}{u}")),
        any::<String>(),
    ]
}

/// Thread designations: well-formed shapes with odd numbers, and noise.
fn designation() -> impl Strategy<Value = String> {
    prop_oneof![
        (number(), prop::option::of(number())).prop_map(|(d, p)| match p {
            Some(p) => format!("M{d}x{p}"),
            None => format!("M{d}"),
        }),
        (number(), number()).prop_map(|(d, n)| format!("{d}-{n} UNC")),
        (number(), number()).prop_map(|(d, n)| format!("#{d}-{n} UNF")),
        "[M#0-9x./ -]{0,12}(UNC|UNF|UNEF)?",
        any::<String>(),
    ]
}

const SPEC_KEYS: [&str; 16] = [
    "thread",
    "property_class",
    "finish",
    "lubricant",
    "tightening_method",
    "clamp_length",
    "clamped_material",
    "joint_outer_diameter",
    "bearing_outer_diameter",
    "bearing_inner_diameter",
    "thread_friction",
    "bearing_friction",
    "engagement_length",
    "required_clamp_load",
    "snug_torque",
    "units",
];

/// A value for one of the spec keys: a plausible one or noise.
fn spec_value() -> impl Strategy<Value = String> {
    prop_oneof![
        Just("M10".to_string()),
        Just("8.8".to_string()),
        Just("plain".to_string()),
        Just("light-oil".to_string()),
        Just("dc-nutrunner".to_string()),
        Just("torque-angle".to_string()),
        Just("steel-s355".to_string()),
        number(),
        quantity_text(),
        any::<String>(),
    ]
}

fn spec_pairs() -> impl Strategy<Value = Vec<(String, String)>> {
    let key = prop_oneof![
        prop::sample::select(SPEC_KEYS.to_vec()).prop_map(str::to_string),
        "[a-z_]{1,12}",
    ];
    prop::collection::vec((key, spec_value()), 0..10)
}

fn csv_text() -> impl Strategy<Value = String> {
    let header = prop_oneof![
        Just(crate::catalogue::exchange::CSV_COLUMNS.join(",")),
        "[a-z_,]{0,40}",
    ];
    let cell = prop_oneof![number(), "[a-z=+@'\t -]{0,8}", Just(String::new())];
    let row = prop::collection::vec(cell, 0..16).prop_map(|cells| cells.join(","));
    (header, prop::collection::vec(row, 0..6))
        .prop_map(|(h, rows)| format!("{h}\n{}", rows.join("\n")))
}

proptest! {
    #![proptest_config(config())]

    #[test]
    #[ignore = "long: run by scripts/fuzz"]
    fn fuzz_designation_parser(text in designation()) {
        match parse_designation(&text) {
            Ok(thread) => {
                let d = thread.nominal_diameter_mm();
                prop_assert!(d.is_finite() && d > 0.0, "{text:?}: {d}");
            }
            Err(e) => prop_assert!(names_fields(&ApiError::from(crate::app::AppError::from(e))), "{text:?}"),
        }
    }

    #[test]
    #[ignore = "long: run by scripts/fuzz"]
    fn fuzz_quantity_parser(text in quantity_text()) {
        match quantity_from_query("clamp_length", &text) {
            Ok(q) => prop_assert!(q.value.is_finite(), "{text:?}: {}", q.value),
            Err(e) => prop_assert!(e.field.starts_with("clamp_length"), "{text:?}: {e:?}"),
        }
    }

    #[test]
    #[ignore = "long: run by scripts/fuzz"]
    fn fuzz_spec_query_string(pairs in spec_pairs()) {
        let query = form_urlencoded::Serializer::new(String::new())
            .extend_pairs(pairs.iter())
            .finish();
        match parse_query::<SpecQuery>(&query) {
            Err(e) => prop_assert!(names_fields(&e), "{query}"),
            Ok(q) => match q.to_request() {
                Err(errors) => prop_assert!(items_name_fields(&errors), "{query}: {errors:?}"),
                Ok(req) => computes_or_names(&req, &Snapshot::seed())?,
            },
        }
    }

    #[test]
    #[ignore = "long: run by scripts/fuzz"]
    fn fuzz_json_spec_body(pairs in spec_pairs(), numeric in any::<bool>()) {
        let mut body = serde_json::Map::new();
        for (k, v) in pairs {
            let value = match (numeric, v.parse::<f64>()) {
                (true, Ok(x)) => serde_json::json!(x),
                _ => serde_json::Value::String(v),
            };
            body.insert(k, value);
        }
        let text = serde_json::Value::Object(body).to_string();
        let raw = serde_json::value::RawValue::from_string(text.clone()).expect("raw JSON");
        match read_item(&raw) {
            Err(e) => prop_assert!(names_fields(&e), "{text}"),
            Ok(req) => computes_or_names(&req.spec, &Snapshot::seed())?,
        }
    }

    #[test]
    #[ignore = "long: run by scripts/fuzz"]
    fn fuzz_csv_import(text in csv_text()) {
        match parse_csv(&text) {
            Err(problems) => {
                prop_assert!(!problems.is_empty());
                prop_assert!(problems.iter().all(|p| !p.field.is_empty()), "{text:?}");
            }
            Ok(file) => {
                for e in &file.entries {
                    let mut ranges = vec![&e.thread_friction, &e.bearing_friction];
                    ranges.extend(e.total_friction.as_ref());
                    for r in ranges {
                        prop_assert!(r.min.is_finite() && r.max.is_finite(), "{text:?}");
                    }
                }
            }
        }
    }
}

/// A plausible spec request: every figure its answer holds is walked.
fn plausible_request() -> impl Strategy<Value = serde_json::Value> {
    let threads = prop::sample::select(vec!["M5", "M6", "M8", "M10", "M12", "M16", "M20", "M24"]);
    let classes = prop::sample::select(vec!["8.8", "10.9", "12.9", "A2-70"]);
    let pairs = prop::sample::select(vec![
        ("plain", "light-oil"),
        ("plain", "mos2-paste"),
        ("zinc-electroplated", "none"),
        ("zinc-flake", "light-oil"),
        ("phosphate-oil", "none"),
    ]);
    let methods = prop::sample::select(
        crate::engine::method::METHODS
            .iter()
            .map(|m| m.id)
            .collect::<Vec<_>>(),
    );
    let materials = prop::sample::select(vec!["steel", "steel-s355", "cast-iron-gjl-250"]);
    (
        threads,
        classes,
        pairs,
        methods,
        materials,
        0.5f64..8.0,
        any::<bool>(),
        0.5f64..0.95,
    )
        .prop_map(
            |(thread, class, (finish, lubricant), method, material, clamp_per_d, us, utilisation)| {
                let d: f64 = thread[1..].parse().unwrap_or(10.0);
                serde_json::json!({
                    "thread": thread,
                    "property_class": class,
                    "finish": finish,
                    "lubricant": lubricant,
                    "tightening_method": method,
                    "clamped_material": material,
                    "clamp_length": {"value": (clamp_per_d * d * 10.0).round() / 10.0, "unit": "mm"},
                    "utilisation": utilisation,
                    "units": if us { "us" } else { "si" },
                })
            },
        )
}

proptest! {
    #![proptest_config(Config { cases: 256, failure_persistence: None, ..Config::default() })]

    /// Runs in every `cargo test`: plausible requests that compute give an
    /// answer whose every number is finite.
    #[test]
    fn every_number_of_a_computed_answer_is_finite(body in plausible_request()) {
        let req: SpecRequest = serde_json::from_value(body.clone())
            .map_err(|e| TestCaseError::fail(format!("{body}: {e}")))?;
        computes_or_names(&req, &Snapshot::seed())?;
    }
}

#[test]
fn the_walk_refuses_null_and_counts_numbers() {
    let mut n = 0;
    let ok = serde_json::json!({"a": [1.5, {"b": 2}], "c": "x"});
    assert!(every_number_finite(&ok, "answer", &mut n).is_ok());
    assert_eq!(n, 2);
    let bad = serde_json::json!({"window": {"lower": null}});
    assert!(every_number_finite(&bad, "answer", &mut n).is_err());
}
