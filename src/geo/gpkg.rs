//! GeoPackage reading (OGC GeoPackage Encoding Standard 1.3/1.4, OGC 12-128r18 and later): one
//! feature table of polygons, through SQLite (bundled, so nothing is needed on the machine).
//!
//! - Layers are the `features` rows of `gpkg_contents` with their `gpkg_geometry_columns` entry.
//!   With one polygon layer it is read; with several, `--layer` names one (the error lists them).
//! - Geometries are GeoPackage binary blobs (clause 2.1.3): the `GP` header (version, flags, SRS
//!   id, optional envelope) followed by ISO WKB (OGC 06-103r4; Z, M and ZM variants, and the
//!   extended-WKB flag bits some writers use). Polygons and multi-polygons become regions; a
//!   geometry collection contributes its polygons; points and lines are skipped with a note.
//! - The layer's spatial reference (`gpkg_spatial_ref_sys`) says longitude/latitude (geographic
//!   definitions, EPSG:4326) or planar; a planar system is kept in its units and recorded
//!   ([`super::Crs`]) so exports can write it back. The reserved "undefined" systems (ids -1
//!   and 0, which GDAL gives data without a coordinate system) leave it to the coordinate range.
//! - Other columns become properties (integers and reals as numbers, text as text, blobs
//!   skipped); the primary key is the feature id.
//!
//! Hostile input (not a database, a damaged one, a blob shorter than its header, counts larger
//! than the blob) is refused with an [`ImportError::GeoPackage`] naming the layer and feature,
//! never a panic: every count is checked against the bytes left before anything is allocated.

use std::path::Path;

use rusqlite::types::ValueRef;
use rusqlite::{Connection, OpenFlags};
use serde_json::Value;

use super::{
    CoordinateMode, Crs, Diagnostic, DiagnosticKind, ImportError, Point, Polygon, RawFeature,
    RawMap,
};

/// SQLite's file header (the first 16 bytes of every database file).
const SQLITE_MAGIC: &[u8; 16] = b"SQLite format 3\0";

fn error(reason: impl Into<String>) -> ImportError {
    ImportError::GeoPackage {
        reason: reason.into(),
    }
}

fn sql_error(e: rusqlite::Error) -> ImportError {
    error(format!("the database cannot be read: {e}"))
}

/// Opens `path` read-only and reads one layer.
pub(super) fn read_path(
    path: &Path,
    layer: Option<&str>,
    mode: CoordinateMode,
) -> Result<RawMap, ImportError> {
    let head = read_head(path)?;
    check_magic(&head)?;
    let connection = Connection::open_with_flags(
        path,
        OpenFlags::SQLITE_OPEN_READ_ONLY | OpenFlags::SQLITE_OPEN_NO_MUTEX,
    )
    .map_err(sql_error)?;
    read_connection(&connection, layer, mode)
}

/// Reads one layer of a GeoPackage held in memory (tests and the fuzz target).
pub(super) fn read_bytes(
    bytes: &[u8],
    layer: Option<&str>,
    mode: CoordinateMode,
) -> Result<RawMap, ImportError> {
    check_magic(bytes)?;
    let mut connection = Connection::open_in_memory().map_err(sql_error)?;
    connection
        .deserialize_read_exact(rusqlite::MAIN_DB, bytes, bytes.len(), true)
        .map_err(sql_error)?;
    read_connection(&connection, layer, mode)
}

fn read_head(path: &Path) -> Result<Vec<u8>, ImportError> {
    use std::io::Read;
    let io = |source| ImportError::Io {
        path: path.to_path_buf(),
        source,
    };
    let mut head = Vec::with_capacity(16);
    std::fs::File::open(path)
        .map_err(io)?
        .take(16)
        .read_to_end(&mut head)
        .map_err(io)?;
    Ok(head)
}

fn check_magic(bytes: &[u8]) -> Result<(), ImportError> {
    if bytes.len() < SQLITE_MAGIC.len() || &bytes[..SQLITE_MAGIC.len()] != SQLITE_MAGIC {
        return Err(error(
            "not a GeoPackage: the file is not an SQLite database (it does not start with \
             \"SQLite format 3\")",
        ));
    }
    Ok(())
}

/// A feature layer as `gpkg_contents` and `gpkg_geometry_columns` describe it.
#[derive(Debug)]
struct Layer {
    table: String,
    column: String,
    geometry_type: String,
    srs_id: i64,
}

