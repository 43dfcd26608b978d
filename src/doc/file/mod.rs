//! The `.tinct` project file: pretty RON text, `format_version` first, every list sorted so that two
//! versions of a project diff cleanly. The only module that knows RON.
//!
//! Saving is atomic: the text goes to a temporary file in the same folder, is flushed to disk, and
//! then renamed over the target, so a crash leaves either the old file or the new one, whole.
//! Loading never falls back to defaults: a damaged file is an error that names the line and column.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::sync::Arc;

use serde::{Deserialize, Serialize};

use super::builder::DocumentBuilder;
use crate::projection::Projection;

use super::model::{
    AttrValue, Border, BorderKind, Document, Geometry, Group, GroupId, Palette, Polygon, Region,
    RegionId, RegionPair, Rgb, Role, Settings, Slot, Units,
};

/// The format version this build writes, and the newest it reads.
pub const FORMAT_VERSION: u32 = 1;

/// The file name extension of project files.
pub const EXTENSION: &str = "tinct";

/// Why a project file could not be read or written.
#[derive(Debug, thiserror::Error)]
pub enum FileError {
    #[error("cannot read {path}: {source}")]
    Read {
        path: PathBuf,
        source: std::io::Error,
    },
    #[error("cannot save {path}: {source}")]
    Write {
        path: PathBuf,
        source: std::io::Error,
    },
    #[error("the project file is empty")]
    Empty,
    #[error("line {line}, column {column}: {message}")]
    Syntax {
        line: usize,
        column: usize,
        message: String,
    },
    #[error(
        "this project was saved by a newer Tinct (file format {found}); this version reads format {supported} and older. Open it with a newer Tinct"
    )]
    NewerVersion { found: u32, supported: u32 },
    #[error("the project file is not valid: {0}")]
    Invalid(String),
}

mod fast;

// ---- The version 1 records. Field order here is the order in the file. ----

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct ProjectV1 {
    format_version: u32,
    title: String,
    settings: SettingsV1,
    palette_name: String,
    palette: Vec<SlotV1>,
    #[serde(default)]
    groups: Vec<GroupV1>,
    #[serde(default)]
    regions: Vec<RegionV1>,
    #[serde(default)]
    borders: Vec<BorderV1>,
    #[serde(default)]
    colouring: BTreeMap<u64, u32>,
    #[serde(default)]
    next_region_id: u64,
    #[serde(default)]
    next_group_id: u64,
    /// Added within version 1 (optional): notes from importing the map.
    #[serde(default)]
    notes: Vec<NoteV1>,
}

/// A note from importing the map: what was found and the regions it is about.
#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct NoteV1 {
    message: String,
    #[serde(default)]
    regions: Vec<u64>,
}

#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct SettingsV1 {
    corners_count: bool,
    min_border_length: f64,
    tolerance: f64,
    units: UnitsV1,
    /// Added within version 1 (optional): the centre `(longitude, latitude)` of a Lambert azimuthal
    /// equal-area projection. Written for that projection (so earlier builds still read the file),
    /// never together with `projection`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    projection_origin: Option<(f64, f64)>,
    /// Added within version 1 (optional): any other projection of a map imported from
    /// longitude/latitude.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    projection: Option<ProjectionV1>,
    /// Added within version 1 (optional): the coordinate system of a planar map's units, as the
    /// imported file named it.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    coordinate_system: Option<CrsV1>,
    /// Added within version 1 (optional, written only when true): the map will also be copied
    /// in greyscale, so the palette check asks for lightness steps too.
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    greyscale_copies: bool,
}

/// A map projection; every angle in degrees (see [`crate::projection::Projection`]).
#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
enum ProjectionV1 {
    LambertAzimuthal {
        lon0: f64,
        lat0: f64,
    },
    AlbersEqualArea {
        lon0: f64,
        lat0: f64,
        lat1: f64,
        lat2: f64,
    },
    EqualEarth {
        lon0: f64,
    },
}

