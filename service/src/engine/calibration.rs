//! Friction calibration: evaluate a torque–tension test series the way
//! ISO 16047 does and summarise the spread of the friction coefficients.
//!
//! A test rig measures, per specimen, the clamp force F (load cell under
//! the head), the total tightening torque T (on the wrench) and, where the
//! rig has a thread-torque transducer, the thread torque T_th. From these:
//!
//! - thread friction   μ_th = (T_th/F − P/(2π)) / (c·d2)
//! - bearing friction  μ_b  = (T − T_th) / (F·D_b/2)
//! - total friction    μ_tot = (T/F − P/(2π)) / (c·d2 + D_b/2)
//! - nut factor        K = T/(F·d)
//! - efficiency        η = F·P/(2π·T)  (share of the torque that stretches the bolt)
//!
//! with c = 1/(2·cos(β/2)) for the included flank angle β (0.577 for 60°
//! threads) and D_b the mean bearing diameter (d_o + d_i)/2. Formula form
//! recalled from memory, ISO 16047:2005 §8; the 0.577 is generalised here
//! to other flank angles through c.
//!
//! Three record forms are accepted: full (F, T, T_th), shop (F, T: thread
//! and bearing friction cannot be separated and stay `None`), and
//! thrust-bearing (a thrust bearing under the turned part removes bearing
//! friction, so the measured torque is thread torque and μ_b stays `None`).
//! A specimen may instead carry a sampled curve; it is then read at the
//! evaluation clamp force, by default 75 % of the proof load as ISO 16047
//! does (recalled from memory, ISO 16047:2005 §8).

mod curve;
pub mod proposal;
mod specimen;
pub mod statistics;
#[cfg(test)]
mod tests;
mod warnings;

use std::fmt;

use uom::si::f64::{Angle, Force, Length, Torque};

use super::bearing::BearingSurface;
use super::thread::ThreadGeometry;
use super::EngineError;
pub use statistics::{CoefficientStatistics, SeriesStatistics, OUTLIER_RULE, STD_DEV_RULE};
use warnings::series_warnings;

/// Fraction of the proof load at which ISO 16047 evaluates the coefficients
/// when no evaluation clamp force is given (recalled from memory,
/// ISO 16047:2005 §8: 0.75·F_p).
pub const EVALUATION_FRACTION_OF_PROOF_LOAD: f64 = 0.75;

/// Smallest series we accept as support for a catalogue friction range.
/// Common practice for torque–tension friction series (ten specimens per
/// combination of finish and lubricant); not a figure taken from a standard.
pub const MINIMUM_SERIES_SIZE: usize = 10;

/// Plausible range of a friction coefficient; values outside it usually
/// mean a rig or unit mistake. Matches the range the engine accepts for a
/// friction input (common practice).
pub const PLAUSIBLE_FRICTION: (f64, f64) = (0.02, 0.6);

/// Values read at one instant of a tightening test.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Measurement {
    pub clamp_force: Force,
    pub total_torque: Torque,
    /// Thread torque, when the rig measures it separately.
    pub thread_torque: Option<Torque>,
}

/// One sample of a recorded tightening curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvePoint {
    pub clamp_force: Force,
    pub total_torque: Torque,
    pub thread_torque: Option<Torque>,
    pub angle: Option<Angle>,
}

/// What the rig recorded for one specimen.
#[derive(Debug, Clone, PartialEq)]
pub enum SpecimenRecord {
    /// Values at the evaluation point, read off by the rig.
    Point(Measurement),
    /// A sampled curve; read at the evaluation clamp force.
    Curve(Vec<CurvePoint>),
}

/// The geometry the formulas need, taken from the thread and the bearing.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct JointGeometry {
    pub nominal_diameter: Length,
    pub pitch: Length,
    pub pitch_diameter: Length,
    /// Included flank angle β (60° for ISO metric and Unified threads).
    pub flank_angle: Angle,
    /// Mean bearing diameter D_b = (d_o + d_i)/2; `None` with a thrust bearing.
    pub bearing_mean_diameter: Option<Length>,
    /// A thrust bearing under the turned part: no bearing friction.
    pub thrust_bearing: bool,
}

