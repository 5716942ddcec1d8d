//! Engine benchmarks (issue 6): one complete spec, a torque-angle spec,
//! designation parsing, a batch of 10,000 specs and the evaluation of a
//! 100-specimen friction test series; (issue 12) the full working-state
//! path: a described bolt, torque-angle tightening by the angle model,
//! load factor, embedding and the working state under operating loads.
//!
//! Targets (issue 6): one spec ≤ 2 µs median, parsing ≤ 200 ns; (issue 12)
//! the full working-state spec ≤ 5 µs. Run with
//! `cargo bench --bench engine`; criterion prints the median as the middle
//! figure of `time: [low median high]`.
//!
//! Demo data (invented): Hollowmere Works, Kestrel K4 garden tractor joints.

use std::hint::black_box;

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use uom::si::f64::{Force, Length, Torque};
use uom::si::force::kilonewton;
use uom::si::length::{micrometer, millimeter};
use uom::si::torque::newton_meter;

use tightspec::engine::angle::{AngleOutcome, JointInput, JointType};
use tightspec::engine::bearing::{bearing_surface, HeadType, HoleSeries, Washer};
use tightspec::engine::calibration::{
    evaluate_series, JointGeometry, Measurement, SeriesInput, SpecimenRecord,
};
use tightspec::engine::grade::strength_for;
use tightspec::engine::joint::bolt::{bolt, in_clamp_length, BoltInput, BoltStandard};
use tightspec::engine::joint::model::{JointModel, JointModelInput};
use tightspec::engine::joint::working::Loads;
use tightspec::engine::material::find_material;
use tightspec::engine::method::TighteningMethod;
use tightspec::engine::quantity::FrictionRange;
use tightspec::engine::spec::{compute, Spec, SpecFlags, SpecInput, WindowMode};
use tightspec::engine::thread::parse_designation;
use tightspec::engine::EngineError;

fn mm(v: f64) -> Length {
    Length::new::<millimeter>(v)
}

/// Request-shaped inputs of one spec: the names a client sends.
struct Names<'a> {
    thread: &'a str,
    class: &'a str,
    thread_friction: (f64, f64),
    bearing_friction: (f64, f64),
    method: TighteningMethod,
    clamp_length_mm: Option<f64>,
}

/// Everything the HTTP layer's parse step does with the engine's own
/// look-ups (designation, grade, bearing table, friction ranges, material),
/// then `compute` (window, clamp-load verdict, angle, figures, checks).
fn full_spec(n: &Names) -> Result<tightspec::engine::spec::Spec, EngineError> {
    let thread = parse_designation(n.thread)?;
    let strength = strength_for(n.class, &thread)?;
    let bearing = bearing_surface(
        &thread,
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Medium,
    )?;
    let joint = n.clamp_length_mm.map(|l| JointInput {
        clamp_length: Some(mm(l)),
        joint_type: JointType::ThroughBolted,
        clamped_modulus: None,
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: Some(mm(3.0 * l)),
        socket_head: false,
        shank_sections: Vec::new(),
        snug_torque: None,
    });
    let input = SpecInput {
        thread,
        strength,
        bearing,
        thread_friction: FrictionRange::new(
            n.thread_friction.0,
            n.thread_friction.1,
            "thread_friction",
        )?,
        bearing_friction: FrictionRange::new(
            n.bearing_friction.0,
            n.bearing_friction.1,
            "bearing_friction",
        )?,
        friction_source: "given in the request".to_string(),
        method: n.method,
        scatter: None,
        utilisation: None,
        prevailing_torque: None,
        clamped_material: Some(find_material("steel")?),
        joint,
        tapped_hole: None,
        parts: Default::default(),
        required_clamp_load: None,
        window_mode: WindowMode::MaximumPreload,
        flags: SpecFlags {
            electroplated: true,
            ..SpecFlags::default()
        },
        joint_model: Default::default(),
    };
    compute(&input)
}

/// Kestrel K4 rear axle clamp (demo): M10 8.8, zinc-plated, click wrench.
const AXLE_CLAMP: Names = Names {
    thread: "M10",
    class: "8.8",
    thread_friction: (0.10, 0.16),
    bearing_friction: (0.10, 0.16),
    method: TighteningMethod::ClickWrench,
    clamp_length_mm: None,
};