impl ProjectionV1 {
    fn from_projection(p: Projection) -> Self {
        match p {
            Projection::LambertAzimuthal { lon0, lat0 } => {
                ProjectionV1::LambertAzimuthal { lon0, lat0 }
            }
            Projection::AlbersEqualArea {
                lon0,
                lat0,
                lat1,
                lat2,
            } => ProjectionV1::AlbersEqualArea {
                lon0,
                lat0,
                lat1,
                lat2,
            },
            Projection::EqualEarth { lon0 } => ProjectionV1::EqualEarth { lon0 },
        }
    }

    fn to_projection(&self) -> Projection {
        match *self {
            ProjectionV1::LambertAzimuthal { lon0, lat0 } => {
                Projection::LambertAzimuthal { lon0, lat0 }
            }
            ProjectionV1::AlbersEqualArea {
                lon0,
                lat0,
                lat1,
                lat2,
            } => Projection::AlbersEqualArea {
                lon0,
                lat0,
                lat1,
                lat2,
            },
            ProjectionV1::EqualEarth { lon0 } => Projection::EqualEarth { lon0 },
        }
    }
}

#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct CrsV1 {
    name: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    epsg: Option<u32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    wkt: Option<String>,
}

#[derive(Serialize, Deserialize)]
enum UnitsV1 {
    Metres,
    Unitless,
}

#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct SlotV1 {
    name: String,
    colour: String,
}

#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct GroupV1 {
    id: u64,
    name: String,
}

#[derive(Serialize, Deserialize)]
enum RoleV1 {
    Land,
    Water,
}

#[derive(Deserialize)]
enum AttrV1 {
    Null,
    Bool(bool),
    Number(f64),
    Text(String),
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RegionV1 {
    id: u64,
    name: String,
    role: RoleV1,
    anchor: (f64, f64),
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pin: Option<u32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    group: Option<u64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    source_index: Option<u64>,
    #[serde(default)]
    attributes: AttrsV1,
    /// Each polygon is a list of rings: the exterior first, then the holes.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    geometry: Option<Vec<PolygonV1>>,
}

/// A region's attributes, written as a map `{"name": value}` and read into a plain vector in the
/// order the file gives (Tinct writes them sorted by name).
#[derive(Default)]
struct AttrsV1(Vec<(String, AttrV1)>);

impl<'de> Deserialize<'de> for AttrsV1 {
    fn deserialize<D: serde::Deserializer<'de>>(deserializer: D) -> Result<AttrsV1, D::Error> {
        struct Entries;
        impl<'de> serde::de::Visitor<'de> for Entries {
            type Value = AttrsV1;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("a map of attribute names to values")
            }
            fn visit_map<A: serde::de::MapAccess<'de>>(
                self,
                mut map: A,
            ) -> Result<AttrsV1, A::Error> {
                let mut out = Vec::new();
                while let Some(entry) = map.next_entry::<String, AttrV1>()? {
                    out.push(entry);
                }
                Ok(AttrsV1(out))
            }
        }
        deserializer.deserialize_map(Entries)
    }
}

/// A polygon as its rings: the exterior first, then the holes.
/// (A point `[x, y]` is written `(x, y)`, like a pair: serde writes both as a tuple.)
type PolygonV1 = Vec<Vec<[f64; 2]>>;

#[derive(Serialize, Deserialize)]
enum KindV1 {
    Shared,
    Corner,
    Manual,
}

#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct BorderV1 {
    a: u64,
    b: u64,
    kind: KindV1,
    #[serde(default)]
    length: f64,
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    suppressed: bool,
}

/// Only the version, read first so that a newer file is refused with the right message.
#[derive(Deserialize)]
struct VersionProbe {
    format_version: u32,
}

