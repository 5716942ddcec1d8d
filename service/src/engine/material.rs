//! Clamped-part materials: elastic modulus and permissible surface pressure.
//!
//! Public surface:
//! - [`clamped_materials`] lists the tabulated materials (steel, S235,
//!   E295, S355, C45, 42CrMo4, EN-GJL-250, EN-GJS-400, EN AW-6082,
//!   GD-AlSi9Cu3, AZ91, 1.4301, 1.4401), each with its sources;
//! - [`find_material`] accepts the id or a usual name (`S235`, `42CrMo4`,
//!   `GG-25`, `6082`, `AZ91`, `1.4401`);
//! - [`min_engagement_factor`] recommends a minimum thread engagement, as a
//!   multiple of d, for a tapped hole in a material.

mod table;
#[cfg(test)]
mod tests;

use std::sync::OnceLock;

use uom::si::f64::Pressure;
use uom::si::pressure::megapascal;

use super::grade::Strength;
use super::thread::{ThreadGeometry, ThreadSeries};
use super::EngineError;
use table::{EngagementRow, RawMaterial, MATERIALS};

/// What kind of material a row is: only metals are inside the method.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum MaterialKind {
    /// Steel, cast iron, light alloys: the parts VDI 2230 Part 1 is written for.
    Metal,
    /// A plastic part: creeps and relaxes under preload, outside VDI 2230.
    Plastic,
    /// A threaded insert: a second thread whose strength its maker states,
    /// outside VDI 2230.
    ThreadedInsert,
}

impl MaterialKind {
    /// The id the API uses.
    pub fn id(self) -> &'static str {
        match self {
            Self::Metal => "metal",
            Self::Plastic => "plastic",
            Self::ThreadedInsert => "threaded_insert",
        }
    }
}

/// A clamped-part (or nut / tapped-part) material.
#[derive(Debug, Clone, PartialEq)]
pub struct ClampedMaterial {
    /// Identifier as the API spells it, e.g. `steel-s235`.
    pub id: String,
    pub name: String,
    /// Metal (inside the method), plastic or threaded insert (outside it).
    pub kind: MaterialKind,
    /// Modulus of elasticity E.
    pub elastic_modulus: Pressure,
    /// Limiting surface pressure p_G under head or nut, where tabulated.
    pub permissible_surface_pressure: Option<Pressure>,
    /// Minimum tensile strength, used for thread-stripping checks.
    pub tensile_strength_min: Option<Pressure>,
    /// Where the values come from.
    pub source: String,
}

/// Every tabulated material, in listing order.
pub fn clamped_materials() -> &'static [ClampedMaterial] {
    static ALL: OnceLock<Vec<ClampedMaterial>> = OnceLock::new();
    ALL.get_or_init(|| MATERIALS.iter().map(build).collect())
}

fn build(m: &RawMaterial) -> ClampedMaterial {
    let mpa = Pressure::new::<megapascal>;
    ClampedMaterial {
        id: m.id.into(),
        name: m.name.into(),
        kind: m.kind,
        elastic_modulus: mpa(m.e),
        permissible_surface_pressure: m.p_g.map(mpa),
        tensile_strength_min: m.rm.map(mpa),
        source: m.source.into(),
    }
}

/// Lower-case alphanumerics of `a` equal those of `b`.
fn same_key(a: &str, b: &str) -> bool {
    let key = |s: &str| {
        s.bytes()
            .filter(u8::is_ascii_alphanumeric)
            .map(|c| c.to_ascii_lowercase())
            .collect::<Vec<u8>>()
    };
    let ka = key(a);
    !ka.is_empty() && ka == key(b)
}

fn raw(id: &str) -> Option<(usize, &'static RawMaterial)> {
    MATERIALS.iter().enumerate().find(|(_, m)| {
        m.id.eq_ignore_ascii_case(id.trim())
            || same_key(m.id, id)
            || m.aliases.iter().any(|a| same_key(a, id))
    })
}

