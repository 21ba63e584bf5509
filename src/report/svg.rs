//! SVG figures of the curves [`crate::quantity::curves`] computes (f64 is
//! enough here: a figure is presentation). Only the SVG backend is
//! used, so no font or image system libraries are needed; PNG is not
//! offered because rasterising text would need them.

use std::path::Path;

use plotters::prelude::*;
use plotters::style::ShapeStyle;

use crate::error::{Error, Result};
use crate::quantity::curves::Curve;

/// Twelve colours that stay apart from each other, so that a figure with
/// several quantities and their expansions does not repeat a colour.
const PALETTE: [RGBColor; 12] = [
    RGBColor(31, 90, 170),
    RGBColor(200, 70, 30),
    RGBColor(40, 140, 60),
    RGBColor(130, 60, 160),
    RGBColor(150, 110, 20),
    RGBColor(20, 140, 150),
    RGBColor(220, 40, 120),
    RGBColor(90, 90, 90),
    RGBColor(110, 170, 30),
    RGBColor(240, 150, 20),
    RGBColor(70, 40, 110),
    RGBColor(160, 40, 40),
];

/// Range of the finite coordinates, widened when degenerate.
fn span(values: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    let (lo, hi) = values
        .filter(|v| v.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), v| {
            (lo.min(v), hi.max(v))
        });
    if lo > hi {
        return None;
    }
    let pad = if hi > lo {
        0.04 * (hi - lo)
    } else {
        lo.abs().max(1.0) * 0.5
    };
    Some((lo - pad, hi + pad))
}

/// Dash pattern drawn as separate segments along the polyline, by length in
/// data-independent pixel units of the chart's coordinate mapping.
fn dashes(points: &[(f64, f64)], x: (f64, f64), y: (f64, f64)) -> Vec<Vec<(f64, f64)>> {
    // Work in normalised coordinates so dashes look even on both axes.
    let sx = (x.1 - x.0).max(f64::MIN_POSITIVE);
    let sy = (y.1 - y.0).max(f64::MIN_POSITIVE);
    let (on, off): (f64, f64) = (0.018, 0.012);
    let mut out = Vec::new();
    let mut current: Vec<(f64, f64)> = Vec::new();
    let mut phase = 0.0f64;
    let mut drawing = true;
    for w in points.windows(2) {
        let (a, b) = (w[0], w[1]);
        let len = (((b.0 - a.0) / sx).powi(2) + ((b.1 - a.1) / sy).powi(2)).sqrt();
        let mut s = 0.0;
        while s < len {
            let limit = if drawing { on } else { off };
            let step = (limit - phase).min(len - s);
            let p0 = (a.0 + (b.0 - a.0) * s / len, a.1 + (b.1 - a.1) * s / len);
            s += step;
            phase += step;
            let p1 = (a.0 + (b.0 - a.0) * s / len, a.1 + (b.1 - a.1) * s / len);
            if drawing {
                if current.is_empty() {
                    current.push(p0);
                }
                current.push(p1);
            }
            if phase >= limit {
                phase = 0.0;
                if drawing {
                    out.push(std::mem::take(&mut current));
                }
                drawing = !drawing;
            }
        }
    }
    if current.len() > 1 {
        out.push(current);
    }
    out
}

fn draw_err<E: std::fmt::Display>(path: &Path) -> impl Fn(E) -> Error + '_ {
    move |e| {
        Error::io(format!(
            "{}: could not draw the figure: {e}",
            path.display()
        ))
    }
}

