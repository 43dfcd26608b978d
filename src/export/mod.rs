//! Export: SVG and PNG pictures for print, GeoJSON for GIS, CSV for spreadsheets.
//!
//! Pure functions over a [`Document`](crate::doc::Document) that return text or bytes; the
//! command line and the editor write them where the user asked. Beside `formats` in the layering:
//! uses `doc`, `colour` and `geo` (for the inverse projection), and nothing above.

pub mod csv;
pub mod geojson;
pub mod png;
pub mod svg;

pub use csv::to_csv;
pub use geojson::to_geojson;
pub use png::{PngSize, to_png};
pub use svg::{MapFrame, SvgOptions, to_svg};

/// Why an export could not be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ExportError {
    #[error("the map is empty: there is nothing to draw")]
    EmptyMap,
    #[error("{0}")]
    NotGeographic(String),
    #[error("the picture would be {width} x {height} pixels; the limit is {limit} pixels a side")]
    TooLarge { width: u64, height: u64, limit: u64 },
    #[error("{0}")]
    BadOption(String),
    #[error("could not render the picture: {0}")]
    Render(String),
}

/// One export kind, for callers that offer a choice (the editor's Export menu).
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ExportFormat {
    Svg,
    Png(PngSize),
    GeoJson,
    Csv,
}

impl ExportFormat {
    /// The usual file name extension, without the dot.
    pub fn extension(self) -> &'static str {
        match self {
            ExportFormat::Svg => "svg",
            ExportFormat::Png(_) => "png",
            ExportFormat::GeoJson => "geojson",
            ExportFormat::Csv => "csv",
        }
    }

    /// A short name for menus and messages.
    pub fn label(self) -> &'static str {
        match self {
            ExportFormat::Svg => "SVG picture",
            ExportFormat::Png(_) => "PNG picture",
            ExportFormat::GeoJson => "GeoJSON for GIS",
            ExportFormat::Csv => "CSV table",
        }
    }
}

/// The bytes of one export; `options` matter only to SVG and PNG.
pub fn export_bytes(
    doc: &crate::doc::Document,
    format: ExportFormat,
    options: &SvgOptions,
) -> Result<Vec<u8>, ExportError> {
    Ok(match format {
        ExportFormat::Svg => to_svg(doc, options)?.into_bytes(),
        ExportFormat::Png(size) => to_png(doc, options, size)?,
        ExportFormat::GeoJson => to_geojson(doc)?.into_bytes(),
        ExportFormat::Csv => to_csv(doc).into_bytes(),
    })
}
