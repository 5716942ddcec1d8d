//! `GET`/`POST /v1/tightening-specs`: the response contract, units, the VDI
//! 2230 anchor, catalogue friction with provenance, caching and every error
//! class.

use serde_json::{json, Value};

use crate::specs_support::{json, problem_fields, rel, spawn, value};

const M12_VDI: &str = "/v1/tightening-specs?thread=M12&property_class=8.8\
    &thread_friction=0.14&bearing_friction=0.14&tool_scatter=0";

/// VDI 2230 Part 1 (edition 2015) assembly preload for M12, class 8.8,
/// μ_G = μ_K = 0.14, ν = 0.9: F_M = 41.9 kN, as reproduced in a
/// supplier's technical tables (the worked example beside its VDI 2230
/// reference tables; basis ISO 4017 head, ISO 273 medium hole).
#[tokio::test]
async fn vdi_anchor_m12_8_8_single_friction_no_scatter() {
    let app = spawn().await;
    let (status, s) = json(app.get(M12_VDI).await).await;
    assert_eq!(status, 200, "{s}");
    let fm = value(&s["preload"]["max"], "N");
    assert!(rel(fm, 41_900.0) < 0.005, "preload.max {fm} N vs 41.9 kN");
    // With one friction value and no scatter the window collapses to M_A.
    let upper = value(&s["torque"]["upper"], "N·m");
    assert_eq!(upper, value(&s["torque"]["lower"], "N·m"));
    assert_eq!(upper, value(&s["torque"]["target"], "N·m"));
    // torque.upper is VDI 2230's M_A = F_M·(0.16·P + 0.58·d2·μ_G + D_Km/2·μ_K)
    // (VDI 2230 Part 1, 60° threads), from the response's own geometry.
    let t = &s["fastener"]["thread"];
    let p = value(&t["pitch"], "mm") / 1000.0;
    let d2 = value(&t["pitch_diameter"], "mm") / 1000.0;
    let dkm = value(&s["fastener"]["bearing"]["mean_diameter"], "mm") / 1000.0;
    let ma = fm * (0.16 * p + 0.58 * d2 * 0.14 + dkm / 2.0 * 0.14);
    assert!(rel(upper, ma) < 1e-9, "torque.upper {upper} vs M_A {ma}");
    assert!(rel(value(&s["preload"]["permissible"], "N"), fm) < 1e-9);
}

#[tokio::test]
async fn response_contract() {
    let app = spawn().await;
    let (status, s) = json(
        app.get(
            "/v1/tightening-specs?thread=M10&property_class=8.8&finish=zinc-electroplated\
             &lubricant=none",
        )
        .await,
    )
    .await;
    assert_eq!(status, 200, "{s}");
    for path in [
        "/torque/lower",
        "/torque/target",
        "/torque/upper",
        "/preload/min",
        "/preload/max",
        "/fastener/stress_area",
        "/fastener/proof_load",
        "/fastener/thread/pitch_diameter",
        "/fastener/property_class/yield_strength_min",
        "/fastener/bearing/mean_diameter",
    ] {
        let q = s.pointer(path).unwrap_or_else(|| panic!("missing {path}"));
        assert!(q["value"].is_f64() && q["unit"].is_string(), "{path}: {q}");
    }
    let (lo, tg, up) = (
        value(&s["torque"]["lower"], "N·m"),
        value(&s["torque"]["target"], "N·m"),
        value(&s["torque"]["upper"], "N·m"),
    );
    assert!(lo < tg && tg < up, "{lo} {tg} {up}");
    assert!(value(&s["preload"]["min"], "N") < value(&s["preload"]["max"], "N"));
    // As of M10 is 58.0 mm² (ISO 898-1 nominal stress area).
    assert!((value(&s["fastener"]["stress_area"], "mm²") - 58.0).abs() < 0.05);
    // No clamp length: the angle is not computed, and the reason is given.
    assert_eq!(s["angle"]["computed"], false);
    assert!(s["angle"]["reason"]
        .as_str()
        .unwrap()
        .contains("clamp length"));
    assert!(s["angle"].get("min").is_none());
    // Friction from the catalogue, with entry and revision.
    let th = &s["friction"]["thread"];
    assert_eq!(th["origin"], "catalogue");
    let entry = &s["friction"]["catalogue_entry"];
    assert_eq!(entry["id"], 7);
    let listed = json(app.get("/v1/friction-entries/7").await).await.1;
    assert_eq!(entry["revision"], listed["revision"]);
    let current = listed["catalogue_revision"].clone();
    assert!(current.as_i64().is_some_and(|r| r >= 1), "{current}");
    assert!(
        entry["source"].as_str().unwrap().contains("VDI 2230"),
        "{entry}"
    );
    assert_eq!(
        (th["min"].as_f64(), th["max"].as_f64()),
        (Some(0.14), Some(0.24))
    );
    assert_eq!(s["friction"]["catalogue_revision"], current);
    assert_eq!(s["catalogue_revision"], current);
    assert_eq!(s["catalogue_may_be_stale"], false);
    assert_eq!(s["method"]["id"], "click-wrench");
    assert_eq!(s["method"]["tool_scatter_source"], "default");
    assert!(s["tightening_factor"].as_f64().unwrap() > 1.0);
    assert!(s["figures"]["at_min_friction"]["nut_factor"].is_f64());
    let split = &s["figures"]["at_max_friction"]["torque_split"];
    let sum: f64 = ["pitch", "thread_friction", "bearing_friction", "prevailing"]
        .iter()
        .map(|k| split[k].as_f64().unwrap())
        .sum();
    assert!((sum - 1.0).abs() < 1e-9, "{split}");
    let cautions = s["cautions"].as_array().unwrap();
    assert!(cautions
        .iter()
        .any(|c| c.as_str().unwrap().contains("ISO 16047")));
    assert!(cautions.iter().any(|c| c
        .as_str()
        .unwrap()
        .contains("licensed engineering practice")));
    assert!(!s["assumptions"].as_array().unwrap().is_empty());
    for c in s["checks"].as_array().unwrap() {
        assert!(c["code"].is_string() && c["severity"].is_string() && c["message"].is_string());
    }
    assert_eq!(s["spec_hash"].as_str().unwrap().len(), 64);
}

