//! Nut property classes and grades: ISO 898-2 (metric) and their inch
//! counterparts SAE J995 and ASTM A563, each with its size range and the
//! strongest bolt it is made to carry.
//!
//! Public surface:
//! - [`nut_classes`] lists every class with its size ranges and source;
//! - [`nut_strength`] gives the [`NutStrength`] of a class at one thread
//!   size (field `nut.property_class`), refusing a class on the wrong thread
//!   form or outside its sizes.
//!
//! The nut checks compare (a) the strongest bolt the class is made for with
//! the bolt's Rm,min — a weaker nut strips its thread before the bolt
//! breaks — and (b) the nut's proof load Sp·A_s with the highest assembly
//! preload. Both assume the standard's own nut height (ISO 4032 style 1,
//! ISO 4033 style 2, ASME B18.2.2 hex and heavy hex), which is the
//! engagement length a nut gives (stated in the check).

use uom::si::f64::{Length, Pressure};
use uom::si::length::{inch, millimeter};
use uom::si::pressure::{megapascal, psi};

use super::thread::{ThreadForm, ThreadGeometry};
use super::EngineError;

const FIELD: &str = "nut.property_class";

/// One size range of a nut class: (min exclusive unless first, max
/// inclusive, label, proof stress Sp) in the standard's units.
pub struct NutRange {
    pub min: f64,
    pub max: f64,
    pub label: &'static str,
    pub proof_stress: f64,
}

/// A nut class as its standard defines it. Diameters in mm (metric) or in
/// (inch); stresses in MPa (metric) or psi (inch).
pub struct NutClass {
    /// Id as the API spells it, e.g. `iso-898-2-8`.
    pub id: &'static str,
    pub name: &'static str,
    pub standard: &'static str,
    pub form: ThreadForm,
    /// Strongest bolt Rm,min the class is made to carry (the standard's
    /// bolt-and-nut combination), in the standard's stress unit.
    pub mates_bolt_rm_up_to: f64,
    /// What that bolt is, in words.
    pub mates: &'static str,
    pub ranges: &'static [NutRange],
    /// Other spellings, compared after removing non-alphanumerics.
    pub aliases: &'static [&'static str],
}

const fn r(min: f64, max: f64, label: &'static str, proof_stress: f64) -> NutRange {
    NutRange {
        min,
        max,
        label,
        proof_stress,
    }
}

// ISO 898-2:2012, proof load stress Sp of nuts with coarse thread (style 1
// for classes 5, 8 and 10; class 12 style 1 up to M16 and style 2 above),
// values recalled from memory; the standard covers M5 to M39 (scope,
// recalled from memory). Class n is made for bolts up to property class
// n.x (ISO 898-2:2012 combination of nuts and bolts, recalled from memory),
// so the strongest mating bolt's Rm,min is that of ISO 898-1:2013 Table 3.
const ISO898_2: &str =
    "ISO 898-2:2012, proof load stress of nuts with coarse thread (values recalled from memory)";
// SAE J995 proof stresses and ASTM A563 proof stresses (hex and heavy hex
// nuts), recalled from memory; the mating bolt grades are those the
// standards pair them with (SAE J429 grades; ASTM A307, A325/A449, A490),
// recalled from memory.
const J995: &str = "SAE J995, mechanical requirements of steel nuts (values recalled from memory)";
const A563: &str = "ASTM A563, carbon and alloy steel nuts (values recalled from memory)";

