//! Plausibility ranges for the dimensional inputs a client can scale freely:
//! bearing diameters, clamp length, outer diameter of the clamped parts,
//! engagement length, prevailing torque and required clamp load. Each range is
//! stated relative to the thread (nominal diameter d, yield load F_y = Rp·As)
//! so it holds for every size; a value outside it is a typing or unit error,
//! refused with the field and the range rather than computed into a torque
//! that no joint could take.
//!
//! The ranges are this service's own plausibility bounds, wide enough for
//! every joint of the trade (common practice), not limits of a standard.
//! Friction, utilisation and tool scatter are bounded where they are typed
//! ([`super::quantity`]); the resolution where setpoints are rounded.

use uom::si::f64::Length;
use uom::si::force::newton;
use uom::si::length::millimeter;
use uom::si::torque::newton_meter;

use super::material::MaterialKind;
use super::spec::SpecInput;
use super::EngineError;

mod warnings;
pub use warnings::{
    codes, warnings, CLAMP_LENGTH_MODEL_PER_D, PREVAILING_SHARE_MAX, SCATTER_WARN_ABOVE,
    UTILISATION_BAND, UTILISATION_MIN,
};

/// Inner bearing diameter d_h from 0.8·d (a bearing face that reaches into
/// the thread run-out) to 4·d (common practice).
pub const BEARING_INNER_PER_D: (f64, f64) = (0.8, 4.0);
/// Outer bearing diameter d_w up to 6·d: above a large washer (ISO 7093
/// outer diameters are about 3·d) with room to spare (common practice).
pub const BEARING_OUTER_MAX_PER_D: f64 = 6.0;
/// Clamp length l_K from 0.1·d to 50·d (a long tie bolt; common practice).
pub const CLAMP_LENGTH_PER_D: (f64, f64) = (0.1, 50.0);
/// Outer diameter of the clamped parts D_A up to 50·d; beyond the limiting
/// diameter of the deformation cone (VDI 2230 Part 1) a larger D_A changes
/// nothing, so a larger value is a unit error (common practice).
pub const JOINT_OUTER_MAX_PER_D: f64 = 50.0;
/// Thread engagement up to 10·d: the weakest internal thread the trade uses
/// needs about 2.5·d (common practice).
pub const ENGAGEMENT_MAX_PER_D: f64 = 10.0;
/// Prevailing torque up to 0.1·F_y·d, roughly half the torque that would
/// yield the bolt: locking elements are a small share of the tightening
/// torque (ISO 2320 prevailing torques, common practice).
pub const PREVAILING_MAX_PER_FY_D: f64 = 0.1;
/// Required clamp load up to 10·F_y: above it no bolt of this size and grade
/// comes near, so it is a unit error (common practice).
pub const REQUIRED_CLAMP_LOAD_MAX_PER_FY: f64 = 10.0;

fn outside(field: &str, what: &str, value: f64, unit: &str, lo: f64, hi: f64) -> EngineError {
    EngineError::invalid(
        field,
        format!(
            "{what} {value} {unit} is outside the plausible range {lo:.4} to {hi:.4} {unit} for \
             this thread; check the value and its unit"
        ),
    )
}

fn check_length(
    out: &mut Vec<EngineError>,
    field: &str,
    what: &str,
    length: Length,
    range: (f64, f64),
) {
    let v = length.get::<millimeter>();
    if !(v.is_finite() && range.0 <= v && v <= range.1) {
        out.push(outside(field, what, v, "mm", range.0, range.1));
    }
}

