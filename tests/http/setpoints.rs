//! `GET /v1/setpoints`: tool units and their spellings, rounding that never
//! leaves the spec's window, the spec hash, caching and errors.

use crate::specs_support::{json, problem_fields, spawn, value};

const Q: &str = "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=none";

/// 1 lbf·ft = 1.355 818 N·m, 1 lbf·in = 0.112 985 N·m (NIST SP 811, App. B).
const NM_PER_LBF_FT: f64 = 1.355_818;
const NM_PER_LBF_IN: f64 = 0.112_985;

#[tokio::test]
async fn rounding_never_leaves_the_window() {
    let app = spawn().await;
    let threads = [
        ("M6", "8.8"),
        ("M10", "8.8"),
        ("M12", "10.9"),
        ("M16", "12.9"),
        ("1/4-20%20UNC", "sae-j429-5"),
    ];
    let units = [
        ("N%C2%B7m", "N·m", 1.0),
        ("lbf.ft", "lbf·ft", NM_PER_LBF_FT),
        ("lbf.in", "lbf·in", NM_PER_LBF_IN),
    ];
    let resolutions = [0.01, 0.05, 0.1, 0.2, 0.25, 0.5, 1.0];
    for (thread, grade) in threads {
        let base = format!(
            "thread={thread}&property_class={grade}&finish=zinc-electroplated&lubricant=none"
        );
        let (st, spec) = json(app.get(&format!("/v1/tightening-specs?{base}")).await).await;
        assert_eq!(st, 200, "{spec}");
        let lower = value(&spec["torque"]["lower"], "N·m");
        let upper = value(&spec["torque"]["upper"], "N·m");
        for (param, symbol, nm_per_unit) in units {
            for res in resolutions {
                let url = format!("/v1/setpoints?{base}&torque_unit={param}&resolution={res}");
                let (st, sp) = json(app.get(&url).await).await;
                if st == 422 {
                    // Only when no step of the resolution fits in the window,
                    // or the window rounds to one value (an error check).
                    assert!((upper - lower) / nm_per_unit < res * 2.0001, "{url}: {sp}");
                    if sp["type"] == "/problems/checks-not-accepted" {
                        let zero = sp["checks"].as_array().unwrap().iter().any(|c| {
                            c["code"] == "setpoint_window_zero_width" && c["severity"] == "error"
                        });
                        assert!(zero, "{url}: {sp}");
                    } else {
                        assert!((upper - lower) / nm_per_unit < res * 1.0001, "{url}: {sp}");
                        assert_eq!(problem_fields(&sp), ["resolution"]);
                    }
                    continue;
                }
                assert_eq!(st, 200, "{url}: {sp}");
                assert_eq!(sp["torque_unit"], symbol);
                let lo = value(&sp["lower"], symbol);
                let tg = value(&sp["target"], symbol);
                let up = value(&sp["upper"], symbol);
                // Converted back with uom's factors the limits stay inside;
                // the tolerance covers only the printed conversion factor.
                let eps = 1e-6;
                assert!(
                    lo * nm_per_unit >= lower * (1.0 - eps),
                    "{url}: {lo} vs {lower}"
                );
                assert!(
                    up * nm_per_unit <= upper * (1.0 + eps),
                    "{url}: {up} vs {upper}"
                );
                assert!(lo <= tg && tg <= up, "{url}: {lo} {tg} {up}");
                for v in [lo, tg, up] {
                    let steps = v / res;
                    assert!(
                        (steps - steps.round()).abs() < 1e-6,
                        "{url}: {v} not a step of {res}"
                    );
                }
                // the tool's unit and resolution are in the setpoints' hash
                assert_ne!(sp["spec_hash"], spec["spec_hash"]);
            }
        }
    }
}

/// Regression: the hash covers the tool's unit and resolutions, so one spec
/// given as N·m and as lbf·ft (or at two resolutions) is two hashes, and the
/// same query is one; answers carry the service and method versions.
#[tokio::test]
async fn the_setpoint_hash_covers_unit_and_resolution() {
    let app = spawn().await;
    let mut hashes = Vec::new();
    for tool in [
        "torque_unit=N.m&resolution=0.1",
        "torque_unit=lbf.ft&resolution=0.1",
        "torque_unit=lbf.ft&resolution=1",
    ] {
        let (st, sp) = json(app.get(&format!("/v1/setpoints?{Q}&{tool}")).await).await;
        assert_eq!(st, 200, "{tool}: {sp}");
        assert_eq!(sp["service_version"], env!("CARGO_PKG_VERSION"));
        assert_eq!(sp["method_version"], tightspec::engine::METHOD_VERSION);
        hashes.push(sp["spec_hash"].as_str().unwrap().to_string());
    }
    for (i, a) in hashes.iter().enumerate() {
        for b in &hashes[i + 1..] {
            assert_ne!(a, b);
        }
    }
    let (_, again) = json(
        app.get(&format!("/v1/setpoints?{Q}&torque_unit=N.m&resolution=0.1"))
            .await,
    )
    .await;
    assert_eq!(again["spec_hash"], hashes[0].as_str());
    // a torque-controlled answer has no angle window: its angle step changes nothing
    let (_, angle) = json(
        app.get(&format!(
            "/v1/setpoints?{Q}&torque_unit=N.m&resolution=0.1&angle_resolution=2"
        ))
        .await,
    )
    .await;
    assert_eq!(angle["spec_hash"], hashes[0].as_str());
}