static CLASSES: &[NutClass] = &[
    NutClass {
        id: "iso-898-2-5",
        name: "nut property class 5",
        standard: ISO898_2,
        form: ThreadForm::IsoMetric,
        mates_bolt_rm_up_to: 520.0,
        mates: "bolts up to property class 5.8 (Rm,min 520 MPa)",
        ranges: &[
            r(5.0, 7.0, "M5 to M7", 580.0),
            r(7.0, 10.0, "over M7 to M10", 590.0),
            r(10.0, 16.0, "over M10 to M16", 610.0),
            r(16.0, 39.0, "over M16 to M39", 630.0),
        ],
        aliases: &["5", "class 5", "iso 898-2 5", "iso 898-2 class 5"],
    },
    NutClass {
        id: "iso-898-2-8",
        name: "nut property class 8",
        standard: ISO898_2,
        form: ThreadForm::IsoMetric,
        mates_bolt_rm_up_to: 830.0,
        mates: "bolts up to property class 8.8 (Rm,min 830 MPa above M16)",
        ranges: &[
            r(5.0, 7.0, "M5 to M7", 810.0),
            r(7.0, 10.0, "over M7 to M10", 830.0),
            r(10.0, 16.0, "over M10 to M16", 840.0),
            r(16.0, 39.0, "over M16 to M39", 920.0),
        ],
        aliases: &["8", "class 8", "iso 898-2 8", "iso 898-2 class 8"],
    },
    NutClass {
        id: "iso-898-2-10",
        name: "nut property class 10",
        standard: ISO898_2,
        form: ThreadForm::IsoMetric,
        mates_bolt_rm_up_to: 1040.0,
        mates: "bolts up to property class 10.9 (Rm,min 1040 MPa)",
        ranges: &[
            r(5.0, 10.0, "M5 to M10", 1040.0),
            r(10.0, 16.0, "over M10 to M16", 1050.0),
            r(16.0, 39.0, "over M16 to M39", 1060.0),
        ],
        aliases: &["10", "class 10", "iso 898-2 10", "iso 898-2 class 10"],
    },
    NutClass {
        id: "iso-898-2-12",
        name: "nut property class 12",
        standard: ISO898_2,
        form: ThreadForm::IsoMetric,
        mates_bolt_rm_up_to: 1220.0,
        mates: "bolts up to property class 12.9 (Rm,min 1220 MPa)",
        ranges: &[
            r(5.0, 7.0, "M5 to M7", 1150.0),
            r(7.0, 10.0, "over M7 to M10", 1160.0),
            r(10.0, 16.0, "over M10 to M16", 1190.0),
            r(16.0, 39.0, "over M16 to M39 (style 2)", 1200.0),
        ],
        aliases: &["12", "class 12", "iso 898-2 12", "iso 898-2 class 12"],
    },
    NutClass {
        id: "sae-j995-2",
        name: "SAE J995 Grade 2 nut",
        standard: J995,
        form: ThreadForm::Unified,
        mates_bolt_rm_up_to: 74_000.0,
        mates: "SAE J429 Grade 2 bolts (Rm,min 74 ksi)",
        ranges: &[r(0.25, 1.5, "1/4 to 1-1/2 in", 90_000.0)],
        aliases: &["sae j995 grade 2", "j995 grade 2", "j995-2", "sae j995 2"],
    },
    NutClass {
        id: "sae-j995-5",
        name: "SAE J995 Grade 5 nut",
        standard: J995,
        form: ThreadForm::Unified,
        mates_bolt_rm_up_to: 120_000.0,
        mates: "SAE J429 Grade 5 bolts (Rm,min 120 ksi)",
        ranges: &[
            r(0.25, 1.0, "1/4 to 1 in", 120_000.0),
            r(1.0, 1.5, "over 1 to 1-1/2 in", 105_000.0),
        ],
        aliases: &["sae j995 grade 5", "j995 grade 5", "j995-5", "sae j995 5"],
    },
    NutClass {
        id: "sae-j995-8",
        name: "SAE J995 Grade 8 nut",
        standard: J995,
        form: ThreadForm::Unified,
        mates_bolt_rm_up_to: 150_000.0,
        mates: "SAE J429 Grade 8 bolts (Rm,min 150 ksi)",
        ranges: &[r(0.25, 1.5, "1/4 to 1-1/2 in", 150_000.0)],
        aliases: &["sae j995 grade 8", "j995 grade 8", "j995-8", "sae j995 8"],
    },
    NutClass {
        id: "astm-a563-a",
        name: "ASTM A563 Grade A hex nut",
        standard: A563,
        form: ThreadForm::Unified,
        mates_bolt_rm_up_to: 60_000.0,
        mates: "ASTM A307 bolts (Rm,min 60 ksi)",
        ranges: &[r(0.25, 1.5, "1/4 to 1-1/2 in", 90_000.0)],
        aliases: &["a563 a", "a563 grade a", "astm a563 grade a"],
    },
    NutClass {
        id: "astm-a563-c",
        name: "ASTM A563 Grade C heavy hex nut",
        standard: A563,
        form: ThreadForm::Unified,
        mates_bolt_rm_up_to: 120_000.0,
        mates: "ASTM F3125 Grade A325 and A449 bolts (Rm,min 120 ksi)",
        ranges: &[r(0.25, 4.0, "1/4 to 4 in", 144_000.0)],
        aliases: &["a563 c", "a563 grade c", "astm a563 grade c"],
    },
    NutClass {
        id: "astm-a563-dh",
        name: "ASTM A563 Grade DH heavy hex nut",
        standard: A563,
        form: ThreadForm::Unified,
        mates_bolt_rm_up_to: 150_000.0,
        mates: "ASTM F3125 Grade A490 bolts (Rm,min 150 ksi)",
        ranges: &[r(0.25, 4.0, "1/4 to 4 in", 175_000.0)],
        aliases: &["a563 dh", "a563 grade dh", "astm a563 grade dh"],
    },
];

