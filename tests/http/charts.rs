//! The charts as an engineer meets them: the tightening window, the
//! torque–angle chart, a stored friction test series and a catalogue
//! entry's history as SVG. Each is well-formed XML with its title, axes and
//! labelled lines; the same request gives the same bytes and a 304 on its
//! ETag; the plotted window corners, read back through the plot's axis
//! transform, are the JSON spec's; bad input gets the JSON route's problem.
//! A browser asking for `/` is sent to the page. Runs on SQLite and
//! PostgreSQL.

use reqwest::StatusCode;
use serde_json::Value;
use tightspec::store::Role;

use crate::catalogue_support::{problem_fields, start, token, Instance};
use crate::on_both_backends;
use crate::support::db::TestDb;

on_both_backends!(
    window_chart_draws_the_json_spec,
    angle_chart_draws_the_angle_window,
    friction_test_chart_draws_every_specimen_and_the_spread,
    entry_history_chart_follows_the_revisions,
    bad_chart_input_gets_the_json_routes_problem,
    a_browser_asking_for_the_root_is_sent_to_the_page,
);

/// Hollowmere Works (demo data): an M10 8.8 joint with a friction range
/// and a required clamp load.
const WINDOW: &str = "thread=M10&property_class=8.8&thread_friction_min=0.10\
    &thread_friction_max=0.16&bearing_friction_min=0.10&bearing_friction_max=0.16\
    &required_clamp_load=12kN";

/// The torque-angle joint of the bolt spec tests (M12 10.9, steel plates).
const ANGLE: &str = "thread=M12&property_class=10.9&thread_friction=0.12&bearing_friction=0.12\
    &tightening_method=torque-angle&clamp_length=40mm&clamped_material=steel-s355\
    &joint_outer_diameter=30mm";

/// A chart's response: status, content type, ETag and body.
async fn fetch(app: &Instance, path: &str) -> (StatusCode, String, String, String) {
    let r = app.get(path).await;
    let status = r.status();
    let header = |name: &str| {
        r.headers()
            .get(name)
            .map(|v| v.to_str().unwrap().to_string())
            .unwrap_or_default()
    };
    let (ct, tag) = (header("content-type"), header("etag"));
    (status, ct, tag, r.text().await.unwrap())
}

/// A chart that must be there: 200, SVG, an ETag, the same bytes twice,
/// 304 on its ETag.
pub(crate) async fn chart(app: &Instance, path: &str) -> (String, String) {
    let (status, ct, tag, body) = fetch(app, path).await;
    assert_eq!(status, StatusCode::OK, "{path}: {body}");
    assert_eq!(ct, "image/svg+xml");
    assert!(tag.starts_with('"') && tag.len() > 10, "{tag}");
    let (_, _, tag2, again) = fetch(app, path).await;
    assert_eq!(
        (tag2.as_str(), again.as_str()),
        (tag.as_str(), body.as_str())
    );
    let r = app
        .client
        .get(app.url(path))
        .header("If-None-Match", &tag)
        .send()
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::NOT_MODIFIED);
    assert_eq!(r.headers()["etag"].to_str().unwrap(), tag);
    (body, tag)
}

pub(crate) fn attr(n: roxmltree::Node, name: &str) -> f64 {
    n.attribute(name)
        .unwrap_or_else(|| panic!("no {name} on {n:?}"))
        .parse()
        .unwrap()
}

/// The plot's data-to-pixel frame, to read pixels back as values.
pub(crate) struct Frame {
    left: f64,
    top: f64,
    width: f64,
    height: f64,
    x: (f64, f64),
    y: (f64, f64),
}

impl Frame {
    pub(crate) fn of(plot: roxmltree::Node) -> Frame {
        Frame {
            left: attr(plot, "data-left"),
            top: attr(plot, "data-top"),
            width: attr(plot, "data-width"),
            height: attr(plot, "data-height"),
            x: (attr(plot, "data-x-min"), attr(plot, "data-x-max")),
            y: (attr(plot, "data-y-min"), attr(plot, "data-y-max")),
        }
    }
    pub(crate) fn x(&self, px: f64) -> f64 {
        self.x.0 + (px - self.left) / self.width * (self.x.1 - self.x.0)
    }
    pub(crate) fn y(&self, px: f64) -> f64 {
        self.y.0 + (self.top + self.height - px) / self.height * (self.y.1 - self.y.0)
    }
    /// A hundredth of a pixel (the SVG's rounding of a position and a
    /// size, half a hundredth each) in x and y units.
    fn tolerance(&self) -> (f64, f64) {
        (
            0.0101 * (self.x.1 - self.x.0) / self.width,
            0.0101 * (self.y.1 - self.y.0) / self.height,
        )
    }
}

