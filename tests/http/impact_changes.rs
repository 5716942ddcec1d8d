//! `POST /v1/catalogue/impact` for each kind of change on a small registry
//! of the invented Hollowmere plant (demo data), on SQLite and PostgreSQL:
//! a created entry, an updated entry (direction and the reported percent
//! recomputed from the figures), a retired entry (the joint that loses its
//! friction names the problem) and a stored friction test, whose proposal
//! lists the same joints with the same figures. Bad bodies name their
//! field; nothing is ever written.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::{Role, Store};

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::friction_tests::demo_series;
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    each_change_shows_its_effect_on_the_released_joints_and_writes_nothing,
    a_friction_test_proposal_lists_the_impact_the_impact_route_gives,
);

/// M10 8.8, zinc-electroplated, no lubricant: friction from the catalogue.
pub(crate) const PLATED: &str = "HW-K4-PL-001";
/// M10 8.8, zinc flake, no lubricant (the demo friction test's pair).
pub(crate) const FLAKE: &str = "HW-K4-ZF-002";
/// M10 8.8, zinc flake with wax: no catalogue entry for the pair, so the
/// joint gives its friction itself.
const WAXED: &str = "HW-K4-ZW-003";
/// Defined but never released: never in an impact.
const DRAFTED: &str = "HW-K4-PL-004";

const IMPACT: &str = "/v1/catalogue/impact";

pub(crate) fn catalogue_request(finish: &str) -> Value {
    json!({"thread": "M10", "property_class": "8.8", "finish": finish, "lubricant": "none"})
}

fn waxed_request() -> Value {
    json!({"thread": "M10", "property_class": "8.8", "finish": "zinc-flake", "lubricant": "wax",
           "thread_friction": {"min": 0.10, "max": 0.13},
           "bearing_friction": {"min": 0.10, "max": 0.13}})
}

async fn post(app: &Instance, token: Option<&str>, path: &str, body: Value) -> (StatusCode, Value) {
    let r = app.post_json(token, path, &body).await;
    let st = r.status();
    (st, r.json().await.unwrap_or(Value::Null))
}

/// Defines joint `id` and, when `release`, releases it.
pub(crate) async fn register(
    app: &Instance,
    editor: &str,
    id: &str,
    request: Value,
    release: bool,
) {
    let definition = json!({
        "id": id,
        "title": "Mower deck bracket (demo)",
        "tags": ["hollowmere-demo"],
        "request": request,
        "setpoints": {"torque_unit": "N·m", "resolution": 0.1, "angle_resolution": 1.0},
    });
    let (st, body) = post(app, Some(editor), "/v1/joints", definition).await;
    assert_eq!(st, StatusCode::CREATED, "{body}");
    if release {
        let path = format!("/v1/joints/{id}/releases");
        let (st, body) = post(app, Some(editor), &path, json!({"reason": "demo release"})).await;
        assert_eq!(st, StatusCode::CREATED, "{body}");
    }
}

async fn impact(app: &Instance, body: Value) -> Value {
    let (st, answer) = post(app, None, IMPACT, body).await;
    assert_eq!(st, StatusCode::OK, "{answer}");
    answer
}

fn row<'a>(answer: &'a Value, id: &str) -> &'a Value {
    answer["joints"]
        .as_array()
        .expect("joints")
        .iter()
        .find(|j| j["id"] == id)
        .unwrap_or_else(|| panic!("{id} not in {answer}"))
}

fn ids(answer: &Value) -> Vec<&str> {
    let mut ids: Vec<&str> = answer["joints"]
        .as_array()
        .expect("joints")
        .iter()
        .map(|j| j["id"].as_str().unwrap())
        .collect();
    ids.sort();
    ids
}

fn unchanged(answer: &Value, id: &str) {
    let r = row(answer, id);
    assert_eq!(r["changed"], false, "{r}");
    assert_eq!(r["before"], r["after"], "{r}");
    assert_eq!(r["change_percent"], 0.0, "{r}");
}

fn value(figures: &Value, name: &str) -> f64 {
    figures[name]["value"]
        .as_f64()
        .unwrap_or_else(|| panic!("{name} in {figures}"))
}

/// The largest |after / before − 1| of the figures in percent, two
/// decimals, recomputed from the JSON.
fn largest_percent(r: &Value) -> f64 {
    let names = ["lower", "target", "upper", "preload_min", "preload_max"];
    let largest = names
        .iter()
        .map(|n| (value(&r["after"], n) / value(&r["before"], n) - 1.0).abs() * 100.0)
        .fold(0.0, f64::max);
    (largest * 100.0).round() / 100.0
}