/// Writes an SVG figure with a title, axis labels and a legend naming each
/// curve. Non-finite points are skipped.
pub fn write_svg(
    path: &Path,
    title: &str,
    x_label: &str,
    y_label: &str,
    curves: &[Curve],
) -> Result<()> {
    // Probe the path first so an unwritable place is reported as such and
    // not as a drawing failure.
    std::fs::File::create(path).map_err(|e| Error::io(format!("{}: {e}", path.display())))?;
    let xs = span(curves.iter().flat_map(|c| c.points.iter().map(|p| p.0))).unwrap_or((0.0, 1.0));
    let ys = span(curves.iter().flat_map(|c| c.points.iter().map(|p| p.1))).unwrap_or((0.0, 1.0));
    let root = SVGBackend::new(path, (900, 600)).into_drawing_area();
    let fail = draw_err(path);
    root.fill(&WHITE).map_err(&fail)?;
    let mut chart = ChartBuilder::on(&root)
        .caption(title, ("sans-serif", 24))
        .margin(16)
        .x_label_area_size(50)
        .y_label_area_size(80)
        .build_cartesian_2d(xs.0..xs.1, ys.0..ys.1)
        .map_err(&fail)?;
    chart
        .configure_mesh()
        .x_desc(x_label)
        .y_desc(y_label)
        .light_line_style(RGBColor(235, 235, 235))
        .draw()
        .map_err(&fail)?;
    for (k, curve) in curves.iter().enumerate() {
        let color = PALETTE[k % PALETTE.len()];
        let style = ShapeStyle {
            color: color.to_rgba(),
            filled: false,
            stroke_width: 2,
        };
        let pts: Vec<(f64, f64)> = curve
            .points
            .iter()
            .copied()
            .filter(|p| p.0.is_finite() && p.1.is_finite())
            .collect();
        let series = if curve.dashed {
            let pieces = dashes(&pts, xs, ys);
            chart
                .draw_series(pieces.into_iter().map(|p| PathElement::new(p, style)))
                .map_err(&fail)?
        } else {
            chart
                .draw_series(LineSeries::new(pts, style))
                .map_err(&fail)?
        };
        let dashed = curve.dashed;
        series.label(curve.name.clone()).legend(move |(x, y)| {
            if dashed {
                PathElement::new(vec![(x, y), (x + 8, y)], style)
            } else {
                PathElement::new(vec![(x, y), (x + 20, y)], style)
            }
        });
    }
    chart
        .configure_series_labels()
        .background_style(WHITE.mix(0.85))
        .border_style(BLACK)
        .position(SeriesLabelPosition::UpperLeft)
        .draw()
        .map_err(&fail)?;
    root.present().map_err(&fail)?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn writes_svg_with_legend_names() {
        let dir = std::env::temp_dir().join(format!("loopwise-plot-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let path = dir.join("figure.svg");
        let solid: Vec<(f64, f64)> = (0..=50)
            .map(|k| (k as f64 * 0.1, (k as f64 * 0.1).sin()))
            .collect();
        let dashed: Vec<(f64, f64)> = (0..=50)
            .map(|k| (k as f64 * 0.1, 0.5 * (k as f64 * 0.1).cos()))
            .collect();
        let curves = [
            Curve {
                name: "solid sine".into(),
                points: solid,
                dashed: false,
            },
            Curve {
                name: "dashed half cosine".into(),
                points: dashed,
                dashed: true,
            },
        ];
        write_svg(&path, "Test figure", "g", "value", &curves).unwrap();
        let text = std::fs::read_to_string(&path).unwrap();
        assert!(
            text.trim_start().starts_with("<svg"),
            "not SVG: {}",
            &text[..text.len().min(80)]
        );
        assert!(text.trim_end().ends_with("</svg>"));
        for needle in [
            "solid sine",
            "dashed half cosine",
            "Test figure",
            "<polyline",
        ] {
            assert!(text.contains(needle), "missing {needle}");
        }
        std::fs::remove_dir_all(&dir).unwrap();
    }

    #[test]
    fn unwritable_path_is_an_io_error_naming_it() {
        // A path whose parent is a regular file cannot be created.
        let blocker =
            std::env::temp_dir().join(format!("loopwise-plot-blocker-{}", std::process::id()));
        std::fs::write(&blocker, b"x").unwrap();
        let path = blocker.join("figure.svg");
        let err = write_svg(&path, "t", "x", "y", &[]).unwrap_err();
        std::fs::remove_file(&blocker).unwrap();
        assert_eq!(err.kind(), crate::ErrorKind::Io);
        assert!(
            err.message().contains("loopwise-plot-blocker"),
            "{}",
            err.message()
        );
    }
}
