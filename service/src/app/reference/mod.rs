//! Reference data from the engine's tables, as the adapters serve it:
//! threads and property classes (`tables`), tightening methods, clamped
//! materials and bearing types (`lists`), nut classes (`nuts`). Finishes and lubricants are
//! catalogue items (`app::catalogue`).

mod lists;
mod nuts;
mod tables;

pub use lists::{
    bearing_types, materials, tightening_methods, BearingTypes, Material, MaterialList, NamedValue,
    Range, TighteningMethodList, TighteningMethodWire,
};
pub use nuts::{nut_classes, NutClassList, NutClassWire, NutRangeWire};
pub use tables::{
    property_class, property_classes, thread, threads, PropertyClass, SizeRangeWire, Thread, SERIES,
};
