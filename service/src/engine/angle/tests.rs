use uom::si::angle::degree;

use super::*;
use crate::engine::quantity::{FrictionRange, Scatter};
use crate::engine::thread::ThreadGeometry;
use crate::engine::tightening::fixtures::*;
use crate::engine::window::{maximum_window, no_prevailing_torque};

fn joint(lk: Option<f64>, da: Option<f64>, kind: JointType) -> JointInput {
    JointInput {
        clamp_length: lk.map(mm),
        joint_type: kind,
        clamped_modulus: Some(mpa(205_000.0)),
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: da.map(mm),
        socket_head: false,
        shank_sections: Vec::new(),
        snug_torque: None,
    }
}

fn m12() -> (ThreadGeometry, BearingSurface) {
    (metric(12.0, 1.75), bearing(16.63, 13.5))
}

fn window_input<'a>(t: &'a ThreadGeometry, b: &BearingSurface) -> WindowInput<'a> {
    WindowInput {
        thread: t,
        yield_strength: mpa(640.0),
        mean_bearing_diameter: b.mean_diameter(),
        thread_friction: FrictionRange::new(0.10, 0.14, "thread_friction").unwrap(),
        bearing_friction: FrictionRange::new(0.10, 0.14, "bearing_friction").unwrap(),
        scatter: Scatter::new(0.05, "scatter").unwrap(),
        utilisation: crate::engine::quantity::Utilisation::DEFAULT,
        prevailing_torque: no_prevailing_torque(),
    }
}

fn dp(t: &ThreadGeometry, b: &BearingSurface, kind: JointType, lk: f64, da: f64) -> Resilience {
    resilience(t, b, &joint(Some(lk), Some(da), kind), mm(lk), mm(da)).unwrap()
}

/// The three δ_P branches of the cone model (VDI 2230 Part 1, recalled from
/// memory) must join without a jump at D_A = d_W and at D_A = D_A,Gr.
#[test]
fn clamped_part_resilience_is_continuous_across_branches() {
    let (t, b) = m12();
    for kind in [JointType::ThroughBolted, JointType::TappedHole] {
        let lk = 30.0;
        let at_dw = b.outer_diameter.value * 1e3;
        let below = dp(&t, &b, kind, lk, at_dw * (1.0 - 1e-7)).clamped_parts;
        let above = dp(&t, &b, kind, lk, at_dw * (1.0 + 1e-7)).clamped_parts;
        assert!((below / above - 1.0).abs() < 1e-4, "{kind:?} at d_W");
        // Find D_A = D_A,Gr(D_A) by fixed point, then compare both sides.
        let mut da = at_dw * 2.0;
        for _ in 0..60 {
            da = dp(&t, &b, kind, lk, da).cone_limit_diameter.value * 1e3;
        }
        let below = dp(&t, &b, kind, lk, da * (1.0 - 1e-7)).clamped_parts;
        let above = dp(&t, &b, kind, lk, da * (1.0 + 1e-7)).clamped_parts;
        assert!((below / above - 1.0).abs() < 1e-4, "{kind:?} at D_A,Gr");
    }
}

#[test]
fn resilience_responds_the_right_way() {
    let (t, b) = m12();
    let base = dp(&t, &b, JointType::ThroughBolted, 30.0, 40.0);
    let sum = base.head
        + base.shank_sections
        + base.free_thread
        + base.engaged_thread
        + base.nut_or_tapped_hole;
    assert!((sum / base.bolt - 1.0).abs() < 1e-12);
    assert!(base.bolt > base.clamped_parts, "bolt is the softer member");
    assert!(base.load_factor > 0.0 && base.load_factor < 0.5);
    // A full-diameter shank is stiffer than thread: δ_S falls.
    let mut j = joint(Some(30.0), Some(40.0), JointType::ThroughBolted);
    j.shank_sections = vec![ShankSection {
        length: mm(20.0),
        diameter: mm(12.0),
    }];
    let shanked = resilience(&t, &b, &j, mm(30.0), mm(40.0)).unwrap();
    assert!(shanked.bolt < base.bolt);
    // Longer clamp length: softer bolt and softer plates.
    let long = dp(&t, &b, JointType::ThroughBolted, 60.0, 40.0);
    assert!(long.bolt > base.bolt && long.clamped_parts > base.clamped_parts);
    // Aluminium plates (E about 70 000 N/mm², recalled from memory) are softer.
    let mut al = joint(Some(30.0), Some(40.0), JointType::ThroughBolted);
    al.clamped_modulus = Some(mpa(70_000.0));
    let al = resilience(&t, &b, &al, mm(30.0), mm(40.0)).unwrap();
    assert!(al.clamped_parts > base.clamped_parts);
}

