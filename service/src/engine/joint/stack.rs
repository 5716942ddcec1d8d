//! The clamped-part stack: several plates (a washer is a plate) of their own
//! thickness and elastic modulus, clamped as one substitute-deformation body.
//!
//! The body is the VDI 2230 Part 1 deformation cone (through-bolted: two
//! cones from the bearing faces meeting mid-way, w = 1; tapped hole: one
//! cone from the head, w = 2), with tan φ from the whole clamp length
//! (`angle::deformation_cone`, recalled from memory); where the cone reaches
//! the outer diameter D_A it continues as a sleeve of diameter D_A, and when
//! D_A ≤ d_W the whole body is a sleeve. The resilience of each layer is
//! the integral of dz/(E_i·A(z)) over its thickness, A(z) = π/4·(D(z)² − d_h²):
//! exact for the cone and the sleeve piece by piece (VDI 2230 Part 1:2015
//! §5.1.2 integrates the same body over the layers; recalled from memory).
//! With one modulus the sum is the guideline's closed formula for cone,
//! cone plus sleeve and sleeve; the tests hold it to that.
//!
//! The stack is handed to the rest of the model as one equivalent modulus:
//! the modulus that gives the stack's δ_P with the single-material formula.

use std::f64::consts::PI;

use uom::si::f64::{Length, Pressure};
use uom::si::length::meter;
use uom::si::pressure::pascal;

use crate::engine::angle::{deformation_cone, JointType};
use crate::engine::bearing::BearingSurface;
use crate::engine::quantity::positive;
use crate::engine::EngineError;

/// Most layers a stack may have (washers included).
pub const MAX_LAYERS: usize = 16;
/// Thinnest layer accepted: 0.1 mm (a shim; common practice).
pub const MIN_LAYER_M: f64 = 1e-4;
/// Thickest layer accepted: 2 m (keeps the figures meaningful).
pub const MAX_LAYER_M: f64 = 2.0;

/// One clamped layer.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ClampedLayer {
    pub thickness: Length,
    /// E of the layer's material.
    pub modulus: Pressure,
}

/// The stack as one body.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Stack {
    /// l_K = Σ thickness.
    pub clamp_length: Length,
    /// δ_P of the stack, m/N.
    pub clamped_resilience: f64,
    /// The modulus giving δ_P with the single-material formula.
    pub equivalent_modulus: Pressure,
}

/// Validated layer thicknesses (m) and moduli (Pa), each problem named.
fn read_layers(layers: &[ClampedLayer]) -> Result<Vec<(f64, f64)>, EngineError> {
    if layers.is_empty() || layers.len() > MAX_LAYERS {
        return Err(EngineError::invalid(
            "clamped_parts",
            format!(
                "between 1 and {MAX_LAYERS} clamped layers are accepted, got {}",
                layers.len()
            ),
        ));
    }
    let mut out = Vec::with_capacity(layers.len());
    for (i, l) in layers.iter().enumerate() {
        let field = format!("clamped_parts[{i}].thickness");
        let t = positive(l.thickness.value, &field)?;
        if !(MIN_LAYER_M..=MAX_LAYER_M).contains(&t) {
            return Err(EngineError::invalid(
                field,
                format!(
                    "a layer's thickness must lie between 0.1 mm and 2000 mm, got {:.3} mm",
                    t * 1e3
                ),
            ));
        }
        let e = positive(l.modulus.value, &format!("clamped_parts[{i}].material"))?;
        out.push((t, e));
    }
    Ok(out)
}

/// The cumulative geometric resilience F(z) = ∫₀^z dz'/A(z') (E = 1) of the
/// substitute body, z measured from the head's bearing face.
struct Body {
    joint: JointType,
    lk: f64,
    dh: f64,
    dw: f64,
    da: f64,
    tan_phi: f64,
    sleeve_only: bool,
}

impl Body {
    fn sleeve_per_length(&self) -> f64 {
        4.0 / (PI * (self.da * self.da - self.dh * self.dh))
    }

    fn ln_ratio(&self, u: f64) -> f64 {
        ((u - self.dh) / (u + self.dh)).ln()
    }

    /// F of one cone from a bearing face, `z` from that face, up to `reach`
    /// (where it stops: mid-way or the far end), sleeve beyond D_A.
    fn one_cone(&self, z: f64, reach: f64) -> f64 {
        let z = z.clamp(0.0, reach);
        if self.sleeve_only {
            return z * self.sleeve_per_length();
        }
        let t = self.tan_phi;
        let to_da = ((self.da - self.dw) / (2.0 * t)).min(reach);
        let cone = |z: f64| {
            (self.ln_ratio(self.dw + 2.0 * t * z) - self.ln_ratio(self.dw)) / (PI * t * self.dh)
        };
        if z <= to_da {
            cone(z)
        } else {
            cone(to_da) + (z - to_da) * self.sleeve_per_length()
        }
    }

    fn cumulative(&self, z: f64) -> f64 {
        match self.joint {
            JointType::TappedHole => self.one_cone(z, self.lk),
            JointType::ThroughBolted => {
                let half = self.lk / 2.0;
                if z <= half {
                    self.one_cone(z, half)
                } else {
                    2.0 * self.one_cone(half, half) - self.one_cone(self.lk - z, half)
                }
            }
        }
    }
}

/// δ_P of the stack (layers from under the head) and its equivalent modulus.
pub fn stack(
    joint: JointType,
    bearing: &BearingSurface,
    outer_diameter: Length,
    layers: &[ClampedLayer],
) -> Result<Stack, EngineError> {
    let layers = read_layers(layers)?;
    let lk: f64 = layers.iter().map(|(t, _)| t).sum();
    let (dw, dh) = (bearing.outer_diameter.value, bearing.inner_diameter.value);
    if !(dw > dh && dh > 0.0) {
        return Err(EngineError::invalid(
            "bearing.outer_diameter",
            "the bearing outer diameter must exceed the hole diameter",
        ));
    }
    let da = positive(outer_diameter.value, "joint_outer_diameter")?;
    if da <= dh {
        return Err(EngineError::invalid(
            "joint_outer_diameter",
            format!(
                "outer diameter of the clamped parts {:.2} mm must exceed the hole {:.2} mm",
                da * 1e3,
                dh * 1e3
            ),
        ));
    }
    let (_, tan_phi) = deformation_cone(joint, lk, dw, da);
    if !(tan_phi.is_finite() && tan_phi > 0.0) {
        return Err(EngineError::invalid(
            "clamped_parts",
            "the deformation cone model gives no valid cone for this clamp length and \
             outer diameter",
        ));
    }
    let body = Body {
        joint,
        lk,
        dh,
        dw,
        da,
        tan_phi,
        sleeve_only: da <= dw,
    };
    let (mut z, mut delta) = (0.0, 0.0);
    for (t, e) in &layers {
        delta += (body.cumulative(z + t) - body.cumulative(z)) / e;
        z += t;
    }
    let geometric = body.cumulative(lk);
    if !(delta.is_finite() && delta > 0.0 && geometric.is_finite() && geometric > 0.0) {
        return Err(EngineError::invalid(
            "clamped_parts",
            "the stack gives no finite resilience; check the thicknesses and diameters",
        ));
    }
    Ok(Stack {
        clamp_length: Length::new::<meter>(lk),
        clamped_resilience: delta,
        equivalent_modulus: Pressure::new::<pascal>(geometric / delta),
    })
}

#[cfg(test)]
mod tests;
