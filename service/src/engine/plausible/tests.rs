use proptest::prelude::*;
use uom::si::f64::{Force, Length, Torque};
use uom::si::force::newton;
use uom::si::length::millimeter;
use uom::si::torque::newton_meter;

use super::*;
use crate::engine::angle::AngleOutcome;
use crate::engine::bearing::explicit_bearing;
use crate::engine::checks::TappedHole;
use crate::engine::spec::{compute, tests::m10_input};

fn mm(v: f64) -> Length {
    Length::new::<millimeter>(v)
}

fn fields(input: &SpecInput) -> Vec<String> {
    problems(input)
        .iter()
        .map(|e| e.field().to_string())
        .collect()
}

#[test]
fn the_demo_joint_is_plausible() {
    assert!(problems(&m10_input()).is_empty());
}

#[test]
fn each_out_of_range_input_is_named() {
    // M10: d = 10 mm, F_y = 640 MPa · 57.99 mm² ≈ 37.1 kN.
    let mut input = m10_input();
    input.bearing = explicit_bearing(mm(3e16), mm(11.0)).unwrap();
    assert_eq!(fields(&input), ["bearing.outer_diameter"]);

    let mut input = m10_input();
    input.bearing = explicit_bearing(mm(16.0), mm(2.0)).unwrap();
    assert_eq!(fields(&input), ["bearing.inner_diameter"]);

    let mut input = m10_input();
    input.joint.as_mut().unwrap().clamp_length = Some(mm(1e6));
    assert_eq!(fields(&input), ["joint.clamp_length"]);

    let mut input = m10_input();
    input.joint.as_mut().unwrap().outer_diameter = Some(mm(1e300));
    assert_eq!(fields(&input), ["joint.outer_diameter"]);

    let mut input = m10_input();
    input.tapped_hole = Some(TappedHole {
        engagement_length: mm(500.0),
        min_engagement_factor: 1.0,
        engagement_given: true,
    });
    assert_eq!(fields(&input), ["joint.engagement_length"]);

    let mut input = m10_input();
    input.prevailing_torque = Some(Torque::new::<newton_meter>(100.0));
    assert_eq!(fields(&input), ["prevailing_torque"]);

    let mut input = m10_input();
    input.required_clamp_load = Some(Force::new::<newton>(1e9));
    assert_eq!(fields(&input), ["required_clamp_load"]);
}

#[test]
fn the_range_is_in_the_reason() {
    let mut input = m10_input();
    input.joint.as_mut().unwrap().clamp_length = Some(mm(1e6));
    let reason = problems(&input)[0].to_string();
    assert!(reason.contains("1.0000 to 500.0000 mm"), "{reason}");
}

#[test]
fn compute_refuses_an_implausible_input() {
    let mut input = m10_input();
    input.joint.as_mut().unwrap().clamp_length = Some(mm(1e308));
    let err = compute(&input).unwrap_err();
    assert_eq!(err.field(), "joint.clamp_length");
}

proptest! {
    /// Inside the ranges every figure of the spec is finite; outside them the
    /// input is refused. No input gives a non-finite number.
    #[test]
    fn every_figure_is_finite_or_the_input_is_refused(
        outer in 1e-3f64..1e12,
        inner_per_d in 0.1f64..10.0,
        clamp in 1e-3f64..1e9,
        da in 1e-3f64..1e9,
        prevailing in 0.0f64..1e6,
    ) {
        let mut input = m10_input();
        let inner = inner_per_d * 10.0;
        if let Ok(b) = explicit_bearing(mm(outer.max(inner * 1.01)), mm(inner)) {
            input.bearing = b;
        }
        let j = input.joint.as_mut().unwrap();
        j.clamp_length = Some(mm(clamp));
        j.outer_diameter = Some(mm(da));
        input.prevailing_torque = Some(Torque::new::<newton_meter>(prevailing));
        if let Ok(spec) = compute(&input) {
            let w = &spec.window;
            for v in [w.lower.value, w.target.value, w.upper.value, w.preload_min.value,
                      w.preload_max.value, spec.surface_pressure.value] {
                prop_assert!(v.is_finite());
            }
            if let AngleOutcome::Computed(a) = &spec.angle {
                for v in [a.angle_min.value, a.angle_max.value, a.angle_at_yield.value] {
                    prop_assert!(v.is_finite());
                }
            }
        }
    }
}