#[tokio::test]
async fn torque_unit_spellings() {
    let app = spawn().await;
    for (given, symbol) in [
        ("N%C2%B7m", "N·m"),
        ("N.m", "N·m"),
        ("Nm", "N·m"),
        ("lbf%C2%B7ft", "lbf·ft"),
        ("lbf.ft", "lbf·ft"),
        ("lbf%C2%B7in", "lbf·in"),
        ("lbf.in", "lbf·in"),
    ] {
        let (st, sp) = json(
            app.get(&format!("/v1/setpoints?{Q}&torque_unit={given}"))
                .await,
        )
        .await;
        assert_eq!(
            (st, sp["torque_unit"].as_str()),
            (200, Some(symbol)),
            "{given}: {sp}"
        );
    }
    let (st, sp) = json(app.get(&format!("/v1/setpoints?{Q}")).await).await;
    assert_eq!(
        (st, sp["torque_unit"].as_str(), sp["resolution"].as_f64()),
        (200, Some("N·m"), Some(0.1))
    );
    let current = json(app.get("/v1/friction-entries").await).await.1["catalogue_revision"].clone();
    assert!(current.as_i64().is_some_and(|r| r >= 1), "{current}");
    assert_eq!(sp["catalogue_revision"], current);
    assert!(sp.get("angle").is_none(), "torque-controlled: no angle");
}

#[tokio::test]
async fn angle_window_for_torque_angle_tightening() {
    let app = spawn().await;
    let base = format!("/v1/setpoints?{Q}&tightening_method=torque-angle");
    let (st, p) = json(app.get(&base).await).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (422, vec!["clamp_length".to_string()]),
        "{p}"
    );
    let url = format!(
        "{base}&clamp_length=40mm&joint_outer_diameter=30mm&clamped_material=steel-s355\
         &angle_resolution=0.5"
    );
    let (st, sp) = json(app.get(&url).await).await;
    assert_eq!(st, 200, "{sp}");
    let a = &sp["angle"];
    let (lo, hi) = (value(&a["min"], "degrees"), value(&a["max"], "degrees"));
    assert!(0.0 < lo && lo <= hi, "{a}");
    assert_eq!(a["resolution"], 0.5);
    for v in [lo, hi] {
        assert!((v * 2.0 - (v * 2.0).round()).abs() < 1e-9, "{v}");
    }
    // Inside the spec's own angle window.
    let spec_url = url
        .replace("/v1/setpoints?", "/v1/tightening-specs?")
        .replace("&angle_resolution=0.5", "");
    let (_, spec) = json(app.get(&spec_url).await).await;
    assert!(lo >= value(&spec["angle"]["min"], "degrees"));
    assert!(hi <= value(&spec["angle"]["max"], "degrees"));
}

#[tokio::test]
async fn errors_and_caching() {
    let app = spawn().await;
    let (st, p) = json(
        app.get(&format!("/v1/setpoints?{Q}&torque_unit=kgf.m"))
            .await,
    )
    .await;
    assert_eq!(st, 400, "{p}");
    assert!(problem_fields(&p)[0].starts_with("torque_unit"), "{p}");
    let (st, p) = json(app.get(&format!("/v1/setpoints?{Q}&resolution=0")).await).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (422, vec!["resolution".to_string()])
    );
    let (st, p) = json(app.get(&format!("/v1/setpoints?{Q}&resolution=100")).await).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (422, vec!["resolution".to_string()])
    );
    let (st, p) = json(app.get(&format!("/v1/setpoints?{Q}&resolutoin=0.1")).await).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (400, vec!["resolutoin".to_string()])
    );

    let url = format!("/v1/setpoints?{Q}&resolution=0.5");
    let r = app.get(&url).await;
    let tag = r.headers()["etag"].to_str().unwrap().to_string();
    let r = app.get_with(&url, ("if-none-match", &tag)).await;
    assert_eq!(r.status().as_u16(), 304);
    // Another resolution is another representation.
    let r = app
        .get_with(
            &format!("/v1/setpoints?{Q}&resolution=0.1"),
            ("if-none-match", &tag),
        )
        .await;
    assert_eq!(r.status().as_u16(), 200);
}

/// A resolution coarser than the window: the refusal names `resolution` and
/// gives the window in the tool's unit, two decimals finer than the step.
#[tokio::test]
async fn no_step_inside_the_window_is_told_in_the_tool_unit() {
    let app = spawn().await;
    let base = "thread=M6&property_class=8.8&finish=zinc-electroplated&lubricant=none";
    for (unit, resolution, decimals) in [
        ("lbf%C2%B7ft", "5", 2),
        ("N%C2%B7m", "3", 2),
        ("lbf%C2%B7in", "20", 2),
    ] {
        let path = format!("/v1/setpoints?{base}&torque_unit={unit}&resolution={resolution}");
        let (st, p) = json(app.get(&path).await).await;
        assert_eq!(
            (st, problem_fields(&p)),
            (422, vec!["resolution".to_string()]),
            "{p}"
        );
        let reason = p["errors"][0]["reason"].as_str().unwrap();
        let symbol = match unit {
            "lbf%C2%B7ft" => "lbf·ft",
            "lbf%C2%B7in" => "lbf·in",
            _ => "N·m",
        };
        assert!(
            reason.contains(&format!(
                " {symbol} holds no multiple of the resolution {resolution} {symbol}"
            )),
            "{reason}"
        );
        // "the window a–b unit": both limits with the stated decimals
        let window = reason
            .trim_start_matches("the window ")
            .split(' ')
            .next()
            .unwrap();
        let limits: Vec<&str> = window.split('–').collect();
        assert_eq!(limits.len(), 2, "{reason}");
        for l in &limits {
            let (_, frac) = l.split_once('.').unwrap_or_else(|| panic!("{reason}"));
            assert_eq!(frac.len(), decimals, "{reason}");
            assert!(l.parse::<f64>().is_ok_and(|v| v > 0.0), "{reason}");
        }
    }
}
