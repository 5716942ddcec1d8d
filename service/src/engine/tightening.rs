//! Assembly preload and tightening torque by the VDI 2230 Part 1 method.
//!
//! Symbols follow the guideline: d nominal diameter, P pitch, d2 pitch
//! diameter, d3 minor diameter, d0 = (d2 + d3)/2 (shank bolts), A0 = As,
//! μ_th thread friction (VDI μ_G), μ_b bearing friction (VDI μ_K), D_Km mean
//! bearing-friction diameter, β included flank angle, ν utilisation of the
//! minimum yield strength.
//!
//! Torque formula: for 60° thread forms the engine uses the VDI 2230 Part 1
//! form M_A = F_M·(0.16·P + 0.58·d2·μ_th + D_Km/2·μ_b), as issue 2 asks;
//! for any other flank angle the general form
//! M_A = F_M·(d2/2·tan(φ + ρ') + D_Km/2·μ_b), tan φ = P/(π·d2),
//! tan ρ' = μ_th/cos(β/2) (VDI 2230 Part 1, same section). Both are linear in
//! the preload, so "preload at a given torque" is the exact inverse.
//!
//! Prevailing torque of a locking element adds to the torque and makes no
//! preload: M = F·c(μ_th, μ_b) + M_prevailing.
//!
//! Everything is computed in SI base units (m, N, Pa) on the raw `value` of
//! the uom quantities, to keep `spec::compute` fast.

use std::f64::consts::PI;

use uom::si::f64::{Force, Length, Pressure, Torque};
use uom::si::force::newton;
use uom::si::pressure::pascal;
use uom::si::torque::newton_meter;

use super::quantity::Utilisation;
use super::thread::ThreadGeometry;

/// Which torque formula applies to a thread form.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TorqueFormula {
    /// VDI 2230 Part 1: M_A = F·(0.16·P + 0.58·d2·μ_th + D_Km/2·μ_b), 60° threads.
    Vdi60,
    /// General flank angle: M_A = F·(d2/2·tan(φ + ρ') + D_Km/2·μ_b).
    GeneralFlank,
}

impl TorqueFormula {
    /// Text for the spec's assumptions list.
    pub fn description(&self) -> &'static str {
        match self {
            Self::Vdi60 => {
                "M_A = F_M·(0.16·P + 0.58·d2·μ_th + D_Km/2·μ_b) (VDI 2230 Part 1, 60° threads)"
            }
            Self::GeneralFlank => {
                "M_A = F_M·(d2/2·tan(φ + ρ') + D_Km/2·μ_b), tan ρ' = μ_th/cos(β/2) (VDI 2230 Part 1)"
            }
        }
    }
}

/// The formula used for a thread: 60° (±0.01°) gets the VDI form.
pub fn torque_formula(thread: &ThreadGeometry) -> TorqueFormula {
    let sixty = PI / 3.0;
    if (thread.flank_angle.value - sixty).abs() < 0.01_f64.to_radians() {
        TorqueFormula::Vdi60
    } else {
        TorqueFormula::GeneralFlank
    }
}

/// tan ρ' = μ_th / cos(β/2), the friction of the inclined flank.
fn flank_friction(thread: &ThreadGeometry, mu_th: f64) -> f64 {
    mu_th / (thread.flank_angle.value / 2.0).cos()
}

/// tan φ = P/(π·d2), the lead angle.
fn lead(thread: &ThreadGeometry) -> f64 {
    thread.pitch.value / (PI * thread.pitch_diameter.value)
}

/// Stress diameter d0 = d_S, taken from the stress area: d0 = sqrt(4·As/π).
/// For ISO metric threads this is exactly (d2 + d3)/2 (ISO 898-1); for Unified
/// threads it is the diameter of the ASME B1.1 tensile stress area, so A0 and
/// d0 always describe the same cross-section.
fn stress_diameter(thread: &ThreadGeometry) -> f64 {
    (4.0 * thread.stress_area.value / PI).sqrt()
}