/// Looks a material up by id or usual name. Unknown (field
/// `clamped_material`) with the nearest ids as suggestions.
pub fn find_material(id: &str) -> Result<ClampedMaterial, EngineError> {
    if id.len() <= 64 {
        if let Some((i, _)) = raw(id) {
            return Ok(clamped_materials()[i].clone());
        }
    }
    let lower = id.trim().to_lowercase();
    let mut scored: Vec<(f64, &str)> = MATERIALS
        .iter()
        .map(|m| {
            let best = std::iter::once(m.id)
                .chain(m.aliases.iter().copied())
                .map(|a| strsim::jaro_winkler(&lower, a))
                .fold(0.0, f64::max);
            (best, m.id)
        })
        .collect();
    scored.sort_by(|a, b| b.0.total_cmp(&a.0));
    Err(EngineError::Unknown {
        field: "clamped_material".into(),
        kind: "clamped material",
        given: id.chars().take(64).collect(),
        suggestions: scored
            .iter()
            .take(3)
            .map(|(_, id)| id.to_string())
            .collect(),
    })
}

/// A recommended minimum length of thread engagement in a tapped hole.
#[derive(Debug, Clone, PartialEq)]
pub struct EngagementFactor {
    /// Minimum engagement length divided by the nominal diameter d.
    pub factor: f64,
    /// False when the value is a stand-in (material or bolt strength not in
    /// the table): treat it as a lower bound and confirm by test.
    pub tabulated: bool,
    /// Where the value comes from and how it was chosen.
    pub source: String,
}

/// Nominal tensile strength of property class 8.8, the column the scaling of
/// a missing stronger column starts from (ISO 898-1:2013: class 8.8 means
/// Rm,nom 800 MPa).
const RM_8_8_MPA: f64 = 800.0;

const SUPPLIER: &str = "supplier sheet of recommended minimum engagement lengths for cut internal threads, based on trials M6–M16, as reproduced in two suppliers' technical tables; column mapping read from a flattened copy";

/// Factor for (8.8 coarse, 8.8 fine, 10.9 coarse, 10.9 fine, 12.9 coarse).
fn row_values(row: EngagementRow) -> [Option<f64>; 5] {
    match row {
        EngagementRow::MildSteel => [Some(1.0), Some(1.25), Some(1.25), Some(1.4), Some(1.4)],
        EngagementRow::StructuralSteel => [Some(0.9), Some(1.0), Some(1.0), Some(1.2), Some(1.2)],
        EngagementRow::QuenchedTempered => [Some(0.8), Some(0.8), Some(0.9), Some(0.9), Some(1.0)],
        EngagementRow::GreyCastIron => [Some(1.0), Some(1.25), Some(1.25), Some(1.4), Some(1.4)],
        EngagementRow::Aluminium => [Some(2.0), Some(2.5), None, None, None],
    }
}

/// Common-practice engagement for a material family: steel 1·d, cast
/// iron 1.25·d, aluminium (and, by analogy, magnesium) 2·d.
fn rule_of_thumb(row: EngagementRow) -> f64 {
    match row {
        EngagementRow::MildSteel
        | EngagementRow::StructuralSteel
        | EngagementRow::QuenchedTempered => 1.0,
        EngagementRow::GreyCastIron => 1.25,
        EngagementRow::Aluminium => 2.0,
    }
}

