//! `GET /v1/setpoints` never hides a failed check: every check of the spec
//! is in the answer; while an error check applies the answer is a 422
//! listing the checks unless `accept_checks` names each error; the window
//! as the tool holds it is checked; the cautions that apply are all there.
//! Both backends.

use serde_json::Value;

use crate::support::{expect_problem, TestApp};

/// M8 8.8 screwed 12 mm into EN AW-6082: the head presses more than the
/// aluminium takes, and 12 mm is less engagement than it needs.
const ALU: &str = "thread=M8&property_class=8.8&finish=zinc-electroplated&lubricant=none\
    &tightening_method=dc-nutrunner&joint_type=tapped-hole&clamped_material=aluminium-6082\
    &engagement_length=12mm";
const BOTH: &str = "surface_pressure_exceeded,thread_engagement_too_short";

/// `(hits, misses)` of the setpoint route's answer cache.
async fn setpoint_lookups(app: &TestApp) -> (u64, u64) {
    let text = app.get("/metrics").await.text().await.unwrap_or_default();
    let count = |result: &str| {
        let series = format!(
            "tightspec_answer_cache_lookups_total{{result=\"{result}\",route=\"/v1/setpoints\"}} "
        );
        text.lines()
            .find_map(|l| l.strip_prefix(series.as_str()))
            .and_then(|v| v.trim().parse().ok())
            .unwrap_or(0)
    };
    (count("hit"), count("miss"))
}

fn codes(checks: &Value) -> Vec<&str> {
    checks
        .as_array()
        .map(|a| a.iter().filter_map(|c| c["code"].as_str()).collect())
        .unwrap_or_default()
}

fn check<'a>(checks: &'a Value, code: &str) -> &'a Value {
    checks
        .as_array()
        .and_then(|a| a.iter().find(|c| c["code"] == code))
        .unwrap_or_else(|| panic!("no {code} in {checks}"))
}

async fn refused_until_each_error_is_accepted(app: TestApp) {
    let spec = app.get_json(&format!("/v1/tightening-specs?{ALU}")).await;
    let url = format!("/v1/setpoints?{ALU}");

    // Refused, with every warning and error check and one field error each.
    for _ in 0..2 {
        let p = expect_problem(app.get(&url).await, 422).await;
        assert_eq!(p["type"], "/problems/checks-not-accepted", "{p}");
        assert_eq!(p["errors"].as_array().unwrap().len(), 2, "{p}");
        for e in p["errors"].as_array().unwrap() {
            assert_eq!(e["field"], "accept_checks", "{p}");
        }
        let sp = check(&p["checks"], "surface_pressure_exceeded");
        assert_eq!(sp["severity"], "error");
        assert!(sp["message"].as_str().unwrap().contains("MPa"), "{sp}");
        let te = check(&p["checks"], "thread_engagement_too_short");
        assert_eq!(te["severity"], "error");
        assert!(te["message"].as_str().unwrap().contains("12.0 mm"), "{te}");
        assert!(
            p["detail"].as_str().unwrap().contains("2 error checks"),
            "{p}"
        );
    }
    assert_eq!(
        setpoint_lookups(&app).await,
        (0, 2),
        "refusals are not kept"
    );

    // One accepted is not enough: the other is named.
    let p = expect_problem(
        app.get(&format!("{url}&accept_checks=surface_pressure_exceeded"))
            .await,
        422,
    )
    .await;
    assert_eq!(p["errors"].as_array().unwrap().len(), 1, "{p}");
    assert!(p["errors"][0]["reason"]
        .as_str()
        .unwrap()
        .contains("thread_engagement_too_short"));

    // Both accepted (in any order): the answer records them.
    let accepted =
        format!("{url}&accept_checks=thread_engagement_too_short,surface_pressure_exceeded");
    let r = app.get(&accepted).await;
    assert_eq!(r.status(), 200);
    let sp: Value = r.json().await.unwrap();
    assert_eq!(sp["has_errors"], true, "{sp}");
    assert_eq!(
        sp["accepted_checks"],
        serde_json::json!(["surface_pressure_exceeded", "thread_engagement_too_short"])
    );
    // Every check of the spec is there, with code, severity and sentence.
    for c in spec["checks"].as_array().unwrap() {
        let found = check(&sp["checks"], c["code"].as_str().unwrap());
        assert_eq!(found, c, "{sp}");
    }
    // The window is the spec's, rounded inside it.
    let lower = spec["torque"]["lower"]["value"].as_f64().unwrap();
    let upper = spec["torque"]["upper"]["value"].as_f64().unwrap();
    let (lo, up) = (
        sp["lower"]["value"].as_f64().unwrap(),
        sp["upper"]["value"].as_f64().unwrap(),
    );
    assert!(lower <= lo && lo < up && up <= upper, "{sp}");
    // Kept under its own query string; the refusal was not.
    let again: Value = app.get(&accepted).await.json().await.unwrap();
    assert_eq!(again, sp);
    assert_eq!(setpoint_lookups(&app).await, (1, 4));

    // An unknown code names the field and the nearest codes.
    let p = expect_problem(
        app.get(&format!(
            "{url}&accept_checks=surface_pressure_exceded,thread_engagement_too_short"
        ))
        .await,
        400,
    )
    .await;
    assert_eq!(p["errors"][0]["field"], "accept_checks", "{p}");
    assert_eq!(
        p["errors"][0]["suggestions"][0],
        "surface_pressure_exceeded"
    );
    expect_problem(app.get(&format!("{url}&accept_checks=")).await, 400).await;

    // Without error checks: a clean answer, no acceptance needed; a known
    // code that does not apply is not recorded.
    let clean = "/v1/setpoints?thread=M10&property_class=8.8&finish=zinc-electroplated\
        &lubricant=none&tightening_method=dc-nutrunner";
    for q in [clean.to_string(), format!("{clean}&accept_checks={BOTH}")] {
        let sp = app.get_json(&q).await;
        assert_eq!(sp["has_errors"], false, "{sp}");
        assert_eq!(sp["accepted_checks"], serde_json::json!([]), "{sp}");
        assert!(sp["checks"].is_array(), "{sp}");
    }
}

