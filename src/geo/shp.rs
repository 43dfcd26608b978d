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

fn shp_error(path: &Path, e: impl std::fmt::Display) -> ImportError {
    ImportError::Shapefile {
        reason: format!("{}: {e}", path.display()),
    }
}

pub(super) fn read_path(path: &Path, mode: CoordinateMode) -> Result<RawMap, ImportError> {
    if !path.exists() {
        return Err(ImportError::Io {
            path: path.to_path_buf(),
            source: std::io::Error::new(std::io::ErrorKind::NotFound, "file not found"),
        });
    }
    let mut reader = shapefile::ShapeReader::from_path(path).map_err(|e| shp_error(path, e))?;
    let mut raw = RawMap::default();

    let mut records: Vec<Option<dbase::Record>> = Vec::new();
    let dbf = path.with_extension("dbf");
    if dbf.exists() {
        // Lossy decoding: a name in a legacy code page should not stop the import.
        let mut table = dbase::ReaderBuilder::new()
            .with_encoding(dbase::encoding::UnicodeLossy)
            .open(&dbf)
            .map_err(|e| shp_error(&dbf, e))?;
        raw.field_names = table
            .fields()
            .iter()
            .map(|f| f.name().to_string())
            .collect();
        for record in table.iter_records() {
            records.push(Some(record.map_err(|e| shp_error(&dbf, e))?));
        }
    } else {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            regions: vec![],
            message: format!(
                "no {} beside the shapefile; regions are named by record number",
                dbf.display()
            ),
        });
    }

    if mode == CoordinateMode::Auto {
        let prj = path.with_extension("prj");
        if let Ok(text) = std::fs::read_to_string(&prj) {
            let text = text.trim_start().to_ascii_uppercase();
            if text.starts_with("GEOGCS") {
                raw.lon_lat_hint = Some(true);
            } else if text.starts_with("PROJCS") {
                raw.lon_lat_hint = Some(false);
            }
        }
    }

    for (index, shape) in reader.iter_shapes().enumerate() {
        let shape = shape.map_err(|e| shp_error(path, e))?;
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
                    .position(|poly| contains(&poly.exterior, *p))
            })
            .unwrap_or(fallback);
        polygons[owner].holes.push(hole);
    }
    polygons
}

/// Even-odd point-in-ring test (crossing number).
fn contains(ring: &[Point], p: Point) -> bool {
    let mut inside = false;
    for w in ring.windows(2) {
        let (a, b) = (w[0], w[1]);
        if (a[1] > p[1]) != (b[1] > p[1]) {
            let x = a[0] + (p[1] - a[1]) / (b[1] - a[1]) * (b[0] - a[0]);
            if p[0] < x {
                inside = !inside;
            }
        }
    }
    inside
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