/// Every nut class, in listing order.
pub fn nut_classes() -> &'static [NutClass] {
    CLASSES
}

/// A nut class at one size, in SI.
#[derive(Debug, Clone, PartialEq)]
pub struct NutStrength {
    pub id: &'static str,
    pub name: &'static str,
    /// Standard and size range the values come from.
    pub standard: String,
    /// Proof load stress Sp (proof load = Sp·A_s of the bolt thread).
    pub proof_stress: Pressure,
    /// Strongest bolt Rm,min the class is made to carry.
    pub mates_bolt_rm_up_to: Pressure,
    pub mates: &'static str,
}

impl NutClass {
    fn stress(&self, v: f64) -> Pressure {
        match self.form {
            ThreadForm::IsoMetric => Pressure::new::<megapascal>(v),
            ThreadForm::Unified => Pressure::new::<psi>(v),
        }
    }

    fn size(&self, d: Length) -> f64 {
        match self.form {
            ThreadForm::IsoMetric => d.get::<millimeter>(),
            ThreadForm::Unified => d.get::<inch>(),
        }
    }
}

fn key(s: &str) -> String {
    s.bytes()
        .filter(u8::is_ascii_alphanumeric)
        .map(|c| char::from(c.to_ascii_lowercase()))
        .collect()
}

/// Looks a nut class up by id or usual spelling (Unknown naming
/// `nut.property_class` with the nearest ids).
pub fn find_nut_class(text: &str) -> Result<&'static NutClass, EngineError> {
    let k = key(text);
    let found = (!k.is_empty() && text.len() <= 64)
        .then(|| {
            CLASSES
                .iter()
                .find(|c| key(c.id) == k || c.aliases.iter().any(|a| key(a) == k))
        })
        .flatten();
    found.ok_or_else(|| {
        let lower = text.trim().to_lowercase();
        let mut scored: Vec<(f64, &str)> = CLASSES
            .iter()
            .map(|c| (strsim::jaro_winkler(&lower, c.id), c.id))
            .collect();
        scored.sort_by(|a, b| b.0.total_cmp(&a.0));
        EngineError::Unknown {
            field: FIELD.into(),
            kind: "nut property class",
            given: text.chars().take(64).collect(),
            suggestions: scored
                .iter()
                .take(3)
                .map(|(_, id)| id.to_string())
                .collect(),
        }
    })
}

/// The nut class `text` at the size of `thread`.
pub fn nut_strength(text: &str, thread: &ThreadGeometry) -> Result<NutStrength, EngineError> {
    let class = find_nut_class(text)?;
    if thread.form != class.form {
        let same_form: Vec<String> = CLASSES
            .iter()
            .filter(|c| c.form == thread.form)
            .map(|c| c.id.to_string())
            .collect();
        return Err(EngineError::Invalid {
            field: FIELD.into(),
            reason: format!(
                "{} ({}) is for {} threads, not for {}",
                class.name,
                class.standard,
                match class.form {
                    ThreadForm::IsoMetric => "ISO metric",
                    ThreadForm::Unified => "Unified inch",
                },
                thread.designation
            ),
            suggestions: same_form,
        });
    }
    let d = class.size(thread.nominal_diameter);
    let range = class
        .ranges
        .iter()
        .enumerate()
        .find(|(i, r)| {
            let above = if *i == 0 {
                d >= r.min - 1e-6
            } else {
                d > r.min + 1e-6
            };
            above && d <= r.max + 1e-6
        })
        .map(|(_, r)| r);
    let Some(range) = range else {
        let labels: Vec<&str> = class.ranges.iter().map(|r| r.label).collect();
        return Err(EngineError::invalid(
            FIELD,
            format!(
                "{} is defined for {} only ({}); {} is outside",
                class.name,
                labels.join(", "),
                class.standard,
                thread.designation
            ),
        ));
    };
    Ok(NutStrength {
        id: class.id,
        name: class.name,
        standard: format!("{}, {}", class.standard, range.label),
        proof_stress: class.stress(range.proof_stress),
        mates_bolt_rm_up_to: class.stress(class.mates_bolt_rm_up_to),
        mates: class.mates,
    })
}

#[cfg(test)]
mod tests;
