//! Geometry import: GeoJSON, TopoJSON and Shapefile readers, projection and adjacency derivation.
//!
//! The readers turn a boundary file into an [`ImportedMap`]: one region per feature (or per
//! polygon part with [`ImportOptions::split_parts`]), in projected world units, plus the borders
//! between regions and a list of [`Diagnostic`]s about questionable data. Problems in the data are
//! reported, never fatal; [`ImportError`] means the file cannot be read at all.
//!
//! Pipeline: read (format module) -> choose names -> clean rings (closure, duplicates, degenerate
//! rings) -> project longitude/latitude data ([`project`]) -> split parts if asked -> derive
//! borders ([`adjacency`], or straight from shared arcs for TopoJSON) -> diagnostics.
//!
//! `ImportedMap` is the importers' own result; [`ImportedMap::into_document`] turns it into a
//! project document (every contact recorded, the rule kept in the document's settings).
//!
//! # Rules, tolerance and lengths (user documentation)
//!
//! * **Rook**: two regions border each other when their boundaries share a stretch of positive
//!   length, at least `min_border_length`. **Queen**: any shared point counts; contacts without
//!   shared length are kept as [`BorderKind::Corner`] borders. Contacts a rule leaves out are
//!   kept in [`ImportedMap::excluded`] so a user can bring them back. At a quadripoint rook gives
//!   a 4-cycle and queen a K4.
//! * **Tolerance** (`tolerance`, metres for longitude/latitude data, else map units): boundaries
//!   that run within this distance of each other count as shared even when their vertices
//!   differ (digitising gaps, slivers). Zero means exact, up to rounding (1e-9 of the map's
//!   diagonal).
//! * **Shared length**: the length of boundary lying within the tolerance of the neighbour's,
//!   less the tolerance at both ends of each stretch, averaged over the two regions; contacts
//!   measuring under twice the tolerance (plus 1e-6 of the diagonal) are corner contacts.
//!   For longitude/latitude data lengths are great-circle lengths on the sphere.
//! * **TopoJSON**: borders come from the topology itself: two regions whose rings use the same
//!   arc share its length; regions whose arcs end at a common node touch there. The tolerance
//!   then applies only to the geometric diagnostics (gaps, overlaps).
//! * **Projection**: longitude/latitude data (GeoJSON per RFC 7946; Shapefile with a `GEOGCS`
//!   .prj; otherwise detected from the coordinate range) is projected to metres with an
//!   equal-area projection chosen for the extent of the data's main mass
//!   ([`Projection::choose`]: Equal Earth for the world, Albers for mid-latitude areas wider
//!   east-west, Lambert azimuthal for the rest), so outlying parts do not move its centre; data
//!   crossing the 180-degree meridian stays whole.
//!
//! # Diagnostics
//!
//! Each [`Diagnostic`] names the regions involved: skipped non-polygon geometries, empty
//! geometries, unclosed rings (closed), degenerate rings (dropped), self-intersecting rings,
//! overlaps deeper than the tolerance, gaps (regions within the gap band, by default three times
//! the tolerance or 1e-4 of the diagonal, that do not touch), duplicate names, and borders
//! shorter than the minimum length. Errors ([`ImportError`]) only when the file cannot be read:
//! not JSON or truncated, not GeoJSON/TopoJSON, an unreadable shapefile, a missing name field
//! (the error lists the available fields) or TopoJSON object.
//!
//! Overlaps are found three ways: boundaries that cross with a vertex deeper than the tolerance
//! inside the other region; two exterior outlines lying wholly along each other (a duplicate);
//! and a region inside another without touching its boundary. Limitation: gaps are reported
//! only for regions that do not touch at all, not for a gap along part of a shared border.

pub mod adjacency;
pub mod document;
mod fgb;
mod geojson;
mod gpkg;
pub mod project;
mod rings;
mod shp;
mod topojson;

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

pub use crate::projection::{MainMass, Projection, outlying_parts};
pub use adjacency::{AdjacencyOptions, Derived, derive_borders, derive_contacts};

/// A position in world units (`[x, y]`), or `[longitude, latitude]` in degrees before projection.
pub type Point = [f64; 2];

/// A ring. As read from a file it may repeat its first position at the end; once cleaned (in
/// every [`ImportedMap`]) it is open, as everywhere in Tinct (see [`crate::geometry`]).
pub type Ring = Vec<Point>;

/// A polygon with one exterior ring and any number of holes.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Polygon {
    pub exterior: Ring,
    pub holes: Vec<Ring>,
}

/// A multi-part region: the parts share one colour.
pub type MultiPolygon = Vec<Polygon>;

/// One region of an imported map.
#[derive(Clone, Debug, PartialEq)]
pub struct ImportedRegion {
    /// 0-based position of the feature (or shape record, or TopoJSON geometry) in the input file.
    pub source_index: usize,
    /// The region's name, from the name field; `"#<source_index>"` when the feature has no value.
    pub name: String,
    /// The geometry in projected world units (see [`ImportedMap::units`]). May be empty when the
    /// feature had no usable geometry (an [`DiagnosticKind::EmptyGeometry`] says so).
    pub parts: MultiPolygon,
    /// The feature's properties (Shapefile: the .dbf record), for display and export.
    pub properties: Properties,
    /// Where a region without usable geometry stands: the mean of the positions the file gave it
    /// (projected like the rest), when its rings were all degenerate. `None` otherwise (a region
    /// with parts is placed inside its largest part).
    pub position: Option<Point>,
}

