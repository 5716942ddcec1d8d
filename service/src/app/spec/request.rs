//! The spec request, declared here for every adapter: the HTTP endpoints
//! and `tightspec spec` (whose flags are [`SpecQuery`]'s fields).
//!
//! - [`SpecRequest`]: the POST body (and one batch item), the full set of
//!   options, quantities as `{"value", "unit"}`.
//! - [`SpecQuery`]: the GET query of `/v1/tightening-specs` and the flags of
//!   `tightspec spec`, scalar names, declared once by `spec_query!`.
//!   Friction is `thread_friction=0.12` (one value) or
//!   `thread_friction_min=0.10&thread_friction_max=0.16` (a range); lengths,
//!   forces and torques carry their unit in the value (`clamp_length=40mm`,
//!   `clamp_length=1.5in`, `prevailing_torque=2N·m`); a bare number for a
//!   dimensional parameter is refused, so no unit is ever guessed. The
//!   bearing diameters are `bearing_outer_diameter` / `bearing_inner_diameter`.
//! - [`SetpointQuery`]: the same names plus `torque_unit`, `resolution`,
//!   `angle_resolution` and `accept_checks`.
//!
//! Unknown names are refused (`deny_unknown_fields`), so a typo such as
//! `thred=` is a 400 naming it rather than being silently ignored.

use serde::de::{self, MapAccess, Visitor};
use serde::{Deserialize, Deserializer, Serialize};
use utoipa::ToSchema;

use crate::app::quantity::{Quantity, Units};

/// A friction coefficient: one value (`0.12`) or a range
/// (`{"min": 0.10, "max": 0.16}`).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, ToSchema)]
#[serde(untagged)]
pub enum FrictionInput {
    Single(f64),
    Range { min: f64, max: f64 },
}

impl FrictionInput {
    /// `(min, max)`; a single value gives `min = max`.
    pub fn bounds(self) -> (f64, f64) {
        match self {
            FrictionInput::Single(v) => (v, v),
            FrictionInput::Range { min, max } => (min, max),
        }
    }
}

impl<'de> Deserialize<'de> for FrictionInput {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = FrictionInput;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("a friction coefficient (e.g. 0.12) or {\"min\": …, \"max\": …}")
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<Self::Value, E> {
                Ok(FrictionInput::Single(v))
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<Self::Value, E> {
                Ok(FrictionInput::Single(v as f64))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<Self::Value, E> {
                Ok(FrictionInput::Single(v as f64))
            }
            fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Self::Value, A::Error> {
                let (mut min, mut max) = (None, None);
                while let Some(key) = map.next_key::<String>()? {
                    match key.as_str() {
                        "min" => min = Some(map.next_value::<f64>()?),
                        "max" => max = Some(map.next_value::<f64>()?),
                        other => return Err(de::Error::unknown_field(other, &["min", "max"])),
                    }
                }
                match (min, max) {
                    (Some(min), Some(max)) => Ok(FrictionInput::Range { min, max }),
                    (None, _) => Err(de::Error::missing_field("min")),
                    (_, None) => Err(de::Error::missing_field("max")),
                }
            }
        }
        d.deserialize_any(V)
    }
}

/// Explicit bearing diameters under the turning head or nut, replacing the
/// head/washer/hole tables.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BearingInput {
    /// Outer bearing diameter d_w.
    pub outer_diameter: Quantity,
    /// Inner bearing diameter d_h (usually the clearance hole).
    pub inner_diameter: Quantity,
}

/// One reduced shank section of a bolt, from under the head.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ShankSectionInput {
    /// Length l_i of the section.
    pub length: Quantity,
    /// Diameter d_i of the section (at most the nominal diameter).
    pub diameter: Quantity,
}

