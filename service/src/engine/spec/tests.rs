use proptest::prelude::*;
use uom::si::angle::degree;
use uom::si::force::kilonewton;

use super::*;
use crate::engine::angle::JointType;
use crate::engine::cautions::Caution;
use crate::engine::grade::strength_for;
use crate::engine::thread::parse_designation;
use crate::engine::tightening::fixtures::*;

fn steel() -> ClampedMaterial {
    ClampedMaterial {
        id: "test-steel".into(),
        name: "steel (test fixture)".into(),
        kind: crate::engine::material::MaterialKind::Metal,
        // E = 205 000 N/mm² (usual VDI 2230 value, recalled from memory);
        // p_G of S355J0 760 MPa (VDI 2230:2003, as reproduced in a supplier's technical tables).
        elastic_modulus: mpa(205_000.0),
        permissible_surface_pressure: Some(mpa(760.0)),
        tensile_strength_min: Some(mpa(510.0)),
        source: "test fixture".into(),
    }
}

fn joint() -> JointInput {
    JointInput {
        clamp_length: Some(mm(30.0)),
        joint_type: JointType::ThroughBolted,
        clamped_modulus: None,
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: Some(mm(40.0)),
        socket_head: false,
        shank_sections: Vec::new(),
        snug_torque: None,
    }
}

/// Hollowmere Works demo joint (invented): M10 8.8, hexagon head on steel,
/// ISO 4017 grade A d_w,min 14.63 mm, ISO 273 medium hole 11 mm.
pub(crate) fn m10_input() -> SpecInput {
    let thread = parse_designation("M10").unwrap();
    let strength = strength_for("8.8", &thread).unwrap();
    SpecInput {
        thread,
        strength,
        bearing: bearing(14.63, 11.0),
        thread_friction: FrictionRange::new(0.10, 0.16, "thread_friction").unwrap(),
        bearing_friction: FrictionRange::new(0.10, 0.16, "bearing_friction").unwrap(),
        friction_source: "VDI 2230 Part 1 friction class B (test)".into(),
        method: TighteningMethod::ClickWrench,
        scatter: None,
        utilisation: None,
        prevailing_torque: None,
        clamped_material: Some(steel()),
        joint: Some(joint()),
        tapped_hole: None,
        parts: Default::default(),
        required_clamp_load: None,
        window_mode: WindowMode::MaximumPreload,
        flags: SpecFlags::default(),
        joint_model: Default::default(),
    }
}

#[test]
fn full_m10_spec_carries_its_assumptions() {
    let spec = compute(&m10_input()).unwrap();
    assert_eq!(spec.thread.designation, "M10");
    assert_eq!(spec.strength.id, "8.8");
    assert_eq!(spec.scatter_source, ValueSource::Default);
    assert_eq!(spec.scatter, 0.06);
    assert_eq!(spec.utilisation, 0.9);
    assert_eq!(spec.torque_formula, TorqueFormula::Vdi60);
    // Proof load M10 8.8: ISO 898-1 prints 33 700 N (supplier tables of EN ISO
    // 898-1); As·Sp unrounded is within 0.5 %.
    assert!((spec.proof_load.value / 33_700.0 - 1.0).abs() < 0.005);
    let w = &spec.window;
    assert!(w.lower < w.target && w.target < w.upper);
    assert!(w.tightening_factor > 1.3 && w.tightening_factor < 2.2);
    assert!(spec.at_min_friction.preload_at_target > spec.at_max_friction.preload_at_target);
    assert!(spec.at_min_friction.nut_factor < spec.at_max_friction.nut_factor);
    let AngleOutcome::Computed(a) = &spec.angle else {
        panic!("{:?}", spec.angle)
    };
    assert!(a.angle_min.get::<degree>() > 0.0);
    assert!(spec.checks.is_empty(), "{:?}", spec.checks);
    let j = spec.joint.as_ref().unwrap();
    assert_eq!(j.clamped_modulus, Some(mpa(205_000.0)));
    assert_eq!(j.bolt_modulus, Some(mpa(205_000.0)));
    assert_eq!(j.nut_modulus, Some(mpa(205_000.0)));
    // An angle window is given: the elastic-model caution applies.
    assert!(spec.cautions.contains(Caution::ElasticModel));
    assert!(spec.cautions.texts().next().unwrap().contains("ISO 16047"));
}