/// A feature's properties, names to JSON values in name order. A sorted vector rather than a
/// tree: a million features with a handful of properties each would otherwise cost a million
/// tree nodes of several hundred bytes.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Properties(Vec<(String, serde_json::Value)>);

impl Properties {
    pub fn new() -> Properties {
        Properties(Vec::new())
    }
    /// Sets `name` to `value` (a name given twice keeps its last value, as JSON readers do).
    pub fn insert(&mut self, name: String, value: serde_json::Value) {
        match self.0.binary_search_by(|(k, _)| k.as_str().cmp(&name)) {
            Ok(i) => self.0[i].1 = value,
            Err(i) => self.0.insert(i, (name, value)),
        }
    }
    pub fn get(&self, name: &str) -> Option<&serde_json::Value> {
        self.0
            .binary_search_by(|(k, _)| k.as_str().cmp(name))
            .ok()
            .map(|i| &self.0[i].1)
    }
    pub fn contains_key(&self, name: &str) -> bool {
        self.get(name).is_some()
    }
    pub fn keys(&self) -> impl Iterator<Item = &String> {
        self.0.iter().map(|(k, _)| k)
    }
    pub fn iter(&self) -> impl Iterator<Item = (&String, &serde_json::Value)> {
        self.0.iter().map(|(k, v)| (k, v))
    }
    pub fn len(&self) -> usize {
        self.0.len()
    }
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
}

impl IntoIterator for Properties {
    type Item = (String, serde_json::Value);
    type IntoIter = std::vec::IntoIter<(String, serde_json::Value)>;
    /// The properties by name, consumed.
    fn into_iter(self) -> Self::IntoIter {
        self.0.into_iter()
    }
}

impl FromIterator<(String, serde_json::Value)> for Properties {
    fn from_iter<I: IntoIterator<Item = (String, serde_json::Value)>>(iter: I) -> Properties {
        let mut out = Properties::new();
        for (k, v) in iter {
            out.insert(k, v);
        }
        out
    }
}

/// How two regions touch.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum BorderKind {
    /// A shared boundary of positive length, in world units.
    Shared { length: f64 },
    /// The regions touch only at points (corner contact, such as a quadripoint).
    Corner,
}

/// A border between regions `a < b` (indices into [`ImportedMap::regions`]).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ImportedBorder {
    pub a: usize,
    pub b: usize,
    pub kind: BorderKind,
}

impl ImportedBorder {
    /// Shared length in world units; zero for a corner contact.
    pub fn length(&self) -> f64 {
        match self.kind {
            BorderKind::Shared { length } => length,
            BorderKind::Corner => 0.0,
        }
    }
}

/// What kind of questionable data a diagnostic reports.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum DiagnosticKind {
    /// A feature with a geometry that is not a polygon (point, line) was skipped.
    SkippedGeometry,
    /// A feature had no geometry or only degenerate rings.
    EmptyGeometry,
    /// A ring whose last position differs from its first; it was closed.
    UnclosedRing,
    /// A ring with fewer than three distinct positions; it was dropped.
    DegenerateRing,
    /// A ring crosses or touches itself.
    SelfIntersection,
    /// Two regions overlap by more than the tolerance.
    Overlap,
    /// Two regions come close (within the gap band) but do not touch within the tolerance.
    Gap,
    /// Several regions carry the same name.
    DuplicateName,
    /// A shared border shorter than the minimum length was left out by the rook rule.
    ShortBorder,
    /// Something about the file as a whole (a coordinate system assumption, an unknown member).
    File,
}

/// Questionable data found during import; names the regions involved.
#[derive(Clone, Debug, PartialEq)]
pub struct Diagnostic {
    pub kind: DiagnosticKind,
    /// Indices into [`ImportedMap::regions`], sorted.
    pub regions: Vec<usize>,
    pub message: String,
}

/// Units of the world coordinates.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Units {
    /// Longitude/latitude input projected to metres (Lambert azimuthal equal-area).
    Metres,
    /// Planar input kept in its own units.
    MapUnits,
}

/// The result of an import.
#[derive(Clone, Debug, PartialEq)]
pub struct ImportedMap {
    pub regions: Vec<ImportedRegion>,
    /// The borders the rule selects, sorted by `(a, b)`.
    pub borders: Vec<ImportedBorder>,
    /// Contacts the rule leaves out (corner contacts under rook, shared borders shorter than the
    /// minimum length), sorted by `(a, b)`, so that a user can include them again.
    pub excluded: Vec<ImportedBorder>,
    /// The options the borders were derived with.
    pub rule: Rule,
    pub tolerance: f64,
    pub min_border_length: f64,
    /// Sorted by kind, then regions, then message.
    pub diagnostics: Vec<Diagnostic>,
    pub units: Units,
    /// The projection used for longitude/latitude input (`None` for planar data).
    pub projection: Option<Projection>,
    /// The coordinate system of planar data, when the file names one (a GeoPackage layer's
    /// spatial reference, a shapefile's `.prj`); exports write it back.
    pub crs: Option<Crs>,
}

