//! The joint's pictures: the force–deformation diagram of a spec in its
//! working state (well-formed, labelled, deterministic, its forces the JSON
//! `joint` block's; a 422 naming what a spec without one lacks) and the
//! tightening window of a joint's release (the stored values, the release's
//! ETag, 409 without an active release, 404 with suggestions, `?release=N`,
//! still the release's values after the joint is edited). The plant and its
//! joints are invented for the test (demo data). SQLite and PostgreSQL.

use reqwest::StatusCode;
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{demo_joint, problem_fields, start, token};
use crate::charts::{attr, chart, mark, near, value, well_formed};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    joint_diagram_draws_the_json_joint_block,
    release_chart_draws_the_stored_release,
);

/// Hollowmere Works (demo data): an M10 8.8 bolt through 20 mm of steel
/// under an 8 kN axial working load.
const JOINT: &str = "thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12\
    &clamp_length=20mm&clamped_material=steel-s355&joint_outer_diameter=25mm&loads_axial=8kN";

async fn joint_diagram_draws_the_json_joint_block(db: &TestDb) {
    let app = start(&db.url, true).await;
    for (units, force_scale, axes) in [
        ("si", 1000.0, ["Deformation in µm", "Force in kN"]),
        ("us", 1.0, ["Deformation in µin", "Force in lbf"]),
    ] {
        let query = format!("{JOINT}&units={units}");
        let spec = app.get_json(&format!("/v1/tightening-specs?{query}")).await;
        let joint = &spec["joint"];
        assert!(joint["additional_bolt_load"].is_object(), "{spec}");
        let (svg, _) = chart(
            &app,
            &format!("/v1/tightening-specs/joint-diagram.svg?{query}"),
        )
        .await;
        let doc = well_formed(&svg, "Joint diagram M10 8.8", &axes);
        for role in [
            "bolt-line",
            "clamped-part-line",
            "clamped-part-line-embedded",
            "assembly-preload",
            "embedding-loss",
            "axial-load",
            "additional-bolt-load",
            "residual-clamp-load",
        ] {
            mark(&doc, role);
        }
        let labels: Vec<&str> = doc
            .descendants()
            .filter_map(|n| n.attribute("data-label"))
            .collect();
        for start in ["F_M,min ", "F_Z ", "F_A ", "F_SA ", "F_KR,min "] {
            assert!(labels.iter().any(|l| l.starts_with(start)), "{labels:?}");
        }
        let f = |v: &Value| value(v) / force_scale;
        let tol = 1e-6 * f(&spec["preload"]["min"]);
        let f_m = f(&spec["preload"]["min"]);
        let f_z = f(&joint["embedding"]["preload_loss"]);
        let f_sa = f(&joint["additional_bolt_load"]);
        let f_kr = f(&joint["residual_clamp_load_min"]);
        let level = |role: &str| attr(mark(&doc, role), "data-y");
        assert!(near(level("assembly-preload"), f_m, tol));
        assert!(near(level("additional-bolt-load"), f_m - f_z + f_sa, tol));
        assert!(near(level("residual-clamp-load"), f_kr, tol));
        let bar = |role: &str| {
            let g = mark(&doc, role)
                .descendants()
                .find(|n| n.attribute("data-low").is_some())
                .unwrap();
            (attr(g, "data-low"), attr(g, "data-high"))
        };
        let (lo, hi) = bar("embedding-loss");
        assert!(near(hi - lo, f_z, tol), "F_Z drawn {}, JSON {f_z}", hi - lo);
        // F_A spans F_KR,min to the bolt force: 8 kN, the load given.
        let (lo, hi) = bar("axial-load");
        let f_a = if units == "si" {
            8.0
        } else {
            8000.0 / 4.448_221_615_260_5
        };
        assert!(near(hi - lo, f_a, 1e-3 * f_a), "F_A drawn {}", hi - lo);
        // Φ from the JSON: F_SA = Φ·F_A.
        assert!(near(
            f_sa,
            joint["load_factor"].as_f64().unwrap() * f_a,
            1e-3 * f_a
        ));
    }

    // Without the working state: a 422 naming what is missing.
    let base = "thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12";
    for (query, fields) in [
        (base.to_string(), vec!["clamp_length", "loads_axial"]),
        (
            format!(
                "{base}&clamp_length=20mm&clamped_material=steel-s355&joint_outer_diameter=25mm"
            ),
            vec!["loads_axial"],
        ),
    ] {
        let r = app
            .get(&format!("/v1/tightening-specs/joint-diagram.svg?{query}"))
            .await;
        assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
        let p: Value = r.json().await.unwrap();
        assert_eq!(problem_fields(&p), fields, "{p}");
    }
}

