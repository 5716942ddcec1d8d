//! A full spec through the data modules: designation, grade and bearing
//! tables, then the computations. Hollowmere Works demo joint (invented):
//! Kestrel K4 garden tractor axle clamp, M10 8.8 hexagon head bolt.

use uom::si::force::kilonewton;
use uom::si::torque::newton_meter;

use super::*;
use crate::engine::angle::JointType;
use crate::engine::bearing::{bearing_surface, HeadType, HoleSeries, Washer};
use crate::engine::checks::TappedHole;
use crate::engine::grade::strength_for;
use crate::engine::material::{find_material, min_engagement_factor};
use crate::engine::thread::parse_designation;
use crate::engine::tightening::fixtures::mm;

fn input(designation: &str, class: &str) -> SpecInput {
    let thread = parse_designation(designation).unwrap();
    let strength = strength_for(class, &thread).unwrap();
    let bearing = bearing_surface(
        &thread,
        HeadType::HexagonHead,
        Washer::None,
        HoleSeries::Medium,
    )
    .unwrap();
    SpecInput {
        thread,
        strength,
        bearing,
        thread_friction: FrictionRange::new(0.12, 0.12, "thread_friction").unwrap(),
        bearing_friction: FrictionRange::new(0.12, 0.12, "bearing_friction").unwrap(),
        friction_source: "given in the request".into(),
        method: TighteningMethod::DcNutrunner,
        scatter: Some(0.0),
        utilisation: None,
        prevailing_torque: None,
        clamped_material: Some(find_material("steel-s355").unwrap()),
        joint: Some(JointInput {
            clamp_length: Some(mm(25.0)),
            joint_type: JointType::ThroughBolted,
            clamped_modulus: None,
            nut_modulus: None,
            bolt_modulus: None,
            outer_diameter: Some(mm(30.0)),
            socket_head: false,
            shank_sections: Vec::new(),
            snug_torque: None,
        }),
        tapped_hole: None,
        parts: Default::default(),
        required_clamp_load: None,
        window_mode: WindowMode::MaximumPreload,
        flags: SpecFlags::default(),
        joint_model: Default::default(),
    }
}

/// With single friction values and s = 0: torque.upper = VDI M_A and
/// preload.max = F_M,zul (issue 2). Published anchor for the preload: M12 8.8
/// μ 0.14 → 41.9 kN (VDI 2230 Part 1:2015, as reproduced in a supplier's technical tables).
#[test]
fn m10_and_m12_end_to_end() {
    let spec = compute(&input("M10", "8.8")).unwrap();
    let w = &spec.window;
    let f_zul = crate::engine::tightening::permissible_preload(
        &spec.thread,
        spec.strength.yield_strength_min,
        crate::engine::quantity::Utilisation::DEFAULT,
        0.12,
    );
    assert!((w.preload_max.value / f_zul.value - 1.0).abs() < 1e-12);
    assert_eq!(w.lower, w.upper);
    assert!(w.upper.get::<newton_meter>() > 0.0);
    assert!(matches!(spec.angle, AngleOutcome::Computed(_)));

    let mut m12 = input("M12", "8.8");
    m12.thread_friction = FrictionRange::single(0.14, "thread_friction").unwrap();
    m12.bearing_friction = FrictionRange::single(0.14, "bearing_friction").unwrap();
    let spec = compute(&m12).unwrap();
    let kn = spec.window.preload_max.get::<kilonewton>();
    assert!((kn / 41.9 - 1.0).abs() < 0.01, "{kn}");
}

/// Tapped hole in die-cast aluminium: the engagement factor from the material
/// table (supplier sheet based on trials; common practice aluminium 2·d) makes
/// a 1·d engagement fail the stripping check.
#[test]
fn short_engagement_in_aluminium_is_flagged() {
    let mut i = input("M8", "8.8");
    let al = find_material("aluminium-alsi9cu3").unwrap();
    let factor = min_engagement_factor(&al, &i.strength, &i.thread).unwrap();
    assert!(factor.factor >= 2.0);
    i.clamped_material = Some(al);
    i.joint.as_mut().unwrap().joint_type = JointType::TappedHole;
    i.tapped_hole = Some(TappedHole {
        engagement_length: mm(8.0),
        min_engagement_factor: factor.factor,
        engagement_given: true,
    });
    let spec = compute(&i).unwrap();
    let codes: Vec<_> = spec.checks.iter().map(|c| c.code).collect();
    assert!(codes.contains(&"thread_engagement_too_short"), "{codes:?}");
    // p_G of GD-AlSi9Cu3 is 290 MPa (VDI 2230:2003, as reproduced in a
    // supplier's technical tables): an 8.8 hexagon head at full preload exceeds it.
    assert!(codes.contains(&"surface_pressure_exceeded"), "{codes:?}");
}

/// Unified inch thread end to end: 1/2-13 UNC, SAE J429 Grade 5 hex cap
/// screw with ASME bearing tables; the forward window is ordered and the
/// nut factor at μ = 0.15 lies near Shigley's 0.20 (Shigley's Mechanical
/// Engineering Design §8-8; tolerance widened to ±0.03 because the ASME
/// bearing face here is not Shigley's 1.5·d).
#[test]
fn inch_thread_end_to_end() {
    let mut i = input("1/2-13 UNC", "grade 5");
    i.thread_friction = FrictionRange::single(0.15, "thread_friction").unwrap();
    i.bearing_friction = FrictionRange::single(0.15, "bearing_friction").unwrap();
    i.scatter = None;
    i.clamped_material = Some(find_material("steel").unwrap());
    let spec = compute(&i).unwrap();
    assert_eq!(spec.strength.id, "sae-j429-5");
    assert!(spec.window.lower < spec.window.upper);
    let k = spec.at_min_friction.nut_factor;
    assert!((k - 0.20).abs() <= 0.03, "{k}");
}