impl Layer {
    fn is_polygonal(&self) -> bool {
        matches!(
            self.geometry_type.to_ascii_uppercase().as_str(),
            "POLYGON"
                | "MULTIPOLYGON"
                | "GEOMETRY"
                | "GEOMETRYCOLLECTION"
                | "SURFACE"
                | "MULTISURFACE"
                | "CURVEPOLYGON"
        )
    }
}

fn layers(connection: &Connection) -> Result<Vec<Layer>, ImportError> {
    let has_contents: bool = connection
        .query_row(
            "SELECT count(*) FROM sqlite_master WHERE type IN ('table', 'view') \
             AND name IN ('gpkg_contents', 'gpkg_geometry_columns')",
            [],
            |row| row.get::<_, i64>(0),
        )
        .map_err(sql_error)?
        == 2;
    if !has_contents {
        return Err(error(
            "not a GeoPackage: the database has no gpkg_contents and gpkg_geometry_columns \
             tables (it is an SQLite database of some other kind)",
        ));
    }
    let mut statement = connection
        .prepare(
            "SELECT c.table_name, g.column_name, g.geometry_type_name, g.srs_id \
             FROM gpkg_contents c JOIN gpkg_geometry_columns g ON c.table_name = g.table_name \
             WHERE c.data_type = 'features' ORDER BY c.table_name",
        )
        .map_err(sql_error)?;
    let rows = statement
        .query_map([], |row| {
            Ok(Layer {
                table: row.get(0)?,
                column: row.get(1)?,
                geometry_type: row.get(2)?,
                srs_id: row.get(3)?,
            })
        })
        .map_err(sql_error)?;
    rows.collect::<Result<Vec<_>, _>>().map_err(sql_error)
}

/// SQL identifiers are quoted, with quotes inside doubled.
fn quoted(name: &str) -> String {
    format!("\"{}\"", name.replace('"', "\"\""))
}

fn choose_layer(connection: &Connection, wanted: Option<&str>) -> Result<Layer, ImportError> {
    let mut all = layers(connection)?;
    let describe = |layers: &[Layer]| {
        layers
            .iter()
            .map(|l| {
                let count: Option<i64> = connection
                    .query_row(
                        &format!("SELECT count(*) FROM {}", quoted(&l.table)),
                        [],
                        |r| r.get(0),
                    )
                    .ok();
                match count {
                    Some(n) => format!("{} ({}, {n} features)", l.table, l.geometry_type),
                    None => format!("{} ({})", l.table, l.geometry_type),
                }
            })
            .collect::<Vec<_>>()
    };
    if let Some(name) = wanted {
        return match all.iter().position(|l| l.table == name) {
            Some(i) => Ok(all.swap_remove(i)),
            None => Err(ImportError::MissingLayer {
                layer: name.to_string(),
                available: describe(&all),
            }),
        };
    }
    let polygonal: Vec<usize> = (0..all.len()).filter(|&i| all[i].is_polygonal()).collect();
    match polygonal.as_slice() {
        [one] => Ok(all.swap_remove(*one)),
        [] if all.is_empty() => Err(error("the GeoPackage has no feature layers")),
        [] => Err(error(format!(
            "the GeoPackage has no polygon layer; its feature layers are {}",
            describe(&all).join(", ")
        ))),
        several => {
            let candidates: Vec<Layer> = all
                .into_iter()
                .enumerate()
                .filter(|(i, _)| several.contains(i))
                .map(|(_, l)| l)
                .collect();
            Err(error(format!(
                "the GeoPackage has {} polygon layers: {}; choose one with --layer NAME",
                candidates.len(),
                describe(&candidates).join(", ")
            )))
        }
    }
}

