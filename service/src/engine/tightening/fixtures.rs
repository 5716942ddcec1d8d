//! Test fixtures: thread geometry built from the ISO / ASME basic-profile
//! formulas, so the computation tests do not depend on the thread tables.

use uom::si::angle::degree;
use uom::si::area::square_meter;
use uom::si::f64::{Angle, Area, Length, Pressure};
use uom::si::length::{inch, millimeter};
use uom::si::pressure::megapascal;

use crate::engine::bearing::BearingSurface;
use crate::engine::grade::{Strength, YieldBasis};
use crate::engine::thread::{ThreadForm, ThreadGeometry, ThreadSeries};

pub fn mm(v: f64) -> Length {
    Length::new::<millimeter>(v)
}

pub fn mpa(v: f64) -> Pressure {
    Pressure::new::<megapascal>(v)
}

/// ISO metric basic geometry, ISO 68-1 / ISO 724: d2 = d − 0.649519·P,
/// d3 = d − 1.226869·P, As = π/4·((d2 + d3)/2)² (ISO 898-1).
pub fn metric(d: f64, p: f64) -> ThreadGeometry {
    let d2 = d - 0.649519 * p;
    let d3 = d - 1.226869 * p;
    let d0 = (d2 + d3) / 2.0;
    ThreadGeometry {
        designation: format!("M{d}x{p}"),
        form: ThreadForm::IsoMetric,
        series: ThreadSeries::Coarse,
        nominal_diameter: mm(d),
        pitch: mm(p),
        flank_angle: Angle::new::<degree>(60.0),
        pitch_diameter: mm(d2),
        minor_diameter: mm(d3),
        stress_area: Area::new::<square_meter>(std::f64::consts::PI / 4.0 * (d0 * 1e-3).powi(2)),
        custom: false,
    }
}

/// Unified inch basic geometry, ASME B1.1: d2 = D − 0.649519/n and
/// (d2 + d3)/2 = D − 0.974279/n, so As = 0.7854·(D − 0.9743/n)².
pub fn unified(d_in: f64, tpi: f64) -> ThreadGeometry {
    let p = 1.0 / tpi;
    let d2 = d_in - 0.649519 * p;
    let d3 = d_in - 1.299038 * p;
    let d0 = (d2 + d3) / 2.0;
    let inch_m = Length::new::<inch>(1.0).value;
    ThreadGeometry {
        designation: format!("{d_in}-{tpi} UNC"),
        form: ThreadForm::Unified,
        series: ThreadSeries::Unc,
        nominal_diameter: Length::new::<inch>(d_in),
        pitch: Length::new::<inch>(p),
        flank_angle: Angle::new::<degree>(60.0),
        pitch_diameter: Length::new::<inch>(d2),
        minor_diameter: Length::new::<inch>(d3),
        stress_area: Area::new::<square_meter>(std::f64::consts::PI / 4.0 * (d0 * inch_m).powi(2)),
        custom: false,
    }
}

pub fn bearing(outer_mm: f64, inner_mm: f64) -> BearingSurface {
    BearingSurface {
        outer_diameter: mm(outer_mm),
        inner_diameter: mm(inner_mm),
        source: "test fixture".into(),
        conical_seat: false,
    }
}

/// ISO 898-1 strengths, values per ISO 898-1:2013 Table 3 (as reproduced by
/// supplier tables of EN ISO 898-1).
pub fn strength(id: &str, rm: f64, rp: f64, sp: f64) -> Strength {
    Strength {
        id: id.into(),
        standard: "ISO 898-1:2013 Table 3".into(),
        tensile_strength_min: mpa(rm),
        yield_strength_min: mpa(rp),
        yield_basis: YieldBasis::ProofStrength02,
        proof_stress: mpa(sp),
    }
}

/// 8.8 for d ≤ 16 mm (ISO 898-1:2013 Table 3).
pub fn class_8_8() -> Strength {
    strength("8.8", 800.0, 640.0, 580.0)
}

/// The M12 10.9 window input of the joint-model regressions: R_p0.2 940
/// N/mm² (ISO 898-1, property class 10.9), μ_th = μ_b = 0.12 single values,
/// ±9 % scatter, ν = 0.9, on `bearing` (ISO 4017 grade A d_W 16.63 mm over
/// an ISO 273 medium hole 13.5 mm in those tests).
pub fn m12_10_9_input<'a>(
    thread: &'a ThreadGeometry,
    bearing: &BearingSurface,
) -> crate::engine::window::WindowInput<'a> {
    use crate::engine::quantity::{FrictionRange, Scatter, Utilisation};
    crate::engine::window::WindowInput {
        thread,
        yield_strength: mpa(940.0),
        mean_bearing_diameter: bearing.mean_diameter(),
        thread_friction: FrictionRange::single(0.12, "thread_friction").expect("plausible"),
        bearing_friction: FrictionRange::single(0.12, "bearing_friction").expect("plausible"),
        scatter: Scatter::new(0.09, "scatter").expect("plausible"),
        utilisation: Utilisation::DEFAULT,
        prevailing_torque: crate::engine::window::no_prevailing_torque(),
    }
}

/// The through-bolted steel joint of the joint-model regressions: plates
/// of E = 205 000 N/mm² (VDI 2230 Part 1 steel value, recalled from
/// memory), outer diameter D_A 30 mm, clamp length `clamp_mm`, the bolt's
/// shank sections inside it.
pub fn steel_joint(
    clamp_mm: f64,
    shank_sections: Vec<crate::engine::angle::ShankSection>,
    socket_head: bool,
) -> crate::engine::angle::JointInput {
    crate::engine::angle::JointInput {
        clamp_length: Some(mm(clamp_mm)),
        joint_type: crate::engine::angle::JointType::ThroughBolted,
        clamped_modulus: Some(mpa(205_000.0)),
        nut_modulus: None,
        bolt_modulus: None,
        outer_diameter: Some(mm(30.0)),
        socket_head,
        shank_sections,
        snug_torque: None,
    }
}
