//! Drawing the marks of a plot: lines, points, reference lines, bands,
//! window frames and bars, their markers, the labels in the right margin
//! and the legend.

use std::fmt::Write;

use super::svg::{esc, legend_columns, num, px, Frame, FONT, LABEL_GAP, LEGEND_COLUMN, LEGEND_ROW};
use super::{Mark, Marker, Pen, Plot, Shape};

pub(super) fn stroke(pen: Pen) -> String {
    let mut s = format!(
        "stroke=\"{}\" stroke-width=\"{}\" fill=\"none\"",
        pen.colour, pen.width
    );
    if !pen.dash.is_empty() {
        let _ = write!(s, " stroke-dasharray=\"{}\"", pen.dash);
    }
    s
}

/// One marker centred on (`x`, `y`) in pixels.
pub(super) fn marker(out: &mut String, m: Marker, x: f64, y: f64, pen: Pen) {
    let (c, r) = (pen.colour, 4.0);
    let (xs, ys) = (px(x), px(y));
    let _ = match m {
        Marker::None => Ok(()),
        Marker::Circle => writeln!(
            out,
            "<circle cx=\"{xs}\" cy=\"{ys}\" r=\"{r}\" fill=\"white\" stroke=\"{c}\" stroke-width=\"1.4\"/>"
        ),
        Marker::Square => writeln!(
            out,
            "<rect x=\"{}\" y=\"{}\" width=\"7\" height=\"7\" fill=\"{c}\"/>",
            px(x - 3.5),
            px(y - 3.5)
        ),
        Marker::Triangle => writeln!(
            out,
            "<path d=\"M{} {} L{} {} L{} {} Z\" fill=\"{c}\"/>",
            xs,
            px(y - r),
            px(x + r),
            px(y + r * 0.8),
            px(x - r),
            px(y + r * 0.8)
        ),
        Marker::Diamond => writeln!(
            out,
            "<path d=\"M{xs} {} L{} {ys} L{xs} {} L{} {ys} Z\" fill=\"white\" stroke=\"{c}\" stroke-width=\"1.4\"/>",
            px(y - r),
            px(x + r),
            px(y + r),
            px(x - r)
        ),
        Marker::Cross => writeln!(
            out,
            "<path d=\"M{} {} L{} {} M{} {} L{} {}\" stroke=\"{c}\" stroke-width=\"1.6\"/>",
            px(x - r),
            px(y - r),
            px(x + r),
            px(y + r),
            px(x - r),
            px(y + r),
            px(x + r),
            px(y - r)
        ),
    };
}

fn polyline(points: &[(f64, f64)], f: Frame) -> String {
    let mut d = String::new();
    for (x, y) in points
        .iter()
        .filter(|(x, y)| x.is_finite() && y.is_finite())
    {
        let _ = write!(
            d,
            "{}{},{}",
            if d.is_empty() { "" } else { " " },
            px(f.sx(*x)),
            px(f.sy(*y))
        );
    }
    d
}

fn finite_points(points: &[(f64, f64)]) -> impl Iterator<Item = &(f64, f64)> {
    points
        .iter()
        .filter(|(x, y)| x.is_finite() && y.is_finite())
}

