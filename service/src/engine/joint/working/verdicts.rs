//! The sentences of the working-state checks: one per safety, information
//! when met and an error when not.

use super::{Safety, REQUIRED_FATIGUE_SAFETY, REQUIRED_SLIP_SAFETY};
use crate::engine::checks::{
    Check, Severity, FATIGUE_SAFETY, RESIDUAL_CLAMP_LOAD, SEALING_CLAMP_LOAD, SLIP_SAFETY,
    WORKING_SURFACE_PRESSURE, WORKING_YIELD_SAFETY,
};

fn check(code: &'static str, met: bool, message: String) -> Check {
    Check {
        code,
        severity: if met { Severity::Info } else { Severity::Error },
        message,
    }
}

/// The checks of a working state, in a fixed order.
pub(super) fn working_checks(
    s: &Safety,
    residual: f64,
    sealing: Option<f64>,
    sigma_a: f64,
    slip_clamp: f64,
) -> Vec<Check> {
    let kn = |f: f64| f / 1e3;
    let mut out = Vec::with_capacity(6);
    out.push(check(
        RESIDUAL_CLAMP_LOAD,
        residual > 0.0,
        if residual > 0.0 {
            format!(
                "the joint stays closed: residual clamp load at least {:.1} kN after embedding \
                 and the axial load",
                kn(residual)
            )
        } else {
            format!(
                "the joint opens: minimum preload minus embedding loss minus the clamped parts' \
                 share of the axial load leaves {:.1} kN",
                kn(residual)
            )
        },
    ));
    out.push(check(
        WORKING_YIELD_SAFETY,
        s.yield_ >= 1.0,
        format!(
            "safety against yield in service S_F = {:.2} (required at least 1.0, VDI 2230 \
             Part 1), with half the tightening torsion left in the bolt",
            s.yield_
        ),
    ));
    out.push(match s.fatigue {
        Some(sd) => check(
            FATIGUE_SAFETY,
            sd >= REQUIRED_FATIGUE_SAFETY,
            format!(
                "safety against fatigue S_D = {sd:.2} at an alternating stress of {:.1} N/mm² \
                 (required at least {REQUIRED_FATIGUE_SAFETY}, VDI 2230 Part 1)",
                sigma_a / 1e6
            ),
        ),
        None => check(
            FATIGUE_SAFETY,
            true,
            "no alternating axial load given: fatigue not checked".into(),
        ),
    });
    if let Some(sg) = s.slip {
        out.push(check(
            SLIP_SAFETY,
            sg >= REQUIRED_SLIP_SAFETY,
            format!(
                "safety against slip S_G = {sg:.2}: residual clamp load {:.1} kN against {:.1} \
                 kN needed by friction at the interfaces (required at least \
                 {REQUIRED_SLIP_SAFETY} for static transverse load, VDI 2230 Part 1)",
                kn(residual.max(0.0)),
                kn(slip_clamp)
            ),
        ));
    }
    if let Some(fkp) = sealing {
        out.push(check(
            SEALING_CLAMP_LOAD,
            residual >= fkp,
            format!(
                "residual clamp load {:.1} kN against the sealing clamp load {:.1} kN",
                kn(residual),
                kn(fkp)
            ),
        ));
    }
    if let Some(sp) = s.surface_pressure {
        out.push(check(
            WORKING_SURFACE_PRESSURE,
            sp >= 1.0,
            format!(
                "surface pressure under head or nut in service: safety S_p = {sp:.2} against \
                 the part's limiting pressure (required at least 1.0)"
            ),
        ));
    }
    out
}
