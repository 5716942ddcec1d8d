//! Strength grades of fasteners: ISO 898-1, ISO 3506-1, SAE J429, ASTM A574,
//! the ASTM inch bolting grades A193 B7/B7M, A320 L7, F3125 A325/A490, A449,
//! and for metric bolts above M39 ASTM A193M B7/B7M/B8/B8M and A320M L7.
//!
//! Public surface:
//! - [`property_classes`] lists every grade with its size ranges;
//! - [`find_property_class`] accepts the spellings people use (`8.8`,
//!   `a4-80`, `SAE J429 Grade 5`, `grade 5`, `J429-8`, `ASTM A574`, `A574`);
//! - [`strength_for`] gives the [`Strength`] of a grade at one thread size.
//!
//! Decisions: a grade is only valid on the thread form its standard is
//! written for. ISO 898-1 and ISO 3506-1 classes on a Unified thread, or SAE
//! J429 / ASTM A574 grades on a metric thread, are refused (Invalid) rather
//! than converted, because those standards tie the strengths to their own
//! size steps. A custom thread is accepted when its nominal diameter lies in
//! a size range of the grade. ISO 898-1 fine threads below M8 are refused:
//! the standard covers fine threads M8x1 to M39x3 (recalled from memory).

mod large;
mod refusal;
mod table;
#[cfg(test)]
mod tests;
#[cfg(test)]
mod tests_large;

use std::sync::OnceLock;

use uom::si::f64::{Length, Pressure};
use uom::si::length::{inch, millimeter};
use uom::si::pressure::{megapascal, psi};

use super::thread::{ThreadForm, ThreadGeometry, ThreadSeries};
use super::EngineError;

/// Which minimum yield value a grade's standard specifies.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum YieldBasis {
    /// Lower yield strength ReL.
    LowerYield,
    /// 0.2 % proof strength Rp0.2.
    ProofStrength02,
    /// Stress at 0.0048·d non-proportional elongation, full-size fastener Rpf.
    FullSizeRpf,
    /// Yield strength as the inch standards state it.
    InchYield,
}

/// The strengths of one grade at one size.
#[derive(Debug, Clone, PartialEq)]
pub struct Strength {
    /// Grade identifier as the API spells it, e.g. `8.8`, `A2-70`, `sae-j429-5`.
    pub id: String,
    /// Standard the values come from, e.g. `ISO 898-1:2013 Table 3`.
    pub standard: String,
    /// Minimum tensile strength Rm,min.
    pub tensile_strength_min: Pressure,
    /// Minimum yield strength used for preload (ReL, Rp0.2, Rpf...).
    pub yield_strength_min: Pressure,
    pub yield_basis: YieldBasis,
    /// Proof stress Sp (proof load = Sp·As).
    pub proof_stress: Pressure,
}

/// The standard family a grade belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum GradeFamily {
    /// ISO 898-1 carbon and alloy steel property classes.
    Iso898,
    /// ISO 3506-1 austenitic stainless steel.
    Iso3506,
    /// SAE J429 inch grades.
    SaeJ429,
    /// ASTM A574 socket head cap screws.
    AstmA574,
    /// ASTM inch bolting: A193, A320, F3125, A449.
    AstmBolting,
    /// ASTM metric bolting: A193M, A320M (the sizes above M39).
    AstmBoltingMetric,
}

impl GradeFamily {
    /// The thread form the family's standard is written for.
    pub fn thread_form(self) -> ThreadForm {
        match self {
            Self::Iso898 | Self::Iso3506 | Self::AstmBoltingMetric => ThreadForm::IsoMetric,
            Self::SaeJ429 | Self::AstmA574 | Self::AstmBolting => ThreadForm::Unified,
        }
    }
}

/// One size range of a grade with its strengths.
#[derive(Debug, Clone, PartialEq)]
pub struct SizeRange {
    /// Smallest nominal diameter covered.
    pub min_diameter: Length,
    /// Whether `min_diameter` itself is covered (false for "over 16 mm").
    pub min_inclusive: bool,
    /// Largest nominal diameter covered (inclusive).
    pub max_diameter: Length,
    /// The range as a person reads it, e.g. `over M16 to M39`.
    pub label: &'static str,
    pub tensile_strength_min: Pressure,
    pub yield_strength_min: Pressure,
    pub proof_stress: Pressure,
}

