//! FlatGeobuf reading (flatgeobuf.org specification, version 3): the `flatgeobuf` crate's
//! FlatBuffers tables, verified before use, walked here so that every size the file declares is
//! checked against the bytes present.
//!
//! Layout: the magic bytes, a size-prefixed header (geometry type, columns, coordinate system,
//! feature count, index node size), an optional packed Hilbert R-tree, then size-prefixed
//! features. Polygons and multi-polygons become regions (a ring's end offsets split `xy`); points
//! and lines are skipped with a note. Properties are decoded here from the column list (the crate's
//! own decoder trusts the value lengths, and a damaged file would make it panic).

use std::path::Path;

use flatgeobuf::{ColumnType, GeometryType};
use serde_json::Value;

use super::{
    CoordinateMode, Crs, Diagnostic, DiagnosticKind, ImportError, Point, Polygon, RawFeature,
    RawMap,
};

fn error(reason: impl Into<String>) -> ImportError {
    ImportError::FlatGeobuf {
        reason: reason.into(),
    }
}

pub(super) fn read_path(path: &Path, mode: CoordinateMode) -> Result<RawMap, ImportError> {
    let bytes = std::fs::read(path).map_err(|source| ImportError::Io {
        path: path.to_path_buf(),
        source,
    })?;
    read_bytes(&bytes, mode)
}

/// A little cursor over the file that refuses to run past its end.
struct Bytes<'a> {
    all: &'a [u8],
    at: usize,
}

impl<'a> Bytes<'a> {
    fn take(&mut self, n: usize, what: &str) -> Result<&'a [u8], ImportError> {
        let left = self.all.len() - self.at;
        if n > left {
            return Err(error(format!(
                "{what} needs {n} bytes at byte {} but the file has only {left} more (is it \
                 truncated?)",
                self.at
            )));
        }
        let out = &self.all[self.at..self.at + n];
        self.at += n;
        Ok(out)
    }

    fn u32(&mut self, what: &str) -> Result<usize, ImportError> {
        let b = self.take(4, what)?;
        Ok(u32::from_le_bytes([b[0], b[1], b[2], b[3]]) as usize)
    }
}

/// The size in bytes of the packed R-tree of `items` features with `node_size` children per
/// node (each node 40 bytes: four coordinates and an offset), or `None` if it overflows.
fn index_size(items: u64, node_size: u16) -> Option<u64> {
    if node_size == 0 || items == 0 {
        return Some(0);
    }
    let node_size = u64::from(node_size.max(2));
    let (mut n, mut nodes) = (items, items);
    while n > 1 {
        n = n.div_ceil(node_size);
        nodes = nodes.checked_add(n)?;
    }
    nodes.checked_mul(40)
}

pub(super) fn read_bytes(all: &[u8], mode: CoordinateMode) -> Result<RawMap, ImportError> {
    let mut bytes = Bytes { all, at: 0 };
    let magic = bytes
        .take(8, "the magic bytes")
        .map_err(|_| error("not a FlatGeobuf file: it is shorter than the 8 magic bytes"))?;
    if &magic[..3] != b"fgb" || &magic[4..7] != b"fgb" {
        return Err(error(
            "not a FlatGeobuf file: it does not start with \"fgb\"",
        ));
    }
    if magic[3] != flatgeobuf::VERSION {
        return Err(error(format!(
            "FlatGeobuf version {} is not supported (Tinct reads version {})",
            magic[3],
            flatgeobuf::VERSION
        )));
    }
    let header_start = bytes.at;
    let header_size = bytes.u32("the header size")?;
    bytes.take(header_size, "the header")?;
    let header = flatgeobuf::size_prefixed_root_as_header(&all[header_start..bytes.at])
        .map_err(|e| error(format!("the header is damaged: {e}")))?;

    let mut raw = RawMap::default();
    if let Some(crs) = header.crs() {
        let org = crs.org().unwrap_or("EPSG");
        let epsg = (org.eq_ignore_ascii_case("EPSG") && crs.code() > 0)
            .then(|| u32::try_from(crs.code()).ok())
            .flatten();
        let wkt = crs
            .wkt()
            .map(str::to_string)
            .filter(|w| !w.trim().is_empty());
        raw.note_coordinate_system(
            mode,
            Crs {
                name: crs.name().unwrap_or_default().to_string(),
                epsg,
                wkt,
            },
        );
    }
    let columns: Vec<(String, ColumnType)> = header
        .columns()
        .map(|c| {
            c.iter()
                .map(|c| (c.name().to_string(), c.type_()))
                .collect()
        })
        .unwrap_or_default();
    raw.field_names = columns.iter().map(|c| c.0.clone()).collect();

    let declared = header.features_count();
    let index = index_size(declared, header.index_node_size())
        .and_then(|n| usize::try_from(n).ok())
        .ok_or_else(|| error(format!("the header declares {declared} features, too many")))?;
    bytes.take(index, "the spatial index")?;

    let layer_type = header.geometry_type();
    let mut skipped = 0usize;
    let mut index = 0usize;
    while bytes.at < all.len() {
        let start = bytes.at;
        let size = bytes.u32("a feature's size")?;
        bytes.take(size, &format!("feature {}", index + 1))?;
        let feature = flatgeobuf::size_prefixed_root_as_feature(&all[start..bytes.at])
            .map_err(|e| error(format!("feature {} is damaged: {e}", index + 1)))?;
        let mut out = RawFeature {
            source_index: index,
            ..RawFeature::default()
        };
        if let Some(properties) = feature.properties() {
            read_properties(properties.bytes(), &columns, &mut out)
                .map_err(|e| error(format!("feature {}: {e}", index + 1)))?;
        }
        match feature.geometry() {
            None => out.geometry_missing = true,
            Some(geometry) => {
                let kind = if layer_type == GeometryType::Unknown {
                    geometry.type_()
                } else {
                    layer_type
                };
                match polygons(&geometry, kind, 0)
                    .map_err(|e| error(format!("feature {}: {e}", index + 1)))?
                {
                    Some(parts) => out.parts = parts,
                    None => {
                        skipped += 1;
                        index += 1;
                        continue;
                    }
                }
            }
        }
        raw.features.push(out);
        index += 1;
    }
    if skipped > 0 {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::SkippedGeometry,
            regions: vec![],
            message: format!("{skipped} feature(s) are not polygons and were skipped"),
        });
    }
    if declared != 0 && declared != index as u64 {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            regions: vec![],
            message: format!("the header declares {declared} features but the file holds {index}"),
        });
    }
    Ok(raw)
}

