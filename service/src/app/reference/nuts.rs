//! The nut property classes (`nut.property_class` of a spec request) as
//! `/v1/nut-classes` serves them.

use serde::Serialize;
use uom::si::f64::{Length, Pressure};
use uom::si::length::{inch, millimeter};
use uom::si::pressure::{megapascal, psi};
use utoipa::ToSchema;

use crate::app::quantity::{Quantity, Units};
use crate::engine::nut::{self, NutClass};
use crate::engine::thread::ThreadForm;

/// Proof stress of a nut class over one size range.
#[derive(Debug, Serialize, ToSchema)]
pub struct NutRangeWire {
    /// The range as a person reads it, e.g. `over M10 to M16`.
    pub label: String,
    pub min_diameter: Quantity,
    pub max_diameter: Quantity,
    /// Proof load stress S_p (proof load = S_p · A_s of the bolt thread).
    pub proof_stress: Quantity,
}

/// A nut property class or grade.
#[derive(Debug, Serialize, ToSchema)]
pub struct NutClassWire {
    /// The value of `nut.property_class`, e.g. `iso-898-2-10`.
    pub id: String,
    pub name: String,
    pub standard: String,
    /// `iso_metric` or `unified`.
    pub thread_form: String,
    /// The strongest bolt the class is made to carry.
    pub mates: String,
    pub size_ranges: Vec<NutRangeWire>,
}

/// The nut classes, wrapped like the other reference lists.
#[derive(Debug, Serialize, ToSchema)]
pub struct NutClassList {
    pub nut_classes: Vec<NutClassWire>,
}

fn wire(c: &NutClass, units: Units) -> NutClassWire {
    let metric = c.form == ThreadForm::IsoMetric;
    let len = |v: f64| {
        let l = if metric {
            Length::new::<millimeter>(v)
        } else {
            Length::new::<inch>(v)
        };
        Quantity::length(l, units)
    };
    let stress = |v: f64| {
        let p = if metric {
            Pressure::new::<megapascal>(v)
        } else {
            Pressure::new::<psi>(v)
        };
        Quantity::stress(p, units)
    };
    NutClassWire {
        id: c.id.into(),
        name: c.name.into(),
        standard: c.standard.into(),
        thread_form: if metric { "iso_metric" } else { "unified" }.into(),
        mates: c.mates.into(),
        size_ranges: c
            .ranges
            .iter()
            .map(|r| NutRangeWire {
                label: r.label.into(),
                min_diameter: len(r.min),
                max_diameter: len(r.max),
                proof_stress: stress(r.proof_stress),
            })
            .collect(),
    }
}

/// Every nut class (ISO 898-2, SAE J995, ASTM A563).
pub fn nut_classes(units: Units) -> NutClassList {
    NutClassList {
        nut_classes: nut::nut_classes().iter().map(|c| wire(c, units)).collect(),
    }
}