impl SizeRange {
    /// True when the nominal diameter lies in this range (1 µm tolerance).
    pub fn covers(&self, d: Length) -> bool {
        let d = d.get::<millimeter>();
        let lo = self.min_diameter.get::<millimeter>();
        let hi = self.max_diameter.get::<millimeter>();
        let above_min = if self.min_inclusive {
            d >= lo - 1e-3
        } else {
            d > lo + 1e-3
        };
        above_min && d <= hi + 1e-3
    }
}

/// A strength grade with everything the reference endpoint lists.
#[derive(Debug, Clone, PartialEq)]
pub struct GradeInfo {
    /// Identifier as the API spells it: `8.8`, `A2-70`, `sae-j429-5`, `astm-a574`.
    pub id: &'static str,
    /// Name a technician reads, e.g. `SAE J429 Grade 5`.
    pub name: &'static str,
    pub standard: &'static str,
    pub family: GradeFamily,
    pub yield_basis: YieldBasis,
    pub size_ranges: Vec<SizeRange>,
    /// Conditions of the standard worth showing beside the values.
    pub notes: &'static [&'static str],
}

/// Every grade, in the order the reference endpoint lists them.
pub fn property_classes() -> &'static [GradeInfo] {
    static GRADES: OnceLock<Vec<GradeInfo>> = OnceLock::new();
    GRADES.get_or_init(|| {
        table::GRADES
            .iter()
            .chain(large::GRADES)
            .map(build)
            .collect()
    })
}

fn build(g: &table::RawGrade) -> GradeInfo {
    let metric = g.family.thread_form() == ThreadForm::IsoMetric;
    let len = |v: f64| {
        if metric {
            Length::new::<millimeter>(v)
        } else {
            Length::new::<inch>(v)
        }
    };
    let stress = |v: f64| {
        if metric {
            Pressure::new::<megapascal>(v)
        } else {
            Pressure::new::<psi>(v)
        }
    };
    GradeInfo {
        id: g.id,
        name: g.name,
        standard: g.standard,
        family: g.family,
        yield_basis: g.yield_basis,
        size_ranges: g
            .ranges
            .iter()
            .map(|r| SizeRange {
                min_diameter: len(r.min),
                min_inclusive: r.min_inclusive,
                max_diameter: len(r.max),
                label: r.label,
                tensile_strength_min: stress(r.rm),
                yield_strength_min: stress(r.yield_min),
                proof_stress: stress(r.proof),
            })
            .collect(),
        notes: g.notes,
    }
}

const FIELD: &str = "property_class";

/// Lower-cased letters and digits of `text`, without a leading standard or
/// `class` word, into `buf`. None when the text is too long to be a grade.
fn normalise<'b>(text: &str, buf: &'b mut [u8; 40]) -> Option<&'b [u8]> {
    let mut n = 0;
    for c in text.bytes().filter(u8::is_ascii_alphanumeric) {
        if n == buf.len() {
            return None;
        }
        buf[n] = c.to_ascii_lowercase();
        n += 1;
    }
    let mut s: &[u8] = &buf[..n];
    for prefix in [
        &b"en"[..],
        b"iso8981",
        b"iso35061",
        b"propertyclass",
        b"class",
        b"pc",
    ] {
        if s.len() > prefix.len() && s.starts_with(prefix) {
            s = &s[prefix.len()..];
        }
    }
    Some(s)
}

/// Matches a normalised key against one grade id.
fn key_matches(key: &[u8], id: &str) -> bool {
    match id {
        "sae-j429-2" => sae_matches(key, b"2"),
        "sae-j429-5" => sae_matches(key, b"5"),
        "sae-j429-8" => sae_matches(key, b"8"),
        "astm-a574" => matches!(key, b"astma574" | b"a574" | b"astma574shcs"),
        "sae-j429-1" => sae_matches(key, b"1"),
        "sae-j429-8.2" => sae_matches(key, b"82"),
        "astm-a193-b7" => matches!(key, b"astma193b7" | b"a193b7" | b"b7" | b"a193gradeb7"),
        "astm-a193-b7m" => matches!(key, b"astma193b7m" | b"a193b7m" | b"b7m" | b"a193gradeb7m"),
        "astm-a320-l7" => matches!(key, b"astma320l7" | b"a320l7" | b"l7" | b"a320gradel7"),
        "astm-f3125-a325" => matches!(key, b"astmf3125a325" | b"f3125a325" | b"a325" | b"astma325"),
        "astm-f3125-a490" => matches!(key, b"astmf3125a490" | b"f3125a490" | b"a490" | b"astma490"),
        "astm-a449" => matches!(key, b"astma449" | b"a449"),
        "astm-a193m-b7" => matches!(key, b"astma193mb7" | b"a193mb7"),
        "astm-a193m-b7m" => matches!(key, b"astma193mb7m" | b"a193mb7m"),
        "astm-a320m-l7" => matches!(key, b"astma320ml7" | b"a320ml7"),
        "astm-a193m-b8-1" => matches!(key, b"astma193mb81" | b"a193mb81" | b"a193mb8class1"),
        "astm-a193m-b8m-1" => matches!(key, b"astma193mb8m1" | b"a193mb8m1" | b"a193mb8mclass1"),
        _ => {
            let compact = id.bytes().filter(u8::is_ascii_alphanumeric);
            key.len() == compact.clone().count()
                && key
                    .iter()
                    .zip(compact)
                    .all(|(k, c)| *k == c.to_ascii_lowercase())
        }
    }
}

