//! Friction calibration over HTTP: an engineer posts a test series, reads
//! the statistics, stores it, sees the proposed catalogue change and its
//! impact on the released joints, applies it, and finds the series from the entry's
//! history. Bad series are refused with every field named and nothing
//! stored. Runs on SQLite and PostgreSQL.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{problem_fields, start, token};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    engineer_evaluates_stores_proposes_applies_and_traces_a_series,
    bad_series_are_refused_with_every_field_named_and_nothing_stored,
    us_customary_thrust_bearing_series,
);

const PI: f64 = std::f64::consts::PI;

/// M10 (P 1.5 mm, d2 = 10 − 0.649519·1.5 mm, ISO 68-1) on a bearing of
/// 16/11 mm (D_b = 13.5 mm): thread and total torque for the given
/// frictions by the ISO 16047 relations, T_th = F·(P/(2π) + μ_th·d2/(2·cos 30°))
/// and T = T_th + F·μ_b·D_b/2 (formula form recalled from memory).
fn m10_torques(f_n: f64, mu_th: f64, mu_b: f64) -> (f64, f64) {
    let (p, d2, db) = (1.5e-3, (10.0 - 0.649519 * 1.5) * 1e-3, 13.5e-3);
    let t_th = f_n * (p / (2.0 * PI) + mu_th * d2 / (2.0 * (PI / 6.0).cos()));
    (t_th, t_th + f_n * mu_b * db / 2.0)
}

/// Hollowmere Works (demo data): ten zinc-flake M10 8.8 screws from the
/// Kestrel K4 mower-deck joint on the torque–tension rig.
pub(crate) fn demo_series() -> (Value, Vec<f64>, Vec<f64>) {
    let thread_mu: Vec<f64> = (0..10).map(|i| 0.11 + 0.002 * f64::from(i)).collect();
    let bearing_mu: Vec<f64> = (0..10).map(|i| 0.15 - 0.003 * f64::from(i)).collect();
    let specimens: Vec<Value> = thread_mu
        .iter()
        .zip(&bearing_mu)
        .map(|(&th, &b)| {
            let f = 25_275.0;
            let (t_th, t) = m10_torques(f, th, b);
            json!({
                "clamp_force": {"value": f / 1000.0, "unit": "kN"},
                "total_torque": {"value": t, "unit": "N·m"},
                "thread_torque": {"value": t_th, "unit": "N·m"}
            })
        })
        .collect();
    let body = json!({
        "thread": "M10",
        "property_class": "8.8",
        "finish": "zinc-flake",
        "lubricant": "none",
        "bearing": {
            "outer_diameter": {"value": 16.0, "unit": "mm"},
            "inner_diameter": {"value": 11.0, "unit": "mm"}
        },
        "specimens": specimens,
        "notes": "Hollowmere Works rig 2, Kestrel K4 deck bolts (demo data)"
    });
    (body, thread_mu, bearing_mu)
}

fn mean(v: &[f64]) -> f64 {
    v.iter().sum::<f64>() / v.len() as f64
}

fn close(a: &Value, b: f64) -> bool {
    a.as_f64().is_some_and(|a| ((a - b) / b).abs() < 1e-9)
}

