//! GeoJSON reader (RFC 7946): FeatureCollection, Feature, Polygon, MultiPolygon, holes.
//!
//! Other geometry types (Point, LineString, ...) are skipped with a diagnostic; a feature without
//! geometry is kept as an empty region. Only a document that is not GeoJSON at all is an error.
//!
//! A FeatureCollection is read one feature at a time ([`read_streaming`]): each feature becomes
//! a small JSON tree, is turned into coordinates and dropped, so a large file never exists as one
//! tree (which costs about ten times the file's size).

use std::fmt;

use serde::de::{DeserializeSeed, Deserializer, MapAccess, SeqAccess, Visitor};
use serde_json::Value;

use super::{
    Diagnostic, DiagnosticKind, ImportError, MultiPolygon, Point, Polygon, Properties, RawFeature,
    RawMap,
};

/// What a streamed document turned out to be.
pub(super) enum Streamed {
    /// A GeoJSON FeatureCollection, already read feature by feature.
    Features(RawMap),
    /// Anything else (a single Feature or geometry, TopoJSON): the whole tree, to be read as before.
    Whole(Value),
}

/// Reads a JSON document from `bytes`, streaming the members of a FeatureCollection's `features`
/// one at a time. Errors in the JSON itself come back as serde_json errors, with their line and
/// column.
pub(super) fn read_streaming(bytes: &[u8]) -> Result<Streamed, serde_json::Error> {
    read_from(serde_json::Deserializer::from_slice(bytes))
}

/// Like [`read_streaming`], from a reader: the file's text is never held whole (on a large map
/// it would be as much memory again as everything read from it).
pub(super) fn read_streaming_from(
    reader: impl std::io::Read,
) -> Result<Streamed, serde_json::Error> {
    read_from(serde_json::Deserializer::from_reader(reader))
}

fn read_from<'de, R: serde_json::de::Read<'de>>(
    mut de: serde_json::Deserializer<R>,
) -> Result<Streamed, serde_json::Error> {
    let streamed = TopLevel.deserialize(&mut de)?;
    de.end()?;
    Ok(streamed)
}

/// The top-level object: members in any order; `features` read element by element.
struct TopLevel;

impl<'de> DeserializeSeed<'de> for TopLevel {
    type Value = Streamed;
    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<Streamed, D::Error> {
        d.deserialize_any(self)
    }
}

impl<'de> Visitor<'de> for TopLevel {
    type Value = Streamed;

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("a JSON document")
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Streamed, A::Error> {
        let mut others = serde_json::Map::new();
        let mut raw = RawMap::default();
        let mut streamed = false;
        while let Some(key) = map.next_key::<String>()? {
            if key == "features" {
                streamed = true;
                map.next_value_seed(Features { raw: &mut raw })?;
            } else {
                let value: Value = map.next_value()?;
                others.insert(key, value);
            }
        }
        let is_collection = others.get("type").and_then(Value::as_str) == Some("FeatureCollection");
        if streamed && is_collection {
            if others.contains_key("crs") {
                raw.diagnostics.insert(0, crs_note());
            }
            Ok(Streamed::Features(raw))
        } else {
            // Not a FeatureCollection (or one without features): read as a whole, as before.
            // A "features" member of anything else carries no meaning here and was dropped.
            Ok(Streamed::Whole(Value::Object(others)))
        }
    }

    // Any other JSON value: kept whole, so the reader says why it is not GeoJSON.
    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Streamed, A::Error> {
        let mut items = Vec::new();
        while let Some(v) = seq.next_element::<Value>()? {
            items.push(v);
        }
        Ok(Streamed::Whole(Value::Array(items)))
    }
    fn visit_str<E>(self, v: &str) -> Result<Streamed, E> {
        Ok(Streamed::Whole(Value::String(v.to_string())))
    }
    fn visit_bool<E>(self, v: bool) -> Result<Streamed, E> {
        Ok(Streamed::Whole(Value::Bool(v)))
    }
    fn visit_i64<E>(self, v: i64) -> Result<Streamed, E> {
        Ok(Streamed::Whole(Value::from(v)))
    }
    fn visit_u64<E>(self, v: u64) -> Result<Streamed, E> {
        Ok(Streamed::Whole(Value::from(v)))
    }
    fn visit_f64<E>(self, v: f64) -> Result<Streamed, E> {
        Ok(Streamed::Whole(Value::from(v)))
    }
    fn visit_unit<E>(self) -> Result<Streamed, E> {
        Ok(Streamed::Whole(Value::Null))
    }
}

