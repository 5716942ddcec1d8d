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