/// A coordinate reference system as a file names it (the document keeps it).
pub use crate::doc::Crs;

/// Which contacts count as borders.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum Rule {
    /// Shared boundary of positive length, at least [`ImportOptions::min_border_length`].
    #[default]
    Rook,
    /// Any shared point; corner contacts become [`BorderKind::Corner`] borders.
    Queen,
}

/// How to read coordinates.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
pub enum CoordinateMode {
    /// Longitude/latitude when the file says so (GeoJSON per RFC 7946, a .prj with `GEOGCS`) or,
    /// failing that, when every coordinate lies within the longitude/latitude range.
    #[default]
    Auto,
    LonLat,
    Planar,
    /// Planar, with y growing downward (screen or pixel coordinates, as in maps projected for a
    /// web page, such as us-atlas's `*-albers-10m.json`): y is turned over at import, so north
    /// stays up.
    PlanarDown,
}

/// Options for [`import_path`].
#[derive(Clone, Debug, PartialEq)]
pub struct ImportOptions {
    pub rule: Rule,
    /// Boundaries within this distance count as shared (world units: metres for lon/lat data).
    pub tolerance: f64,
    /// The rook rule drops shared borders shorter than this (world units).
    pub min_border_length: f64,
    /// The property naming a region; default: the first of `name`, `NAME`, `Name`, `id`, `ID`
    /// present in the file, else the feature id, else `#<index>`.
    pub name_field: Option<String>,
    /// One region per polygon part instead of one per feature.
    pub split_parts: bool,
    /// The layer to import: a TopoJSON object (default: the one with the most polygon
    /// geometries) or a GeoPackage feature table (default: the only polygon layer).
    pub layer: Option<String>,
    pub coordinates: CoordinateMode,
    /// Regions closer than this but not within the tolerance get a [`DiagnosticKind::Gap`];
    /// default (`None`): three times the tolerance, at least 1e-4 of the map's diagonal.
    pub gap_width: Option<f64>,
    /// A second property that tells regions of the same name apart: names given to more than
    /// one region get its value in brackets ("Shelby (Tennessee)"). `"id"` falls back to the
    /// feature id when no property has that name.
    pub qualify_field: Option<String>,
    /// Where each feature's parent unit is written (a field, or its leading characters; `"id"`
    /// falls back to the feature id): kept as the region's attribute `parent`
    /// ([`crate::doc::PARENT_ATTRIBUTE`]), for colours that follow a hierarchy.
    pub parent_field: Option<crate::doc::ParentKey>,
}

impl Default for ImportOptions {
    fn default() -> Self {
        Self {
            rule: Rule::Rook,
            tolerance: 0.0,
            min_border_length: 0.0,
            name_field: None,
            split_parts: false,
            layer: None,
            coordinates: CoordinateMode::Auto,
            gap_width: None,
            qualify_field: None,
            parent_field: None,
        }
    }
}

/// Why a file could not be imported at all.
#[derive(Debug, thiserror::Error)]
pub enum ImportError {
    #[error("cannot read {path}: {source}")]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    #[error(
        "cannot tell the format of {path}: expected .geojson, .json, .topojson, .shp, .gpkg or .fgb"
    )]
    UnknownFormat { path: PathBuf },
    #[error("not valid JSON at line {line}, column {column}: {message}")]
    Json {
        line: usize,
        column: usize,
        message: String,
    },
    #[error("not a GeoJSON or TopoJSON document: {reason}")]
    NotGeoJson { reason: String },
    #[error("invalid TopoJSON: {reason}")]
    Topology { reason: String },
    #[error("invalid Shapefile: {reason}")]
    Shapefile { reason: String },
    #[error("invalid GeoPackage: {reason}")]
    GeoPackage { reason: String },
    #[error("invalid FlatGeobuf: {reason}")]
    FlatGeobuf { reason: String },
    #[error("no property {field:?} names the regions; available fields: {}", available.join(", "))]
    MissingNameField {
        field: String,
        available: Vec<String>,
    },
    #[error("no property {field:?} holds the parent units; available fields: {}", available.join(", "))]
    MissingParentField {
        field: String,
        available: Vec<String>,
    },
    #[error("no property {field:?} is there to tell regions of the same name apart; available fields: {}", available.join(", "))]
    MissingQualifyField {
        field: String,
        available: Vec<String>,
    },
    #[error("layer {layer:?} not found; the file's layers: {}", available.join(", "))]
    MissingLayer {
        layer: String,
        available: Vec<String>,
    },
}

/// Input formats.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Format {
    GeoJson,
    TopoJson,
    Shapefile,
    GeoPackage,
    FlatGeobuf,
}

/// A feature as read, before names, projection and adjacency.
#[derive(Clone, Debug, Default)]
struct RawFeature {
    source_index: usize,
    /// Feature id (GeoJSON `id`, TopoJSON geometry `id`), used when no name field exists.
    id: Option<String>,
    properties: Properties,
    parts: MultiPolygon,
    /// TopoJSON only: per part, the arc indices (non-negative) its rings use.
    part_arcs: Vec<Vec<usize>>,
    /// The geometry was missing or null.
    geometry_missing: bool,
}