/// The polygons of a geometry, or `None` for points and lines.
fn polygons(
    geometry: &flatgeobuf::Geometry<'_>,
    kind: GeometryType,
    depth: usize,
) -> Result<Option<Vec<Polygon>>, String> {
    if depth > 16 {
        return Err("geometry collections are nested more than 16 deep".into());
    }
    match kind {
        GeometryType::Polygon => Ok(Some(polygon(geometry)?.into_iter().collect())),
        GeometryType::MultiPolygon | GeometryType::GeometryCollection => {
            let mut out = Vec::new();
            let mut any = false;
            for part in geometry.parts().iter().flatten() {
                let part_kind = if kind == GeometryType::MultiPolygon {
                    GeometryType::Polygon
                } else {
                    part.type_()
                };
                if let Some(p) = polygons(&part, part_kind, depth + 1)? {
                    any = true;
                    out.extend(p);
                }
            }
            Ok((any || kind == GeometryType::MultiPolygon).then_some(out))
        }
        _ => Ok(None),
    }
}

/// One polygon: `xy` holds the positions, `ends` where each ring stops (one ring when absent).
fn polygon(geometry: &flatgeobuf::Geometry<'_>) -> Result<Option<Polygon>, String> {
    let Some(xy) = geometry.xy() else {
        return Ok(None);
    };
    let points = xy.len() / 2;
    let ends: Vec<usize> = match geometry.ends() {
        Some(ends) => ends.iter().map(|e| e as usize).collect(),
        None => vec![points],
    };
    let mut rings: Vec<Vec<Point>> = Vec::with_capacity(ends.len());
    let mut start = 0;
    for end in ends {
        if end < start || end > points {
            return Err(format!(
                "a ring ends at position {end}, outside the {points} positions of its polygon"
            ));
        }
        rings.push(
            (start..end)
                .map(|i| [xy.get(2 * i), xy.get(2 * i + 1)])
                .collect(),
        );
        start = end;
    }
    let mut rings = rings.into_iter();
    Ok(rings.next().map(|exterior| Polygon {
        exterior,
        holes: rings.collect(),
    }))
}

