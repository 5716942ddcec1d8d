//! Checks of the bolt's partners: the surface pressure under the head or
//! nut (with a washer: head on washer against the washer's limit, washer on
//! part against the part's), the nut (class pairing and proof load), the
//! tapped thread's engagement (always run for a tapped hole, with a stated
//! default length) and materials outside the method (plastics, inserts).

use std::f64::consts::PI;

use uom::si::f64::{Length, Pressure, Torque};

use super::super::bearing::WasherBearing;
use super::super::material::{ClampedMaterial, MaterialKind};
use super::super::nut::NutStrength;
use super::{surface_pressure_value, Check, CheckInput, Severity};

/// Code: the washer-on-part (or head-on-part) pressure exceeds the part's p_G.
pub const SURFACE_PRESSURE_EXCEEDED: &str = "surface_pressure_exceeded";
/// Code: no p_G known for the part, pressure reported unchecked.
pub const SURFACE_PRESSURE_NOT_CHECKED: &str = "surface_pressure_not_checked";
/// Code: the head presses on the washer harder than the washer takes.
pub const WASHER_SURFACE_PRESSURE_EXCEEDED: &str = "washer_surface_pressure_exceeded";
/// Code: the tapped thread's engagement is shorter than the material needs.
pub const THREAD_ENGAGEMENT_TOO_SHORT: &str = "thread_engagement_too_short";
/// Code: a tapped hole whose material is unknown, so stripping is unchecked.
pub const THREAD_STRIPPING_NOT_CHECKED: &str = "thread_stripping_not_checked";
/// Code: the nut class is made for weaker bolts than this one.
pub const NUT_WEAKER_THAN_BOLT: &str = "nut_weaker_than_bolt";
/// Code: the highest preload exceeds the nut's proof load.
pub const NUT_PROOF_LOAD_EXCEEDED: &str = "nut_proof_load_exceeded";
/// Code: a plastic part or threaded insert, outside VDI 2230.
pub const MATERIAL_OUTSIDE_METHOD: &str = "material_outside_method";
/// Code: the window's upper torque exceeds the permissible torque from test.
pub const PERMISSIBLE_TORQUE_EXCEEDED: &str = "permissible_torque_exceeded";

/// Default thread engagement in a tapped hole when none is given: 1.5·d
/// (common practice: a tapped hole drilled for about one and a half
/// diameters of full thread). Stated in the check's sentence.
pub const DEFAULT_TAPPED_ENGAGEMENT_PER_D: f64 = 1.5;

/// A tapped hole whose thread engagement is checked.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TappedHole {
    /// Length of thread engagement in the tapped part.
    pub engagement_length: Length,
    /// Recommended minimum engagement as a multiple of d for this internal
    /// thread material and bolt grade (from `material`).
    pub min_engagement_factor: f64,
    /// False when `engagement_length` is the default
    /// [`DEFAULT_TAPPED_ENGAGEMENT_PER_D`]·d.
    pub engagement_given: bool,
}

/// The bolt's partners beyond the bearing surface.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct MatingParts {
    /// The nut of a through-bolted joint, where its class is given.
    pub nut: Option<NutStrength>,
    /// The tapped part's material, where different from the clamped part's.
    pub tapped_part: Option<ClampedMaterial>,
    /// A tapped-hole joint whose material is not known.
    pub tapped_material_unknown: bool,
    /// The plain washer under the head, where the tables put one.
    pub washer: Option<WasherBearing>,
    /// Permissible tightening torque from a joint test (plastics, inserts).
    pub permissible_torque: Option<Torque>,
    /// Thread and bearing friction were both given in the request.
    pub friction_given: bool,
}

fn mpa(p: Pressure) -> f64 {
    p.value / 1e6
}

/// Surface pressures: without a washer the head's (or nut's) on the part;
/// with one the head's on the washer and the washer's on the part.
pub(super) fn surface_pressure(i: &CheckInput, out: &mut Vec<Check>) {
    let head = mpa(surface_pressure_value(i.bearing, i.window));
    let Some(w) = &i.parts.washer else {
        part_pressure(
            i,
            head,
            "The head or nut presses",
            out,
            "Use a hardened washer, a flange head or a lower preload.",
        );
        return;
    };
    let pw = mpa(w.permissible_pressure);
    if head > pw {
        out.push(Check {
            code: WASHER_SURFACE_PRESSURE_EXCEEDED,
            severity: Severity::Error,
            message: format!(
                "The head presses {head:.0} MPa on the plain washer, more than the {pw:.0} MPa \
                 a 200 HV washer takes: the washer is dented and the joint loses preload. Use \
                 a hardened washer (300 HV), a flange head or a lower preload."
            ),
        });
    }
    let (o, h) = (w.outer_diameter.value, w.part_hole_diameter.value);
    let area = PI / 4.0 * (o * o - h * h);
    let on_part = if area > 0.0 {
        i.window.preload_max.value / area / 1e6
    } else {
        head
    };
    part_pressure(
        i,
        on_part,
        "The washer presses",
        out,
        "Use a larger or thicker hardened washer, a flange head or a lower preload.",
    );
}