/// What a reader hands on.
#[derive(Debug, Default)]
struct RawMap {
    features: Vec<RawFeature>,
    diagnostics: Vec<Diagnostic>,
    /// Field names in file order (dbf) or first-seen order (JSON), for the name-field error.
    field_names: Vec<String>,
    /// The reader knows the coordinates are longitude/latitude (`Some(true)`) or planar.
    lon_lat_hint: Option<bool>,
    /// TopoJSON: the decoded arcs in input coordinates.
    arcs: Option<Vec<Vec<Point>>>,
    /// A streamed FeatureCollection whose `features` member was not an array.
    not_an_array: bool,
    /// The coordinate system of planar data, when the file names one.
    crs: Option<Crs>,
}

/// The extensions of the boundary files Tinct imports (lower case, without the dot).
pub const BOUNDARY_EXTENSIONS: [&str; 6] = ["geojson", "json", "topojson", "shp", "gpkg", "fgb"];

/// True when `path` has one of [`BOUNDARY_EXTENSIONS`] (in any case).
pub fn is_boundary_file(path: &Path) -> bool {
    path.extension()
        .map(|e| e.to_string_lossy().to_ascii_lowercase())
        .is_some_and(|e| BOUNDARY_EXTENSIONS.contains(&e.as_str()))
}

impl RawMap {
    /// Records what a file says of its coordinate system: whether it is longitude/latitude
    /// (unless the user chose how to read coordinates), and a planar system itself.
    fn note_coordinate_system(&mut self, mode: CoordinateMode, crs: Crs) {
        let geographic = crs.is_geographic();
        if mode == CoordinateMode::Auto {
            self.lon_lat_hint = geographic;
        }
        if geographic == Some(false) {
            self.crs = Some(crs);
        }
    }
}

/// Reads and imports a boundary file; the format comes from the extension (and, for `.json`,
/// from the document's `type`).
pub fn import_path(path: &Path, options: &ImportOptions) -> Result<ImportedMap, ImportError> {
    let ext = path
        .extension()
        .and_then(|e| e.to_str())
        .map(|e| e.to_ascii_lowercase())
        .unwrap_or_default();
    match ext.as_str() {
        "shp" => {
            let raw = shp::read_path(path, options.coordinates)?;
            finish(raw, options)
        }
        "gpkg" => {
            let raw = gpkg::read_path(path, options.layer.as_deref(), options.coordinates)?;
            finish(raw, options)
        }
        "fgb" => {
            let raw = fgb::read_path(path, options.coordinates)?;
            finish(raw, options)
        }
        "geojson" | "json" | "topojson" => {
            // Read through a buffer, never whole: on a large map the file's text would be a
            // good part of the peak memory.
            let file = std::fs::File::open(path).map_err(|source| ImportError::Io {
                path: path.to_path_buf(),
                source,
            })?;
            let reader = std::io::BufReader::with_capacity(1 << 20, file);
            let streamed = geojson::read_streaming_from(reader).map_err(|e| {
                if e.is_io() {
                    ImportError::Io {
                        path: path.to_path_buf(),
                        source: e.into(),
                    }
                } else {
                    json_error(e)
                }
            })?;
            import_streamed(streamed, options)
        }
        _ => Err(ImportError::UnknownFormat {
            path: path.to_path_buf(),
        }),
    }
}

/// Imports a GeoJSON or TopoJSON document held in memory (the `type` member decides).
pub fn import_json(bytes: &[u8], options: &ImportOptions) -> Result<ImportedMap, ImportError> {
    import_streamed(parse_streaming(bytes)?, options)
}

/// Reads JSON, streaming a FeatureCollection's features (see [`geojson::read_streaming`]).
fn parse_streaming(bytes: &[u8]) -> Result<geojson::Streamed, ImportError> {
    geojson::read_streaming(bytes).map_err(json_error)
}

fn import_streamed(
    streamed: geojson::Streamed,
    options: &ImportOptions,
) -> Result<ImportedMap, ImportError> {
    match streamed {
        geojson::Streamed::Features(raw) if raw.not_an_array => Err(ImportError::NotGeoJson {
            reason: "a FeatureCollection needs a \"features\" array".to_string(),
        }),
        geojson::Streamed::Features(raw) => finish(raw, options),
        geojson::Streamed::Whole(value) => import_value(value, options),
    }
}

fn json_error(e: serde_json::Error) -> ImportError {
    // serde_json's text ends with " at line L column C"; the error says where already.
    let text = e.to_string();
    let message = match text.rsplit_once(" at line ") {
        Some((head, _)) => head.to_string(),
        None => text,
    };
    ImportError::Json {
        line: e.line(),
        // serde_json counts a position just after a line break as column 0.
        column: e.column().max(1),
        message,
    }
}

fn import_value(
    value: serde_json::Value,
    options: &ImportOptions,
) -> Result<ImportedMap, ImportError> {
    let raw = if value.get("type").and_then(|t| t.as_str()) == Some("Topology") {
        topojson::read_value(&value, options.layer.as_deref())?
    } else {
        geojson::read_value(&value)?
    };
    // The JSON tree is several times the size of the file; the features have what they need.
    drop(value);
    finish(raw, options)
}

