//! `plot` as a user runs it, one test per promise of the figures: the y axis
//! names the quantity, labels are typeset (Γ, g², λ/(16π²)), each quantity's
//! curves keep one hue, strong-coupling expansions start at the threshold,
//! truncations are clipped at the frame, coordinates are sub-pixel, and PDF
//! files embed their font. The SVG is read as text; the PDF's bytes are
//! checked against ISO 32000-1.

mod common;

use common::loopwise;

/// A file in the temporary directory, unique to this test process.
fn temp(name: &str) -> std::path::PathBuf {
    std::env::temp_dir().join(format!("loopwise-cli-plot-{}-{name}", std::process::id()))
}

/// Runs `plot` writing to `name` and returns the file's bytes and stderr.
fn plot(args: &[&str], name: &str) -> (Vec<u8>, String) {
    let path = temp(name);
    let mut all = vec!["plot"];
    all.extend_from_slice(args);
    all.extend_from_slice(&["--out", path.to_str().unwrap()]);
    let (code, out, err) = loopwise(&all);
    assert_eq!(code, 0, "{all:?}: {err}");
    assert!(out.is_empty(), "a figure prints nothing on stdout: {out}");
    let bytes = std::fs::read(&path).unwrap();
    std::fs::remove_file(&path).ok();
    (bytes, err)
}

fn svg(args: &[&str], name: &str) -> String {
    String::from_utf8(plot(args, name).0).unwrap()
}

/// The value of attribute `name` in one element's line.
fn attr<'a>(line: &'a str, name: &str) -> &'a str {
    let key = format!(" {name}=\"");
    let start = line
        .find(&key)
        .unwrap_or_else(|| panic!("no {name} in {line}"))
        + key.len();
    &line[start..start + line[start..].find('"').unwrap()]
}

/// One curve of a figure, as its `<path>` states it.
#[derive(Debug)]
struct Drawn {
    /// `data-quantity`: the quantity's place in the command line, from 0.
    quantity: String,
    /// `data-kind`: finite, weak-L, pade-N or strong.
    kind: String,
    stroke: String,
    points: Vec<(f64, f64)>,
}

/// Every curve of a figure.
fn curves(svg: &str) -> Vec<Drawn> {
    svg.lines()
        .filter(|l| l.starts_with("<path class=\"curve\""))
        .map(|l| {
            let points = attr(l, "d")
                .split_whitespace()
                .map(|p| {
                    let (x, y) = p.trim_start_matches(['M', 'L']).split_once(',').unwrap();
                    (x.parse().unwrap(), y.parse().unwrap())
                })
                .collect();
            Drawn {
                quantity: attr(l, "data-quantity").to_string(),
                kind: attr(l, "data-kind").to_string(),
                stroke: attr(l, "stroke").to_string(),
                points,
            }
        })
        .collect()
}

/// The rectangle the curves are clipped to: (left, top, right, bottom).
fn clip_rect(svg: &str) -> (f64, f64, f64, f64) {
    let line = svg
        .lines()
        .find(|l| l.contains("<clipPath id=\"frame-clip\">"))
        .expect("a clip path");
    let n = |name: &str| attr(line, name).parse::<f64>().unwrap();
    let (x, y) = (n("x"), n("y"));
    (x, y, x + n("width"), y + n("height"))
}

/// Hue in degrees of `#rrggbb`, by the RGB-to-HSL conversion of CSS Color 4
/// section 7 (written out here, independent of the printer's own).
fn hue(colour: &str) -> f64 {
    let c = |i: usize| f64::from(u8::from_str_radix(&colour[i..i + 2], 16).unwrap()) / 255.0;
    let (r, g, b) = (c(1), c(3), c(5));
    let max = r.max(g).max(b);
    let d = max - r.min(g).min(b);
    assert!(d > 0.0, "{colour} is grey");
    let h = if max == r {
        (g - b) / d + if g < b { 6.0 } else { 0.0 }
    } else if max == g {
        (b - r) / d + 2.0
    } else {
        (r - g) / d + 4.0
    };
    h * 60.0
}

fn hue_gap(a: f64, b: f64) -> f64 {
    let d = (a - b).abs() % 360.0;
    d.min(360.0 - d)
}

const SUB_CUSP: &str = "Γ<tspan baseline-shift=\"sub\" font-size=\"70%\">cusp</tspan>";

/// The y axis carries the quantity's symbol, typeset, and nothing else.
#[test]
fn the_y_axis_is_labelled_with_the_quantity() {
    let s = svg(&["cusp", "--g", "0:1", "--points", "6"], "ylabel.svg");
    let line = s.lines().find(|l| l.contains("class=\"y-label\"")).unwrap();
    assert!(line.contains("rotate(-90)"), "{line}");
    let text = &line[line.find('>').unwrap() + 1..line.rfind("</text>").unwrap()];
    assert_eq!(text, SUB_CUSP);
    let s = svg(
        &["Gamma(pi/4) - 4*g^2", "--g", "0:1", "--points", "6"],
        "ylabel2.svg",
    );
    let line = s.lines().find(|l| l.contains("class=\"y-label\"")).unwrap();
    assert!(line.contains(">Γ(π/4) − 4g²</text>"), "{line}");
}