async fn engineer_evaluates_stores_proposes_applies_and_traces_a_series(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let reader = token(db, "hollowmere-line", Role::Reader).await;
    let (series, thread_mu, bearing_mu) = demo_series();

    // Evaluate: nothing stored, every specimen back, statistics per coefficient.
    let r = app
        .post_json(None, "/v1/friction-tests/evaluate", &series)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
    let eval: Value = r.json().await.unwrap();
    let specimens = eval["specimens"].as_array().unwrap();
    assert_eq!(specimens.len(), 10);
    for (s, (&th, &b)) in specimens.iter().zip(thread_mu.iter().zip(&bearing_mu)) {
        assert_eq!(s["form"], "full");
        assert!(close(&s["thread_friction"], th), "{s}");
        assert!(close(&s["bearing_friction"], b), "{s}");
        assert!(s["nut_factor"].as_f64().unwrap() > 0.1);
    }
    let st = &eval["statistics"]["thread_friction"];
    assert_eq!(st["count"], 10);
    assert!(close(&st["mean"], mean(&thread_mu)));
    assert!(close(&st["min"], 0.11) && close(&st["max"], 0.128));
    assert!(st["std_dev"].as_f64().unwrap() > 0.0);
    assert!(eval["method"]["std_dev"]
        .as_str()
        .unwrap()
        .contains("n − 1"));
    assert!(eval["cautions"].as_array().unwrap().len() >= 2);
    assert!(app.get("/v1/friction-tests/1").await.status() == StatusCode::NOT_FOUND);

    // Storing needs an editor; nothing is stored when refused.
    let post = |tok: Option<&str>| {
        let mut rq = app.client.post(app.url("/v1/friction-tests")).json(&series);
        if let Some(t) = tok {
            rq = rq.bearer_auth(t);
        }
        rq.send()
    };
    assert_eq!(post(None).await.unwrap().status(), StatusCode::UNAUTHORIZED);
    assert_eq!(
        post(Some(&reader)).await.unwrap().status(),
        StatusCode::FORBIDDEN
    );
    assert_eq!(
        app.get("/v1/friction-tests/1").await.status(),
        StatusCode::NOT_FOUND
    );
    let r = post(Some(&editor)).await.unwrap();
    assert_eq!(r.status(), StatusCode::CREATED);
    let location = r.headers()["location"].to_str().unwrap().to_owned();
    let stored: Value = r.json().await.unwrap();
    let id = stored["id"].as_i64().unwrap();
    assert_eq!(location, format!("/v1/friction-tests/{id}"));
    assert_eq!(stored["actor"], "hollowmere-lab");
    assert_eq!(stored["evidence"], format!("friction-test:{id}"));
    assert_eq!(stored["evaluation"]["statistics"], eval["statistics"]);
    let read = app.get_json(&location).await;
    assert_eq!(read["series"], series);
    assert_eq!(read["evaluation"], stored["evaluation"]);

    // Proposal: basis is the user's choice; a diff and the impact on joints.
    let r = app.get(&format!("/v1/friction-tests/{id}/proposal")).await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let p = app
        .get_json(&format!("/v1/friction-tests/{id}/proposal?basis=observed"))
        .await;
    let entry_id = p["entry_id"].as_i64().unwrap();
    let (entry, etag) = app.entry(entry_id).await;
    let base = app.revision().await;
    assert_eq!(
        (entry["finish"].as_str(), entry["lubricant"].as_str()),
        (Some("zinc-flake"), Some("none"))
    );
    assert_eq!(p["entry_etag"], etag);
    let thread = &p["changes"][0];
    assert_eq!(thread["coefficient"], "thread_friction");
    assert_eq!(thread["current"], entry["thread_friction"]);
    assert_eq!(thread["proposed"], json!({"min": 0.11, "max": 0.128}));
    assert_eq!(
        p["changes"][1]["proposed"],
        json!({"min": 0.123, "max": 0.15})
    );
    // No joint is registered here: the impact is empty and says so
    // (`impact_changes.rs` has the joints).
    assert_eq!(p["impact"]["joints"], json!([]));
    assert!(p.get("effect").is_none(), "{p}");
    let sigma = app
        .get_json(&format!(
            "/v1/friction-tests/{id}/proposal?basis=three_sigma"
        ))
        .await;
    assert_eq!(sigma["basis"], "three_sigma");

    // Apply: editor, reason, If-Match.
    let apply = |etag: Option<String>, body: Value| {
        let mut rq = app
            .client
            .post(app.url(&format!("/v1/friction-tests/{id}/apply")))
            .bearer_auth(&editor)
            .json(&body);
        if let Some(e) = etag {
            rq = rq.header("if-match", e);
        }
        rq.send()
    };
    let good =
        json!({"basis": "observed", "reason": "Rig 2 series on Kestrel K4 deck bolts (demo)"});
    let r = apply(None, good.clone()).await.unwrap();
    assert_eq!(r.status(), StatusCode::PRECONDITION_REQUIRED);
    let r = apply(Some(etag.clone()), json!({"basis": "observed"}))
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let problem: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&problem), ["reason"]);
    assert_eq!(
        app.entry(entry_id).await.1,
        etag,
        "refused applies change nothing"
    );
    let r = apply(Some(etag.clone()), good.clone()).await.unwrap();
    assert_eq!(r.status(), StatusCode::OK);
    let applied: Value = r.json().await.unwrap();
    let revision = applied["catalogue_revision"].as_i64().unwrap();
    assert_eq!(revision, base + 1);
    assert_eq!(
        applied["entry"]["thread_friction"],
        json!({"min": 0.11, "max": 0.128})
    );
    let (after, new_etag) = app.entry(entry_id).await;
    assert_ne!(new_etag, etag);
    assert!(after["source"]
        .as_str()
        .unwrap()
        .contains(&format!("friction test series {id}")));
    // The stale ETag is refused now.
    assert_eq!(
        apply(Some(etag), good).await.unwrap().status(),
        StatusCode::PRECONDITION_FAILED
    );

    // From the entry's history back to the series, and from the series to the revision.
    let history = app
        .get_json(&format!("/v1/friction-entries/{entry_id}/history"))
        .await;
    let items = history
        .as_array()
        .or_else(|| history["history"].as_array())
        .or_else(|| history["items"].as_array())
        .expect("history list");
    let last = items.last().unwrap();
    assert_eq!(last["revision"], revision);
    assert_eq!(last["evidence"], format!("friction-test:{id}"));
    let read = app.get_json(&location).await;
    assert_eq!(read["applications"][0]["revision"], revision);
    assert_eq!(read["applications"][0]["basis"], "observed");
}

