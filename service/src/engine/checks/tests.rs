use uom::si::f64::Force;
use uom::si::force::kilonewton;

use super::*;
use crate::engine::quantity::{Scatter, Utilisation};
use crate::engine::tightening::fixtures::*;
use crate::engine::window::{
    clamp_load_verdict, maximum_window, no_prevailing_torque, WindowInput,
};

struct Case {
    thread: ThreadGeometry,
    strength: Strength,
    bearing: BearingSurface,
    window: TorqueWindow,
    friction: FrictionRange,
    parts: MatingParts,
}

fn case() -> Case {
    let thread = metric(10.0, 1.5);
    let bearing = bearing(14.63, 11.0);
    let friction = FrictionRange::new(0.10, 0.16, "thread_friction").unwrap();
    let window = maximum_window(&WindowInput {
        thread: &thread,
        yield_strength: mpa(940.0),
        mean_bearing_diameter: bearing.mean_diameter(),
        thread_friction: friction,
        bearing_friction: friction,
        scatter: Scatter::new(0.06, "scatter").unwrap(),
        utilisation: Utilisation::DEFAULT,
        prevailing_torque: no_prevailing_torque(),
    })
    .unwrap();
    Case {
        thread,
        strength: strength("10.9", 1040.0, 940.0, 830.0),
        bearing,
        window,
        friction,
        parts: MatingParts::default(),
    }
}

fn input(c: &Case) -> CheckInput<'_> {
    CheckInput {
        thread: &c.thread,
        strength: &c.strength,
        bearing: &c.bearing,
        window: &c.window,
        method: TighteningMethod::ClickWrench,
        clamp_load: None,
        permissible_surface_pressure: Some(mpa(900.0)),
        tapped_hole: None,
        thread_friction: c.friction,
        bearing_friction: c.friction,
        measured_thread_friction: None,
        measured_bearing_friction: None,
        electroplated: false,
        hot_dip_galvanized: false,
        acid_cleaned: false,
        dry: false,
        stainless: false,
        angle: None,
        bolt_described: false,
        parts: &c.parts,
        outside_method: None,
    }
}

fn codes(checks: &[Check]) -> Vec<&'static str> {
    checks.iter().map(|c| c.code).collect()
}

#[test]
fn clean_joint_has_no_findings() {
    let c = case();
    assert!(run(&input(&c)).is_empty());
}

/// Surface pressure p = F_M,max/A_p against p_G: S235 490 MPa (VDI 2230
/// Part 1:2003 limiting surface pressure, as reproduced by a supplier page
/// "based on VDI 2230, edition 2003", in its technical tables).
#[test]
fn surface_pressure_on_soft_steel_is_flagged() {
    let c = case();
    let p = surface_pressure_value(&c.bearing, &c.window).value / 1e6;
    assert!(p > 490.0, "{p}");
    let mut i = input(&c);
    i.permissible_surface_pressure = Some(mpa(490.0));
    let found = run(&i);
    assert_eq!(codes(&found), ["surface_pressure_exceeded"]);
    assert_eq!(found[0].severity, Severity::Error);
    i.permissible_surface_pressure = None;
    assert_eq!(codes(&run(&i)), ["surface_pressure_not_checked"]);
}

#[test]
fn each_flagged_condition_has_its_code() {
    let c = case();
    let mut i = input(&c);
    i.tapped_hole = Some(TappedHole {
        engagement_length: mm(12.0),
        min_engagement_factor: 2.0,
        engagement_given: true,
    });
    let verdict = clamp_load_verdict(&c.window, Force::new::<kilonewton>(60.0));
    i.clamp_load = Some(&verdict);
    i.measured_thread_friction = Some(FrictionRange::new(0.12, 0.16, "x").unwrap());
    i.electroplated = true;
    i.dry = true;
    i.stainless = true;
    i.method = TighteningMethod::ImpactWrench;
    let found = run(&i);
    assert_eq!(
        codes(&found),
        [
            "thread_engagement_too_short",
            "clamp_load_not_reached",
            "friction_outside_measured_range",
            "hydrogen_embrittlement_risk",
            "galling_risk_dry_stainless",
            "impact_tool_unsuitable",
        ]
    );
    assert_eq!(found.last().unwrap().severity, Severity::Error);
    i.method = TighteningMethod::TorqueAngle;
    assert_eq!(codes(&run(&i)).last(), Some(&"torque_window_is_monitoring"));
    assert!(found.iter().all(|f| f.message.ends_with('.')));
}

