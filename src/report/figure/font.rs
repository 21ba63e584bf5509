//! The one typeface of the figures, bundled so that a figure looks the same
//! everywhere and the PDF can embed it: DejaVu Sans (regular face only, to
//! keep the binary small; license in `LICENSE-DejaVu.txt` beside it). Its
//! advances also lay out the legend, so text never runs into the frame.

use std::sync::OnceLock;

/// The font file, as shipped by the DejaVu project (version 2.37, the file of Debian's fonts-dejavu-core).
pub const DEJAVU_SANS: &[u8] = include_bytes!("DejaVuSans.ttf");

/// The family name the SVG asks for; viewers without it fall back to a sans-serif.
pub const FAMILY: &str = "DejaVu Sans";

/// Advance of a character the face lacks, in ems (about DejaVu's average).
const MISSING_ADVANCE: f64 = 0.6;

struct Metrics {
    face: ttf_parser::Face<'static>,
    units_per_em: f64,
}

fn metrics() -> Option<&'static Metrics> {
    static METRICS: OnceLock<Option<Metrics>> = OnceLock::new();
    METRICS
        .get_or_init(|| {
            let face = ttf_parser::Face::parse(DEJAVU_SANS, 0).ok()?;
            let units_per_em = f64::from(face.units_per_em());
            Some(Metrics { face, units_per_em })
        })
        .as_ref()
}

/// Width of `text` at font size `size` (no kerning: an upper estimate
/// within a few percent, enough for layout).
pub fn advance(text: &str, size: f64) -> f64 {
    let Some(m) = metrics() else {
        return text.chars().count() as f64 * MISSING_ADVANCE * size;
    };
    text.chars()
        .map(|c| {
            m.face
                .glyph_index(c)
                .and_then(|g| m.face.glyph_hor_advance(g))
                .map_or(MISSING_ADVANCE, |a| f64::from(a) / m.units_per_em)
        })
        .sum::<f64>()
        * size
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The bundled face parses and covers the letters the labels use.
    #[test]
    fn the_bundled_face_has_the_label_glyphs() {
        let m = metrics().expect("DejaVu Sans parses");
        for c in "ΓΔαπλζ²⁴⁻−·√≥g".chars() {
            assert!(m.face.glyph_index(c).is_some(), "no glyph for {c}");
        }
        // Digits of a text face are tabular (one width, so columns of
        // numbers align); proportional letters differ.
        let digit = advance("0", 10.0);
        assert!("123456789"
            .chars()
            .all(|c| advance(&c.to_string(), 10.0) == digit));
        assert!(advance("W", 10.0) > 2.0 * advance("i", 10.0));
        assert!(digit > 3.0 && digit < 8.0, "{digit}");
    }
}
