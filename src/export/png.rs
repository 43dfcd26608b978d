//! PNG export: the SVG export rendered by resvg (pure Rust, on the CPU), so the picture and the
//! vector file always agree. Labels use the Ubuntu Light font embedded in the program (from the
//! `epaint_default_fonts` crate, under the Ubuntu Font Licence), so the result does not depend on
//! which fonts the computer has.

use std::sync::Arc;

use resvg::{tiny_skia, usvg};

use crate::doc::Document;

use super::ExportError;
use super::labels::LabelReport;
use super::svg::{SvgOptions, render_with};

/// The largest width or height we render, in pixels (a 2 m print at 600 dpi is about 47,000).
pub const MAX_SIDE_PX: u64 = 30_000;

/// How big the PNG is.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum PngSize {
    /// The page width in pixels.
    WidthPx(u32),
    /// Dots per inch at the SVG's print size (`width_mm`).
    Dpi(f64),
}

/// The fonts the PNG export renders with: the embedded Ubuntu Light, standing for every generic
/// family.
pub fn font_database() -> usvg::fontdb::Database {
    let mut db = usvg::fontdb::Database::new();
    db.load_font_data(epaint_default_fonts::UBUNTU_LIGHT.to_vec());
    // The SVG asks for the generic family; map it to the one font we carry.
    let family = db
        .faces()
        .next()
        .and_then(|f| f.families.first().map(|(name, _)| name.clone()));
    if let Some(family) = family {
        db.set_sans_serif_family(family.clone());
        db.set_serif_family(family);
    }
    db
}

/// Renders the SVG text to an RGBA pixmap `width_px` wide.
pub fn render_svg(
    svg: &str,
    size: PngSize,
    width_mm: f64,
) -> Result<tiny_skia::Pixmap, ExportError> {
    let options = usvg::Options {
        fontdb: Arc::new(font_database()),
        ..Default::default()
    };
    let tree =
        usvg::Tree::from_str(svg, &options).map_err(|e| ExportError::Render(e.to_string()))?;
    let natural = tree.size();
    let width_px = match size {
        PngSize::WidthPx(w) => f64::from(w),
        PngSize::Dpi(dpi) => {
            if !(dpi.is_finite() && dpi > 0.0) {
                return Err(ExportError::BadOption(format!(
                    "the resolution must be a positive number of dots per inch, not {dpi}"
                )));
            }
            (width_mm / 25.4 * dpi).round()
        }
    };
    let scale = width_px / f64::from(natural.width());
    let height_px = (f64::from(natural.height()) * scale).round();
    if width_px < 1.0
        || height_px < 1.0
        || width_px > MAX_SIDE_PX as f64
        || height_px > MAX_SIDE_PX as f64
    {
        return Err(ExportError::TooLarge {
            width: width_px as u64,
            height: height_px as u64,
            limit: MAX_SIDE_PX,
        });
    }
    let mut pixmap =
        tiny_skia::Pixmap::new(width_px as u32, height_px as u32).ok_or_else(|| {
            ExportError::Render(format!("cannot allocate {width_px} x {height_px} pixels"))
        })?;
    pixmap.fill(tiny_skia::Color::WHITE);
    resvg::render(
        &tree,
        tiny_skia::Transform::from_scale(scale as f32, scale as f32),
        &mut pixmap.as_mut(),
    );
    Ok(pixmap)
}

/// The map as PNG bytes: [`super::svg::to_svg`] with `options`, rendered at `size`.
pub fn to_png(doc: &Document, options: &SvgOptions, size: PngSize) -> Result<Vec<u8>, ExportError> {
    to_png_with_report(doc, options, size).map(|(bytes, _)| bytes)
}

/// [`to_png`], with what label placement did.
pub fn to_png_with_report(
    doc: &Document,
    options: &SvgOptions,
    size: PngSize,
) -> Result<(Vec<u8>, LabelReport), ExportError> {
    // Ubuntu Light has no italic face: slant water names with a skew instead.
    let made = render_with(doc, options, true)?;
    let pixmap = render_svg(&made.svg, size, options.width_mm)?;
    let bytes = pixmap
        .encode_png()
        .map_err(|e| ExportError::Render(e.to_string()))?;
    Ok((bytes, made.labels))
}
