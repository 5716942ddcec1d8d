use proptest::prelude::*;
use uom::si::angle::degree;
use uom::si::f64::Force;
use uom::si::force::kilonewton;
use uom::si::torque::newton_meter;

use super::super::tests::m10_input;
use super::super::*;
use crate::engine::cautions::Caution;
use crate::engine::grade::strength_for;
use crate::engine::thread::parse_designation;
use crate::engine::tightening::fixtures::{bearing, mm, steel_joint};
use crate::engine::tightening::torque_per_preload;
use crate::engine::window::Governing;

/// The audit's M12 10.9 (issue 12): R_p0.2min 940 N/mm² (ISO 898-1:2013
/// Table 3), μ_th = μ_b = 0.12 single values, hexagon head d_W 16.63 mm
/// (ISO 4017 grade A) over an ISO 273 medium hole 13.5 mm, ν = 0.9, steel
/// plates, no joint unless a test adds one.
fn m12_10_9(method: TighteningMethod) -> SpecInput {
    let thread = parse_designation("M12").unwrap();
    let strength = strength_for("10.9", &thread).unwrap();
    let mut i = m10_input();
    i.thread_friction = FrictionRange::single(0.12, "thread_friction").unwrap();
    i.bearing_friction = FrictionRange::single(0.12, "bearing_friction").unwrap();
    i.thread = thread;
    i.strength = strength;
    i.bearing = bearing(16.63, 13.5);
    i.method = method;
    i.joint = None;
    i
}

fn kn(f: Force) -> f64 {
    f.get::<kilonewton>()
}

fn codes(s: &Spec) -> Vec<&'static str> {
    s.checks.iter().map(|c| c.code).collect()
}

/// Issue 12 audit, Why 2: yield-controlled M12 10.9 showed 52.9–63.3 kN
/// (the torque window with ±9 % scatter) while the method reaches at least
/// about 70 kN. Inputs as in [`m12_10_9`]. The torque model with ±9 % is
/// kept as the reference that reproduces the audit's old figures.
#[test]
fn audit_yield_controlled_m12_10_9_preload_from_the_yield_point() {
    let mut old = m12_10_9(TighteningMethod::ClickWrench);
    old.scatter = Some(0.09);
    let w = compute(&old).unwrap().window;
    assert!((kn(w.preload_min) - 52.9).abs() < 0.1, "{w:?}");
    assert!((kn(w.preload_max) - 63.3).abs() < 0.1, "{w:?}");

    let spec = compute(&m12_10_9(TighteningMethod::YieldControlled)).unwrap();
    let w = &spec.window;
    // Yield point at ν = 1, μ_th 0.12: 70.4 kN (the audit's yield force).
    assert!(kn(w.preload_min) >= 65.0 && (kn(w.preload_min) - 70.4).abs() < 0.1);
    // R_p0.2max defaulted to 1.2·R_p0.2min: α_A is that spread exactly.
    let p = spec.controlled.unwrap();
    assert!(p.yield_max_defaulted);
    assert!((w.tightening_factor - 1.2).abs() < 1e-9);
    assert!((kn(w.preload_max) / kn(w.preload_min) - 1.2).abs() < 1e-9);
    assert_eq!(w.governing, Governing::YieldPoint);
    // One friction value: the band runs from F_M,min·c to F_M,max·c.
    let c = torque_per_preload(&spec.thread, spec.mean_bearing_diameter, 0.12, 0.12).value;
    assert!((w.lower.value - w.preload_min.value * c).abs() < 1e-9);
    assert!((w.upper.value - w.preload_max.value * c).abs() < 1e-9);
    assert!(w.lower < w.target && w.target < w.upper);
    // The surface pressure uses the model's F_M,max.
    let ap = std::f64::consts::PI / 4.0 * (16.63f64.powi(2) - 13.5f64.powi(2));
    let pressure = spec.surface_pressure.value / 1e6;
    assert!(
        (pressure - w.preload_max.value / ap).abs() < 1e-6,
        "{pressure}"
    );
    assert!(matches!(spec.angle, AngleOutcome::NotComputed { .. }));
    assert!(codes(&spec).contains(&"torque_window_is_monitoring"));
    assert!(
        spec.cautions.contains(Caution::NoReuse),
        "{:?}",
        spec.cautions
    );
}

