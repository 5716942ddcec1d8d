//! Wire requests for the tightening-spec endpoints.
//!
//! - [`SpecRequest`]: the POST body (and one batch item), the full set of
//!   options, quantities as `{"value", "unit"}`.
//! - [`SpecQuery`]: the GET query of `/v1/tightening-specs`, scalar names.
//!   Friction is `thread_friction=0.12` (one value) or
//!   `thread_friction_min=0.10&thread_friction_max=0.16` (a range); lengths,
//!   forces and torques carry their unit in the value (`clamp_length=40mm`,
//!   `clamp_length=1.5in`, `prevailing_torque=2N·m`); a bare number for a
//!   dimensional parameter is refused, so no unit is ever guessed. The
//!   bearing diameters are `bearing_outer_diameter` / `bearing_inner_diameter`.
//! - [`SetpointQuery`]: the same names plus `torque_unit`, `resolution`
//!   and `angle_resolution`.
//!
//! Unknown names are refused (`deny_unknown_fields`), so a typo such as
//! `thred=` is a 400 naming it rather than being silently ignored.

use serde::de::{self, MapAccess, Visitor};
use serde::{Deserialize, Deserializer, Serialize};
use utoipa::{IntoParams, ToSchema};

use super::item_error::ItemError;
use crate::http::quantity::Quantity;
pub use crate::http::quantity::Units;

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
    /// angle, its limiting surface pressure and strength for the checks.
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
    /// Snug torque before the angle is counted.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub snug_torque: Option<Quantity>,
    /// Units of the response: `si` (default) or `us`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub units: Option<Units>,
    /// Catalogue revision to answer from; default the current one.
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        deserialize_with = "crate::http::extract::integral"
    )]
    #[schema(minimum = 1)]
    pub catalogue_revision: Option<i64>,
}

/// Reads a query value such as `40mm`, `40 mm`, `1.5in`, `2N·m` into a
/// quantity. A bare number is refused: the unit must be stated.
pub fn quantity_from_query(field: &str, text: &str) -> Result<Quantity, ItemError> {
    let t = text.trim();
    let split = t
        .char_indices()
        .find(|&(i, c)| {
            !(c.is_ascii_digit()
                || c == '.'
                || ((c == '-' || c == '+') && (i == 0 || t[..i].ends_with(['e', 'E'])))
                || ((c == 'e' || c == 'E')
                    && i > 0
                    && t[i + 1..]
                        .starts_with(|d: char| d.is_ascii_digit() || d == '-' || d == '+')))
        })
        .map(|(i, _)| i)
        .unwrap_or(t.len());
    let (number, unit) = t.split_at(split);
    let unit = unit.trim();
    let value: f64 = number.parse().map_err(|_| {
        ItemError::malformed(
            field,
            format!("'{text}' is not a number followed by a unit"),
        )
    })?;
    if unit.is_empty() {
        return Err(ItemError::malformed(
            field,
            format!("'{text}' has no unit; write it with one, e.g. 40mm, 1.5in, 20kN, 2N·m"),
        ));
    }
    Ok(Quantity {
        value,
        unit: unit.to_string().into(),
    })
}