const ID: &str = "HW-S40-BR-003";

fn definition(request: Value) -> Value {
    demo_joint(
        ID,
        "Brake caliper bracket, left (demo)",
        &["hollowmere-demo"],
        request,
    )
}

async fn release_chart_draws_the_stored_release(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let first = json!({"thread": "M10", "property_class": "8.8",
                       "thread_friction": {"min": 0.10, "max": 0.16},
                       "bearing_friction": {"min": 0.10, "max": 0.16}});
    let r = app
        .post_json(Some(&editor), "/v1/joints", &definition(first.clone()))
        .await;
    assert_eq!(
        r.status(),
        StatusCode::CREATED,
        "{}",
        r.text().await.unwrap()
    );
    let path = format!("/v1/joints/{ID}/chart.svg");

    // No release yet: 409 naming `release`; an unknown joint: 404.
    let r = app.get(&path).await;
    assert_eq!(r.status(), StatusCode::CONFLICT);
    assert_eq!(problem_fields(&r.json().await.unwrap()), ["release"]);
    let r = app.get("/v1/joints/HW-S40-BR-00/chart.svg").await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    let p: Value = r.json().await.unwrap();
    assert!(p.to_string().contains(ID), "suggestions: {p}");

    let releases = format!("/v1/joints/{ID}/releases");
    let why = json!({"reason": "pilot build (demo)"});
    let r = app.post_json(Some(&editor), &releases, &why).await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let released = app.get_json(&format!("/v1/joints/{ID}/spec")).await;
    let (svg, tag) = chart(&app, &path).await;
    let hash = released["spec_hash"].as_str().unwrap();
    assert!(tag.contains(&hash[..32]), "{tag}");
    let corners = |svg: &str, spec: &Value| {
        let doc = well_formed(
            svg,
            "Tightening window M10 8.8",
            &["Torque in N·m", "Clamp force in kN"],
        );
        let band = mark(&doc, "torque-window");
        let (x0, x1) = (attr(band, "data-x0"), attr(band, "data-x1"));
        assert!(
            near(x0, value(&spec["torque"]["lower"]), 1e-9),
            "{x0} {spec}"
        );
        assert!(near(x1, value(&spec["torque"]["upper"]), 1e-9), "{x1}");
    };
    corners(&svg, &released["spec"]);

    // The joint is edited (wider friction): the release's chart still
    // shows the release's values; a new release shows the new ones.
    let mut wider = first.clone();
    wider["thread_friction"] = json!({"min": 0.08, "max": 0.20});
    let body = definition(wider);
    let current = app.get(&format!("/v1/joints/{ID}")).await;
    let etag = current.headers()["etag"].to_str().unwrap().to_string();
    let r = app
        .client
        .put(app.url(&format!("/v1/joints/{ID}")))
        .bearer_auth(&editor)
        .header("If-Match", etag)
        .json(&body)
        .send()
        .await
        .unwrap();
    assert!(r.status().is_success(), "{}", r.text().await.unwrap());
    let (again, _) = chart(&app, &path).await;
    assert_eq!(again, svg);
    let r = app.post_json(Some(&editor), &releases, &why).await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let second = app.get_json(&format!("/v1/joints/{ID}/spec")).await;
    let (newer, newer_tag) = chart(&app, &path).await;
    assert_ne!(newer_tag, tag);
    corners(&newer, &second["spec"]);
    let (older, older_tag) = chart(&app, &format!("{path}?release=1")).await;
    assert_eq!(older, svg);
    assert_ne!(older_tag, newer_tag);
    let r = app.get(&format!("{path}?release=0")).await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    let r = app.get(&format!("{path}?release=9")).await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
}