/// Imports a shapefile held in memory: the `.shp` bytes, and the `.dbf` (names and attributes)
/// and `.prj` (coordinate system) when there are any. Errors call the files `name.shp` and
/// `name.dbf`. Counts declared in either file are checked against the bytes actually present
/// before anything is allocated for them.
pub fn import_shapefile_bytes(
    name: &str,
    shp: &[u8],
    dbf: Option<&[u8]>,
    prj: Option<&[u8]>,
    options: &ImportOptions,
) -> Result<ImportedMap, ImportError> {
    let files = shp::Files {
        shp,
        dbf,
        prj,
        shp_label: format!("{name}.shp"),
        dbf_label: format!("{name}.dbf"),
    };
    let raw = shp::read_files(&files, options.coordinates)?;
    finish(raw, options)
}

/// Imports one layer of a GeoPackage held in memory (`options.layer` picks it when there are
/// several polygon layers).
pub fn import_geopackage_bytes(
    bytes: &[u8],
    options: &ImportOptions,
) -> Result<ImportedMap, ImportError> {
    let raw = gpkg::read_bytes(bytes, options.layer.as_deref(), options.coordinates)?;
    finish(raw, options)
}

/// Imports a FlatGeobuf file held in memory.
pub fn import_flatgeobuf_bytes(
    bytes: &[u8],
    options: &ImportOptions,
) -> Result<ImportedMap, ImportError> {
    finish(fgb::read_bytes(bytes, options.coordinates)?, options)
}

/// Detects the format of an in-memory document or file name (for callers that need to say which).
pub fn format_of(path: &Path, bytes: Option<&[u8]>) -> Option<Format> {
    let ext = path.extension()?.to_str()?.to_ascii_lowercase();
    match ext.as_str() {
        "shp" => Some(Format::Shapefile),
        "gpkg" => Some(Format::GeoPackage),
        "fgb" => Some(Format::FlatGeobuf),
        "topojson" => Some(Format::TopoJson),
        "geojson" => Some(Format::GeoJson),
        "json" => {
            let text = bytes.map(|b| String::from_utf8_lossy(&b[..b.len().min(4096)]).into_owned());
            match text {
                Some(t) if t.contains("\"Topology\"") => Some(Format::TopoJson),
                _ => Some(Format::GeoJson),
            }
        }
        _ => None,
    }
}

