//! The bolt's partners through `compute`: the washer's two surface
//! pressures (issue 12 audit case), the nut, materials outside the method
//! and the prevailing torque's twist in F_M,zul. Hollowmere Works demo
//! joints (invented).

use uom::si::torque::newton_meter;

use super::*;
use crate::engine::angle::JointType;
use crate::engine::bearing::{bearing_surface, washer_bearing, HeadType, HoleSeries, Washer};
use crate::engine::checks::{
    MATERIAL_OUTSIDE_METHOD, NUT_PROOF_LOAD_EXCEEDED, NUT_WEAKER_THAN_BOLT,
    SURFACE_PRESSURE_EXCEEDED, WASHER_SURFACE_PRESSURE_EXCEEDED,
};
use crate::engine::grade::strength_for;
use crate::engine::material::find_material;
use crate::engine::nut::nut_strength;
use crate::engine::thread::parse_designation;
use crate::engine::tightening::{permissible_preload, permissible_preload_with_prevailing};

fn input(designation: &str, class: &str, washer: Washer, material: &str) -> SpecInput {
    let thread = parse_designation(designation).unwrap();
    let strength = strength_for(class, &thread).unwrap();
    let bearing =
        bearing_surface(&thread, HeadType::HexagonHead, washer, HoleSeries::Medium).unwrap();
    let washer = washer_bearing(&thread, washer, HoleSeries::Medium).unwrap();
    SpecInput {
        thread,
        strength,
        bearing,
        thread_friction: FrictionRange::new(0.12, 0.12, "thread_friction").unwrap(),
        bearing_friction: FrictionRange::new(0.12, 0.12, "bearing_friction").unwrap(),
        friction_source: "given in the request".into(),
        method: TighteningMethod::ClickWrench,
        scatter: None,
        utilisation: None,
        prevailing_torque: None,
        clamped_material: Some(find_material(material).unwrap()),
        joint: None,
        tapped_hole: None,
        parts: MatingParts {
            washer,
            friction_given: true,
            ..Default::default()
        },
        required_clamp_load: None,
        window_mode: WindowMode::MaximumPreload,
        flags: SpecFlags::default(),
        joint_model: Default::default(),
    }
}

fn codes(spec: &Spec) -> Vec<&'static str> {
    spec.checks.iter().map(|c| c.code).collect()
}

#[test]
fn m6_washer_on_die_cast_aluminium_is_checked_on_both_faces() {
    // Issue 12 audit: the head-on-washer pressure (above the part's p_G
    // 290 MPa of GD-AlSi9Cu3) was compared with the part's limit. The part
    // sees F_M,max over the washer's face: ISO 7089 M6 outer 12 mm on the
    // ISO 273 medium hole 6.6 mm, π/4·(12² − 6.6²) = 78.9 mm² → about 120 MPa.
    let spec = compute(&input("M6", "8.8", Washer::Plain, "aluminium-alsi9cu3")).unwrap();
    let head_on_washer = spec.surface_pressure.value / 1e6;
    assert!(head_on_washer > 290.0, "{head_on_washer}");
    let on_part =
        spec.window.preload_max.value / (std::f64::consts::PI / 4.0 * (144.0 - 6.6 * 6.6)) * 1e6
            / 1e6;
    assert!((110.0..135.0).contains(&on_part), "{on_part}");
    let c = codes(&spec);
    assert!(!c.contains(&SURFACE_PRESSURE_EXCEEDED), "{c:?}");
    assert!(!c.contains(&WASHER_SURFACE_PRESSURE_EXCEEDED), "{c:?}");
    // Without the washer the head overloads the part and a washer is advised.
    let bare = compute(&input("M6", "8.8", Washer::None, "aluminium-alsi9cu3")).unwrap();
    let m = &bare
        .checks
        .iter()
        .find(|c| c.code == SURFACE_PRESSURE_EXCEEDED)
        .unwrap()
        .message;
    assert!(m.contains("washer"), "{m}");
    // A 12.9 head dents the 200 HV washer (630 MPa); the advice is a
    // hardened washer, never "fit a washer".
    let hard = compute(&input("M6", "12.9", Washer::Plain, "steel-42crmo4")).unwrap();
    if hard.surface_pressure.value / 1e6 > 630.0 {
        let m = &hard
            .checks
            .iter()
            .find(|c| c.code == WASHER_SURFACE_PRESSURE_EXCEEDED)
            .unwrap()
            .message;
        assert!(m.contains("hardened washer (300 HV)"), "{m}");
    }
}

