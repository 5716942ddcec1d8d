use proptest::prelude::*;
use uom::si::f64::{Force, Torque};
use uom::si::force::{kilonewton, newton};
use uom::si::pressure::megapascal;
use uom::si::torque::newton_meter;

use super::*;
use crate::engine::checks::Severity;
use crate::engine::tightening::fixtures::{bearing, metric, mm, mpa};

fn kn(v: f64) -> Force {
    Force::new::<kilonewton>(v)
}

fn loads(fa: f64) -> Loads {
    Loads {
        axial_max: kn(fa),
        axial_min: kn(0.0),
        transverse: kn(0.0),
        torsion: Torque::new::<newton_meter>(0.0),
        torsion_radius: None,
        interfaces: 1,
        interface_friction: None,
        sealing_clamp_load: None,
    }
}

struct Case {
    thread: ThreadGeometry,
    bearing: BearingSurface,
}

fn m30() -> Case {
    Case {
        thread: metric(30.0, 3.5),
        bearing: bearing(42.75, 33.0),
    }
}

fn input<'a>(c: &'a Case, l: &'a Loads, phi: f64, fm: (f64, f64)) -> WorkingInput<'a> {
    WorkingInput {
        thread: &c.thread,
        yield_strength: mpa(640.0),
        preload_min: kn(fm.0),
        preload_max: kn(fm.1),
        thread_friction_min: 0.12,
        load_factor: phi,
        embedding_loss: kn(0.0),
        bearing: &c.bearing,
        permissible_surface_pressure: None,
        rolling: ThreadRolling::BeforeHeatTreatment,
        loads: l,
    }
}

fn codes(w: &WorkingState) -> Vec<(&'static str, Severity)> {
    w.checks.iter().map(|c| (c.code, c.severity)).collect()
}

/// Budynas & Nisbett, Shigley's Mechanical Engineering Design, solutions
/// manual, chapter 8 fatigue problem: M30 8.8, A_t = 561 mm², preload
/// F_i = 252.45 kN, joint constant C = 0.33, external load 0 → 80 kN:
/// σ_a = C·P/(2·A_t) = 23.53 MPa and separation factor
/// n_0 = F_i/((1 − C)·P) = 4.71.
#[test]
fn alternating_stress_and_separation_match_the_published_problem() {
    let c = m30();
    let l = loads(80.0);
    let w = working_state(&input(&c, &l, 0.33, (252.45, 252.45))).unwrap();
    let sa = w.alternating_stress.get::<megapascal>();
    assert!((sa / 23.53 - 1.0).abs() < 0.002, "{sa}");
    let separation = 252.45e3 / (252.45e3 - w.residual_clamp_load_min.get::<newton>());
    assert!((separation - 4.71).abs() < 0.01, "{separation}");
    assert!((w.additional_bolt_load.get::<kilonewton>() - 26.4).abs() < 1e-9);
}

/// σ_ASV = 0.85·(150/d + 45) N/mm² (VDI 2230 Part 1:2003 §5.5.4, recalled
/// from memory): M12 48.9, M30 42.5; rolled after heat treatment lies between
/// σ_ASV and 2·σ_ASV and falls as the mean load rises.
#[test]
fn fatigue_limits() {
    let m12 = metric(12.0, 1.75);
    let v = fatigue_limit_rolled_before(&m12).get::<megapascal>();
    assert!((v - 48.875).abs() < 1e-9, "{v}");
    let v = fatigue_limit_rolled_before(&metric(30.0, 3.5)).get::<megapascal>();
    assert!((v - 42.5).abs() < 1e-9, "{v}");
    let f02 = m12.stress_area.value * 940e6;
    let lo = fatigue_limit_rolled_after(&m12, Force::new::<newton>(0.8 * f02), mpa(940.0));
    let hi = fatigue_limit_rolled_after(&m12, Force::new::<newton>(0.5 * f02), mpa(940.0));
    let sasv = fatigue_limit_rolled_before(&m12);
    assert!((lo.value / sasv.value - 1.2).abs() < 1e-12);
    assert!(hi > lo && hi.value <= 2.0 * sasv.value);
}