#[test]
fn hydrogen_caution_only_from_1000_mpa() {
    let mut c = case();
    c.strength = class_8_8();
    let mut i = input(&c);
    i.electroplated = true;
    assert!(run(&i).is_empty());
}

#[test]
fn every_code_written_in_the_checks_is_listed() {
    // Scans this module's source, so a new check cannot be left out of
    // the list `accept_checks` is read against.
    let source = include_str!("../checks.rs");
    let mut found = 0;
    for part in source.split("code: \"").skip(1) {
        let code = part.split('"').next().unwrap();
        assert!(CODES.contains(&code), "{code} missing from CODES");
        found += 1;
    }
    // The partners' and plausibility checks name their codes by constants
    // that CODES itself lists.
    assert!(found >= 8, "{found}");
    let mut sorted = CODES.to_vec();
    sorted.sort_unstable();
    sorted.dedup();
    assert_eq!(sorted.len(), CODES.len(), "codes are unique");
}

#[test]
fn tool_window_warns_below_two_steps_and_refuses_one_value() {
    // M6 8.8 in lbf·ft at resolution 1: the window rounds to 8/8/8.
    let zero = tool_window(7.6, 8.4, (8.0, 8.0, 8.0), 1.0, "lbf·ft").unwrap();
    assert_eq!(
        (zero.code, zero.severity),
        (WINDOW_ZERO_WIDTH, Severity::Error)
    );
    assert!(zero.message.contains("8 lbf·ft"), "{}", zero.message);
    let narrow = tool_window(7.6, 9.4, (8.0, 9.0, 9.0), 1.0, "lbf·ft").unwrap();
    assert_eq!(
        (narrow.code, narrow.severity),
        (WINDOW_UNDER_TWO_STEPS, Severity::Warning)
    );
    assert!(tool_window(7.6, 9.6, (8.0, 9.0, 9.0), 1.0, "lbf·ft").is_none());
    assert!(tool_window(36.0, 39.5, (36.0, 37.5, 39.5), 0.5, "N·m").is_none());
}

#[test]
fn hot_dip_galvanized_12_9_is_an_error_and_10_9_passes() {
    let mut c = case();
    c.strength = strength("12.9", 1220.0, 1100.0, 970.0);
    let mut i = input(&c);
    i.hot_dip_galvanized = true;
    // acid cleaning is part of galvanizing: one finding, the error
    i.acid_cleaned = true;
    let found = run(&i);
    assert_eq!(codes(&found), ["hot_dip_galvanized_class_not_covered"]);
    assert_eq!(found[0].severity, Severity::Error);
    assert!(found[0].message.contains("ISO 10684") && found[0].message.contains("12.9"));
    // ISO 10684 covers 10.9
    let c = case();
    let mut i = input(&c);
    i.hot_dip_galvanized = true;
    assert!(run(&i).is_empty());
}

/// ASTM F3125 does not permit hot-dip galvanizing Grade A490 (recalled
/// from memory), though its tensile strength is below 12.9's.
#[test]
fn hot_dip_galvanized_a490_is_an_error() {
    let mut c = case();
    c.strength = strength("astm-f3125-a490", 1034.0, 896.0, 827.0);
    let mut i = input(&c);
    i.hot_dip_galvanized = true;
    let found = run(&i);
    assert_eq!(codes(&found), ["hot_dip_galvanized_class_not_covered"]);
    assert_eq!(found[0].severity, Severity::Error);
    assert!(found[0].message.contains("A490"));
    // Not galvanized: no finding.
    let i = input(&c);
    assert!(run(&i).is_empty());
}

