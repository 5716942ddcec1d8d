//! The joint model end to end: bolt → resilience → load factor → embedding
//! → working state.

use uom::si::f64::{Force, Torque};
use uom::si::force::kilonewton;
use uom::si::length::micrometer;
use uom::si::torque::newton_meter;

use super::bolt::{bolt, in_clamp_length, BoltInput, BoltStandard};
use super::embedding::{embedding, Loading, Surfaces};
use super::load_factor::load_factor;
use super::working::{working_state, Loads, ThreadRolling, WorkingInput};
use crate::engine::angle::{resilience, JointType};
use crate::engine::checks::{Severity, SLIP_SAFETY};
use crate::engine::tightening::fixtures::{bearing, m12_10_9_input, metric, mm, mpa, steel_joint};
use crate::engine::window::maximum_window;

fn kn(v: f64) -> Force {
    Force::new::<kilonewton>(v)
}

/// Issue 12 audit item 3: M12 10.9 with l_K = 15 mm was "met" with a 2.1 kN
/// margin on the clamp load while the embedding loss is about 4.8 kN. The
/// audit's required clamp load is not stated; here it is set 2.1 kN below
/// the window's minimum preload (μ 0.12, ±9 %, the audit's other inputs) and
/// expressed as a transverse load F_Q = F_KQ·μ_T (q_F = 1, μ_T = 0.2), so the
/// slip check carries it. Without embedding S_G is above 1; with it, below.
#[test]
fn embedding_turns_the_audit_margin_into_a_shortfall() {
    let t = metric(12.0, 1.75);
    let b = bearing(16.63, 13.5);
    let w_in = m12_10_9_input(&t, &b);
    let window = maximum_window(&w_in).unwrap();
    let fully_threaded = BoltInput::Standard {
        standard: BoltStandard::Iso4017,
        length: mm(30.0),
    };
    let clamped = in_clamp_length(
        &bolt(&t, &fully_threaded).unwrap(),
        mm(15.0),
        mm(10.0),
        "nut",
    )
    .unwrap();
    let j = steel_joint(15.0, clamped.shank_sections, clamped.socket_head);
    let r = resilience(&t, &b, &j, mm(15.0), mm(30.0)).unwrap();
    let lf = load_factor(r.bolt, r.clamped_parts, None).unwrap();
    let surfaces = Surfaces::of_stack(JointType::ThroughBolted, 2).unwrap();
    let emb = embedding(
        uom::si::f64::Length::new::<micrometer>(16.0),
        Loading::Axial,
        surfaces,
        r.bolt,
        r.clamped_parts,
    )
    .unwrap();
    assert!((emb.preload_loss.get::<kilonewton>() - 4.8).abs() < 0.05);
    let required = window.preload_min.get::<kilonewton>() - 2.1;
    let loads = Loads {
        axial_max: kn(0.0),
        axial_min: kn(0.0),
        transverse: kn(required * 0.2),
        torsion: Torque::new::<newton_meter>(0.0),
        torsion_radius: None,
        interfaces: 1,
        interface_friction: Some(0.2),
        sealing_clamp_load: None,
    };
    let input = |loss: Force| WorkingInput {
        thread: &t,
        yield_strength: mpa(940.0),
        preload_min: window.preload_min,
        preload_max: window.preload_max,
        thread_friction_min: 0.12,
        load_factor: lf.load_factor,
        embedding_loss: loss,
        bearing: &b,
        permissible_surface_pressure: None,
        rolling: ThreadRolling::BeforeHeatTreatment,
        loads: &loads,
    };
    let without = working_state(&input(kn(0.0))).unwrap();
    let with = working_state(&input(emb.preload_loss)).unwrap();
    let sg = |s: &super::working::WorkingState| s.safety.slip.unwrap();
    assert!(sg(&without) > 1.0, "{}", sg(&without));
    assert!(sg(&with) < 1.0, "{}", sg(&with));
    let slip = with.checks.iter().find(|c| c.code == SLIP_SAFETY).unwrap();
    assert_eq!(slip.severity, Severity::Error);
    // Residual = F_M,min − F_Z with no axial load.
    let residual = with.residual_clamp_load_min.value;
    assert!((residual - (window.preload_min.value - emb.preload_loss.value)).abs() < 1e-6);
}
