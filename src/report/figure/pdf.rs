//! PDF figures: the SVG of a figure converted by svg2pdf (vector paths,
//! text kept as text), with the bundled DejaVu Sans as the only font, so
//! the PDF embeds it (a subset of the glyphs used) and looks the same on
//! every machine whatever fonts it has.

use std::sync::Arc;

use svg2pdf::usvg;

use super::font;

/// The PDF of an SVG figure; the page is the figure's size, 1 px = 1 pt.
pub fn from_svg(svg: &str) -> std::result::Result<Vec<u8>, String> {
    let mut fonts = usvg::fontdb::Database::new();
    fonts.load_font_data(font::DEJAVU_SANS.to_vec());
    // Every family the SVG names (and the generic ones) resolves to the
    // bundled face: no system font can slip in.
    fonts.set_sans_serif_family(font::FAMILY);
    fonts.set_serif_family(font::FAMILY);
    fonts.set_monospace_family(font::FAMILY);
    let options = usvg::Options {
        font_family: font::FAMILY.to_string(),
        fontdb: Arc::new(fonts),
        ..usvg::Options::default()
    };
    let tree = usvg::Tree::from_str(svg, &options).map_err(|e| e.to_string())?;
    svg2pdf::to_pdf(
        &tree,
        svg2pdf::ConversionOptions::default(),
        svg2pdf::PageOptions::default(),
    )
    .map_err(|e| e.to_string())
}