#[test]
fn acid_cleaned_12_9_is_a_warning_and_10_9_passes() {
    let mut c = case();
    c.strength = strength("12.9", 1220.0, 1100.0, 970.0);
    let mut i = input(&c);
    i.acid_cleaned = true;
    let found = run(&i);
    assert_eq!(codes(&found), ["acid_cleaning_hydrogen_risk"]);
    assert_eq!(found[0].severity, Severity::Warning);
    assert!(found[0].message.contains("ISO 4042"));
    let c = case();
    let mut i = input(&c);
    i.acid_cleaned = true;
    assert!(run(&i).is_empty());
}

#[test]
fn tool_angle_window_warns_below_two_steps_and_refuses_one_value() {
    let zero = tool_angle_window(30.3, 39.2, (35.0, 35.0), 5.0).unwrap();
    assert_eq!(
        (zero.code, zero.severity),
        (ANGLE_WINDOW_ZERO_WIDTH, Severity::Error)
    );
    assert!(zero.message.contains("35°"), "{}", zero.message);
    let narrow = tool_angle_window(30.3, 39.2, (31.5, 36.0), 4.5).unwrap();
    assert_eq!(
        (narrow.code, narrow.severity),
        (ANGLE_WINDOW_UNDER_TWO_STEPS, Severity::Warning)
    );
    assert!(tool_angle_window(30.3, 39.2, (32.0, 36.0), 4.0).is_none());
}

/// An angle window reaching the yield angle: a warning for a bolt taken as
/// fully threaded, an error (refusing setpoints unless accepted) for a bolt
/// whose shank was described, since that yield angle is the real bolt's.
#[test]
fn angle_past_yield_is_an_error_for_a_described_bolt() {
    use crate::engine::angle::{angle_window, AngleOutcome, JointInput, JointType};
    let c = case();
    let w_in = WindowInput {
        thread: &c.thread,
        yield_strength: mpa(940.0),
        mean_bearing_diameter: c.bearing.mean_diameter(),
        thread_friction: c.friction,
        bearing_friction: c.friction,
        scatter: Scatter::new(0.06, "scatter").unwrap(),
        utilisation: Utilisation::DEFAULT,
        prevailing_torque: no_prevailing_torque(),
    };
    let joint = JointInput {
        clamp_length: Some(mm(30.0)),
        joint_type: JointType::ThroughBolted,
        clamped_modulus: Some(mpa(205_000.0)),
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: Some(mm(25.0)),
        socket_head: false,
        shank_sections: Vec::new(),
        snug_torque: None,
    };
    let AngleOutcome::Computed(mut a) = angle_window(&w_in, &c.bearing, &joint, &c.window).unwrap()
    else {
        panic!("angle not computed");
    };
    let mut i = input(&c);
    i.angle = Some(&a);
    let below = run(&i);
    assert!(!codes(&below).contains(&ANGLE_MAY_YIELD));
    assert!(!codes(&below).contains(&ANGLE_PAST_BOLT_YIELD));
    a.angle_max = a.angle_at_yield * 1.01;
    let mut i = input(&c);
    i.angle = Some(&a);
    let fully_threaded = run(&i);
    let warn = fully_threaded
        .iter()
        .find(|k| k.code == ANGLE_MAY_YIELD)
        .expect("warning");
    assert_eq!(warn.severity, Severity::Warning);
    assert!(!codes(&fully_threaded).contains(&ANGLE_PAST_BOLT_YIELD));
    i.bolt_described = true;
    let described = run(&i);
    let err = described
        .iter()
        .find(|k| k.code == ANGLE_PAST_BOLT_YIELD)
        .expect("error");
    assert_eq!(err.severity, Severity::Error);
    assert!(!codes(&described).contains(&ANGLE_MAY_YIELD));
}