/// Every input of `input` outside its plausible range, each naming its field
/// (the engine's field names, as in [`EngineError`]) and the range.
pub fn problems(input: &SpecInput) -> Vec<EngineError> {
    let mut out = Vec::new();
    let d = input.thread.nominal_diameter.get::<millimeter>();
    let yield_load = input.strength.yield_strength_min.value * input.thread.stress_area.value;
    if !(d.is_finite() && d > 0.0 && yield_load.is_finite() && yield_load > 0.0) {
        // The thread or grade is itself refused by `spec::compute`.
        return out;
    }

    let (inner_lo, inner_hi) = BEARING_INNER_PER_D;
    check_length(
        &mut out,
        "bearing.inner_diameter",
        "inner bearing diameter",
        input.bearing.inner_diameter,
        (inner_lo * d, inner_hi * d),
    );
    check_length(
        &mut out,
        "bearing.outer_diameter",
        "outer bearing diameter",
        input.bearing.outer_diameter,
        (inner_lo * d, BEARING_OUTER_MAX_PER_D * d),
    );
    if let Some(joint) = &input.joint {
        if let Some(l) = joint.clamp_length {
            let (lo, hi) = CLAMP_LENGTH_PER_D;
            check_length(
                &mut out,
                "joint.clamp_length",
                "clamp length",
                l,
                (lo * d, hi * d),
            );
        }
        if let Some(da) = joint.outer_diameter {
            check_length(
                &mut out,
                "joint.outer_diameter",
                "outer diameter of the clamped parts",
                da,
                (d, JOINT_OUTER_MAX_PER_D * d),
            );
        }
    }
    if let Some(t) = &input.tapped_hole {
        check_length(
            &mut out,
            "joint.engagement_length",
            "engagement length",
            t.engagement_length,
            (0.0, ENGAGEMENT_MAX_PER_D * d),
        );
    }
    if let Some(t) = input.prevailing_torque {
        let v = t.get::<newton_meter>();
        let hi = PREVAILING_MAX_PER_FY_D * yield_load * d / 1000.0;
        if !(v.is_finite() && (0.0..=hi).contains(&v)) {
            out.push(outside(
                "prevailing_torque",
                "prevailing torque",
                v,
                "N·m",
                0.0,
                hi,
            ));
        }
    }
    if let Some(nu) = input.utilisation {
        if nu.is_finite() && nu < UTILISATION_MIN {
            out.push(outside(
                "utilisation",
                "utilisation",
                nu,
                "",
                UTILISATION_MIN,
                1.0,
            ));
        }
    }
    outside_method(input, &mut out);
    if let Some(f) = input.required_clamp_load {
        let v = f.get::<newton>();
        let hi = REQUIRED_CLAMP_LOAD_MAX_PER_FY * yield_load;
        if !(v.is_finite() && v > 0.0 && v <= hi) {
            out.push(outside(
                "required_clamp_load",
                "required clamp load",
                v,
                "N",
                0.0,
                hi,
            ));
        }
    }
    out
}

/// Plastics and threaded inserts are outside VDI 2230: refused unless both
/// frictions and a permissible torque from a joint test are given.
fn outside_method(input: &SpecInput, out: &mut Vec<EngineError>) {
    let Some((field, m)) = outside_method_material(input) else {
        return;
    };
    let why = format!(
        "{field} '{}' is a {} part, outside VDI 2230 (metal parts): no torque is computed \
         from tables for it",
        m.id,
        m.kind.id().replace('_', " ")
    );
    if input.parts.permissible_torque.is_none() {
        out.push(EngineError::invalid(
            "permissible_torque",
            format!("{why}; give permissible_torque, the highest torque a joint test allowed"),
        ));
    }
    if !input.parts.friction_given {
        out.push(EngineError::invalid(
            "thread_friction",
            format!("{why}; give thread_friction and bearing_friction measured on the part"),
        ));
    }
}

/// The first part outside the method: the clamped part's material, then the
/// tapped part's.
pub fn outside_method_material(
    input: &SpecInput,
) -> Option<(&'static str, &super::material::ClampedMaterial)> {
    [
        ("clamped_material", input.clamped_material.as_ref()),
        ("tapped_part.material", input.parts.tapped_part.as_ref()),
    ]
    .into_iter()
    .find_map(|(f, m)| m.filter(|m| m.kind != MaterialKind::Metal).map(|m| (f, m)))
}

#[cfg(test)]
mod tests;
