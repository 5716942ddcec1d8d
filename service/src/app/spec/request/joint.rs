//! The joint model's request fields as the POST body carries them: the
//! clamped stack and the operating loads. Their flat forms for the GET query
//! and the command line are read in `query.rs` (`clamped_parts` as
//! `7.5mm:steel-s355,7.5mm:steel-s355`, `loads_*` for `loads`).

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use crate::app::quantity::Quantity;
use crate::app::FieldProblem;

use super::query::quantity_from_query;

/// One clamped layer, from under the head (a washer is a layer).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct ClampedPartInput {
    /// Thickness of the layer (0.1 mm to 2000 mm).
    pub thickness: Quantity,
    /// Material id (see `/v1/materials`).
    #[schema(example = "steel-s355")]
    pub material: String,
}

/// Operating loads on one bolt (VDI 2230 Part 1 working state). Forces are
/// per bolt; absent loads are zero.
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct LoadsInput {
    /// Largest axial working load F_A,max.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub axial: Option<Quantity>,
    /// Smallest axial working load F_A,min of an alternating load (default 0;
    /// at most `axial`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub axial_min: Option<Quantity>,
    /// Transverse load F_Q carried by friction at the interfaces.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub transverse: Option<Quantity>,
    /// Torsion M_Y about the bolt axis carried by friction (needs `torsion_radius`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub torsion: Option<Quantity>,
    /// Friction radius r_a of the torsion.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub torsion_radius: Option<Quantity>,
    /// Interfaces q_F that carry the transverse load (1 to 32; default 1).
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        deserialize_with = "crate::app::reading::integral"
    )]
    #[schema(minimum = 1, maximum = 32)]
    pub interfaces: Option<i64>,
    /// Friction μ_T at those interfaces (0.02 to 1); needed with a
    /// transverse load or torsion.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub interface_friction: Option<f64>,
    /// Clamp load F_KP a seal needs.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sealing_clamp_load: Option<Quantity>,
}

/// Most layers in the query form (the engine's bound, checked again there).
const MAX_QUERY_LAYERS: usize = 16;

/// `clamped_parts` in its flat form: `THICKNESS:MATERIAL` pairs separated
/// by commas, e.g. `7.5mm:steel-s355,2mm:steel-s235`.
pub fn clamped_parts_from_query(text: &str) -> Result<Vec<ClampedPartInput>, FieldProblem> {
    let parts: Vec<&str> = text.split(',').collect();
    if parts.len() > MAX_QUERY_LAYERS {
        return Err(FieldProblem::invalid(
            "clamped_parts",
            format!(
                "{} layers given, at most {MAX_QUERY_LAYERS} are accepted",
                parts.len()
            ),
        ));
    }
    parts
        .iter()
        .enumerate()
        .map(|(i, part)| {
            let Some((thickness, material)) = part.split_once(':') else {
                return Err(FieldProblem::malformed(
                    "clamped_parts",
                    format!(
                        "layer {i} '{}' is not THICKNESS:MATERIAL (e.g. 7.5mm:steel-s355)",
                        part.chars().take(40).collect::<String>()
                    ),
                ));
            };
            Ok(ClampedPartInput {
                thickness: quantity_from_query(
                    &format!("clamped_parts[{i}].thickness"),
                    thickness,
                )?,
                material: material.trim().to_string(),
            })
        })
        .collect()
}
