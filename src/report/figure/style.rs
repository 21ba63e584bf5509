//! How a curve looks: one hue per quantity, and within it a shade, a width
//! and a dash pattern per kind of curve, so that a quantity's curves read
//! as one family and still stay apart (also in greyscale print, where the
//! dash patterns alone tell them apart).

use crate::quantity::curves::CurveKind;

/// Base hues in degrees, one per quantity: blue, red, green, purple,
/// amber, teal; far enough apart (at least 40 degrees) to name at a glance.
pub const HUES: [f64; 6] = [215.0, 0.0, 125.0, 285.0, 40.0, 170.0];

/// The stroke of one curve.
#[derive(Clone, Debug, PartialEq)]
pub struct Stroke {
    /// `#rrggbb`.
    pub colour: String,
    pub width: f64,
    /// An SVG `stroke-dasharray`, or None for a solid line.
    pub dashes: Option<&'static str>,
}

/// The dash patterns of successive weak-coupling truncations (in user units).
const TRUNCATION_DASHES: [&str; 5] = ["9 5", "3 4", "14 4 3 4", "2 7", "18 5"];

/// The hue of the `k`-th quantity.
pub fn hue(k: usize) -> f64 {
    // Past six quantities the hues repeat shifted by half a step, still
    // distinct from their neighbours.
    HUES[k % HUES.len()] + 20.0 * (k / HUES.len()) as f64
}

/// The stroke of a curve of the `k`-th quantity; `rank` numbers its weak-coupling
/// truncations in increasing loop order (0 for the lowest), `truncations` counts them.
pub fn stroke(k: usize, kind: CurveKind, rank: usize, truncations: usize) -> Stroke {
    let h = hue(k);
    match kind {
        CurveKind::Finite => Stroke {
            colour: hsl(h, 0.80, 0.30),
            width: 3.2,
            dashes: None,
        },
        CurveKind::Weak(_) => {
            // Higher orders lie closer to the finite-coupling curve, so they
            // get the lighter shades: the eye follows the darkest lines first.
            let t = if truncations > 1 {
                rank as f64 / (truncations - 1) as f64
            } else {
                0.0
            };
            Stroke {
                colour: hsl(h, 0.75, 0.42 + 0.24 * t),
                width: 2.2,
                dashes: Some(TRUNCATION_DASHES[rank % TRUNCATION_DASHES.len()]),
            }
        }
        CurveKind::Pade(_) => Stroke {
            colour: hsl(h, 0.55, 0.22),
            width: 2.2,
            dashes: Some("12 4 2 4 2 4"),
        },
        CurveKind::Strong { .. } => Stroke {
            colour: hsl(h, 0.90, 0.50),
            width: 2.6,
            dashes: Some("20 6"),
        },
    }
}

/// `#rrggbb` of a colour given by hue (degrees), saturation and lightness in [0, 1].
pub fn hsl(h: f64, s: f64, l: f64) -> String {
    let c = (1.0 - (2.0 * l - 1.0).abs()) * s;
    let hp = h.rem_euclid(360.0) / 60.0;
    let x = c * (1.0 - (hp % 2.0 - 1.0).abs());
    let (r, g, b) = match hp as u32 {
        0 => (c, x, 0.0),
        1 => (x, c, 0.0),
        2 => (0.0, c, x),
        3 => (0.0, x, c),
        4 => (x, 0.0, c),
        _ => (c, 0.0, x),
    };
    let m = l - c / 2.0;
    let byte = |v: f64| ((v + m) * 255.0).round().clamp(0.0, 255.0) as u8;
    format!("#{:02x}{:02x}{:02x}", byte(r), byte(g), byte(b))
}

/// Hue in degrees of a `#rrggbb` colour (None for a grey or a malformed colour).
pub fn hue_of(colour: &str) -> Option<f64> {
    let hex = colour.strip_prefix('#')?;
    if hex.len() != 6 {
        return None;
    }
    let channel = |i: usize| {
        u8::from_str_radix(&hex[i..i + 2], 16)
            .ok()
            .map(|v| f64::from(v) / 255.0)
    };
    let (r, g, b) = (channel(0)?, channel(2)?, channel(4)?);
    let max = r.max(g).max(b);
    let min = r.min(g).min(b);
    let d = max - min;
    if d < 1e-9 {
        return None;
    }
    let h = if max == r {
        60.0 * ((g - b) / d).rem_euclid(6.0)
    } else if max == g {
        60.0 * ((b - r) / d + 2.0)
    } else {
        60.0 * ((r - g) / d + 4.0)
    };
    Some(h)
}

/// Distance of two hues on the colour circle, in degrees.
pub fn hue_distance(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(360.0);
    d.min(360.0 - d)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Reference colours of the CSS Color 4 hsl() definition (its worked
    /// examples: hsl(0 100% 50%) is red, hsl(120 100% 25%) is #008000,
    /// hsl(240 100% 50%) blue).
    #[test]
    fn hsl_matches_the_css_definition() {
        assert_eq!(hsl(0.0, 1.0, 0.5), "#ff0000");
        assert_eq!(hsl(120.0, 1.0, 0.25), "#008000");
        assert_eq!(hsl(240.0, 1.0, 0.5), "#0000ff");
        assert_eq!(hsl(60.0, 1.0, 0.5), "#ffff00");
        assert_eq!(hue_of("#008000"), Some(120.0));
        assert_eq!(hue_of("#808080"), None);
    }

    #[test]
    fn a_quantity_keeps_its_hue_and_its_curves_stay_apart() {
        let kinds = [
            (CurveKind::Finite, 0),
            (CurveKind::Weak(2), 0),
            (CurveKind::Weak(4), 1),
            (CurveKind::Weak(8), 2),
            (CurveKind::Pade(4), 0),
            (CurveKind::Strong { conjecture: false }, 0),
        ];
        for k in 0..HUES.len() {
            let strokes: Vec<Stroke> = kinds
                .iter()
                .map(|(kind, r)| stroke(k, *kind, *r, 3))
                .collect();
            for s in &strokes {
                let h = hue_of(&s.colour).unwrap();
                assert!(
                    hue_distance(h, hue(k)) < 6.0,
                    "{k}: {} has hue {h}",
                    s.colour
                );
            }
            for (i, a) in strokes.iter().enumerate() {
                for b in &strokes[i + 1..] {
                    assert!(a.colour != b.colour || a.dashes != b.dashes, "{a:?} {b:?}");
                }
            }
        }
        for a in 0..HUES.len() {
            for b in a + 1..HUES.len() {
                assert!(hue_distance(hue(a), hue(b)) >= 40.0, "{a} {b}");
            }
        }
    }
}
