//! The figures a change is judged by — lower, target and upper torque in
//! the tool's unit, preload minimum and maximum, the angle window when the
//! joint is tightened by angle — and the check codes, read the same way
//! from a stored release's answers and from answers computed now, so that
//! "before" and "after" compare like with like.

use serde::{Deserialize, Serialize};
use utoipa::ToSchema;

use crate::app::quantity::Quantity;

/// One joint's figures.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct ImpactFigures {
    /// Lower torque limit, as the tool holds it.
    pub lower: Quantity,
    /// Target torque (for a monitoring band, its middle).
    pub target: Quantity,
    /// Upper torque limit, as the tool holds it.
    pub upper: Quantity,
    /// Minimum preload of the window.
    pub preload_min: Quantity,
    /// Maximum preload of the window.
    pub preload_max: Quantity,
    /// Angle window from snug (torque-angle only).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub angle_min: Option<Quantity>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub angle_max: Option<Quantity>,
}

/// The parts of a stored setpoint answer the figures are read from;
/// every other field is skipped without being built.
#[derive(Deserialize)]
struct StoredSetpoints {
    lower: Quantity,
    target: Quantity,
    upper: Quantity,
    #[serde(default)]
    angle: Option<StoredWindow>,
    #[serde(default)]
    checks: Vec<StoredCheck>,
}

#[derive(Deserialize)]
struct StoredWindow {
    min: Option<Quantity>,
    max: Option<Quantity>,
}

#[derive(Deserialize)]
struct StoredCheck {
    code: String,
}

#[derive(Deserialize)]
struct StoredSpec {
    preload: StoredWindow,
}

/// The figures and check codes of a setpoint answer and a spec answer
/// (JSON text, as stored with a release or as just written), reading only
/// the fields the figures need; `None` when either lacks a figure.
pub fn read_stored(setpoints: &str, spec: &str) -> Option<(ImpactFigures, Vec<String>)> {
    let s: StoredSetpoints = serde_json::from_str(setpoints).ok()?;
    let p: StoredSpec = serde_json::from_str(spec).ok()?;
    let (angle_min, angle_max) = s.angle.map(|a| (a.min, a.max)).unwrap_or_default();
    let figures = ImpactFigures {
        lower: s.lower,
        target: s.target,
        upper: s.upper,
        preload_min: p.preload.min?,
        preload_max: p.preload.max?,
        angle_min,
        angle_max,
    };
    Some((figures, s.checks.into_iter().map(|c| c.code).collect()))
}

fn pairs<'a>(a: &'a ImpactFigures, b: &'a ImpactFigures) -> Vec<(&'a Quantity, &'a Quantity)> {
    let mut out = vec![
        (&a.lower, &b.lower),
        (&a.target, &b.target),
        (&a.upper, &b.upper),
        (&a.preload_min, &b.preload_min),
        (&a.preload_max, &b.preload_max),
    ];
    if let (Some(x), Some(y)) = (&a.angle_min, &b.angle_min) {
        out.push((x, y));
    }
    if let (Some(x), Some(y)) = (&a.angle_max, &b.angle_max) {
        out.push((x, y));
    }
    out
}

/// The largest relative change of any figure, in percent of its value
/// before (two decimals); `None` when a figure cannot be compared (its
/// unit changed, an angle window came or went, or a value before was
/// zero while it moved).
pub fn change_percent(before: &ImpactFigures, after: &ImpactFigures) -> Option<f64> {
    if before.angle_min.is_some() != after.angle_min.is_some() {
        return None;
    }
    let mut largest: f64 = 0.0;
    for (b, a) in pairs(before, after) {
        if b.unit != a.unit {
            return None;
        }
        if a.value == b.value {
            continue;
        }
        if b.value == 0.0 {
            return None;
        }
        largest = largest.max(((a.value - b.value) / b.value).abs() * 100.0);
    }
    let rounded = (largest * 100.0).round() / 100.0;
    rounded.is_finite().then_some(rounded)
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::{json, Value};

    fn answers(target: f64) -> (Value, Value) {
        let q = |v: f64, u: &str| json!({"value": v, "unit": u});
        (
            json!({"lower": q(target * 0.9, "N·m"), "target": q(target, "N·m"),
                   "upper": q(target * 1.1, "N·m"), "note": "skipped",
                   "checks": [{"code": "a", "severity": "warning", "message": "m"}]}),
            json!({"preload": {"min": q(10.0, "kN"), "max": q(20.0, "kN"),
                               "permissible": q(25.0, "kN")}}),
        )
    }

    fn read(s: &Value, p: &Value) -> Option<(ImpactFigures, Vec<String>)> {
        read_stored(&s.to_string(), &p.to_string())
    }

    #[test]
    fn the_largest_relative_change_is_reported() {
        let (s, p) = answers(40.0);
        let (before, codes) = read(&s, &p).unwrap();
        assert_eq!(codes, ["a"]);
        assert_eq!(before.target.value, 40.0);
        assert_eq!(before.preload_max.value, 20.0);
        assert_eq!(before.angle_min, None);
        assert_eq!(change_percent(&before, &before), Some(0.0));
        let (s2, p2) = answers(44.0);
        let (after, _) = read(&s2, &p2).unwrap();
        assert_eq!(change_percent(&before, &after), Some(10.0));
        let mut other = after.clone();
        other.target.unit = "lbf·ft".into();
        assert_eq!(change_percent(&before, &other), None);
    }

    #[test]
    fn the_angle_window_is_read_when_there_is_one() {
        let (mut s, p) = answers(40.0);
        s["angle"] = json!({"min": {"value": 60.0, "unit": "degrees"},
                            "max": {"value": 90.0, "unit": "degrees"}, "resolution": 1.0});
        let (f, _) = read(&s, &p).unwrap();
        assert_eq!(f.angle_min.map(|q| q.value), Some(60.0));
        assert_eq!(f.angle_max.map(|q| q.value), Some(90.0));
        s["angle"] = Value::Null;
        assert_eq!(read(&s, &p).unwrap().0.angle_min, None);
    }

    #[test]
    fn an_answer_lacking_a_figure_reads_as_none() {
        let (s, p) = answers(40.0);
        assert!(read(&json!({}), &p).is_none());
        assert!(read(
            &s,
            &json!({"preload": {"min": {"value": 1.0, "unit": "kN"}}})
        )
        .is_none());
        assert!(read_stored("not json", &p.to_string()).is_none());
    }
}