/// Declares a flat query struct with every spec parameter plus `$extra`
/// fields, and its conversion into a [`SpecRequest`].
macro_rules! spec_query {
    ($(#[$meta:meta])* $name:ident { $($(#[$fmeta:meta])* $extra:ident : $ety:ty,)* }) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Default, Deserialize, IntoParams)]
        #[serde(deny_unknown_fields)]
        #[into_params(parameter_in = Query)]
        pub struct $name {
            /// Thread designation, e.g. `M10`, `M10x1.25`, `1/2-13 UNC`.
            #[param(example = "M10")]
            pub thread: String,
            /// Property class or grade, e.g. `8.8`, `A2-70`.
            #[param(example = "8.8")]
            pub property_class: String,
            /// Finish id from the friction catalogue; required (with
            /// `lubricant`) unless thread and bearing friction are both
            /// given directly (422 naming it otherwise).
            pub finish: Option<String>,
            /// Lubricant id from the friction catalogue; required (with
            /// `finish`) unless thread and bearing friction are both given
            /// directly (422 naming it otherwise).
            pub lubricant: Option<String>,
            /// One thread friction value μ_G (replaces the catalogue's).
            pub thread_friction: Option<f64>,
            /// Lower end of a thread friction range (with `thread_friction_max`).
            pub thread_friction_min: Option<f64>,
            /// Upper end of a thread friction range.
            pub thread_friction_max: Option<f64>,
            /// One bearing friction value μ_K (replaces the catalogue's).
            pub bearing_friction: Option<f64>,
            /// Lower end of a bearing friction range (with `bearing_friction_max`).
            pub bearing_friction_min: Option<f64>,
            /// Upper end of a bearing friction range.
            pub bearing_friction_max: Option<f64>,
            /// Tightening method id; default `click-wrench`.
            pub tightening_method: Option<String>,
            /// Tool scatter as a fraction (0.05 = ±5 %).
            pub tool_scatter: Option<f64>,
            /// Head type; default `hexagon-head`.
            pub head: Option<String>,
            /// Washer: `none` (default) or `plain`.
            pub washer: Option<String>,
            /// Clearance-hole series: `fine`, `medium` (default), `coarse`.
            pub hole: Option<String>,
            /// Explicit outer bearing diameter with unit, e.g. `16.6mm`.
            pub bearing_outer_diameter: Option<String>,
            /// Explicit inner bearing diameter with unit, e.g. `11mm`.
            pub bearing_inner_diameter: Option<String>,
            /// Utilisation ν of the minimum yield strength; default 0.9.
            pub utilisation: Option<f64>,
            /// Prevailing torque with unit, e.g. `2N·m`.
            pub prevailing_torque: Option<String>,
            /// Clamp length with unit, e.g. `40mm`.
            pub clamp_length: Option<String>,
            /// Clamped-part material id.
            pub clamped_material: Option<String>,
            /// Outer diameter of the clamped parts with unit, e.g. `30mm`.
            pub joint_outer_diameter: Option<String>,
            /// `through-bolted` (default) or `tapped-hole`.
            pub joint_type: Option<String>,
            /// Thread engagement length in a tapped hole with unit, e.g. `15mm`.
            pub engagement_length: Option<String>,
            /// Required minimum clamp load with unit, e.g. `15kN`.
            pub required_clamp_load: Option<String>,
            /// `maximum-preload` (default) or `minimum-clamp-load`.
            pub window_mode: Option<String>,
            /// Snug torque with unit, e.g. `10N·m`.
            pub snug_torque: Option<String>,
            /// Units of the response: `si` (default) or `us`.
            pub units: Option<Units>,
            /// Catalogue revision to answer from; default the current one.
            #[serde(default, deserialize_with = "crate::http::extract::integral")]
            #[param(minimum = 1)]
            pub catalogue_revision: Option<i64>,
            $($(#[$fmeta])* pub $extra: $ety,)*
        }

        impl $name {
            /// The equivalent full request; every problem found is returned.
            pub fn to_request(&self) -> Result<SpecRequest, Vec<ItemError>> {
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
                let bearing = match (outer, inner) {
                    (Some(outer_diameter), Some(inner_diameter)) => Some(BearingInput {
                        outer_diameter,
                        inner_diameter,
                    }),
                    (None, None) => None,
                    (Some(_), None) => {
                        if self.bearing_inner_diameter.is_none() {
                            problems.push(ItemError::malformed(
                                "bearing_inner_diameter",
                                "give both bearing diameters or neither",
                            ));
                        }
                        None
                    }
                    (None, Some(_)) => {
                        if self.bearing_outer_diameter.is_none() {
                            problems.push(ItemError::malformed(
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
                    snug_torque,
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
        torque_unit: Option<String>,
        /// Tool torque resolution in `torque_unit`; default 0.1.
        resolution: Option<f64>,
        /// Tool angle resolution in degrees; default 1.
        angle_resolution: Option<f64>,
    }
}

/// One value, or both ends of a range; anything else is refused.
fn friction_from_query(
    field: &str,
    single: Option<f64>,
    min: Option<f64>,
    max: Option<f64>,
    problems: &mut Vec<ItemError>,
) -> Option<FrictionInput> {
    match (single, min, max) {
        (None, None, None) => None,
        (Some(v), None, None) => Some(FrictionInput::Single(v)),
        (None, Some(min), Some(max)) => Some(FrictionInput::Range { min, max }),
        (Some(_), _, _) => {
            problems.push(ItemError::malformed(
                field,
                format!("give either {field} or {field}_min and {field}_max, not both"),
            ));
            None
        }
        (None, Some(_), None) => {
            problems.push(ItemError::malformed(
                format!("{field}_max"),
                format!("{field}_min needs {field}_max"),
            ));
            None
        }
        (None, None, Some(_)) => {
            problems.push(ItemError::malformed(
                format!("{field}_min"),
                format!("{field}_max needs {field}_min"),
            ));
            None
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn friction_single_or_range() {
        let r: SpecRequest = serde_json::from_str(
            r#"{"thread":"M10","property_class":"8.8","thread_friction":0.12,
                "bearing_friction":{"min":0.1,"max":0.16}}"#,
        )
        .unwrap();
        assert_eq!(r.thread_friction, Some(FrictionInput::Single(0.12)));
        assert_eq!(
            r.bearing_friction,
            Some(FrictionInput::Range {
                min: 0.1,
                max: 0.16
            })
        );
    }

    #[test]
    fn friction_errors_name_the_problem() {
        let e = serde_json::from_str::<SpecRequest>(
            r#"{"thread":"M10","property_class":"8.8","thread_friction":{"min":0.1}}"#,
        )
        .unwrap_err()
        .to_string();
        assert!(e.contains("max"), "{e}");
        let e = serde_json::from_str::<SpecRequest>(
            r#"{"thread":"M10","property_class":"8.8","thread_friction":"low"}"#,
        )
        .unwrap_err()
        .to_string();
        assert!(e.contains("friction coefficient"), "{e}");
    }

    #[test]
    fn unknown_body_field_refused() {
        let e = serde_json::from_str::<SpecRequest>(
            r#"{"thread":"M10","property_class":"8.8","thred":"M12"}"#,
        )
        .unwrap_err()
        .to_string();
        assert!(e.contains("thred"), "{e}");
    }

    #[test]
    fn query_quantities_need_units() {
        let q = quantity_from_query("clamp_length", "40mm").unwrap();
        assert_eq!((q.value, q.unit.as_ref()), (40.0, "mm"));
        let q = quantity_from_query("clamp_length", " 1.5 in").unwrap();
        assert_eq!((q.value, q.unit.as_ref()), (1.5, "in"));
        let q = quantity_from_query("snug_torque", "1e1N·m").unwrap();
        assert_eq!((q.value, q.unit.as_ref()), (10.0, "N·m"));
        let e = quantity_from_query("clamp_length", "40").unwrap_err();
        assert_eq!(e.field, "clamp_length");
        assert!(quantity_from_query("clamp_length", "mm").is_err());
    }

    #[test]
    fn query_to_request() {
        let q: SpecQuery = serde_urlencoded::from_str(
            "thread=M10&property_class=8.8&thread_friction_min=0.1&thread_friction_max=0.14\
             &bearing_friction=0.12&clamp_length=40mm&units=us",
        )
        .unwrap();
        let r = q.to_request().unwrap();
        assert_eq!(
            r.thread_friction,
            Some(FrictionInput::Range {
                min: 0.1,
                max: 0.14
            })
        );
        assert_eq!(r.bearing_friction, Some(FrictionInput::Single(0.12)));
        assert_eq!(r.units, Some(Units::Us));
        assert_eq!(r.clamp_length.map(|q| q.value), Some(40.0));
    }

    #[test]
    fn query_problems_listed_together() {
        let q: SpecQuery = serde_urlencoded::from_str(
            "thread=M10&property_class=8.8&thread_friction=0.1&thread_friction_min=0.1\
             &bearing_friction_min=0.1&clamp_length=40&bearing_outer_diameter=16mm",
        )
        .unwrap();
        let e = q.to_request().unwrap_err();
        let fields: Vec<&str> = e.iter().map(|p| p.field.as_str()).collect();
        assert_eq!(
            fields,
            [
                "thread_friction",
                "bearing_friction_max",
                "clamp_length",
                "bearing_inner_diameter"
            ]
        );
    }

    #[test]
    fn unknown_query_parameter_refused() {
        let e = serde_urlencoded::from_str::<SpecQuery>("thred=M10&property_class=8.8")
            .unwrap_err()
            .to_string();
        assert!(e.contains("thred"), "{e}");
        let e =
            serde_urlencoded::from_str::<SpecQuery>("thread=M10&property_class=8.8&resolution=0.1")
                .unwrap_err()
                .to_string();
        assert!(e.contains("resolution"), "{e}");
        let s: SetpointQuery = serde_urlencoded::from_str(
            "thread=M10&property_class=8.8&resolution=0.1&torque_unit=N%C2%B7m",
        )
        .unwrap();
        assert_eq!(s.torque_unit.as_deref(), Some("N·m"));
    }
}
