//! The stored friction test's page shows the proposal's impact on the
//! released joints (SQLite and PostgreSQL): with none released it says so;
//! once a joint on the tested pair is released, the table lists it with a
//! link to its page, its figures before → after and the caution. The
//! plant is invented (demo data).

use reqwest::StatusCode;
use serde_json::Value;
use tightspec::store::Role;

use crate::catalogue_support::{start, token};
use crate::friction_tests::demo_series;
use crate::impact_changes::{catalogue_request, register, FLAKE, PLATED};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(the_series_page_tables_the_impact_on_released_joints);

async fn page(app: &crate::catalogue_support::Instance, path: &str) -> String {
    let r = app.get(path).await;
    assert_eq!(r.status(), StatusCode::OK);
    let ct = r.headers()["content-type"].to_str().unwrap().to_owned();
    assert_eq!(ct, "text/html; charset=utf-8");
    r.text().await.unwrap()
}

async fn the_series_page_tables_the_impact_on_released_joints(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let (series, _, _) = demo_series();
    let r = app
        .post_json(Some(&editor), "/v1/friction-tests", &series)
        .await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let id = r.json::<Value>().await.unwrap()["id"].as_i64().unwrap();
    let path = format!("/ui/friction-tests/{id}?basis=observed");

    let before = page(&app, &path).await;
    assert!(before.contains("Impact on the released joints"), "{before}");
    assert!(
        before.contains("No joint has an active release"),
        "{before}"
    );
    assert!(!before.contains("href=\"/ui/joints/"), "{before}");

    register(&app, &editor, FLAKE, catalogue_request("zinc-flake"), true).await;
    register(
        &app,
        &editor,
        PLATED,
        catalogue_request("zinc-electroplated"),
        false,
    )
    .await;
    let html = page(&app, &path).await;
    let proposal = app
        .get_json(&format!("/v1/friction-tests/{id}/proposal?basis=observed"))
        .await;
    let flake = &proposal["impact"]["joints"][0];
    assert_eq!(flake["id"], FLAKE);
    assert!(
        html.contains(&format!("<a href=\"/ui/joints/{FLAKE}\">{FLAKE}</a>")),
        "{html}"
    );
    // The unreleased joint is not compared.
    assert!(!html.contains(&format!("/ui/joints/{PLATED}")), "{html}");
    // The target torque before → after as the JSON gives it (the page
    // shows four significant figures).
    let target = |side: &str| flake[side]["target"]["value"].as_f64().unwrap();
    let shown = |v: f64| {
        let decimals = (3 - v.abs().log10().floor() as i32).clamp(0, 6) as usize;
        format!("{v:.decimals$} N·m")
    };
    let arrow = format!("{} → {}", shown(target("before")), shown(target("after")));
    assert!(html.contains(&arrow), "{arrow} in {html}");
    assert!(
        html.contains("1 joint(s) with an active release compared"),
        "{html}"
    );
    let caution = proposal["impact"]["caution"].as_str().unwrap();
    assert!(html.contains(caution), "{html}");
}
