//! Views of the engine's reference lists and the use cases that read them:
//! tightening methods, clamped-part materials, and the head types, washers
//! and hole series a spec request may name. Each answer is an object holding
//! one named list, as the catalogue lists are.

use serde::Serialize;
use utoipa::ToSchema;

use crate::app::quantity::{Quantity, Units};
use crate::engine::bearing;
use crate::engine::material::{self, ClampedMaterial};
use crate::engine::method::{MethodInfo, METHODS};

/// A fraction range (min, max).
#[derive(Debug, Serialize, ToSchema)]
pub struct Range {
    pub min: f64,
    pub max: f64,
}

/// A tightening method with its default tool scatter.
#[derive(Debug, Serialize, ToSchema)]
pub struct TighteningMethodWire {
    /// The value of `tightening_method` in spec requests.
    pub id: String,
    pub name: String,
    /// Default ±scatter of the controlled quantity (0.06 = ±6 %).
    pub default_scatter: f64,
    pub scatter_source: String,
    /// VDI 2230 Part 1 Table A8 tightening factor α_A range.
    pub tightening_factor_range: Range,
    /// The same range as preload scatter (α_A − 1)/(α_A + 1).
    pub preload_scatter_range: Range,
    /// True when the tool controls torque; false when torque is only monitored.
    pub torque_controlled: bool,
}

fn wire_method(m: &MethodInfo) -> TighteningMethodWire {
    let (lo, hi) = m.table_a8_scatter();
    TighteningMethodWire {
        id: m.id.to_string(),
        name: m.name.to_string(),
        default_scatter: m.default_scatter,
        scatter_source: m.scatter_source.to_string(),
        tightening_factor_range: Range {
            min: m.table_a8_alpha_a.0,
            max: m.table_a8_alpha_a.1,
        },
        preload_scatter_range: Range { min: lo, max: hi },
        torque_controlled: m.torque_controlled,
    }
}

/// The list of tightening methods, wrapped like the catalogue lists.
#[derive(Debug, Serialize, ToSchema)]
pub struct TighteningMethodList {
    pub tightening_methods: Vec<TighteningMethodWire>,
}

/// The tightening methods and their scatter.
pub fn tightening_methods() -> TighteningMethodList {
    TighteningMethodList {
        tightening_methods: METHODS.iter().map(wire_method).collect(),
    }
}

/// A clamped-part material.
#[derive(Debug, Serialize, ToSchema)]
pub struct Material {
    /// The value of `clamped_material` in spec requests.
    pub id: String,
    pub name: String,
    /// `metal`; or `plastic` / `threaded_insert`: outside VDI 2230, a spec
    /// needs `permissible_torque` and both frictions from a joint test.
    pub kind: String,
    pub elastic_modulus: Quantity,
    /// Limiting surface pressure p_G under head or nut, where tabulated.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub permissible_surface_pressure: Option<Quantity>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub tensile_strength_min: Option<Quantity>,
    pub source: String,
}

fn wire_material(m: &ClampedMaterial, units: Units) -> Material {
    Material {
        id: m.id.clone(),
        name: m.name.clone(),
        kind: m.kind.id().into(),
        elastic_modulus: Quantity::stress(m.elastic_modulus, units),
        permissible_surface_pressure: m
            .permissible_surface_pressure
            .map(|p| Quantity::stress(p, units)),
        tensile_strength_min: m.tensile_strength_min.map(|p| Quantity::stress(p, units)),
        source: m.source.clone(),
    }
}

/// The list of clamped-part materials, wrapped like the catalogue lists.
#[derive(Debug, Serialize, ToSchema)]
pub struct MaterialList {
    pub materials: Vec<Material>,
}

/// The clamped-part materials with modulus and limiting surface pressure.
pub fn materials(units: Units) -> MaterialList {
    MaterialList {
        materials: material::clamped_materials()
            .iter()
            .map(|m| wire_material(m, units))
            .collect(),
    }
}

/// One value a spec request may give, with its meaning and standard.
#[derive(Debug, Serialize, ToSchema)]
pub struct NamedValue {
    /// The value to send, e.g. `hexagon-head`.
    pub id: String,
    pub description: String,
}

/// What may bear on the clamped part: the `head`, `washer` and `hole`
/// values of spec and setpoint requests.
#[derive(Debug, Serialize, ToSchema)]
pub struct BearingTypes {
    /// Values of `head`.
    pub head_types: Vec<NamedValue>,
    /// Values of `washer`.
    pub washers: Vec<NamedValue>,
    /// Values of `hole` (clearance-hole series).
    pub hole_series: Vec<NamedValue>,
}

/// The bearing-surface choices: head types, washers and hole series.
pub fn bearing_types() -> BearingTypes {
    BearingTypes {
        head_types: bearing::head_types()
            .iter()
            .map(|h| named(h.id(), h.description()))
            .collect(),
        washers: bearing::washers()
            .iter()
            .map(|w| named(w.id(), w.description()))
            .collect(),
        hole_series: bearing::hole_series()
            .iter()
            .map(|h| named(h.id(), h.description()))
            .collect(),
    }
}

fn named(id: &str, description: &str) -> NamedValue {
    NamedValue {
        id: id.into(),
        description: description.into(),
    }
}
