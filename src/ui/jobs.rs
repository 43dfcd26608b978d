//! What the background jobs of the editor return, and the export job's work.

use std::path::{Path, PathBuf};

use crate::analysis::{self, Analysis};
use crate::doc::Document;

use super::commands::ExportFormat;
use super::state::ExportOptions;

/// Results of background jobs.
pub enum JobResult {
    Loaded {
        path: PathBuf,
        result: Result<Box<(Document, Vec<String>)>, String>,
    },
    Analysed(Box<Analysis>),
    /// A balanced recolouring for a revision.
    Balanced {
        revision: u64,
        verdict: Box<analysis::ColouringVerdict>,
    },
    /// What to drop for one colour fewer, for a revision, or why it was not found.
    Relaxed {
        revision: u64,
        result: Result<Box<super::state::RelaxAnswer>, String>,
    },
    /// A colouring by parent unit for a revision, or why there is none.
    ColouredByParent {
        revision: u64,
        result: Result<Box<analysis::hierarchy::HierarchyOutcome>, String>,
    },
    /// An export written (its size in bytes) or the reason it was not.
    Exported {
        format: ExportFormat,
        path: PathBuf,
        /// The bytes written, and for a picture what label placement did (in one line).
        result: Result<(usize, Option<String>), String>,
    },
    /// The project saved (as of `revision`) to `path`, or why not.
    Saved {
        path: PathBuf,
        revision: u64,
        /// The document as written.
        written: std::sync::Arc<Document>,
        result: Result<(), String>,
    },
    /// Unsaved work written aside as of `revision`, or why not.
    Autosaved {
        revision: u64,
        result: Result<(), String>,
    },
    /// Proof files written to a folder, or why not.
    ProofWritten {
        folder: PathBuf,
        names: Vec<String>,
        result: Result<(), String>,
    },
}

/// A byte count in words a user reads at a glance.
pub fn human_size(bytes: usize) -> String {
    match bytes {
        b if b < 1024 => format!("{b} bytes"),
        b if b < 1024 * 1024 => format!("{:.0} KB", b as f64 / 1024.0),
        b => format!("{:.1} MB", b as f64 / (1024.0 * 1024.0)),
    }
}

/// Makes the files of an export to `path` (run on the worker: a PNG of a large map takes a
/// while); a shapefile is several files beside `path`.
pub fn export_files(
    doc: &Document,
    format: ExportFormat,
    options: &ExportOptions,
    path: &Path,
) -> Result<(crate::export::Files, Option<crate::export::LabelReport>), crate::export::ExportError>
{
    let text = |s: &str| (!s.trim().is_empty()).then(|| s.trim().to_string());
    let svg = crate::export::SvgOptions {
        width_mm: options.width_mm,
        labels: options.labels,
        legend: options.legend,
        legend_heading: options.legend_heading.trim().to_string(),
        title: text(&options.title),
        source: text(&options.source),
        scale_bar: options.scale_bar,
        insets: options.insets,
        label_min_mm: options.name_pt[0] * crate::export::svg::MM_PER_POINT,
        label_max_mm: options.name_pt[1] * crate::export::svg::MM_PER_POINT,
        ..Default::default()
    };
    let format = match format {
        ExportFormat::Svg => crate::export::ExportFormat::Svg,
        ExportFormat::Png => {
            crate::export::ExportFormat::Png(crate::export::PngSize::Dpi(options.dpi as f64))
        }
        ExportFormat::Pdf => crate::export::ExportFormat::Pdf(crate::export::PdfOptions {
            page: options.paper,
            orientation: options.orientation,
            margin_mm: options.margin_mm,
        }),
        ExportFormat::GeoJson => crate::export::ExportFormat::GeoJson,
        ExportFormat::GeoPackage => crate::export::ExportFormat::GeoPackage,
        ExportFormat::Shapefile => crate::export::ExportFormat::Shapefile,
        ExportFormat::Csv => crate::export::ExportFormat::Csv,
    };
    crate::export::export_files_with_report(doc, format, &svg, path)
}