/// The layer's spatial reference, when it is a defined one.
fn spatial_reference(connection: &Connection, srs_id: i64) -> Option<Crs> {
    // The standard's reserved ids: -1 undefined Cartesian, 0 undefined geographic. GDAL gives
    // data without any coordinate system id 0, so neither decides: the coordinate range does,
    // as for a shapefile without a `.prj`.
    if srs_id == -1 || srs_id == 0 {
        return None;
    }
    let row = connection.query_row(
        "SELECT srs_name, organization, organization_coordsys_id, definition \
         FROM gpkg_spatial_ref_sys WHERE srs_id = ?1",
        [srs_id],
        |row| {
            Ok((
                row.get::<_, Option<String>>(0)?,
                row.get::<_, Option<String>>(1)?,
                row.get::<_, Option<i64>>(2)?,
                row.get::<_, Option<String>>(3)?,
            ))
        },
    );
    let (name, organization, code, definition) = row.ok()?;
    let definition = definition.unwrap_or_default();
    let epsg = organization
        .as_deref()
        .is_some_and(|o| o.eq_ignore_ascii_case("EPSG"))
        .then_some(code)
        .flatten()
        .and_then(|c| u32::try_from(c).ok());
    Some(Crs {
        name: name.unwrap_or_default(),
        epsg,
        wkt: (!definition.trim().is_empty() && !definition.eq_ignore_ascii_case("undefined"))
            .then_some(definition),
    })
}

fn read_connection(
    connection: &Connection,
    layer: Option<&str>,
    mode: CoordinateMode,
) -> Result<RawMap, ImportError> {
    let layer = choose_layer(connection, layer)?;
    let mut raw = RawMap::default();
    if let Some(crs) = spatial_reference(connection, layer.srs_id) {
        raw.note_coordinate_system(mode, crs);
    }

    // Columns in table order; the primary key is the feature id.
    let mut columns: Vec<(String, String, bool)> = Vec::new();
    {
        let mut info = connection
            .prepare(&format!("PRAGMA table_info({})", quoted(&layer.table)))
            .map_err(sql_error)?;
        let rows = info
            .query_map([], |row| {
                Ok((
                    row.get::<_, String>(1)?,
                    row.get::<_, Option<String>>(2)?.unwrap_or_default(),
                    row.get::<_, i64>(5)? > 0,
                ))
            })
            .map_err(sql_error)?;
        for row in rows {
            columns.push(row.map_err(sql_error)?);
        }
    }
    if columns.is_empty() {
        return Err(error(format!(
            "layer {:?} is listed in gpkg_contents but its table is missing",
            layer.table
        )));
    }
    let Some(geometry_index) = columns.iter().position(|c| c.0 == layer.column) else {
        return Err(error(format!(
            "layer {:?} has no column {:?}, which gpkg_geometry_columns names as its geometry",
            layer.table, layer.column
        )));
    };
    let key_index = columns.iter().position(|c| c.2);
    raw.field_names = columns
        .iter()
        .enumerate()
        .filter(|&(i, _)| i != geometry_index && Some(i) != key_index)
        .map(|(_, c)| c.0.clone())
        .collect();

    let order = key_index.map_or("rowid".to_string(), |k| quoted(&columns[k].0));
    let list = columns
        .iter()
        .map(|c| quoted(&c.0))
        .collect::<Vec<_>>()
        .join(", ");
    let mut statement = connection
        .prepare(&format!(
            "SELECT {list} FROM {} ORDER BY {order}",
            quoted(&layer.table)
        ))
        .map_err(sql_error)?;
    let mut rows = statement.query([]).map_err(sql_error)?;
    let mut skipped: Vec<String> = Vec::new();
    let mut index = 0usize;
    while let Some(row) = rows.next().map_err(sql_error)? {
        let mut feature = RawFeature {
            source_index: index,
            ..RawFeature::default()
        };
        let mut fid = None;
        for (i, (name, declared, _)) in columns.iter().enumerate() {
            let value = row.get_ref(i).map_err(sql_error)?;
            if i == geometry_index {
                continue;
            }
            if Some(i) == key_index {
                fid = match value {
                    ValueRef::Integer(k) => Some(k.to_string()),
                    ValueRef::Text(t) => Some(String::from_utf8_lossy(t).into_owned()),
                    _ => None,
                };
                continue;
            }
            if let Some(v) = property(value, declared) {
                feature.properties.insert(name.clone(), v);
            }
        }
        let label = match &fid {
            Some(f) => format!("feature {f} of layer {:?}", layer.table),
            None => format!("feature {} of layer {:?}", index + 1, layer.table),
        };
        feature.id = fid;
        match row.get_ref(geometry_index).map_err(sql_error)? {
            ValueRef::Null => feature.geometry_missing = true,
            ValueRef::Blob(blob) => {
                let geometry = decode_blob(blob).map_err(|e| error(format!("{label}: {e}")))?;
                match geometry {
                    Decoded::Polygons(parts) => feature.parts = parts,
                    Decoded::Empty => feature.geometry_missing = true,
                    Decoded::Other(kind) => {
                        skipped.push(format!("{label} ({kind})"));
                        index += 1;
                        continue;
                    }
                }
            }
            other => {
                return Err(error(format!(
                    "{label}: the geometry is {}, not a GeoPackage binary blob",
                    value_kind(other)
                )));
            }
        }
        raw.features.push(feature);
        index += 1;
    }
    if !skipped.is_empty() {
        let shown: Vec<&str> = skipped.iter().take(5).map(String::as_str).collect();
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::SkippedGeometry,
            regions: vec![],
            message: format!(
                "{} feature(s) are not polygons and were skipped: {}{}",
                skipped.len(),
                shown.join(", "),
                if skipped.len() > shown.len() {
                    ", …"
                } else {
                    ""
                }
            ),
        });
    }
    Ok(raw)
}