/// Factor of the VDI reduced stress during tightening:
/// σ_red/σ_M = sqrt(1 + 3·[(3/2)·(d2/d0)·(P/(π·d2) + μ_th/cos(β/2))]²).
/// VDI 2230 Part 1:2015 eq. R13/5.5/48 (equation number recalled from memory).
fn reduced_stress_factor(thread: &ThreadGeometry, mu_th: f64) -> f64 {
    let d2 = thread.pitch_diameter.value;
    let d0 = stress_diameter(thread);
    let t = 1.5 * d2 / d0 * (lead(thread) + flank_friction(thread, mu_th));
    (1.0 + 3.0 * t * t).sqrt()
}

/// Permissible assembly preload F_M,zul at utilisation ν of the minimum yield
/// strength, under tension plus thread torsion (von Mises), VDI 2230 Part 1:2015
/// eq. R13/5.5/48 (equation number recalled from memory), with A0 = As and
/// d0 = (d2 + d3)/2 for shank bolts (see [`stress_diameter`]).
pub fn permissible_preload(
    thread: &ThreadGeometry,
    yield_min: Pressure,
    nu: Utilisation,
    mu_th: f64,
) -> Force {
    let f = thread.stress_area.value * nu.value() * yield_min.value
        / reduced_stress_factor(thread, mu_th);
    Force::new::<newton>(f)
}

/// F_M,zul with a locking element's prevailing torque M_p. The prevailing
/// torque is reacted in the thread, so it twists the bolt like the thread
/// torque: τ = (F·d2/2·(tan φ + tan ρ') + M_p)/W_p with the same W_p =
/// π·d0³/12 that the VDI formula's factor 3/2 implies (VDI 2230 Part
/// 1:2015 eq. R13/5.5/48, recalled from memory), and
/// (F/A0)² + 3τ² = (ν·Rp)² is solved for F. With M_p = 0 this is
/// [`permissible_preload`]; zero when M_p alone would yield the bolt.
pub fn permissible_preload_with_prevailing(
    thread: &ThreadGeometry,
    yield_min: Pressure,
    nu: Utilisation,
    mu_th: f64,
    prevailing: Torque,
) -> Force {
    let mp = prevailing.value;
    if mp <= 0.0 {
        return permissible_preload(thread, yield_min, nu, mu_th);
    }
    let a0 = thread.stress_area.value;
    let d0 = stress_diameter(thread);
    let k = 12.0 / (PI * d0 * d0 * d0);
    let c = thread.pitch_diameter.value / 2.0 * (lead(thread) + flank_friction(thread, mu_th));
    let limit = nu.value() * yield_min.value;
    let a = 1.0 / (a0 * a0) + 3.0 * k * k * c * c;
    let b = 6.0 * k * k * c * mp;
    let c0 = 3.0 * k * k * mp * mp - limit * limit;
    let disc = b * b - 4.0 * a * c0;
    let f = if c0 >= 0.0 || disc < 0.0 {
        0.0
    } else {
        (-b + disc.sqrt()) / (2.0 * a)
    };
    Force::new::<newton>(f.max(0.0))
}

/// Combined (von Mises) stress in the thread during tightening at preload F,
/// by the same VDI 2230 model as [`permissible_preload`].
pub fn combined_stress(thread: &ThreadGeometry, preload: Force, mu_th: f64) -> Pressure {
    let sigma = preload.value / thread.stress_area.value;
    Pressure::new::<pascal>(sigma * reduced_stress_factor(thread, mu_th))
}

