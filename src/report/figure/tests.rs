//! The figure printer on made-up curves (no engine): labels, colour
//! families, clipping at the frame, sub-pixel coordinates, the PDF.

use super::*;
use crate::input::catalogue::Catalogue;

fn quantities(names: &[&str]) -> Vec<Quantity> {
    let catalogue = Catalogue::builtin().unwrap();
    names
        .iter()
        .map(|n| Quantity::resolve(n, &catalogue).unwrap())
        .collect()
}

fn grid(f: impl Fn(f64) -> f64) -> Vec<(f64, f64)> {
    (0..=60)
        .map(|k| k as f64 * 0.05)
        .map(|g| (g, f(g)))
        .collect()
}

/// Two quantities, each with all kinds of curves; the 8-loop truncation
/// grows like g^16 and leaves any sensible frame, the Padé curve has a
/// pole at g = 1.525 (between two samples) and comes back into the
/// frame after it.
fn sample() -> (Figure, Vec<Quantity>) {
    let qs = quantities(&["cusp", "octagon"]);
    let mut curves = Vec::new();
    for k in 0..2 {
        let s = 1.0 + 0.3 * k as f64;
        curves.push(Curve {
            quantity: k,
            kind: CurveKind::Finite,
            points: grid(|g| s * (1.0 + g).ln() + 0.1 * (3.0 * g).sin()),
        });
        for l in [2, 4, 8] {
            curves.push(Curve {
                quantity: k,
                kind: CurveKind::Weak(l),
                points: grid(|g| s * g - 1e3 * g.powi(2 * l as i32)),
            });
        }
        curves.push(Curve {
            quantity: k,
            kind: CurveKind::Pade(4),
            points: grid(|g| 0.5 + 0.05 / (1.525 - g)),
        });
        curves.push(Curve {
            quantity: k,
            kind: CurveKind::Strong { conjecture: false },
            points: grid(|g| s * (1.0 + g).ln())
                .into_iter()
                .filter(|p| p.0 >= 0.5)
                .collect(),
        });
    }
    (
        Figure {
            curves,
            strong_from: 0.5,
            notes: Vec::new(),
        },
        qs,
    )
}

/// (data-quantity, data-kind, stroke, the d attribute) of every curve path.
fn paths(svg: &str) -> Vec<(usize, String, String, String)> {
    svg.lines()
        .filter(|l| l.starts_with("<path class=\"curve\""))
        .map(|l| {
            let attr = |name: &str| {
                let start = l.find(&format!(" {name}=\"")).unwrap() + name.len() + 3;
                l[start..start + l[start..].find('"').unwrap()].to_string()
            };
            (
                attr("data-quantity").parse().unwrap(),
                attr("data-kind"),
                attr("stroke"),
                attr("d"),
            )
        })
        .collect()
}

fn coordinates(d: &str) -> Vec<(f64, f64)> {
    d.split_whitespace()
        .map(|p| {
            let (x, y) = p.trim_start_matches(['M', 'L']).split_once(',').unwrap();
            (x.parse().unwrap(), y.parse().unwrap())
        })
        .collect()
}

/// Text of every `<text>` element, tspans included.
fn texts(svg: &str) -> Vec<&str> {
    svg.lines()
        .filter(|l| l.starts_with("<text"))
        .map(|l| &l[l.find('>').unwrap() + 1..l.rfind("</text>").unwrap()])
        .collect()
}

#[test]
fn labels_legend_and_title_are_typeset() {
    let (fig, qs) = sample();
    let d = draw(&fig, &qs);
    let all = texts(&d.svg).join("\n");
    let cusp = "Γ<tspan baseline-shift=\"sub\" font-size=\"70%\">cusp</tspan>";
    let y_label = d
        .svg
        .lines()
        .find(|l| l.contains("class=\"y-label\""))
        .unwrap();
    let oct = "Γ<tspan baseline-shift=\"sub\" font-size=\"70%\">oct</tspan>";
    assert!(y_label.contains(&format!("{cusp}, {oct}")), "{y_label}");
    for needle in [
        &format!("{cusp} = Γ(π/4)") as &str,
        &format!("{oct} = Γ(0)"),
        "g² = λ/(16π²)",
        "weak coupling to g⁴ (2 loops)",
        "weak coupling to g¹⁶ (8 loops)",
        "Padé [4/4] in g²",
        "strong coupling, g ≥ 0.5",
        "finite coupling",
        "against the coupling g",
    ] {
        assert!(all.contains(needle), "missing {needle} in\n{all}");
    }
    // No ASCII spelling of a Greek letter or a power is left in any text.
    for ascii in ["Gamma", "Delta", "pi", "lambda", "^", "g2"] {
        assert!(!all.contains(ascii), "{ascii} in\n{all}");
    }
}