/// Decodes a feature's properties: pairs of a column index (u16) and a value whose encoding
/// the column's type gives (fixed-size little-endian numbers; strings, JSON, dates and binary
/// with a u32 length first).
fn read_properties(
    bytes: &[u8],
    columns: &[(String, ColumnType)],
    out: &mut RawFeature,
) -> Result<(), String> {
    let mut at = 0;
    let take = |at: &mut usize, n: usize| -> Result<&[u8], String> {
        let end = at
            .checked_add(n)
            .filter(|&e| e <= bytes.len())
            .ok_or_else(|| format!("a property runs past the end of its {} bytes", bytes.len()))?;
        let slice = &bytes[*at..end];
        *at = end;
        Ok(slice)
    };
    while at < bytes.len() {
        let i = take(&mut at, 2)?;
        let column = usize::from(u16::from_le_bytes([i[0], i[1]]));
        let Some((name, kind)) = columns.get(column) else {
            return Err(format!(
                "a property names column {column}, but the header lists {}",
                columns.len()
            ));
        };
        let fixed = |at: &mut usize, n: usize| take(at, n).map(<[u8]>::to_vec);
        let value = match *kind {
            ColumnType::Byte => Value::from(fixed(&mut at, 1)?[0] as i8),
            ColumnType::UByte => Value::from(fixed(&mut at, 1)?[0]),
            ColumnType::Bool => Value::Bool(fixed(&mut at, 1)?[0] != 0),
            ColumnType::Short => {
                let b = fixed(&mut at, 2)?;
                Value::from(i16::from_le_bytes([b[0], b[1]]))
            }
            ColumnType::UShort => {
                let b = fixed(&mut at, 2)?;
                Value::from(u16::from_le_bytes([b[0], b[1]]))
            }
            ColumnType::Int => {
                let b = fixed(&mut at, 4)?;
                Value::from(i32::from_le_bytes([b[0], b[1], b[2], b[3]]))
            }
            ColumnType::UInt => {
                let b = fixed(&mut at, 4)?;
                Value::from(u32::from_le_bytes([b[0], b[1], b[2], b[3]]))
            }
            ColumnType::Long => {
                let b: [u8; 8] = fixed(&mut at, 8)?.try_into().map_err(|_| "short")?;
                Value::from(i64::from_le_bytes(b))
            }
            ColumnType::ULong => {
                let b: [u8; 8] = fixed(&mut at, 8)?.try_into().map_err(|_| "short")?;
                Value::from(u64::from_le_bytes(b))
            }
            ColumnType::Float => {
                let b = fixed(&mut at, 4)?;
                number(f64::from(f32::from_le_bytes([b[0], b[1], b[2], b[3]])))
            }
            ColumnType::Double => {
                let b: [u8; 8] = fixed(&mut at, 8)?.try_into().map_err(|_| "short")?;
                number(f64::from_le_bytes(b))
            }
            ColumnType::String | ColumnType::Json | ColumnType::DateTime => {
                let n = fixed(&mut at, 4)?;
                let n = u32::from_le_bytes([n[0], n[1], n[2], n[3]]) as usize;
                Value::String(String::from_utf8_lossy(take(&mut at, n)?).into_owned())
            }
            ColumnType::Binary => {
                let n = fixed(&mut at, 4)?;
                let n = u32::from_le_bytes([n[0], n[1], n[2], n[3]]) as usize;
                take(&mut at, n)?;
                continue;
            }
            other => return Err(format!("column {name:?} has an unknown type {}", other.0)),
        };
        out.properties.insert(name.clone(), value);
    }
    Ok(())
}

fn number(f: f64) -> Value {
    serde_json::Number::from_f64(f).map_or(Value::Null, Value::Number)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_index_size_follows_the_packed_tree_layout() {
        // One node per item plus the levels above: 10 items, 4 per node: 10 + 3 + 1 nodes.
        assert_eq!(index_size(10, 4), Some(14 * 40));
        assert_eq!(index_size(1, 16), Some(40));
        assert_eq!(index_size(0, 16), Some(0));
        assert_eq!(index_size(5, 0), Some(0));
        assert_eq!(index_size(u64::MAX, 2), None);
        // The crate's own computation agrees.
        assert_eq!(
            index_size(1000, 16),
            Some(flatgeobuf::packed_r_tree::PackedRTree::index_size(1000, 16) as u64)
        );
    }

    #[test]
    fn properties_that_run_past_their_bytes_are_errors() {
        let columns = vec![("name".to_string(), ColumnType::String)];
        let mut f = RawFeature::default();
        // Column 0, a string of length 200 with 3 bytes present.
        let mut bytes = vec![0, 0];
        bytes.extend(200u32.to_le_bytes());
        bytes.extend(b"abc");
        assert!(read_properties(&bytes, &columns, &mut f).is_err());
        // Column 5 does not exist.
        assert!(read_properties(&[5, 0, 0, 0, 0, 0], &columns, &mut f).is_err());
        // A sound one.
        let mut good = vec![0, 0];
        good.extend(3u32.to_le_bytes());
        good.extend(b"Ada");
        read_properties(&good, &columns, &mut f).unwrap();
        assert_eq!(f.properties.get("name"), Some(&Value::from("Ada")));
    }
}
