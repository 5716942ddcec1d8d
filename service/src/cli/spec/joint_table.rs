//! The joint model's lines of the `tightspec spec` table.

use std::fmt::Write;

use crate::app::quantity::Quantity;
use crate::app::spec::view::JointOut;

fn q(v: &Quantity, decimals: usize) -> String {
    format!("{:.*} {}", decimals, v.value, v.unit)
}

fn force(v: &Quantity) -> String {
    if v.unit == "N" {
        format!("{:.2} kN", v.value / 1000.0)
    } else {
        q(v, 0)
    }
}

fn resilience(v: &Quantity) -> String {
    format!("{:.3e} {}", v.value, v.unit)
}

fn defaulted(j: &JointOut, field: &str) -> &'static str {
    if j.defaults.contains(&field) {
        " (default)"
    } else {
        ""
    }
}

/// The joint block as table lines.
pub(super) fn lines(j: &JointOut, o: &mut String) {
    let _ = writeln!(
        o,
        "Joint       δ_S {}, δ_P {}, Φ_K {:.3}, n {:.2}{}, Φ {:.3}",
        resilience(&j.bolt_resilience),
        resilience(&j.clamped_resilience),
        j.load_factor_k,
        j.load_introduction,
        defaulted(j, "load_introduction"),
        j.load_factor
    );
    let _ = writeln!(
        o,
        "Embedding   f_Z {} at Rz {}{}: preload loss F_Z {}",
        q(&j.embedding.amount, 1),
        q(&j.roughness_rz, 0),
        defaulted(j, "roughness_rz"),
        force(&j.embedding.preload_loss)
    );
    if let (Some(fsa), Some(fkr), Some(sa), Some(sasv)) = (
        &j.additional_bolt_load,
        &j.residual_clamp_load_min,
        &j.alternating_stress,
        &j.fatigue_limit,
    ) {
        let _ = writeln!(
            o,
            "Working     F_SA {}, F_KR,min {}, σ_a {} against σ_AS {} ({}{})",
            force(fsa),
            force(fkr),
            q(sa, 1),
            q(sasv, 1),
            j.thread_rolling.unwrap_or(""),
            defaulted(j, "thread_rolling")
        );
    }
    if let Some(s) = &j.safety {
        let mut text = format!("yield {:.2}", s.yield_);
        for (name, v) in [
            ("fatigue", s.fatigue),
            ("slip", s.slip),
            ("surface pressure", s.surface_pressure),
        ] {
            if let Some(v) = v {
                let _ = write!(text, ", {name} {v:.2}");
            }
        }
        let _ = writeln!(o, "Safety      {text}");
    }
}