/// US units: lbf, lbf·ft, in, in², ksi. Factors 1 lbf = 4.448 222 N,
/// 1 lbf·ft = 1.355 818 N·m, 1 in = 25.4 mm, 1 ksi = 6.894 757 MPa (NIST SP
/// 811, Appendix B).
#[tokio::test]
async fn us_units_convert_every_quantity() {
    let app = spawn().await;
    let q = "/v1/tightening-specs?thread=1/2-13%20UNC&property_class=sae-j429-5\
             &thread_friction=0.12&bearing_friction=0.12";
    let (_, si) = json(app.get(q).await).await;
    let (status, us) = json(app.get(&format!("{q}&units=us")).await).await;
    assert_eq!(status, 200, "{us}");
    assert_eq!(us["units"], "us");
    let pairs = [
        ("/preload/max", "N", "lbf", 4.448_222),
        ("/torque/upper", "N·m", "lbf·ft", 1.355_818),
        ("/fastener/thread/nominal_diameter", "mm", "in", 25.4),
        ("/fastener/stress_area", "mm²", "in²", 645.16),
        (
            "/fastener/property_class/proof_stress",
            "MPa",
            "ksi",
            6.894_757,
        ),
    ];
    for (path, si_unit, us_unit, factor) in pairs {
        let a = value(si.pointer(path).unwrap(), si_unit);
        let b = value(us.pointer(path).unwrap(), us_unit);
        assert!(
            rel(b * factor, a) < 1e-5,
            "{path}: {b} {us_unit} vs {a} {si_unit}"
        );
    }
    // ASME B1.1 tensile stress area of 1/2-13 UNC: 0.1419 in².
    assert!((value(&us["fastener"]["stress_area"], "in²") - 0.1419).abs() < 0.0005);
    // the unit system changes the answer, so it changes the hash
    assert_ne!(si["spec_hash"], us["spec_hash"]);
    for s in [&si, &us] {
        assert_eq!(s["service_version"], env!("CARGO_PKG_VERSION"));
        assert_eq!(s["method_version"], tightspec::engine::METHOD_VERSION);
    }
}

#[tokio::test]
async fn post_with_full_options_computes_the_angle() {
    let app = spawn().await;
    let body = json!({
        "thread": "M10",
        "property_class": "10.9",
        "finish": "zinc-flake-lubricated",
        "lubricant": "none",
        "tightening_method": "dc-nutrunner",
        "tool_scatter": 0.05,
        "head": "hexagon-head",
        "washer": "none",
        "hole": "medium",
        "utilisation": 0.85,
        "clamp_length": {"value": 40, "unit": "mm"},
        "clamped_material": "steel-s355",
        "joint_outer_diameter": {"value": 30, "unit": "mm"},
        "joint_type": "through-bolted",
        "snug_torque": {"value": 10, "unit": "N·m"},
        "required_clamp_load": {"value": 20, "unit": "kN"}
    });
    let (status, s) = json(app.post_json("/v1/tightening-specs", &body).await).await;
    assert_eq!(status, 200, "{s}");
    assert_eq!(s["angle"]["computed"], true, "{}", s["angle"]);
    let (amin, amax) = (
        value(&s["angle"]["min"], "degrees"),
        value(&s["angle"]["max"], "degrees"),
    );
    assert!(0.0 < amin && amin < amax, "{amin} {amax}");
    assert_eq!(value(&s["angle"]["snug_torque"], "N·m"), 10.0);
    assert_eq!(s["angle"]["snug_torque_source"], "given");
    assert_eq!(s["method"]["tool_scatter"], 0.05);
    assert_eq!(s["method"]["tool_scatter_source"], "given");
    assert_eq!(s["utilisation"], 0.85);
    assert_eq!(s["clamped_material"], "steel-s355");
    assert_eq!(s["clamp_load"]["met"], true, "{}", s["clamp_load"]);
    assert_eq!(value(&s["clamp_load"]["required"], "N"), 20_000.0);
}