#[test]
fn formulas_and_conjectures_are_labelled() {
    let qs = quantities(&["Gamma(pi/4) - 4*g^2", "hexagon"]);
    let fig = Figure {
        curves: (0..2)
            .map(|k| Curve {
                quantity: k,
                kind: CurveKind::Finite,
                points: grid(|g| g * (k + 1) as f64),
            })
            .collect(),
        strong_from: 0.5,
        notes: Vec::new(),
    };
    let all = texts(&draw(&fig, &qs).svg).join("\n");
    assert!(all.contains("Γ(π/4) − 4g²"), "{all}");
    assert!(
        all.contains(
            "Γ<tspan baseline-shift=\"sub\" font-size=\"70%\">hex</tspan> = Γ(π/3) (conjecture)"
        ),
        "{all}"
    );
}

#[test]
fn each_quantity_has_one_hue_family() {
    let (fig, qs) = sample();
    let d = draw(&fig, &qs);
    let ps = paths(&d.svg);
    let mut seen = std::collections::HashSet::new();
    for (k, kind, stroke, _) in &ps {
        let h = style::hue_of(stroke).unwrap();
        assert!(
            style::hue_distance(h, style::hue(*k)) < 6.0,
            "{k} {kind}: {stroke} has hue {h}"
        );
        seen.insert((*k, kind.clone()));
    }
    assert!(style::hue_distance(style::hue(0), style::hue(1)) >= 40.0);
    // Every curve of one quantity differs from its siblings in colour or dashes.
    let lines: Vec<&str> = d
        .svg
        .lines()
        .filter(|l| l.starts_with("<path class=\"curve\""))
        .collect();
    for k in 0..2 {
        let styles: Vec<String> = lines
            .iter()
            .filter(|l| l.contains(&format!("data-quantity=\"{k}\"")))
            .map(|l| {
                let end = l.find(" d=\"").unwrap();
                let start = l.find(" stroke=").unwrap();
                l[start..end].to_string()
            })
            .collect();
        let unique: std::collections::HashSet<&String> = styles.iter().collect();
        assert_eq!(unique.len(), styles.len(), "{styles:#?}");
    }
    assert!(seen.len() >= 10, "{seen:?}");
}

#[test]
fn nothing_leaves_the_frame_and_truncations_do_not_stretch_it() {
    let (fig, qs) = sample();
    let d = draw(&fig, &qs);
    let f = d.frame;
    let ps = paths(&d.svg);
    let mut touches_edge = false;
    for (_, kind, _, path) in &ps {
        for (x, y) in coordinates(path) {
            // Coordinates are printed to 0.01.
            assert!(
                x >= f.left - 0.005
                    && x <= f.right + 0.005
                    && y >= f.top - 0.005
                    && y <= f.bottom + 0.005,
                "{kind}: ({x}, {y}) outside {f:?}"
            );
            if kind == "weak-8" && ((y - f.top).abs() < 0.01 || (y - f.bottom).abs() < 0.01) {
                touches_edge = true;
            }
        }
    }
    assert!(
        touches_edge,
        "the 8-loop truncation is cut at the frame's edge"
    );
    // The y range is the finite-coupling curves' (1.3 ln 4 + 0.1 at most,
    // far below the 1e3 g^16 of the truncations): the top tick is small.
    let top_tick = texts(&d.svg)
        .iter()
        .filter_map(|t| t.parse::<f64>().ok())
        .fold(f64::NEG_INFINITY, f64::max);
    assert!(top_tick <= 3.0, "{top_tick}");
    // The Padé pole at g = 1.525 breaks its curve instead of drawing a
    // vertical line through the frame: one piece ends before it, the next
    // starts after it.
    let pade = ps.iter().find(|p| p.0 == 0 && p.1 == "pade-4").unwrap();
    assert_eq!(pade.3.matches('M').count(), 2, "{}", pade.3);
    let pole = f.left + 1.525 / 3.0 * (f.right - f.left);
    let second = pade.3.rfind('M').unwrap();
    let before = coordinates(pade.3[..second].trim_end());
    let after = coordinates(&pade.3[second..]);
    assert!(
        before.last().unwrap().0 < pole && after[0].0 > pole,
        "{}",
        pade.3
    );
}

