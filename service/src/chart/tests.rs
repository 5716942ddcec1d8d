use super::*;

fn figure() -> Figure {
    let x = Axis::fit("Torque", "N·m", &[0.0, 47.3], true);
    let y = Axis::fit("Clamp force", "kN", &[0.0, 31.9], true);
    Figure {
        title: "A & B <window>".into(),
        desc: "Demo figure for the writer's tests.".into(),
        plots: vec![Plot {
            heading: "heading".into(),
            x,
            y,
            marks: vec![
                Mark::new(
                    "band",
                    "window",
                    Shape::Band {
                        from: 20.0,
                        to: 30.0,
                    },
                ),
                Mark::new(
                    "line",
                    "μ min",
                    Shape::Line {
                        points: vec![(0.0, 0.0), (40.0, 30.0), (f64::NAN, 1.0)],
                        pen: pens::LOW,
                        marker: Marker::Circle,
                    },
                )
                .explained("clamp force at minimum friction"),
                Mark::new(
                    "level",
                    "F_M,zul",
                    Shape::Level {
                        y: 25.0,
                        pen: pens::LIMIT,
                    },
                ),
                Mark::new(
                    "level2",
                    "F_M,max",
                    Shape::Level {
                        y: 25.1,
                        pen: pens::PRELOAD,
                    },
                ),
                Mark::new(
                    "box",
                    "window",
                    Shape::Frame {
                        x0: 20.0,
                        x1: 30.0,
                        y0: 15.0,
                        y1: 25.0,
                        pen: pens::WINDOW,
                    },
                ),
                Mark::new(
                    "bars",
                    "range",
                    Shape::Bars {
                        bars: vec![Bar {
                            x: 5.0,
                            low: 1.0,
                            high: 3.0,
                            mid: Some(2.0),
                        }],
                        pen: pens::DATA,
                        marker: Marker::Diamond,
                    },
                ),
            ],
        }],
        notes: vec!["a note ".repeat(40)],
    }
}

#[test]
fn nice_ranges_use_round_steps() {
    assert_eq!(nice_range(0.0, 47.3), (0.0, 50.0, 10.0));
    assert_eq!(nice_range(0.08, 0.16).2, 0.02);
    // 0.14/0.02 is a rounding error above 7: the domain starts at 0.14.
    let (lo, hi, _) = nice_range(0.14, 0.24);
    assert!(
        (lo - 0.14).abs() < 1e-12 && (hi - 0.24).abs() < 1e-12,
        "{lo} {hi}"
    );
    let axis = Axis::fit("μ", "", &[0.14, 0.24], false).with_headroom(0.15);
    assert!(axis.max > 0.24 && (axis.min - 0.14).abs() < 1e-12);
    let (lo, hi, step) = nice_range(5.0, 5.0);
    assert!(lo < 5.0 && hi > 5.0 && step > 0.0);
    assert_eq!(nice_range(f64::NAN, 1.0), (0.0, 1.0, 0.2));
    assert_eq!(format_number(0.1 * 3.0, 0.02), "0.30");
    assert_eq!(format_number(-0.0, 1.0), "0");
    assert_eq!(format_number(1500.0, 500.0), "1500");
}

#[test]
fn the_same_figure_gives_the_same_bytes_and_escapes_text() {
    let a = render(&figure());
    assert_eq!(a, render(&figure()));
    assert!(a.contains("<title id=\"chart-title\">A &amp; B &lt;window&gt;</title>"));
    assert!(!a.contains("NaN") && !a.contains("inf"));
    assert!(a.contains("stroke-dasharray=\"9 4\""));
    assert!(a.contains("clamp force at minimum friction"));
    assert!(a.contains("Torque in N·m") && a.contains("Clamp force in kN"));
}

#[test]
fn labels_in_the_right_margin_never_overlap() {
    let svg = render(&figure());
    let ys: Vec<f64> = svg
        .lines()
        .filter(|l| l.contains("class=\"line-label\""))
        .filter_map(|l| l.split("y=\"").nth(1)?.split('"').next()?.parse().ok())
        .collect();
    assert_eq!(ys.len(), 3);
    for pair in ys.windows(2) {
        assert!(pair[1] - pair[0] >= 12.0, "{ys:?}");
    }
}