/// Names, ring cleaning, projection, part splitting, borders and diagnostics.
fn finish(mut raw: RawMap, options: &ImportOptions) -> Result<ImportedMap, ImportError> {
    let mut names = choose_names(&raw, options.name_field.as_deref())?;
    if let Some(field) = options.qualify_field.as_deref() {
        qualify_names(&raw, &mut names, field)?;
    }
    if let Some(key) = &options.parent_field {
        set_parents(&mut raw, key)?;
    }
    let mut diagnostics = std::mem::take(&mut raw.diagnostics);

    // Where each feature's positions lie on average, for a feature whose rings are all dropped:
    // it is placed there rather than at the map's origin.
    let mut raw_points: Vec<Option<Point>> = raw
        .features
        .iter()
        .map(|feature| {
            let (mut sum, mut n) = ([0.0, 0.0], 0usize);
            for p in feature
                .parts
                .iter()
                .flat_map(|p| std::iter::once(&p.exterior).chain(&p.holes))
                .flatten()
                .filter(|p| p[0].is_finite() && p[1].is_finite())
            {
                sum = [sum[0] + p[0], sum[1] + p[1]];
                n += 1;
            }
            (n > 0).then(|| [sum[0] / n as f64, sum[1] / n as f64])
        })
        .collect();

    // Clean rings first, in input coordinates, so that the projection sees valid rings.
    let mut cleaned: Vec<(MultiPolygon, Vec<Vec<usize>>, Vec<rings::RingProblem>)> = Vec::new();
    for feature in &mut raw.features {
        let parts = std::mem::take(&mut feature.parts);
        let arcs = std::mem::take(&mut feature.part_arcs);
        let (parts, arcs, problems) = rings::clean_parts(parts, arcs);
        cleaned.push((parts, arcs, problems));
    }

    // Decide on longitude/latitude and project.
    let lon_lat = match options.coordinates {
        CoordinateMode::LonLat => true,
        CoordinateMode::Planar | CoordinateMode::PlanarDown => false,
        CoordinateMode::Auto => raw.lon_lat_hint.unwrap_or_else(|| {
            let mut all = cleaned
                .iter()
                .flat_map(|(p, _, _)| all_points(p))
                .peekable();
            if all.peek().is_some() {
                project::looks_like_lon_lat(all)
            } else {
                // No outline is left, only markers: decide by where their positions lie.
                let mut markers = raw_points.iter().flatten().copied().peekable();
                markers.peek().is_some() && project::looks_like_lon_lat(markers)
            }
        }),
    };
    let projection = if lon_lat {
        // Chosen for the outlines; when no feature has one left, for where the features' positions
        // lie on average (they become markers there).
        let outlines: Vec<&[Point]> = cleaned
            .iter()
            .flat_map(|(parts, _, _)| parts.iter().map(|p| p.exterior.as_slice()))
            .collect();
        Projection::choose(&outlines).or_else(|| {
            let positions: Vec<[Point; 1]> = raw_points.iter().flatten().map(|p| [*p]).collect();
            Projection::choose(&positions)
        })
    } else {
        None
    };
    // Screen coordinates: y turned over so that north is up (rings reversed to keep their turn).
    if options.coordinates == CoordinateMode::PlanarDown {
        let flip = |ring: &mut Ring| {
            for p in ring.iter_mut() {
                p[1] = -p[1];
            }
            ring.reverse();
        };
        for (parts, _, _) in &mut cleaned {
            for polygon in parts.iter_mut() {
                flip(&mut polygon.exterior);
                polygon.holes.iter_mut().for_each(flip);
            }
        }
        if let Some(arcs) = &mut raw.arcs {
            for arc in arcs.iter_mut() {
                for p in arc.iter_mut() {
                    p[1] = -p[1];
                }
            }
        }
        for point in raw_points.iter_mut().flatten() {
            point[1] = -point[1];
        }
    }
    // On a world map, rings across its edge are cut there (see `projection::split_at_edge`).
    if let Some(Projection::EqualEarth { lon0 }) = projection {
        for (parts, arcs, _) in &mut cleaned {
            cut_at_edge(parts, arcs, lon0);
        }
    }
    if let Some(proj) = &projection {
        for (parts, _, _) in &mut cleaned {
            for polygon in parts.iter_mut() {
                project_open_ring(proj, &mut polygon.exterior);
                for hole in &mut polygon.holes {
                    project_open_ring(proj, hole);
                }
            }
        }
        if let Some(arcs) = &mut raw.arcs {
            for arc in arcs.iter_mut() {
                proj.project_ring(arc);
            }
        }
        for point in raw_points.iter_mut().flatten() {
            *point = proj.project(*point);
        }
    }
    let units = if projection.is_some() {
        Units::Metres
    } else {
        Units::MapUnits
    };

    // A field that would tell apart the features that share a name, for the duplicate-name note.
    let separating = if options.qualify_field.is_none() {
        separating_field(&raw, &names)
    } else {
        None
    };

    // Build regions (splitting parts if asked), remembering each region's arcs.
    // The features are consumed as the regions are built, so the two never both hold a
    // million property lists; the lists are trimmed to their length (a vector grown one
    // property at a time keeps room for four).
    let features = std::mem::take(&mut raw.features);
    let mut regions = Vec::with_capacity(features.len());
    let mut region_arcs: Vec<Vec<usize>> = Vec::new();
    let mut ring_problems: Vec<(usize, rings::RingProblem)> = Vec::new();
    let mut empty: Vec<usize> = Vec::new();
    for (((mut feature, name), (parts, arcs, problems)), raw_point) in
        features.into_iter().zip(names).zip(cleaned).zip(raw_points)
    {
        feature.properties.0.shrink_to_fit();
        let first_region = regions.len();
        if options.split_parts && parts.len() > 1 {
            for (k, (polygon, arcs)) in parts.into_iter().zip(arcs_or_empty(arcs)).enumerate() {
                regions.push(ImportedRegion {
                    source_index: feature.source_index,
                    name: format!("{name} ({})", k + 1),
                    parts: vec![polygon],
                    properties: feature.properties.clone(),
                    position: None,
                });
                if raw.arcs.is_some() {
                    region_arcs.push(arcs);
                }
            }
        } else {
            let all_arcs: Vec<usize> = arcs.into_iter().flatten().collect();
            if parts.is_empty() {
                empty.push(first_region);
            }
            let position = if parts.is_empty() { raw_point } else { None };
            regions.push(ImportedRegion {
                source_index: feature.source_index,
                name,
                parts,
                properties: std::mem::take(&mut feature.properties),
                position,
            });
            if raw.arcs.is_some() {
                region_arcs.push(all_arcs);
            }
        }
        for problem in problems {
            ring_problems.push((first_region, problem));
        }
    }

    for (region, problem) in ring_problems {
        diagnostics.push(problem.into_diagnostic(region, &regions[region].name));
    }
    for region in empty {
        diagnostics.push(Diagnostic {
            kind: DiagnosticKind::EmptyGeometry,
            regions: vec![region],
            message: format!(
                "region {:?} (feature {}) has no polygon geometry; it is kept without a shape{}",
                regions[region].name,
                regions[region].source_index,
                if regions[region].position.is_some() {
                    ", as a marker where its positions lie"
                } else {
                    ""
                }
            ),
        });
    }
    diagnostics.extend(duplicate_names(&regions, &separating));

    let adjacency = AdjacencyOptions {
        rule: options.rule,
        tolerance: options.tolerance,
        min_border_length: options.min_border_length,
        gap_width: options.gap_width,
        lengths_on_sphere: projection,
    };
    let derived = match &raw.arcs {
        Some(arcs) => topojson::borders_from_arcs(&regions, &region_arcs, arcs, &adjacency),
        None => derive_contacts(&regions, &adjacency),
    };
    diagnostics.extend(derived.diagnostics);
    sort_diagnostics(&mut diagnostics);

    Ok(ImportedMap {
        regions,
        borders: derived.borders,
        excluded: derived.excluded,
        rule: options.rule,
        tolerance: options.tolerance,
        min_border_length: options.min_border_length,
        diagnostics,
        units,
        projection,
        crs: if projection.is_none() { raw.crs } else { None },
    })
}

