//! `tinct import` and `tinct adjacency`: boundary files (GeoJSON, TopoJSON, Shapefile) in,
//! a project file or an adjacency report out.
//!
//! The JSON printed by `tinct adjacency --json` is stable: later versions add fields, never
//! rename or remove them. Region ids are those `tinct import` gives the regions (1, 2, ... in
//! import order); `source_index` is the 0-based position of the feature in the input file.

use std::path::Path;

use anyhow::anyhow;
use clap::{Args, ValueEnum};
use serde::Serialize;

use super::{CommandResult, OrFail, Outcome};
use crate::geo::{self, BorderKind, ImportOptions, ImportedMap, Rule, Units};

/// Contiguity rule on the command line.
#[derive(Copy, Clone, Debug, PartialEq, Eq, ValueEnum)]
pub enum RuleArg {
    /// A shared boundary of positive length (at least --min-border).
    Rook,
    /// Any shared point, corner contacts included.
    Queen,
}

/// Options shared by `import` and `adjacency`.
#[derive(Args, Debug, Clone)]
pub struct GeoArgs {
    /// Which contacts count as borders.
    #[arg(long, value_enum, default_value = "rook")]
    pub rule: RuleArg,
    /// Boundaries within this distance count as shared (metres for longitude/latitude data,
    /// else map units).
    #[arg(long, default_value_t = 0.0)]
    pub tolerance: f64,
    /// With the rook rule, shared borders shorter than this are left out (same units).
    #[arg(long = "min-border", default_value_t = 0.0)]
    pub min_border: f64,
    /// The property that names a region (default: the first of name, NAME, Name, id, ID).
    #[arg(long = "name-field")]
    pub name_field: Option<String>,
    /// One region per polygon part instead of one per feature (parts share a colour group).
    #[arg(long = "split-parts")]
    pub split_parts: bool,
    /// A second property that tells regions of the same name apart: names given to more than
    /// one region get its value in brackets, as "Shelby (Tennessee)" ("id" means the feature id).
    #[arg(long = "qualify-field", value_name = "FIELD")]
    pub qualify_field: Option<String>,
    /// Where each region's parent unit is written, kept as its attribute "parent" for
    /// `tinct colour --by-parent`: a field, or FIELD:N for its first N characters (as in
    /// hierarchical codes: id:2 gives a US county's state from its FIPS code; "id" means the
    /// feature id).
    #[arg(long = "parent-field", value_name = "FIELD[:N]", value_parser = parse_parent_key)]
    pub parent_field: Option<crate::doc::ParentKey>,
    /// The layer to import: a TopoJSON object (default: the one with the most polygons) or a
    /// GeoPackage feature table (needed when the file has several polygon layers).
    #[arg(long)]
    pub layer: Option<String>,
    /// How to read coordinates: auto (longitude/latitude when the file says so or the values
    /// fit that range), lon-lat, planar (map units, no projection), or planar-down (map units
    /// whose y grows downward, as in screen or pixel coordinates: turned over so north is up).
    #[arg(long, value_enum, default_value = "auto")]
    pub coordinates: CoordinatesArg,
}

/// Coordinate interpretation on the command line.
#[derive(Copy, Clone, Debug, PartialEq, Eq, ValueEnum)]
pub enum CoordinatesArg {
    Auto,
    LonLat,
    Planar,
    PlanarDown,
}

impl GeoArgs {
    pub fn options(&self) -> ImportOptions {
        ImportOptions {
            rule: match self.rule {
                RuleArg::Rook => Rule::Rook,
                RuleArg::Queen => Rule::Queen,
            },
            tolerance: self.tolerance,
            min_border_length: self.min_border,
            name_field: self.name_field.clone(),
            split_parts: self.split_parts,
            layer: self.layer.clone(),
            qualify_field: self.qualify_field.clone(),
            parent_field: self.parent_field.clone(),
            coordinates: match self.coordinates {
                CoordinatesArg::Auto => geo::CoordinateMode::Auto,
                CoordinatesArg::LonLat => geo::CoordinateMode::LonLat,
                CoordinatesArg::Planar => geo::CoordinateMode::Planar,
                CoordinatesArg::PlanarDown => geo::CoordinateMode::PlanarDown,
            },
            ..ImportOptions::default()
        }
    }
}

/// Reads `--parent-field` and `--by-parent` (clap reports the message, exit status 2).
pub fn parse_parent_key(text: &str) -> Result<crate::doc::ParentKey, String> {
    crate::doc::ParentKey::parse(text)
}

/// True for the extensions the geometry importers read.
pub use crate::geo::is_boundary_file;

/// Imports a boundary file, naming the file in the error.
pub fn import(path: &Path, options: &ImportOptions) -> anyhow::Result<ImportedMap> {
    geo::import_path(path, options).map_err(|e| anyhow!("{}: {e}", path.display()))
}

fn title_of(path: &Path) -> String {
    path.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "Untitled".into())
}

/// `tinct import FILE --out PROJECT.tinct`.
pub fn run_import(file: &Path, out: &Path, args: &GeoArgs) -> CommandResult {
    let map = import(file, &args.options()).bad_input()?;
    let mut notes: Vec<String> = map
        .diagnostics
        .iter()
        .map(|d| format!("note: {}", d.message))
        .collect();
    let (regions, borders) = (map.regions.len(), map.borders.len());
    if let Some(projection) = map.projection {
        // Which flat map of the globe the shapes are on: it decides how they look.
        notes.push(format!("projection: {}", projection.name()));
    }
    let document = map.into_document(title_of(file));
    super::save(&document, out)?;
    notes.push(format!(
        "imported {regions} regions and {borders} borders into {}",
        out.display()
    ));
    Ok(Outcome::notes(notes))
}

