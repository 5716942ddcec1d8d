//! The work behind `GET /v1/tightening-specs`, `GET /v1/setpoints` and a
//! batch item, without the HTTP stack: query string → wire request → parse
//! step against the catalogue snapshot (names, catalogue friction, content
//! hash) → `engine::spec::compute` → response wire type → JSON bytes.
//! These are the same public functions the handlers call.
//!
//! Run with `cargo bench --bench service_path`. The load test
//! (`scripts/load`) measures the same paths through actix-web.
//!
//! Demo data (invented): Hollowmere Works, Kestrel K4 garden tractor joints.

use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion, Throughput};

use tightspec::catalogue::Snapshot;
use tightspec::http::quantity::TorqueUnit;
use tightspec::http::specs::handlers::compute_one;
use tightspec::http::specs::request::{SetpointQuery, SpecQuery, SpecRequest};
use tightspec::http::specs::response::spec_response;
use tightspec::http::specs::setpoints::setpoints;

/// Kestrel K4 rear axle clamp (demo): M10 8.8, zinc-plated, light oil,
/// catalogue friction, click wrench.
const AXLE_CLAMP: &str =
    "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=light-oil";

/// Kestrel K4 mower deck spindle (demo): torque-angle with clamp length.
const DECK_SPINDLE: &str = "thread=M12x1.25&property_class=10.9&finish=zinc-flake&lubricant=none\
    &tightening_method=torque-angle&clamp_length=32mm&joint_outer_diameter=30mm&clamped_material=steel&torque_unit=N%C2%B7m&resolution=0.5";

fn request(query: &str) -> SpecRequest {
    let q: SpecQuery = match serde_urlencoded::from_str(query) {
        Ok(q) => q,
        Err(e) => panic!("bench query {query}: {e}"),
    };
    match q.to_request() {
        Ok(r) => r,
        Err(e) => panic!("bench query {query}: {e:?}"),
    }
}

/// Query string to JSON bytes, as `GET /v1/tightening-specs` does.
fn spec_get(query: &str, snapshot: &Snapshot) -> Result<Vec<u8>, String> {
    let q: SpecQuery = serde_urlencoded::from_str(query).map_err(|e| e.to_string())?;
    let req = q.to_request().map_err(|e| format!("{e:?}"))?;
    let (resolved, spec) = compute_one(&req, snapshot).map_err(|e| format!("{e:?}"))?;
    serde_json::to_vec(&spec_response(&spec, &resolved, false)).map_err(|e| e.to_string())
}

/// Query string to JSON bytes, as `GET /v1/setpoints` does.
fn setpoints_get(query: &str, snapshot: &Snapshot) -> Result<Vec<u8>, String> {
    let q: SetpointQuery = serde_urlencoded::from_str(query).map_err(|e| e.to_string())?;
    let unit = TorqueUnit::parse("torque_unit", q.torque_unit.as_deref().unwrap_or("N·m"))
        .map_err(|e| format!("{e:?}"))?;
    let req = q.to_request().map_err(|e| format!("{e:?}"))?;
    let (resolved, spec) = compute_one(&req, snapshot).map_err(|e| format!("{e:?}"))?;
    let body = setpoints(
        &spec,
        &resolved,
        unit,
        q.resolution,
        q.angle_resolution,
        false,
    )
    .map_err(|e| format!("{e:?}"))?;
    serde_json::to_vec(&body).map_err(|e| e.to_string())
}

/// Fails loudly, before timing, if a bench input stopped being valid.
fn valid(what: &str, r: Result<Vec<u8>, String>) {
    if let Err(e) = r {
        panic!("{what} refused: {e}");
    }
}

fn bench_get(c: &mut Criterion) {
    let snapshot = Snapshot::seed();
    let axle_setpoints = format!("{AXLE_CLAMP}&torque_unit=N%C2%B7m&resolution=0.1");
    valid("spec GET", spec_get(AXLE_CLAMP, &snapshot));
    valid("setpoints GET", setpoints_get(&axle_setpoints, &snapshot));
    valid(
        "torque-angle setpoints GET",
        setpoints_get(DECK_SPINDLE, &snapshot),
    );
    let mut g = c.benchmark_group("service_path");
    g.bench_function("spec_get_m10_catalogue_friction", |b| {
        b.iter(|| spec_get(black_box(AXLE_CLAMP), &snapshot))
    });
    g.bench_function("setpoints_get_m10", |b| {
        b.iter(|| setpoints_get(black_box(&axle_setpoints), &snapshot))
    });
    g.bench_function("setpoints_get_torque_angle_m12x1.25", |b| {
        b.iter(|| setpoints_get(black_box(DECK_SPINDLE), &snapshot))
    });
    g.finish();
}

/// A batch of 1,000 catalogue-friction items (as the batch endpoint: JSON
/// items already parsed, compute each in one loop, serialise once).
fn bench_batch(c: &mut Criterion) {
    let snapshot = Snapshot::seed();
    const JOINTS: [(&str, &str, &str, &str); 5] = [
        ("M6", "8.8", "zinc-electroplated", "none"),
        ("M8", "8.8", "zinc-nickel", "light-oil"),
        ("M10", "10.9", "zinc-flake", "none"),
        ("M12", "8.8", "plain", "light-oil"),
        ("M16", "10.9", "phosphate-oil", "mos2-paste"),
    ];
    let requests: Vec<SpecRequest> = (0..1000)
        .map(|i| {
            let (t, c, f, l) = JOINTS[i % JOINTS.len()];
            request(&format!(
                "thread={t}&property_class={c}&finish={f}&lubricant={l}"
            ))
        })
        .collect();
    for r in &requests {
        if let Err(e) = compute_one(r, &snapshot) {
            panic!("batch item refused: {e:?}");
        }
    }
    let mut g = c.benchmark_group("service_path");
    g.throughput(Throughput::Elements(requests.len() as u64));
    g.sample_size(30);
    g.bench_function("batch_1000_compute_and_serialise", |b| {
        b.iter(|| {
            let items: Vec<_> = requests
                .iter()
                .filter_map(|r| compute_one(black_box(r), &snapshot).ok())
                .map(|(resolved, spec)| spec_response(&spec, &resolved, false))
                .collect();
            serde_json::to_vec(&items).map(|v| v.len()).unwrap_or(0)
        })
    });
    g.finish();
}

criterion_group!(benches, bench_get, bench_batch);
criterion_main!(benches);