#[test]
fn no_joint_means_no_angle_with_a_reason() {
    let mut i = m10_input();
    i.joint = None;
    let spec = compute(&i).unwrap();
    assert!(matches!(spec.angle, AngleOutcome::NotComputed { .. }));
    let mut i = m10_input();
    i.clamped_material = None;
    match compute(&i).unwrap().angle {
        AngleOutcome::NotComputed { reason } => assert!(reason.contains("clamped material")),
        other => panic!("{other:?}"),
    }
}

#[test]
fn inverse_mode_and_no_window() {
    let mut i = m10_input();
    i.required_clamp_load = Some(Force::new::<kilonewton>(12.0));
    i.window_mode = WindowMode::MinimumClampLoad;
    let spec = compute(&i).unwrap();
    let v = spec.clamp_load.unwrap();
    assert!(v.met && v.margin.value.abs() < 1e-6);
    i.required_clamp_load = Some(Force::new::<kilonewton>(25.0));
    let e = compute(&i).unwrap_err();
    assert_eq!(e.field(), "required_clamp_load");
    assert!(e.to_string().contains("no torque window"));
    // Forward mode: the same load is a failed check, not an error.
    i.window_mode = WindowMode::MaximumPreload;
    let spec = compute(&i).unwrap();
    assert!(spec
        .checks
        .iter()
        .any(|c| c.code == "clamp_load_not_reached"));
    i.required_clamp_load = None;
    i.window_mode = WindowMode::MinimumClampLoad;
    assert_eq!(compute(&i).unwrap_err().field(), "required_clamp_load");
}

type Mutation = Box<dyn Fn(&mut SpecInput)>;

/// Issue 2 "Bad input": each class gives a typed error naming the field.
#[test]
fn bad_input_names_the_field() {
    let cases: Vec<(Mutation, &str)> = vec![
        (Box::new(|i| i.scatter = Some(0.5)), "scatter"),
        (Box::new(|i| i.scatter = Some(f64::NAN)), "scatter"),
        (Box::new(|i| i.utilisation = Some(0.0)), "utilisation"),
        (Box::new(|i| i.utilisation = Some(1.2)), "utilisation"),
        (
            Box::new(|i| i.prevailing_torque = Some(Torque::new::<newton_meter>(-1.0))),
            "prevailing_torque",
        ),
        (
            Box::new(|i| i.required_clamp_load = Some(Force::new::<kilonewton>(0.0))),
            "required_clamp_load",
        ),
        (
            Box::new(|i| i.bearing = bearing(11.0, 14.63)),
            "bearing.outer_diameter",
        ),
        (
            Box::new(|i| i.bearing = bearing(f64::INFINITY, 11.0)),
            "bearing.outer_diameter",
        ),
        (Box::new(|i| i.thread.pitch = mm(-1.0)), "thread"),
        (Box::new(|i| i.thread.minor_diameter = mm(11.0)), "thread"),
        (
            Box::new(|i| i.strength.yield_strength_min = mpa(f64::NAN)),
            "property_class",
        ),
        (
            Box::new(|i| i.joint.as_mut().unwrap().clamp_length = Some(mm(3.0))),
            "joint.clamp_length",
        ),
        (
            Box::new(|i| i.joint.as_mut().unwrap().clamp_length = Some(mm(-3.0))),
            "joint.clamp_length",
        ),
        (
            Box::new(|i| {
                i.joint.as_mut().unwrap().snug_torque = Some(Torque::new::<newton_meter>(0.0))
            }),
            "joint.snug_torque",
        ),
    ];
    for (mutate, field) in cases {
        let mut i = m10_input();
        mutate(&mut i);
        let e = compute(&i).unwrap_err();
        assert_eq!(e.field(), field, "{e}");
        assert!(matches!(e, EngineError::Invalid { .. }));
    }
    // Friction and grade errors come from their constructors.
    assert_eq!(
        FrictionRange::new(0.2, 0.1, "thread_friction")
            .unwrap_err()
            .field(),
        "thread_friction.min"
    );
    let m20 = parse_designation("M20").unwrap();
    assert!(matches!(
        strength_for("9.8", &m20),
        Err(EngineError::Invalid { .. })
    ));
}

