//! The SVG writer: a [`Figure`] in, the document's text out. Plots sit side
//! by side; each has its axes with round ticks, its marks, the marks' text
//! labels (at the end of a line, beside a reference line, on top of a band)
//! and a legend under it; the figure's notes close the picture.

use std::fmt::Write;

use super::marks::{legend, mark_svg, right_margin_labels};
use super::ticks::{format_number, ticks};
use super::{Axis, Figure, Mark, Plot, Shape};

/// Outer width of one plot (axes, labels and legend included).
const PLOT_WIDTH: f64 = 760.0;
const MARGIN_LEFT: f64 = 78.0;
/// Room for the labels at the ends of lines and reference lines.
const MARGIN_RIGHT: f64 = 170.0;
const TITLE_HEIGHT: f64 = 34.0;
const HEADING_HEIGHT: f64 = 30.0;
const AREA_HEIGHT: f64 = 330.0;
/// Below the plot area: tick labels and the x-axis title.
const AXIS_HEIGHT: f64 = 52.0;
pub(super) const LEGEND_ROW: f64 = 18.0;
pub(super) const LEGEND_COLUMN: f64 = 341.0;
const NOTE_ROW: f64 = 15.0;
/// Characters of a note line before it wraps.
const NOTE_WIDTH: usize = 110;
/// Smallest vertical distance between two labels in the right margin.
pub(super) const LABEL_GAP: f64 = 12.5;
pub(super) const FONT: &str = "font-family=\"sans-serif\"";

/// `text` safe inside an XML element or attribute.
pub(super) fn esc(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && c != '\n' && c != '\t' => {}
            c => out.push(c),
        }
    }
    out
}

/// A pixel coordinate (two decimals, never `NaN`).
pub(super) fn px(v: f64) -> String {
    if v.is_finite() {
        format!("{v:.2}")
    } else {
        "0".into()
    }
}

/// A data value in a `data-*` attribute (shortest round-trip form).
pub(super) fn num(v: f64) -> String {
    if v.is_finite() {
        format!("{v}")
    } else {
        "0".into()
    }
}