/// Recommended minimum thread engagement / d for a tapped hole in
/// `material` for a bolt of `strength` on `thread`.
///
/// The bolt column is chosen by the bolt's Rm,min: up to 830 MPa reads the
/// 8.8 column, up to 1040 MPa the 10.9 column, above that 12.9 (12.9 fine
/// reads the larger of 12.9 coarse and 10.9 fine). Materials outside the
/// table read the nearest conservative row and are flagged not tabulated.
/// Where the sheet has no legible value for a stronger bolt (aluminium:
/// 10.9 and 12.9), the 8.8 value is scaled by Rm,bolt / 800 MPa.
/// Plastics and threaded inserts have no rule (Invalid, `tapped_part.material`).
/// The result is never below the common-practice rule (steel 1·d, cast iron
/// 1.25·d, aluminium 2·d). Invalid (field `clamped_material`) for a
/// material id the engine does not know and that has no Rm.
pub fn min_engagement_factor(
    material: &ClampedMaterial,
    strength: &Strength,
    thread: &ThreadGeometry,
) -> Result<EngagementFactor, EngineError> {
    if material.kind != MaterialKind::Metal {
        return Err(EngineError::invalid(
            "tapped_part.material",
            format!(
                "no thread-engagement rule for '{}': {} threads are outside VDI 2230; the \
                 engagement must be proven by a joint test",
                material.id,
                material.kind.id().replace('_', " ")
            ),
        ));
    }
    let (row, listed) = match raw(&material.id) {
        Some((_, m)) => (m.row, m.row_is_listed),
        None => match material.tensile_strength_min.map(|p| p.get::<megapascal>()) {
            Some(rm) if rm > 800.0 => (EngagementRow::QuenchedTempered, false),
            Some(rm) if rm > 500.0 => (EngagementRow::StructuralSteel, false),
            Some(rm) if rm > 360.0 => (EngagementRow::MildSteel, false),
            _ => {
                return Err(EngineError::invalid(
                    "clamped_material",
                    format!(
                        "no thread-engagement recommendation for '{}': not a tabulated material and no steel-like Rm; choose a tabulated material",
                        material.id
                    ),
                ))
            }
        },
    };
    let fine = matches!(thread.series, ThreadSeries::Fine | ThreadSeries::Unf);
    let rm = strength.tensile_strength_min.get::<megapascal>();
    let v = row_values(row);
    let (value, column) = if rm <= 830.0 + 1e-6 {
        (
            if fine { v[1] } else { v[0] },
            if fine { "8.8 fine" } else { "8.8 coarse" },
        )
    } else if rm <= 1040.0 + 1e-6 {
        (
            if fine { v[3] } else { v[2] },
            if fine { "10.9 fine" } else { "10.9 coarse" },
        )
    } else if fine {
        (
            v[4].zip(v[3]).map(|(a, b)| a.max(b)),
            "12.9 fine (larger of 12.9 coarse and 10.9 fine)",
        )
    } else {
        (v[4], "12.9 coarse")
    };
    let thumb = rule_of_thumb(row);
    let (factor, tabulated, how) = match value {
        Some(f) => (f.max(thumb), listed, format!("{SUPPLIER}; column {column}")),
        None => {
            // The sheet has no legible value for a stronger bolt in this
            // material: scale its 8.8 value by the bolt's breaking load.
            let base = if fine { v[1] } else { v[0] }.unwrap_or(thumb);
            let scaled = base * (rm / RM_8_8_MPA).max(1.0);
            (
                scaled.max(thumb),
                false,
                format!(
                    "{SUPPLIER}; no legible value for column {column}: the 8.8 value {base}·d scaled by Rm,bolt/800 MPa = {:.3} to {scaled:.2}·d (the internal thread's stripping force grows in proportion to the engaged length, so the length for the bolt to break before the thread strips — the design rule of VDI 2230 Part 1:2015 §5.5.5, section recalled from memory — grows with the bolt's breaking load Rm·A_s)",
                    rm / RM_8_8_MPA
                ),
            )
        }
    };
    let stand_in = if listed {
        String::new()
    } else {
        format!(
            "; {} is not a row of the sheet, nearest conservative row used",
            material.id
        )
    };
    Ok(EngagementFactor {
        factor,
        tabulated: tabulated && value.is_some(),
        source: format!(
            "{how}{stand_in}; never below the common-practice rule steel 1·d, cast iron 1.25·d, aluminium 2·d ({thumb}·d here)"
        ),
    })
}