/// The `format_version` at the head of a project file (`(` then `format_version: N`), read
/// without parsing the rest; `None` when the text does not start that way.
fn declared_version(text: &str) -> Option<u32> {
    let rest = text.trim_start().strip_prefix('(')?.trim_start();
    let rest = rest.strip_prefix("format_version")?.trim_start();
    let rest = rest.strip_prefix(':')?.trim_start();
    let end = rest
        .find(|c: char| !c.is_ascii_digit())
        .unwrap_or(rest.len());
    rest[..end].parse().ok()
}

// ---- Writing ----

/// The project as written: the version 1 layout, field for field, borrowing the document's
/// regions, borders and colours instead of copying them (a million-region project is written
/// straight from the document to the file).
#[derive(Serialize)]
struct ProjectOut<'a> {
    format_version: u32,
    title: &'a str,
    settings: SettingsV1,
    palette_name: &'a str,
    palette: Vec<SlotV1>,
    groups: Vec<GroupV1>,
    regions: RegionsOut<'a>,
    borders: BordersOut<'a>,
    colouring: ColouringOut<'a>,
    next_region_id: u64,
    next_group_id: u64,
    #[serde(skip_serializing_if = "Vec::is_empty")]
    notes: Vec<NoteV1>,
}

/// One region as written (see [`RegionV1`]).
#[derive(Serialize)]
struct RegionOut<'a> {
    id: u64,
    name: &'a str,
    role: RoleV1,
    anchor: (f64, f64),
    #[serde(skip_serializing_if = "Option::is_none")]
    pin: Option<u32>,
    #[serde(skip_serializing_if = "Option::is_none")]
    group: Option<u64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    source_index: Option<u64>,
    #[serde(skip_serializing_if = "AttrsOut::is_empty")]
    attributes: AttrsOut<'a>,
    #[serde(skip_serializing_if = "Option::is_none")]
    geometry: Option<GeometryOut<'a>>,
}

struct RegionsOut<'a>(&'a Document);
struct BordersOut<'a>(&'a Document);
struct ColouringOut<'a>(&'a Document);
struct AttrsOut<'a>(&'a super::model::Attributes);
struct GeometryOut<'a>(&'a Geometry);
struct PolygonOut<'a>(&'a Polygon);

/// An attribute value as written (see [`AttrV1`]).
#[derive(Serialize)]
enum AttrOut<'a> {
    Null,
    Bool(bool),
    Number(f64),
    Text(&'a str),
}

impl AttrsOut<'_> {
    fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
}

impl Serialize for RegionsOut<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        use serde::ser::SerializeSeq;
        let regions = self.0.regions();
        let mut seq = serializer.serialize_seq(Some(regions.len()))?;
        for (id, r) in regions {
            seq.serialize_element(&RegionOut {
                id: id.0,
                name: &r.name,
                role: match r.role {
                    Role::Land => RoleV1::Land,
                    Role::Water => RoleV1::Water,
                },
                anchor: (r.anchor[0], r.anchor[1]),
                pin: r.pin,
                group: r.group.map(|g| g.0),
                source_index: r.source_index,
                attributes: AttrsOut(&r.attributes),
                geometry: r.geometry.as_deref().map(GeometryOut),
            })?;
        }
        seq.end()
    }
}

impl Serialize for AttrsOut<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        use serde::ser::SerializeMap;
        let mut map = serializer.serialize_map(Some(self.0.len()))?;
        for (k, v) in self.0.iter() {
            let v = match v {
                AttrValue::Null => AttrOut::Null,
                AttrValue::Bool(b) => AttrOut::Bool(*b),
                AttrValue::Number(n) => AttrOut::Number(*n),
                AttrValue::Text(t) => AttrOut::Text(t),
            };
            map.serialize_entry(k, &v)?;
        }
        map.end()
    }
}

impl Serialize for GeometryOut<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_seq(self.0.polygons.iter().map(PolygonOut))
    }
}

impl Serialize for PolygonOut<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        // The exterior first, then the holes; a point `[x, y]` is written as the pair `(x, y)`.
        serializer.collect_seq(std::iter::once(&self.0.exterior).chain(&self.0.holes))
    }
}

