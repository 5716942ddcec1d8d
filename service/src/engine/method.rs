//! Tightening methods and their default scatter.
//!
//! Two figures per method, kept apart on purpose:
//! - `default_scatter` ±s: the scatter of the quantity the tool controls
//!   (torque for torque tools). The torque window applies it on top of the
//!   friction ranges the request gives, so it must NOT contain friction scatter.
//! - `table_a8_alpha_a`: the tightening-factor range α_A of VDI 2230 Part 1:2003
//!   Table A8 (table recalled from memory; see each row), which includes the
//!   friction scatter of a real joint. It is shown for comparison with the
//!   window's own α_A. For torque-angle `default_scatter` is the scatter of
//!   the angle; for yield-controlled tightening no tool scatter enters (the
//!   preload model of `joint::controlled` gives α_A). Conversion: ±Δ = (α_A − 1)/(α_A + 1) (VDI 2230 Part 1).

use std::str::FromStr;

use super::EngineError;

/// A way of tightening, with its API id.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum TighteningMethod {
    ClickWrench,
    IndicatingWrench,
    DcNutrunner,
    PulseTool,
    ImpactWrench,
    TorqueAngle,
    YieldControlled,
}

/// One row of the method table.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MethodInfo {
    pub method: TighteningMethod,
    /// API id, e.g. `click-wrench`.
    pub id: &'static str,
    pub name: &'static str,
    /// Default ±s of the controlled quantity, as a fraction (0.06 = ±6 %).
    pub default_scatter: f64,
    /// Where `default_scatter` comes from.
    pub scatter_source: &'static str,
    /// VDI 2230 Part 1 Table A8 α_A range (min, max) for this kind of method.
    pub table_a8_alpha_a: (f64, f64),
    /// True when the tool controls torque (the torque window is the setting);
    /// false when torque is only monitored (angle or yield control).
    pub torque_controlled: bool,
}

impl MethodInfo {
    /// Table A8 range converted to preload scatter ±Δ = (α_A − 1)/(α_A + 1).
    pub fn table_a8_scatter(&self) -> (f64, f64) {
        let (lo, hi) = self.table_a8_alpha_a;
        (alpha_to_scatter(lo), alpha_to_scatter(hi))
    }
}

/// ±Δ = (α_A − 1)/(α_A + 1) (VDI 2230 Part 1, tightening factor definition).
pub fn alpha_to_scatter(alpha_a: f64) -> f64 {
    (alpha_a - 1.0) / (alpha_a + 1.0)
}

/// α_A = (1 + Δ)/(1 − Δ), the inverse of [`alpha_to_scatter`].
pub fn scatter_to_alpha(scatter: f64) -> f64 {
    (1.0 + scatter) / (1.0 - scatter)
}

const ISO_6789: &str = "ISO 6789-1 permissible deviation of hand torque tools, \
    wider class ±6 % (recalled from memory); operator effects not included";

/// Every method, in the order the API lists them.
pub const METHODS: [MethodInfo; 7] = [
    MethodInfo {
        method: TighteningMethod::ClickWrench,
        id: "click-wrench",
        name: "hand click (setting) torque wrench",
        default_scatter: 0.06,
        scatter_source: ISO_6789,
        // Table A8 torque wrench rows: 1.4–1.6 with torque set by experiment,
        // 1.6–2.0 with estimated friction (PUB via a supplier page based on
        // VDI 2230: "αA = 1.6 to 2.0"); combined range shown.
        table_a8_alpha_a: (1.4, 2.0),
        torque_controlled: true,
    },
    MethodInfo {
        method: TighteningMethod::IndicatingWrench,
        id: "indicating-wrench",
        name: "hand indicating (dial) torque wrench",
        default_scatter: 0.06,
        scatter_source: ISO_6789,
        table_a8_alpha_a: (1.4, 2.0),
        torque_controlled: true,
    },
    MethodInfo {
        method: TighteningMethod::DcNutrunner,
        id: "dc-nutrunner",
        name: "transducerised DC electric nutrunner",
        default_scatter: 0.05,
        scatter_source: "common practice: ±5 % torque scatter for a transducer-controlled \
            nutrunner in capability; confirm with the tool's own capability study",
        // Table A8 "precision nutrunner with dynamic torque measurement": 1.4–1.6.
        table_a8_alpha_a: (1.4, 1.6),
        torque_controlled: true,
    },
    MethodInfo {
        method: TighteningMethod::PulseTool,
        id: "pulse-tool",
        name: "hydraulic pulse tool",
        default_scatter: 0.10,
        scatter_source: "common practice: ±10 % torque scatter for a pulse tool with shut-off",
        // Table A8 puts impulse tools with impact wrenches: 2.5–4.
        table_a8_alpha_a: (2.5, 4.0),
        torque_controlled: true,
    },
    MethodInfo {
        method: TighteningMethod::ImpactWrench,
        id: "impact-wrench",
        name: "impact wrench",
        default_scatter: 0.43,
        scatter_source: "VDI 2230 Part 1:2003 Table A8, impact wrench α_A 2.5 → ±43 % \
            (lower end; table recalled from memory)",
        table_a8_alpha_a: (2.5, 4.0),
        torque_controlled: true,
    },
    MethodInfo {
        method: TighteningMethod::TorqueAngle,
        id: "torque-angle",
        name: "torque-angle (angle-controlled) tightening",
        default_scatter: 0.05,
        scatter_source: "common practice: ±5 % scatter of the angle from snug (angle \
            measurement and snug-point detection of a controlled nutrunner); confirm with the \
            tool's own capability study. The preload range follows from it, the friction range \
            at snug and the joint's resilience (VDI 2230 Part 1 elastic model)",
        // Table A8 angle-controlled tightening: 1.2–1.4 (recalled from memory).
        table_a8_alpha_a: (1.2, 1.4),
        torque_controlled: false,
    },
    MethodInfo {
        method: TighteningMethod::YieldControlled,
        id: "yield-controlled",
        name: "yield-point-controlled tightening",
        default_scatter: 0.0,
        scatter_source: "no tool scatter enters: the preload range comes from the yield-strength \
            spread and the thread-friction range at the yield point (VDI 2230 Part 1:2003 \
            §5.4.3, recalled from memory); a given tool scatter is not used",
        // Table A8 yield-controlled tightening: 1.2–1.4 (recalled from memory).
        table_a8_alpha_a: (1.2, 1.4),
        torque_controlled: false,
    },
];

