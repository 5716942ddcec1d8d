//! The release flow on a joint's page over plain HTTP, on SQLite and
//! PostgreSQL: the preview table (the joint computed now against its active
//! release) and the checks now; a release refused without a token, without
//! the form value or from another origin, and without a reason, each
//! writing nothing; a release with an editor's token, then withdrawn; under
//! the four-eyes rule a draft accepted with its error checks and approved by
//! an approver (not by an editor); a review mark confirmed from the page.
//! The plant and its joints are invented for the test (demo data).

use reqwest::{Response, StatusCode};
use serde_json::{json, Value};
use tightspec::store::Role;

use crate::catalogue_support::{demo_joint, start, start_with, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;
use crate::support::loopback_base;
use crate::ui::{csrf, html, no_redirects};

on_both_backends!(
    a_joint_is_released_and_withdrawn_from_its_page,
    four_eyes_and_review_from_the_joint_page,
);

fn definition(id: &str, request: Value) -> Value {
    demo_joint(
        id,
        "Cross member to side rail (demo)",
        &["hollowmere-demo", "station-12"],
        request,
    )
}

async fn create(app: &Instance, editor: &str, id: &str, request: Value) {
    let r = app
        .post_json(Some(editor), "/v1/joints", &definition(id, request))
        .await;
    assert_eq!(
        r.status(),
        StatusCode::CREATED,
        "{}",
        r.text().await.unwrap()
    );
}

/// A form post to the page with these cookies (and `Origin`, when given).
async fn post(
    app: &Instance,
    path: &str,
    cookies: &str,
    origin: Option<&str>,
    fields: &[(&str, &str)],
) -> Response {
    let mut rq = no_redirects()
        .post(app.url(path))
        .header("cookie", cookies)
        .form(fields);
    if let Some(o) = origin {
        rq = rq.header("origin", o);
    }
    rq.send().await.expect("POST")
}

async fn releases(app: &Instance, id: &str) -> Vec<Value> {
    app.get_json(&format!("/v1/joints/{id}/releases")).await["releases"]
        .as_array()
        .expect("releases")
        .clone()
}

fn redirected_to(r: &Response, to: &str) {
    assert_eq!(r.status(), StatusCode::SEE_OTHER, "{r:?}");
    assert_eq!(r.headers()["location"], to);
}

/// The field named in a page's problem table.
fn names(page: &str, field: &str) -> bool {
    page.contains(&format!("<code class=\"field-name\">{field}</code>"))
}

async fn a_joint_is_released_and_withdrawn_from_its_page(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let id = "HW-S12-CM-021";
    create(
        &app,
        &editor,
        id,
        json!({"thread": "M10", "property_class": "8.8",
               "finish": "zinc-electroplated", "lubricant": "none"}),
    )
    .await;
    let page_path = format!("/ui/joints/{id}");
    let release_path = format!("/ui/joints/{id}/release");

    // The preview without an active release: figures now, checks, the form.
    let before = html(app.get(&page_path).await, StatusCode::OK).await;
    for text in [
        "id=\"release-preview\"",
        "id=\"impact\"",
        "Target torque",
        "Preload min",
        "with no active release to compare with",
        "Checks now",
        &format!("action=\"{release_path}\""),
        "name=\"reason\"",
        "Not released yet",
    ] {
        assert!(before.contains(text), "{text} not in {before}");
    }

    let value = csrf(&app).await;
    let jar = format!("tightspec_csrf={value}");
    let with_token = format!("{jar}; tightspec_token={editor}");
    let reason = [("csrf", value.as_str()), ("reason", "pilot build (demo)")];

    // Refused: no token (401), no form cookie, a wrong value, another
    // origin (403), no reason (422); the joint's page with the problem.
    let r = post(&app, &release_path, &jar, Some(&app.base), &reason).await;
    let page = html(r, StatusCode::UNAUTHORIZED).await;
    assert!(
        names(&page, "token") && page.contains("id=\"release-preview\""),
        "{page}"
    );
    let r = post(
        &app,
        &release_path,
        &format!("tightspec_token={editor}"),
        None,
        &reason,
    )
    .await;
    assert!(names(&html(r, StatusCode::FORBIDDEN).await, "csrf"));
    let wrong = "0".repeat(64);
    let r = post(
        &app,
        &release_path,
        &with_token,
        None,
        &[("csrf", wrong.as_str()), ("reason", "pilot build (demo)")],
    )
    .await;
    assert!(names(&html(r, StatusCode::FORBIDDEN).await, "csrf"));
    let r = post(
        &app,
        &release_path,
        &with_token,
        None,
        &[("reason", "pilot build (demo)")],
    )
    .await;
    assert!(names(&html(r, StatusCode::FORBIDDEN).await, "csrf"));
    let r = post(
        &app,
        &release_path,
        &with_token,
        Some(&loopback_base(1)),
        &reason,
    )
    .await;
    assert!(html(r, StatusCode::FORBIDDEN)
        .await
        .contains("another site"));
    let r = post(
        &app,
        &release_path,
        &with_token,
        None,
        &[("csrf", value.as_str()), ("reason", " ")],
    )
    .await;
    assert!(names(
        &html(r, StatusCode::UNPROCESSABLE_ENTITY).await,
        "reason"
    ));
    assert!(
        releases(&app, id).await.is_empty(),
        "a refused release wrote"
    );

    // Released with the editor's token: the page shows release 1 and the chart.
    let r = post(&app, &release_path, &with_token, Some(&app.base), &reason).await;
    redirected_to(&r, &format!("/ui/joints/{id}#releases"));
    let after = html(app.get(&page_path).await, StatusCode::OK).await;
    for text in [
        "id=\"release-list\"",
        "pilot build (demo)",
        "hollowmere-planning",
        "<td class=\"status\">released</td>",
        &format!("src=\"/v1/joints/{id}/chart.svg\""),
        "compared with release 1, the active one.",
        "Nothing would change",
        "id=\"withdraw-1\"",
    ] {
        assert!(after.contains(text), "{text} not in {after}");
    }
    let list = releases(&app, id).await;
    assert_eq!(list.len(), 1);
    assert_eq!(list[0]["requested_by"], "hollowmere-planning");
    // The preview's figures before the release are the released ones.
    let served = app.get_json(&format!("/v1/joints/{id}/setpoints")).await;
    let target = served["setpoints"]["target"]["value"]
        .as_f64()
        .expect("target torque");
    assert!((10.0..100.0).contains(&target), "{target}");
    let shown = format!("{target:.2} N·m");
    assert!(before.contains(&shown) && after.contains(&shown), "{shown}");

    // Withdrawn (reason needed): the line has nothing to fetch.
    let withdraw = format!("/ui/joints/{id}/releases/1/withdraw");
    let r = post(
        &app,
        &withdraw,
        &with_token,
        None,
        &[("csrf", value.as_str())],
    )
    .await;
    assert!(names(
        &html(r, StatusCode::UNPROCESSABLE_ENTITY).await,
        "reason"
    ));
    let r = post(
        &app,
        &withdraw,
        &jar,
        None,
        &[("csrf", value.as_str()), ("reason", "x")],
    )
    .await;
    html(r, StatusCode::UNAUTHORIZED).await;
    assert_eq!(releases(&app, id).await[0]["status"], "released");
    let r = post(
        &app,
        &withdraw,
        &with_token,
        None,
        &[
            ("csrf", value.as_str()),
            ("reason", "drawing change (demo)"),
        ],
    )
    .await;
    redirected_to(&r, &format!("/ui/joints/{id}#releases"));
    let page = html(app.get(&page_path).await, StatusCode::OK).await;
    assert!(
        page.contains("<td class=\"status\">withdrawn</td>")
            && !page.contains("id=\"release-chart\""),
        "{page}"
    );
    let r = app.get(&format!("/v1/joints/{id}/spec")).await;
    assert_eq!(r.status(), StatusCode::CONFLICT);
}

/// M8 8.8 screwed 12 mm into EN AW-6082: error checks apply.
fn aluminium_request() -> Value {
    json!({"thread": "M8", "property_class": "8.8", "finish": "zinc-electroplated",
           "lubricant": "none", "tightening_method": "dc-nutrunner",
           "joint_type": "tapped-hole", "clamped_material": "aluminium-6082",
           "engagement_length": {"value": 12, "unit": "mm"}})
}

/// The error checks the release form offers to accept.
fn accept_fields(page: &str) -> Vec<String> {
    page.split("name=\"accept.")
        .skip(1)
        .filter_map(|rest| rest.split('"').next())
        .map(str::to_owned)
        .collect()
}

async fn four_eyes_and_review_from_the_joint_page(db: &TestDb) {
    let app = start_with(&db.url, |c| c.four_eyes = true).await;
    let editor = token(db, "hollowmere-planning", Role::Editor).await;
    let approver = token(db, "hollowmere-quality", Role::Approver).await;
    let id = "HW-S12-GB-004";
    create(&app, &editor, id, aluminium_request()).await;
    let page_path = format!("/ui/joints/{id}");
    let release_path = format!("/ui/joints/{id}/release");
    let value = csrf(&app).await;
    let jar = format!("tightspec_csrf={value}");
    let as_editor = format!("{jar}; tightspec_token={editor}");
    let as_approver = format!("{jar}; tightspec_token={approver}");

    // The checks now with their severity; each error check has a field.
    let page = html(app.get(&page_path).await, StatusCode::OK).await;
    assert!(
        page.contains("id=\"checks-now\"") && page.contains("class=\"check error\""),
        "{page}"
    );
    assert!(page.contains("Four-eyes rule"), "{page}");
    let codes = accept_fields(&page);
    assert!(!codes.is_empty(), "{page}");

    // Not accepted: refused, listing the checks; nothing written.
    let plain = [("csrf", value.as_str()), ("reason", "gearbox cover (demo)")];
    let r = post(&app, &release_path, &as_editor, None, &plain).await;
    let refused = html(r, StatusCode::UNPROCESSABLE_ENTITY).await;
    assert!(
        refused.contains("Error checks apply") && names(&refused, "accept_checks"),
        "{refused}"
    );
    assert!(
        refused.contains("value=\"gearbox cover (demo)\""),
        "{refused}"
    );
    assert!(releases(&app, id).await.is_empty());

    // Each accepted with a reason: a draft, with approve and withdraw.
    let accept_names: Vec<String> = codes.iter().map(|c| format!("accept.{c}")).collect();
    let mut fields: Vec<(&str, &str)> = plain.to_vec();
    for n in &accept_names {
        fields.push((n.as_str(), "helical insert fitted (demo)"));
    }
    let r = post(&app, &release_path, &as_editor, None, &fields).await;
    redirected_to(&r, &format!("/ui/joints/{id}#releases"));
    let page = html(app.get(&page_path).await, StatusCode::OK).await;
    assert!(
        page.contains("<td class=\"status\">draft</td>")
            && page.contains("id=\"approve-1\"")
            && page.contains("id=\"withdraw-1\""),
        "{page}"
    );
    let list = releases(&app, id).await;
    assert_eq!(
        list[0]["accepted_checks"].as_array().map(Vec::len),
        Some(codes.len()),
        "{list:?}"
    );

    // An editor may not approve; the approver may.
    let approve = format!("/ui/joints/{id}/releases/1/approve");
    let ok = [
        ("csrf", value.as_str()),
        ("reason", "checked the insert (demo)"),
    ];
    let r = post(&app, &approve, &as_editor, None, &ok).await;
    assert!(html(r, StatusCode::FORBIDDEN).await.contains("role editor"));
    assert_eq!(releases(&app, id).await[0]["status"], "draft");
    let r = post(&app, &approve, &as_approver, None, &ok).await;
    redirected_to(&r, &format!("/ui/joints/{id}#releases"));
    let page = html(app.get(&page_path).await, StatusCode::OK).await;
    assert!(
        page.contains("<td class=\"status\">released</td>")
            && page.contains("hollowmere-quality")
            && page.contains("id=\"release-chart\""),
        "{page}"
    );

    // A catalogue change marks the joint; the page shows the mark and confirms it.
    let entries = app
        .get_json("/v1/friction-entries?finish=zinc-electroplated&lubricant=none")
        .await;
    let entry_id = entries["entries"][0]["id"].as_i64().expect("entry id");
    let (entry, etag) = app.entry(entry_id).await;
    let min = entry["thread_friction"]["min"].as_f64().unwrap();
    let r = app
        .put_thread_min(&editor, entry_id, Some(&etag), min + 0.02)
        .await;
    assert_eq!(r.status(), StatusCode::OK);
    let revision = app.revision().await;
    let page = html(app.get(&page_path).await, StatusCode::OK).await;
    assert!(
        page.contains("id=\"review-due\"")
            && page.contains(&format!("catalogue revision {revision} would move"))
            && page.contains("id=\"confirm-review\""),
        "{page}"
    );
    let confirm = format!("/ui/joints/{id}/review/confirm");
    let r = post(
        &app,
        &confirm,
        &as_editor,
        None,
        &[("csrf", value.as_str())],
    )
    .await;
    assert!(names(
        &html(r, StatusCode::UNPROCESSABLE_ENTITY).await,
        "reason"
    ));
    let r = post(
        &app,
        &confirm,
        &as_editor,
        None,
        &[
            ("csrf", value.as_str()),
            ("reason", "within the tool's band (demo)"),
        ],
    )
    .await;
    redirected_to(&r, &page_path);
    let page = html(app.get(&page_path).await, StatusCode::OK).await;
    assert!(!page.contains("id=\"review-due\""), "{page}");
    let joint = app.get_json(&format!("/v1/joints/{id}")).await;
    assert!(joint["review_due"].is_null(), "{joint}");
}
