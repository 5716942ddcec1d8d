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

use std::sync::Arc;

use serde_json::value::RawValue;

use tightspec::app::quantity::TorqueUnit;
use tightspec::app::spec::setpoints::setpoints;
use tightspec::app::spec::tool::ToolAsk;
use tightspec::app::spec::view::spec_response;
use tightspec::app::spec::{compute_one, SetpointQuery, SpecQuery};
use tightspec::catalogue::Snapshot;
use tightspec::http::specs::batch::{
    read_item, write_items, ReadItem, CHUNK_ITEMS, ITEM_JSON_BYTES,
};
use tightspec::http::specs::handlers::{json_bytes, SPEC_JSON_CAPACITY};

/// Kestrel K4 rear axle clamp (demo): M10 8.8, zinc-plated, light oil,
/// catalogue friction, click wrench.
const AXLE_CLAMP: &str =
    "thread=M10&property_class=8.8&finish=zinc-electroplated&lubricant=light-oil";

/// Kestrel K4 mower deck spindle (demo): torque-angle with clamp length.
const DECK_SPINDLE: &str = "thread=M12x1.25&property_class=10.9&finish=zinc-flake&lubricant=none\
    &tightening_method=torque-angle&clamp_length=32mm&joint_outer_diameter=30mm&clamped_material=steel&torque_unit=N%C2%B7m&resolution=0.5";

/// Query string to JSON bytes, as `GET /v1/tightening-specs` does.
fn spec_get(query: &str, snapshot: &Snapshot) -> Result<Vec<u8>, String> {
    let q: SpecQuery = serde_urlencoded::from_str(query).map_err(|e| e.to_string())?;
    let req = q.to_request().map_err(|e| format!("{e:?}"))?;
    let (resolved, spec) = compute_one(&req, snapshot).map_err(|e| format!("{e:?}"))?;
    json_bytes(&spec_response(&spec, &resolved, false), SPEC_JSON_CAPACITY)
        .map_err(|e| e.to_string())
}

/// Query string to JSON bytes, as `GET /v1/setpoints` does.
fn setpoints_get(query: &str, snapshot: &Snapshot) -> Result<Vec<u8>, String> {
    let q: SetpointQuery = serde_urlencoded::from_str(query).map_err(|e| e.to_string())?;
    let unit = TorqueUnit::parse("torque_unit", q.torque_unit.as_deref().unwrap_or("N·m"))
        .map_err(|e| format!("{e:?}"))?;
    let req = q.to_request().map_err(|e| format!("{e:?}"))?;
    let (resolved, spec) = compute_one(&req, snapshot).map_err(|e| format!("{e:?}"))?;
    let tool = ToolAsk {
        unit,
        resolution: q.resolution,
        angle_resolution: q.angle_resolution,
        accept: Vec::new(),
    };
    let body = setpoints(&spec, &resolved, &tool, false).map_err(|e| format!("{e:?}"))?;
    json_bytes(&body, SPEC_JSON_CAPACITY).map_err(|e| e.to_string())
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

/// A batch of 1,000 catalogue-friction items, as `POST
/// /v1/tightening-specs/batch` answers it: each raw JSON item read into a
/// spec request, computed and written as JSON, a chunk at a time.
fn bench_batch(c: &mut Criterion) {
    let snapshot = Arc::new(Snapshot::seed());
    const JOINTS: [(&str, &str, &str, &str); 5] = [
        ("M6", "8.8", "zinc-electroplated", "none"),
        ("M8", "8.8", "zinc-nickel", "light-oil"),
        ("M10", "10.9", "zinc-flake", "none"),
        ("M12", "8.8", "plain", "light-oil"),
        ("M16", "10.9", "phosphate-oil", "mos2-paste"),
    ];
    let items: Vec<Box<RawValue>> = (0..1000)
        .map(|i| {
            let (t, c, f, l) = JOINTS[i % JOINTS.len()];
            let json = format!(
                r#"{{"thread":"{t}","property_class":"{c}","finish":"{f}","lubricant":"{l}"}}"#
            );
            match RawValue::from_string(json) {
                Ok(raw) => raw,
                Err(e) => panic!("bench item {i}: {e}"),
            }
        })
        .collect();
    let answer = |items: &[Box<RawValue>]| -> (usize, usize) {
        let mut bytes = 0;
        let mut succeeded = 0;
        for (n, chunk) in items.chunks(CHUNK_ITEMS).enumerate() {
            let read: Vec<ReadItem> = chunk
                .iter()
                .enumerate()
                .map(|(i, raw)| {
                    let r = read_item(raw)
                        .map(|req| (req, Arc::clone(&snapshot)))
                        .map_err(|e| e.problem());
                    (n * CHUNK_ITEMS + i, r)
                })
                .collect();
            let mut out = Vec::with_capacity(chunk.len() * ITEM_JSON_BYTES);
            succeeded += write_items(read, false, &mut out).unwrap_or(0);
            bytes += out.len();
        }
        (succeeded, bytes)
    };
    assert_eq!(
        answer(&items).0,
        items.len(),
        "every bench item must succeed"
    );
    let mut g = c.benchmark_group("service_path");
    g.throughput(Throughput::Elements(items.len() as u64));
    g.sample_size(30);
    g.bench_function("batch_1000_read_compute_write", |b| {
        b.iter(|| answer(black_box(&items)))
    });
    g.finish();
}

criterion_group!(benches, bench_get, bench_batch);
criterion_main!(benches);
