//! The parts of a spec response, each a wire type with quantities as
//! `{"value", "unit"}`.

use serde::Serialize;
use utoipa::ToSchema;

use crate::app::quantity::Quantity;

/// The torque window to set, or (angle- and yield-controlled methods) the
/// torque band to monitor.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct TorqueOut {
    /// `setting` (the tool controls torque) or `monitoring` (torque-angle and
    /// yield-controlled tightening: the band a good joint's final torque
    /// lies in, not a value to set).
    pub role: &'static str,
    /// Lowest acceptable torque: target·(1 − s); for a monitoring band its
    /// lower end.
    pub lower: Quantity,
    /// Torque to set on the tool: upper/(1 + s); for a monitoring band its
    /// middle.
    pub target: Quantity,
    /// Highest acceptable torque; with single friction values and no tool
    /// scatter this is VDI 2230's tightening torque M_A. For a monitoring
    /// band its upper end.
    pub upper: Quantity,
    /// Yield-limited torque at minimum friction (equals `upper` unless a
    /// required clamp load chose a lower window); for a monitoring band its
    /// upper end.
    pub upper_limit: Quantity,
}

/// The assembly preload the window gives (angle- and yield-controlled
/// methods: the preload their own model gives).
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct PreloadOut {
    /// At the lower torque and maximum friction.
    pub min: Quantity,
    /// At the upper torque and minimum friction; with single friction values
    /// and no tool scatter this is VDI 2230's F_M,zul.
    pub max: Quantity,
    /// F_M,zul at minimum thread friction (VDI 2230 Part 1).
    pub permissible: Quantity,
}

/// The angle window from snug torque, or why it was not computed.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct AngleOut {
    pub computed: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub min: Option<Quantity>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max: Option<Quantity>,
    /// Angle from snug at which the bolt may first yield: a limit, never a target.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub at_yield: Option<Quantity>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub snug_torque: Option<Quantity>,
    /// `given`, or `default` (30 % of the target torque, common practice).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub snug_torque_source: Option<&'static str>,
    /// Why the angle was not computed.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub reason: Option<String>,
}

/// The tightening method and tool scatter used.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct MethodOut {
    pub id: &'static str,
    pub name: &'static str,
    /// Tool scatter ±s as a fraction (0.05 = ±5 %).
    pub tool_scatter: f64,
    /// `given` or `default` (the method's).
    pub tool_scatter_source: &'static str,
    /// Where the method's default scatter comes from.
    pub scatter_reference: &'static str,
    /// VDI 2230 Part 1 Table A8 tightening-factor range of this kind of method.
    pub table_a8_tightening_factor: [f64; 2],
    /// True when the tool controls torque; false when torque is only monitored.
    pub torque_controlled: bool,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct ThreadOut {
    pub designation: String,
    pub form: &'static str,
    pub series: &'static str,
    pub nominal_diameter: Quantity,
    pub pitch: Quantity,
    pub pitch_diameter: Quantity,
    pub minor_diameter: Quantity,
    pub stress_area: Quantity,
    pub flank_angle: Quantity,
    pub custom: bool,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct GradeOut {
    pub id: String,
    pub standard: String,
    pub tensile_strength_min: Quantity,
    pub yield_strength_min: Quantity,
    /// `lower_yield`, `proof_strength02`, `full_size_rpf` or `inch_yield`.
    pub yield_basis: &'static str,
    pub proof_stress: Quantity,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct BearingOut {
    pub outer_diameter: Quantity,
    pub inner_diameter: Quantity,
    /// Diameter the bearing friction acts at: D_Km = (d_w + d_h)/2 on a flat
    /// face; D_Km/sin 45° on a countersunk head's 90° conical seat.
    pub mean_diameter: Quantity,
    pub source: String,
    /// Surface pressure under the head or nut at preload max.
    pub surface_pressure: Quantity,
}

/// The fastener: thread geometry, grade strengths and loads.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FastenerOut {
    pub thread: ThreadOut,
    /// Convenience copy of `thread.stress_area`.
    pub stress_area: Quantity,
    pub property_class: GradeOut,
    /// Proof load Sp·As.
    pub proof_load: Quantity,
    /// Yield load Rp·As (tension only).
    pub yield_load: Quantity,
    pub bearing: BearingOut,
}

/// A catalogue entry a friction value came from.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct CatalogueEntryRef {
    pub id: i64,
    /// Catalogue revision of the entry's last change.
    pub revision: i64,
    /// The entry's published source.
    pub source: String,
}

/// One friction range used, and where it came from.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FrictionSideOut {
    pub min: f64,
    pub max: f64,
    /// `catalogue` (the entry in `friction.catalogue_entry`) or `request`
    /// (given in the request).
    pub origin: &'static str,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FrictionOut {
    /// Thread friction μ_G (VDI 2230 notation).
    pub thread: FrictionSideOut,
    /// Bearing friction μ_K under the turning head or nut.
    pub bearing: FrictionSideOut,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub finish: Option<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub lubricant: Option<String>,
    /// The catalogue entry the `catalogue` values came from (one entry
    /// gives both thread and bearing friction).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub catalogue_entry: Option<CatalogueEntryRef>,
    /// The catalogue revision the look-up used.
    pub catalogue_revision: i64,
    /// Why that catalogue entry applies: the joint tag it is limited to,
    /// or absent for the generic entry (present when `catalogue_entry` is).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub scope: Option<FrictionScopeOut>,
    /// Provenance in words.
    pub source: String,
}

/// Why a catalogue entry was used: the most specific active entry wins
/// (an entry limited to one of the joint's tags over the generic entry).
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FrictionScopeOut {
    /// The joint tag the entry is limited to; absent for the generic entry.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub joint_tag: Option<String>,
    /// The reason in words.
    pub reason: String,
}

/// Shares of the torque (fractions summing to 1).
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct TorqueSplitOut {
    /// Share that stretches the bolt (tightening efficiency).
    pub pitch: f64,
    pub thread_friction: f64,
    pub bearing_friction: f64,
    pub prevailing: f64,
}

/// Figures at one friction corner and the target torque.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FiguresOut {
    pub thread_friction: f64,
    pub bearing_friction: f64,
    pub preload_at_target: Quantity,
    pub torque_split: TorqueSplitOut,
    /// Nut factor K = M/(F·d), prevailing torque excluded.
    pub nut_factor: f64,
    /// μ_tot: the single friction giving the same torque.
    pub total_friction: f64,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct FiguresPair {
    pub at_min_friction: FiguresOut,
    pub at_max_friction: FiguresOut,
}

#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct ClampLoadOut {
    pub required: Quantity,
    /// Clamp load at the low end of the window: the preload there, less the
    /// embedding loss where the joint is described.
    pub achieved_min: Quantity,
    /// F_Z taken off (VDI 2230 Part 1); absent without the joint model.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub embedding_loss: Option<Quantity>,
    pub margin: Quantity,
    pub met: bool,
}
