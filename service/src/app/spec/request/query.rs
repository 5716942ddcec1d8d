//! The flat query strings of the GET look-ups and their conversion into a
//! [`SpecRequest`].

use clap::Args;
use serde::Deserialize;
use utoipa::IntoParams;

use crate::engine::bearing::{HeadType, HoleSeries, Washer};

use super::flat::{bolt_from_query, friction_from_query, loads_from_query, FlatLoads};
use super::joint::clamped_parts_from_query;
use super::{BearingInput, SpecRequest};
use super::{NutRequest, TappedPartRequest};
use crate::app::quantity::Quantity;
use crate::app::quantity::Units;
use crate::app::FieldProblem;

mod value;
pub use value::quantity_from_query;

/// Help text listing every value of a `--head`, `--washer` or `--hole`
/// flag (the same lists `/v1/bearing-types` serves).
fn choices<T: Copy>(what: &str, all: &[T], id: fn(T) -> &'static str) -> String {
    let ids: Vec<&str> = all.iter().map(|v| id(*v)).collect();
    format!("{what}: {} (see GET /v1/bearing-types)", ids.join(", "))
}

/// THE declaration of the spec parameters in their flat form: declares a
/// struct with every spec parameter plus `$extra` fields, read as a GET
/// query (serde, `deny_unknown_fields`), documented as query parameters
/// (`IntoParams`) and parsed as command-line flags (`clap::Args`, `--`
/// and the name with `-` for `_`), and its one conversion into a
/// [`SpecRequest`]. A macro rather than `#[serde(flatten)]`: flattening
/// loses `deny_unknown_fields` and the numbers of a urlencoded query.
macro_rules! spec_query {
    ($(#[$meta:meta])* $name:ident { $($(#[$fmeta:meta])* $extra:ident : $ety:ty,)* }) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Default, Deserialize, IntoParams, Args)]
        #[serde(deny_unknown_fields)]
        #[into_params(parameter_in = Query)]
        pub struct $name {
            /// Thread designation, e.g. `M10`, `M10x1.25`, `1/2-13 UNC`.
            #[param(example = "M10")]
            #[arg(long)]
            pub thread: String,
            /// Property class or grade, e.g. `8.8`, `A2-70`.
            #[param(example = "8.8")]
            #[arg(long)]
            pub property_class: String,
            /// Finish id from the friction catalogue; required (with
            /// `lubricant`) unless thread and bearing friction are both
            /// given directly (422 naming it otherwise).
            #[arg(long)]
            pub finish: Option<String>,
            /// Lubricant id from the friction catalogue; required (with
            /// `finish`) unless thread and bearing friction are both given
            /// directly (422 naming it otherwise).
            #[arg(long)]
            pub lubricant: Option<String>,
            /// One thread friction value μ_G (replaces the catalogue's).
            #[arg(long)]
            pub thread_friction: Option<f64>,
            /// Lower end of a thread friction range (with `thread_friction_max`).
            #[arg(long)]
            pub thread_friction_min: Option<f64>,
            /// Upper end of a thread friction range.
            #[arg(long)]
            pub thread_friction_max: Option<f64>,
            /// One bearing friction value μ_K (replaces the catalogue's).
            #[arg(long)]
            pub bearing_friction: Option<f64>,
            /// Lower end of a bearing friction range (with `bearing_friction_max`).
            #[arg(long)]
            pub bearing_friction_min: Option<f64>,
            /// Upper end of a bearing friction range.
            #[arg(long)]
            pub bearing_friction_max: Option<f64>,
            /// Tightening method id; default `click-wrench`.
            #[arg(long)]
            pub tightening_method: Option<String>,
            /// Tool scatter as a fraction (0.05 = ±5 %).
            #[arg(long)]
            pub tool_scatter: Option<f64>,
            /// Head type; default `hexagon-head`.
            #[arg(long, help = choices("Head type", HeadType::ALL, HeadType::id))]
            pub head: Option<String>,
            /// Washer: `none` (default) or `plain`.
            #[arg(long, help = choices("Washer", Washer::ALL, Washer::id))]
            pub washer: Option<String>,
            /// Clearance-hole series: `fine`, `medium` (default), `coarse`.
            #[arg(long, help = choices("Clearance-hole series", HoleSeries::ALL, HoleSeries::id))]
            pub hole: Option<String>,
            /// Explicit outer bearing diameter with unit, e.g. `16.6mm`.
            #[arg(long)]
            pub bearing_outer_diameter: Option<String>,
            /// Explicit inner bearing diameter with unit, e.g. `11mm`.
            #[arg(long)]
            pub bearing_inner_diameter: Option<String>,
            /// Utilisation ν of the minimum yield strength; default 0.9.
            #[arg(long)]
            pub utilisation: Option<f64>,
            /// Prevailing torque with unit, e.g. `2N·m`.
            #[arg(long)]
            pub prevailing_torque: Option<String>,
            /// Clamp length with unit, e.g. `40mm`.
            #[arg(long)]
            pub clamp_length: Option<String>,
            /// Clamped-part material id.
            #[arg(long)]
            pub clamped_material: Option<String>,
            /// Outer diameter of the clamped parts with unit, e.g. `30mm`.
            #[arg(long)]
            pub joint_outer_diameter: Option<String>,
            /// `through-bolted` (default) or `tapped-hole`.
            #[arg(long)]
            pub joint_type: Option<String>,
            /// Thread engagement length in a tapped hole with unit, e.g. `15mm`.
            #[arg(long)]
            pub engagement_length: Option<String>,
            /// Required minimum clamp load with unit, e.g. `15kN`.
            #[arg(long)]
            pub required_clamp_load: Option<String>,
            /// `maximum-preload` (default) or `minimum-clamp-load`.
            #[arg(long)]
            pub window_mode: Option<String>,
            /// Bolt product standard (`iso-4014`, `iso-4017`, `iso-4762`,
            /// `asme-b18.2.1`), with `bolt_length`; the thread length then
            /// comes from the standard. Reduced shank sections can be given
            /// only in the POST body (`bolt.shank_sections`).
            #[arg(long)]
            pub bolt_standard: Option<String>,
            /// Bolt length under the head with unit, e.g. `60mm`; with
            /// `bolt_standard` or `bolt_thread_length`.
            #[arg(long)]
            pub bolt_length: Option<String>,
            /// Bolt thread length with unit, e.g. `30mm` (without
            /// `bolt_standard`).
            #[arg(long)]
            pub bolt_thread_length: Option<String>,
            /// The clamped stack from under the head as `THICKNESS:MATERIAL`
            /// pairs separated by commas, e.g. `7.5mm:steel-s355,7.5mm:steel-s355`
            /// (1 to 16 layers; not with `clamp_length` or `clamped_material`).
            #[arg(long)]
            pub clamped_parts: Option<String>,
            /// Surface roughness Rz with unit, e.g. `16µm` or `16um`; default
            /// 16 µm (VDI 2230 Part 1 Table 5 class 10 to below 40 µm).
            #[arg(long)]
            pub roughness_rz: Option<String>,
            /// Largest axial working load per bolt with unit, e.g. `8kN`.
            #[arg(long)]
            pub loads_axial: Option<String>,
            /// Smallest axial working load with unit (alternating load; default 0).
            #[arg(long)]
            pub loads_axial_min: Option<String>,
            /// Transverse load per bolt with unit, e.g. `2kN`.
            #[arg(long)]
            pub loads_transverse: Option<String>,
            /// Torsion about the bolt axis with unit, e.g. `50N·m`.
            #[arg(long)]
            pub loads_torsion: Option<String>,
            /// Friction radius of the torsion with unit, e.g. `40mm`.
            #[arg(long)]
            pub loads_torsion_radius: Option<String>,
            /// Interfaces carrying the transverse load (1 to 32; default 1).
            #[serde(default, deserialize_with = "crate::app::reading::integral")]
            #[param(minimum = 1, maximum = 32)]
            #[arg(long)]
            pub loads_interfaces: Option<i64>,
            /// Friction at those interfaces (0.02 to 1).
            #[arg(long)]
            pub loads_interface_friction: Option<f64>,
            /// Clamp load a seal needs, with unit, e.g. `5kN`.
            #[arg(long)]
            pub loads_sealing_clamp_load: Option<String>,
            /// Load-introduction factor n in (0, 1]; default 0.5.
            #[arg(long)]
            pub load_introduction: Option<f64>,
            /// `rolled-before-heat-treatment` (default) or
            /// `rolled-after-heat-treatment`.
            #[arg(long)]
            pub thread_rolling: Option<String>,
            /// Snug torque with unit, e.g. `10N·m`.
            #[arg(long)]
            pub snug_torque: Option<String>,
            /// Material id of the tapped part of a tapped-hole joint
            /// (default: `clamped_material`), e.g. `aluminium-6082`.
            #[arg(long)]
            pub tapped_part_material: Option<String>,
            /// Property class of the nut (ISO 898-2 `8`, `10`, ...; SAE J995,
            /// ASTM A563), e.g. `iso-898-2-10`.
            #[arg(long)]
            pub nut_property_class: Option<String>,
            /// Permissible tightening torque from a joint test with unit,
            /// e.g. `1.2N·m`; required for plastics and threaded inserts.
            #[arg(long)]
            pub permissible_torque: Option<String>,
            /// The joint's tags separated by commas, e.g. `k4-rear-axle,station-12`:
            /// a friction entry limited to one of them wins over the generic
            /// entry (a tag holding a comma can be given only in the POST body).
            #[arg(long)]
            pub joint_tags: Option<String>,
            /// Units of the response: `si` (default) or `us`.
            #[arg(long, value_enum)]
            pub units: Option<Units>,
            /// Catalogue revision to answer from; default the current one.
            #[serde(default, deserialize_with = "crate::app::reading::integral")]
            #[param(minimum = 1)]
            #[arg(long)]
            pub catalogue_revision: Option<i64>,
            $($(#[$fmeta])* pub $extra: $ety,)*
        }

        impl $name {
            /// The equivalent full request; every problem found is returned.
            pub fn to_request(&self) -> Result<SpecRequest, Vec<FieldProblem>> {
                let mut problems = Vec::new();
                let thread_friction = friction_from_query(
                    "thread_friction",
                    self.thread_friction,
                    self.thread_friction_min,
                    self.thread_friction_max,
                    &mut problems,
                );
                let bearing_friction = friction_from_query(
                    "bearing_friction",
                    self.bearing_friction,
                    self.bearing_friction_min,
                    self.bearing_friction_max,
                    &mut problems,
                );
                let mut q = |field: &str, v: &Option<String>| -> Option<Quantity> {
                    let text = v.as_deref()?;
                    match quantity_from_query(field, text) {
                        Ok(q) => Some(q),
                        Err(e) => {
                            problems.push(e);
                            None
                        }
                    }
                };
                let outer = q("bearing_outer_diameter", &self.bearing_outer_diameter);
                let inner = q("bearing_inner_diameter", &self.bearing_inner_diameter);
                let prevailing_torque = q("prevailing_torque", &self.prevailing_torque);
                let clamp_length = q("clamp_length", &self.clamp_length);
                let joint_outer_diameter = q("joint_outer_diameter", &self.joint_outer_diameter);
                let engagement_length = q("engagement_length", &self.engagement_length);
                let required_clamp_load = q("required_clamp_load", &self.required_clamp_load);
                let snug_torque = q("snug_torque", &self.snug_torque);
                let permissible_torque = q("permissible_torque", &self.permissible_torque);
                let bolt_length = q("bolt_length", &self.bolt_length);
                let bolt_thread_length = q("bolt_thread_length", &self.bolt_thread_length);
                let roughness_rz = q("roughness_rz", &self.roughness_rz);
                let flat_loads = FlatLoads {
                    axial: q("loads_axial", &self.loads_axial),
                    axial_min: q("loads_axial_min", &self.loads_axial_min),
                    transverse: q("loads_transverse", &self.loads_transverse),
                    torsion: q("loads_torsion", &self.loads_torsion),
                    torsion_radius: q("loads_torsion_radius", &self.loads_torsion_radius),
                    interfaces: self.loads_interfaces,
                    interface_friction: self.loads_interface_friction,
                    sealing_clamp_load: q("loads_sealing_clamp_load", &self.loads_sealing_clamp_load),
                };
                let clamped_parts = match self.clamped_parts.as_deref().map(clamped_parts_from_query) {
                    Some(Ok(parts)) => Some(parts),
                    Some(Err(e)) => {
                        problems.push(e);
                        None
                    }
                    None => None,
                };
                let bolt = bolt_from_query(
                    self.bolt_standard.as_deref(),
                    self.bolt_length.is_some(),
                    bolt_length,
                    bolt_thread_length,
                    &mut problems,
                );
                let bearing = match (outer, inner) {
                    (Some(outer_diameter), Some(inner_diameter)) => Some(BearingInput {
                        outer_diameter,
                        inner_diameter,
                    }),
                    (None, None) => None,
                    (Some(_), None) => {
                        if self.bearing_inner_diameter.is_none() {
                            problems.push(FieldProblem::malformed(
                                "bearing_inner_diameter",
                                "give both bearing diameters or neither",
                            ));
                        }
                        None
                    }
                    (None, Some(_)) => {
                        if self.bearing_outer_diameter.is_none() {
                            problems.push(FieldProblem::malformed(
                                "bearing_outer_diameter",
                                "give both bearing diameters or neither",
                            ));
                        }
                        None
                    }
                };
                if !problems.is_empty() {
                    return Err(problems);
                }
                Ok(SpecRequest {
                    thread: self.thread.clone(),
                    property_class: self.property_class.clone(),
                    finish: self.finish.clone(),
                    lubricant: self.lubricant.clone(),
                    thread_friction,
                    bearing_friction,
                    tightening_method: self.tightening_method.clone(),
                    tool_scatter: self.tool_scatter,
                    head: self.head.clone(),
                    washer: self.washer.clone(),
                    hole: self.hole.clone(),
                    bearing,
                    utilisation: self.utilisation,
                    prevailing_torque,
                    clamp_length,
                    clamped_material: self.clamped_material.clone(),
                    joint_outer_diameter,
                    joint_type: self.joint_type.clone(),
                    engagement_length,
                    required_clamp_load,
                    window_mode: self.window_mode.clone(),
                    bolt,
                    clamped_parts,
                    roughness_rz,
                    loads: loads_from_query(flat_loads),
                    load_introduction: self.load_introduction,
                    thread_rolling: self.thread_rolling.clone(),
                    snug_torque,
                    tapped_part: self.tapped_part_material.clone().map(|material| {
                        TappedPartRequest { material }
                    }),
                    nut: self
                        .nut_property_class
                        .clone()
                        .map(|property_class| NutRequest { property_class }),
                    permissible_torque,
                    joint_tags: self
                        .joint_tags
                        .as_deref()
                        .map(|t| t.split(',').map(|s| s.trim().to_string()).collect()),
                    units: self.units,
                    catalogue_revision: self.catalogue_revision,
                })
            }
        }
    };
}

spec_query! {
    /// Query of `GET /v1/tightening-specs`.
    SpecQuery {}
}

spec_query! {
    /// Query of `GET /v1/setpoints`: the spec parameters plus the tool's
    /// torque unit and resolution.
    SetpointQuery {
        /// Torque unit: `N·m` (default; also `N.m`, `Nm`, `N*m`), `lbf·ft`
        /// (also `lbf.ft`, `lbf*ft`, `ft-lbf`) or `lbf·in` (also `lbf.in`,
        /// `lbf*in`, `in-lbf`). The middle dot may be URL-encoded (`%C2%B7`).
        #[arg(long)]
        torque_unit: Option<String>,
        /// Tool torque resolution in `torque_unit`; default 0.1.
        #[arg(long)]
        resolution: Option<f64>,
        /// Tool angle resolution in degrees; default 1.
        #[arg(long)]
        angle_resolution: Option<f64>,
        /// Error-severity check codes to accept, separated by commas (e.g.
        /// `surface_pressure_exceeded,thread_engagement_too_short`). While an
        /// error check applies the setpoints are refused (422, listing the
        /// checks) unless every one is named here.
        #[arg(long)]
        accept_checks: Option<String>,
    }
}