/// Words of `text` in lines of at most `width` characters.
fn wrap(text: &str, width: usize) -> Vec<String> {
    let mut lines = Vec::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        if !line.is_empty() && line.chars().count() + 1 + word.chars().count() > width {
            lines.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
}

/// The pixel frame of one plot area and its data-to-pixel transform.
#[derive(Clone, Copy)]
pub(super) struct Frame {
    pub(super) left: f64,
    pub(super) top: f64,
    pub(super) width: f64,
    pub(super) height: f64,
    pub(super) x: (f64, f64),
    pub(super) y: (f64, f64),
}

impl Frame {
    pub(super) fn sx(&self, v: f64) -> f64 {
        let (a, b) = self.x;
        self.left + (v - a) / (b - a) * self.width
    }
    pub(super) fn sy(&self, v: f64) -> f64 {
        let (a, b) = self.y;
        self.top + self.height - (v - a) / (b - a) * self.height
    }
    pub(super) fn right(&self) -> f64 {
        self.left + self.width
    }
    pub(super) fn bottom(&self) -> f64 {
        self.top + self.height
    }
}

/// The document for `figure`. Deterministic: the same figure gives the
/// same bytes.
pub fn render(figure: &Figure) -> String {
    let count = figure.plots.len().max(1) as f64;
    let width = PLOT_WIDTH * count;
    let legend_rows = figure.plots.iter().map(legend_rows).max().unwrap_or(0) as f64;
    let notes: Vec<String> = figure
        .notes
        .iter()
        .flat_map(|n| wrap(n, NOTE_WIDTH * figure.plots.len().max(1)))
        .collect();
    let legend_top = TITLE_HEIGHT + HEADING_HEIGHT + AREA_HEIGHT + AXIS_HEIGHT;
    let notes_top = legend_top + legend_rows * LEGEND_ROW + 10.0;
    let height = notes_top + notes.len() as f64 * NOTE_ROW + 10.0;
    let mut out = String::with_capacity(16 * 1024);
    let _ = writeln!(
        out,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{w}\" height=\"{h}\" \
         viewBox=\"0 0 {w} {h}\" role=\"img\" aria-labelledby=\"chart-title chart-desc\">",
        w = px(width),
        h = px(height)
    );
    let _ = writeln!(
        out,
        "<title id=\"chart-title\">{}</title>",
        esc(&figure.title)
    );
    let _ = writeln!(out, "<desc id=\"chart-desc\">{}</desc>", esc(&figure.desc));
    let _ = writeln!(
        out,
        "<rect x=\"0\" y=\"0\" width=\"{}\" height=\"{}\" fill=\"white\"/>",
        px(width),
        px(height)
    );
    let _ = writeln!(
        out,
        "<text x=\"{}\" y=\"22\" {FONT} font-size=\"16\" font-weight=\"bold\" fill=\"#111111\">{}</text>",
        px(MARGIN_LEFT),
        esc(&figure.title)
    );
    for (i, plot) in figure.plots.iter().enumerate() {
        let offset = PLOT_WIDTH * i as f64;
        let frame = Frame {
            left: offset + MARGIN_LEFT,
            top: TITLE_HEIGHT + HEADING_HEIGHT,
            width: PLOT_WIDTH - MARGIN_LEFT - MARGIN_RIGHT,
            height: AREA_HEIGHT,
            x: domain(&plot.x),
            y: domain(&plot.y),
        };
        plot_svg(&mut out, plot, frame, i, legend_top);
    }
    for (i, line) in notes.iter().enumerate() {
        let _ = writeln!(
            out,
            "<text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" fill=\"#333333\" class=\"note\">{}</text>",
            px(MARGIN_LEFT),
            px(notes_top + NOTE_ROW * (i as f64 + 0.8)),
            esc(line)
        );
    }
    out.push_str("</svg>\n");
    out
}

/// An axis's domain, never empty.
fn domain(axis: &Axis) -> (f64, f64) {
    let (a, b) = (axis.min, axis.max);
    if a.is_finite() && b.is_finite() && b > a {
        (a, b)
    } else {
        (0.0, 1.0)
    }
}

/// Legend columns of a plot: two while every text fits half the width
/// (about 6 px a character at 11 px), else one.
pub(super) fn legend_columns(plot: &Plot) -> usize {
    let widest = plot
        .marks
        .iter()
        .map(|m| m.legend.chars().count())
        .max()
        .unwrap_or(0) as f64;
    if widest * 6.2 + 40.0 > LEGEND_COLUMN {
        1
    } else {
        ((PLOT_WIDTH - MARGIN_LEFT) / LEGEND_COLUMN)
            .floor()
            .max(1.0) as usize
    }
}

fn legend_rows(plot: &Plot) -> usize {
    plot.marks.len().div_ceil(legend_columns(plot))
}

fn plot_svg(out: &mut String, plot: &Plot, f: Frame, index: usize, legend_top: f64) {
    let _ = writeln!(
        out,
        "<g class=\"plot\" data-plot=\"{index}\" data-left=\"{}\" data-top=\"{}\" data-width=\"{}\" \
         data-height=\"{}\" data-x-min=\"{}\" data-x-max=\"{}\" data-y-min=\"{}\" data-y-max=\"{}\">",
        num(f.left),
        num(f.top),
        num(f.width),
        num(f.height),
        num(f.x.0),
        num(f.x.1),
        num(f.y.0),
        num(f.y.1)
    );
    let _ = writeln!(
        out,
        "<text x=\"{}\" y=\"{}\" {FONT} font-size=\"13\" fill=\"#111111\" class=\"heading\">{}</text>",
        px(f.left),
        px(f.top - 12.0),
        esc(&plot.heading)
    );
    axes(out, plot, f);
    // Bands first, so that lines are drawn over them.
    let mut order: Vec<&Mark> = plot.marks.iter().collect();
    order.sort_by_key(|m| !matches!(m.shape, Shape::Band { .. }));
    let mut right_labels: Vec<(f64, String, String)> = Vec::new();
    let mut top_labels = 0usize;
    for m in order {
        mark_svg(out, m, f, &mut right_labels, &mut top_labels);
    }
    right_margin_labels(out, f, right_labels);
    legend(out, plot, f, legend_top);
    out.push_str("</g>\n");
}

fn axes(out: &mut String, plot: &Plot, f: Frame) {
    let _ = writeln!(
        out,
        "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"none\" stroke=\"#444444\" stroke-width=\"1\"/>",
        px(f.left),
        px(f.top),
        px(f.width),
        px(f.height)
    );
    let grid = |out: &mut String, axis: &Axis, horizontal: bool| {
        let list: Vec<(f64, String)> = if axis.categories.is_empty() {
            let (vals, step) = ticks(f64::min(axis.min, axis.max), f64::max(axis.min, axis.max));
            vals.into_iter()
                .map(|v| (v, format_number(v, step)))
                .collect()
        } else {
            axis.categories.clone()
        };
        let _ = writeln!(
            out,
            "<g class=\"axis\" data-axis=\"{}\">",
            if horizontal { "x" } else { "y" }
        );
        for (v, text) in list {
            if horizontal {
                let x = f.sx(v);
                let _ = writeln!(
                    out,
                    "<line x1=\"{x}\" y1=\"{}\" x2=\"{x}\" y2=\"{}\" stroke=\"#e2e2e2\" stroke-width=\"0.8\"/>\
                     <text x=\"{x}\" y=\"{}\" {FONT} font-size=\"11\" text-anchor=\"middle\" fill=\"#222222\" data-value=\"{}\">{}</text>",
                    px(f.top),
                    px(f.bottom()),
                    px(f.bottom() + 15.0),
                    num(v),
                    esc(&text),
                    x = px(x)
                );
            } else {
                let y = f.sy(v);
                let _ = writeln!(
                    out,
                    "<line x1=\"{}\" y1=\"{y}\" x2=\"{}\" y2=\"{y}\" stroke=\"#e2e2e2\" stroke-width=\"0.8\"/>\
                     <text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" text-anchor=\"end\" fill=\"#222222\" data-value=\"{}\">{}</text>",
                    px(f.left),
                    px(f.right()),
                    px(f.left - 6.0),
                    px(y + 4.0),
                    num(v),
                    esc(&text),
                    y = px(y)
                );
            }
        }
        let (title_x, title_y, rotate) = if horizontal {
            (f.left + f.width / 2.0, f.bottom() + 36.0, String::new())
        } else {
            let (x, y) = (f.left - 56.0, f.top + f.height / 2.0);
            (
                x,
                y,
                format!(" transform=\"rotate(-90 {} {})\"", px(x), px(y)),
            )
        };
        let _ = writeln!(
            out,
            "<text x=\"{}\" y=\"{}\"{rotate} {FONT} font-size=\"12\" text-anchor=\"middle\" fill=\"#111111\" class=\"axis-title\">{}</text>\n</g>",
            px(title_x),
            px(title_y),
            esc(&axis.title())
        );
    };
    grid(out, &plot.x, true);
    grid(out, &plot.y, false);
}