impl JointGeometry {
    /// Geometry from an engine thread and (unless a thrust bearing is used)
    /// the bearing surface under the turned part.
    pub fn new(
        thread: &ThreadGeometry,
        bearing: Option<&BearingSurface>,
        thrust_bearing: bool,
    ) -> Result<Self, EngineError> {
        let bearing_mean_diameter =
            match (bearing, thrust_bearing) {
                (Some(b), _) => {
                    let (outer, inner) = (b.outer_diameter.value, b.inner_diameter.value);
                    if !(outer.is_finite() && inner.is_finite() && inner >= 0.0 && outer > inner) {
                        return Err(EngineError::invalid(
                        "bearing",
                        "the outer bearing diameter must be larger than the inner one, both finite",
                    ));
                    }
                    Some(b.friction_diameter())
                }
                (None, true) => None,
                (None, false) => return Err(EngineError::invalid(
                    "bearing",
                    "a bearing (head and hole, or outer and inner diameter) is required unless \
                     thrust_bearing is true",
                )),
            };
        Ok(Self {
            nominal_diameter: thread.nominal_diameter,
            pitch: thread.pitch,
            pitch_diameter: thread.pitch_diameter,
            flank_angle: thread.flank_angle,
            bearing_mean_diameter,
            thrust_bearing,
        })
    }

    /// c = 1/(2·cos(β/2)): 0.577 for a 60° thread (ISO 16047, formula form
    /// recalled from memory; generalised to any flank angle).
    pub fn flank_factor(&self) -> f64 {
        1.0 / (2.0 * (self.flank_angle.value / 2.0).cos())
    }

    /// Torque split for given friction values by the ISO 16047 relation:
    /// returns (thread torque, total torque). With a thrust bearing the
    /// bearing share is zero. Used for round trips and for proposals.
    pub fn torques_for(
        &self,
        clamp_force: Force,
        thread_friction: f64,
        bearing_friction: f64,
    ) -> (Torque, Torque) {
        let f = clamp_force.value;
        let pitch_share = self.pitch.value / (2.0 * std::f64::consts::PI);
        let thread =
            f * (pitch_share + thread_friction * self.flank_factor() * self.pitch_diameter.value);
        let bearing = match (self.thrust_bearing, self.bearing_mean_diameter) {
            (false, Some(db)) => f * bearing_friction * db.value / 2.0,
            _ => 0.0,
        };
        (newton_metres(thread), newton_metres(thread + bearing))
    }
}

fn newton_metres(value: f64) -> Torque {
    Torque::new::<uom::si::torque::newton_meter>(value)
}

/// Which record form a specimen's result came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum SpecimenForm {
    Full,
    Shop,
    ThrustBearing,
}

/// The coefficients a series reports, with their API names.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Coefficient {
    ThreadFriction,
    BearingFriction,
    TotalFriction,
    NutFactor,
    Efficiency,
}

impl Coefficient {
    pub const ALL: [Coefficient; 5] = [
        Self::ThreadFriction,
        Self::BearingFriction,
        Self::TotalFriction,
        Self::NutFactor,
        Self::Efficiency,
    ];

    pub fn name(self) -> &'static str {
        match self {
            Self::ThreadFriction => "thread_friction",
            Self::BearingFriction => "bearing_friction",
            Self::TotalFriction => "total_friction",
            Self::NutFactor => "nut_factor",
            Self::Efficiency => "efficiency",
        }
    }
}

/// The evaluation of one specimen. A coefficient the record cannot give is
/// `None`, never invented.
#[derive(Debug, Clone, PartialEq)]
pub struct SpecimenResult {
    pub form: SpecimenForm,
    /// True when the values were read from a curve by interpolation.
    pub from_curve: bool,
    /// The values the coefficients were computed from.
    pub clamp_force: Force,
    pub total_torque: Torque,
    pub thread_torque: Option<Torque>,
    /// Angle at the evaluation point, when the curve has angles.
    pub angle: Option<Angle>,
    pub thread_friction: Option<f64>,
    pub bearing_friction: Option<f64>,
    pub total_friction: Option<f64>,
    pub nut_factor: f64,
    pub efficiency: f64,
    /// Coefficients in which this specimen is an outlier by [`OUTLIER_RULE`].
    pub outlier_in: Vec<Coefficient>,
}

impl SpecimenResult {
    pub fn coefficient(&self, c: Coefficient) -> Option<f64> {
        match c {
            Coefficient::ThreadFriction => self.thread_friction,
            Coefficient::BearingFriction => self.bearing_friction,
            Coefficient::TotalFriction => self.total_friction,
            Coefficient::NutFactor => Some(self.nut_factor),
            Coefficient::Efficiency => Some(self.efficiency),
        }
    }
}