#[test]
fn slip_and_sealing_clamp_loads() {
    let c = m30();
    let mut l = loads(0.0);
    l.transverse = kn(10.0);
    l.interface_friction = Some(0.2);
    // F_KQ = F_Q/(q_F·μ_T) = 10/(1·0.2) = 50 kN.
    let w = working_state(&input(&c, &l, 0.2, (100.0, 150.0))).unwrap();
    assert!((w.slip_clamp_load.get::<kilonewton>() - 50.0).abs() < 1e-9);
    assert!((w.safety.slip.unwrap() - 2.0).abs() < 1e-12);
    // Torsion 100 N·m at r_a = 20 mm adds 100/(0.02·0.2) = 25 kN.
    l.torsion = Torque::new::<newton_meter>(100.0);
    l.torsion_radius = Some(mm(20.0));
    let w = working_state(&input(&c, &l, 0.2, (100.0, 150.0))).unwrap();
    assert!((w.slip_clamp_load.get::<kilonewton>() - 75.0).abs() < 1e-9);
    // Two interfaces halve it; below 1.2 is an error.
    l.interfaces = 2;
    let w = working_state(&input(&c, &l, 0.2, (30.0, 45.0))).unwrap();
    assert!((w.slip_clamp_load.get::<kilonewton>() - 37.5).abs() < 1e-9);
    assert!(codes(&w).contains(&(SLIP_SAFETY, Severity::Error)));
    l.sealing_clamp_load = Some(kn(40.0));
    let w = working_state(&input(&c, &l, 0.2, (30.0, 45.0))).unwrap();
    assert!(codes(&w).contains(&(SEALING_CLAMP_LOAD, Severity::Error)));
}

#[test]
fn joint_opening_yield_and_surface_pressure_are_flagged() {
    let c = m30();
    let l = loads(500.0);
    let mut i = input(&c, &l, 0.3, (200.0, 300.0));
    i.permissible_surface_pressure = Some(mpa(260.0));
    let w = working_state(&i).unwrap();
    // 200 − 0.7·500 = −150 kN: the joint opens.
    assert!((w.residual_clamp_load_min.get::<kilonewton>() + 150.0).abs() < 1e-9);
    let c = codes(&w);
    assert!(c.contains(&(RESIDUAL_CLAMP_LOAD, Severity::Error)), "{c:?}");
    // σ_z = (300 + 150) kN / 560.6 mm² = 803 N/mm² > 640: yield safety below 1.
    assert!(
        c.contains(&(WORKING_YIELD_SAFETY, Severity::Error)),
        "{c:?}"
    );
    assert!(
        c.contains(&(WORKING_SURFACE_PRESSURE, Severity::Error)),
        "{c:?}"
    );
    // A modest load on the same joint passes every check.
    let c2 = m30();
    let l = loads(20.0);
    let w = working_state(&input(&c2, &l, 0.2, (200.0, 250.0))).unwrap();
    assert!(
        w.checks.iter().all(|c| c.severity == Severity::Info),
        "{w:?}"
    );
    assert!(w.safety.yield_ > 1.0 && w.safety.fatigue.unwrap() > 1.2);
}

#[test]
fn bad_loads_name_their_field() {
    let c = m30();
    let field = |l: &Loads| {
        working_state(&input(&c, l, 0.2, (100.0, 150.0)))
            .unwrap_err()
            .field()
            .to_string()
    };
    let mut l = loads(-1.0);
    assert_eq!(field(&l), "loads.axial");
    l = loads(f64::NAN);
    assert_eq!(field(&l), "loads.axial");
    l = loads(2e6);
    assert_eq!(field(&l), "loads.axial");
    l = loads(10.0);
    l.axial_min = kn(20.0);
    assert_eq!(field(&l), "loads.axial_min");
    l = loads(10.0);
    l.transverse = kn(5.0);
    assert_eq!(field(&l), "loads.interface_friction");
    l.interface_friction = Some(1.5);
    assert_eq!(field(&l), "loads.interface_friction");
    l.interface_friction = Some(0.2);
    l.interfaces = 0;
    assert_eq!(field(&l), "loads.interfaces");
    l.interfaces = 1;
    l.torsion = Torque::new::<newton_meter>(10.0);
    assert_eq!(field(&l), "loads.torsion_radius");
    let l = loads(10.0);
    let e = working_state(&input(&c, &l, 1.0, (100.0, 150.0))).unwrap_err();
    assert_eq!(e.field(), "load_factor");
    let e = working_state(&input(&c, &l, 0.2, (150.0, 100.0))).unwrap_err();
    assert_eq!(e.field(), "preload.min");
    let mut i = input(&c, &l, 0.2, (100.0, 150.0));
    i.thread_friction_min = f64::NAN;
    assert_eq!(
        working_state(&i).unwrap_err().field(),
        "thread_friction.min"
    );
}