/// The three torque contributions per newton of preload, in metres:
/// (pitch, thread friction, bearing friction).
fn torque_parts(thread: &ThreadGeometry, mean_bearing: Length, mu_th: f64, mu_b: f64) -> [f64; 3] {
    let p = thread.pitch.value;
    let d2 = thread.pitch_diameter.value;
    let bearing = mean_bearing.value / 2.0 * mu_b;
    match torque_formula(thread) {
        // VDI 2230 Part 1: 0.16·P + 0.58·d2·μ_th (60° threads).
        TorqueFormula::Vdi60 => [0.16 * p, 0.58 * d2 * mu_th, bearing],
        TorqueFormula::GeneralFlank => {
            let (tp, tr) = (lead(thread), flank_friction(thread, mu_th));
            let thread_total = d2 / 2.0 * (tp + tr) / (1.0 - tp * tr);
            let pitch = p / (2.0 * PI);
            [pitch, thread_total - pitch, bearing]
        }
    }
}

/// Torque per unit preload c = M_A/F_M (a length): thread plus bearing.
pub fn torque_per_preload(
    thread: &ThreadGeometry,
    mean_bearing: Length,
    mu_th: f64,
    mu_b: f64,
) -> Length {
    let [a, b, c] = torque_parts(thread, mean_bearing, mu_th, mu_b);
    Length::new::<uom::si::length::meter>(a + b + c)
}

/// Tightening torque M_A for a preload, plus any prevailing torque.
pub fn tightening_torque(
    thread: &ThreadGeometry,
    preload: Force,
    mean_bearing: Length,
    mu_th: f64,
    mu_b: f64,
    prevailing: Torque,
) -> Torque {
    let c = torque_per_preload(thread, mean_bearing, mu_th, mu_b).value;
    Torque::new::<newton_meter>(preload.value * c + prevailing.value)
}

/// Preload produced by a torque (inverse of [`tightening_torque`]). Torque
/// spent on the prevailing torque makes no preload; at or below it the
/// preload is zero.
pub fn preload_at_torque(
    thread: &ThreadGeometry,
    torque: Torque,
    mean_bearing: Length,
    mu_th: f64,
    mu_b: f64,
    prevailing: Torque,
) -> Force {
    let c = torque_per_preload(thread, mean_bearing, mu_th, mu_b).value;
    let f = ((torque.value - prevailing.value) / c).max(0.0);
    Force::new::<newton>(f)
}

/// Where the tightening torque goes, as shares of the total (sum = 1).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TorqueSplit {
    /// Share that stretches the bolt (makes preload): F·P/(2π·M_A), the
    /// tightening efficiency.
    pub pitch: f64,
    /// Share lost in thread friction.
    pub thread_friction: f64,
    /// Share lost in friction under the head or nut.
    pub bearing_friction: f64,
    /// Share taken by the prevailing torque of a locking element.
    pub prevailing: f64,
}

/// Split of the torque needed for `preload`. The pitch share is the exact
/// F·P/(2π) (ISO 16047 evaluation, recalled from memory); for the 60° VDI form
/// the remainder of its 0.16·P term (0.16 − 1/2π) is counted as thread friction.
pub fn torque_split(
    thread: &ThreadGeometry,
    preload: Force,
    mean_bearing: Length,
    mu_th: f64,
    mu_b: f64,
    prevailing: Torque,
) -> TorqueSplit {
    let f = preload.value;
    let [p, t, b] = torque_parts(thread, mean_bearing, mu_th, mu_b);
    let total = f * (p + t + b) + prevailing.value;
    if total <= 0.0 || !total.is_finite() {
        return TorqueSplit {
            pitch: 0.0,
            thread_friction: 0.0,
            bearing_friction: 0.0,
            prevailing: 0.0,
        };
    }
    let pitch = f * thread.pitch.value / (2.0 * PI);
    let bearing = f * b;
    TorqueSplit {
        pitch: pitch / total,
        thread_friction: (f * (p + t) - pitch) / total,
        bearing_friction: bearing / total,
        prevailing: prevailing.value / total,
    }
}