/// The bolt's geometry: `{"length", "thread_length", "shank_sections"}`, or a
/// product standard and its nominal length (`{"standard", "length"}`, the
/// thread length then from the standard's b column). With `clamp_length`,
/// the shank inside the clamp length goes into the bolt's resilience
/// (VDI 2230 Part 1 §5.1.1), so the angle window is that of this bolt;
/// without `bolt` the bolt is taken as threaded up to the head.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct BoltRequest {
    /// Product standard: `iso-4014`, `iso-4017`, `iso-4762` or
    /// `asme-b18.2.1` (hex cap screw); not with `thread_length` or
    /// `shank_sections`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    #[schema(example = "iso-4014")]
    pub standard: Option<String>,
    /// Length under the head (the nominal length of a standard bolt);
    /// required (a request without it is refused naming `bolt.length`).
    #[serde(default)]
    #[schema(required = true, nullable = false)]
    pub length: Option<Quantity>,
    /// Thread length b; required without `standard`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thread_length: Option<Quantity>,
    /// Reduced shank sections from under the head (at most 8); the rest of
    /// the unthreaded part is a plain shank of the nominal diameter.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    #[schema(max_items = 8)]
    pub shank_sections: Option<Vec<ShankSectionInput>>,
}

/// The tapped part of a tapped-hole joint.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct TappedPartRequest {
    /// Material id (see `/v1/materials`), e.g. `aluminium-alsi9cu3`; plastics
    /// and threaded inserts need `permissible_torque` and both frictions.
    #[schema(example = "aluminium-alsi9cu3")]
    pub material: String,
}

/// The nut of a through-bolted joint.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct NutRequest {
    /// Nut property class (see `/v1/property-classes`, `nut_classes`):
    /// ISO 898-2 `iso-898-2-5|8|10|12` (also `8`, `class 10`), SAE J995
    /// `sae-j995-2|5|8`, ASTM A563 `astm-a563-a|c|dh`.
    #[schema(example = "iso-898-2-10")]
    pub property_class: String,
}