/// Projects a cleaned (open) ring and keeps it open: positions that differ in longitude/latitude
/// but are one place on the globe (180 and -180 degrees on the same parallel, as data cut at the
/// 180-degree meridian has them) project to one point, so repeats are dropped.
/// Cuts the parts of one feature that cross the edge of a world map centred on `lon0` into
/// pieces on either side; each piece keeps its part's arcs (for borders), and a hole goes with
/// the piece on its side.
fn cut_at_edge(parts: &mut MultiPolygon, arcs: &mut Vec<Vec<usize>>, lon0: f64) {
    let aligned = arcs.len() == parts.len();
    let mut new_parts = Vec::with_capacity(parts.len());
    let mut new_arcs = Vec::with_capacity(arcs.len());
    for (i, polygon) in std::mem::take(parts).into_iter().enumerate() {
        let pieces: Vec<Ring> = crate::projection::split_at_edge(&polygon.exterior, lon0)
            .into_iter()
            .filter(|p| p.len() >= 3 && crate::geometry::signed_area(p) != 0.0)
            .collect();
        if pieces.len() <= 1 {
            // Unchanged, or a ring round a pole now closed along the pole.
            let mut polygon = polygon;
            if let Some(piece) = pieces.into_iter().next() {
                polygon.exterior = piece;
            }
            new_parts.push(polygon);
            if aligned {
                new_arcs.push(arcs[i].clone());
            }
            continue;
        }
        // Which side of the edge a ring lies on: the sign of its mean offset.
        let side = |ring: &[Point]| {
            ring.iter()
                .map(|p| crate::projection::normalise_lon(p[0] - lon0))
                .sum::<f64>()
                >= 0.0
        };
        let sides: Vec<bool> = pieces.iter().map(|p| side(p)).collect();
        let mut holes: Vec<Vec<Ring>> = vec![Vec::new(); pieces.len()];
        for hole in polygon.holes {
            let k = sides.iter().position(|&s| s == side(&hole)).unwrap_or(0);
            holes[k].push(hole);
        }
        for (piece, holes) in pieces.into_iter().zip(holes) {
            new_parts.push(Polygon {
                exterior: piece,
                holes,
            });
            if aligned {
                new_arcs.push(arcs[i].clone());
            }
        }
    }
    *parts = new_parts;
    if aligned {
        *arcs = new_arcs;
    }
}

fn project_open_ring(projection: &Projection, ring: &mut Ring) {
    projection.project_ring(ring);
    ring.dedup();
    while ring.len() > 1 && ring.first() == ring.last() {
        ring.pop();
    }
}

fn arcs_or_empty(arcs: Vec<Vec<usize>>) -> impl Iterator<Item = Vec<usize>> {
    arcs.into_iter().chain(std::iter::repeat_with(Vec::new))
}

fn all_points(parts: &MultiPolygon) -> impl Iterator<Item = Point> + '_ {
    parts
        .iter()
        .flat_map(|p| p.exterior.iter().chain(p.holes.iter().flatten()).copied())
}

/// Name fields tried in order when none is given (common practice in boundary datasets).
const DEFAULT_NAME_FIELDS: [&str; 5] = ["name", "NAME", "Name", "id", "ID"];

fn choose_names(raw: &RawMap, field: Option<&str>) -> Result<Vec<String>, ImportError> {
    let has_field = |f: &str| {
        raw.field_names.iter().any(|n| n == f)
            || raw.features.iter().any(|x| x.properties.contains_key(f))
    };
    let field = match field {
        Some(f) => {
            if !has_field(f) {
                let available = available_fields(raw, "(feature id: leave the name field unset)");
                return Err(ImportError::MissingNameField {
                    field: f.to_string(),
                    available,
                });
            }
            Some(f.to_string())
        }
        None => DEFAULT_NAME_FIELDS
            .iter()
            .find(|f| has_field(f))
            .map(|f| f.to_string()),
    };
    Ok(raw
        .features
        .iter()
        .map(|feature| {
            let from_field = field
                .as_ref()
                .and_then(|f| feature.properties.get(f))
                .and_then(value_as_name);
            from_field
                .or_else(|| feature.id.clone())
                .unwrap_or_else(|| format!("#{}", feature.source_index))
        })
        .collect())
}

fn value_as_name(value: &serde_json::Value) -> Option<String> {
    match value {
        serde_json::Value::String(s) => Some(s.trim().to_string()).filter(|s| !s.is_empty()),
        serde_json::Value::Number(n) => Some(n.to_string()),
        serde_json::Value::Bool(b) => Some(b.to_string()),
        _ => None,
    }
}

fn duplicate_names(regions: &[ImportedRegion], separating: &Option<String>) -> Vec<Diagnostic> {
    let mut by_name: BTreeMap<&str, Vec<usize>> = BTreeMap::new();
    for (i, region) in regions.iter().enumerate() {
        by_name.entry(region.name.as_str()).or_default().push(i);
    }
    let hint = match separating {
        Some(field) => {
            format!("; the field {field:?} tells them apart (import with --qualify-field {field})")
        }
        None => String::new(),
    };
    by_name
        .into_iter()
        .filter(|(_, ids)| ids.len() > 1)
        .map(|(name, ids)| Diagnostic {
            kind: DiagnosticKind::DuplicateName,
            message: format!("{} regions are named {name:?}{hint}", ids.len()),
            regions: ids,
        })
        .collect()
}