/// Kestrel K4 mower deck spindle (demo): M12x1.25 10.9, torque-angle.
const DECK_SPINDLE: Names = Names {
    thread: "M12x1.25",
    class: "10.9",
    thread_friction: (0.10, 0.14),
    bearing_friction: (0.10, 0.14),
    method: TighteningMethod::TorqueAngle,
    clamp_length_mm: Some(32.0),
};

fn bench_spec(c: &mut Criterion) {
    // Fail loudly (before timing) if the inputs stopped being valid.
    if let Err(e) = full_spec(&AXLE_CLAMP) {
        panic!("bench input refused by the engine: {e}");
    }
    match full_spec(&DECK_SPINDLE).map(|s| s.angle) {
        Ok(AngleOutcome::Computed(_)) => {}
        other => panic!("torque-angle bench input gives no angle window: {other:?}"),
    }
    let mut g = c.benchmark_group("spec");
    g.bench_function("complete_m10_8.8", |b| {
        b.iter(|| full_spec(black_box(&AXLE_CLAMP)))
    });
    g.bench_function("torque_angle_m12x1.25_10.9", |b| {
        b.iter(|| full_spec(black_box(&DECK_SPINDLE)))
    });
    g.finish();
}

/// Kestrel K4 mower deck spindle (demo) as a described joint: ISO 4014
/// M12×60 10.9 clamping 40 mm of steel (D_A 30 mm), torque-angle, with the
/// operating loads in the spec's joint model: 12 kN axial (0 to 12 kN),
/// 2 kN transverse over one interface at μ_T 0.15, Rz 16 µm. The engine's
/// own functions in the order a request meets them: look-ups, bolt and its
/// shank in the clamp length, then `compute` (angle-controlled preload,
/// Φ, F_Z, the working state, checks).
fn working_state_spec() -> Result<(Spec, JointModel), EngineError> {
    let thread = parse_designation("M12")?;
    let strength = strength_for("10.9", &thread)?;
    let bearing = bearing_surface(
        &thread,
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Medium,
    )?;
    let lk = mm(40.0);
    let described = bolt(
        &thread,
        &BoltInput::Standard {
            standard: BoltStandard::Iso4014,
            length: mm(60.0),
        },
    )?;
    let clamped = in_clamp_length(&described, lk, thread.nominal_diameter * 0.8, "nut")?;
    let joint = JointInput {
        clamp_length: Some(lk),
        joint_type: JointType::ThroughBolted,
        clamped_modulus: None,
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: Some(mm(30.0)),
        socket_head: clamped.socket_head,
        shank_sections: clamped.shank_sections,
        snug_torque: None,
    };
    let loads = Loads {
        axial_max: Force::new::<kilonewton>(12.0),
        axial_min: Force::new::<kilonewton>(0.0),
        transverse: Force::new::<kilonewton>(2.0),
        torsion: Torque::new::<newton_meter>(0.0),
        torsion_radius: None,
        interfaces: 1,
        interface_friction: Some(0.15),
        sealing_clamp_load: None,
    };
    let input = SpecInput {
        thread,
        strength,
        bearing,
        thread_friction: FrictionRange::new(0.10, 0.14, "thread_friction")?,
        bearing_friction: FrictionRange::new(0.10, 0.14, "bearing_friction")?,
        friction_source: "given in the request".to_string(),
        method: TighteningMethod::TorqueAngle,
        scatter: None,
        utilisation: None,
        prevailing_torque: None,
        clamped_material: Some(find_material("steel")?),
        joint: Some(joint),
        tapped_hole: None,
        parts: Default::default(),
        required_clamp_load: None,
        window_mode: WindowMode::MaximumPreload,
        flags: SpecFlags {
            bolt_described: true,
            ..SpecFlags::default()
        },
        joint_model: JointModelInput {
            roughness_rz: Some(Length::new::<micrometer>(16.0)),
            loads: Some(loads),
            ..JointModelInput::default()
        },
    };
    let mut spec = compute(&input)?;
    if !matches!(spec.angle, AngleOutcome::Computed(_)) {
        return Err(EngineError::invalid("joint", "no angle window"));
    }
    let Some(model) = spec.joint_model.take() else {
        return Err(EngineError::invalid("loads", "no joint model"));
    };
    if model.working.is_none() {
        return Err(EngineError::invalid("loads", "no working state"));
    }
    Ok((spec, model))
}

