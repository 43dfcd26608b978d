//! Export: SVG, PNG and PDF pictures for print, GeoJSON, GeoPackage and Shapefile for GIS, CSV for
//! spreadsheets.
//!
//! Pure functions over a [`Document`](crate::doc::Document) that return text or bytes; the
//! command line and the editor write them where the user asked. Beside `formats` in the layering:
//! uses `doc`, `colour` and `geo` (for the inverse projection), and nothing above.

pub mod contrast;
pub mod csv;
pub mod geojson;
pub mod gis;
pub mod gpkg;
pub mod insets;
pub mod labels;
pub mod lines;
pub mod pdf;
pub mod png;
pub mod polylabel;
pub mod shp;
pub mod svg;

pub use csv::to_csv;
pub use geojson::to_geojson;
pub use gpkg::to_geopackage;
pub use labels::LabelReport;
pub use pdf::{Orientation, PageSize, PdfOptions, to_pdf};
pub use png::{PngSize, to_png};
pub use shp::to_shapefile;
pub use svg::{MapFrame, SvgExport, SvgOptions, to_svg};

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
    Pdf(PdfOptions),
    GeoJson,
    GeoPackage,
    Shapefile,
    Csv,
}

impl ExportFormat {
    /// The usual file name extension, without the dot.
    pub fn extension(self) -> &'static str {
        match self {
            ExportFormat::Svg => "svg",
            ExportFormat::Png(_) => "png",
            ExportFormat::Pdf(_) => "pdf",
            ExportFormat::GeoJson => "geojson",
            ExportFormat::GeoPackage => "gpkg",
            ExportFormat::Shapefile => "shp",
            ExportFormat::Csv => "csv",
        }
    }

    /// A short name for menus and messages.
    pub fn label(self) -> &'static str {
        match self {
            ExportFormat::Svg => "SVG picture",
            ExportFormat::Png(_) => "PNG picture",
            ExportFormat::Pdf(_) => "PDF for print",
            ExportFormat::GeoJson => "GeoJSON for GIS",
            ExportFormat::GeoPackage => "GeoPackage for GIS",
            ExportFormat::Shapefile => "Shapefile for GIS",
            ExportFormat::Csv => "CSV table",
        }
    }
}

/// The files of one export to `path`: one file, except for a shapefile, which is the `.shp`
/// at `path` with its `.shx`, `.dbf`, `.cpg` and (when the coordinate system is known) `.prj`
/// beside it. `options` matter only to SVG, PNG and PDF. Nothing is written here.
pub fn export_files(
    doc: &crate::doc::Document,
    format: ExportFormat,
    options: &SvgOptions,
    path: &std::path::Path,
) -> Result<Vec<(std::path::PathBuf, Vec<u8>)>, ExportError> {
    export_files_with_report(doc, format, options, path).map(|(files, _)| files)
}

/// The files of one export: where each goes and its bytes.
pub type Files = Vec<(std::path::PathBuf, Vec<u8>)>;

/// [`export_files`], with what label placement did for a picture (`None` for the other formats).
pub fn export_files_with_report(
    doc: &crate::doc::Document,
    format: ExportFormat,
    options: &SvgOptions,
    path: &std::path::Path,
) -> Result<(Files, Option<LabelReport>), ExportError> {
    let files = match format {
        ExportFormat::Svg => {
            let made = svg::render(doc, options)?;
            return Ok((
                vec![(path.to_path_buf(), made.svg.into_bytes())],
                Some(made.labels),
            ));
        }
        ExportFormat::Png(size) => {
            let (bytes, report) = png::to_png_with_report(doc, options, size)?;
            return Ok((vec![(path.to_path_buf(), bytes)], Some(report)));
        }
        ExportFormat::Pdf(paper) => {
            let (bytes, report) = pdf::to_pdf_with_report(doc, options, &paper)?;
            return Ok((vec![(path.to_path_buf(), bytes)], Some(report)));
        }
        ExportFormat::GeoJson => vec![(path.to_path_buf(), to_geojson(doc)?.into_bytes())],
        ExportFormat::Csv => vec![(path.to_path_buf(), to_csv(doc).into_bytes())],
        ExportFormat::GeoPackage => {
            let stem = path
                .file_stem()
                .map(|s| s.to_string_lossy().into_owned())
                .unwrap_or_default();
            vec![(
                path.to_path_buf(),
                to_geopackage(doc, &gpkg::layer_name(&stem))?,
            )]
        }
        ExportFormat::Shapefile => to_shapefile(doc)?
            .into_iter()
            .map(|(extension, bytes)| (path.with_extension(extension), bytes))
            .collect(),
    };
    Ok((files, None))
}