/// Writes each feature's parent unit, read by `key`, as its `parent` property; refuses when the
/// field is missing from the file, and notes features without a value.
fn set_parents(raw: &mut RawMap, key: &crate::doc::ParentKey) -> Result<(), ImportError> {
    let has_field = raw.field_names.contains(&key.field)
        || raw
            .features
            .iter()
            .any(|x| x.properties.contains_key(&key.field))
        || (key.field == "id" && raw.features.iter().any(|x| x.id.is_some()));
    if !has_field {
        return Err(ImportError::MissingParentField {
            field: key.field.clone(),
            available: available_fields(raw, "id (the feature id)"),
        });
    }
    let mut without: Vec<usize> = Vec::new();
    for (i, feature) in raw.features.iter_mut().enumerate() {
        match field_value(feature, &key.field).and_then(|v| key.cut(&v)) {
            Some(parent) => feature.properties.insert(
                crate::doc::PARENT_ATTRIBUTE.to_string(),
                serde_json::Value::String(parent),
            ),
            None => without.push(i),
        }
    }
    if !without.is_empty() {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            message: format!(
                "{} features have no {} (their regions have no parent unit)",
                without.len(),
                key
            ),
            regions: Vec::new(),
        });
    }
    Ok(())
}

/// The value of `field` for a feature, as a name: the property, or for `"id"` the feature id
/// when no property has that name.
fn field_value(feature: &RawFeature, field: &str) -> Option<String> {
    feature
        .properties
        .get(field)
        .and_then(value_as_name)
        .or_else(|| (field == "id").then(|| feature.id.clone()).flatten())
}

/// The fields a file has, for an error that names a missing one: the declared fields, then any
/// other property seen, then `feature_id` when features carry ids.
fn available_fields(raw: &RawMap, feature_id: &str) -> Vec<String> {
    let mut available = raw.field_names.clone();
    for feature in &raw.features {
        for key in feature.properties.keys() {
            if !available.contains(key) {
                available.push(key.clone());
            }
        }
    }
    if raw.features.iter().any(|x| x.id.is_some()) {
        available.push(feature_id.to_string());
    }
    available
}

/// Appends the value of `field` to every name that more than one feature has.
fn qualify_names(raw: &RawMap, names: &mut [String], field: &str) -> Result<(), ImportError> {
    let known = raw.features.iter().any(|f| field_value(f, field).is_some());
    if !known {
        let available = available_fields(raw, "id (the feature id)");
        return Err(ImportError::MissingQualifyField {
            field: field.to_string(),
            available,
        });
    }
    let mut count: BTreeMap<String, usize> = BTreeMap::new();
    for name in names.iter() {
        *count.entry(name.clone()).or_insert(0) += 1;
    }
    for (feature, name) in raw.features.iter().zip(names.iter_mut()) {
        if count.get(name.as_str()).is_some_and(|&n| n > 1)
            && let Some(value) = field_value(feature, field)
        {
            *name = format!("{name} ({value})");
        }
    }
    Ok(())
}

/// The first field (in the file's order, then the feature id) whose values tell apart, within
/// every group of features sharing a name, all the features of the group.
fn separating_field(raw: &RawMap, names: &[String]) -> Option<String> {
    let mut groups: BTreeMap<&str, Vec<usize>> = BTreeMap::new();
    for (i, name) in names.iter().enumerate() {
        groups.entry(name.as_str()).or_default().push(i);
    }
    let groups: Vec<Vec<usize>> = groups.into_values().filter(|g| g.len() > 1).collect();
    if groups.is_empty() {
        return None;
    }
    let mut candidates = raw.field_names.clone();
    for feature in &raw.features {
        for key in feature.properties.keys() {
            if !candidates.contains(key) {
                candidates.push(key.clone());
            }
        }
    }
    candidates.push("id".to_string());
    candidates.into_iter().find(|field| {
        groups.iter().all(|group| {
            let mut values: Vec<String> = Vec::with_capacity(group.len());
            for &i in group {
                match field_value(&raw.features[i], field) {
                    Some(v) if !values.contains(&v) => values.push(v),
                    _ => return false,
                }
            }
            true
        })
    })
}

fn sort_diagnostics(diagnostics: &mut [Diagnostic]) {
    diagnostics
        .sort_by(|x, y| (x.kind, &x.regions, &x.message).cmp(&(y.kind, &y.regions, &y.message)));
}

impl ImportedMap {
    /// The borders as index pairs, for comparisons and graph building.
    pub fn edges(&self) -> Vec<(usize, usize)> {
        self.borders.iter().map(|b| (b.a, b.b)).collect()
    }

    /// Diagnostics of one kind.
    pub fn diagnostics_of(&self, kind: DiagnosticKind) -> impl Iterator<Item = &Diagnostic> {
        self.diagnostics.iter().filter(move |d| d.kind == kind)
    }

    /// The index of the region with this name (the first if several share it).
    pub fn region_named(&self, name: &str) -> Option<usize> {
        self.regions.iter().position(|r| r.name == name)
    }
}