/// Nut factor K = M_A/(F·d), without prevailing torque.
pub fn nut_factor(thread: &ThreadGeometry, mean_bearing: Length, mu_th: f64, mu_b: f64) -> f64 {
    torque_per_preload(thread, mean_bearing, mu_th, mu_b).value / thread.nominal_diameter.value
}

/// Equivalent total friction μ_tot: the single coefficient that, used for both
/// thread and bearing, gives the same torque per preload as (μ_th, μ_b).
/// Closed form for the 60° VDI form (linear in μ); a few Newton steps otherwise.
pub fn equivalent_total_friction(
    thread: &ThreadGeometry,
    mean_bearing: Length,
    mu_th: f64,
    mu_b: f64,
) -> f64 {
    let target = torque_per_preload(thread, mean_bearing, mu_th, mu_b).value;
    match torque_formula(thread) {
        TorqueFormula::Vdi60 => {
            let slope = 0.58 * thread.pitch_diameter.value + mean_bearing.value / 2.0;
            (target - 0.16 * thread.pitch.value) / slope
        }
        TorqueFormula::GeneralFlank => {
            let g = |mu: f64| torque_per_preload(thread, mean_bearing, mu, mu).value - target;
            let mut mu = (mu_th + mu_b) / 2.0;
            for _ in 0..8 {
                let h = 1e-6;
                let slope = (g(mu + h) - g(mu - h)) / (2.0 * h);
                if slope.abs() < 1e-15 || !slope.is_finite() {
                    break;
                }
                mu -= g(mu) / slope;
            }
            mu
        }
    }
}

/// Thread friction that explains a measured torque at a measured preload and
/// known bearing friction (inverse in μ_th). `None` when no non-negative
/// thread friction can explain it (torque too low for the pitch and bearing).
pub fn thread_friction_from_torque(
    thread: &ThreadGeometry,
    torque: Torque,
    preload: Force,
    mean_bearing: Length,
    mu_b: f64,
) -> Option<f64> {
    if preload.value <= 0.0 || !torque.value.is_finite() {
        return None;
    }
    let per_n = torque.value / preload.value;
    let mu = match torque_formula(thread) {
        TorqueFormula::Vdi60 => {
            let rest = per_n - 0.16 * thread.pitch.value - mean_bearing.value / 2.0 * mu_b;
            rest / (0.58 * thread.pitch_diameter.value)
        }
        TorqueFormula::GeneralFlank => {
            // Solve d2/2·tan(φ + ρ') = rest for ρ', then μ = tan ρ'·cos(β/2).
            let rest = per_n - mean_bearing.value / 2.0 * mu_b;
            let phi_rho = (2.0 * rest / thread.pitch_diameter.value).atan();
            let rho = phi_rho - lead(thread).atan();
            rho.tan() * (thread.flank_angle.value / 2.0).cos()
        }
    };
    (mu.is_finite() && mu >= 0.0).then_some(mu)
}

/// Shigley's torque coefficient, Shigley's Mechanical Engineering Design §8-8
/// (form recalled from memory):
/// K = (d_m/2d)·(tan λ + f·sec α)/(1 − f·tan λ·sec α) + 0.625·f_c, with d_m = d2, tan λ = P/(π·d_m), α the half flank angle and a
/// collar (washer face) of 1.5·d, so a mean collar diameter of 1.25·d.
pub fn shigley_torque_coefficient(thread: &ThreadGeometry, f: f64, fc: f64) -> f64 {
    let d = thread.nominal_diameter.value;
    let dm = thread.pitch_diameter.value;
    let tan_l = lead(thread);
    let sec_a = 1.0 / (thread.flank_angle.value / 2.0).cos();
    dm / (2.0 * d) * (tan_l + f * sec_a) / (1.0 - f * tan_l * sec_a) + 0.625 * fc
}

#[cfg(test)]
pub(crate) mod fixtures;
#[cfg(test)]
mod published_fine;
#[cfg(test)]
mod tests;