/// Greek letters and superscripts as characters (U+0393, U+03C0, U+03BB,
/// U+00B2, U+2074, U+2212), the ASCII spellings of the coefficient language gone.
#[test]
fn labels_are_typeset() {
    let s = svg(
        &[
            "cusp",
            "Delta(c2=1/3)",
            "--g",
            "0:1",
            "--points",
            "6",
            "--loops",
            "2,4",
        ],
        "typeset.svg",
    );
    for needle in [
        "g² = λ/(16π²)",
        "weak coupling to g⁴ (2 loops)",
        "weak coupling to g⁸ (4 loops)",
        "Δ(cos²α = 1/3)",
        &format!("{SUB_CUSP} = Γ(π/4)"),
    ] {
        assert!(s.contains(needle), "missing {needle}");
    }
    let texts: String = s
        .lines()
        .filter(|l| l.starts_with("<text"))
        .map(|l| &l[l.find('>').unwrap() + 1..l.rfind("</text>").unwrap()])
        .collect();
    for ascii in ["Gamma", "Delta", "lambda", "pi", "^", "g2", "c2"] {
        assert!(!texts.contains(ascii), "{ascii} left in {texts}");
    }
}

/// Every curve of one quantity (finite coupling, truncations, Padé, strong
/// coupling) shares its hue within a few degrees; the quantities' hues lie
/// far apart; the truncations of one quantity still differ from each other.
#[test]
fn each_quantity_keeps_one_colour_family() {
    let s = svg(
        &[
            "cusp", "octagon", "--g", "0:2", "--points", "11", "--loops", "2,4,6", "--pade", "4",
        ],
        "hues.svg",
    );
    let cs = curves(&s);
    assert_eq!(cs.len(), 12, "{cs:?}");
    let family = |q: &str| -> Vec<(String, f64)> {
        cs.iter()
            .filter(|c| c.quantity == q)
            .map(|c| (c.stroke.clone(), hue(&c.stroke)))
            .collect()
    };
    let (cusp, octagon) = (family("0"), family("1"));
    for f in [&cusp, &octagon] {
        for (colour, h) in f.iter() {
            assert!(hue_gap(*h, f[0].1) < 6.0, "{colour} strays from {}", f[0].0);
        }
    }
    assert!(
        hue_gap(cusp[0].1, octagon[0].1) >= 40.0,
        "{cusp:?} {octagon:?}"
    );
    let truncations: Vec<&str> = s
        .lines()
        .filter(|l| l.contains("data-quantity=\"0\" data-kind=\"weak-"))
        .map(|l| &l[l.find(" stroke=").unwrap()..l.find(" d=").unwrap()])
        .collect();
    assert_eq!(truncations.len(), 3);
    assert!(
        truncations[0] != truncations[1]
            && truncations[1] != truncations[2]
            && truncations[0] != truncations[2],
        "{truncations:?}"
    );
}

/// The strong-coupling curve starts at the first grid point at or above the
/// threshold (0.5 unless `--strong-from` says otherwise) and has no point
/// below it. The x axis maps the range 0..2 onto the clip rectangle.
#[test]
fn strong_coupling_starts_at_the_threshold() {
    for (extra, first) in [(vec![], 0.5), (vec!["--strong-from", "1.25"], 1.3)] {
        let mut args = vec!["cusp", "--g", "0:2", "--points", "21", "--loops", "none"];
        args.extend(extra.iter().copied());
        let s = svg(&args, "strong.svg");
        let (left, _, right, _) = clip_rect(&s);
        let g_of = |x: f64| (x - left) / (right - left) * 2.0;
        let strong: Vec<_> = curves(&s)
            .into_iter()
            .filter(|c| c.kind == "strong")
            .collect();
        assert_eq!(strong.len(), 1, "{extra:?}");
        let gs: Vec<f64> = strong[0].points.iter().map(|p| g_of(p.0)).collect();
        assert!(
            (gs[0] - first).abs() < 1e-3,
            "{extra:?}: starts at g = {}",
            gs[0]
        );
        assert!(gs.iter().all(|g| *g >= first - 1e-3), "{extra:?}: {gs:?}");
        let threshold = if extra.is_empty() { "0.5" } else { "1.25" };
        assert!(
            s.contains(&format!("strong coupling, g ≥ {threshold}")),
            "{extra:?}"
        );
    }
}

