//! Views of the engine's thread and property-class tables, and the use
//! cases that read them: every tabulated thread (optionally one series), one
//! thread by designation, every property class, one property class.

use serde::Serialize;
use utoipa::ToSchema;

use crate::app::quantity::{Quantity, Units};
use crate::app::reading::suggest;
use crate::app::{AppError, FieldProblem};
use crate::engine::grade::{self, GradeInfo};
use crate::engine::thread::{self, ThreadGeometry};

/// The series the thread list may be limited to.
pub const SERIES: [&str; 5] = ["coarse", "fine", "unc", "unf", "un8"];

/// Basic geometry of one thread.
#[derive(Debug, Serialize, ToSchema)]
pub struct Thread {
    /// Normalised designation, e.g. `M10`, `M10x1.25`, `1/2-13 UNC`.
    pub designation: String,
    /// `iso_metric` (ISO 68-1) or `unified` (ASME B1.1).
    pub form: String,
    /// `coarse`, `fine` (ISO 261), `unc`, `unf`, `un8` (ASME B1.1), `custom`.
    pub series: String,
    pub nominal_diameter: Quantity,
    pub pitch: Quantity,
    /// Threads per inch (Unified threads only).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub threads_per_inch: Option<f64>,
    pub flank_angle: Quantity,
    pub pitch_diameter: Quantity,
    pub minor_diameter: Quantity,
    /// Tensile stress area A_s.
    pub stress_area: Quantity,
}

fn slug<T: Serialize>(value: &T) -> String {
    serde_json::to_value(value)
        .ok()
        .and_then(|v| v.as_str().map(str::to_owned))
        .unwrap_or_default()
}

fn wire_thread(t: &ThreadGeometry, units: Units) -> Thread {
    let tpi = t
        .is_inch()
        .then(|| (1.0 / t.pitch.get::<uom::si::length::inch>() * 1e6).round() / 1e6);
    Thread {
        designation: t.designation.clone(),
        form: slug(&t.form),
        series: slug(&t.series),
        nominal_diameter: Quantity::length(t.nominal_diameter, units),
        pitch: Quantity::length(t.pitch, units),
        threads_per_inch: tpi,
        flank_angle: Quantity::angle(t.flank_angle),
        pitch_diameter: Quantity::length(t.pitch_diameter, units),
        minor_diameter: Quantity::length(t.minor_diameter, units),
        stress_area: Quantity::area(t.stress_area, units),
    }
}

/// Strengths of a grade over one size range.
#[derive(Debug, Serialize, ToSchema)]
pub struct SizeRangeWire {
    /// The range as a person reads it, e.g. `over M16 to M39`.
    pub label: String,
    pub min_diameter: Quantity,
    /// Whether `min_diameter` itself belongs to the range.
    pub min_inclusive: bool,
    pub max_diameter: Quantity,
    pub tensile_strength_min: Quantity,
    pub yield_strength_min: Quantity,
    /// Proof stress S_p (proof load = S_p · A_s).
    pub proof_stress: Quantity,
}

/// A strength grade (property class).
#[derive(Debug, Serialize, ToSchema)]
pub struct PropertyClass {
    /// As the API spells it: `8.8`, `A2-70`, `sae-j429-5`, `astm-a574`.
    pub id: String,
    pub name: String,
    pub standard: String,
    /// `iso898`, `iso3506`, `sae_j429`, `astm_a574`, `astm_bolting`,
    /// `astm_bolting_metric`.
    pub family: String,
    /// Which yield value the standard specifies (`lower_yield`,
    /// `proof_strength02`, `full_size_rpf`, `inch_yield`).
    pub yield_basis: String,
    pub size_ranges: Vec<SizeRangeWire>,
    pub notes: Vec<String>,
}

fn wire_grade(g: &GradeInfo, units: Units) -> PropertyClass {
    PropertyClass {
        id: g.id.to_string(),
        name: g.name.to_string(),
        standard: g.standard.to_string(),
        family: slug(&g.family),
        yield_basis: slug(&g.yield_basis),
        size_ranges: g
            .size_ranges
            .iter()
            .map(|r| SizeRangeWire {
                label: r.label.to_string(),
                min_diameter: Quantity::length(r.min_diameter, units),
                min_inclusive: r.min_inclusive,
                max_diameter: Quantity::length(r.max_diameter, units),
                tensile_strength_min: Quantity::stress(r.tensile_strength_min, units),
                yield_strength_min: Quantity::stress(r.yield_strength_min, units),
                proof_stress: Quantity::stress(r.proof_stress, units),
            })
            .collect(),
        notes: g.notes.iter().map(|n| n.to_string()).collect(),
    }
}

/// Every tabulated thread (ISO 261 metric coarse and fine, ASME B1.1 UNC,
/// UNF and 8-UN), or those of one `series`.
pub fn threads(series: Option<&str>, units: Units) -> Result<Vec<Thread>, AppError> {
    if let Some(s) = series {
        if !SERIES.contains(&s) {
            let known: Vec<String> = SERIES.iter().map(|s| s.to_string()).collect();
            return Err(FieldProblem::malformed(
                "series",
                format!("unknown series '{s}'; use one of {}", SERIES.join(", ")),
            )
            .with_suggestions(suggest(s, &known))
            .into());
        }
    }
    Ok(thread::standard_threads()
        .filter(|t| series.is_none_or(|s| slug(&t.series) == s))
        .map(|t| wire_thread(&t, units))
        .collect())
}

/// One thread by designation; non-tabulated metric designations with an
/// explicit pitch are computed.
pub fn thread(designation: &str, units: Units) -> Result<Thread, AppError> {
    Ok(wire_thread(&thread::parse_designation(designation)?, units))
}

/// Every property class.
pub fn property_classes(units: Units) -> Vec<PropertyClass> {
    grade::property_classes()
        .iter()
        .map(|g| wire_grade(g, units))
        .collect()
}

/// One property class with its strengths per size range.
pub fn property_class(id: &str, units: Units) -> Result<PropertyClass, AppError> {
    Ok(wire_grade(grade::find_property_class(id)?, units))
}
