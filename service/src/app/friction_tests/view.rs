//! From the engine's evaluation to the wire answer, in SI or US units
//! (torque in lbf·in for US units, see `units`).

use super::parse::ParsedSeries;
use super::units;
use super::wire::{
    CoefficientStatisticsResponse, EvaluationResponse, GeometryResponse, MethodResponse,
    SeriesRequest, SpecimenResponse, StatisticsResponse, WarningResponse,
};
use crate::app::quantity::{Quantity, Units};
use crate::engine::calibration::{
    CoefficientStatistics, SeriesEvaluation, SpecimenForm, SpecimenResult,
    EVALUATION_FRACTION_OF_PROOF_LOAD, MINIMUM_SERIES_SIZE, OUTLIER_RULE, STD_DEV_RULE,
};

/// Cautions every evaluation carries.
pub const CAUTIONS: [&str; 3] = [
    "Friction coefficients from a test series describe the parts, finish, lubricant and rig \
     of that series only; other batches can differ.",
    "Torque values derived from them are engineering estimates: confirm by joint tests on the \
     real parts (ISO 16047) and by tool capability tests.",
    "The drawing, local codes and licensed engineering practice take precedence.",
];

pub fn evaluation(
    req: &SeriesRequest,
    parsed: &ParsedSeries,
    eval: &SeriesEvaluation,
    u: Units,
) -> EvaluationResponse {
    let joint = &parsed.input.joint;
    EvaluationResponse {
        thread: parsed.thread.designation.clone(),
        property_class: parsed.strength.as_ref().map(|s| s.id.clone()),
        finish: req.finish.clone(),
        lubricant: req.lubricant.clone(),
        thrust_bearing: joint.thrust_bearing,
        geometry: GeometryResponse {
            nominal_diameter: Quantity::length(joint.nominal_diameter, u),
            pitch: Quantity::length(joint.pitch, u),
            pitch_diameter: Quantity::length(joint.pitch_diameter, u),
            flank_angle: Quantity::angle(joint.flank_angle),
            flank_factor: joint.flank_factor(),
            bearing_mean_diameter: joint.bearing_mean_diameter.map(|d| Quantity::length(d, u)),
            bearing_source: parsed.bearing.as_ref().map(|b| b.source.clone()),
            proof_load: parsed.input.proof_load.map(|f| Quantity::force(f, u)),
        },
        evaluation_clamp_force: eval.evaluation_clamp_force.map(|f| Quantity::force(f, u)),
        specimens: eval.specimens.iter().map(|s| specimen(s, u)).collect(),
        statistics: StatisticsResponse {
            thread_friction: eval.statistics.thread_friction.as_ref().map(statistics),
            bearing_friction: eval.statistics.bearing_friction.as_ref().map(statistics),
            total_friction: eval.statistics.total_friction.as_ref().map(statistics),
            nut_factor: eval.statistics.nut_factor.as_ref().map(statistics),
            efficiency: eval.statistics.efficiency.as_ref().map(statistics),
        },
        method: MethodResponse {
            evaluation: "ISO 16047 (formula form recalled from memory, ISO 16047:2005 §8): \
                         μ_th = (T_th/F − P/(2π))/(c·d2), μ_b = (T − T_th)/(F·D_b/2), \
                         μ_tot = (T/F − P/(2π))/(c·d2 + D_b/2), c = 1/(2·cos(β/2)); \
                         K = T/(F·d); efficiency = F·P/(2π·T)"
                .into(),
            evaluation_point: format!(
                "curves are read at evaluation_clamp_force, by default {:.0} % of the proof \
                 load (ISO 16047), by linear interpolation where the clamp force first \
                 reaches it",
                EVALUATION_FRACTION_OF_PROOF_LOAD * 100.0
            ),
            std_dev: STD_DEV_RULE.into(),
            outliers: OUTLIER_RULE.into(),
            minimum_series_size: MINIMUM_SERIES_SIZE,
        },
        warnings: eval
            .warnings
            .iter()
            .map(|w| WarningResponse {
                code: w.code.into(),
                message: w.message.clone(),
            })
            .collect(),
        cautions: CAUTIONS.iter().map(|c| (*c).to_owned()).collect(),
    }
}

fn form_name(form: SpecimenForm) -> &'static str {
    match form {
        SpecimenForm::Full => "full",
        SpecimenForm::Shop => "shop",
        SpecimenForm::ThrustBearing => "thrust_bearing",
    }
}

fn specimen(s: &SpecimenResult, u: Units) -> SpecimenResponse {
    SpecimenResponse {
        form: form_name(s.form).into(),
        from_curve: s.from_curve,
        clamp_force: Quantity::force(s.clamp_force, u),
        total_torque: units::torque(s.total_torque, u),
        thread_torque: s.thread_torque.map(|t| units::torque(t, u)),
        angle: s.angle.map(Quantity::angle),
        thread_friction: s.thread_friction,
        bearing_friction: s.bearing_friction,
        total_friction: s.total_friction,
        nut_factor: s.nut_factor,
        efficiency: s.efficiency,
        outlier_in: s.outlier_in.iter().map(|c| c.name().to_owned()).collect(),
    }
}

fn statistics(s: &CoefficientStatistics) -> CoefficientStatisticsResponse {
    CoefficientStatisticsResponse {
        count: s.count,
        mean: s.mean,
        std_dev: s.std_dev,
        min: s.min,
        max: s.max,
        mean_minus_3_sigma: s.mean_minus_3_sigma,
        mean_plus_3_sigma: s.mean_plus_3_sigma,
        outliers: s.outliers.clone(),
    }
}