/// A test series to evaluate.
#[derive(Debug, Clone, PartialEq)]
pub struct SeriesInput {
    pub joint: JointGeometry,
    /// Clamp force at which curves are read; defaults to
    /// [`EVALUATION_FRACTION_OF_PROOF_LOAD`] of `proof_load`.
    pub evaluation_clamp_force: Option<Force>,
    /// Proof load of the fastener (S_p·A_s), for the default evaluation force.
    pub proof_load: Option<Force>,
    pub specimens: Vec<SpecimenRecord>,
}

/// A remark about the series as a whole.
#[derive(Debug, Clone, PartialEq, Eq, serde::Serialize)]
pub struct Warning {
    /// Machine-readable code, e.g. `series_too_small`.
    pub code: &'static str,
    pub message: String,
}

/// The evaluation of a whole series.
#[derive(Debug, Clone, PartialEq)]
pub struct SeriesEvaluation {
    /// The clamp force curves were read at (when any specimen is a curve,
    /// or when one was given).
    pub evaluation_clamp_force: Option<Force>,
    pub specimens: Vec<SpecimenResult>,
    pub statistics: SeriesStatistics,
    pub warnings: Vec<Warning>,
}

/// Every problem found in a series, each naming its specimen and field
/// (e.g. `specimens[3].thread_torque`). Rendered as one 422.
#[derive(Debug, Clone, PartialEq)]
pub struct CalibrationErrors(pub Vec<EngineError>);

impl fmt::Display for CalibrationErrors {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let parts: Vec<String> = self.0.iter().map(ToString::to_string).collect();
        write!(f, "{}", parts.join("; "))
    }
}

impl std::error::Error for CalibrationErrors {}

impl From<EngineError> for CalibrationErrors {
    fn from(e: EngineError) -> Self {
        Self(vec![e])
    }
}

/// Evaluate a series: every specimen, then the statistics. Either the whole
/// series evaluates, or every problem found is returned.
pub fn evaluate_series(input: &SeriesInput) -> Result<SeriesEvaluation, CalibrationErrors> {
    let mut errors = Vec::new();
    if input.specimens.is_empty() {
        errors.push(EngineError::invalid(
            "specimens",
            "a series needs at least one specimen",
        ));
    }
    let evaluation_clamp_force = resolve_evaluation_force(input, &mut errors);
    let mut specimens = Vec::with_capacity(input.specimens.len());
    for (index, record) in input.specimens.iter().enumerate() {
        let measured = match record {
            SpecimenRecord::Point(m) => Some((*m, None, false)),
            SpecimenRecord::Curve(points) => match evaluation_clamp_force {
                Some(fe) => curve::read_at(points, fe, index, &mut errors)
                    .map(|(m, angle)| (m, angle, true)),
                // The missing evaluation force is already reported.
                None => None,
            },
        };
        if let Some((m, angle, from_curve)) = measured {
            if let Some(result) =
                specimen::evaluate(&input.joint, &m, angle, from_curve, index, &mut errors)
            {
                specimens.push(result);
            }
        }
    }
    if !errors.is_empty() {
        return Err(CalibrationErrors(errors));
    }
    let statistics = statistics::summarise(&mut specimens);
    let warnings = series_warnings(&specimens, &statistics);
    Ok(SeriesEvaluation {
        evaluation_clamp_force,
        specimens,
        statistics,
        warnings,
    })
}

fn resolve_evaluation_force(input: &SeriesInput, errors: &mut Vec<EngineError>) -> Option<Force> {
    let has_curve = input
        .specimens
        .iter()
        .any(|s| matches!(s, SpecimenRecord::Curve(_)));
    let given = match input.evaluation_clamp_force {
        Some(f) if !(f.value.is_finite() && f.value > 0.0) => {
            errors.push(EngineError::invalid(
                "evaluation_clamp_force",
                "must be a finite clamp force above zero",
            ));
            return None;
        }
        Some(f) => Some(f),
        None => input
            .proof_load
            .filter(|p| p.value.is_finite() && p.value > 0.0)
            .map(|p| p * EVALUATION_FRACTION_OF_PROOF_LOAD),
    };
    if has_curve && given.is_none() {
        errors.push(EngineError::invalid(
            "evaluation_clamp_force",
            "curves need an evaluation clamp force: give one, or a property class so that 75 % \
             of the proof load can be used (ISO 16047)",
        ));
    }
    given
}