#[test]
fn a_nut_too_weak_for_the_bolt_is_an_error() {
    let mut i = input("M12", "10.9", Washer::None, "steel-s355");
    i.parts.nut = Some(nut_strength("5", &i.thread).unwrap());
    let c = codes(&compute(&i).unwrap());
    // Class 5 (ISO 898-2: for bolts up to 5.8) under 10.9: weaker, and its
    // proof load 610 MPa × 84.3 mm² = 51.4 kN is below F_M,max (~ 60 kN).
    assert!(c.contains(&NUT_WEAKER_THAN_BOLT), "{c:?}");
    assert!(c.contains(&NUT_PROOF_LOAD_EXCEEDED), "{c:?}");
    i.parts.nut = Some(nut_strength("10", &i.thread).unwrap());
    let c = codes(&compute(&i).unwrap());
    assert!(!c.contains(&NUT_WEAKER_THAN_BOLT) && !c.contains(&NUT_PROOF_LOAD_EXCEEDED));
}

#[test]
fn a_plastic_part_is_refused_without_test_values_and_flagged_with_them() {
    let mut i = input("M5", "A2-70", Washer::None, "steel-s235");
    i.clamped_material = None;
    i.parts.tapped_part = Some(find_material("insert-in-plastic").unwrap());
    i.joint = Some(JointInput {
        clamp_length: None,
        joint_type: JointType::TappedHole,
        clamped_modulus: None,
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: None,
        socket_head: false,
        shank_sections: Vec::new(),
        snug_torque: None,
    });
    assert_eq!(compute(&i).unwrap_err().field(), "permissible_torque");
    i.parts.permissible_torque = Some(Torque::new::<newton_meter>(10.0));
    i.parts.friction_given = false;
    assert_eq!(compute(&i).unwrap_err().field(), "thread_friction");
    i.parts.friction_given = true;
    let spec = compute(&i).unwrap();
    assert!(codes(&spec).contains(&MATERIAL_OUTSIDE_METHOD));
}

#[test]
fn the_prevailing_torque_twists_the_bolt_and_lowers_f_m_zul() {
    let t = parse_designation("M10").unwrap();
    let s = strength_for("8.8", &t).unwrap();
    let nu = crate::engine::quantity::Utilisation::DEFAULT;
    let plain = permissible_preload(&t, s.yield_strength_min, nu, 0.12);
    let zero = permissible_preload_with_prevailing(
        &t,
        s.yield_strength_min,
        nu,
        0.12,
        Torque::new::<newton_meter>(0.0),
    );
    assert_eq!(plain, zero);
    let locked = permissible_preload_with_prevailing(
        &t,
        s.yield_strength_min,
        nu,
        0.12,
        Torque::new::<newton_meter>(5.0),
    );
    assert!(
        locked < plain && locked.value > 0.8 * plain.value,
        "{locked:?} {plain:?}"
    );
    // A prevailing torque that alone yields the bolt leaves nothing.
    let absurd = permissible_preload_with_prevailing(
        &t,
        s.yield_strength_min,
        nu,
        0.12,
        Torque::new::<newton_meter>(500.0),
    );
    assert_eq!(absurd.value, 0.0);
    // Through compute: the window's F_M,zul drops with the locking element.
    let mut i = input("M10", "8.8", Washer::None, "steel-s355");
    let before = compute(&i).unwrap().window.permissible_preload;
    i.prevailing_torque = Some(Torque::new::<newton_meter>(5.0));
    assert!(compute(&i).unwrap().window.permissible_preload < before);
}