pub(crate) fn mark<'a>(doc: &'a roxmltree::Document, role: &str) -> roxmltree::Node<'a, 'a> {
    doc.descendants()
        .find(|n| n.attribute("data-role") == Some(role))
        .unwrap_or_else(|| panic!("no mark {role}"))
}

/// Title, description, axis titles and a label on every mark.
pub(crate) fn well_formed<'a>(svg: &'a str, title: &str, axes: &[&str]) -> roxmltree::Document<'a> {
    let doc = roxmltree::Document::parse(svg).expect("well-formed XML");
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(root.attribute("role"), Some("img"));
    let text = |name: &str| {
        doc.descendants()
            .find(|n| n.tag_name().name() == name)
            .and_then(|n| n.text())
            .unwrap_or_default()
            .to_string()
    };
    assert!(text("title").contains(title), "{}", text("title"));
    assert!(text("desc").len() > 40);
    let axis_titles: Vec<&str> = doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("axis-title"))
        .filter_map(|n| n.text())
        .collect();
    assert_eq!(axis_titles, axes);
    for m in doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("mark"))
    {
        assert!(!m.attribute("data-label").unwrap_or("").is_empty());
    }
    assert!(!svg.contains("NaN") && !svg.contains("inf"));
    doc
}

pub(crate) fn value(v: &Value) -> f64 {
    v["value"].as_f64().unwrap()
}

pub(crate) fn near(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol + 1e-9 * b.abs()
}

async fn window_chart_draws_the_json_spec(db: &TestDb) {
    let app = start(&db.url, true).await;
    for (units, force_scale, axes) in [
        ("si", 1000.0, ["Torque in N·m", "Clamp force in kN"]),
        ("us", 1.0, ["Torque in lbf·ft", "Clamp force in lbf"]),
    ] {
        let query = format!("{WINDOW}&units={units}");
        let spec = app.get_json(&format!("/v1/tightening-specs?{query}")).await;
        let (svg, tag) = chart(&app, &format!("/v1/tightening-specs/chart.svg?{query}")).await;
        let doc = well_formed(&svg, "Tightening window M10 8.8", &axes);
        for role in [
            "torque-window",
            "friction-min",
            "friction-nominal",
            "friction-max",
            "preload-min",
            "preload-max",
            "permissible-preload",
            "yield-limited-torque",
            "required-clamp-load",
        ] {
            mark(&doc, role);
        }
        let labels: Vec<&str> = doc
            .descendants()
            .filter(|n| n.attribute("class") == Some("line-label"))
            .filter_map(|n| n.text())
            .collect();
        for l in ["μ min", "μ nominal", "μ max"] {
            assert!(labels.contains(&l), "{labels:?}");
        }
        assert!(labels.iter().any(|l| l.starts_with("F_M,zul ")));
        // The JSON route's ETag is another representation's.
        let r = app.get(&format!("/v1/tightening-specs?{query}")).await;
        assert_ne!(r.headers()["etag"].to_str().unwrap(), tag);

        // The window's corners read back from the drawn rectangle.
        let plot = doc
            .descendants()
            .find(|n| n.attribute("class") == Some("plot"))
            .unwrap();
        let f = Frame::of(plot);
        let (tx, ty) = f.tolerance();
        let rect = mark(&doc, "tightening-window")
            .children()
            .find(|n| n.tag_name().name() == "rect")
            .unwrap();
        let (x, y, w, h) = (
            attr(rect, "x"),
            attr(rect, "y"),
            attr(rect, "width"),
            attr(rect, "height"),
        );
        let torque = &spec["torque"];
        let preload = &spec["preload"];
        let corners = [
            (f.x(x), value(&torque["lower"]), tx),
            (f.x(x + w), value(&torque["upper"]), tx),
            (f.y(y + h), value(&preload["min"]) / force_scale, ty),
            (f.y(y), value(&preload["max"]) / force_scale, ty),
        ];
        for (drawn, json, tol) in corners {
            assert!(
                near(drawn, json, tol),
                "{units}: drawn {drawn}, JSON {json}"
            );
        }
        let zul = attr(mark(&doc, "permissible-preload"), "data-y");
        assert!(near(
            zul,
            value(&preload["permissible"]) / force_scale,
            1e-6
        ));
        let limit = attr(mark(&doc, "yield-limited-torque"), "data-x");
        assert!(near(limit, value(&torque["upper_limit"]), 1e-6));
        let required = attr(mark(&doc, "required-clamp-load"), "data-y");
        assert!(near(
            required,
            value(&spec["clamp_load"]["required"]) / force_scale,
            1e-6
        ));
    }
}

