//! Charts as SVG: a small deterministic writer (no I/O, no clock, no
//! randomness), so the same figure always gives the same bytes.
//!
//! A [`Figure`] holds a title, a description and one or more [`Plot`]s side
//! by side; a plot has two [`Axis`]es and its [`Mark`]s (lines, points,
//! reference lines, bands, boxes, range bars). [`render`] writes the SVG:
//! `<title>` and `<desc>` for readers, a text label on every mark and a
//! legend (never colour alone: each pen has its own dash pattern and each
//! series its own marker shape), dark-on-light colours that stay apart in
//! grey-scale print. Every plot and mark carries `data-*` attributes (its
//! axis domains, its pixel frame, its values) so that a reader can take the
//! numbers back out of the picture.
//!
//! The chart builders that turn a spec, a friction test series or an
//! entry's history into a figure are use cases in `app::charts`.

mod marks;
mod svg;
mod ticks;

pub use svg::render;
pub use ticks::{format_number, nice_range};

/// How a line or an outline is drawn. Grey-scale safe: pens differ in
/// their dash pattern and width, not only in colour.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Pen {
    pub colour: &'static str,
    /// SVG `stroke-dasharray`; empty for a solid line.
    pub dash: &'static str,
    pub width: f64,
}

/// The pens of this service's charts (a plain scheme of its own: dark blue
/// for the quantity itself, green for preload limits, dark red for limits
/// of the bolt, violet for what the joint needs, grey for the rest).
pub mod pens {
    use super::Pen;

    /// The nominal line of a quantity.
    pub const NOMINAL: Pen = Pen {
        colour: "#1d3f6e",
        dash: "",
        width: 2.2,
    };
    /// The line of the low end of a range (e.g. at minimum friction).
    pub const LOW: Pen = Pen {
        colour: "#1d3f6e",
        dash: "9 4",
        width: 1.6,
    };
    /// The line of the high end of a range (e.g. at maximum friction).
    pub const HIGH: Pen = Pen {
        colour: "#1d3f6e",
        dash: "2 3",
        width: 1.8,
    };
    /// Preload limits of the window.
    pub const PRELOAD: Pen = Pen {
        colour: "#2e6b3a",
        dash: "6 3",
        width: 1.4,
    };
    /// Limits set by the bolt's strength (F_M,zul, yield).
    pub const LIMIT: Pen = Pen {
        colour: "#8a2a1c",
        dash: "12 3 2 3",
        width: 1.6,
    };
    /// What the joint needs (required clamp load).
    pub const REQUIRED: Pen = Pen {
        colour: "#5b3f8c",
        dash: "3 2",
        width: 1.6,
    };
    /// Points and bars of measured data.
    pub const DATA: Pen = Pen {
        colour: "#222222",
        dash: "",
        width: 1.2,
    };
    /// A second set of measured data.
    pub const DATA_ALT: Pen = Pen {
        colour: "#8a5a00",
        dash: "",
        width: 1.2,
    };
    /// Statistics drawn over data (mean, ± 3σ).
    pub const STATISTIC: Pen = Pen {
        colour: "#555555",
        dash: "5 2 1 2",
        width: 1.2,
    };
    /// The outline of a window box.
    pub const WINDOW: Pen = Pen {
        colour: "#1d3f6e",
        dash: "",
        width: 1.4,
    };
}

/// The shape drawn at each point of a series.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Marker {
    None,
    Circle,
    Square,
    Triangle,
    Diamond,
    Cross,
}

/// One axis: its name, unit and the domain it spans.
#[derive(Debug, Clone, PartialEq)]
pub struct Axis {
    /// The quantity in words (`Torque`, `Clamp force`).
    pub label: String,
    /// The unit symbol shown after the label (`N·m`); empty for a pure
    /// number (a friction coefficient).
    pub unit: String,
    pub min: f64,
    pub max: f64,
    /// The tick positions and their labels. When `categories` is empty the
    /// ticks are numbers chosen by [`nice_range`].
    pub categories: Vec<(f64, String)>,
}