async fn bad_series_are_refused_with_every_field_named_and_nothing_stored(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let (mut series, _, _) = demo_series();
    let s = series["specimens"].as_array_mut().unwrap();
    s[1]["clamp_force"]["value"] = json!(0.0);
    s[2]["total_torque"]["value"] = json!(-5.0);
    s[3]["thread_torque"]["value"] = json!(500.0);
    s[4]["clamp_force"]["unit"] = json!("N·m");
    s[5] = json!({"curve": [
        {"clamp_force": {"value": 0.0, "unit": "kN"}, "total_torque": {"value": 0.0, "unit": "N·m"}},
        {"clamp_force": {"value": 12.0, "unit": "kN"}, "total_torque": {"value": 25.0, "unit": "N·m"}}
    ]});
    for path in ["/v1/friction-tests/evaluate", "/v1/friction-tests"] {
        let r = app.post_json(Some(&editor), path, &series).await;
        assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY, "{path}");
        assert_eq!(r.headers()["content-type"], "application/problem+json");
        let problem: Value = r.json().await.unwrap();
        assert_eq!(
            problem_fields(&problem),
            [
                "specimens[1].clamp_force",
                "specimens[2].total_torque",
                "specimens[3].thread_torque",
                "specimens[4].clamp_force",
                "specimens[5].curve",
            ],
            "{problem}"
        );
    }
    assert_eq!(
        app.get("/v1/friction-tests/1").await.status(),
        StatusCode::NOT_FOUND
    );

    // Unknown names: 404 with suggestions; a stored series needs finish and lubricant.
    let (mut unknown, _, _) = demo_series();
    unknown["finish"] = json!("zinc-flak");
    let r = app
        .post_json(None, "/v1/friction-tests/evaluate", &unknown)
        .await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    let problem: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&problem), ["finish"]);
    let (mut anonymous, _, _) = demo_series();
    anonymous.as_object_mut().unwrap().remove("lubricant");
    let r = app
        .post_json(Some(&editor), "/v1/friction-tests", &anonymous)
        .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let problem: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&problem), ["lubricant"]);
    // Unknown body fields are malformed, not ignored.
    let (mut typo, _, _) = demo_series();
    typo["thrust_bearings"] = json!(true);
    let r = app
        .post_json(None, "/v1/friction-tests/evaluate", &typo)
        .await;
    assert_eq!(r.status(), StatusCode::BAD_REQUEST);
    assert_eq!(
        app.get("/v1/friction-tests/1").await.status(),
        StatusCode::NOT_FOUND
    );
}

