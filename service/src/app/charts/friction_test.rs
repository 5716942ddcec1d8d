//! The chart of a stored friction test series: on the left each
//! specimen's total torque (and thread torque where measured) against its
//! clamp force, with the evaluation clamp force; on the right the spread of
//! μ_th, μ_b and μ_tot over the specimens with mean ± 3σ (ISO 16047
//! evaluation, as `GET /v1/friction-tests/{id}` answers it).

use crate::app::friction_tests::evaluate;
use crate::app::friction_tests::wire::{
    CoefficientStatisticsResponse, EvaluationResponse, SeriesRequest, SpecimenResponse,
};
use crate::app::quantity::{Quantity, Units};
use crate::app::{App, AppError};
use crate::chart::{pens, render, Axis, Bar, Figure, Mark, Marker, Plot, Shape};

/// A force in kN when given in N (readable ticks), else as given.
fn force(q: &Quantity) -> (f64, String) {
    if q.unit == "N" {
        (q.value / 1000.0, "kN".into())
    } else {
        (q.value, q.unit.to_string())
    }
}

/// Spread the points of one coefficient a little sideways so that equal
/// values stay visible (a fixed pattern by specimen number, no randomness).
fn beside(category: f64, index: usize) -> f64 {
    category + ((index % 5) as f64 - 2.0) * 0.06
}

type Coefficient = fn(&SpecimenResponse) -> Option<f64>;

/// The torque–clamp force plot.
fn torque_plot(eval: &EvaluationResponse) -> Plot {
    let mut total = Vec::new();
    let mut thread = Vec::new();
    let (mut force_unit, mut torque_unit) = (String::from("kN"), String::new());
    for s in &eval.specimens {
        let (f, unit) = force(&s.clamp_force);
        force_unit = unit;
        torque_unit = s.total_torque.unit.to_string();
        total.push((f, s.total_torque.value));
        if let Some(t) = &s.thread_torque {
            thread.push((f, t.value));
        }
    }
    let mut xs: Vec<f64> = total.iter().map(|p| p.0).collect();
    let ys: Vec<f64> = total.iter().chain(&thread).map(|p| p.1).collect();
    let mut marks = vec![Mark::new(
        "total-torque",
        "total torque",
        Shape::Points {
            points: total,
            pen: pens::DATA,
            marker: Marker::Circle,
        },
    )
    .explained("total torque of each specimen")];
    if !thread.is_empty() {
        marks.push(
            Mark::new(
                "thread-torque",
                "thread torque",
                Shape::Points {
                    points: thread,
                    pen: pens::DATA_ALT,
                    marker: Marker::Triangle,
                },
            )
            .explained("thread torque of each specimen (where measured)"),
        );
    }
    if let Some(q) = &eval.evaluation_clamp_force {
        let (f, unit) = force(q);
        xs.push(f);
        marks.push(
            Mark::new(
                "evaluation-point",
                format!("evaluation at {f:.1} {unit}"),
                Shape::Upright {
                    x: f,
                    pen: pens::STATISTIC,
                },
            )
            .explained("evaluation clamp force: the curves are read here"),
        );
    }
    Plot {
        heading: format!(
            "Torque against clamp force, {} specimens",
            eval.specimens.len()
        ),
        x: Axis::fit("Clamp force", &force_unit, &xs, true),
        y: Axis::fit("Torque", &torque_unit, &ys, true),
        marks,
    }
}