async fn review_events(db: &TestDb) -> usize {
    let store = Store::open(Some(&db.url)).await.expect("store");
    let events = store.outbox_after(0, 10_000).await.expect("outbox");
    store.close().await;
    events
        .iter()
        .filter(|e| e.event.kind == "joint.review_due")
        .count()
}

async fn entry_of(app: &Instance, finish: &str, lubricant: &str) -> (i64, Value, String) {
    let list = app
        .get_json(&format!(
            "/v1/friction-entries?finish={finish}&lubricant={lubricant}"
        ))
        .await;
    let id = list["entries"][0]["id"].as_i64().expect("entry id");
    let (entry, etag) = app.entry(id).await;
    (id, entry, etag)
}

async fn each_change_shows_its_effect_on_the_released_joints_and_writes_nothing(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    register(
        &app,
        &editor,
        PLATED,
        catalogue_request("zinc-electroplated"),
        true,
    )
    .await;
    register(&app, &editor, FLAKE, catalogue_request("zinc-flake"), true).await;
    register(&app, &editor, WAXED, waxed_request(), true).await;
    register(
        &app,
        &editor,
        DRAFTED,
        catalogue_request("zinc-electroplated"),
        false,
    )
    .await;
    let revision = app.revision().await;
    let (plated_id, plated, plated_etag) = entry_of(&app, "zinc-electroplated", "none").await;

    // Create: an entry for zinc flake with wax, whose ranges do not hold the
    // waxed joint's own friction. Its figures stay (the request gives the
    // friction); the engine now flags them as outside the measured range.
    let created = impact(
        &app,
        json!({"action": "create", "entry": {
            "finish": "zinc-flake", "lubricant": "wax",
            "thread_friction": {"min": 0.14, "max": 0.18},
            "bearing_friction": {"min": 0.14, "max": 0.18},
            "source": "Hollowmere Works rig 2, series HW-21 (demo data)"}}),
    )
    .await;
    assert_eq!(ids(&created), [PLATED, FLAKE, WAXED]);
    let waxed = row(&created, WAXED);
    assert_eq!(waxed["changed"], true, "{waxed}");
    assert_eq!(waxed["before"], waxed["after"], "{waxed}");
    assert_eq!(waxed["change_percent"], 0.0);
    // Raised for both ranges (thread and bearing), listed once.
    assert_eq!(
        waxed["checks_added"],
        json!(["friction_outside_measured_range"])
    );
    assert_eq!(waxed["checks_removed"], json!([]));
    unchanged(&created, PLATED);
    unchanged(&created, FLAKE);
    assert_eq!(created["summary"]["compared"], 3);
    assert_eq!(created["summary"]["affected"], 1);
    assert!(
        created["note"].as_str().unwrap().contains("1 would change"),
        "{created}"
    );

    // Update: more friction on the plated entry needs more torque for the
    // same preload; the reported percent is the largest figure's ratio.
    let mut raised = plated.clone();
    for side in ["thread_friction", "bearing_friction"] {
        for end in ["min", "max"] {
            let v = raised[side][end].as_f64().unwrap();
            raised[side][end] = json!(((v + 0.02) * 1000.0).round() / 1000.0);
        }
    }
    let updated = impact(
        &app,
        json!({"action": "update", "entry_id": plated_id, "entry": raised}),
    )
    .await;
    let moved = row(&updated, PLATED);
    assert_eq!(moved["changed"], true, "{moved}");
    for figure in ["lower", "target", "upper"] {
        assert!(
            value(&moved["after"], figure) > value(&moved["before"], figure),
            "{figure}: {moved}"
        );
    }
    let pct = moved["change_percent"].as_f64().unwrap();
    assert!(
        (pct - largest_percent(moved)).abs() < 0.0051,
        "{pct}: {moved}"
    );
    assert!(pct > 0.0);
    assert_eq!(
        updated["summary"]["largest_change_percent"],
        moved["change_percent"]
    );
    assert_eq!(updated["summary"]["affected"], 1);
    unchanged(&updated, FLAKE);
    unchanged(&updated, WAXED);

    // Retire: the plated joint loses its friction entry and says why.
    let retired = impact(&app, json!({"action": "retire", "entry_id": plated_id})).await;
    let lost = row(&retired, PLATED);
    assert_eq!(lost["changed"], true, "{lost}");
    assert!(lost["after"].is_null(), "{lost}");
    assert!(lost["change_percent"].is_null(), "{lost}");
    assert!(!lost["problem"].as_str().unwrap_or("").is_empty(), "{lost}");
    unchanged(&retired, FLAKE);
    unchanged(&retired, WAXED);

    // Bad bodies are refused naming the field.
    let (_, flake, _) = entry_of(&app, "zinc-flake", "none").await;
    for (body, status, field) in [
        (json!({"action": "retire"}), 422, "entry_id"),
        (
            json!({"action": "retire", "entry_id": plated_id, "entry": plated.clone()}),
            422,
            "entry",
        ),
        (
            json!({"action": "update", "entry_id": plated_id}),
            422,
            "entry",
        ),
        (
            json!({"action": "create", "entry_id": 3, "entry": flake.clone()}),
            422,
            "entry_id",
        ),
        (
            json!({"action": "retire", "entry_id": plated_id, "basis": "observed"}),
            422,
            "basis",
        ),
        (json!({"action": "replace"}), 422, "action"),
        (json!({"entry": flake.clone()}), 422, "action"),
        (
            json!({"action": "retire", "entry_id": 99_999}),
            404,
            "entry_id",
        ),
        (json!({"friction_test": 99_999}), 404, "friction_test"),
    ] {
        let (st, p) = post(&app, None, IMPACT, body.clone()).await;
        assert_eq!(st.as_u16(), status, "{body}: {p}");
        assert!(
            problem_fields(&p)
                .iter()
                .any(|f| f == field || f.ends_with(&format!(".{field}"))),
            "{field} for {body}: {p}"
        );
    }
    // A second active entry for the same pair is refused as the change is.
    let (st, p) = post(
        &app,
        None,
        IMPACT,
        json!({"action": "create", "entry": flake}),
    )
    .await;
    assert_eq!(st, StatusCode::UNPROCESSABLE_ENTITY, "{p}");
    assert!(
        problem_fields(&p).iter().all(|f| f.starts_with("entry")),
        "{p}"
    );

    // Nothing was written: same revision and entry, no review marks.
    assert_eq!(app.revision().await, revision);
    assert_eq!(app.entry(plated_id).await.1, plated_etag);
    assert_eq!(review_events(db).await, 0);
    let due = app.get_json("/v1/joints?review=due").await;
    assert_eq!(due["joints"], json!([]), "{due}");
}