/// One tightening-spec request: the POST body of `/v1/tightening-specs`
/// and one item of a batch.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct SpecRequest {
    /// Thread designation, e.g. `M10`, `M10x1.25`, `1/2-13 UNC`, `#10-24`.
    #[schema(example = "M10")]
    pub thread: String,
    /// Property class or grade, e.g. `8.8`, `10.9`, `A2-70`, `SAE J429 Grade 5`.
    #[schema(example = "8.8")]
    pub property_class: String,
    /// Finish id from the friction catalogue, e.g. `zinc-electroplated`;
    /// required (with `lubricant`) unless both frictions are given directly.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub finish: Option<String>,
    /// Lubricant id from the friction catalogue, e.g. `none`, `light-oil`;
    /// required (with `finish`) unless both frictions are given directly.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub lubricant: Option<String>,
    /// Thread friction μ_G: replaces the catalogue value.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thread_friction: Option<FrictionInput>,
    /// Bearing (head or nut) friction μ_K: replaces the catalogue value.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bearing_friction: Option<FrictionInput>,
    /// Tightening method id (see `/v1/tightening-methods`); default `click-wrench`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tightening_method: Option<String>,
    /// Tool scatter as a fraction (0.05 means ±5 %); default from the method.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tool_scatter: Option<f64>,
    /// Head type; default `hexagon-head` (ISO 4017 / ASME B18.2.1).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub head: Option<String>,
    /// Washer under the turning part: `none` (default) or `plain`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub washer: Option<String>,
    /// Clearance-hole series (ISO 273): `fine`, `medium` (default), `coarse`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub hole: Option<String>,
    /// Explicit bearing diameters (replace head/washer/hole tables).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bearing: Option<BearingInput>,
    /// Utilisation ν of the minimum yield strength; default 0.9 (VDI 2230).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub utilisation: Option<f64>,
    /// Prevailing torque of a locking element (adds torque, no preload).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub prevailing_torque: Option<Quantity>,
    /// Clamp length l_K; needed for the angle window.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub clamp_length: Option<Quantity>,
    /// Clamped-part material id (see `/v1/materials`): its modulus for the
    /// angle, its limiting surface pressure for the checks, and the tapped
    /// part's material when `tapped_part` is not given.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub clamped_material: Option<String>,
    /// Outer diameter D_A of the clamped parts (default: wide joint).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub joint_outer_diameter: Option<Quantity>,
    /// `through-bolted` (nut, default) or `tapped-hole`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub joint_type: Option<String>,
    /// Length of thread engagement in a tapped hole (stripping check).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub engagement_length: Option<Quantity>,
    /// Minimum clamp load the joint needs.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub required_clamp_load: Option<Quantity>,
    /// `maximum-preload` (default: use the bolt up to ν·Rp at the top of the
    /// window) or `minimum-clamp-load` (the lowest window that still gives
    /// `required_clamp_load`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub window_mode: Option<String>,
    /// The bolt's geometry (shank and thread length); default: taken as
    /// threaded up to the head.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bolt: Option<BoltRequest>,
    /// The clamped stack from under the head, 1 to 16 layers (a washer is a
    /// layer): each layer's thickness and material. Not with `clamp_length`
    /// or `clamped_material` (the one-plate shorthand); `joint_outer_diameter`
    /// is the stack's outer diameter D_A.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    #[schema(min_items = 1, max_items = 16)]
    pub clamped_parts: Option<Vec<ClampedPartInput>>,
    /// Surface roughness Rz of the joint's faces (below 160 µm), for the
    /// embedding by the classes of VDI 2230 Part 1 Table 5; default 16 µm
    /// (class 10 to below 40 µm, machined faces; common practice).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub roughness_rz: Option<Quantity>,
    /// Operating loads per bolt; with them the answer's `joint` block has
    /// the working state and its checks.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub loads: Option<LoadsInput>,
    /// Load-introduction factor n (greater than 0, at most 1; 1: under head
    /// and nut); default 0.5 (common practice where the geometry is not
    /// described, VDI 2230 Part 1 §5.2.2).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub load_introduction: Option<f64>,
    /// `rolled-before-heat-treatment` (default, the usual case) or
    /// `rolled-after-heat-treatment`: which fatigue limit applies (VDI 2230
    /// Part 1 §5.5.4).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub thread_rolling: Option<String>,
    /// Snug torque before the angle is counted.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub snug_torque: Option<Quantity>,
    /// The tapped part of a tapped-hole joint (`{"material"}`); default its
    /// material is `clamped_material`. Makes the joint a tapped-hole joint.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub tapped_part: Option<TappedPartRequest>,
    /// The nut of a through-bolted joint (`{"property_class"}`): its class
    /// is checked against the bolt and its proof load against the preload.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub nut: Option<NutRequest>,
    /// Permissible tightening torque from a joint test; required (with
    /// `thread_friction` and `bearing_friction`) for plastic parts and
    /// threaded inserts, which are outside VDI 2230.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub permissible_torque: Option<Quantity>,
    /// The tags of the joint this spec is for (e.g. a part family): a
    /// friction entry limited to one of them wins over the generic entry
    /// for the same finish and lubricant. Lets the calculator reproduce a
    /// registered joint's answer; a joint's own request may not hold it
    /// (the joint's `tags` are used).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    #[schema(max_items = 32)]
    pub joint_tags: Option<Vec<String>>,
    /// Units of the response: `si` (default) or `us`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub units: Option<Units>,
    /// Catalogue revision to answer from; default the current one.
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        deserialize_with = "crate::app::reading::integral"
    )]
    #[schema(minimum = 1)]
    pub catalogue_revision: Option<i64>,
}

mod flat;
mod joint;
mod query;
pub use joint::{clamped_parts_from_query, ClampedPartInput, LoadsInput};
pub use query::{quantity_from_query, SetpointQuery, SpecQuery};

#[cfg(test)]
mod tests;
