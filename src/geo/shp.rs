//! Shapefile reader (ESRI Shapefile Technical Description, July 1998): .shp geometry, .dbf names.
//!
//! Uses the `shapefile` crate for the binary records. Polygon rings come as outer rings
//! (clockwise in the file) and holes (anticlockwise); each hole is given to the outer ring that
//! contains it. A `.prj` beside the file tells longitude/latitude (`GEOGCS`) from projected
//! (`PROJCS`) coordinates; without one, the coordinate range decides.

use std::path::Path;

use serde_json::Value;
use shapefile::dbase;

use super::{
    CoordinateMode, Diagnostic, DiagnosticKind, ImportError, Point, Polygon, RawFeature, RawMap,
};

fn shp_error(label: &str, e: impl std::fmt::Display) -> ImportError {
    ImportError::Shapefile {
        reason: format!("{label}: {e}"),
    }
}

/// The shape types whose records hold a bounding box, a part count and a point count
/// (PolyLine, Polygon, and their Z and M forms), as listed in the technical description, table 1.
const MULTI_PART_TYPES: [i32; 6] = [3, 5, 13, 15, 23, 25];
/// MultiPoint and its Z and M forms: a bounding box and a point count.
const MULTI_POINT_TYPES: [i32; 3] = [8, 18, 28];
/// MultiPatch: like a polygon, with a part type per part.
const MULTI_PATCH: i32 = 31;

fn be_i32(bytes: &[u8], at: usize) -> Option<i32> {
    Some(i32::from_be_bytes(bytes.get(at..at + 4)?.try_into().ok()?))
}

fn le_i32(bytes: &[u8], at: usize) -> Option<i32> {
    Some(i32::from_le_bytes(bytes.get(at..at + 4)?.try_into().ok()?))
}

/// Walks the record headers of a .shp before any record is decoded, so that no count declared in
/// the file is trusted: every record must fit in the bytes that are actually there, and every part
/// and point count must fit in its record. The `shapefile` crate reserves memory for the declared
/// counts, so a 100-byte file claiming two billion points would otherwise ask for 32 GB. Returns
/// each record's content as a byte range; each is then decoded on its own, so a record that says
/// less than it holds cannot make the decoder read the next record's bytes as counts.
fn check_structure(bytes: &[u8], label: &str) -> Result<Vec<std::ops::Range<usize>>, ImportError> {
    const HEADER: usize = 100;
    if bytes.len() < HEADER {
        return Err(shp_error(
            label,
            format!(
                "the file has {} bytes, fewer than the 100-byte header; is it truncated?",
                bytes.len()
            ),
        ));
    }
    if be_i32(bytes, 0) != Some(9994) {
        return Err(shp_error(
            label,
            "the file does not start with the shapefile code 9994: it is not a .shp file",
        ));
    }
    // The header gives the length in 16-bit words; the records end there or at the end of the bytes.
    let declared = be_i32(bytes, 24).unwrap_or(0).max(0) as u64 * 2;
    let end = (declared.min(bytes.len() as u64)) as usize;
    let mut at = HEADER;
    let mut record = 0usize;
    let mut contents = Vec::new();
    while at + 8 <= end {
        record += 1;
        let words = be_i32(bytes, at + 4).unwrap_or(-1);
        if words < 0 {
            return Err(shp_error(
                label,
                format!("record {record} (byte {at}) declares a negative length ({words} words)"),
            ));
        }
        let length = words as u64 * 2;
        let content = at + 8;
        if content as u64 + length > bytes.len() as u64 {
            return Err(shp_error(
                label,
                format!(
                    "record {record} (byte {at}) declares {length} bytes, but only {} remain; \
                     is the file truncated?",
                    bytes.len() - content
                ),
            ));
        }
        let length = length as usize;
        let shape_type = le_i32(bytes, content).filter(|_| length >= 4);
        // Bytes the declared counts need: fixed part + per-part + per-point sizes.
        let needed = |fixed: usize, count_at: usize, per_part: u64, has_parts: bool| {
            if length < fixed {
                return Err(shp_error(
                    label,
                    format!(
                        "record {record} (byte {at}) is {length} bytes long, too short for its shape type"
                    ),
                ));
            }
            let (parts, points) = if has_parts {
                (
                    le_i32(bytes, content + count_at).unwrap_or(-1),
                    le_i32(bytes, content + count_at + 4).unwrap_or(-1),
                )
            } else {
                (0, le_i32(bytes, content + count_at).unwrap_or(-1))
            };
            if parts < 0 || points < 0 {
                return Err(shp_error(
                    label,
                    format!("record {record} (byte {at}) declares a negative part or point count"),
                ));
            }
            let need = fixed as u64 + parts as u64 * per_part + points as u64 * 16;
            if need > length as u64 {
                return Err(shp_error(
                    label,
                    format!(
                        "record {record} (byte {at}) declares {parts} parts and {points} points, \
                         which need {need} bytes, but the record holds {length}"
                    ),
                ));
            }
            // Each part starts at a point index; the decoder sizes a part by the difference of
            // two starts, so they must rise from 0 and stay within the point count.
            let mut previous = 0;
            for k in 0..parts as usize {
                let start = le_i32(bytes, content + count_at + 8 + 4 * k).unwrap_or(-1);
                if (k == 0 && start != 0) || start < previous || start > points {
                    return Err(shp_error(
                        label,
                        format!(
                            "record {record} (byte {at}): part {} starts at point {start}, \
                             outside 0..={points} or before the part ahead of it",
                            k + 1
                        ),
                    ));
                }
                previous = start;
            }
            Ok(())
        };
        match shape_type {
            Some(t) if MULTI_PART_TYPES.contains(&t) => needed(44, 36, 4, true)?,
            Some(t) if MULTI_POINT_TYPES.contains(&t) => needed(40, 36, 0, false)?,
            Some(MULTI_PATCH) => needed(44, 36, 8, true)?,
            _ => {}
        }
        contents.push(content..content + length);
        at = content + length;
    }
    if at < end || declared > bytes.len() as u64 {
        return Err(shp_error(
            label,
            format!(
                "the header declares {declared} bytes but the file ends at byte {} (after {record} \
                 whole records); is it truncated?",
                bytes.len().min(end.max(at))
            ),
        ));
    }
    Ok(contents)
}