async fn angle_chart_draws_the_angle_window(db: &TestDb) {
    let app = start(&db.url, true).await;
    let spec = app.get_json(&format!("/v1/tightening-specs?{ANGLE}")).await;
    assert_eq!(spec["angle"]["computed"], true);
    let (svg, _) = chart(
        &app,
        &format!("/v1/tightening-specs/angle-chart.svg?{ANGLE}"),
    )
    .await;
    let doc = well_formed(
        &svg,
        "Torque–angle M12 10.9",
        &["Angle from snug in degrees", "Clamp force in kN"],
    );
    let band = mark(&doc, "angle-window");
    let angle = &spec["angle"];
    assert!(near(attr(band, "data-x0"), value(&angle["min"]), 1e-6));
    assert!(near(attr(band, "data-x1"), value(&angle["max"]), 1e-6));
    let at_yield = attr(mark(&doc, "angle-at-yield"), "data-x");
    assert!(near(at_yield, value(&angle["at_yield"]), 1e-6));
    // Each line reaches its end of the preload window at its end of the
    // angle window: μ max at the lower angle, μ min at the upper.
    let line_at = |role: &str, angle: f64| {
        let pts: Vec<(f64, f64)> = mark(&doc, role)
            .children()
            .find(|n| n.tag_name().name() == "polyline")
            .unwrap()
            .attribute("points")
            .unwrap()
            .split(' ')
            .map(|p| {
                let (x, y) = p.split_once(',').unwrap();
                (x.parse().unwrap(), y.parse().unwrap())
            })
            .collect();
        let f = Frame::of(
            doc.descendants()
                .find(|n| n.attribute("class") == Some("plot"))
                .unwrap(),
        );
        let (a, b) = (pts[0], pts[pts.len() - 1]);
        let (xa, ya, xb, yb) = (f.x(a.0), f.y(a.1), f.x(b.0), f.y(b.1));
        ya + (angle - xa) / (xb - xa) * (yb - ya)
    };
    let kn = |v: &Value| value(v) / 1000.0;
    let low = line_at("from-snug-friction-max", value(&angle["min"]));
    let high = line_at("from-snug-friction-min", value(&angle["max"]));
    assert!(near(low, kn(&spec["preload"]["min"]), 0.01), "{low}");
    assert!(near(high, kn(&spec["preload"]["max"]), 0.01), "{high}");

    // A spec without an angle window is refused naming what it lacks.
    let r = app
        .get(
            "/v1/tightening-specs/angle-chart.svg?thread=M10&property_class=8.8\
             &thread_friction=0.12&bearing_friction=0.12",
        )
        .await;
    assert_eq!(r.status(), StatusCode::UNPROCESSABLE_ENTITY);
    assert!(r.headers()["content-type"]
        .to_str()
        .unwrap()
        .starts_with("application/problem+json"));
    let p: Value = r.json().await.unwrap();
    assert_eq!(problem_fields(&p), ["clamp_length"]);
}

async fn friction_test_chart_draws_every_specimen_and_the_spread(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-lab", Role::Editor).await;
    let (series, _, _) = crate::friction_tests::demo_series();
    let r = app
        .post_json(Some(&editor), "/v1/friction-tests", &series)
        .await;
    assert_eq!(r.status(), StatusCode::CREATED);
    let stored: Value = r.json().await.unwrap();
    let id = stored["id"].as_i64().unwrap();
    let (svg, _) = chart(&app, &format!("/v1/friction-tests/{id}/chart.svg")).await;
    let doc = well_formed(
        &svg,
        &format!("Friction test series {id}: M10"),
        &[
            "Clamp force in kN",
            "Torque in N·m",
            "Coefficient",
            "Friction coefficient μ",
        ],
    );
    let points = |role: &str| {
        mark(&doc, role)
            .children()
            .filter(|n| n.attribute("data-y").is_some())
            .count()
    };
    assert_eq!(points("total-torque"), 10);
    assert_eq!(points("thread-torque"), 10);
    assert_eq!(points("thread-friction"), 10);
    let stats = &stored["evaluation"]["statistics"]["thread_friction"];
    let bar = mark(&doc, "thread-friction-mean-3-sigma")
        .children()
        .find(|n| n.attribute("data-low").is_some())
        .unwrap();
    assert!(near(
        attr(bar, "data-low"),
        stats["mean_minus_3_sigma"].as_f64().unwrap(),
        1e-9
    ));
    assert!(near(
        attr(bar, "data-high"),
        stats["mean_plus_3_sigma"].as_f64().unwrap(),
        1e-9
    ));
    let (us, _) = chart(&app, &format!("/v1/friction-tests/{id}/chart.svg?units=us")).await;
    assert!(us.contains("Clamp force in lbf") && us != svg);

    let r = app.get("/v1/friction-tests/999999/chart.svg").await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
    let r = app
        .get(&format!("/v1/friction-tests/{id}/chart.svg?unit=us"))
        .await;
    assert_eq!(r.status(), StatusCode::BAD_REQUEST);
}

