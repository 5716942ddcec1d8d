//! Embedding: the plastic flattening of surface roughness in the thread, under
//! head and nut and at every inner interface of the clamped stack after
//! tightening, and the preload it costs.
//!
//! Amounts per surface from VDI 2230 Part 1:2003 Table 5 (values recalled
//! from memory, not checked against the guideline here), in µm:
//!
//! | Rz (µm)        | loading    | thread | per head or nut bearing face | per inner interface |
//! |----------------|------------|--------|------------------------------|---------------------|
//! | < 10           | axial      | 3      | 2.5                          | 1.5                 |
//! | < 10           | transverse | 3      | 3                            | 2                   |
//! | 10 to < 40     | axial      | 3      | 3                            | 2                   |
//! | 10 to < 40     | transverse | 3      | 4.5                          | 2.5                 |
//! | 40 to < 160    | axial      | 3      | 4                            | 3                   |
//! | 40 to < 160    | transverse | 3      | 6.5                          | 3.5                 |
//!
//! f_Z is the sum over the surfaces of the joint; the preload loss is
//! F_Z = f_Z/(δ_S + δ_P) (VDI 2230 Part 1:2003 §5.4.2, recalled from memory).

use uom::si::f64::{Force, Length};
use uom::si::force::newton;
use uom::si::length::micrometer;

use crate::engine::angle::JointType;
use crate::engine::quantity::positive;
use crate::engine::EngineError;

/// Most inner interfaces accepted (a bound on the stack a request describes).
pub const MAX_INTERFACES: u32 = 32;

/// Surface roughness class of VDI 2230 Part 1:2003 Table 5.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum RoughnessClass {
    /// Rz < 10 µm.
    Below10,
    /// 10 µm ≤ Rz < 40 µm.
    From10To40,
    /// 40 µm ≤ Rz < 160 µm.
    From40To160,
}

/// Direction of the working load, which sets the embedding amounts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Loading {
    Axial,
    Transverse,
}

/// Table 5 class of a roughness Rz; 160 µm and above is outside the table.
pub fn roughness_class(rz: Length) -> Result<RoughnessClass, EngineError> {
    let um = positive(rz.value, "roughness_rz")? * 1e6;
    if um < 10.0 {
        Ok(RoughnessClass::Below10)
    } else if um < 40.0 {
        Ok(RoughnessClass::From10To40)
    } else if um < 160.0 {
        Ok(RoughnessClass::From40To160)
    } else {
        Err(EngineError::invalid(
            "roughness_rz",
            format!(
                "Rz {um:.1} µm is outside VDI 2230 Part 1 Table 5 (Rz below 160 µm); the \
                 embedding of rougher surfaces must be measured"
            ),
        ))
    }
}

/// Embedding amounts (thread, per bearing face, per inner interface) in µm,
/// VDI 2230 Part 1:2003 Table 5 (recalled from memory).
pub fn table_5(class: RoughnessClass, loading: Loading) -> [f64; 3] {
    use Loading::{Axial, Transverse};
    use RoughnessClass::{Below10, From10To40, From40To160};
    match (class, loading) {
        (Below10, Axial) => [3.0, 2.5, 1.5],
        (Below10, Transverse) => [3.0, 3.0, 2.0],
        (From10To40, Axial) => [3.0, 3.0, 2.0],
        (From10To40, Transverse) => [3.0, 4.5, 2.5],
        (From40To160, Axial) => [3.0, 4.0, 3.0],
        (From40To160, Transverse) => [3.0, 6.5, 3.5],
    }
}

/// The surfaces that embed in a joint.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Surfaces {
    /// Head and nut bearing faces: 2 through-bolted, 1 in a tapped hole.
    pub bearing_faces: u32,
    /// Inner interfaces between the layers of the stack (and between the last
    /// layer and the tapped part).
    pub inner_interfaces: u32,
}

impl Surfaces {
    /// Surfaces of a stack of `layers` clamped layers (washers included):
    /// through-bolted, layers − 1 interfaces and two bearing faces; tapped,
    /// one interface per layer (the last sits on the tapped part) and one
    /// bearing face.
    pub fn of_stack(joint: JointType, layers: u32) -> Result<Self, EngineError> {
        if layers == 0 || layers > MAX_INTERFACES {
            return Err(EngineError::invalid(
                "clamped_parts",
                format!("between 1 and {MAX_INTERFACES} clamped layers are accepted, got {layers}"),
            ));
        }
        Ok(match joint {
            JointType::ThroughBolted => Self {
                bearing_faces: 2,
                inner_interfaces: layers - 1,
            },
            JointType::TappedHole => Self {
                bearing_faces: 1,
                inner_interfaces: layers,
            },
        })
    }
}

/// Embedding of a joint and the preload it costs.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Embedding {
    pub class: RoughnessClass,
    pub loading: Loading,
    /// f_Z, the total embedding amount.
    pub amount: Length,
    /// F_Z = f_Z/(δ_S + δ_P).
    pub preload_loss: Force,
}

/// f_Z summed over the surfaces and F_Z = f_Z/(δ_S + δ_P), resiliences in m/N.
pub fn embedding(
    rz: Length,
    loading: Loading,
    surfaces: Surfaces,
    bolt_resilience: f64,
    clamped_resilience: f64,
) -> Result<Embedding, EngineError> {
    let class = roughness_class(rz)?;
    if surfaces.inner_interfaces > MAX_INTERFACES || surfaces.bearing_faces > 2 {
        return Err(EngineError::invalid(
            "clamped_parts",
            format!("at most {MAX_INTERFACES} inner interfaces and 2 bearing faces are accepted"),
        ));
    }
    let delta = positive(bolt_resilience, "bolt")? + positive(clamped_resilience, "clamped_parts")?;
    let [thread, face, interface] = table_5(class, loading);
    let um = thread
        + face * f64::from(surfaces.bearing_faces)
        + interface * f64::from(surfaces.inner_interfaces);
    let amount = Length::new::<micrometer>(um);
    Ok(Embedding {
        class,
        loading,
        amount,
        preload_loss: Force::new::<newton>(amount.value / delta),
    })
}

#[cfg(test)]
mod tests;