async fn a_friction_test_proposal_lists_the_impact_the_impact_route_gives(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let (series, _, _) = demo_series();
    let r = app
        .post_json(Some(&editor), "/v1/friction-tests", &series)
        .await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let id = r.json::<Value>().await.unwrap()["id"].as_i64().unwrap();
    let proposal = |basis: &'static str| {
        let app = &app;
        async move {
            app.get_json(&format!("/v1/friction-tests/{id}/proposal?basis={basis}"))
                .await
        }
    };

    // No released joint yet: an empty impact that says so.
    let empty = proposal("observed").await;
    assert_eq!(empty["impact"]["joints"], json!([]));
    assert_eq!(empty["impact"]["summary"]["compared"], 0);
    let note = empty["impact"]["note"].as_str().unwrap();
    assert!(note.contains("No joint has an active release"), "{note}");
    assert!(empty.get("effect").is_none(), "{empty}");

    register(&app, &editor, FLAKE, catalogue_request("zinc-flake"), true).await;
    register(
        &app,
        &editor,
        PLATED,
        catalogue_request("zinc-electroplated"),
        true,
    )
    .await;
    let revision = app.revision().await;
    for basis in ["observed", "three_sigma"] {
        let p = proposal(basis).await;
        let direct = impact(&app, json!({"friction_test": id, "basis": basis})).await;
        assert_eq!(p["impact"], direct, "{basis}");
        assert_eq!(ids(&direct), [PLATED, FLAKE]);
        // The series tested the flake joint's pair: it moves; the plated
        // joint's entry is untouched.
        assert_eq!(row(&direct, FLAKE)["changed"], true, "{direct}");
        unchanged(&direct, PLATED);
        assert_eq!(direct["summary"]["affected"], 1);
    }
    // The basis defaults to three_sigma on the impact route.
    let default = impact(&app, json!({"friction_test": id})).await;
    assert_eq!(default, proposal("three_sigma").await["impact"]);

    // An unknown basis is unknown (404, as everywhere) with the two known.
    let (st, p) = post(
        &app,
        None,
        IMPACT,
        json!({"friction_test": id, "basis": "median"}),
    )
    .await;
    assert_eq!(st, StatusCode::NOT_FOUND, "{p}");
    assert_eq!(problem_fields(&p), ["basis"]);
    assert_eq!(
        p["errors"][0]["suggestions"],
        json!(["observed", "three_sigma"])
    );
    assert_eq!(app.revision().await, revision);
    assert_eq!(review_events(db).await, 0);
}