impl Axis {
    /// An axis spanning `values` (non-finite values ignored), widened to
    /// round tick steps; from zero when `from_zero`.
    pub fn fit(label: &str, unit: &str, values: &[f64], from_zero: bool) -> Axis {
        let finite = values.iter().copied().filter(|v| v.is_finite());
        let (mut lo, mut hi) = finite.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
            (a.min(v), b.max(v))
        });
        if !lo.is_finite() || !hi.is_finite() {
            (lo, hi) = (0.0, 1.0);
        }
        if from_zero {
            lo = lo.min(0.0);
        }
        let (min, max, _) = nice_range(lo, hi);
        Axis {
            label: label.into(),
            unit: unit.into(),
            min,
            max,
            categories: Vec::new(),
        }
    }

    /// The same axis with room above its highest value for labels
    /// (`share` of the span), rounded to its ticks again.
    pub fn with_headroom(self, share: f64) -> Axis {
        let span = self.max - self.min;
        let (min, max, _) = nice_range(self.min, self.max + span * share);
        Axis { min, max, ..self }
    }

    /// The axis title as printed: `Torque in N·m`.
    pub fn title(&self) -> String {
        if self.unit.is_empty() {
            self.label.clone()
        } else {
            format!("{} in {}", self.label, self.unit)
        }
    }
}

/// What a mark draws, in data coordinates.
#[derive(Debug, Clone, PartialEq)]
pub enum Shape {
    /// A polyline through `points`, labelled at its last point.
    Line {
        points: Vec<(f64, f64)>,
        pen: Pen,
        marker: Marker,
    },
    /// Unconnected points.
    Points {
        points: Vec<(f64, f64)>,
        pen: Pen,
        marker: Marker,
    },
    /// A horizontal reference line across the plot.
    Level { y: f64, pen: Pen },
    /// A vertical reference line across the plot.
    Upright { x: f64, pen: Pen },
    /// A shaded band over the plot's full height from `from` to `to` on x.
    Band { from: f64, to: f64 },
    /// An outlined rectangle (a window: x from `x0` to `x1`, y from `y0` to `y1`).
    Frame {
        x0: f64,
        x1: f64,
        y0: f64,
        y1: f64,
        pen: Pen,
    },
    /// Vertical bars with end caps (a range over a revision, mean ± 3σ),
    /// labelled over the last one.
    Bars {
        bars: Vec<Bar>,
        pen: Pen,
        marker: Marker,
    },
}

/// One vertical bar from `low` to `high` at `x`, with a marker at `mid`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Bar {
    pub x: f64,
    pub low: f64,
    pub high: f64,
    pub mid: Option<f64>,
}

/// One labelled thing on a plot.
#[derive(Debug, Clone, PartialEq)]
pub struct Mark {
    /// A stable slug (`data-role`), e.g. `torque-window`.
    pub role: String,
    /// The short text label drawn beside it on the plot.
    pub label: String,
    /// The longer text of the legend (the label unless explained).
    pub legend: String,
    pub shape: Shape,
}

impl Mark {
    pub fn new(role: &str, label: impl Into<String>, shape: Shape) -> Mark {
        let label = label.into();
        Mark {
            role: role.into(),
            legend: label.clone(),
            label,
            shape,
        }
    }

    /// The same mark with a longer legend text.
    pub fn explained(mut self, legend: impl Into<String>) -> Mark {
        self.legend = legend.into();
        self
    }
}

/// One plot area with its axes and marks.
#[derive(Debug, Clone, PartialEq)]
pub struct Plot {
    pub heading: String,
    pub x: Axis,
    pub y: Axis,
    pub marks: Vec<Mark>,
}

/// A whole picture.
#[derive(Debug, Clone, PartialEq)]
pub struct Figure {
    pub title: String,
    /// What the picture shows, in sentences (`<desc>`).
    pub desc: String,
    pub plots: Vec<Plot>,
    /// Lines printed under the plots (sources, cautions).
    pub notes: Vec<String>,
}

#[cfg(test)]
mod tests;