fn part_pressure(i: &CheckInput, p: f64, who: &str, out: &mut Vec<Check>, remedy: &str) {
    match i.permissible_surface_pressure {
        Some(pg) if p > mpa(pg) => out.push(Check {
            code: SURFACE_PRESSURE_EXCEEDED,
            severity: Severity::Error,
            message: format!(
                "{who} {p:.0} MPa on the clamped part, more than the {:.0} MPa it can take: \
                 it will sink in and the joint loses preload. {remedy}",
                mpa(pg)
            ),
        }),
        Some(_) => {}
        None => out.push(Check {
            code: SURFACE_PRESSURE_NOT_CHECKED,
            severity: Severity::Info,
            message: format!(
                "{who} {p:.0} MPa on the clamped part; no permissible value is known for the \
                 clamped material, so it was not checked."
            ),
        }),
    }
}

/// The tapped thread's engagement, always run for a tapped hole.
pub(super) fn engagement(i: &CheckInput, out: &mut Vec<Check>) {
    if i.parts.tapped_material_unknown {
        out.push(Check {
            code: THREAD_STRIPPING_NOT_CHECKED,
            severity: Severity::Warning,
            message: "The tapped part's material is not known, so the thread engagement was \
                      not checked against stripping. Give tapped_part.material (or \
                      clamped_material) and engagement_length."
                .into(),
        });
    }
    let Some(t) = i.tapped_hole else { return };
    let d = i.thread.nominal_diameter.value;
    let needed = t.min_engagement_factor * d;
    if t.engagement_length.value < needed {
        let assumed = if t.engagement_given {
            String::new()
        } else {
            format!(
                " (engagement_length not given: {DEFAULT_TAPPED_ENGAGEMENT_PER_D}·d assumed; give the real length)"
            )
        };
        out.push(Check {
            code: THREAD_ENGAGEMENT_TOO_SHORT,
            severity: Severity::Error,
            message: format!(
                "The thread engages {:.1} mm in the tapped part{assumed}, but this material \
                 needs at least {:.1} mm ({:.2}·d) for a {} bolt: the internal thread may strip \
                 before the bolt reaches its load. Use a longer screw, a thread insert or a \
                 stronger part.",
                t.engagement_length.value * 1e3,
                needed * 1e3,
                t.min_engagement_factor,
                i.strength.id
            ),
        });
    }
}

/// The nut: its class against the bolt's strength, its proof load against
/// the highest assembly preload. Both at the standard's nut height.
pub(super) fn nut(i: &CheckInput, out: &mut Vec<Check>) {
    let Some(n) = &i.parts.nut else { return };
    let bolt_rm = i.strength.tensile_strength_min;
    if bolt_rm.value > n.mates_bolt_rm_up_to.value * (1.0 + 1e-9) {
        out.push(Check {
            code: NUT_WEAKER_THAN_BOLT,
            severity: Severity::Error,
            message: format!(
                "The {} is made for {}, weaker than this {} bolt (Rm,min {:.0} MPa): on \
                 overtightening its thread strips before the bolt breaks, without warning. \
                 Use the nut class that matches the bolt ({}).",
                n.name,
                n.mates,
                i.strength.id,
                mpa(bolt_rm),
                n.standard
            ),
        });
    }
    let proof = n.proof_stress.value * i.thread.stress_area.value;
    if i.window.preload_max.value > proof {
        out.push(Check {
            code: NUT_PROOF_LOAD_EXCEEDED,
            severity: Severity::Error,
            message: format!(
                "The highest assembly preload {:.1} kN exceeds the proof load of the {} \
                 ({:.1} kN = Sp {:.0} MPa × A_s, standard nut height; {}): the nut thread may \
                 deform or strip. Use a stronger nut class or a lower preload.",
                i.window.preload_max.value / 1e3,
                n.name,
                proof / 1e3,
                mpa(n.proof_stress),
                n.standard
            ),
        });
    }
}

/// Plastics and threaded inserts: outside VDI 2230, answered only with the
/// friction and a permissible torque from a joint test (the refusal without
/// them is `plausible::outside_method`).
pub(super) fn outside_method(i: &CheckInput, out: &mut Vec<Check>) {
    let Some(m) = i.outside_method else { return };
    out.push(Check {
        code: MATERIAL_OUTSIDE_METHOD,
        severity: Severity::Error,
        message: format!(
            "{} is outside VDI 2230 (written for metal parts): {}. The window rests on the \
             friction and the permissible torque you gave from a joint test; confirm the \
             preload, creep and relaxation by test on the real part before release.",
            m.name,
            match m.kind {
                MaterialKind::ThreadedInsert =>
                    "the insert's own strength and its hold in \
                                                 the part limit the joint",
                _ => "plastics creep and relax under preload and have no tabulated limits",
            }
        ),
    });
    let Some(limit) = i.parts.permissible_torque else {
        return;
    };
    if i.window.upper.value > limit.value {
        out.push(Check {
            code: PERMISSIBLE_TORQUE_EXCEEDED,
            severity: Severity::Error,
            message: format!(
                "The window's upper torque {:.2} N·m exceeds the permissible torque {:.2} N·m \
                 from the joint test: lower the utilisation or the required clamp load, or \
                 test again.",
                i.window.upper.value, limit.value
            ),
        });
    }
}
