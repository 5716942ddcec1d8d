//! Wire types of the friction-test use cases: the series as posted (the
//! HTTP body, built from a CSV file by the CLI) and its evaluation as
//! answered (the HTTP answer, printed by the CLI). The names `thread`,
//! `property_class`, `finish`, `lubricant`, `head`, `hole`, `bearing`
//! (`outer_diameter`, `inner_diameter`), `thrust_bearing` and `specimens`
//! (`clamp_force`, `total_torque`, `thread_torque`) are fixed: test rigs and
//! other systems post them.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use crate::app::quantity::Quantity;

/// A torque–tension test series as posted.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct SeriesRequest {
    /// Thread designation, e.g. `M10` or `3/4-10 UNC`.
    pub thread: String,
    /// Property class of the tested bolts, e.g. `8.8`; needed for the default
    /// evaluation clamp force of curves (75 % of the proof load).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub property_class: Option<String>,
    /// Catalogue finish id; required to store the series.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub finish: Option<String>,
    /// Catalogue lubricant id; required to store the series.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub lubricant: Option<String>,
    /// Head type under which the bearing turns (e.g. `hexagon-head`); with `hole`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub head: Option<String>,
    /// Washer under the head (`none` or `plain`); with `head`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub washer: Option<String>,
    /// Clearance hole series (`fine`, `medium`, `coarse`); with `head`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub hole: Option<String>,
    /// Bearing diameters measured on the rig; instead of `head` and `hole`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bearing: Option<BearingRequest>,
    /// A thrust bearing under the turned part: the measured torque is thread
    /// torque and bearing friction is not measured.
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub thrust_bearing: bool,
    /// Clamp force at which curves are read; default 75 % of the proof load.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub evaluation_clamp_force: Option<Quantity>,
    /// One record per specimen, in test order.
    pub specimens: Vec<SpecimenRequest>,
    /// Free text kept with a stored series (rig, batch, date).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub notes: Option<String>,
}

/// Bearing diameters under the turned part.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BearingRequest {
    pub outer_diameter: Quantity,
    pub inner_diameter: Quantity,
}

/// One specimen: values at the evaluation point, or a sampled `curve`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct SpecimenRequest {
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub clamp_force: Option<Quantity>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub total_torque: Option<Quantity>,
    /// Thread torque, where the rig measures it separately.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thread_torque: Option<Quantity>,
    /// Samples of the tightening curve, in order of rising clamp force.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub curve: Option<Vec<CurvePointRequest>>,
}

/// One sample of a tightening curve.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct CurvePointRequest {
    pub clamp_force: Quantity,
    pub total_torque: Quantity,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thread_torque: Option<Quantity>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub angle: Option<Quantity>,
}

/// The evaluation of a series.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct EvaluationResponse {
    pub thread: String,
    pub property_class: Option<String>,
    pub finish: Option<String>,
    pub lubricant: Option<String>,
    pub thrust_bearing: bool,
    pub geometry: GeometryResponse,
    /// Clamp force the curves were read at (null when no curve was posted
    /// and none was given).
    pub evaluation_clamp_force: Option<Quantity>,
    /// Per specimen, in the posted order.
    pub specimens: Vec<SpecimenResponse>,
    pub statistics: StatisticsResponse,
    /// How the numbers were obtained.
    pub method: MethodResponse,
    pub warnings: Vec<WarningResponse>,
    pub cautions: Vec<String>,
}

/// The geometry used by the formulas.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct GeometryResponse {
    pub nominal_diameter: Quantity,
    pub pitch: Quantity,
    pub pitch_diameter: Quantity,
    pub flank_angle: Quantity,
    /// c = 1/(2·cos(β/2)) in μ_th = (T_th/F − P/(2π))/(c·d2): 0.577 for 60°.
    pub flank_factor: f64,
    /// Mean bearing diameter D_b = (d_o + d_i)/2; null with a thrust bearing.
    pub bearing_mean_diameter: Option<Quantity>,
    /// Where the bearing diameters came from.
    pub bearing_source: Option<String>,
    /// Proof load of the bolt, when the property class is given.
    pub proof_load: Option<Quantity>,
}

/// One specimen's coefficients; null where the record cannot give them.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct SpecimenResponse {
    /// `full`, `shop` or `thrust_bearing`.
    pub form: String,
    /// True when read from a curve at the evaluation clamp force.
    pub from_curve: bool,
    pub clamp_force: Quantity,
    pub total_torque: Quantity,
    pub thread_torque: Option<Quantity>,
    pub angle: Option<Quantity>,
    pub thread_friction: Option<f64>,
    pub bearing_friction: Option<f64>,
    pub total_friction: Option<f64>,
    pub nut_factor: f64,
    pub efficiency: f64,
    /// Coefficients in which this specimen is flagged as an outlier.
    pub outlier_in: Vec<String>,
}

/// Statistics per coefficient; null where no specimen gives it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct StatisticsResponse {
    pub thread_friction: Option<CoefficientStatisticsResponse>,
    pub bearing_friction: Option<CoefficientStatisticsResponse>,
    pub total_friction: Option<CoefficientStatisticsResponse>,
    pub nut_factor: Option<CoefficientStatisticsResponse>,
    pub efficiency: Option<CoefficientStatisticsResponse>,
}

/// Spread of one coefficient.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct CoefficientStatisticsResponse {
    pub count: usize,
    pub mean: f64,
    /// Sample standard deviation (n − 1); null for one value.
    pub std_dev: Option<f64>,
    pub min: f64,
    pub max: f64,
    pub mean_minus_3_sigma: Option<f64>,
    pub mean_plus_3_sigma: Option<f64>,
    /// Indexes of the specimens flagged as outliers.
    pub outliers: Vec<usize>,
}

/// The rules applied, stated.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct MethodResponse {
    pub evaluation: String,
    pub evaluation_point: String,
    pub std_dev: String,
    pub outliers: String,
    pub minimum_series_size: usize,
}

/// A remark about the series.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
pub struct WarningResponse {
    pub code: String,
    pub message: String,
}