async fn us_customary_thrust_bearing_series(db: &TestDb) {
    // Common practice check values: head friction removed by a thrust
    // bearing, about 3100 lbf from about 270 lbf·in on 3/4-10 UNC →
    // efficiency about 18 %, thread friction about 0.18.
    let app = start(&db.url, true).await;
    let body = json!({
        "thread": "3/4-10 UNC",
        "thrust_bearing": true,
        "specimens": [{
            "clamp_force": {"value": 3100.0, "unit": "lbf"},
            "total_torque": {"value": 270.0, "unit": "lbf·in"}
        }]
    });
    let r = app
        .post_json(None, "/v1/friction-tests/evaluate?units=us", &body)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
    let eval: Value = r.json().await.unwrap();
    let s = &eval["specimens"][0];
    assert_eq!(s["form"], "thrust_bearing");
    assert_eq!(s["clamp_force"]["unit"], "lbf");
    assert!((s["clamp_force"]["value"].as_f64().unwrap() - 3100.0).abs() < 1e-6);
    assert_eq!(s["total_torque"]["unit"], "lbf·in");
    assert!(
        (s["efficiency"].as_f64().unwrap() - 0.18).abs() < 0.005,
        "{s}"
    );
    assert!(
        (s["thread_friction"].as_f64().unwrap() - 0.18).abs() < 0.005,
        "{s}"
    );
    assert_eq!(s["bearing_friction"], Value::Null);
    assert_eq!(s["total_friction"], Value::Null);
    assert_eq!(eval["geometry"]["pitch"]["unit"], "in");
    assert!(eval["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .any(|w| w["code"] == "series_too_small"));
    let r = app
        .post_json(None, "/v1/friction-tests/evaluate?units=metric", &body)
        .await;
    assert_eq!(r.status(), StatusCode::BAD_REQUEST);
}

#[tokio::test(flavor = "multi_thread", worker_threads = 2)]
async fn curves_are_read_at_75_percent_of_the_proof_load() {
    // M10 8.8: the evaluation point is 0.75·F_p (ISO 16047); the curve is
    // sampled every 4 kN with torques from the ISO 16047 relations, so the
    // interpolated point gives back the frictions it was made with.
    let db = TestDb::sqlite();
    let app = start(&db.url, true).await;
    let curve: Vec<Value> = (0..=10)
        .map(|i| {
            let f = 4000.0 * f64::from(i);
            let (t_th, t) = m10_torques(f, 0.12, 0.16);
            json!({
                "clamp_force": {"value": f, "unit": "N"},
                "total_torque": {"value": t, "unit": "N·m"},
                "thread_torque": {"value": t_th, "unit": "N·m"},
                "angle": {"value": 9.0 * f64::from(i), "unit": "degrees"}
            })
        })
        .collect();
    let body = json!({
        "thread": "M10",
        "property_class": "8.8",
        "bearing": {
            "outer_diameter": {"value": 16.0, "unit": "mm"},
            "inner_diameter": {"value": 11.0, "unit": "mm"}
        },
        "specimens": [{"curve": curve}]
    });
    let r = app
        .post_json(None, "/v1/friction-tests/evaluate", &body)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
    let eval: Value = r.json().await.unwrap();
    let proof = eval["geometry"]["proof_load"]["value"].as_f64().unwrap();
    let fe = eval["evaluation_clamp_force"]["value"].as_f64().unwrap();
    assert!(((fe / proof) - 0.75).abs() < 1e-12, "{fe} of {proof}");
    let s = &eval["specimens"][0];
    assert_eq!(s["from_curve"], true);
    assert!(close(&s["thread_friction"], 0.12), "{s}");
    assert!(close(&s["bearing_friction"], 0.16), "{s}");
    assert!(close(&s["angle"]["value"], 9.0 * fe / 4000.0), "{s}");
}
