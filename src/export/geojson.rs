//! GeoJSON export (RFC 7946): one feature per region, in longitude/latitude on WGS 84, with the
//! region's imported properties kept and Tinct's added:
//! - `name`: the region's name in Tinct (replacing an imported `name`, since the user may have
//!   renamed it);
//! - `tinct_id`: Tinct's region id (also the feature's `id`);
//! - `tinct_colour`: the palette slot, 0-based as in project files, or null when uncoloured or water;
//! - `tinct_fill`: that slot's colour as `#rrggbb`, or null;
//! - `tinct_group`: the same-colour group's name, or null; `tinct_pinned`: whether the colour is fixed.
//!
//! Imported geographic maps are kept in metres (Lambert azimuthal equal-area, see
//! [`crate::geo::project`]); the export applies the inverse projection about the centre recorded at
//! import ([`crate::doc::Settings::projection_origin`]). The sphere's latitude is written as WGS 84
//! latitude, as the import read WGS 84 latitude onto the sphere, so coordinates come back as they were
//! read, to rounding (7 decimals, about 1 cm).
//!
//! Maps without a position on the globe (sketches, planar data, projects saved before Tinct
//! recorded the projection) are refused with an explanation: RFC 7946 allows only longitude and
//! latitude, and a GIS given free units as degrees would place the map at the wrong spot on Earth.
//! Rings follow the RFC's right-hand rule (exteriors counter-clockwise) and are closed.

use serde_json::{Map, Value, json};

use crate::doc::model::ring_area;
use crate::doc::{AttrValue, Document, Point, Role, Units};
use crate::geo::LambertAzimuthalEqualArea;

use super::ExportError;

fn round7(v: f64) -> f64 {
    (v * 1e7).round() / 1e7
}

fn position(projection: &LambertAzimuthalEqualArea, p: Point) -> Value {
    let [lon, lat] = projection.unproject(p);
    json!([round7(lon), round7(lat)])
}

fn ring(projection: &LambertAzimuthalEqualArea, points: &[Point], counter_clockwise: bool) -> Value {
    let lon_lat: Vec<Point> = points.iter().map(|p| projection.unproject(*p)).collect();
    let mut order: Vec<usize> = (0..points.len()).collect();
    // Orientation in projected metres equals orientation in degrees for the small areas regions
    // cover (the projection is conformal at no point but keeps orientation everywhere).
    if (ring_area(points) > 0.0) != counter_clockwise {
        order.reverse();
    }
    let mut out: Vec<Value> = order
        .iter()
        .map(|&i| json!([round7(lon_lat[i][0]), round7(lon_lat[i][1])]))
        .collect();
    if let Some(first) = out.first().cloned() {
        out.push(first);
    }
    Value::Array(out)
}

fn attr(value: &AttrValue) -> Value {
    match value {
        AttrValue::Null => Value::Null,
        AttrValue::Bool(b) => Value::Bool(*b),
        AttrValue::Number(n) => json!(n),
        AttrValue::Text(t) => Value::String(t.clone()),
    }
}

/// The map as a GeoJSON FeatureCollection.
pub fn to_geojson(doc: &Document) -> Result<String, ExportError> {
    let origin = match (doc.settings.units, doc.settings.projection_origin) {
        (Units::Metres, Some(origin)) => origin,
        (Units::Metres, None) => {
            return Err(ExportError::NotGeographic(
                "this project does not record where its map lies on the globe (it was saved by an \
                 older Tinct); import the boundary file again, then export GeoJSON"
                    .into(),
            ));
        }
        (Units::Unitless, _) => {
            return Err(ExportError::NotGeographic(
                "this map is in free units (a sketch, or planar data), not longitude and latitude; \
                 GeoJSON (RFC 7946) must be longitude/latitude, so it cannot be placed on the globe. \
                 Export CSV for the colours, or SVG for a picture"
                    .into(),
            ));
        }
    };
    let projection = LambertAzimuthalEqualArea::new(origin[0], origin[1]);
    let mut features = Vec::with_capacity(doc.regions.len());
    for (id, region) in &doc.regions {
        let mut properties: Map<String, Value> = region
            .attributes
            .iter()
            .map(|(k, v)| (k.clone(), attr(v)))
            .collect();
        let slot = if region.role == Role::Land {
            doc.colouring.get(id).copied()
        } else {
            None
        };
        let fill = slot
            .and_then(|s| doc.palette.slots.get(s as usize))
            .map(|s| s.colour.to_hex());
        properties.insert("name".into(), json!(region.name));
        properties.insert("tinct_id".into(), json!(id.0));
        properties.insert("tinct_colour".into(), json!(slot));
        properties.insert("tinct_fill".into(), json!(fill));
        properties.insert(
            "tinct_group".into(),
            json!(region.group.and_then(|g| doc.groups.get(&g)).map(|g| g.name.clone())),
        );
        properties.insert("tinct_pinned".into(), json!(region.pin.is_some()));
        let geometry = match &region.geometry {
            Some(g) if !g.polygons.is_empty() => {
                let polygons: Vec<Value> = g
                    .polygons
                    .iter()
                    .map(|p| {
                        let mut rings = vec![ring(&projection, &p.exterior, true)];
                        rings.extend(p.holes.iter().map(|h| ring(&projection, h, false)));
                        Value::Array(rings)
                    })
                    .collect();
                if polygons.len() == 1 {
                    json!({ "type": "Polygon", "coordinates": polygons[0] })
                } else {
                    json!({ "type": "MultiPolygon", "coordinates": polygons })
                }
            }
            _ => json!({ "type": "Point", "coordinates": position(&projection, region.anchor) }),
        };
        features.push(json!({
            "type": "Feature",
            "id": id.0,
            "properties": properties,
            "geometry": geometry,
        }));
    }
    let collection = json!({ "type": "FeatureCollection", "features": features });
    let mut text = serde_json::to_string(&collection)
        .map_err(|e| ExportError::Render(e.to_string()))?;
    text.push('\n');
    Ok(text)
}