#[tokio::test]
async fn explicit_friction_replaces_the_catalogue() {
    let app = spawn().await;
    let (status, s) = json(
        app.get(
            "/v1/tightening-specs?thread=M8&property_class=8.8&finish=zinc-electroplated\
             &lubricant=none&thread_friction_min=0.10&thread_friction_max=0.12",
        )
        .await,
    )
    .await;
    assert_eq!(status, 200, "{s}");
    assert_eq!(s["friction"]["thread"]["origin"], "request");
    assert_eq!(s["friction"]["catalogue_entry"]["id"], 7);
    assert_eq!(s["friction"]["thread"]["min"], 0.10);
    assert_eq!(s["friction"]["bearing"]["origin"], "catalogue");
}

async fn problem(app: &crate::specs_support::SpecApp, q: &str) -> (u16, Value) {
    let r = app.get(q).await;
    let ct = r.headers()["content-type"].to_str().unwrap().to_string();
    let (status, body) = json(r).await;
    assert_eq!(ct, "application/problem+json", "{q}");
    assert_eq!(body["status"], status, "{body}");
    (status, body)
}

#[tokio::test]
async fn every_error_class_names_the_field() {
    let app = spawn().await;
    let base = "/v1/tightening-specs?property_class=8.8&thread_friction=0.12&bearing_friction=0.12";

    // 400: unknown parameter (typo), unreadable number, quantity without unit
    let (st, p) = problem(&app, &format!("{base}&thred=M10")).await;
    assert_eq!((st, problem_fields(&p)), (400, vec!["thred".to_string()]));
    let (st, p) = problem(&app, &format!("{base}&thread=M10&tool_scatter=lots")).await;
    assert_eq!(st, 400, "{p}");
    let (st, p) = problem(&app, &format!("{base}&thread=M10&clamp_length=40")).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (400, vec!["clamp_length".to_string()])
    );
    let (st, p) = problem(&app, &format!("{base}&thread=banana")).await;
    assert_eq!((st, problem_fields(&p)), (400, vec!["thread".to_string()]));

    // 404 with suggestions: grade, finish, method
    let (st, p) = problem(
        &app,
        "/v1/tightening-specs?thread=M10&property_class=8.9&thread_friction=0.12&bearing_friction=0.12",
    )
    .await;
    assert_eq!(
        (st, problem_fields(&p)),
        (404, vec!["property_class".to_string()])
    );
    assert!(
        !p["errors"][0]["suggestions"].as_array().unwrap().is_empty(),
        "{p}"
    );
    let (st, p) = problem(
        &app,
        "/v1/tightening-specs?thread=M10&property_class=8.8&finish=zinc-plated&lubricant=none",
    )
    .await;
    assert_eq!((st, problem_fields(&p)), (404, vec!["finish".to_string()]));
    let sugg = p["errors"][0]["suggestions"].as_array().unwrap();
    assert!(sugg.iter().any(|s| s == "zinc-electroplated"), "{p}");
    let (st, p) = problem(
        &app,
        &format!("{base}&thread=M10&tightening_method=click-wrnch"),
    )
    .await;
    assert_eq!(
        (st, problem_fields(&p)),
        (404, vec!["tightening_method".to_string()])
    );

    // 422: μ_min > μ_max, missing friction source, grade outside its size range
    let (st, p) = problem(
        &app,
        "/v1/tightening-specs?thread=M10&property_class=8.8&thread_friction_min=0.2\
         &thread_friction_max=0.1&bearing_friction=0.12",
    )
    .await;
    assert_eq!(
        (st, problem_fields(&p)),
        (422, vec!["thread_friction.min".to_string()])
    );
    let (st, p) = problem(&app, "/v1/tightening-specs?thread=M10&property_class=8.8").await;
    assert_eq!(
        (st, problem_fields(&p)),
        (422, vec!["finish".to_string(), "lubricant".to_string()])
    );
    // ISO 898-1: property class 9.8 is specified for d ≤ 16 mm only.
    let (st, p) = problem(
        &app,
        "/v1/tightening-specs?thread=M20&property_class=9.8&thread_friction=0.12&bearing_friction=0.12",
    )
    .await;
    assert_eq!(
        (st, problem_fields(&p)),
        (422, vec!["property_class".to_string()])
    );
}