#[tokio::test]
async fn aluminium_case_refused_until_each_error_is_accepted_sqlite() {
    refused_until_each_error_is_accepted(TestApp::spawn().await).await;
}

#[tokio::test]
async fn aluminium_case_refused_until_each_error_is_accepted_postgres() {
    refused_until_each_error_is_accepted(TestApp::builder().postgres().await.spawn().await).await;
}

async fn window_held_by_the_tool(app: TestApp) {
    // M6 8.8 in lbf·ft at resolution 1 rounds to one value.
    let m6 = "/v1/setpoints?thread=M6&property_class=8.8&finish=zinc-electroplated&lubricant=none\
        &torque_unit=lbf.ft&resolution=1";
    let p = expect_problem(app.get(m6).await, 422).await;
    let zero = check(&p["checks"], "setpoint_window_zero_width");
    assert_eq!(zero["severity"], "error", "{p}");
    let sp = app
        .get_json(&format!("{m6}&accept_checks=setpoint_window_zero_width"))
        .await;
    assert_eq!(sp["lower"], sp["upper"], "{sp}");
    assert_eq!(sp["lower"], sp["target"], "{sp}");
    assert_eq!(sp["accepted_checks"][0], "setpoint_window_zero_width");

    // Fewer than two steps in the window: a warning, answered.
    let base = "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none";
    let spec = app.get_json(&format!("/v1/tightening-specs?{base}")).await;
    let width = spec["torque"]["upper"]["value"].as_f64().unwrap()
        - spec["torque"]["lower"]["value"].as_f64().unwrap();
    let torque = Held {
        parameter: "resolution",
        under_two_steps: "setpoint_window_under_two_steps",
        zero_width: "setpoint_window_zero_width",
    };
    let steps: Vec<f64> = (1..=16).map(|i| f64::from(i) / 2.0).collect();
    let (warned, _) = torque.sweep(&app, base, width, &steps).await;
    assert!(warned > 0, "some resolution gives fewer than two steps");

    // The same for the angle window of torque-angle tightening.
    let base = "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none\
        &tightening_method=torque-angle&clamp_length=40mm&joint_outer_diameter=30mm\
        &clamped_material=steel-s355";
    let spec = app.get_json(&format!("/v1/tightening-specs?{base}")).await;
    let width = spec["angle"]["max"]["value"].as_f64().unwrap()
        - spec["angle"]["min"]["value"].as_f64().unwrap();
    let angle = Held {
        parameter: "angle_resolution",
        under_two_steps: "setpoint_angle_window_under_two_steps",
        zero_width: "setpoint_angle_window_zero_width",
    };
    let steps: Vec<f64> = (1..=40).map(|i| f64::from(i) / 2.0).collect();
    let (warned, single) = angle.sweep(&app, base, width, &steps).await;
    assert!(warned > 0 && single > 0, "warned {warned}, single {single}");
}