fn value_kind(value: ValueRef<'_>) -> &'static str {
    match value {
        ValueRef::Null => "null",
        ValueRef::Integer(_) => "an integer",
        ValueRef::Real(_) => "a number",
        ValueRef::Text(_) => "text",
        ValueRef::Blob(_) => "a blob",
    }
}

/// An attribute as a property; `declared` is the column's declared type (BOOLEAN columns hold
/// 0 and 1). Blobs have no JSON counterpart and are left out.
fn property(value: ValueRef<'_>, declared: &str) -> Option<Value> {
    Some(match value {
        ValueRef::Null => Value::Null,
        ValueRef::Integer(i) if declared.eq_ignore_ascii_case("BOOLEAN") => Value::Bool(i != 0),
        ValueRef::Integer(i) => Value::from(i),
        ValueRef::Real(f) => serde_json::Number::from_f64(f).map_or(Value::Null, Value::Number),
        ValueRef::Text(t) => Value::String(String::from_utf8_lossy(t).into_owned()),
        ValueRef::Blob(_) => return None,
    })
}

/// What a geometry blob holds, as far as import is concerned.
#[derive(Debug, PartialEq)]
pub(super) enum Decoded {
    Polygons(Vec<Polygon>),
    /// The empty-geometry flag, or an empty polygon or collection.
    Empty,
    /// A point, line or curve: named for the note.
    Other(&'static str),
}

/// Decodes a GeoPackage binary geometry (clause 2.1.3).
pub(super) fn decode_blob(blob: &[u8]) -> Result<Decoded, String> {
    if blob.len() < 8 {
        return Err(format!(
            "the geometry blob has {} bytes, fewer than the 8 of its header",
            blob.len()
        ));
    }
    if &blob[..2] != b"GP" {
        return Err("the geometry blob does not start with \"GP\"".to_string());
    }
    let flags = blob[3];
    if flags & 0b1100_0000 != 0 {
        return Err(format!(
            "the geometry header's reserved flag bits are set ({flags:#04x})"
        ));
    }
    let envelope = match (flags >> 1) & 0b111 {
        0 => 0,
        1 => 32,
        2 | 3 => 48,
        4 => 64,
        code => {
            return Err(format!(
                "the geometry header's envelope code {code} is invalid"
            ));
        }
    };
    let start = 8 + envelope;
    if blob.len() < start {
        return Err(format!(
            "the geometry blob has {} bytes, fewer than the {start} its header and envelope take",
            blob.len()
        ));
    }
    if flags & 0b0010_0000 != 0 {
        return Ok(Decoded::Other("an extended geometry"));
    }
    if flags & 0b0001_0000 != 0 {
        return Ok(Decoded::Empty);
    }
    let mut reader = Wkb {
        bytes: &blob[start..],
        at: 0,
    };
    let decoded = reader.geometry(0)?;
    Ok(match decoded {
        Decoded::Polygons(p) if p.is_empty() => Decoded::Empty,
        other => other,
    })
}

/// A reader over well-known binary (ISO 13249-3 / OGC 06-103r4).
struct Wkb<'a> {
    bytes: &'a [u8],
    at: usize,
}

/// Collections nest; a hostile blob could nest them deeply enough to exhaust the stack.
const MAX_NESTING: usize = 32;

impl Wkb<'_> {
    fn take(&mut self, n: usize) -> Result<&[u8], String> {
        let end = self
            .at
            .checked_add(n)
            .filter(|&e| e <= self.bytes.len())
            .ok_or_else(|| {
                format!(
                    "the WKB ends after {} bytes where {} more were expected",
                    self.bytes.len(),
                    n
                )
            })?;
        let out = &self.bytes[self.at..end];
        self.at = end;
        Ok(out)
    }

    fn u32(&mut self, little: bool) -> Result<u32, String> {
        let b: [u8; 4] = self.take(4)?.try_into().map_err(|_| "short read")?;
        Ok(if little {
            u32::from_le_bytes(b)
        } else {
            u32::from_be_bytes(b)
        })
    }

    fn f64(&mut self, little: bool) -> Result<f64, String> {
        let b: [u8; 8] = self.take(8)?.try_into().map_err(|_| "short read")?;
        Ok(if little {
            f64::from_le_bytes(b)
        } else {
            f64::from_be_bytes(b)
        })
    }

    /// A count of items each at least `min_size` bytes long, checked against what is left.
    fn count(&mut self, little: bool, min_size: usize, what: &str) -> Result<usize, String> {
        let n = self.u32(little)? as usize;
        let left = self.bytes.len() - self.at;
        if n.saturating_mul(min_size) > left {
            return Err(format!(
                "the WKB declares {n} {what} but only {left} bytes are left"
            ));
        }
        Ok(n)
    }

    fn geometry(&mut self, depth: usize) -> Result<Decoded, String> {
        if depth > MAX_NESTING {
            return Err(format!(
                "geometry collections are nested more than {MAX_NESTING} deep"
            ));
        }
        let little = match self.take(1)?[0] {
            0 => false,
            1 => true,
            other => return Err(format!("the WKB byte order mark is {other}, not 0 or 1")),
        };
        let code = self.u32(little)?;
        // Extended WKB (PostGIS) keeps Z and M in the high bits; ISO adds 1000, 2000 or 3000.
        let (ewkb_z, ewkb_m) = (code & 0x8000_0000 != 0, code & 0x4000_0000 != 0);
        if code & 0x2000_0000 != 0 {
            return Err("the WKB carries an embedded SRID, which GeoPackage does not allow".into());
        }
        let code = code & 0x0FFF_FFFF;
        let (base, iso) = (code % 1000, code / 1000);
        let dims = match iso {
            0 => 2,
            1 | 2 => 3,
            3 => 4,
            _ => return Err(format!("the WKB geometry type {code} is unknown")),
        } + usize::from(ewkb_z)
            + usize::from(ewkb_m);
        match base {
            3 => Ok(Decoded::Polygons(
                self.polygon(little, dims)?.into_iter().collect(),
            )),
            6 | 7 => {
                let n = self.count(little, 5, "parts")?;
                let mut polygons = Vec::new();
                let mut other = None;
                for _ in 0..n {
                    match self.geometry(depth + 1)? {
                        Decoded::Polygons(p) => polygons.extend(p),
                        Decoded::Empty => {}
                        Decoded::Other(kind) => other = Some(kind),
                    }
                }
                Ok(match (polygons.is_empty(), other) {
                    (true, Some(kind)) => Decoded::Other(kind),
                    _ => Decoded::Polygons(polygons),
                })
            }
            1 | 4 => Ok(Decoded::Other("points")),
            2 | 5 => Ok(Decoded::Other("lines")),
            8..=17 => Ok(Decoded::Other("curves")),
            _ => Err(format!("the WKB geometry type {code} is unknown")),
        }
    }

    /// A polygon: its rings, the first the exterior; `None` when it has no rings.
    fn polygon(&mut self, little: bool, dims: usize) -> Result<Option<Polygon>, String> {
        let rings = self.count(little, 4, "rings")?;
        let mut read = Vec::with_capacity(rings);
        for _ in 0..rings {
            let points = self.count(little, 8 * dims, "points")?;
            let mut ring: Vec<Point> = Vec::with_capacity(points);
            for _ in 0..points {
                let x = self.f64(little)?;
                let y = self.f64(little)?;
                for _ in 2..dims {
                    self.f64(little)?;
                }
                ring.push([x, y]);
            }
            read.push(ring);
        }
        let mut rings = read.into_iter();
        Ok(rings.next().map(|exterior| Polygon {
            exterior,
            holes: rings.collect(),
        }))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A little-endian WKB polygon from rings of (x, y).
    fn wkb_polygon(rings: &[&[(f64, f64)]]) -> Vec<u8> {
        let mut out = vec![1u8];
        out.extend(3u32.to_le_bytes());
        out.extend((rings.len() as u32).to_le_bytes());
        for ring in rings {
            out.extend((ring.len() as u32).to_le_bytes());
            for &(x, y) in *ring {
                out.extend(x.to_le_bytes());
                out.extend(y.to_le_bytes());
            }
        }
        out
    }

    fn blob(wkb: &[u8]) -> Vec<u8> {
        let mut out = b"GP".to_vec();
        out.extend([0, 0b0000_0001]);
        out.extend(4326i32.to_le_bytes());
        out.extend(wkb);
        out
    }

    const SQUARE: &[(f64, f64)] = &[(0.0, 0.0), (1.0, 0.0), (1.0, 1.0), (0.0, 1.0), (0.0, 0.0)];

    #[test]
    fn a_polygon_blob_decodes_to_its_rings() {
        let decoded = decode_blob(&blob(&wkb_polygon(&[SQUARE]))).unwrap();
        let Decoded::Polygons(p) = decoded else {
            panic!("{decoded:?}")
        };
        assert_eq!(p.len(), 1);
        assert_eq!(p[0].exterior.len(), 5);
        assert_eq!(p[0].exterior[2], [1.0, 1.0]);
    }

    #[test]
    fn big_endian_and_z_variants_decode_alike() {
        // Polygon Z (ISO code 1003), big-endian, one ring of three points and its closure.
        let mut wkb = vec![0u8];
        wkb.extend(1003u32.to_be_bytes());
        wkb.extend(1u32.to_be_bytes());
        wkb.extend(4u32.to_be_bytes());
        for (x, y) in [(0.0, 0.0), (2.0, 0.0), (0.0, 2.0), (0.0, 0.0)] {
            wkb.extend(f64::to_be_bytes(x));
            wkb.extend(f64::to_be_bytes(y));
            wkb.extend(f64::to_be_bytes(7.0));
        }
        let Decoded::Polygons(p) = decode_blob(&blob(&wkb)).unwrap() else {
            panic!()
        };
        assert_eq!(
            p[0].exterior,
            vec![[0.0, 0.0], [2.0, 0.0], [0.0, 2.0], [0.0, 0.0]]
        );
    }

    #[test]
    fn hostile_blobs_are_errors_not_panics() {
        let good = blob(&wkb_polygon(&[SQUARE]));
        // Every truncation.
        for n in 0..good.len() {
            assert!(decode_blob(&good[..n]).is_err(), "cut at {n}");
        }
        // A ring count far beyond the bytes left is refused before any allocation.
        let mut absurd = good.clone();
        absurd[8 + 5..8 + 9].copy_from_slice(&u32::MAX.to_le_bytes());
        let e = decode_blob(&absurd).unwrap_err();
        assert!(e.contains("declares"), "{e}");
        // An envelope code the standard leaves undefined.
        let mut envelope = good.clone();
        envelope[3] = 0b0000_1111;
        assert!(
            decode_blob(&envelope)
                .unwrap_err()
                .contains("envelope code")
        );
        // A header that promises an envelope the blob does not hold.
        let mut short = good[..8].to_vec();
        short[3] = 0b0000_1001;
        assert!(decode_blob(&short).unwrap_err().contains("fewer than"));
        // Deeply nested collections.
        let mut nested = Vec::new();
        for _ in 0..100 {
            nested.push(1u8);
            nested.extend(7u32.to_le_bytes());
            nested.extend(1u32.to_le_bytes());
        }
        assert!(decode_blob(&blob(&nested)).unwrap_err().contains("nested"));
    }

    #[test]
    fn points_lines_and_empty_geometries_are_named_not_read() {
        let mut point = vec![1u8];
        point.extend(1u32.to_le_bytes());
        point.extend(1.0f64.to_le_bytes());
        point.extend(2.0f64.to_le_bytes());
        assert_eq!(decode_blob(&blob(&point)), Ok(Decoded::Other("points")));
        let mut empty = blob(&[]);
        empty[3] |= 0b0001_0000;
        assert_eq!(decode_blob(&empty), Ok(Decoded::Empty));
    }
}
