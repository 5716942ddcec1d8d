//! The engineer's page (`/ui/`) over plain HTTP on SQLite and PostgreSQL:
//! status, content type and key texts of each page; a bad spec input shown
//! as the problem's fields in the page; every form post refused without the
//! CSRF value, from another origin, without a token or with a reader's
//! token, writing nothing; an editor's token kept in the HttpOnly cookie
//! records a series. The plant and its people are invented for the test.

use reqwest::redirect::Policy;
use reqwest::{Client, Response, StatusCode};
use utoipa::IntoParams;

use crate::catalogue_support::{start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;
use crate::support::loopback_base;
use tightspec::store::Role;

on_both_backends!(
    pages_answer_html_with_their_key_texts,
    page_posts_need_the_form_value_the_origin_and_a_token,
);

const SPEC: &str =
    "/ui/spec?thread=M10&property_class=8.8&finish=zinc-flake-lubricated&lubricant=none&tightening_method=dc-nutrunner";

/// A demo series (invented figures) as the CSV the page takes.
pub const DEMO_CSV: &str = "clamp_force [kN],total_torque [N·m],thread_torque [N·m]\n\
    25.0,48.1,21.6\n25.0,47.2,21.1\n25.0,49.0,22.0\n25.0,46.8,20.9\n25.0,48.5,21.8\n\
    25.0,47.9,21.4\n25.0,48.8,21.9\n25.0,47.5,21.2\n25.0,48.3,21.7\n25.0,47.0,21.0\n";

pub fn no_redirects() -> Client {
    Client::builder()
        .redirect(Policy::none())
        .build()
        .expect("client")
}

pub async fn html(r: Response, status: StatusCode) -> String {
    let got = r.status();
    let ct = r
        .headers()
        .get("content-type")
        .and_then(|v| v.to_str().ok())
        .unwrap_or("")
        .to_string();
    let body = r.text().await.expect("body");
    assert_eq!(got, status, "{body}");
    assert_eq!(ct, "text/html; charset=utf-8", "{body}");
    assert!(body.starts_with("<!DOCTYPE html>"), "{body}");
    body
}

fn set_cookie(r: &Response, name: &str) -> Option<String> {
    r.headers()
        .get_all("set-cookie")
        .iter()
        .filter_map(|v| v.to_str().ok())
        .find(|v| v.starts_with(&format!("{name}=")))
        .map(str::to_owned)
}

/// The value of the `tightspec_csrf` cookie a first page visit sets.
pub async fn csrf(app: &Instance) -> String {
    let r = app.get("/ui/token").await;
    let c = set_cookie(&r, "tightspec_csrf").expect("the page sets the form cookie");
    for attr in ["HttpOnly", "SameSite=Strict", "Path=/ui"] {
        assert!(c.contains(attr), "{c}");
    }
    c.split(';').next().unwrap()["tightspec_csrf=".len()..].to_string()
}

async fn pages_answer_html_with_their_key_texts(db: &TestDb) {
    let app = start(&db.url, true).await;
    let client = no_redirects();
    let r = client.get(app.url("/ui")).send().await.unwrap();
    assert_eq!(r.status(), StatusCode::PERMANENT_REDIRECT);
    assert_eq!(r.headers()["location"], "/ui/");
    let home = html(app.get("/ui/").await, StatusCode::OK).await;
    assert!(home.contains("Tightening specifications"), "{home}");
    let css = app.get("/ui/assets/ui.css").await;
    assert_eq!(css.headers()["content-type"], "text/css; charset=utf-8");
    let js = app.get("/ui/assets/ui.js").await;
    assert_eq!(
        js.headers()["content-type"],
        "text/javascript; charset=utf-8"
    );

    // The empty calculator lists every parameter of the spec query.
    let form = html(app.get("/ui/spec").await, StatusCode::OK).await;
    for p in tightspec::app::spec::SpecQuery::into_params(|| None) {
        assert!(
            form.contains(&format!("name=\"{}\"", p.name)),
            "{} missing",
            p.name
        );
    }
    // An answer: the table with the target torque, checks, cautions and the chart.
    let page = html(app.get(SPEC).await, StatusCode::OK).await;
    let json = app
        .get_json(&SPEC.replace("/ui/spec", "/v1/tightening-specs"))
        .await;
    let target = json["torque"]["target"]["value"].as_f64().unwrap();
    assert!(page.contains("id=\"answer\""), "{page}");
    assert!(page.contains("Target torque"), "{page}");
    assert!(
        page.contains(&format!("{target:.2} N·m")),
        "target {target} not in {page}"
    );
    assert!(
        page.contains("Cautions") && page.contains("responsible engineer"),
        "{page}"
    );
    assert!(
        page.contains("src=\"/v1/tightening-specs/chart.svg?thread=M10&amp;property_class=8.8"),
        "{page}"
    );
    assert!(page.contains("rel=\"bookmark\""), "{page}");
    // No working state: no joint diagram; with one, the diagram beside the window.
    assert!(!page.contains("id=\"joint-diagram\""), "{page}");
    let working = html(
        app.get(
            "/ui/spec?thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12\
             &clamp_length=20mm&clamped_material=steel-s355&joint_outer_diameter=25mm&loads_axial=8kN",
        )
        .await,
        StatusCode::OK,
    )
    .await;
    assert!(
        working.contains(
            "src=\"/v1/tightening-specs/joint-diagram.svg?thread=M10&amp;property_class=8.8"
        ) && working.contains("id=\"window-chart\""),
        "{working}"
    );

    // Bad input: the problem's fields and reasons in the page, not JSON.
    let bad = html(
        app.get("/ui/spec?thread=M10&property_class=8.8&thread_friction=abc&bearing_friction=0.12")
            .await,
        StatusCode::BAD_REQUEST,
    )
    .await;
    assert!(
        bad.contains("<code class=\"field-name\">thread_friction</code>"),
        "{bad}"
    );
    let unknown = html(
        app.get("/ui/spec?thread=M10&property_class=8.8&finish=no-such-finish&lubricant=none")
            .await,
        StatusCode::NOT_FOUND,
    )
    .await;
    assert!(
        unknown.contains("<code class=\"field-name\">finish</code>"),
        "{unknown}"
    );
    let invalid = html(
        app.get("/ui/spec?thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12&utilisation=3").await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;
    assert!(
        invalid.contains("<code class=\"field-name\">utilisation</code>"),
        "{invalid}"
    );

    // Catalogue: the entries, one entry's history and chart, a diff, export links.
    let list = html(app.get("/ui/catalogue").await, StatusCode::OK).await;
    assert!(
        list.contains("id=\"entries\"") && list.contains("/v1/catalogue/export?revision="),
        "{list}"
    );
    let entry = html(app.get("/ui/catalogue/entries/1").await, StatusCode::OK).await;
    assert!(entry.contains("id=\"history\""), "{entry}");
    assert!(
        entry.contains("src=\"/v1/friction-entries/1/history.svg\""),
        "{entry}"
    );
    let diff = html(
        app.get("/ui/catalogue/diff?from=1&to=2").await,
        StatusCode::OK,
    )
    .await;
    assert!(diff.contains("revision 1 → 2"), "{diff}");
    let no_entry = html(
        app.get("/ui/catalogue/entries/99999").await,
        StatusCode::NOT_FOUND,
    )
    .await;
    assert!(no_entry.contains("field-name"), "{no_entry}");
    html(
        app.get("/ui/catalogue?status=lost").await,
        StatusCode::UNPROCESSABLE_ENTITY,
    )
    .await;

    // Joints and friction tests.
    let joints = html(app.get("/ui/joints").await, StatusCode::OK).await;
    assert!(joints.contains("Release status"), "{joints}");
    let no_joint = html(
        app.get("/ui/joints/no-such-joint").await,
        StatusCode::NOT_FOUND,
    )
    .await;
    assert!(
        no_joint.contains("<code class=\"field-name\">id</code>"),
        "{no_joint}"
    );
    // One joint with a release: the releases table, its fetch links and chart.
    let planner = token(db, "hollowmere-planning", Role::Editor).await;
    let joint = serde_json::json!({
        "id": "HW-S40-BR-007", "title": "Bracket to frame (demo)", "tags": ["hollowmere-demo"],
        "request": {"thread": "M10", "property_class": "8.8",
                    "thread_friction": 0.12, "bearing_friction": 0.12},
        "setpoints": {"torque_unit": "N·m", "resolution": 0.1, "angle_resolution": 1.0},
    });
    let r = app.post_json(Some(&planner), "/v1/joints", &joint).await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let unreleased = html(app.get("/ui/joints/HW-S40-BR-007").await, StatusCode::OK).await;
    assert!(
        unreleased.contains("Not released yet") && !unreleased.contains("id=\"release-chart\""),
        "{unreleased}"
    );
    let why = serde_json::json!({"reason": "pilot build (demo)"});
    let r = app
        .post_json(Some(&planner), "/v1/joints/HW-S40-BR-007/releases", &why)
        .await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let released = html(app.get("/ui/joints/HW-S40-BR-007").await, StatusCode::OK).await;
    for text in [
        "id=\"releases\"",
        "hollowmere-planning",
        "pilot build (demo)",
        "href=\"/v1/joints/HW-S40-BR-007/spec?release=1\"",
        "href=\"/v1/joints/HW-S40-BR-007/setpoints?release=1\"",
        "src=\"/v1/joints/HW-S40-BR-007/chart.svg\"",
    ] {
        assert!(released.contains(text), "{text} not in {released}");
    }
    let upload = html(app.get("/ui/friction-tests").await, StatusCode::OK).await;
    assert!(
        upload.contains("name=\"csrf\"") && upload.contains("textarea"),
        "{upload}"
    );

    // Reads need a token when the service does not allow anonymous reads.
    let closed = start(&db.url, false).await;
    let refused = html(closed.get(SPEC).await, StatusCode::UNAUTHORIZED).await;
    assert!(
        refused.contains("<code class=\"field-name\">token</code>"),
        "{refused}"
    );
}

async fn post_series(
    app: &Instance,
    cookies: &str,
    csrf: &str,
    origin: Option<&str>,
    action: &str,
) -> Response {
    let mut rq = no_redirects()
        .post(app.url("/ui/friction-tests"))
        .header("cookie", cookies)
        .form(&[
            ("csrf", csrf),
            ("action", action),
            ("thread", "M10"),
            ("property_class", "8.8"),
            ("finish", "zinc-flake-lubricated"),
            ("lubricant", "none"),
            ("csv", DEMO_CSV),
        ]);
    if let Some(o) = origin {
        rq = rq.header("origin", o);
    }
    rq.send().await.expect("POST")
}

async fn nothing_recorded(app: &Instance) {
    let r = app.get("/v1/friction-tests/1").await;
    assert_eq!(
        r.status(),
        StatusCode::NOT_FOUND,
        "a refused post wrote a series"
    );
}

async fn page_posts_need_the_form_value_the_origin_and_a_token(db: &TestDb) {
    let app = start(&db.url, true).await;
    let value = csrf(&app).await;
    let jar = format!("tightspec_csrf={value}");

    // No form cookie, a wrong value, another site's origin: 403 naming csrf.
    let r = post_series(&app, "", &value, None, "record").await;
    assert!(html(r, StatusCode::FORBIDDEN)
        .await
        .contains("<code class=\"field-name\">csrf</code>"));
    let r = post_series(&app, &jar, &"0".repeat(64), None, "record").await;
    assert!(html(r, StatusCode::FORBIDDEN)
        .await
        .contains("<code class=\"field-name\">csrf</code>"));
    let r = post_series(
        &app,
        &jar,
        &value,
        // Another origin: the loopback interface on a port the service is not on.
        Some(&loopback_base(1)),
        "record",
    )
    .await;
    assert!(html(r, StatusCode::FORBIDDEN)
        .await
        .contains("another site"));
    // The right value but no token: 401 naming token.
    let r = post_series(&app, &jar, &value, Some(&app.base), "record").await;
    assert!(html(r, StatusCode::UNAUTHORIZED)
        .await
        .contains("<code class=\"field-name\">token</code>"));
    nothing_recorded(&app).await;

    // Evaluating is a read: the evaluation table, nothing stored.
    let r = post_series(&app, &jar, &value, None, "evaluate").await;
    let page = html(r, StatusCode::OK).await;
    assert!(
        page.contains("id=\"evaluation\"") && page.contains("Thread friction μ_th"),
        "{page}"
    );
    nothing_recorded(&app).await;

    // A reader's token is kept but may not record: 403.
    let reader = token(db, "hollowmere-viewer", Role::Reader).await;
    let keep = |secret: String, csrf: String, jar: String| {
        let app = &app;
        async move {
            no_redirects()
                .post(app.url("/ui/token"))
                .header("cookie", jar)
                .form(&[
                    ("csrf", csrf.as_str()),
                    ("token", secret.as_str()),
                    ("action", "keep"),
                ])
                .send()
                .await
                .expect("POST /ui/token")
        }
    };
    let r = keep("not-a-token".into(), value.clone(), jar.clone()).await;
    assert!(html(r, StatusCode::UNAUTHORIZED)
        .await
        .contains("not recognised"));
    let r = keep(reader.clone(), value.clone(), jar.clone()).await;
    assert_eq!(r.status(), StatusCode::SEE_OTHER);
    let kept = set_cookie(&r, "tightspec_token").expect("token cookie");
    for attr in ["HttpOnly", "SameSite=Strict", "Path=/ui"] {
        assert!(kept.contains(attr), "{kept}");
    }
    let r = post_series(
        &app,
        &format!("{jar}; tightspec_token={reader}"),
        &value,
        None,
        "record",
    )
    .await;
    assert!(html(r, StatusCode::FORBIDDEN).await.contains("role reader"));
    nothing_recorded(&app).await;

    // An editor's token records; the stored series shows its proposal and chart.
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let r = post_series(
        &app,
        &format!("{jar}; tightspec_token={editor}"),
        &value,
        Some(&app.base),
        "record",
    )
    .await;
    assert_eq!(
        r.status(),
        StatusCode::SEE_OTHER,
        "{}",
        r.text().await.unwrap_or_default()
    );
    assert_eq!(r.headers()["location"], "/ui/friction-tests/1");
    let stored = html(app.get("/ui/friction-tests/1").await, StatusCode::OK).await;
    assert!(
        stored.contains("Proposed catalogue change") && stored.contains("hollowmere-lab"),
        "{stored}"
    );
    assert!(
        stored.contains("src=\"/v1/friction-tests/1/chart.svg\""),
        "{stored}"
    );
    let json = app.get_json("/v1/friction-tests/1").await;
    assert_eq!(json["actor"], "hollowmere-lab");

    assert!(stored.contains("id=\"apply\""), "{stored}");

    // Applying the proposal: refused without a token and with a stale
    // entry ETag (nothing written), then applied by the editor.
    let proposal = app
        .get_json("/v1/friction-tests/1/proposal?basis=observed")
        .await;
    let entry = proposal["entry_id"].as_i64().unwrap();
    let etag = proposal["entry_etag"].as_str().unwrap().to_string();
    let head = app.get_json("/v1/catalogue/revisions").await;
    let apply = |cookies: String, etag: String| {
        let app = &app;
        let value = value.clone();
        async move {
            no_redirects()
                .post(app.url("/ui/friction-tests/1/apply"))
                .header("cookie", cookies)
                .form(&[
                    ("csrf", value.as_str()),
                    ("basis", "observed"),
                    ("reason", "Hollowmere line 3 demo series"),
                    ("entry_etag", etag.as_str()),
                ])
                .send()
                .await
                .expect("POST apply")
        }
    };
    let r = apply(jar.clone(), etag.clone()).await;
    html(r, StatusCode::UNAUTHORIZED).await;
    let editor_jar = format!("{jar}; tightspec_token={editor}");
    let stale = etag.replace("-r", "-r9");
    let r = apply(editor_jar.clone(), stale).await;
    html(r, StatusCode::PRECONDITION_FAILED).await;
    assert_eq!(
        app.get_json("/v1/catalogue/revisions").await,
        head,
        "a refused apply wrote"
    );
    let r = apply(editor_jar, etag).await;
    assert_eq!(
        r.status(),
        StatusCode::SEE_OTHER,
        "{}",
        r.text().await.unwrap_or_default()
    );
    assert_eq!(
        r.headers()["location"],
        format!("/ui/catalogue/entries/{entry}")
    );
    let history = html(
        app.get(&format!("/ui/catalogue/entries/{entry}")).await,
        StatusCode::OK,
    )
    .await;
    assert!(
        history.contains("friction-test:1") && history.contains("Hollowmere line 3 demo series"),
        "{history}"
    );
}