/// A threshold above the range leaves the curve out with a note; one
/// outside 0 < G <= 200 is refused.
#[test]
fn strong_coupling_threshold_outside_the_range() {
    let (bytes, err) = plot(
        &["cusp", "--g", "0:1", "--points", "6", "--strong-from", "3"],
        "above.svg",
    );
    let s = String::from_utf8(bytes).unwrap();
    assert!(err.contains("strong-coupling curve left out"), "{err}");
    assert!(!s.contains("data-kind=\"strong\""));
    for bad in ["0", "-1", "250", "nan"] {
        let (code, out, err) =
            loopwise(&["plot", "cusp", "--strong-from", bad, "--out", "never.svg"]);
        assert_eq!(code, 2, "{bad}: {err}");
        assert!(out.is_empty());
        assert!(err.contains("0 < G <= 200"), "{bad}: {err}");
    }
    assert!(!std::path::Path::new("never.svg").exists());
}

/// Truncations that run off are cut at the frame: every point of every
/// curve lies inside the clip rectangle, the curves are drawn inside the
/// clip path, and the 6-loop sum (which leaves the frame before g = 2) ends
/// on the frame's edge.
#[test]
fn truncations_are_clipped_at_the_frame() {
    let s = svg(
        &["cusp", "--g", "0:2", "--points", "41", "--loops", "2,6"],
        "clip.svg",
    );
    let (left, top, right, bottom) = clip_rect(&s);
    assert!(s.contains("<g clip-path=\"url(#frame-clip)\""));
    let cs = curves(&s);
    for Drawn { kind, points, .. } in &cs {
        for &(x, y) in points {
            assert!(
                x >= left - 0.005 && x <= right + 0.005 && y >= top - 0.005 && y <= bottom + 0.005,
                "{kind}: ({x}, {y}) outside the frame"
            );
        }
    }
    let six = cs.iter().find(|c| c.kind == "weak-6").unwrap();
    let end = six.points.last().unwrap();
    assert!(
        (end.1 - top).abs() < 0.01 || (end.1 - bottom).abs() < 0.01,
        "the 6-loop sum ends at {end:?}, inside the frame"
    );
    assert!(
        end.0 < right - 1.0,
        "the 6-loop sum reaches g = 2 inside the frame"
    );
}

/// Coordinates are not rounded to whole pixels: most points of the
/// finite-coupling curve have a fractional y.
#[test]
fn coordinates_are_sub_pixel() {
    let s = svg(
        &["cusp", "--g", "0:2", "--points", "41", "--no-strong"],
        "subpixel.svg",
    );
    let finite = curves(&s).into_iter().find(|c| c.kind == "finite").unwrap();
    assert_eq!(finite.points.len(), 41);
    let fractional = finite.points.iter().filter(|p| p.1.fract() != 0.0).count();
    assert!(fractional >= 35, "{fractional} of 41");
}

/// A PDF (by the ending, or by `--format pdf`) is a PDF file (ISO 32000-1
/// section 7.5.2: it starts with %PDF-, and 7.5.5: ends with %%EOF) with
/// the font program embedded (section 9.9: /FontFile2 for TrueType,
/// /FontFile3 for CFF) and named DejaVu (the bundled face, subset-tagged).
#[test]
fn pdf_figures_embed_their_font() {
    for (args, name) in [
        (vec!["cusp", "--g", "0:1", "--points", "6"], "fig.pdf"),
        (
            vec!["cusp", "--g", "0:1", "--points", "6", "--format", "pdf"],
            "fig",
        ),
    ] {
        let (pdf, _) = plot(&args, name);
        assert!(
            pdf.starts_with(b"%PDF-"),
            "{name}: {:?}",
            &pdf[..8.min(pdf.len())]
        );
        let has = |needle: &[u8]| pdf.windows(needle.len()).any(|w| w == needle);
        assert!(
            has(b"/FontFile2") || has(b"/FontFile3"),
            "{name}: no embedded font"
        );
        assert!(has(b"DejaVu"), "{name}: the font is not the bundled one");
        assert!(has(b"/ToUnicode"), "{name}: the text cannot be copied out");
        let tail = String::from_utf8_lossy(&pdf[pdf.len() - 16..]);
        assert!(tail.trim_end().ends_with("%%EOF"), "{name}: {tail}");
    }
    let svg_bytes = plot(
        &["cusp", "--g", "0:1", "--points", "6", "--format", "svg"],
        "plain",
    );
    assert!(svg_bytes.0.starts_with(b"<svg"));
}

/// `--format` contradicting the file's ending is refused, and nothing is written.
#[test]
fn a_format_contradicting_the_ending_is_refused() {
    let path = temp("contradiction.svg");
    let (code, out, err) = loopwise(&[
        "plot",
        "cusp",
        "--format",
        "pdf",
        "--out",
        path.to_str().unwrap(),
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(out.is_empty());
    assert!(err.contains("contradicts the file's ending"), "{err}");
    assert!(!path.exists());
}
