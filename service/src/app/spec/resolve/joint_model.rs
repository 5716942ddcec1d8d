//! The joint model's request fields read into the engine's
//! [`JointModelInput`]: the clamped stack (each layer's material from the
//! material table), roughness, load introduction, thread rolling and the
//! operating loads, every problem named by its request field. The stack and
//! the one-plate shorthand (`clamp_length`, `clamped_material`) are one or
//! the other.

use serde::Serialize;
use uom::si::f64::{Force, Length, Torque};
use uom::si::force::newton;
use uom::si::length::{micrometer, millimeter};
use uom::si::torque::newton_meter;

use crate::app::quantity::Quantity;
use crate::app::FieldProblem;
use crate::engine::joint::model::JointModelInput;
use crate::engine::joint::stack::{ClampedLayer, MAX_LAYERS, MAX_LAYER_M, MIN_LAYER_M};
use crate::engine::joint::working::{Loads, ThreadRolling, MAX_INTERFACES};
use crate::engine::material::{find_material, ClampedMaterial};

use super::super::request::{LoadsInput, SpecRequest};
use super::parts::{engine, keep, Problems};

/// The joint model as read, with the stack's materials.
#[derive(Debug, Clone, Default)]
pub(super) struct JointModelRead {
    pub input: JointModelInput,
    /// The materials of the stack's layers, from under the head.
    pub materials: Vec<ClampedMaterial>,
}

impl JointModelRead {
    /// l_K of the stack, when one is given.
    pub fn clamp_length(&self) -> Option<Length> {
        let layers = &self.input.layers;
        (!layers.is_empty()).then(|| layers.iter().map(|l| l.thickness).sum())
    }
}

pub(super) const ROLLING_IDS: [&str; 2] = [
    "rolled-before-heat-treatment",
    "rolled-after-heat-treatment",
];

fn rolling(text: &str) -> Result<ThreadRolling, FieldProblem> {
    match text.trim() {
        "rolled-before-heat-treatment" => Ok(ThreadRolling::BeforeHeatTreatment),
        "rolled-after-heat-treatment" => Ok(ThreadRolling::AfterHeatTreatment),
        other => Err(FieldProblem::unknown(
            "thread_rolling",
            format!(
                "unknown thread rolling '{}'",
                other.chars().take(60).collect::<String>()
            ),
        )
        .with_suggestions(ROLLING_IDS.iter().map(|s| s.to_string()).collect())),
    }
}

pub(super) fn rolling_id(r: ThreadRolling) -> &'static str {
    match r {
        ThreadRolling::BeforeHeatTreatment => ROLLING_IDS[0],
        ThreadRolling::AfterHeatTreatment => ROLLING_IDS[1],
    }
}

/// Reads the joint model's fields of `req`.
pub(super) fn read(req: &SpecRequest, p: &mut Problems) -> JointModelRead {
    let mut out = JointModelRead::default();
    if let Some(parts) = &req.clamped_parts {
        for (field, given) in [
            ("clamp_length", req.clamp_length.is_some()),
            ("clamped_material", req.clamped_material.is_some()),
        ] {
            if given {
                let both = "give the clamped parts either as clamped_parts (a stack) or as \
                            clamp_length and clamped_material (one plate), not both";
                p.push(FieldProblem::invalid("clamped_parts", both));
                p.push(FieldProblem::invalid(field, both));
            }
        }
        if parts.is_empty() || parts.len() > MAX_LAYERS {
            p.push(FieldProblem::invalid(
                "clamped_parts",
                format!(
                    "between 1 and {MAX_LAYERS} layers are accepted, got {}",
                    parts.len()
                ),
            ));
        } else {
            for (i, part) in parts.iter().enumerate() {
                let field = format!("clamped_parts[{i}].thickness");
                let t = keep(part.thickness.to_length(&field), p).filter(|t| {
                    let ok = (MIN_LAYER_M..=MAX_LAYER_M).contains(&t.value);
                    if !ok {
                        p.push(FieldProblem::invalid(
                            field.as_str(),
                            format!(
                                "a layer's thickness must lie between 0.1 mm and 2000 mm, got \
                                 {:.3} mm",
                                t.get::<millimeter>()
                            ),
                        ));
                    }
                    ok
                });
                let m = engine(find_material(&part.material), p);
                if m.is_none() {
                    if let Some(last) = p.last_mut() {
                        last.field = format!("clamped_parts[{i}].material");
                    }
                }
                if let (Some(thickness), Some(m)) = (t, m) {
                    out.input.layers.push(ClampedLayer {
                        thickness,
                        modulus: m.elastic_modulus,
                    });
                    out.materials.push(m);
                }
            }
        }
    }
    out.input.roughness_rz = req
        .roughness_rz
        .as_ref()
        .and_then(|q| keep(q.to_length("roughness_rz"), p));
    if let Some(n) = req.load_introduction {
        if !(n.is_finite() && n > 0.0 && n <= 1.0) {
            p.push(FieldProblem::invalid(
                "load_introduction",
                format!("n must be greater than 0 and at most 1, got {n}"),
            ));
        }
        out.input.load_introduction = Some(n);
    }
    out.input.rolling = req
        .thread_rolling
        .as_deref()
        .and_then(|r| keep(rolling(r), p));
    out.input.loads = req.loads.as_ref().and_then(|l| loads(l, p));
    out
}