/// The yield band holds every friction corner: a bolt reaching yield at
/// any thread and bearing friction of the range, at either yield strength,
/// finishes inside it (so the band rejects no good joint at high friction).
#[test]
fn yield_band_holds_every_friction_corner() {
    let mut i = m12_10_9(TighteningMethod::YieldControlled);
    i.thread_friction = FrictionRange::new(0.10, 0.16, "thread_friction").unwrap();
    i.bearing_friction = FrictionRange::new(0.10, 0.16, "bearing_friction").unwrap();
    let spec = compute(&i).unwrap();
    let (w, t) = (&spec.window, &spec.thread);
    let alpha = w.tightening_factor;
    // VDI 2230 Part 1:2003 Table A8 (recalled from memory): 1.2–1.4.
    assert!((1.2..=1.4).contains(&alpha), "{alpha}");
    for rp in [940.0e6, 1.2 * 940.0e6] {
        for mu_th in [0.10, 0.16] {
            for mu_b in [0.10, 0.16] {
                let nu = crate::engine::quantity::Utilisation::new(1.0, "u").unwrap();
                let f = crate::engine::tightening::permissible_preload(
                    t,
                    uom::si::f64::Pressure::new::<uom::si::pressure::pascal>(rp),
                    nu,
                    mu_th,
                );
                let m =
                    f.value * torque_per_preload(t, spec.mean_bearing_diameter, mu_th, mu_b).value;
                assert!(m >= w.lower.value * (1.0 - 1e-12) && m <= w.upper.value * (1.0 + 1e-12));
            }
        }
    }
    // The minimum-clamp-load mode does not apply to yield control.
    i.window_mode = WindowMode::MinimumClampLoad;
    i.required_clamp_load = Some(Force::new::<kilonewton>(50.0));
    assert_eq!(compute(&i).unwrap_err().field(), "window_mode");
}

/// Torque-angle needs the joint: without it the spec is refused naming the
/// first missing part, never answered from a guessed resilience.
#[test]
fn torque_angle_needs_the_joint() {
    let i = m12_10_9(TighteningMethod::TorqueAngle);
    assert_eq!(compute(&i).unwrap_err().field(), "joint.clamp_length");
    let mut i = m12_10_9(TighteningMethod::TorqueAngle);
    let mut j = steel_joint(40.0, Vec::new(), false);
    j.outer_diameter = None;
    i.joint = Some(j);
    assert_eq!(compute(&i).unwrap_err().field(), "joint.outer_diameter");
}

/// Torque-angle M12 10.9 (inputs of [`m12_10_9`], 40 mm steel clamp, D_A 30
/// mm, fully threaded, default snug 30 % of M_A,zul, ±5 % angle scatter):
/// the preload comes from the angle and the joint's stiffness; the upper
/// end of the window is F_M,zul, below the angle at yield.
#[test]
fn torque_angle_preload_from_the_angle_window() {
    let mut i = m12_10_9(TighteningMethod::TorqueAngle);
    i.joint = Some(steel_joint(40.0, Vec::new(), false));
    let spec = compute(&i).unwrap();
    let w = &spec.window;
    let AngleOutcome::Computed(a) = &spec.angle else {
        panic!("{:?}", spec.angle)
    };
    // One friction value: the upper end reaches F_M,zul (63.3 kN) exactly.
    assert!((w.preload_max.value - w.permissible_preload.value).abs() < 1e-6);
    assert!(a.angle_max < a.angle_at_yield);
    assert!(
        (a.angle_min.get::<degree>() / a.angle_max.get::<degree>() - 0.95 / 1.05).abs() < 1e-12
    );
    assert_eq!(w.governing, Governing::AngleWindow);
    // Snug 30 % of M_A,zul (M_A at F_M,zul, μ 0.12): M = F·c.
    let c = torque_per_preload(&spec.thread, spec.mean_bearing_diameter, 0.12, 0.12).value;
    let ma = w.permissible_preload.value * c;
    assert!((a.snug_torque.get::<newton_meter>() - 0.3 * ma).abs() < 1e-9);
    // The band with one friction value: F_M,min·c to F_M,max·c.
    assert!((w.lower.value - w.preload_min.value * c).abs() < 1e-9);
    assert!((w.upper.value - w.preload_max.value * c).abs() < 1e-9);
    let codes = codes(&spec);
    assert!(!codes.contains(&checks::ANGLE_MAY_YIELD), "{codes:?}");
    assert!(!codes.contains(&checks::ANGLE_PAST_BOLT_YIELD), "{codes:?}");
}

/// α_A of the torque window with ±9 % on the inputs below: the audit's
/// figure, reproduced.
const AUDIT_OLD_ALPHA: f64 = 1.743;
/// α_A of the angle model on the same inputs with ±5 % angle scatter.
const AUDIT_NEW_ALPHA: f64 = 1.197;

