//! Inputs far outside any joint (the reproductions of the reliability
//! issue): each is answered at once with a 422 naming the field that caused
//! it, never a hang, a 500 or a number JSON cannot hold.

use std::time::Duration;

use crate::specs_support::{json, problem_fields, spawn, SpecApp};

const BASE: &str = "thread=M10&property_class=8.8&finish=plain&lubricant=light-oil";

/// An answer must come long before this; the bound only keeps a regression
/// from hanging the suite (it is not a speed target).
const NO_HANG: Duration = Duration::from_secs(30);

async fn refused(app: &SpecApp, path: &str) -> Vec<String> {
    let r = tokio::time::timeout(NO_HANG, app.get(path))
        .await
        .unwrap_or_else(|_| panic!("{path} did not answer"));
    let (st, body) = json(r).await;
    assert_eq!(st, 422, "{path}: {body}");
    problem_fields(&body)
}

#[tokio::test]
async fn huge_bearing_diameters_are_refused_by_name() {
    let app = spawn().await;
    for route in ["/v1/setpoints", "/v1/tightening-specs"] {
        for outer in ["3e16mm", "1e308mm", "1e300mm"] {
            let path = format!(
                "{route}?{BASE}&tightening_method=dc-nutrunner&bearing_outer_diameter={outer}\
                 &bearing_inner_diameter=11mm"
            );
            assert_eq!(
                refused(&app, &path).await,
                ["bearing.outer_diameter"],
                "{path}"
            );
        }
    }
    // The service still answers afterwards.
    assert_eq!(app.get("/healthz").await.status(), 200);
}

#[tokio::test]
async fn huge_clamp_lengths_are_refused_by_name() {
    let app = spawn().await;
    for route in ["/v1/setpoints", "/v1/tightening-specs"] {
        for clamp in ["1e308mm", "1e6mm"] {
            let path = format!(
                "{route}?{BASE}&clamp_length={clamp}&clamped_material=steel-s355\
                 &joint_outer_diameter=30mm&tightening_method=torque-angle"
            );
            assert_eq!(refused(&app, &path).await, ["clamp_length"], "{path}");
        }
    }
}

/// The reproductions of the issue, exactly as the probe sent them (Why 1:
/// huge bearing diameters on the setpoint route; Why 3: huge clamp length
/// and bearing diameter), with the field each must name. Each is answered
/// within a second with a problem, also when several arrive at once, and
/// the service keeps answering `/healthz` afterwards.
#[tokio::test]
async fn the_reported_reproductions_answer_within_a_second_with_a_problem() {
    const WITHIN: Duration = Duration::from_secs(1);
    let setpoint = "/v1/setpoints?thread=M10&property_class=8.8&finish=plain&lubricant=light-oil\
                    &tightening_method=dc-nutrunner&bearing_inner_diameter=11mm";
    let spec = "/v1/tightening-specs?thread=M10&property_class=8.8&finish=plain&lubricant=light-oil\
                &tightening_method=torque-angle&clamped_material=steel-s355&joint_outer_diameter=30mm";
    let cases = [
        (format!("{setpoint}&bearing_outer_diameter=3e16mm"), "bearing.outer_diameter"),
        (format!("{setpoint}&bearing_outer_diameter=1e308mm"), "bearing.outer_diameter"),
        (format!("{spec}&clamp_length=1e308mm"), "clamp_length"),
        (format!("{spec}&clamp_length=1e6mm"), "clamp_length"),
        (
            format!("{spec}&clamp_length=40mm&bearing_outer_diameter=1e300mm&bearing_inner_diameter=11mm"),
            "bearing.outer_diameter",
        ),
    ];
    let app = crate::support::TestApp::spawn().await;
    // Two rounds: the second sends every case at once.
    for round in 0..2 {
        let mut pending = Vec::new();
        for (path, field) in &cases {
            let started = std::time::Instant::now();
            let request = app.client.get(app.url(path)).timeout(NO_HANG).send();
            if round == 0 {
                let r = request.await.unwrap_or_else(|e| panic!("{path}: {e}"));
                let elapsed = started.elapsed();
                let p = crate::support::expect_problem(r, 422).await;
                assert_eq!(crate::support::error_fields(&p), [*field], "{path}");
                assert!(elapsed < WITHIN, "{path} took {elapsed:?}");
            } else {
                pending.push((path, *field, tokio::spawn(request)));
            }
        }
        let started = std::time::Instant::now();
        for (path, field, task) in pending {
            let r = task
                .await
                .unwrap()
                .unwrap_or_else(|e| panic!("{path}: {e}"));
            let p = crate::support::expect_problem(r, 422).await;
            assert_eq!(crate::support::error_fields(&p), [field], "{path}");
        }
        assert!(started.elapsed() < WITHIN, "{:?}", started.elapsed());
    }
    let r = tokio::time::timeout(WITHIN, app.get("/healthz")).await;
    assert_eq!(r.expect("healthz within a second").status(), 200);
}
