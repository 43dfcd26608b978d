//! GeoJSON reader (RFC 7946): FeatureCollection, Feature, Polygon, MultiPolygon, holes.
//!
//! Other geometry types (Point, LineString, ...) are skipped with a diagnostic; a feature without
//! geometry is kept as an empty region. Only a document that is not GeoJSON at all is an error.

use std::collections::BTreeMap;

use serde_json::Value;

use super::{
    Diagnostic, DiagnosticKind, ImportError, MultiPolygon, Point, Polygon, RawFeature, RawMap,
};

pub(super) fn read_value(value: &Value) -> Result<RawMap, ImportError> {
    let mut raw = RawMap::default();
    let Some(object) = value.as_object() else {
        return Err(ImportError::NotGeoJson {
            reason: "the document is not a JSON object".to_string(),
        });
    };
    let kind =
        object
            .get("type")
            .and_then(Value::as_str)
            .ok_or_else(|| ImportError::NotGeoJson {
                reason: "the top-level object has no \"type\" member".to_string(),
            })?;
    if object.contains_key("crs") {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            regions: vec![],
            message: "the \"crs\" member is not part of RFC 7946 and was ignored; coordinates \
                      are read as longitude/latitude only if they lie in that range"
                .to_string(),
        });
    }
    match kind {
        "FeatureCollection" => {
            let features = object
                .get("features")
                .and_then(Value::as_array)
                .ok_or_else(|| ImportError::NotGeoJson {
                    reason: "a FeatureCollection needs a \"features\" array".to_string(),
                })?;
            for (index, feature) in features.iter().enumerate() {
                read_feature(feature, index, &mut raw);
            }
        }
        "Feature" => read_feature(value, 0, &mut raw),
        "Polygon" | "MultiPolygon" | "GeometryCollection" | "Point" | "MultiPoint"
        | "LineString" | "MultiLineString" => {
            let mut feature = RawFeature::default();
            read_geometry(value, 0, &mut feature, &mut raw.diagnostics);
            raw.features.push(feature);
        }
        other => {
            return Err(ImportError::NotGeoJson {
                reason: format!("unknown GeoJSON type {other:?}"),
            });
        }
    }
    Ok(raw)
}

fn read_feature(value: &Value, index: usize, raw: &mut RawMap) {
    let mut feature = RawFeature {
        source_index: index,
        ..RawFeature::default()
    };
    if value.get("type").and_then(Value::as_str) != Some("Feature") {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::SkippedGeometry,
            regions: vec![],
            message: format!("member {index} of \"features\" is not a Feature; skipped"),
        });
        return;
    }
    feature.id = match value.get("id") {
        Some(Value::String(s)) => Some(s.clone()),
        Some(Value::Number(n)) => Some(n.to_string()),
        _ => None,
    };
    if let Some(Value::Object(properties)) = value.get("properties") {
        for (key, v) in properties {
            if !raw.field_names.contains(key) {
                raw.field_names.push(key.clone());
            }
            feature.properties.insert(key.clone(), v.clone());
        }
    }
    match value.get("geometry") {
        None | Some(Value::Null) => feature.geometry_missing = true,
        Some(geometry) => {
            if !read_geometry(geometry, index, &mut feature, &mut raw.diagnostics) {
                return;
            }
        }
    }
    raw.features.push(feature);
}

/// Reads a geometry into `feature.parts`. Returns false when the feature should be skipped
/// (its geometry is not polygonal at all).
fn read_geometry(
    geometry: &Value,
    index: usize,
    feature: &mut RawFeature,
    diagnostics: &mut Vec<Diagnostic>,
) -> bool {
    let kind = geometry.get("type").and_then(Value::as_str).unwrap_or("");
    let coordinates = geometry.get("coordinates");
    let label = feature_label(index, &feature.properties);
    let malformed = |diagnostics: &mut Vec<Diagnostic>, what: &str| {
        diagnostics.push(Diagnostic {
            kind: DiagnosticKind::EmptyGeometry,
            regions: vec![],
            message: format!("{label}: malformed {what} coordinates; geometry ignored"),
        });
    };
    match kind {
        "Polygon" => match coordinates.and_then(polygon) {
            Some(p) => {
                if !p.exterior.is_empty() {
                    feature.parts.push(p);
                }
                true
            }
            None => {
                malformed(diagnostics, "Polygon");
                true
            }
        },
        "MultiPolygon" => match coordinates.and_then(multi_polygon) {
            Some(parts) => {
                feature
                    .parts
                    .extend(parts.into_iter().filter(|p| !p.exterior.is_empty()));
                true
            }
            None => {
                malformed(diagnostics, "MultiPolygon");
                true
            }
        },
        "GeometryCollection" => {
            let members = geometry
                .get("geometries")
                .and_then(Value::as_array)
                .cloned()
                .unwrap_or_default();
            let mut any_polygonal = members.is_empty();
            for member in &members {
                let member_kind = member.get("type").and_then(Value::as_str).unwrap_or("");
                if matches!(
                    member_kind,
                    "Polygon" | "MultiPolygon" | "GeometryCollection"
                ) {
                    any_polygonal |= read_geometry(member, index, feature, diagnostics);
                } else {
                    diagnostics.push(Diagnostic {
                        kind: DiagnosticKind::SkippedGeometry,
                        regions: vec![],
                        message: format!(
                            "{label}: {member_kind:?} member of a GeometryCollection skipped"
                        ),
                    });
                }
            }
            any_polygonal
        }
        other => {
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::SkippedGeometry,
                regions: vec![],
                message: format!("{label}: {other:?} geometry is not a polygon; feature skipped"),
            });
            false
        }
    }
}

fn feature_label(index: usize, properties: &BTreeMap<String, Value>) -> String {
    let name = ["name", "NAME", "Name"]
        .iter()
        .find_map(|k| properties.get(*k).and_then(Value::as_str));
    match name {
        Some(n) => format!("feature {index} ({n:?})"),
        None => format!("feature {index}"),
    }
}

fn position(value: &Value) -> Option<Point> {
    let array = value.as_array()?;
    // RFC 7946 section 3.1.1: two or more numbers; an altitude is ignored.
    if array.len() < 2 {
        return None;
    }
    Some([array[0].as_f64()?, array[1].as_f64()?])
}

fn ring(value: &Value) -> Option<Vec<Point>> {
    value.as_array()?.iter().map(position).collect()
}

fn polygon(value: &Value) -> Option<Polygon> {
    let rings: Vec<Vec<Point>> = value.as_array()?.iter().map(ring).collect::<Option<_>>()?;
    let mut rings = rings.into_iter();
    Some(Polygon {
        exterior: rings.next().unwrap_or_default(),
        holes: rings.collect(),
    })
}

fn multi_polygon(value: &Value) -> Option<MultiPolygon> {
    value.as_array()?.iter().map(polygon).collect()
}