/// Issue 12 audit, Why 2: torque-angle M14 10.9 showed α_A 1.74 (the torque
/// window with ±9 % and a friction range) while VDI 2230 Part 1:2003
/// Table A8 gives 1.2–1.4 for angle control (recalled from memory). Inputs:
/// M14 10.9, μ_th = μ_b = 0.09–0.14 (the range that reproduces the audit's
/// 1.74), hexagon head d_W 19.64 mm (ISO 4017 grade A) over an ISO 273
/// medium hole 15.5 mm, ν = 0.9, 40 mm steel clamp, D_A 30 mm, fully
/// threaded, default snug, ±5 % angle scatter. The model's 1.197 sits at
/// the table's lower end: the table also covers the scatter of the joint's
/// resilience, which the elastic model takes as exact.

#[test]
fn audit_torque_angle_m14_10_9_tightening_factor() {
    let thread = parse_designation("M14").unwrap();
    let mut i = m12_10_9(TighteningMethod::ClickWrench);
    i.strength = strength_for("10.9", &thread).unwrap();
    i.thread = thread;
    i.bearing = bearing(19.64, 15.5);
    i.thread_friction = FrictionRange::new(0.09, 0.14, "thread_friction").unwrap();
    i.bearing_friction = FrictionRange::new(0.09, 0.14, "bearing_friction").unwrap();
    i.joint = Some(steel_joint(40.0, Vec::new(), false));
    i.scatter = Some(0.09);
    let old = compute(&i).unwrap().window.tightening_factor;
    assert!((old - AUDIT_OLD_ALPHA).abs() < 0.01, "{old}");
    i.method = TighteningMethod::TorqueAngle;
    i.scatter = None;
    let spec = compute(&i).unwrap();
    let alpha = spec.window.tightening_factor;
    assert!((alpha - AUDIT_NEW_ALPHA).abs() < 0.0005, "{alpha}");
    assert!(alpha > 1.19 && alpha <= 1.4, "{alpha}");
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 128, failure_persistence: None, ..ProptestConfig::default() })]

    /// Torque-angle over sizes, frictions, clamp lengths, snug torques and
    /// ν < 1: when an angle window is answered its upper end is below the
    /// angle at yield, no yield check applies, and the band and preloads
    /// are ordered.
    #[test]
    fn torque_angle_window_stays_below_yield(
        size in prop::sample::select(vec!["M8", "M10", "M12", "M16", "M20"]),
        class in prop::sample::select(vec!["8.8", "10.9", "12.9"]),
        mu_lo in 0.08f64..0.14,
        spread in 0.0f64..0.08,
        lk in 15.0f64..80.0,
        nu in 0.5f64..0.999,
        snug_frac in prop::option::of(0.05f64..0.5),
        s in 0.0f64..0.2,
    ) {
        let mut i = m10_input();
        i.thread = parse_designation(size).unwrap();
        i.strength = strength_for(class, &i.thread).unwrap();
        let d = i.thread.nominal_diameter_mm();
        i.bearing = bearing(1.5 * d, 1.1 * d);
        i.thread_friction = FrictionRange::new(mu_lo, mu_lo + spread, "thread_friction").unwrap();
        i.bearing_friction = FrictionRange::new(mu_lo, mu_lo + spread, "bearing_friction").unwrap();
        i.method = TighteningMethod::TorqueAngle;
        i.utilisation = Some(nu);
        i.scatter = Some(s);
        let mut j = steel_joint(lk, Vec::new(), false);
        j.outer_diameter = Some(mm(3.0 * d));
        j.snug_torque = snug_frac.map(|f| {
            uom::si::f64::Torque::new::<newton_meter>(f * 0.2 * d.powi(3) / 10.0)
        });
        i.joint = Some(j);
        match compute(&i) {
            Ok(spec) => {
                let AngleOutcome::Computed(a) = &spec.angle else {
                    return Err(TestCaseError::fail(format!("{:?}", spec.angle)));
                };
                prop_assert!(a.angle_at_yield >= a.angle_max);
                let c = codes(&spec);
                prop_assert!(!c.contains(&checks::ANGLE_PAST_BOLT_YIELD));
                prop_assert!(!c.contains(&checks::ANGLE_MAY_YIELD));
                let w = &spec.window;
                prop_assert!(w.lower <= w.target && w.target <= w.upper);
                prop_assert!(w.preload_min <= w.preload_max);
                prop_assert!(w.tightening_factor >= 1.0);
            }
            Err(e) => prop_assert!(
                ["snug_torque", "joint.snug_torque", "joint.clamp_length", "prevailing_torque"]
                    .contains(&e.field()),
                "{e}"
            ),
        }
    }
}
