//! Bolt and clamped-part resilience by the VDI 2230 Part 1 model (formulas
//! recalled from memory; see the parent module for the list).

use std::f64::consts::PI;

use uom::si::f64::Length;

use super::{steel_bolt_modulus, JointInput, JointType};
use crate::engine::bearing::BearingSurface;
use crate::engine::quantity::positive;
use crate::engine::thread::ThreadGeometry;
use crate::engine::EngineError;

/// The resilience figures, in m/N.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Resilience {
    pub head: f64,
    pub shank_sections: f64,
    pub free_thread: f64,
    pub engaged_thread: f64,
    pub nut_or_tapped_hole: f64,
    /// δ_S, the sum of the above.
    pub bolt: f64,
    /// δ_P of the clamped parts.
    pub clamped_parts: f64,
    /// tan φ of the deformation cone.
    pub cone_tan: f64,
    /// D_A,Gr, the diameter at which the cone is fully developed.
    pub cone_limit_diameter: Length,
    /// Φ_K = δ_P/(δ_S + δ_P), load factor for load introduced under the head.
    pub load_factor: f64,
}

fn area(d: f64) -> f64 {
    PI / 4.0 * d * d
}

fn field_positive(v: f64, field: &str) -> Result<f64, EngineError> {
    positive(v, field)
}

/// Bolt and clamped-part resilience; validates the joint input.
pub fn resilience(
    thread: &ThreadGeometry,
    bearing: &BearingSurface,
    joint: &JointInput,
    clamp_length: Length,
    outer_diameter: Length,
) -> Result<Resilience, EngineError> {
    let d = thread.nominal_diameter.value;
    let d3 = thread.minor_diameter.value;
    let lk = field_positive(clamp_length.value, "joint.clamp_length")?;
    let da = field_positive(outer_diameter.value, "joint.outer_diameter")?;
    let es = field_positive(
        joint.bolt_modulus.unwrap_or_else(steel_bolt_modulus).value,
        "joint.bolt_modulus",
    )?;
    let ep = joint
        .clamped_modulus
        .ok_or_else(|| EngineError::invalid("clamped_material", "no elastic modulus given"))?;
    let ep = field_positive(ep.value, "clamped_material")?;
    let em = match (joint.nut_modulus, joint.joint_type) {
        (Some(e), _) => e.value,
        (None, JointType::ThroughBolted) => steel_bolt_modulus().value,
        (None, JointType::TappedHole) => ep,
    };
    let em = field_positive(em, "joint.nut_modulus")?;
    let (dw, dh) = (bearing.outer_diameter.value, bearing.inner_diameter.value);
    if !(dw > dh && dh > 0.0) {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            "the bearing outer diameter must exceed the hole diameter",
        ));
    }
    let engaged = 0.5 * d;
    if lk < engaged {
        return Err(EngineError::invalid(
            "joint.clamp_length",
            format!(
                "clamp length {:.2} mm is shorter than the engaged thread length the VDI 2230 \
                 model uses (0.5·d = {:.2} mm); the resilience model does not apply",
                lk * 1e3,
                engaged * 1e3
            ),
        ));
    }
    if da <= dh {
        return Err(EngineError::invalid(
            "joint.outer_diameter",
            format!(
                "outer diameter of the clamped parts {:.2} mm must exceed the hole {:.2} mm",
                da * 1e3,
                dh * 1e3
            ),
        ));
    }
    let (mut shank_len, mut shank) = (0.0, 0.0);
    for (i, s) in joint.shank_sections.iter().enumerate() {
        let l = field_positive(s.length.value, &format!("joint.shank_sections[{i}].length"))?;
        let ds = field_positive(
            s.diameter.value,
            &format!("joint.shank_sections[{i}].diameter"),
        )?;
        if ds > d * (1.0 + 1e-9) {
            return Err(EngineError::invalid(
                format!("joint.shank_sections[{i}].diameter"),
                "a shank section cannot be thicker than the nominal diameter",
            ));
        }
        shank_len += l;
        shank += l / (es * area(ds));
    }
    if shank_len > lk * (1.0 + 1e-9) {
        return Err(EngineError::invalid(
            "joint.shank_sections",
            format!(
                "shank sections total {:.2} mm, longer than the clamp length {:.2} mm",
                shank_len * 1e3,
                lk * 1e3
            ),
        ));
    }
    let (an, ad3) = (area(d), area(d3));
    let head = if joint.socket_head { 0.4 } else { 0.5 } * d / (es * an);
    let free_thread = (lk - shank_len).max(0.0) / (es * ad3);
    let engaged_thread = engaged / (es * ad3);
    let lm = match joint.joint_type {
        JointType::ThroughBolted => 0.4 * d,
        JointType::TappedHole => 0.33 * d,
    };
    let nut = lm / (em * an);
    let bolt = head + shank + free_thread + engaged_thread + nut;

    let (w, tan_phi) = deformation_cone(joint.joint_type, lk, dw, da);
    if !(tan_phi.is_finite() && tan_phi > 0.0) {
        return Err(EngineError::invalid(
            "joint.clamp_length",
            "the deformation cone model gives no valid cone for this clamp length and \
             outer diameter",
        ));
    }
    let da_gr = dw + w * lk * tan_phi;
    let clamped = if da <= dw {
        4.0 * lk / (ep * PI * (da * da - dh * dh))
    } else if da >= da_gr {
        let num = (dw + dh) * (dw + w * lk * tan_phi - dh);
        let den = (dw - dh) * (dw + w * lk * tan_phi + dh);
        2.0 * (num / den).ln() / (w * ep * PI * dh * tan_phi)
    } else {
        let cone_part =
            2.0 / (w * dh * tan_phi) * (((dw + dh) * (da - dh)) / ((dw - dh) * (da + dh))).ln();
        let sleeve = 4.0 / (da * da - dh * dh) * (lk - (da - dw) / (w * tan_phi));
        (cone_part + sleeve) / (ep * PI)
    };
    Ok(Resilience {
        head,
        shank_sections: shank,
        free_thread,
        engaged_thread,
        nut_or_tapped_hole: nut,
        bolt,
        clamped_parts: clamped,
        cone_tan: tan_phi,
        cone_limit_diameter: Length::new::<uom::si::length::meter>(da_gr),
        load_factor: clamped / (bolt + clamped),
    })
}

/// (w, tan φ) of the deformation cone, VDI 2230 Part 1 (recalled from memory).
pub fn deformation_cone(joint: JointType, lk: f64, dw: f64, da: f64) -> (f64, f64) {
    let beta = lk / dw;
    let y = (da / dw).max(1.0);
    match joint {
        JointType::ThroughBolted => (1.0, 0.362 + 0.032 * (beta / 2.0).ln() + 0.153 * y.ln()),
        JointType::TappedHole => (2.0, 0.348 + 0.013 * beta.ln() + 0.193 * y.ln()),
    }
}