pub(super) fn mark_svg(
    out: &mut String,
    m: &Mark,
    f: Frame,
    right: &mut Vec<(f64, String, String)>,
    top_labels: &mut usize,
) {
    let (role, label) = (esc(&m.role), esc(&m.label));
    let _ = write!(
        out,
        "<g class=\"mark\" data-role=\"{role}\" data-label=\"{label}\""
    );
    match &m.shape {
        Shape::Line {
            points,
            pen,
            marker: mk,
        } => {
            out.push_str(">\n");
            let _ = writeln!(
                out,
                "<polyline points=\"{}\" {}/>",
                polyline(points, f),
                stroke(*pen)
            );
            for (x, y) in finite_points(points) {
                marker(out, *mk, f.sx(*x), f.sy(*y), *pen);
            }
            if let Some((_, y)) = finite_points(points).last() {
                right.push((f.sy(*y), m.label.clone(), pen.colour.into()));
            }
        }
        Shape::Points {
            points,
            pen,
            marker: mk,
        } => {
            out.push_str(">\n");
            for (x, y) in finite_points(points) {
                let _ = write!(out, "<g data-x=\"{}\" data-y=\"{}\">", num(*x), num(*y));
                marker(out, *mk, f.sx(*x), f.sy(*y), *pen);
                out.push_str("</g>\n");
            }
        }
        Shape::Level { y, pen } => {
            let _ = writeln!(
                out,
                " data-y=\"{}\">\n<line x1=\"{}\" y1=\"{sy}\" x2=\"{}\" y2=\"{sy}\" {}/>",
                num(*y),
                px(f.left),
                px(f.right()),
                stroke(*pen),
                sy = px(f.sy(*y))
            );
            right.push((f.sy(*y), m.label.clone(), pen.colour.into()));
        }
        Shape::Upright { x, pen } => {
            let (sx, ty) = (f.sx(*x), f.top + 6.0);
            let _ = writeln!(
                out,
                " data-x=\"{}\">\n<line x1=\"{sx}\" y1=\"{}\" x2=\"{sx}\" y2=\"{}\" {}/>\
                 <text x=\"{}\" y=\"{}\" transform=\"rotate(-90 {} {})\" {FONT} font-size=\"11\" text-anchor=\"end\" fill=\"{}\">{label}</text>",
                num(*x),
                px(f.top),
                px(f.bottom()),
                stroke(*pen),
                px(sx - 4.0),
                px(ty),
                px(sx - 4.0),
                px(ty),
                pen.colour,
                sx = px(sx)
            );
        }
        Shape::Band { from, to } => {
            let (a, b) = (f.sx(from.min(*to)), f.sx(from.max(*to)));
            let ty = f.bottom() - 8.0 - 14.0 * (*top_labels as f64);
            *top_labels += 1;
            let _ = writeln!(
                out,
                " data-x0=\"{}\" data-x1=\"{}\">\n<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"#c9d6e6\" fill-opacity=\"0.55\" stroke=\"none\"/>\
                 <text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" text-anchor=\"middle\" fill=\"#1d3f6e\">{label}</text>",
                num(*from),
                num(*to),
                px(a),
                px(f.top),
                px(b - a),
                px(f.height),
                px((a + b) / 2.0),
                px(ty)
            );
        }
        Shape::Frame {
            x0,
            x1,
            y0,
            y1,
            pen,
        } => {
            let (a, b) = (f.sx(x0.min(*x1)), f.sx(x0.max(*x1)));
            let (c, d) = (f.sy(y0.max(*y1)), f.sy(y0.min(*y1)));
            let _ = writeln!(
                out,
                " data-x0=\"{}\" data-x1=\"{}\" data-y0=\"{}\" data-y1=\"{}\">\n<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" fill=\"#1d3f6e\" fill-opacity=\"0.08\" {}/>\
                 <text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" fill=\"{}\">{label}</text>",
                num(*x0),
                num(*x1),
                num(*y0),
                num(*y1),
                px(a),
                px(c),
                px(b - a),
                px(d - c),
                stroke(*pen).replace(" fill=\"none\"", ""),
                px(a + 3.0),
                px(d - 4.0),
                pen.colour
            );
        }
        Shape::Bars {
            bars,
            pen,
            marker: mk,
        } => {
            out.push_str(">\n");
            for b in bars.iter().filter(|b| {
                [b.x, b.low, b.high, b.mid.unwrap_or(0.0)]
                    .iter()
                    .all(|v| v.is_finite())
            }) {
                let sx = f.sx(b.x);
                let (lo, hi) = (f.sy(b.low), f.sy(b.high));
                let _ = writeln!(
                    out,
                    "<g data-x=\"{}\" data-low=\"{}\" data-high=\"{}\"><path d=\"M{sxs} {los} L{sxs} {his} M{} {los} L{} {los} M{} {his} L{} {his}\" {}/>",
                    num(b.x),
                    num(b.low),
                    num(b.high),
                    px(sx - 5.0),
                    px(sx + 5.0),
                    px(sx - 5.0),
                    px(sx + 5.0),
                    stroke(*pen),
                    sxs = px(sx),
                    los = px(lo),
                    his = px(hi)
                );
                if let Some(mid) = b.mid {
                    marker(out, *mk, sx, f.sy(mid), *pen);
                }
                out.push_str("</g>\n");
            }
            if let Some(b) = bars.last() {
                let _ = writeln!(
                    out,
                    "<text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" text-anchor=\"middle\" fill=\"{}\">{label}</text>",
                    px(f.sx(b.x)),
                    px(f.sy(b.high) - 6.0),
                    pen.colour
                );
            }
        }
    }
    out.push_str("</g>\n");
}

/// Labels in the right margin at their lines' heights, pushed apart so that
/// none overlaps the one above it.
pub(super) fn right_margin_labels(
    out: &mut String,
    f: Frame,
    mut labels: Vec<(f64, String, String)>,
) {
    labels.sort_by(|a, b| a.0.total_cmp(&b.0));
    let mut last = f64::NEG_INFINITY;
    for (y, text, colour) in labels {
        let y = (y + 4.0).max(last + LABEL_GAP);
        last = y;
        let _ = writeln!(
            out,
            "<text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" fill=\"{colour}\" class=\"line-label\">{}</text>",
            px(f.right() + 6.0),
            px(y),
            esc(&text)
        );
    }
}

/// A sample of each mark's pen and marker with its label.
pub(super) fn legend(out: &mut String, plot: &Plot, f: Frame, top: f64) {
    let columns = legend_columns(plot);
    out.push_str("<g class=\"legend\">\n");
    for (i, m) in plot.marks.iter().enumerate() {
        let x = f.left + LEGEND_COLUMN * (i % columns) as f64;
        let y = top + LEGEND_ROW * (i / columns) as f64 + 9.0;
        let (pen, mk, line) = match &m.shape {
            Shape::Line { pen, marker, .. } => (*pen, *marker, true),
            Shape::Points { pen, marker, .. } => (*pen, *marker, false),
            Shape::Bars { pen, marker, .. } => (*pen, *marker, true),
            Shape::Level { pen, .. } | Shape::Upright { pen, .. } | Shape::Frame { pen, .. } => {
                (*pen, Marker::None, true)
            }
            Shape::Band { .. } => (super::pens::WINDOW, Marker::None, false),
        };
        if matches!(m.shape, Shape::Band { .. }) {
            let _ = write!(
                out,
                "<rect x=\"{}\" y=\"{}\" width=\"28\" height=\"10\" fill=\"#c9d6e6\"/>",
                px(x),
                px(y - 5.0)
            );
        } else if line {
            let _ = write!(
                out,
                "<line x1=\"{}\" y1=\"{ys}\" x2=\"{}\" y2=\"{ys}\" {}/>",
                px(x),
                px(x + 28.0),
                stroke(pen),
                ys = px(y)
            );
        }
        marker(out, mk, x + 14.0, y, pen);
        let _ = writeln!(
            out,
            "<text x=\"{}\" y=\"{}\" {FONT} font-size=\"11\" fill=\"#111111\">{}</text>",
            px(x + 34.0),
            px(y + 4.0),
            esc(&m.legend)
        );
    }
    out.push_str("</g>\n");
}