#[test]
fn stainless_grade_ids() {
    assert!(is_stainless_grade("A2-70"));
    assert!(is_stainless_grade("a4-80"));
    assert!(!is_stainless_grade("8.8"));
    assert!(!is_stainless_grade("astm-a574"));
}

proptest! {
    /// Issue 2: arbitrary values never make the engine panic.
    #[test]
    fn arbitrary_numbers_never_panic(
        s in proptest::num::f64::ANY, nu in proptest::num::f64::ANY,
        mp in proptest::num::f64::ANY, req in proptest::num::f64::ANY,
        lk in proptest::num::f64::ANY, da in proptest::num::f64::ANY,
        snug in proptest::num::f64::ANY, dw in proptest::num::f64::ANY,
        dh in proptest::num::f64::ANY, p in proptest::num::f64::ANY,
        inverse in any::<bool>(),
        f1 in proptest::num::f64::ANY, f2 in proptest::num::f64::ANY,
    ) {
        let mut i = m10_input();
        if let Ok(r) = FrictionRange::new(f1, f2, "thread_friction") {
            i.thread_friction = r;
        }
        if let Ok(r) = FrictionRange::new(f2.abs() % 0.6, f1.abs() % 0.6, "bearing_friction") {
            i.bearing_friction = r;
        }
        i.scatter = Some(s);
        i.utilisation = Some(nu);
        i.prevailing_torque = Some(Torque::new::<newton_meter>(mp));
        i.required_clamp_load = Some(Force::new::<newton>(req));
        i.window_mode = if inverse { WindowMode::MinimumClampLoad } else { WindowMode::MaximumPreload };
        i.bearing = bearing(dw, dh);
        i.thread.pitch = mm(p);
        let j = i.joint.as_mut().unwrap();
        j.clamp_length = Some(mm(lk));
        j.outer_diameter = Some(mm(da));
        j.snug_torque = Some(Torque::new::<newton_meter>(snug));
        let _ = compute(&i);
    }

    /// Plausible but random inputs: always a result or a typed error, and a
    /// result always has an ordered window.
    #[test]
    fn plausible_inputs_give_ordered_windows(
        s in 0.0f64..0.45, nu in 0.3f64..1.0, lk in 1.0f64..200.0, da in 5.0f64..200.0,
        t1 in 0.02f64..0.6, t2 in 0.02f64..0.6,
    ) {
        let mut i = m10_input();
        i.scatter = Some(s);
        i.utilisation = Some(nu);
        i.thread_friction = FrictionRange::new(t1.min(t2), t1.max(t2), "thread_friction").unwrap();
        let j = i.joint.as_mut().unwrap();
        j.clamp_length = Some(mm(lk));
        j.outer_diameter = Some(mm(da));
        if let Ok(spec) = compute(&i) {
            prop_assert!(spec.window.lower <= spec.window.target);
            prop_assert!(spec.window.target <= spec.window.upper);
            prop_assert!(spec.window.preload_min.value > 0.0);
        }
    }
}

/// A wide thread-friction range: the rotation a torque window gives, up to
/// the top of its preload range, can yield a bolt whose thread friction is
/// high. (Torque-angle tightening aims its window below that angle; see
/// `spec/controlled/tests.rs`.)
#[test]
fn wide_friction_angle_window_warns_about_yield() {
    let mut i = m10_input();
    i.thread_friction = FrictionRange::new(0.08, 0.45, "thread_friction").unwrap();
    i.method = TighteningMethod::DcNutrunner;
    let spec = compute(&i).unwrap();
    let codes: Vec<_> = spec.checks.iter().map(|c| c.code).collect();
    if let AngleOutcome::Computed(a) = &spec.angle {
        assert!(a.angle_max >= a.angle_at_yield);
        assert!(codes.contains(&"angle_may_yield_bolt"), "{codes:?}");
    } else {
        panic!("{:?}", spec.angle);
    }
}
