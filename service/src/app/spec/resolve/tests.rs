use super::*;
use crate::app::quantity::Quantity;
use crate::app::spec::request::{BearingInput, BoltRequest, FrictionInput, ShankSectionInput};
use crate::app::ProblemClass;
use crate::engine::angle::JointType;

fn base() -> SpecRequest {
    SpecRequest {
        thread: "M10".into(),
        property_class: "8.8".into(),
        thread_friction: Some(FrictionInput::Single(0.12)),
        bearing_friction: Some(FrictionInput::Single(0.12)),
        ..SpecRequest::default()
    }
}

fn mm(value: f64) -> Quantity {
    Quantity {
        value,
        unit: "mm".into(),
    }
}

fn fields(e: &AppError) -> Vec<&str> {
    e.problems().iter().map(|p| p.field.as_str()).collect()
}

#[test]
fn resolves_names_into_engine_types() {
    let snap = Snapshot::seed();
    let r = resolve(&base(), &snap).unwrap();
    assert_eq!(r.input.thread.designation, "M10");
    assert_eq!(r.input.strength.id, "8.8");
    assert_eq!(r.input.method, DEFAULT_METHOD);
    assert_eq!(r.input.scatter, None);
    assert_eq!(r.input.thread_friction.min(), 0.12);
    assert!(r.input.friction_source.contains("given in the request"));
    assert!(r.input.joint.is_none());
    assert_eq!(r.revision, snap.revision);
    assert!(!r.pinned);
    assert_eq!(r.content_hash.len(), 64);
}

#[test]
fn hash_uses_the_normal_spelling() {
    let snap = Snapshot::seed();
    let a = resolve(&base(), &snap).unwrap();
    let mut spelled = base();
    spelled.thread = "m10".into();
    spelled.hole = Some("medium".into());
    spelled.head = Some("hexagon-head".into());
    let b = resolve(&spelled, &snap).unwrap();
    assert_eq!(a.content_hash, b.content_hash);
    let mut other = base();
    other.tool_scatter = Some(0.0);
    assert_ne!(a.content_hash, resolve(&other, &snap).unwrap().content_hash);
    let mut later = snap.clone();
    later.revision += 1;
    assert_ne!(
        a.content_hash,
        resolve(&base(), &later).unwrap().content_hash
    );
}

#[test]
fn every_problem_is_listed() {
    let snap = Snapshot::seed();
    let mut r = base();
    r.thread = "Q10".into();
    r.property_class = "8.9x".into();
    r.head = Some("round-head".into());
    r.tightening_method = Some("spanner".into());
    r.window_mode = Some("best".into());
    let e = resolve(&r, &snap).unwrap_err();
    assert_eq!(
        fields(&e),
        [
            "thread",
            "property_class",
            "head",
            "tightening_method",
            "window_mode"
        ]
    );
    assert_eq!(
        AppError::class(e.problems()),
        ProblemClass::Malformed,
        "{e:?}"
    );
    assert_eq!(e.problems()[3].suggestions.len(), 3, "{e:?}");
}

#[test]
fn unknown_names_are_404_class_with_suggestions() {
    let snap = Snapshot::seed();
    let mut r = base();
    r.tightening_method = Some("click-wrnch".into());
    let e = resolve(&r, &snap).unwrap_err();
    assert_eq!(AppError::class(e.problems()), ProblemClass::Unknown);
    assert_eq!(fields(&e), ["tightening_method"]);
    assert_eq!(
        e.problems()[0].suggestions.first().map(String::as_str),
        Some("click-wrench")
    );
}

#[test]
fn joint_inputs_become_the_engine_joint() {
    let snap = Snapshot::seed();
    let mut r = base();
    r.clamp_length = Some(mm(40.0));
    r.joint_type = Some("tapped-hole".into());
    let got = resolve(&r, &snap).unwrap();
    let joint = got.input.joint.unwrap();
    assert_eq!(joint.joint_type, JointType::TappedHole);
    assert!((joint.clamp_length.unwrap().get::<millimeter>() - 40.0).abs() < 1e-12);
}

#[test]
fn engagement_needs_a_material() {
    let snap = Snapshot::seed();
    let mut r = base();
    r.engagement_length = Some(mm(12.0));
    let e = resolve(&r, &snap).unwrap_err();
    assert_eq!(fields(&e), ["clamped_material"]);
    assert_eq!(AppError::class(e.problems()), ProblemClass::Invalid);
}

#[test]
fn explicit_bearing_replaces_tables() {
    let snap = Snapshot::seed();
    let mut r = base();
    r.bearing = Some(BearingInput {
        outer_diameter: mm(16.0),
        inner_diameter: mm(11.0),
    });
    let got = resolve(&r, &snap).unwrap();
    assert!((got.input.bearing.mean_diameter().get::<millimeter>() - 13.5).abs() < 1e-12);
    r.bearing = Some(BearingInput {
        outer_diameter: mm(10.0),
        inner_diameter: mm(11.0),
    });
    let e = resolve(&r, &snap).unwrap_err();
    assert!(fields(&e)[0].starts_with("bearing."), "{e:?}");
}

mod no_panic {
    use super::*;
    use crate::engine::spec::compute;
    use proptest::prelude::*;

    fn text() -> impl Strategy<Value = String> {
        prop_oneof![
            Just("M10".to_string()),
            Just("1/2-13 UNC".to_string()),
            Just("8.8".to_string()),
            Just("zinc-electroplated".to_string()),
            Just("none".to_string()),
            "\\PC{0,12}",
        ]
    }

