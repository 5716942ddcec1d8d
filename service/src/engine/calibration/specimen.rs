//! Evaluation of one specimen (ISO 16047 relations, formula form recalled
//! from memory, ISO 16047:2005 §8).

use std::f64::consts::PI;

use uom::si::f64::Angle;

use super::{JointGeometry, Measurement, SpecimenForm, SpecimenResult};
use crate::engine::EngineError;

/// Validate one measurement and compute its coefficients. Problems are
/// pushed to `errors` (each naming `specimens[index].<field>`) and `None`
/// is returned.
pub(super) fn evaluate(
    joint: &JointGeometry,
    m: &Measurement,
    angle: Option<Angle>,
    from_curve: bool,
    index: usize,
    errors: &mut Vec<EngineError>,
) -> Option<SpecimenResult> {
    let field = |name: &str| {
        if from_curve {
            format!("specimens[{index}].curve")
        } else {
            format!("specimens[{index}].{name}")
        }
    };
    let context = if from_curve {
        "at the evaluation clamp force, "
    } else {
        ""
    };
    let before = errors.len();
    let f = m.clamp_force.value;
    let t = m.total_torque.value;
    if !f.is_finite() || f <= 0.0 {
        errors.push(EngineError::invalid(
            field("clamp_force"),
            format!("{context}clamp force must be a finite value above zero"),
        ));
    }
    if !t.is_finite() || t <= 0.0 {
        errors.push(EngineError::invalid(
            field("total_torque"),
            format!("{context}total torque must be a finite value above zero"),
        ));
    }
    let t_th = m.thread_torque.map(|x| x.value);
    if let Some(th) = t_th {
        if !th.is_finite() || th <= 0.0 {
            errors.push(EngineError::invalid(
                field("thread_torque"),
                format!("{context}thread torque must be a finite value above zero"),
            ));
        } else if t.is_finite() && t > 0.0 && th > t {
            errors.push(EngineError::invalid(
                field("thread_torque"),
                format!(
                    "{context}thread torque ({th:.4} N·m) is above the total torque ({t:.4} N·m); \
                     the thread torque is part of the total"
                ),
            ));
        }
    }
    if errors.len() > before {
        return None;
    }

    let pitch_share = joint.pitch.value / (2.0 * PI);
    let thread_lever = joint.flank_factor() * joint.pitch_diameter.value;
    let bearing_lever = joint.bearing_mean_diameter.map(|db| db.value / 2.0);
    // With a thrust bearing the measured torque is thread torque unless a
    // separate thread-torque reading is given.
    let (form, thread_torque) = match (joint.thrust_bearing, t_th) {
        (true, th) => (SpecimenForm::ThrustBearing, Some(th.unwrap_or(t))),
        (false, Some(th)) => (SpecimenForm::Full, Some(th)),
        (false, None) => (SpecimenForm::Shop, None),
    };

    let thread_friction = thread_torque.map(|th| (th / f - pitch_share) / thread_lever);
    let bearing_friction = match (form, thread_torque, bearing_lever) {
        (SpecimenForm::Full, Some(th), Some(lever)) => Some((t - th) / (f * lever)),
        _ => None,
    };
    // Total friction only where bearing friction is part of the record.
    let total_friction = match (form, bearing_lever) {
        (SpecimenForm::ThrustBearing, _) | (_, None) => None,
        (_, Some(lever)) => Some((t / f - pitch_share) / (thread_lever + lever)),
    };
    if let Some(mu) = thread_friction.filter(|mu| *mu <= 0.0) {
        let name = if form == SpecimenForm::ThrustBearing && t_th.is_none() {
            "total_torque"
        } else {
            "thread_torque"
        };
        errors.push(EngineError::invalid(
            field(name),
            format!(
                "{context}the torque is below the pitch share F·P/(2π) at this clamp force \
                 (thread friction would be {mu:.4}); check units, pitch and the load cell"
            ),
        ));
    }
    if let Some(mu) = total_friction.filter(|mu| *mu <= 0.0) {
        errors.push(EngineError::invalid(
            field("total_torque"),
            format!(
                "{context}the torque is below the pitch share F·P/(2π) at this clamp force \
                 (total friction would be {mu:.4}); check units, pitch and the load cell"
            ),
        ));
    }
    if errors.len() > before {
        return None;
    }
    Some(SpecimenResult {
        form,
        from_curve,
        clamp_force: m.clamp_force,
        total_torque: m.total_torque,
        thread_torque: m.thread_torque,
        angle,
        thread_friction,
        bearing_friction,
        total_friction,
        nut_factor: t / (f * joint.nominal_diameter.value),
        efficiency: f * joint.pitch.value / (2.0 * PI * t),
        outlier_in: Vec::new(),
    })
}