#[test]
fn bad_joint_input_names_the_field() {
    let (t, b) = m12();
    let j = joint(Some(5.0), Some(40.0), JointType::ThroughBolted);
    let e = resilience(&t, &b, &j, mm(5.0), mm(40.0)).unwrap_err();
    assert_eq!(e.field(), "joint.clamp_length");
    let e = resilience(&t, &b, &j, mm(f64::NAN), mm(40.0)).unwrap_err();
    assert_eq!(e.field(), "joint.clamp_length");
    let e = resilience(&t, &b, &j, mm(30.0), mm(10.0)).unwrap_err();
    assert_eq!(e.field(), "joint.outer_diameter");
    let mut j = joint(Some(30.0), Some(40.0), JointType::ThroughBolted);
    j.shank_sections = vec![ShankSection {
        length: mm(31.0),
        diameter: mm(12.0),
    }];
    let e = resilience(&t, &b, &j, mm(30.0), mm(40.0)).unwrap_err();
    assert_eq!(e.field(), "joint.shank_sections");
    j.shank_sections = vec![ShankSection {
        length: mm(10.0),
        diameter: mm(-1.0),
    }];
    let e = resilience(&t, &b, &j, mm(30.0), mm(40.0)).unwrap_err();
    assert_eq!(e.field(), "joint.shank_sections[0].diameter");
    j.shank_sections.clear();
    j.clamped_modulus = Some(mpa(0.0));
    assert_eq!(
        resilience(&t, &b, &j, mm(30.0), mm(40.0))
            .unwrap_err()
            .field(),
        "clamped_material"
    );
    assert!("dsv".parse::<JointType>().is_ok());
    assert_eq!(
        "bolted".parse::<JointType>().unwrap_err().field(),
        "joint.type"
    );
}

#[test]
fn angle_not_computed_without_clamp_length_or_outer_diameter() {
    let (t, b) = m12();
    let i = window_input(&t, &b);
    let w = maximum_window(&i).unwrap();
    match angle_window(
        &i,
        &b,
        &joint(None, Some(40.0), JointType::ThroughBolted),
        &w,
    )
    .unwrap()
    {
        AngleOutcome::NotComputed { reason } => assert!(reason.contains("clamp length")),
        other => panic!("{other:?}"),
    }
    match angle_window(
        &i,
        &b,
        &joint(Some(30.0), None, JointType::ThroughBolted),
        &w,
    )
    .unwrap()
    {
        AngleOutcome::NotComputed { reason } => assert!(reason.contains("outer diameter")),
        other => panic!("{other:?}"),
    }
}

#[test]
fn angle_window_brackets_the_preload_window() {
    let (t, b) = m12();
    let i = window_input(&t, &b);
    let w = maximum_window(&i).unwrap();
    let j = joint(Some(30.0), Some(40.0), JointType::ThroughBolted);
    let AngleOutcome::Computed(a) = angle_window(&i, &b, &j, &w).unwrap() else {
        panic!("angle not computed");
    };
    assert_eq!(a.snug_source, SnugSource::DefaultFraction);
    assert!((a.snug_torque.value - DEFAULT_SNUG_FRACTION * w.target.value).abs() < 1e-9);
    let (lo, hi, y) = (
        a.angle_min.get::<degree>(),
        a.angle_max.get::<degree>(),
        a.angle_at_yield.get::<degree>(),
    );
    assert!(0.0 < lo && lo < hi && hi < y, "{lo} {hi} {y}");
    // Back to preload: snug preload plus the elastic advance.
    let per_deg = t.pitch.value / (360.0 * (a.resilience.bolt + a.resilience.clamped_parts));
    let f = a.snug_preload_min.value + lo * per_deg;
    assert!((f / w.preload_min.value - 1.0).abs() < 1e-9);
    // Common practice: the elastic angle from snug on a steel joint with
    // l_K ≈ 2.5·d is a few tens of degrees, not a few degrees or turns.
    assert!(lo > 5.0 && hi < 120.0, "{lo} {hi}");

    // A given snug torque at or above the lower torque is refused.
    let mut j = j.clone();
    j.snug_torque = Some(w.lower);
    assert_eq!(
        angle_window(&i, &b, &j, &w).unwrap_err().field(),
        "joint.snug_torque"
    );
}