/// How many .dbf records really fit in the file: the header's record count is not trusted, so
/// that a short file declaring four billion records is not read four billion times.
fn dbf_records_present(bytes: &[u8], label: &str) -> Result<(u64, u64), ImportError> {
    if bytes.len() < 32 {
        return Err(shp_error(
            label,
            format!(
                "the file has {} bytes, fewer than the 32-byte dBASE header; is it truncated?",
                bytes.len()
            ),
        ));
    }
    let declared = u32::from_le_bytes([bytes[4], bytes[5], bytes[6], bytes[7]]) as u64;
    let header = u16::from_le_bytes([bytes[8], bytes[9]]) as u64;
    let record = u16::from_le_bytes([bytes[10], bytes[11]]) as u64;
    if record == 0 {
        return Err(shp_error(
            label,
            "the dBASE header declares records of 0 bytes; a record holds at least its deletion flag",
        ));
    }
    let fit = (bytes.len() as u64).saturating_sub(header) / record;
    Ok((declared, declared.min(fit)))
}

pub(super) fn read_path(path: &Path, mode: CoordinateMode) -> Result<RawMap, ImportError> {
    let read = |p: &Path| {
        std::fs::read(p).map_err(|source| ImportError::Io {
            path: p.to_path_buf(),
            source,
        })
    };
    let shp = read(path)?;
    let dbf_path = path.with_extension("dbf");
    let dbf = if dbf_path.exists() {
        Some(read(&dbf_path)?)
    } else {
        None
    };
    let prj = std::fs::read(path.with_extension("prj")).ok();
    let files = Files {
        shp: &shp,
        dbf: dbf.as_deref(),
        prj: prj.as_deref(),
        shp_label: path.display().to_string(),
        dbf_label: dbf_path.display().to_string(),
    };
    read_files(&files, mode)
}

/// The three files of a shapefile, in memory, with the names errors use for them.
pub(super) struct Files<'a> {
    pub shp: &'a [u8],
    pub dbf: Option<&'a [u8]>,
    pub prj: Option<&'a [u8]>,
    pub shp_label: String,
    pub dbf_label: String,
}