    fn number() -> impl Strategy<Value = f64> {
        prop_oneof![
            Just(f64::NAN),
            Just(f64::INFINITY),
            Just(-0.0),
            Just(0.12),
            -1e6f64..1e6,
            0.0f64..1.0,
        ]
    }

    fn quantity() -> impl Strategy<Value = Option<Quantity>> {
        proptest::option::of(
            (
                number(),
                prop_oneof![Just("mm"), Just("N·m"), Just("kN"), Just("x")],
            )
                .prop_map(|(value, unit)| Quantity {
                    value,
                    unit: unit.to_string().into(),
                }),
        )
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(400))]
        /// Whatever a client sends, reading and computing it gives a spec or
        /// typed problems, never a panic.
        #[test]
        fn arbitrary_requests_never_panic(
            thread in text(),
            grade in text(),
            finish in proptest::option::of(text()),
            lubricant in proptest::option::of(text()),
            th in proptest::option::of((number(), number())),
            b in proptest::option::of(number()),
            scatter in proptest::option::of(number()),
            nu in proptest::option::of(number()),
            clamp in quantity(),
            snug in quantity(),
            load in quantity(),
            method in proptest::option::of(prop_oneof![Just("torque-angle".to_string()), text()]),
        ) {
            let req = SpecRequest {
                thread,
                property_class: grade,
                finish,
                lubricant,
                thread_friction: th.map(|(min, max)| FrictionInput::Range { min, max }),
                bearing_friction: b.map(FrictionInput::Single),
                tool_scatter: scatter,
                utilisation: nu,
                clamp_length: clamp,
                joint_outer_diameter: Some(mm(30.0)),
                snug_torque: snug,
                required_clamp_load: load,
                tightening_method: method,
                ..SpecRequest::default()
            };
            let snap = Snapshot::seed();
            match resolve(&req, &snap) {
                Ok(r) => { let _ = compute(&r.input); }
                Err(e) => prop_assert!(!e.problems().is_empty()),
            }
        }
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(300))]
        /// Any bolt with the audit's joint: a spec, or problems each naming a
        /// `bolt` field or the clamp length; never a panic.
        #[test]
        fn arbitrary_bolts_never_panic(
            standard in proptest::option::of(prop_oneof![
                Just("iso-4014".to_string()), Just("iso-4762".to_string()), text()
            ]),
            length in quantity(),
            thread_length in quantity(),
            sections in proptest::option::of(proptest::collection::vec((quantity(), quantity()), 0..10)),
            clamp in quantity(),
        ) {
            let shank_sections = sections.map(|v| {
                v.into_iter()
                    .filter_map(|(l, d)| Some(ShankSectionInput { length: l?, diameter: d? }))
                    .collect()
            });
            let req = SpecRequest {
                thread: "M12".into(),
                property_class: "10.9".into(),
                thread_friction: Some(FrictionInput::Single(0.12)),
                bearing_friction: Some(FrictionInput::Single(0.12)),
                clamp_length: clamp,
                clamped_material: Some("steel".into()),
                joint_outer_diameter: Some(mm(30.0)),
                bolt: Some(BoltRequest { standard, length, thread_length, shank_sections }),
                ..SpecRequest::default()
            };
            match resolve(&req, &Snapshot::seed()) {
                Ok(r) => { let _ = compute(&r.input); }
                Err(e) => {
                    prop_assert!(!e.problems().is_empty());
                    for p in e.problems() {
                        prop_assert!(p.field.starts_with("bolt") || p.field.starts_with("clamp_length"), "{p:?}");
                    }
                }
            }
        }
    }
}

/// Every joint-model input is part of the spec's identity; a request
/// without any keeps the hash it had before they existed.
#[test]
fn the_hash_covers_every_joint_model_input() {
    use crate::app::spec::request::{ClampedPartInput, LoadsInput};
    let snap = Snapshot::seed();
    fn kn(value: f64) -> Quantity {
        Quantity {
            value,
            unit: "kN".into(),
        }
    }
    let joint = SpecRequest {
        joint_outer_diameter: Some(mm(30.0)),
        clamped_parts: Some(vec![ClampedPartInput {
            thickness: mm(15.0),
            material: "steel-s355".into(),
        }]),
        ..base()
    };
    let hash = |r: &SpecRequest| resolve(r, &snap).unwrap().content_hash;
    let h0 = hash(&joint);
    let changes: [fn(&mut SpecRequest); 6] = [
        |r| {
            r.clamped_parts = Some(vec![ClampedPartInput {
                thickness: mm(15.0),
                material: "aluminium-6082".into(),
            }])
        },
        |r| {
            r.roughness_rz = Some(Quantity {
                value: 16.0,
                unit: "µm".into(),
            })
        },
        |r| r.load_introduction = Some(0.5),
        |r| r.thread_rolling = Some("rolled-after-heat-treatment".into()),
        |r| {
            r.loads = Some(LoadsInput {
                axial: Some(kn(5.0)),
                ..LoadsInput::default()
            })
        },
        |r| {
            r.loads = Some(LoadsInput {
                sealing_clamp_load: Some(kn(5.0)),
                ..LoadsInput::default()
            })
        },
    ];
    let mut seen = vec![h0.clone()];
    for change in changes {
        let mut r = joint.clone();
        change(&mut r);
        let h = hash(&r);
        assert!(!seen.contains(&h), "{r:?}");
        seen.push(h);
    }
    // The stack's clamp length reaches the engine's joint.
    let r = resolve(&joint, &snap).unwrap();
    let lk = r.input.joint.as_ref().and_then(|j| j.clamp_length).unwrap();
    assert!((lk.value - 0.015).abs() < 1e-12);
    assert_eq!(r.input.joint_model.layers.len(), 1);
}