fn bench_working_state(c: &mut Criterion) {
    if let Err(e) = working_state_spec() {
        panic!("working-state bench input refused by the engine: {e}");
    }
    c.bench_function("working_state/m12x60_iso4014_10.9_torque_angle", |b| {
        b.iter(working_state_spec)
    });
}

fn bench_parse(c: &mut Criterion) {
    let mut g = c.benchmark_group("parse_designation");
    for text in ["M10", "M12x1.25", "1/2-13 UNC", "#10-24"] {
        if let Err(e) = parse_designation(text) {
            panic!("{text}: {e}");
        }
        g.bench_function(text, |b| b.iter(|| parse_designation(black_box(text))));
    }
    g.finish();
}

/// 10,000 specs over a rotating mix of sizes, grades, frictions and methods,
/// computed in one loop as the batch endpoint does.
fn batch_names() -> Vec<Names<'static>> {
    const THREADS: [(&str, &str); 8] = [
        ("M6", "8.8"),
        ("M8", "8.8"),
        ("M10", "10.9"),
        ("M12", "8.8"),
        ("M16", "10.9"),
        ("M10x1.25", "12.9"),
        ("1/2-13 UNC", "grade 5"),
        ("3/8-16 UNC", "grade 8"),
    ];
    const METHODS: [TighteningMethod; 3] = [
        TighteningMethod::ClickWrench,
        TighteningMethod::DcNutrunner,
        TighteningMethod::TorqueAngle,
    ];
    (0..10_000)
        .map(|i| {
            let (thread, class) = THREADS[i % THREADS.len()];
            let lo = 0.08 + 0.002 * (i % 20) as f64;
            let method = METHODS[(i / 8) % METHODS.len()];
            Names {
                thread,
                class,
                thread_friction: (lo, lo + 0.06),
                bearing_friction: (lo, lo + 0.08),
                method,
                clamp_length_mm: (method == TighteningMethod::TorqueAngle).then_some(40.0),
            }
        })
        .collect()
}

fn bench_batch(c: &mut Criterion) {
    let names = batch_names();
    let refused = names.iter().filter(|n| full_spec(n).is_err()).count();
    assert_eq!(refused, 0, "every batch item must be a valid spec");
    let mut g = c.benchmark_group("batch");
    g.throughput(Throughput::Elements(names.len() as u64));
    g.sample_size(20);
    g.bench_function("10000_specs", |b| {
        b.iter(|| {
            names
                .iter()
                .map(|n| full_spec(black_box(n)).map(|s| s.window.target.value))
                .collect::<Vec<_>>()
        })
    });
    g.finish();
}

/// 100 specimens generated from known frictions by the ISO 16047 torque
/// relation (the engine's own `torques_for`), thread torque measured.
fn friction_series() -> SeriesInput {
    let thread = parse_designation("M10").expect("M10");
    let bearing = bearing_surface(
        &thread,
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Medium,
    )
    .expect("bearing");
    let joint = JointGeometry::new(&thread, Some(&bearing), false).expect("joint");
    let specimens = (0..100)
        .map(|i| {
            let th = 0.10 + 0.0004 * i as f64;
            let b = 0.12 + 0.0003 * ((i * 37) % 100) as f64;
            let f = Force::new::<kilonewton>(25.0);
            let (t_th, t) = joint.torques_for(f, th, b);
            SpecimenRecord::Point(Measurement {
                clamp_force: f,
                total_torque: t,
                thread_torque: Some(t_th),
            })
        })
        .collect();
    SeriesInput {
        joint,
        evaluation_clamp_force: None,
        proof_load: None,
        specimens,
    }
}

fn bench_calibration(c: &mut Criterion) {
    let series = friction_series();
    if let Err(e) = evaluate_series(&series) {
        panic!("series refused: {:?}", e.0);
    }
    c.bench_function("calibration/evaluate_100_specimens", |b| {
        b.iter(|| evaluate_series(black_box(&series)))
    });
}

criterion_group!(
    benches,
    bench_spec,
    bench_working_state,
    bench_parse,
    bench_batch,
    bench_calibration
);
criterion_main!(benches);