#[test]
fn coordinates_are_sub_pixel() {
    let (fig, qs) = sample();
    let d = draw(&fig, &qs);
    let f = d.frame;
    let finite = paths(&d.svg)
        .into_iter()
        .find(|p| p.0 == 0 && p.1 == "finite")
        .unwrap();
    let pts = coordinates(&finite.3);
    assert_eq!(pts.len(), 61);
    // Each point sits where the affine map of the frame puts it, to the
    // printed 0.01, not at the nearest whole pixel.
    let (y0, y1) = axis::padded_span(
        fig.curves[0]
            .points
            .iter()
            .chain(&fig.curves[6].points)
            .map(|p| p.1),
    )
    .unwrap();
    let mut fractional = 0;
    for ((g, v), (x, y)) in fig.curves[0].points.iter().zip(&pts) {
        let ex = f.left + g / 3.0 * (f.right - f.left);
        let ey = f.bottom - (v - y0) / (y1 - y0) * (f.bottom - f.top);
        assert!(
            (x - ex).abs() <= 0.0051 && (y - ey).abs() <= 0.0051,
            "({x}, {y}) vs ({ex}, {ey})"
        );
        if y.fract() != 0.0 {
            fractional += 1;
        }
    }
    assert!(
        fractional >= 50,
        "{fractional} of 61 y coordinates off whole pixels"
    );
}

#[test]
fn a_curve_wholly_outside_is_left_out_with_a_note() {
    let qs = quantities(&["cusp"]);
    let fig = Figure {
        curves: vec![
            Curve {
                quantity: 0,
                kind: CurveKind::Finite,
                points: grid(|g| g),
            },
            Curve {
                quantity: 0,
                kind: CurveKind::Weak(6),
                points: grid(|g| 100.0 + g),
            },
        ],
        strong_from: 0.5,
        notes: Vec::new(),
    };
    let d = draw(&fig, &qs);
    assert_eq!(d.drawn, 1);
    assert_eq!(d.notes.len(), 1);
    assert!(
        d.notes[0].contains("cusp weak coupling, 6 loops: left out"),
        "{:?}",
        d.notes
    );
    assert!(!d.svg.contains("6 loops"));
}

/// The PDF is a PDF (ISO 32000-1 section 7.5.2: the file starts with the
/// header %PDF-) and embeds its font program (section 9.9: FontFile2 for
/// TrueType, FontFile3 for CFF); the streams are compressed, so the
/// dictionary keys are what can be seen without inflating.
#[test]
fn the_pdf_embeds_its_font() {
    let (fig, qs) = sample();
    let pdf = pdf::from_svg(&draw(&fig, &qs).svg).unwrap();
    assert!(pdf.starts_with(b"%PDF-"), "{:?}", &pdf[..8]);
    let has = |needle: &[u8]| pdf.windows(needle.len()).any(|w| w == needle);
    assert!(
        has(b"/FontFile2") || has(b"/FontFile3"),
        "no embedded font program"
    );
    assert!(has(b"DejaVu"), "the embedded font is not the bundled one");
    assert!(pdf.ends_with(b"%%EOF") || pdf.ends_with(b"%%EOF\n"));
}

#[test]
fn the_format_follows_the_ending() {
    assert_eq!(format_of(Path::new("a/fig.PDF")), FigureFormat::Pdf);
    assert_eq!(format_of(Path::new("fig.pdf")), FigureFormat::Pdf);
    assert_eq!(format_of(Path::new("fig.svg")), FigureFormat::Svg);
    assert_eq!(format_of(Path::new("fig")), FigureFormat::Svg);
}

#[test]
fn unwritable_path_is_an_io_error_naming_it() {
    // A path whose parent is a regular file cannot be created.
    let blocker =
        std::env::temp_dir().join(format!("loopwise-figure-blocker-{}", std::process::id()));
    std::fs::write(&blocker, b"x").unwrap();
    let path = blocker.join("figure.svg");
    let (fig, qs) = sample();
    let err = write(&path, FigureFormat::Svg, &fig, &qs).err().unwrap();
    std::fs::remove_file(&blocker).unwrap();
    assert_eq!(err.kind(), crate::ErrorKind::Io);
    assert!(
        err.message().contains("loopwise-figure-blocker"),
        "{}",
        err.message()
    );
}
