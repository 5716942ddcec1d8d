use proptest::prelude::*;

use super::*;
use crate::engine::angle::resilience;
use crate::engine::tightening::fixtures::{bearing, metric, mm, mpa, steel_joint};

fn layer(t: f64, e: f64) -> ClampedLayer {
    ClampedLayer {
        thickness: mm(t),
        modulus: mpa(e),
    }
}

/// With one material the layered integral is the single-material closed
/// formula of `angle::resilience` (VDI 2230 Part 1 cone, cone plus sleeve and
/// sleeve, recalled from memory), however the stack is cut.
#[test]
fn one_material_in_any_cut_is_the_closed_formula() {
    let t = metric(12.0, 1.75);
    let b = bearing(16.63, 13.5);
    for kind in [JointType::ThroughBolted, JointType::TappedHole] {
        // D_A 14 (sleeve), 24 (cone and sleeve), 200 mm (full cone).
        for da in [14.0, 24.0, 200.0] {
            let mut j = steel_joint(40.0, Vec::new(), false);
            j.joint_type = kind;
            let closed = resilience(&t, &b, &j, mm(40.0), mm(da))
                .unwrap()
                .clamped_parts;
            for cut in [vec![40.0], vec![10.0, 30.0], vec![5.0; 8]] {
                let layers: Vec<_> = cut.iter().map(|&l| layer(l, 205_000.0)).collect();
                let s = stack(kind, &b, mm(da), &layers).unwrap();
                assert!(
                    (s.clamped_resilience / closed - 1.0).abs() < 1e-9,
                    "{kind:?} D_A {da} {cut:?}: {} vs {closed}",
                    s.clamped_resilience
                );
                assert!((s.equivalent_modulus.value / 205e9 - 1.0).abs() < 1e-9);
                assert!((s.clamp_length.value - 0.040).abs() < 1e-12);
            }
        }
    }
}

/// A softer layer makes the stack more resilient, and the equivalent
/// modulus lies between the layers' moduli. Hand check on the sleeve
/// (D_A ≤ d_W): two 10 mm layers, steel 205 GPa and aluminium 70 GPa, in
/// series: δ = 4/(π(D_A² − d_h²))·(10/205 000 + 10/70 000) mm/N.
#[test]
fn a_soft_layer_adds_its_own_resilience() {
    let b = bearing(16.63, 13.5);
    let s = stack(
        JointType::ThroughBolted,
        &b,
        mm(16.0),
        &[layer(10.0, 205_000.0), layer(10.0, 70_000.0)],
    )
    .unwrap();
    let area_mm2 = PI / 4.0 * (16.0f64.powi(2) - 13.5f64.powi(2));
    let hand_mm_per_n = (10.0 / 205_000.0 + 10.0 / 70_000.0) / area_mm2;
    assert!((s.clamped_resilience * 1e3 / hand_mm_per_n - 1.0).abs() < 1e-9);
    let e = s.equivalent_modulus.value / 1e6;
    assert!(e > 70_000.0 && e < 205_000.0, "{e}");
}

/// Through-bolted, the body is symmetric: the stack turned over has the same δ_P.
#[test]
fn a_through_bolted_stack_turned_over_is_as_resilient() {
    let b = bearing(16.63, 13.5);
    let a = [
        layer(3.0, 205_000.0),
        layer(12.0, 70_000.0),
        layer(25.0, 110_000.0),
    ];
    let mut r = a;
    r.reverse();
    let one = stack(JointType::ThroughBolted, &b, mm(40.0), &a).unwrap();
    let two = stack(JointType::ThroughBolted, &b, mm(40.0), &r).unwrap();
    assert!((one.clamped_resilience / two.clamped_resilience - 1.0).abs() < 1e-9);
}

#[test]
fn bad_stacks_name_the_layer() {
    let b = bearing(16.63, 13.5);
    let f = |layers: &[ClampedLayer], da: f64| {
        stack(JointType::ThroughBolted, &b, mm(da), layers)
            .unwrap_err()
            .field()
            .to_string()
    };
    assert_eq!(f(&[], 30.0), "clamped_parts");
    assert_eq!(f(&[layer(10.0, 205_000.0); 17], 30.0), "clamped_parts");
    assert_eq!(
        f(&[layer(10.0, 205_000.0), layer(0.01, 205_000.0)], 30.0),
        "clamped_parts[1].thickness"
    );
    assert_eq!(
        f(&[layer(f64::NAN, 205_000.0)], 30.0),
        "clamped_parts[0].thickness"
    );
    assert_eq!(f(&[layer(10.0, -1.0)], 30.0), "clamped_parts[0].material");
    assert_eq!(f(&[layer(10.0, 205_000.0)], 12.0), "joint_outer_diameter");
}

proptest! {
    /// Any stack is a finite positive δ_P or a refusal naming a field, never a panic.
    #[test]
    fn any_stack_is_an_answer_or_a_named_refusal(
        layers in proptest::collection::vec((-1.0f64..3000.0, -1.0f64..400_000.0), 0..20),
        da in -5.0f64..500.0,
        tapped in any::<bool>(),
    ) {
        let b = bearing(16.63, 13.5);
        let kind = if tapped { JointType::TappedHole } else { JointType::ThroughBolted };
        let layers: Vec<_> = layers.into_iter().map(|(t, e)| layer(t, e)).collect();
        match stack(kind, &b, mm(da), &layers) {
            Ok(s) => {
                prop_assert!(s.clamped_resilience.is_finite() && s.clamped_resilience > 0.0);
                prop_assert!(s.equivalent_modulus.value.is_finite());
            }
            Err(e) => prop_assert!(!e.field().is_empty()),
        }
    }
}