async fn entry_history_chart_follows_the_revisions(db: &TestDb) {
    let app = start(&db.url, true).await;
    let editor = token(db, "hollowmere-quality", Role::Editor).await;
    let list = app.get_json("/v1/friction-entries").await;
    let id = list["entries"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["finish"] == "zinc-electroplated" && e["lubricant"] == "none")
        .and_then(|e| e["id"].as_i64())
        .expect("seed entry zinc-electroplated + none");
    let path = format!("/v1/friction-entries/{id}/history.svg");
    let (before, tag) = chart(&app, &path).await;
    let (_, etag) = app.entry(id).await;
    let r = app.put_thread_min(&editor, id, Some(&etag), 0.12).await;
    assert_eq!(r.status(), StatusCode::OK);
    let (after, new_tag) = chart(&app, &path).await;
    assert_ne!(
        (before.as_str(), tag.as_str()),
        (after.as_str(), new_tag.as_str())
    );
    let doc = well_formed(
        &after,
        &format!("Friction entry {id}: zinc-electroplated with none"),
        &["Catalogue revision", "Friction coefficient μ"],
    );
    let history = app
        .get_json(&format!("/v1/friction-entries/{id}/history"))
        .await;
    let changes = history["history"].as_array().unwrap();
    let bars: Vec<roxmltree::Node> = mark(&doc, "thread-friction")
        .children()
        .filter(|n| n.attribute("data-low").is_some())
        .collect();
    assert_eq!(bars.len(), changes.len());
    assert_eq!(attr(*bars.last().unwrap(), "data-low"), 0.12);
    assert_eq!(
        attr(bars[0], "data-high"),
        changes[0]["after"]["thread_friction"]["max"]
            .as_f64()
            .unwrap()
    );
    let r = app.get("/v1/friction-entries/999999/history.svg").await;
    assert_eq!(r.status(), StatusCode::NOT_FOUND);
}

async fn bad_chart_input_gets_the_json_routes_problem(db: &TestDb) {
    let app = start(&db.url, true).await;
    for query in [
        "thread=M10&property_class=8.8&thred=1",
        "thread=M10&property_class=8.8&thread_friction=abc",
        "thread=M10&property_class=8.8&finish=zinc-electroplatd&lubricant=none",
        "thread=M99&property_class=8.8",
        "thread=M10&property_class=8.8&thread_friction=0.9&bearing_friction=0.12",
    ] {
        let mut answers = Vec::new();
        for route in ["/v1/tightening-specs", "/v1/tightening-specs/chart.svg"] {
            let r = app.get(&format!("{route}?{query}")).await;
            let status = r.status().as_u16();
            assert!((400..500).contains(&status), "{route}?{query}");
            assert!(r.headers()["content-type"]
                .to_str()
                .unwrap()
                .starts_with("application/problem+json"));
            let p: Value = r.json().await.unwrap();
            assert!(!problem_fields(&p).is_empty(), "{p}");
            answers.push((status, problem_fields(&p), p["type"].clone()));
        }
        assert_eq!(answers[0], answers[1], "{query}");
    }
    // A client that takes only JSON is told the chart is SVG; one that
    // takes SVG gets it.
    let path = format!("/v1/tightening-specs/chart.svg?{WINDOW}");
    for (accept, status) in [
        ("application/json", StatusCode::NOT_ACCEPTABLE),
        ("image/svg+xml", StatusCode::OK),
        ("image/*", StatusCode::OK),
    ] {
        let r = app
            .client
            .get(app.url(&path))
            .header("Accept", accept)
            .send()
            .await
            .unwrap();
        assert_eq!(r.status(), status, "{accept}");
    }
}

async fn a_browser_asking_for_the_root_is_sent_to_the_page(db: &TestDb) {
    let app = start(&db.url, true).await;
    let client = reqwest::Client::builder()
        .redirect(reqwest::redirect::Policy::none())
        .build()
        .unwrap();
    let get = |accept: Option<&'static str>| {
        let mut rq = client.get(app.url("/"));
        if let Some(a) = accept {
            rq = rq.header("Accept", a);
        }
        rq.send()
    };
    let r = get(Some("text/html,application/xhtml+xml,*/*;q=0.8"))
        .await
        .unwrap();
    assert_eq!(r.status(), StatusCode::SEE_OTHER);
    assert_eq!(r.headers()["location"], "/ui/");
    for accept in [Some("application/json"), None, Some("*/*")] {
        let r = get(accept).await.unwrap();
        assert_eq!(r.status(), StatusCode::NOT_FOUND, "{accept:?}");
        assert!(r.headers()["content-type"]
            .to_str()
            .unwrap()
            .starts_with("application/problem+json"));
    }
}