pub(super) fn read_files(files: &Files, mode: CoordinateMode) -> Result<RawMap, ImportError> {
    let (path, dbf_label) = (files.shp_label.as_str(), files.dbf_label.as_str());
    let contents = check_structure(files.shp, path)?;
    // The crate checks the header (file code, version, shape type); records are decoded below.
    shapefile::ShapeReader::new(std::io::Cursor::new(files.shp)).map_err(|e| shp_error(path, e))?;
    let mut raw = RawMap::default();

    let mut records: Vec<Option<dbase::Record>> = Vec::new();
    if let Some(dbf) = files.dbf {
        let (declared, present) = dbf_records_present(dbf, dbf_label)?;
        // Lossy decoding: a name in a legacy code page should not stop the import.
        let mut table = dbase::ReaderBuilder::new()
            .with_encoding(dbase::encoding::UnicodeLossy)
            .build(std::io::Cursor::new(dbf))
            .map_err(|e| shp_error(dbf_label, e))?;
        raw.field_names = table
            .fields()
            .iter()
            .map(|f| f.name().to_string())
            .collect();
        for record in table.iter_records().take(present as usize) {
            records.push(Some(record.map_err(|e| shp_error(dbf_label, e))?));
        }
        if present < declared {
            raw.diagnostics.push(Diagnostic {
                kind: DiagnosticKind::File,
                regions: vec![],
                message: format!(
                    "{dbf_label} declares {declared} records but holds only {present}; \
                     is it truncated?"
                ),
            });
        }
    } else {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            regions: vec![],
            message: format!(
                "no {dbf_label} beside the shapefile; regions are named by record number"
            ),
        });
    }

    if let Some(prj) = files.prj {
        let wkt = String::from_utf8_lossy(prj).trim().to_string();
        // The name is the first quoted string: PROJCS["NAD_1983_Albers", ...].
        let name = wkt.split('"').nth(1).unwrap_or_default().to_string();
        raw.note_coordinate_system(
            mode,
            super::Crs {
                name,
                epsg: None,
                wkt: Some(wkt),
            },
        );
    }

    for (index, range) in contents.into_iter().enumerate() {
        let record_error = |e: &dyn std::fmt::Display| {
            shp_error(
                path,
                format!("record {} (byte {}): {e}", index + 1, range.start - 8),
            )
        };
        let size = i32::try_from(range.len()).map_err(|e| record_error(&e))?;
        let mut source = std::io::Cursor::new(&files.shp[range.clone()]);
        let shape =
            <shapefile::Shape as shapefile::record::ReadableShape>::read_from(&mut source, size)
                .map_err(|e| record_error(&e))?;
        let mut feature = RawFeature {
            source_index: index,
            ..RawFeature::default()
        };
        if let Some(Some(record)) = records.get(index) {
            for (name, value) in record.clone() {
                feature.properties.insert(name, field_value(value));
            }
        }
        let rings: Vec<(bool, Vec<Point>)> = match shape {
            shapefile::Shape::NullShape => {
                feature.geometry_missing = true;
                Vec::new()
            }
            shapefile::Shape::Polygon(p) => rings_of(p.into_inner(), |q| [q.x, q.y]),
            shapefile::Shape::PolygonM(p) => rings_of(p.into_inner(), |q| [q.x, q.y]),
            shapefile::Shape::PolygonZ(p) => rings_of(p.into_inner(), |q| [q.x, q.y]),
            other => {
                raw.diagnostics.push(Diagnostic {
                    kind: DiagnosticKind::SkippedGeometry,
                    regions: vec![],
                    message: format!(
                        "record {index}: {} is not a polygon; skipped",
                        other.shapetype()
                    ),
                });
                continue;
            }
        };
        feature.parts = assemble(rings);
        raw.features.push(feature);
    }
    if !records.is_empty() && records.len() != raw.features.len() {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            regions: vec![],
            message: format!(
                "the .dbf has {} records but the .shp has {} shapes",
                records.len(),
                raw.features.len()
            ),
        });
    }
    Ok(raw)
}

fn rings_of<P>(
    rings: Vec<shapefile::PolygonRing<P>>,
    xy: impl Fn(&P) -> Point,
) -> Vec<(bool, Vec<Point>)> {
    rings
        .into_iter()
        .map(|ring| {
            let outer = matches!(ring, shapefile::PolygonRing::Outer(_));
            (outer, ring.points().iter().map(&xy).collect())
        })
        .collect()
}

/// Gives each hole to the first outer ring containing its first position (else the last outer
/// ring before it, as files usually list a polygon's holes right after its outer ring).
fn assemble(rings: Vec<(bool, Vec<Point>)>) -> Vec<Polygon> {
    let mut polygons: Vec<Polygon> = Vec::new();
    let mut holes: Vec<(usize, Vec<Point>)> = Vec::new();
    for (outer, ring) in rings {
        if outer || polygons.is_empty() {
            polygons.push(Polygon {
                exterior: ring,
                holes: Vec::new(),
            });
        } else {
            holes.push((polygons.len() - 1, ring));
        }
    }
    for (fallback, hole) in holes {
        let owner = hole
            .first()
            .and_then(|p| {
                polygons
                    .iter()
                    .position(|poly| crate::geometry::point_in_ring(&poly.exterior, *p))
            })
            .unwrap_or(fallback);
        polygons[owner].holes.push(hole);
    }
    polygons
}

fn field_value(value: dbase::FieldValue) -> Value {
    use dbase::FieldValue as F;
    let number = |f: f64| {
        if f.fract() == 0.0 && f.abs() < 9.0e15 {
            Value::from(f as i64)
        } else {
            serde_json::Number::from_f64(f).map_or(Value::Null, Value::Number)
        }
    };
    match value {
        F::Character(Some(s)) => Value::String(s.trim().to_string()),
        F::Numeric(Some(f)) | F::Double(f) | F::Currency(f) => number(f),
        F::Float(Some(f)) => number(f64::from(f)),
        F::Integer(i) => Value::from(i),
        F::Logical(Some(b)) => Value::Bool(b),
        F::Date(Some(d)) => Value::String(d.to_string()),
        F::Memo(s) => Value::String(s),
        F::Character(None)
        | F::Numeric(None)
        | F::Float(None)
        | F::Logical(None)
        | F::Date(None) => Value::Null,
        other => Value::String(format!("{other:?}")),
    }
}
