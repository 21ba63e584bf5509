//! Figures of the curves [`crate::quantity::curves`] computes, written as
//! SVG by hand (floating-point coordinates, so curves do not kink at whole
//! pixels) or as PDF with the bundled font embedded. This file lays the
//! figure out and writes the SVG; the pieces are `label` (typeset names),
//! `style` (colour families and dashes), `axis` (ticks), `clip` (cutting at
//! the frame), `font` (the bundled face and its advances) and `pdf`.
//!
//! The frame's y range is that of the finite-coupling curves: expansions
//! and approximants are clipped at it, never widen it.

mod axis;
mod clip;
mod font;
pub mod label;
mod pdf;
pub mod style;

use std::fmt::Write as _;
use std::path::Path;

use crate::error::{Error, Result};
use crate::input::catalogue::Status;
use crate::quantity::curves::{Curve, CurveKind, Figure};
use crate::quantity::Quantity;

pub use clip::Frame;
use label::{typeset, Rich};
use style::Stroke;

/// The file formats of a figure.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum FigureFormat {
    Svg,
    Pdf,
}

/// A laid-out figure: the SVG text, the frame the curves are clipped to,
/// and notes on curves left out (for stderr).
pub struct Drawing {
    pub svg: String,
    pub frame: Frame,
    /// Curves drawn (with at least one visible piece).
    pub drawn: usize,
    pub notes: Vec<String>,
}

const TITLE_SIZE: f64 = 24.0;
const SUBTITLE_SIZE: f64 = 16.0;
const LABEL_SIZE: f64 = 22.0;
const TICK_SIZE: f64 = 16.0;
const LEGEND_SIZE: f64 = 17.0;
const LEGEND_ROW: f64 = 26.0;
const SAMPLE: f64 = 48.0;
const FRAME_WIDTH: f64 = 640.0;
const FRAME_HEIGHT: f64 = 440.0;
const FRAME_TOP: f64 = 92.0;
const INK: &str = "#222222";
const GRID: &str = "#e3e3e3";

/// The visible pieces of a curve in figure coordinates, after clipping.
type Pieces = Vec<Vec<(f64, f64)>>;

/// How one quantity is named in the figure.
struct Subject {
    /// On the y axis and in the title: Γ_cusp, Γ(0), 2Γ(π/4) − 4g².
    symbol: Rich,
    /// Above its curves in the legend.
    header: Rich,
    /// What stderr calls it (as the user wrote it).
    plain: String,
}

fn subject(q: &Quantity) -> Subject {
    let named = q.entry.as_ref().filter(|e| e.name == q.label);
    let conjecture = q
        .entry
        .as_ref()
        .is_some_and(|e| e.status == Status::Conjecture);
    let (symbol, mut header) = match named {
        Some(entry) => {
            let definition = typeset(&entry.definition);
            match label::symbol(&entry.name) {
                Some(symbol) => {
                    let mut header = symbol.clone().then(" = ");
                    header.append(&definition);
                    (symbol, header)
                }
                None => {
                    let mut header = Rich::plain(&format!("{}, ", entry.name));
                    header.append(&definition);
                    (definition, header)
                }
            }
        }
        None => {
            let formula = typeset(&q.label);
            (formula.clone(), formula)
        }
    };
    if conjecture {
        header = header.then(" (conjecture)");
    }
    Subject {
        symbol,
        header,
        plain: q.label.clone(),
    }
}

/// The legend text of a curve (below its quantity's header).
fn entry_text(kind: CurveKind, strong_from: f64) -> Rich {
    match kind {
        CurveKind::Finite => Rich::plain("finite coupling"),
        CurveKind::Weak(l) => {
            let loops = if l == 1 { "loop" } else { "loops" };
            let mut r = Rich::plain("weak coupling to ");
            r.append(&typeset(&format!("g^{}", 2 * l)));
            r.then(&format!(" ({l} {loops})"))
        }
        CurveKind::Pade(n) => {
            let mut r = Rich::plain(&format!("Padé [{n}/{n}] in "));
            r.append(&typeset("g^2"));
            r
        }
        CurveKind::Strong { conjecture } => {
            let mut r = Rich::plain(&format!("strong coupling, g ≥ {strong_from}"));
            if conjecture {
                r = r.then(" (conjecture)");
            }
            r
        }
    }
}