/// The adjacency report (`tinct adjacency --json` prints exactly this).
#[derive(Serialize)]
pub struct AdjacencyReport {
    /// Version of this JSON shape.
    pub schema: u32,
    pub file: String,
    /// "rook" or "queen".
    pub rule: &'static str,
    /// "metres" (projected longitude/latitude) or "map units".
    pub units: &'static str,
    /// For longitude/latitude data: the projection chosen for it, by name (added within schema 1).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub projection: Option<String>,
    /// The same as a PROJ string (added within schema 1).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub proj: Option<String>,
    pub tolerance: f64,
    pub min_border_length: f64,
    pub regions: Vec<RegionOut>,
    /// The borders the rule selects.
    pub borders: Vec<BorderOut>,
    /// Contacts the rule leaves out (corner contacts under rook, too-short borders).
    pub excluded: Vec<BorderOut>,
    pub diagnostics: Vec<DiagnosticOut>,
}

#[derive(Serialize)]
pub struct RegionOut {
    pub id: u64,
    pub name: String,
    pub source_index: usize,
}

#[derive(Serialize)]
pub struct BorderOut {
    pub a: u64,
    pub b: u64,
    /// "shared" or "corner".
    pub kind: &'static str,
    /// Shared length in `units` (0 for a corner contact).
    pub length: f64,
}

#[derive(Serialize)]
pub struct DiagnosticOut {
    /// For example "gap", "overlap", "self-intersection".
    pub kind: String,
    /// Region ids involved.
    pub regions: Vec<u64>,
    pub message: String,
}

fn kind_word(kind: geo::DiagnosticKind) -> String {
    use geo::DiagnosticKind as K;
    match kind {
        K::SkippedGeometry => "skipped-geometry",
        K::EmptyGeometry => "empty-geometry",
        K::UnclosedRing => "unclosed-ring",
        K::DegenerateRing => "degenerate-ring",
        K::SelfIntersection => "self-intersection",
        K::Overlap => "overlap",
        K::Gap => "gap",
        K::DuplicateName => "duplicate-name",
        K::ShortBorder => "short-border",
        K::File => "file",
    }
    .to_string()
}

/// Builds the report; region ids are 1-based positions, as `tinct import` assigns them.
pub fn report(file: &str, map: &ImportedMap) -> AdjacencyReport {
    let id = |i: usize| i as u64 + 1;
    let border = |b: &geo::ImportedBorder| BorderOut {
        a: id(b.a),
        b: id(b.b),
        kind: match b.kind {
            BorderKind::Shared { .. } => "shared",
            BorderKind::Corner => "corner",
        },
        length: b.length(),
    };
    AdjacencyReport {
        schema: 1,
        file: file.to_string(),
        rule: match map.rule {
            Rule::Rook => "rook",
            Rule::Queen => "queen",
        },
        units: match map.units {
            Units::Metres => "metres",
            Units::MapUnits => "map units",
        },
        projection: map.projection.map(|p| p.name()),
        proj: map.projection.map(|p| p.proj_string()),
        tolerance: map.tolerance,
        min_border_length: map.min_border_length,
        regions: map
            .regions
            .iter()
            .enumerate()
            .map(|(i, r)| RegionOut {
                id: id(i),
                name: r.name.clone(),
                source_index: r.source_index,
            })
            .collect(),
        borders: map.borders.iter().map(border).collect(),
        excluded: map.excluded.iter().map(border).collect(),
        diagnostics: map
            .diagnostics
            .iter()
            .map(|d| DiagnosticOut {
                kind: kind_word(d.kind),
                regions: d.regions.iter().map(|&r| id(r)).collect(),
                message: d.message.clone(),
            })
            .collect(),
    }
}

/// Plain-text rendering of the report.
pub fn render_text(report: &AdjacencyReport) -> String {
    use std::fmt::Write as _;
    let mut out = String::new();
    let name = |id: u64| {
        report
            .regions
            .get(id as usize - 1)
            .map_or("?", |r| r.name.as_str())
    };
    let _ = writeln!(
        out,
        "{}: {} regions, {} borders ({} rule, tolerance {} {}), {} contacts left out",
        report.file,
        report.regions.len(),
        report.borders.len(),
        report.rule,
        report.tolerance,
        report.units,
        report.excluded.len()
    );
    for b in &report.borders {
        let _ = match b.kind {
            "corner" => writeln!(out, "  {} - {}: corner", name(b.a), name(b.b)),
            _ => writeln!(
                out,
                "  {} - {}: shared, {:.1} {}",
                name(b.a),
                name(b.b),
                b.length,
                report.units
            ),
        };
    }
    if let Some(projection) = &report.projection {
        let _ = writeln!(out, "projection: {projection}");
    }
    if !report.diagnostics.is_empty() {
        let _ = writeln!(out, "{} diagnostics:", report.diagnostics.len());
        for d in &report.diagnostics {
            let _ = writeln!(out, "  {}: {}", d.kind, d.message);
        }
    }
    out
}

/// `tinct adjacency FILE [--json]`.
pub fn run_adjacency(file: &Path, json: bool, args: &GeoArgs) -> CommandResult {
    let map = import(file, &args.options()).bad_input()?;
    let report = report(&file.display().to_string(), &map);
    let text = if json {
        serde_json::to_string_pretty(&report).cannot_write()? + "\n"
    } else {
        render_text(&report)
    };
    Ok(Outcome::text(text))
}