/// The `features` array: each element read as a small tree, turned into a feature, dropped.
struct Features<'a> {
    raw: &'a mut RawMap,
}

impl<'de> DeserializeSeed<'de> for Features<'_> {
    type Value = ();
    fn deserialize<D: Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_any(self)
    }
}

impl<'de> Visitor<'de> for Features<'_> {
    type Value = ();

    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("an array of features")
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<(), A::Error> {
        let mut index = 0;
        while let Some(feature) = seq.next_element::<Value>()? {
            read_feature(&feature, index, self.raw);
            index += 1;
        }
        Ok(())
    }

    // Not an array: the reader reports it as it always did.
    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        while map
            .next_entry::<serde::de::IgnoredAny, serde::de::IgnoredAny>()?
            .is_some()
        {}
        self.raw.not_an_array = true;
        Ok(())
    }
    fn visit_str<E>(self, _: &str) -> Result<(), E> {
        self.raw.not_an_array = true;
        Ok(())
    }
    fn visit_bool<E>(self, _: bool) -> Result<(), E> {
        self.raw.not_an_array = true;
        Ok(())
    }
    fn visit_i64<E>(self, _: i64) -> Result<(), E> {
        self.raw.not_an_array = true;
        Ok(())
    }
    fn visit_u64<E>(self, _: u64) -> Result<(), E> {
        self.raw.not_an_array = true;
        Ok(())
    }
    fn visit_f64<E>(self, _: f64) -> Result<(), E> {
        self.raw.not_an_array = true;
        Ok(())
    }
    fn visit_unit<E>(self) -> Result<(), E> {
        self.raw.not_an_array = true;
        Ok(())
    }
}

fn crs_note() -> Diagnostic {
    Diagnostic {
        kind: DiagnosticKind::File,
        regions: vec![],
        message: "the \"crs\" member is not part of RFC 7946 and was ignored; coordinates \
                  are read as longitude/latitude only if they lie in that range"
            .to_string(),
    }
}

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
        raw.diagnostics.push(crs_note());
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
        feature.properties.0.reserve_exact(properties.len());
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
    feature.parts.shrink_to_fit();
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

fn feature_label(index: usize, properties: &Properties) -> String {
    let name = ["name", "NAME", "Name"]
        .iter()
        .find_map(|k| properties.get(k).and_then(Value::as_str));
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

// The collections below are sized from the JSON arrays: collected through `Option` they would
// grow by doubling (a ring of nine positions would keep room for sixteen), which on a
// million-feature file is hundreds of megabytes of slack.

fn ring(value: &Value) -> Option<Vec<Point>> {
    let array = value.as_array()?;
    let mut out = Vec::with_capacity(array.len());
    for v in array {
        out.push(position(v)?);
    }
    Some(out)
}

fn polygon(value: &Value) -> Option<Polygon> {
    let array = value.as_array()?;
    let (exterior, holes) = match array.split_first() {
        Some((exterior, holes)) => (ring(exterior)?, holes),
        None => (Vec::new(), &[][..]),
    };
    let mut out = Polygon {
        exterior,
        holes: Vec::with_capacity(holes.len()),
    };
    for hole in holes {
        out.holes.push(ring(hole)?);
    }
    Some(out)
}

fn multi_polygon(value: &Value) -> Option<MultiPolygon> {
    let array = value.as_array()?;
    let mut out = Vec::with_capacity(array.len());
    for v in array {
        out.push(polygon(v)?);
    }
    Some(out)
}