fn kind_word(kind: CurveKind) -> String {
    match kind {
        CurveKind::Finite => "finite coupling".into(),
        CurveKind::Weak(l) => format!("weak coupling, {l} loops"),
        CurveKind::Pade(n) => format!("Padé [{n}/{n}]"),
        CurveKind::Strong { .. } => "strong coupling".into(),
    }
}

/// Order of curves in the legend: finite coupling, truncations by loop
/// order, Padé, strong coupling.
fn legend_rank(kind: CurveKind) -> (u8, u32) {
    match kind {
        CurveKind::Finite => (0, 0),
        CurveKind::Weak(l) => (1, l),
        CurveKind::Pade(n) => (2, n as u32),
        CurveKind::Strong { .. } => (3, 0),
    }
}

fn coord(v: f64) -> String {
    format!("{v:.2}")
}

/// `<text>` at (x, y) with the given size, anchor and colour.
/// A grid line or tick from `a` to `b`.
fn line(out: &mut String, a: (f64, f64), b: (f64, f64), stroke: &str, width: &str) {
    let _ = writeln!(
        out,
        r#"<line x1="{}" y1="{}" x2="{}" y2="{}" stroke="{stroke}" stroke-width="{width}"/>"#,
        coord(a.0),
        coord(a.1),
        coord(b.0),
        coord(b.1)
    );
}

fn text(out: &mut String, x: f64, y: f64, size: f64, anchor: &str, fill: &str, content: &Rich) {
    let _ = writeln!(
        out,
        r#"<text x="{}" y="{}" font-size="{size}" text-anchor="{anchor}" fill="{fill}">{}</text>"#,
        coord(x),
        coord(y),
        content.svg()
    );
}