/// A window as the tool holds it, swept over resolutions.
struct Held {
    parameter: &'static str,
    under_two_steps: &'static str,
    zero_width: &'static str,
}

impl Held {
    /// Asks for setpoints at each resolution: an answer carries the
    /// under-two-steps warning exactly when the unrounded window is
    /// narrower than two steps; a refusal is the zero-width error (then
    /// accepting it answers one value) or no step inside the window.
    /// Returns how many were warned and how many rounded to one value.
    async fn sweep(&self, app: &TestApp, base: &str, width: f64, steps: &[f64]) -> (usize, usize) {
        let (mut warned, mut single) = (0, 0);
        for res in steps {
            let url = format!("/v1/setpoints?{base}&{}={res}", self.parameter);
            let r = app.get(&url).await;
            let status = r.status().as_u16();
            let body: Value = r.json().await.unwrap();
            let found = codes(&body["checks"]);
            if status == 200 {
                let narrow = width < 2.0 * res;
                assert_eq!(
                    found.contains(&self.under_two_steps),
                    narrow,
                    "{res}: {body}"
                );
                assert!(!found.contains(&self.zero_width), "{body}");
                warned += usize::from(narrow);
                continue;
            }
            assert_eq!(status, 422, "{body}");
            if !found.contains(&self.zero_width) {
                assert_eq!(body["errors"][0]["field"], self.parameter, "{body}");
                continue;
            }
            single += 1;
            let accepted = app
                .get_json(&format!("{url}&accept_checks={}", self.zero_width))
                .await;
            let (lo, hi) = if self.parameter == "resolution" {
                (&accepted["lower"], &accepted["upper"])
            } else {
                (&accepted["angle"]["min"], &accepted["angle"]["max"])
            };
            assert_eq!(lo, hi, "{accepted}");
        }
        (warned, single)
    }
}

#[tokio::test]
async fn window_held_by_the_tool_sqlite() {
    window_held_by_the_tool(TestApp::spawn().await).await;
}

#[tokio::test]
async fn window_held_by_the_tool_postgres() {
    window_held_by_the_tool(TestApp::builder().postgres().await.spawn().await).await;
}

fn has(cautions: &Value, words: &str) -> bool {
    cautions
        .as_array()
        .unwrap()
        .iter()
        .any(|c| c.as_str().unwrap().contains(words))
}

const SAFETY: &str = "safety-critical";
const ELASTIC: &str = "elastic VDI 2230 resilience model";
const NO_REUSE: &str = "must not be tightened again or re-used";
const PRECEDENCE: &str = "licensed engineering practice";

async fn cautions_that_apply(app: TestApp) {
    let base = "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none";
    // No angle: no elastic-model caution; the others always.
    for route in ["tightening-specs", "setpoints"] {
        let a = app.get_json(&format!("/v1/{route}?{base}")).await;
        let c = &a["cautions"];
        assert!(
            has(c, SAFETY) && has(c, PRECEDENCE) && has(c, "ISO 16047"),
            "{a}"
        );
        assert!(!has(c, ELASTIC) && !has(c, NO_REUSE), "{route}: {c}");
    }
    // An angle window: the elastic-model caution, on both answers.
    let joint = "&clamp_length=40mm&joint_outer_diameter=30mm&clamped_material=steel-s355";
    for route in ["tightening-specs", "setpoints"] {
        let a = app
            .get_json(&format!(
                "/v1/{route}?{base}&tightening_method=torque-angle{joint}"
            ))
            .await;
        assert!(a["angle"].is_object(), "{a}");
        assert!(
            has(&a["cautions"], ELASTIC) && has(&a["cautions"], SAFETY),
            "{a}"
        );
    }
    // Yield-controlled tightening: do not re-use the bolt.
    for route in ["tightening-specs", "setpoints"] {
        let a = app
            .get_json(&format!(
                "/v1/{route}?{base}&tightening_method=yield-controlled{joint}"
            ))
            .await;
        assert!(has(&a["cautions"], NO_REUSE), "{a}");
        assert!(has(&a["cautions"], SAFETY), "{a}");
    }
}

#[tokio::test]
async fn cautions_that_apply_sqlite() {
    cautions_that_apply(TestApp::spawn().await).await;
}

#[tokio::test]
async fn cautions_that_apply_postgres() {
    cautions_that_apply(TestApp::builder().postgres().await.spawn().await).await;
}