/// The spread of the friction coefficients.
fn spread_plot(eval: &EvaluationResponse) -> Plot {
    let st = &eval.statistics;
    let rows: [(
        &str,
        &str,
        Option<&CoefficientStatisticsResponse>,
        Coefficient,
        Marker,
    ); 3] = [
        (
            "thread-friction",
            "μ_th",
            st.thread_friction.as_ref(),
            |s| s.thread_friction,
            Marker::Triangle,
        ),
        (
            "bearing-friction",
            "μ_b",
            st.bearing_friction.as_ref(),
            |s| s.bearing_friction,
            Marker::Square,
        ),
        (
            "total-friction",
            "μ_tot",
            st.total_friction.as_ref(),
            |s| s.total_friction,
            Marker::Circle,
        ),
    ];
    let mut marks = Vec::new();
    let mut categories = Vec::new();
    let mut values = Vec::new();
    for (k, (role, symbol, stats, pick, marker)) in rows.into_iter().enumerate() {
        let Some(stats) = stats else { continue };
        let at = (k + 1) as f64;
        categories.push((at, symbol.to_string()));
        let points: Vec<(f64, f64)> = eval
            .specimens
            .iter()
            .enumerate()
            .filter_map(|(i, s)| pick(s).map(|v| (beside(at, i), v)))
            .collect();
        values.extend(points.iter().map(|p| p.1));
        marks.push(
            Mark::new(
                role,
                symbol,
                Shape::Points {
                    points,
                    pen: pens::DATA,
                    marker,
                },
            )
            .explained(format!("{symbol} of each specimen")),
        );
        let (low, high) = match (stats.mean_minus_3_sigma, stats.mean_plus_3_sigma) {
            (Some(l), Some(h)) => (l, h),
            _ => (stats.mean, stats.mean),
        };
        values.extend([low, high]);
        let legend = match stats.std_dev {
            Some(sd) => format!("{symbol} mean {:.3} ± 3σ (σ {sd:.4})", stats.mean),
            None => format!("{symbol} mean {:.3} (one value: no σ)", stats.mean),
        };
        marks.push(
            Mark::new(
                &format!("{role}-mean-3-sigma"),
                "mean ± 3σ",
                Shape::Bars {
                    bars: vec![Bar {
                        x: at + 0.3,
                        low,
                        high,
                        mid: Some(stats.mean),
                    }],
                    pen: pens::STATISTIC,
                    marker: Marker::Diamond,
                },
            )
            .explained(legend),
        );
    }
    let mut x = Axis::fit(
        "Coefficient",
        "",
        &[0.5, categories.len() as f64 + 0.5],
        false,
    );
    (x.min, x.max) = (0.5, categories.len().max(1) as f64 + 0.5);
    x.categories = categories;
    Plot {
        heading: "Friction coefficients, mean ± 3σ".into(),
        x,
        y: Axis::fit("Friction coefficient μ", "", &values, false).with_headroom(0.15),
        marks,
    }
}

/// The figure of an evaluated series.
pub fn figure(id: i64, eval: &EvaluationResponse) -> Figure {
    let names = [eval.finish.as_deref(), eval.lubricant.as_deref()]
        .into_iter()
        .flatten()
        .collect::<Vec<_>>()
        .join(", ");
    Figure {
        title: format!("Friction test series {id}: {} {}", eval.thread, names),
        desc: format!(
            "Torque against clamp force of each of the {} specimens of series {id} ({}), and \
             the thread, bearing and total friction coefficients with mean ± 3σ.",
            eval.specimens.len(),
            eval.thread
        ),
        plots: vec![torque_plot(eval), spread_plot(eval)],
        notes: vec![
            format!("Evaluation: {}", eval.method.evaluation),
            format!("Evaluation point: {}", eval.method.evaluation_point),
            "Measured friction applies to the parts, finish and lubricant tested; confirm by \
             joint tests before use on other parts."
                .to_string(),
        ],
    }
}

impl App {
    /// The chart of stored friction test series `id` (404 naming `id` when
    /// there is none), in `units`.
    pub async fn friction_test_chart(&self, id: i64, units: Units) -> Result<String, AppError> {
        let stored = self.store().friction_test(id).await?;
        let req: SeriesRequest = serde_json::from_str(&stored.series_json).map_err(|e| {
            AppError::Internal(format!("stored friction test {id} unreadable: {e}"))
        })?;
        let eval = evaluate(&req, units)?;
        Ok(render(&figure(id, &eval)))
    }
}