fn force(q: &Option<Quantity>, field: &str, p: &mut Problems) -> Option<Force> {
    match q {
        Some(q) => keep(q.to_force(field), p),
        None => Some(Force::new::<newton>(0.0)),
    }
}

fn loads(l: &LoadsInput, p: &mut Problems) -> Option<Loads> {
    let axial_max = force(&l.axial, "loads.axial", p);
    let axial_min = force(&l.axial_min, "loads.axial_min", p);
    let transverse = force(&l.transverse, "loads.transverse", p);
    let torsion = match &l.torsion {
        Some(q) => keep(q.to_torque("loads.torsion"), p),
        None => Some(Torque::new::<newton_meter>(0.0)),
    };
    let torsion_radius = l
        .torsion_radius
        .as_ref()
        .and_then(|q| keep(q.to_length("loads.torsion_radius"), p));
    let interfaces = match l.interfaces {
        None => 1,
        Some(n) if (1..=i64::from(MAX_INTERFACES)).contains(&n) => n as u32,
        Some(n) => {
            p.push(FieldProblem::invalid(
                "loads.interfaces",
                format!("between 1 and {MAX_INTERFACES} interfaces, got {n}"),
            ));
            1
        }
    };
    if let Some(mu) = l.interface_friction {
        if !(mu.is_finite() && (0.02..=1.0).contains(&mu)) {
            p.push(FieldProblem::invalid(
                "loads.interface_friction",
                format!("interface friction must lie between 0.02 and 1, got {mu}"),
            ));
        }
    }
    let sealing = match &l.sealing_clamp_load {
        Some(q) => Some(keep(q.to_force("loads.sealing_clamp_load"), p)?),
        None => None,
    };
    Some(Loads {
        axial_max: axial_max?,
        axial_min: axial_min?,
        transverse: transverse?,
        torsion: torsion?,
        torsion_radius,
        interfaces,
        interface_friction: l.interface_friction,
        sealing_clamp_load: sealing,
    })
}

/// The joint model's part of the spec's identity, in SI numbers. Absent
/// when none of its fields was given, so older hashes stay as they were.
#[derive(Serialize)]
pub(super) struct NormalisedJointModel {
    pub clamped_parts: Vec<(f64, String)>,
    pub roughness_rz_um: Option<f64>,
    pub load_introduction: Option<f64>,
    pub thread_rolling: Option<&'static str>,
    /// F_A,max, F_A,min, F_Q (N), M_Y (N·m), r_a (mm), q_F, μ_T, F_KP (N).
    pub loads: Option<[Option<f64>; 8]>,
}

impl NormalisedJointModel {
    pub fn of(r: &JointModelRead) -> Option<Self> {
        let i = &r.input;
        i.asked().then(|| Self {
            clamped_parts: i
                .layers
                .iter()
                .zip(&r.materials)
                .map(|(l, m)| (l.thickness.get::<millimeter>(), m.id.clone()))
                .collect(),
            roughness_rz_um: i.roughness_rz.map(|l| l.get::<micrometer>()),
            load_introduction: i.load_introduction,
            thread_rolling: i.rolling.map(rolling_id),
            loads: i.loads.map(|l| {
                [
                    Some(l.axial_max.get::<newton>()),
                    Some(l.axial_min.get::<newton>()),
                    Some(l.transverse.get::<newton>()),
                    Some(l.torsion.get::<newton_meter>()),
                    l.torsion_radius.map(|r| r.get::<millimeter>()),
                    Some(f64::from(l.interfaces)),
                    l.interface_friction,
                    l.sealing_clamp_load.map(|f| f.get::<newton>()),
                ]
            }),
        })
    }
}