/// Lays out the figure: frame, ticks, clipped curves, legend, title.
pub fn draw(figure: &Figure, quantities: &[Quantity]) -> Drawing {
    let subjects: Vec<Subject> = quantities.iter().map(subject).collect();
    let finite = figure.curves.iter().filter(|c| c.kind == CurveKind::Finite);
    let (x0, x1) = figure
        .curves
        .iter()
        .flat_map(|c| c.points.iter().map(|p| p.0))
        .filter(|x| x.is_finite())
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), x| {
            (lo.min(x), hi.max(x))
        });
    let (x0, x1) = if x0 < x1 { (x0, x1) } else { (0.0, 1.0) };
    let (y0, y1) =
        axis::padded_span(finite.flat_map(|c| c.points.iter().map(|p| p.1))).unwrap_or((0.0, 1.0));
    let xticks = axis::ticks(x0, x1, 6);
    let yticks = axis::ticks(y0, y1, 6);
    let tick_width = yticks
        .iter()
        .map(|(_, l)| font::advance(l, TICK_SIZE))
        .fold(0.0, f64::max);
    let left = 28.0 + 1.3 * LABEL_SIZE + tick_width + 14.0;
    let frame = Frame {
        left,
        top: FRAME_TOP,
        right: left + FRAME_WIDTH,
        bottom: FRAME_TOP + FRAME_HEIGHT,
    };
    let px = |x: f64| frame.left + (x - x0) / (x1 - x0) * FRAME_WIDTH;
    let py = |y: f64| frame.bottom - (y - y0) / (y1 - y0) * FRAME_HEIGHT;

    // Clip every curve; keep those with something to show.
    let mut notes = Vec::new();
    let mut shown: Vec<(&Curve, Pieces)> = Vec::new();
    for c in &figure.curves {
        let mapped: Vec<(f64, f64)> = c.points.iter().map(|&(x, y)| (px(x), py(y))).collect();
        let pieces = clip::polyline(&frame, &mapped);
        if pieces.is_empty() {
            notes.push(format!(
                "{} {}: left out, it lies outside the frame (the range of the finite-coupling curves) everywhere",
                subjects[c.quantity].plain,
                kind_word(c.kind)
            ));
        } else {
            shown.push((c, pieces));
        }
    }
    let truncations = |k: usize| -> Vec<u32> {
        let mut l: Vec<u32> = shown
            .iter()
            .filter(|(c, _)| c.quantity == k)
            .filter_map(|(c, _)| match c.kind {
                CurveKind::Weak(l) => Some(l),
                _ => None,
            })
            .collect();
        l.sort_unstable();
        l
    };
    let stroke_of = |c: &Curve| -> Stroke {
        let loops = truncations(c.quantity);
        let rank = match c.kind {
            CurveKind::Weak(l) => loops.iter().position(|&m| m == l).unwrap_or(0),
            _ => 0,
        };
        style::stroke(c.quantity, c.kind, rank, loops.len())
    };

    // The legend, grouped by quantity.
    let mut legend: Vec<(usize, Vec<(&Curve, Rich)>)> = Vec::new();
    for k in 0..subjects.len() {
        let mut rows: Vec<(&Curve, Rich)> = shown
            .iter()
            .filter(|(c, _)| c.quantity == k)
            .map(|(c, _)| (*c, entry_text(c.kind, figure.strong_from)))
            .collect();
        rows.sort_by_key(|(c, _)| legend_rank(c.kind));
        if !rows.is_empty() {
            legend.push((k, rows));
        }
    }
    let legend_left = frame.right + 36.0;
    let legend_width = legend
        .iter()
        .flat_map(|(k, rows)| {
            std::iter::once(subjects[*k].header.width(LEGEND_SIZE)).chain(
                rows.iter()
                    .map(|(_, t)| SAMPLE + 12.0 + t.width(LEGEND_SIZE)),
            )
        })
        .fold(0.0, f64::max);
    let legend_rows: usize = legend.iter().map(|(_, rows)| rows.len() + 1).sum();
    let legend_height = legend_rows as f64 * LEGEND_ROW + legend.len() as f64 * 10.0;
    let width = (legend_left + legend_width + 28.0).ceil();
    let height = (frame.bottom + 84.0)
        .max(FRAME_TOP + legend_height + 20.0)
        .ceil();

    let mut out = String::new();
    let _ = writeln!(
        out,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{width}" height="{height}" viewBox="0 0 {width} {height}" font-family="{}, Verdana, sans-serif">"#,
        font::FAMILY
    );
    let _ = writeln!(
        out,
        r##"<rect width="100%" height="100%" fill="#ffffff"/>"##
    );
    let _ = writeln!(
        out,
        r#"<defs><clipPath id="frame-clip"><rect x="{}" y="{}" width="{}" height="{}"/></clipPath></defs>"#,
        coord(frame.left),
        coord(frame.top),
        coord(FRAME_WIDTH),
        coord(FRAME_HEIGHT)
    );
    // Grid and ticks.
    for (v, l) in &xticks {
        let x = px(*v);
        line(&mut out, (x, frame.top), (x, frame.bottom), GRID, "1");
        line(
            &mut out,
            (x, frame.bottom),
            (x, frame.bottom + 6.0),
            INK,
            "1.2",
        );
        text(
            &mut out,
            x,
            frame.bottom + 26.0,
            TICK_SIZE,
            "middle",
            INK,
            &Rich::plain(l),
        );
    }
    for (v, l) in &yticks {
        let y = py(*v);
        line(&mut out, (frame.left, y), (frame.right, y), GRID, "1");
        line(&mut out, (frame.left - 6.0, y), (frame.left, y), INK, "1.2");
        text(
            &mut out,
            frame.left - 10.0,
            y + 0.35 * TICK_SIZE,
            TICK_SIZE,
            "end",
            INK,
            &Rich::plain(l),
        );
    }
    // Curves: expansions first, the finite-coupling curves on top of them.
    let _ = writeln!(
        out,
        r#"<g clip-path="url(#frame-clip)" fill="none" stroke-linejoin="round">"#
    );
    let mut order: Vec<&(&Curve, Pieces)> = shown.iter().collect();
    order.sort_by_key(|(c, _)| c.kind == CurveKind::Finite);
    for (c, pieces) in order {
        let s = stroke_of(c);
        let mut d = String::new();
        for piece in pieces {
            for (i, (x, y)) in piece.iter().enumerate() {
                let _ = write!(
                    d,
                    "{}{},{} ",
                    if i == 0 { "M" } else { "L" },
                    coord(*x),
                    coord(*y)
                );
            }
        }
        let dash = s
            .dashes
            .map(|p| format!(r#" stroke-dasharray="{p}""#))
            .unwrap_or_default();
        let _ = writeln!(
            out,
            r#"<path class="curve" data-quantity="{}" data-kind="{}" stroke="{}" stroke-width="{}"{dash} d="{}"/>"#,
            c.quantity,
            kind_attr(c.kind),
            s.colour,
            s.width,
            d.trim_end()
        );
    }
    let _ = writeln!(out, "</g>");
    let _ = writeln!(
        out,
        r#"<rect id="frame" x="{}" y="{}" width="{}" height="{}" fill="none" stroke="{INK}" stroke-width="1.2"/>"#,
        coord(frame.left),
        coord(frame.top),
        coord(FRAME_WIDTH),
        coord(FRAME_HEIGHT)
    );
    // Axis labels.
    let centre_x = (frame.left + frame.right) / 2.0;
    text(
        &mut out,
        centre_x,
        frame.bottom + 62.0,
        LABEL_SIZE,
        "middle",
        INK,
        &Rich::plain("g"),
    );
    let y_label = join(subjects.iter().map(|s| &s.symbol), ", ");
    let _ = writeln!(
        out,
        r#"<text class="y-label" transform="translate({},{}) rotate(-90)" font-size="{LABEL_SIZE}" text-anchor="middle" fill="{INK}">{}</text>"#,
        coord(28.0 + LABEL_SIZE * 0.8),
        coord((frame.top + frame.bottom) / 2.0),
        y_label.svg()
    );
    // Title and the convention.
    let mut title = join(subjects.iter().map(|s| &s.symbol), ", ");
    title = title.then(" against the coupling g");
    text(&mut out, centre_x, 38.0, TITLE_SIZE, "middle", INK, &title);
    let mut sub = label::convention();
    if figure
        .curves
        .iter()
        .any(|c| matches!(c.kind, CurveKind::Strong { .. }))
    {
        sub = sub.then(&format!(
            "; strong-coupling expansions drawn for g ≥ {}",
            figure.strong_from
        ));
    }
    text(
        &mut out,
        centre_x,
        66.0,
        SUBTITLE_SIZE,
        "middle",
        "#555555",
        &sub,
    );
    // Legend.
    let mut y = frame.top + 0.8 * LEGEND_SIZE;
    for (k, rows) in &legend {
        let dark = style::stroke(*k, CurveKind::Finite, 0, 1).colour;
        text(
            &mut out,
            legend_left,
            y,
            LEGEND_SIZE,
            "start",
            &dark,
            &subjects[*k].header,
        );
        y += LEGEND_ROW;
        for (c, t) in rows {
            let s = stroke_of(c);
            let dash = s
                .dashes
                .map(|p| format!(r#" stroke-dasharray="{p}""#))
                .unwrap_or_default();
            let _ = writeln!(
                out,
                r#"<line class="sample" x1="{0}" y1="{2}" x2="{1}" y2="{2}" stroke="{3}" stroke-width="{4}"{dash}/>"#,
                coord(legend_left),
                coord(legend_left + SAMPLE),
                coord(y - 0.3 * LEGEND_SIZE),
                s.colour,
                s.width
            );
            text(
                &mut out,
                legend_left + SAMPLE + 12.0,
                y,
                LEGEND_SIZE,
                "start",
                INK,
                t,
            );
            y += LEGEND_ROW;
        }
        y += 10.0;
    }
    let _ = writeln!(out, "</svg>");
    Drawing {
        svg: out,
        frame,
        drawn: shown.len(),
        notes,
    }
}

fn kind_attr(kind: CurveKind) -> String {
    match kind {
        CurveKind::Finite => "finite".into(),
        CurveKind::Weak(l) => format!("weak-{l}"),
        CurveKind::Pade(n) => format!("pade-{n}"),
        CurveKind::Strong { .. } => "strong".into(),
    }
}

fn join<'a>(parts: impl Iterator<Item = &'a Rich>, sep: &str) -> Rich {
    let mut out = Rich::default();
    for (i, p) in parts.enumerate() {
        if i > 0 {
            out = out.then(sep);
        }
        out.append(p);
    }
    out
}

/// The format a path asks for: PDF for a `.pdf` ending (any case), else SVG.
pub fn format_of(path: &Path) -> FigureFormat {
    match path.extension().and_then(|e| e.to_str()) {
        Some(e) if e.eq_ignore_ascii_case("pdf") => FigureFormat::Pdf,
        _ => FigureFormat::Svg,
    }
}

/// Draws the figure and writes it to `path` in `format`.
pub fn write(
    path: &Path,
    format: FigureFormat,
    figure: &Figure,
    quantities: &[Quantity],
) -> Result<Drawing> {
    let drawing = draw(figure, quantities);
    let bytes = match format {
        FigureFormat::Svg => drawing.svg.clone().into_bytes(),
        FigureFormat::Pdf => pdf::from_svg(&drawing.svg)
            .map_err(|e| Error::io(format!("{}: could not write the PDF: {e}", path.display())))?,
    };
    std::fs::write(path, bytes).map_err(|e| Error::io(format!("{}: {e}", path.display())))?;
    Ok(drawing)
}

#[cfg(test)]
mod tests;