impl Serialize for BordersOut<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_seq(self.0.borders().iter().map(|(pair, b)| BorderV1 {
            a: pair.a().0,
            b: pair.b().0,
            kind: match b.kind {
                BorderKind::Shared => KindV1::Shared,
                BorderKind::Corner => KindV1::Corner,
                BorderKind::Manual => KindV1::Manual,
            },
            length: b.length,
            suppressed: b.suppressed,
        }))
    }
}

impl Serialize for ColouringOut<'_> {
    fn serialize<S: serde::Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        use serde::ser::SerializeMap;
        // The exact length up front: an empty colouring is written `{}`, as it always was.
        let colouring = self.0.colouring();
        let mut map = serializer.serialize_map(Some(colouring.len()))?;
        for (id, slot) in colouring.iter() {
            map.serialize_entry(&id.0, slot)?;
        }
        map.end()
    }
}

fn to_records(doc: &Document) -> ProjectOut<'_> {
    ProjectOut {
        format_version: FORMAT_VERSION,
        title: &doc.title,
        settings: SettingsV1 {
            corners_count: doc.settings.corners_count,
            min_border_length: doc.settings.min_border_length,
            tolerance: doc.settings.tolerance,
            units: match doc.settings.units {
                Units::Metres => UnitsV1::Metres,
                Units::Unitless => UnitsV1::Unitless,
            },
            // A Lambert azimuthal projection is written as its centre, as before there was a
            // choice, so that earlier builds of format 1 still open the project.
            projection_origin: match doc.settings.projection {
                Some(Projection::LambertAzimuthal { lon0, lat0 }) => Some((lon0, lat0)),
                _ => None,
            },
            projection: match doc.settings.projection {
                Some(Projection::LambertAzimuthal { .. }) | None => None,
                Some(p) => Some(ProjectionV1::from_projection(p)),
            },
            coordinate_system: doc.crs.as_ref().map(|c| CrsV1 {
                name: c.name.clone(),
                epsg: c.epsg,
                wkt: c.wkt.clone(),
            }),
            greyscale_copies: doc.settings.greyscale_copies,
        },
        palette_name: &doc.palette.name,
        palette: doc
            .palette
            .slots
            .iter()
            .map(|s| SlotV1 {
                name: s.name.clone(),
                colour: s.colour.to_hex(),
            })
            .collect(),
        groups: doc
            .groups
            .iter()
            .map(|(id, g)| GroupV1 {
                id: id.0,
                name: g.name.clone(),
            })
            .collect(),
        regions: RegionsOut(doc),
        borders: BordersOut(doc),
        colouring: ColouringOut(doc),
        next_region_id: doc.peek_region_id().0,
        next_group_id: doc.peek_group_id().0,
        notes: doc
            .notes
            .iter()
            .map(|n| NoteV1 {
                message: n.message.clone(),
                regions: n.regions.iter().map(|r| r.0).collect(),
            })
            .collect(),
    }
}

/// How project files are laid out: depth 2 puts each region, border, slot and group on one line
/// of its own, so a change touches only its line.
fn pretty() -> ron::ser::PrettyConfig {
    ron::ser::PrettyConfig::new()
        .depth_limit(2)
        .indentor("  ")
        .separate_tuple_members(false)
}

/// The project as `.tinct` text.
pub fn to_string(doc: &Document) -> String {
    match ron::ser::to_string_pretty(&to_records(doc), pretty()) {
        Ok(mut text) => {
            text.push('\n');
            text
        }
        // Serialising plain records into a string cannot fail; keep a readable fallback anyway.
        Err(e) => format!("// could not write project: {e}\n"),
    }
}