impl TighteningMethod {
    pub fn info(self) -> &'static MethodInfo {
        let i = match self {
            Self::ClickWrench => 0,
            Self::IndicatingWrench => 1,
            Self::DcNutrunner => 2,
            Self::PulseTool => 3,
            Self::ImpactWrench => 4,
            Self::TorqueAngle => 5,
            Self::YieldControlled => 6,
        };
        &METHODS[i]
    }

    pub fn id(self) -> &'static str {
        self.info().id
    }
}

impl FromStr for TighteningMethod {
    type Err = EngineError;

    /// Accepts the API id, case-insensitive, with `_` or spaces for `-`.
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let norm: String = s
            .trim()
            .chars()
            .map(|c| match c {
                '_' | ' ' => '-',
                c => c.to_ascii_lowercase(),
            })
            .collect();
        if let Some(m) = METHODS.iter().find(|m| m.id == norm) {
            return Ok(m.method);
        }
        let mut ranked: Vec<(f64, &str)> = METHODS
            .iter()
            .map(|m| (strsim::jaro_winkler(&norm, m.id), m.id))
            .collect();
        ranked.sort_by(|a, b| b.0.total_cmp(&a.0));
        Err(EngineError::Unknown {
            field: "method".into(),
            kind: "tightening method",
            given: s.chars().take(60).collect(),
            suggestions: ranked
                .iter()
                .take(3)
                .map(|(_, id)| id.to_string())
                .collect(),
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// VDI 2230 Part 1 relation ±Δ = (α_A − 1)/(α_A + 1): α_A 1.6 → ±23 %,
    /// 2.0 → ±33 %, 2.5 → ±43 % (VDI 2230:1986 tolerance list, as reproduced
    /// by a fastener supplier's "Tightening factors and tolerances" page).
    #[test]
    fn alpha_scatter_conversion() {
        assert!((alpha_to_scatter(1.6) - 0.23).abs() < 0.005);
        assert!((alpha_to_scatter(2.0) - 0.33).abs() < 0.005);
        assert!((alpha_to_scatter(2.5) - 0.43).abs() < 0.005);
        for a in [1.0, 1.2, 1.7, 4.0] {
            assert!((scatter_to_alpha(alpha_to_scatter(a)) - a).abs() < 1e-12);
        }
    }

    #[test]
    fn every_method_parses_from_its_id_and_has_a_sane_default() {
        for m in METHODS {
            assert_eq!(m.id.parse::<TighteningMethod>().unwrap(), m.method);
            assert_eq!(m.method.info().id, m.id);
            assert!((0.0..0.5).contains(&m.default_scatter));
            assert!(!m.scatter_source.is_empty());
            let (lo, hi) = m.table_a8_scatter();
            assert!(lo <= hi && lo > 0.0);
        }
        assert_eq!(
            "DC_Nutrunner".parse::<TighteningMethod>().unwrap(),
            TighteningMethod::DcNutrunner
        );
    }

    #[test]
    fn unknown_method_suggests_the_nearest() {
        match "clik-wrench".parse::<TighteningMethod>().unwrap_err() {
            EngineError::Unknown {
                field, suggestions, ..
            } => {
                assert_eq!(field, "method");
                assert_eq!(suggestions[0], "click-wrench");
            }
            other => panic!("{other:?}"),
        }
    }
}