#[test]
fn every_code_is_listed_in_the_checks_codes() {
    for code in WORKING_CODES {
        assert!(crate::engine::checks::CODES.contains(&code), "{code}");
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 256, failure_persistence: None, ..ProptestConfig::default() })]

    /// No panic, every figure finite, and the residual clamp load falls as
    /// the axial load rises.
    #[test]
    fn working_state_is_finite_and_residual_falls_with_axial_load(
        d in 3.0f64..64.0,
        phi in 0.001f64..0.999,
        fm in 0.1f64..2000.0,
        spread in 1.0f64..2.0,
        fa in 0.0f64..5.0e4,
        step in 0.001f64..1.0e4,
        fq in 0.0f64..1.0e4,
        mu in 0.02f64..1.0,
        q in 1u32..32,
        after in any::<bool>(),
    ) {
        let c = Case { thread: metric(d, d / 8.0), bearing: bearing(1.6 * d, 1.1 * d) };
        let mut l = loads(fa);
        l.transverse = kn(fq);
        l.interface_friction = Some(mu);
        l.interfaces = q;
        l.sealing_clamp_load = Some(kn(fm / 2.0));
        let mut i = input(&c, &l, phi, (fm, fm * spread));
        i.permissible_surface_pressure = Some(mpa(500.0));
        i.rolling = if after { ThreadRolling::AfterHeatTreatment } else { ThreadRolling::BeforeHeatTreatment };
        let w = working_state(&i).unwrap();
        let s = w.safety;
        for v in [
            w.additional_bolt_load.value, w.residual_clamp_load_min.value, w.slip_clamp_load.value,
            w.max_bolt_load.value, w.working_stress.value, w.alternating_stress.value,
            w.fatigue_limit.value, s.yield_, s.fatigue.unwrap_or(0.0), s.slip.unwrap_or(0.0),
            s.surface_pressure.unwrap_or(0.0),
        ] {
            prop_assert!(v.is_finite(), "{w:?}");
        }
        let mut more = l;
        more.axial_max = kn(fa + step);
        let w2 = working_state(&WorkingInput { loads: &more, ..i }).unwrap();
        prop_assert!(w2.residual_clamp_load_min < w.residual_clamp_load_min);
    }

    /// Any numbers at all: an answer or a refusal naming a field, never a panic.
    #[test]
    fn any_input_is_answered_or_refused(
        fa in any::<f64>(), fa_min in any::<f64>(), fq in any::<f64>(), my in any::<f64>(),
        ra in any::<f64>(), mu in any::<f64>(), q in any::<u32>(), phi in any::<f64>(),
    ) {
        let c = m30();
        let l = Loads {
            axial_max: Force::new::<newton>(fa),
            axial_min: Force::new::<newton>(fa_min),
            transverse: Force::new::<newton>(fq),
            torsion: Torque::new::<newton_meter>(my),
            torsion_radius: Some(mm(ra)),
            interfaces: q,
            interface_friction: Some(mu),
            sealing_clamp_load: None,
        };
        match working_state(&input(&c, &l, phi, (100.0, 150.0))) {
            Ok(w) => prop_assert!(w.working_stress.value.is_finite()
                && w.residual_clamp_load_min.value.is_finite()
                && w.safety.slip.is_none_or(f64::is_finite)),
            Err(e) => prop_assert!(!e.field().is_empty()),
        }
    }
}