/// Saves `doc` to `path` atomically (temporary file in the same folder, flushed, then renamed),
/// writing straight from the document to the file: no copy of the project's text in memory.
pub fn save(doc: &Document, path: &Path) -> Result<(), FileError> {
    crate::atomic::write_atomically_with(path, |out| {
        ron::Options::default()
            .to_io_writer_pretty(&mut *out, &to_records(doc), pretty())
            .map_err(std::io::Error::other)?;
        out.write_all(b"\n")
    })
    .map_err(|e| FileError::Write {
        path: e.path,
        source: e.source,
    })
}

/// Writes `bytes` to `path` atomically (see [`crate::atomic::write_atomically`]).
pub fn write_atomically(path: &Path, bytes: &[u8]) -> Result<(), FileError> {
    crate::atomic::write_atomically(path, bytes).map_err(|e| FileError::Write {
        path: e.path,
        source: e.source,
    })
}

/// The temporary files that saves of `file_name` left in `folder` when they were killed.
pub use crate::atomic::stale_temporaries;

// ---- Reading ----

fn syntax(e: ron::error::SpannedError, text: &str) -> FileError {
    let (line, column) = (e.span.start.line, e.span.start.col);
    let message = match &e.code {
        ron::Error::Eof => "the file ends too early (is it truncated?)".to_string(),
        other => {
            // An error on the last line of a text that does not end as a project does means the
            // text stopped where more was expected: most often a file cut short by an interrupted
            // copy. (The error may sit a few characters before the cut, at the start of the token
            // the cut split, so the column is not compared.)
            let lines = text.lines().count().max(1);
            let at_end = line >= lines;
            if at_end && !text.ends_with(")\n") && !text.ends_with(')') {
                format!("{other}; the file ends here (is it truncated?)")
            } else {
                other.to_string()
            }
        }
    };
    FileError::Syntax {
        line,
        column,
        message,
    }
}

/// Parses `.tinct` text into a document.
pub fn from_str(text: &str) -> Result<Document, FileError> {
    if text.trim().is_empty() {
        return Err(FileError::Empty);
    }
    // The version is read from the head of the text when it is where Tinct writes it (first);
    // only an unusual file pays for a second full parse (seconds on a million regions).
    let version = declared_version(text).or_else(|| {
        ron::de::from_str::<VersionProbe>(text)
            .ok()
            .map(|p| p.format_version)
    });
    if let Some(found) = version
        && found > FORMAT_VERSION
    {
        return Err(FileError::NewerVersion {
            found,
            supported: FORMAT_VERSION,
        });
    }
    // The fast reader handles files as Tinct writes them; anything else (and every error) goes
    // to the general RON parser, which reports problems with their line and column.
    let records: ProjectV1 = match fast::from_str(text) {
        Ok(records) => records,
        Err(_) => ron::de::from_str(text).map_err(|e| syntax(e, text))?,
    };
    if records.format_version == 0 {
        return Err(FileError::Invalid(
            "format_version 0 does not exist; the first version is 1".into(),
        ));
    }
    from_records(records)
}

/// Reads a project file.
pub fn load(path: &Path) -> Result<Document, FileError> {
    let bytes = std::fs::read(path).map_err(|source| FileError::Read {
        path: path.to_path_buf(),
        source,
    })?;
    from_bytes(&bytes)
}

/// Parses the bytes of a project file; text that is not UTF-8 is a syntax error naming where.
pub fn from_bytes(bytes: &[u8]) -> Result<Document, FileError> {
    let text = std::str::from_utf8(bytes).map_err(|e| {
        let upto = &bytes[..e.valid_up_to()];
        let line = upto.iter().filter(|&&b| b == b'\n').count() + 1;
        let column = upto.iter().rev().take_while(|&&b| b != b'\n').count() + 1;
        FileError::Syntax {
            line,
            column,
            message: "the text is not valid UTF-8".into(),
        }
    })?;
    from_str(text)
}

fn finite(p: (f64, f64)) -> bool {
    p.0.is_finite() && p.1.is_finite()
}