#[tokio::test]
async fn post_errors_bad_json_media_type_unknown_field() {
    let app = spawn().await;
    let url = format!("{}/v1/tightening-specs", app.base);
    let r = app
        .client
        .post(&url)
        .header("content-type", "application/json")
        .body("{\"thread\": ")
        .send()
        .await
        .unwrap();
    assert_eq!(r.status().as_u16(), 400);
    let r = app
        .client
        .post(&url)
        .body("thread=M10")
        .header("content-type", "text/plain")
        .send()
        .await
        .unwrap();
    assert_eq!(r.status().as_u16(), 415);
    let (st, p) = json(
        app.post_json(
            "/v1/tightening-specs",
            &json!({"thread": "M10", "property_class": "8.8", "thred": 1}),
        )
        .await,
    )
    .await;
    assert_eq!((st, problem_fields(&p)), (400, vec!["thred".to_string()]));
    let (st, p) = json(
        app.post_json(
            "/v1/tightening-specs",
            &json!({"thread": "M10", "property_class": "8.8", "thread_friction": 0.12,
                    "bearing_friction": 0.12, "clamp_length": {"value": 40, "unit": "furlong"}}),
        )
        .await,
    )
    .await;
    assert_eq!(st, 400, "{p}");
    assert!(problem_fields(&p)[0].starts_with("clamp_length"), "{p}");
}

#[tokio::test]
async fn etag_304_and_cache_control() {
    let app = spawn().await;
    let r = app.get(M12_VDI).await;
    assert_eq!(r.status().as_u16(), 200);
    let tag = r.headers()["etag"].to_str().unwrap().to_string();
    assert_eq!(
        r.headers()["cache-control"],
        "public, max-age=0, must-revalidate"
    );
    let r = app.get_with(M12_VDI, ("if-none-match", &tag)).await;
    assert_eq!(r.status().as_u16(), 304);
    assert_eq!(r.headers()["etag"].to_str().unwrap(), tag);
    assert!(r.bytes().await.unwrap().is_empty());
    // Another representation (US units) has another tag.
    let r = app
        .get_with(&format!("{M12_VDI}&units=us"), ("if-none-match", &tag))
        .await;
    assert_eq!(r.status().as_u16(), 200);
    // Pinned to a revision: may be kept for five minutes.
    let pinned = format!("{M12_VDI}&catalogue_revision=1");
    let r = app.get(&pinned).await;
    assert_eq!(r.status().as_u16(), 200);
    assert_eq!(r.headers()["cache-control"], "public, max-age=300");
    let (st, p) = json(app.get(&format!("{M12_VDI}&catalogue_revision=99")).await).await;
    assert_eq!(
        (st, problem_fields(&p)),
        (404, vec!["catalogue_revision".to_string()])
    );
}

#[tokio::test]
async fn post_carries_an_etag_but_is_never_304() {
    let app = spawn().await;
    let body = json!({"thread": "M10", "property_class": "8.8", "thread_friction": 0.12, "bearing_friction": 0.12});
    let r = app.post_json("/v1/tightening-specs", &body).await;
    assert_eq!(r.status().as_u16(), 200);
    let tag = r.headers()["etag"].to_str().unwrap().to_string();
    let r = app
        .client
        .post(format!("{}/v1/tightening-specs", app.base))
        .header("if-none-match", &tag)
        .json(&body)
        .send()
        .await
        .unwrap();
    assert_eq!(r.status().as_u16(), 200);
    // The same spec asked by GET has the same tag.
    let r = app
        .get("/v1/tightening-specs?thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12")
        .await;
    assert_eq!(r.headers()["etag"].to_str().unwrap(), tag);
}

#[tokio::test]
async fn reads_need_a_token_when_anonymous_reads_are_off() {
    let app = crate::support::TestApp::builder()
        .anonymous_reads(false)
        .spawn()
        .await;
    for path in [
        "/v1/tightening-specs?thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12",
        "/v1/setpoints?thread=M10&property_class=8.8&thread_friction=0.12&bearing_friction=0.12",
    ] {
        let r = app.get(path).await;
        assert_eq!(r.status().as_u16(), 401, "{path}");
    }
    let r = app
        .post_json("/v1/tightening-specs/batch", &json!({"items": []}))
        .await;
    assert_eq!(r.status().as_u16(), 401);
}