/// `sae j429 grade 5`, `sae-j429-5`, `j429-5`, `grade 5`, `gr5`, `sae grade 5`.
fn sae_matches(key: &[u8], grade: &[u8]) -> bool {
    let mut rest = key;
    let mut had_prefix = false;
    for prefix in [&b"sae"[..], b"j429"] {
        if let Some(r) = rest.strip_prefix(prefix) {
            rest = r;
            had_prefix = true;
        }
    }
    let mut had_grade_word = false;
    for word in [&b"grade"[..], b"gr"] {
        if let Some(r) = rest.strip_prefix(word) {
            rest = r;
            had_grade_word = true;
            break;
        }
    }
    (had_prefix || had_grade_word) && rest == grade
}

/// Looks a grade up by any of its usual spellings.
///
/// Unknown (field `property_class`) with the nearest ids as suggestions.
pub fn find_property_class(id: &str) -> Result<&'static GradeInfo, EngineError> {
    let mut buf = [0u8; 40];
    let found = normalise(id, &mut buf).and_then(|key| {
        property_classes()
            .iter()
            .find(|g| !key.is_empty() && key_matches(key, g.id))
    });
    found.ok_or_else(|| unknown(id))
}

fn unknown(given: &str) -> EngineError {
    let lower = given.trim().to_lowercase();
    let mut scored: Vec<(f64, &'static str)> = property_classes()
        .iter()
        .map(|g| {
            let by_id = strsim::jaro_winkler(&lower, &g.id.to_lowercase());
            let by_name = strsim::jaro_winkler(&lower, &g.name.to_lowercase());
            (by_id.max(by_name), g.id)
        })
        .collect();
    scored.sort_by(|a, b| b.0.total_cmp(&a.0));
    EngineError::Unknown {
        field: FIELD.into(),
        kind: "property class",
        given: given.chars().take(64).collect(),
        suggestions: scored
            .iter()
            .take(3)
            .map(|(_, id)| id.to_string())
            .collect(),
    }
}

/// The strengths of a grade at the size of `thread`.
///
/// Invalid (field `property_class`) when the thread form does not belong to
/// the grade's standard, or the size lies outside every size range of the
/// grade; the reason names the ranges, the suggestions name grades of the
/// same family that do cover the size.
pub fn strength_for(id: &str, thread: &ThreadGeometry) -> Result<Strength, EngineError> {
    let grade = find_property_class(id)?;
    let form = grade.family.thread_form();
    if thread.form != form {
        return Err(refusal::wrong_form(grade, thread));
    }
    if grade.family == GradeFamily::Iso898
        && thread.series == ThreadSeries::Fine
        && thread.nominal_diameter.get::<millimeter>() < 8.0 - 1e-6
    {
        return Err(EngineError::invalid(
            FIELD,
            format!(
                "ISO 898-1 covers fine threads from M8x1 to M39x3 (recalled from memory); {} is outside",
                thread.designation
            ),
        ));
    }
    let d = thread.nominal_diameter;
    let Some(range) = grade.size_ranges.iter().find(|r| r.covers(d)) else {
        return Err(refusal::outside_sizes(grade, thread));
    };
    Ok(Strength {
        id: grade.id.to_string(),
        standard: format!("{}, {}", grade.standard, range.label),
        tensile_strength_min: range.tensile_strength_min,
        yield_strength_min: range.yield_strength_min,
        yield_basis: grade.yield_basis,
        proof_stress: range.proof_stress,
    })
}