fn from_records(r: ProjectV1) -> Result<Document, FileError> {
    let invalid = |m: String| Err(FileError::Invalid(m));
    let mut doc = DocumentBuilder::new(r.title);
    if !(r.settings.min_border_length.is_finite()
        && r.settings.min_border_length >= 0.0
        && r.settings.tolerance.is_finite()
        && r.settings.tolerance >= 0.0)
    {
        return invalid(
            "settings: min_border_length and tolerance must be finite and not negative".into(),
        );
    }
    if let Some((lon, lat)) = r.settings.projection_origin
        && !(lon.is_finite() && lat.is_finite() && (-90.0..=90.0).contains(&lat))
    {
        return invalid(format!(
            "settings: projection_origin ({lon}, {lat}) is not a longitude and latitude"
        ));
    }
    let projection = match (r.settings.projection_origin, &r.settings.projection) {
        (Some(_), Some(_)) => {
            return invalid(
                "settings: both projection_origin and projection are given; a map has one projection"
                    .into(),
            );
        }
        (Some((lon0, lat0)), None) => Some(Projection::LambertAzimuthal { lon0, lat0 }),
        (None, Some(p)) => {
            let p = p.to_projection();
            if let Err(e) = p.check() {
                return invalid(format!("settings: projection {}: {e}", p.name()));
            }
            Some(p)
        }
        (None, None) => None,
    };
    doc.settings(Settings {
        corners_count: r.settings.corners_count,
        min_border_length: r.settings.min_border_length,
        tolerance: r.settings.tolerance,
        units: match r.settings.units {
            UnitsV1::Metres => Units::Metres,
            UnitsV1::Unitless => Units::Unitless,
        },
        projection,
        greyscale_copies: r.settings.greyscale_copies,
    });
    doc.crs(r.settings.coordinate_system.map(|c| crate::doc::Crs {
        name: c.name,
        epsg: c.epsg,
        wkt: c.wkt,
    }));
    let mut slots = Vec::with_capacity(r.palette.len());
    for (i, s) in r.palette.into_iter().enumerate() {
        let Some(colour) = Rgb::from_hex(&s.colour) else {
            return invalid(format!(
                "palette slot {} ({}): colour {:?} is not of the form #rrggbb",
                i + 1,
                s.name,
                s.colour
            ));
        };
        slots.push(Slot {
            name: s.name,
            colour,
        });
    }
    doc.palette(Palette {
        name: r.palette_name,
        slots,
    });
    doc.reserve(r.regions.len(), r.borders.len());
    for g in r.groups {
        doc.group(GroupId(g.id), Group { name: g.name });
    }
    for rec in r.regions {
        let id = RegionId(rec.id);
        if !finite(rec.anchor) {
            return invalid(format!(
                "region {}: the anchor is not a finite point",
                rec.id
            ));
        }
        let geometry = match rec.geometry {
            None => None,
            Some(polys) => {
                let mut polygons = Vec::with_capacity(polys.len());
                for rings in polys {
                    let mut rings = rings.into_iter();
                    let Some(exterior) = rings.next() else {
                        return invalid(format!("region {}: a polygon has no rings", rec.id));
                    };
                    // Rings are moved, not copied: a million regions load without a second copy.
                    let to_points = |ring: Vec<[f64; 2]>| -> Option<Vec<[f64; 2]>> {
                        ring.iter()
                            .all(|p| p[0].is_finite() && p[1].is_finite())
                            .then_some(ring)
                    };
                    let Some(exterior) = to_points(exterior) else {
                        return invalid(format!(
                            "region {}: a coordinate is not a finite number",
                            rec.id
                        ));
                    };
                    let mut holes = Vec::new();
                    for ring in rings {
                        let Some(h) = to_points(ring) else {
                            return invalid(format!(
                                "region {}: a coordinate is not a finite number",
                                rec.id
                            ));
                        };
                        holes.push(h);
                    }
                    polygons.push(Polygon { exterior, holes });
                }
                Some(Arc::new(Geometry { polygons }))
            }
        };
        let region = Region {
            name: rec.name,
            role: match rec.role {
                RoleV1::Land => Role::Land,
                RoleV1::Water => Role::Water,
            },
            anchor: [rec.anchor.0, rec.anchor.1],
            geometry,
            pin: rec.pin,
            group: rec.group.map(GroupId),
            source_index: rec.source_index,
            attributes: rec
                .attributes
                .0
                .into_iter()
                .map(|(k, v)| {
                    let v = match v {
                        AttrV1::Null => AttrValue::Null,
                        AttrV1::Bool(b) => AttrValue::Bool(b),
                        AttrV1::Number(n) => AttrValue::Number(n),
                        AttrV1::Text(t) => AttrValue::Text(t),
                    };
                    (k, v)
                })
                .collect(),
        };
        doc.region(id, region);
    }
    for b in r.borders {
        let Some(pair) = RegionPair::new(RegionId(b.a), RegionId(b.b)) else {
            return invalid(format!("a border joins region {} to itself", b.a));
        };
        if !(b.length.is_finite() && b.length >= 0.0) {
            return invalid(format!(
                "the border between {} and {} has a length that is not a finite number >= 0",
                b.a, b.b
            ));
        }
        let kind = match b.kind {
            KindV1::Shared => BorderKind::Shared,
            KindV1::Corner => BorderKind::Corner,
            KindV1::Manual => BorderKind::Manual,
        };
        doc.border(
            pair,
            Border {
                kind,
                length: b.length,
                suppressed: b.suppressed,
            },
        );
    }
    for (id, slot) in r.colouring {
        doc.colour(RegionId(id), slot);
    }
    doc.next_ids(r.next_region_id, r.next_group_id);
    doc.notes(
        r.notes
            .into_iter()
            .map(|n| crate::doc::Note {
                message: n.message,
                regions: n.regions.into_iter().map(RegionId).collect(),
            })
            .collect(),
    );
    doc.build().map_err(|e| FileError::Invalid(e.to_string()))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The fast reader and the general RON parser read `text` to the same document.
    fn both_readers_agree(text: &str) {
        let fast: ProjectV1 = fast::from_str(text).expect("the fast reader reads Tinct's files");
        let general: ProjectV1 = ron::de::from_str(text).unwrap();
        assert_eq!(from_records(fast).unwrap(), from_records(general).unwrap());
    }

    #[test]
    fn tinct_files_are_written_back_byte_for_byte_and_saving_streams_the_same_text() {
        // Regression: the streamed writer wrote an empty colouring as "{\n  }" instead of "{}".
        for text in [
            include_str!("../../../sample-maps/vessland-province.tinct"),
            include_str!("../../../sample-maps/three-valleys.tinct"),
            include_str!("../../../tests/golden/v1/full.tinct"),
        ] {
            let doc = from_str(text).unwrap();
            let written = to_string(&doc);
            if text.starts_with("(\n  format_version") {
                assert_eq!(written, text, "a file Tinct wrote comes back unchanged");
            }
            let dir = std::env::temp_dir().join(format!("tinct-save-{}", std::process::id()));
            std::fs::create_dir_all(&dir).unwrap();
            let path = dir.join("saved.tinct");
            save(&doc, &path).unwrap();
            assert_eq!(std::fs::read_to_string(&path).unwrap(), written);
            let _ = std::fs::remove_dir_all(&dir);
        }
    }

    #[test]
    fn the_fast_reader_agrees_with_ron_and_gives_up_on_what_it_does_not_know() {
        for text in [
            include_str!("../../../sample-maps/vessland-province.tinct"),
            include_str!("../../../sample-maps/exclave-coast.tinct"),
            include_str!("../../../sample-maps/three-valleys.tinct"),
        ] {
            both_readers_agree(text);
        }
        let mut doc = sample();
        doc.apply(super::super::edit::Edit::SetTitle(
            "Quotes \" and \\ back, tab\t, é and \u{1}".into(),
        ))
        .unwrap();
        both_readers_agree(&to_string(&doc));
        // Notes from an import and a coordinate system, as an imported project carries them.
        let mut builder = crate::doc::DocumentBuilder::new("imported");
        builder
            .region(RegionId(1), crate::doc::Region::new("Ashcombe", [0.0, 0.0]))
            .crs(Some(crate::doc::Crs {
                name: "NAD83 / Conus Albers".into(),
                epsg: Some(5070),
                wkt: Some("PROJCS[\"NAD83 / Conus Albers\"]".into()),
            }))
            .notes(vec![crate::doc::Note {
                message: "a ring of region \"Ashcombe\" crosses or touches itself".into(),
                regions: vec![RegionId(1)],
            }]);
        let imported = builder.build().unwrap();
        let text = to_string(&imported);
        both_readers_agree(&text);
        assert_eq!(from_str(&text).unwrap(), imported);
        // A comment is RON, but not what Tinct writes: the fast reader gives up, and loading
        // still works through the general parser.
        let text = to_string(&sample()).replacen("(\n", "( // a note\n", 1);
        assert!(fast::from_str::<ProjectV1>(&text).is_err());
        assert_eq!(from_str(&text).unwrap(), sample());
    }

    fn sample() -> Document {
        let mut doc = Document::new("Test map");
        let (_, e) = doc.add_group_edit("Pair");
        doc.apply(e).unwrap();
        let mut a = Region::new("Alpha", [1.5, 2.0]);
        a.geometry = Some(Arc::new(Geometry {
            polygons: vec![Polygon {
                exterior: vec![[0.0, 0.0], [4.0, 0.0], [4.0, 4.0], [0.0, 4.0]],
                holes: vec![vec![[1.0, 1.0], [2.0, 1.0], [2.0, 2.0]]],
            }],
        }));
        a.group = Some(GroupId(1));
        a.attributes
            .insert("code".into(), AttrValue::Text("A-1".into()));
        let (_, e) = doc.add_region_edit(a);
        doc.apply(e).unwrap();
        let mut b = Region::new("Beta", [5.0, 2.0]);
        b.pin = Some(2);
        let (_, e) = doc.add_region_edit(b);
        doc.apply(e).unwrap();
        let pair = RegionPair::new(RegionId(1), RegionId(2)).unwrap();
        doc.apply(super::super::edit::Edit::PutBorder {
            pair,
            border: Some(Border::shared(4.0)),
        })
        .unwrap();
        doc.apply(super::super::edit::Edit::PutColour {
            id: RegionId(2),
            slot: Some(2),
        })
        .unwrap();
        doc
    }

    #[test]
    fn round_trips_and_starts_with_format_version() {
        let doc = sample();
        let text = to_string(&doc);
        assert!(text.starts_with("(\n  format_version: 1,"), "{text}");
        let back = from_str(&text).unwrap();
        assert_eq!(back, doc);
        assert_eq!(to_string(&back), text);
    }

    #[test]
    fn truncated_file_names_line_and_column() {
        let text = to_string(&sample());
        let cut = &text[..text.len() / 2];
        match from_str(cut) {
            Err(FileError::Syntax { line, message, .. }) => {
                assert!(line > 1);
                assert!(
                    message.contains("truncated") || !message.is_empty(),
                    "{message}"
                );
            }
            other => panic!("expected a syntax error, got {other:?}"),
        }
    }

    #[test]
    fn newer_version_is_refused() {
        let text = to_string(&sample()).replacen("format_version: 1", "format_version: 7", 1);
        let err = from_str(&text).unwrap_err();
        assert!(
            matches!(
                err,
                FileError::NewerVersion {
                    found: 7,
                    supported: 1
                }
            ),
            "{err}"
        );
        assert!(err.to_string().contains("newer Tinct"));
    }

    #[test]
    fn empty_file_is_an_error() {
        assert!(matches!(from_str("  \n"), Err(FileError::Empty)));
    }
}
