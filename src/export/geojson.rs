//! GeoJSON export (RFC 7946): one feature per region, in longitude/latitude on WGS 84, with the
//! region's imported properties kept and Tinct's added:
//! - `name`: the region's name in Tinct (replacing an imported `name`, since the user may have
//!   renamed it);
//! - `tinct_id`: Tinct's region id (also the feature's `id`);
//! - `tinct_colour`: the palette slot, 0-based as in project files, or null when uncoloured or water;
//! - `tinct_fill`: that slot's colour as `#rrggbb`, or null;
//! - `tinct_group`: the same-colour group's name, or null; `tinct_pinned`: whether the colour is fixed.
//!
//! Imported geographic maps are kept in metres on the equal-area projection chosen at import (see
//! [`crate::projection`]); the export applies the inverse of the projection recorded then
//! ([`crate::doc::Settings::projection`]). The sphere's latitude is written as WGS 84
//! latitude, as the import read WGS 84 latitude onto the sphere, so coordinates come back as they were
//! read, to rounding (7 decimals, about 1 cm).
//!
//! Maps without a position on the globe (sketches, planar data such as the invented sample maps,
//! projects saved before Tinct recorded the projection) are refused with an explanation: RFC 7946 allows only longitude and
//! latitude, and a GIS given free units as degrees would place the map at the wrong spot on Earth.
//! Rings follow the RFC's right-hand rule (exteriors counter-clockwise) and are closed; a polygon
//! that crosses the 180-degree meridian is cut in two there (RFC 7946, section 3.1.9).

use serde_json::{Map, Value, json};

use crate::doc::model::ring_area;
use crate::doc::{AttrValue, Document, Point, Polygon, Units};
use crate::geo::Projection;

use super::ExportError;

fn round7(v: f64) -> f64 {
    (v * 1e7).round() / 1e7
}

fn position(projection: &Projection, p: Point) -> Value {
    let [lon, lat] = projection.unproject(p);
    json!([round7(lon), round7(lat)])
}

/// A ring in longitude/latitude, oriented as RFC 7946 asks (exterior counter-clockwise when
/// `counter_clockwise`), not yet closed.
fn oriented(mut points: Vec<Point>, counter_clockwise: bool) -> Vec<Point> {
    if (ring_area(&points) > 0.0) != counter_clockwise {
        points.reverse();
    }
    points
}

/// Unwraps longitudes so that consecutive points never jump by more than 180 degrees, starting
/// from `reference` (the first point's longitude when `None`).
fn unwrap(points: &mut [Point], reference: Option<f64>) {
    let mut previous = reference.or(points.first().map(|p| p[0]));
    for p in points.iter_mut() {
        if let Some(prev) = previous {
            while p[0] - prev > 180.0 {
                p[0] -= 360.0;
            }
            while p[0] - prev < -180.0 {
                p[0] += 360.0;
            }
        }
        previous = Some(p[0]);
    }
}

/// Sutherland-Hodgman clipping of a ring to one side of the meridian `lon = 180`.
fn clip_at_180(ring: &[Point], west: bool) -> Vec<Point> {
    let inside = |p: &Point| if west { p[0] <= 180.0 } else { p[0] >= 180.0 };
    let mut out = Vec::with_capacity(ring.len() + 2);
    for i in 0..ring.len() {
        let (a, b) = (ring[i], ring[(i + 1) % ring.len()]);
        let (ia, ib) = (inside(&a), inside(&b));
        if ia {
            out.push(a);
        }
        if ia != ib {
            let t = (180.0 - a[0]) / (b[0] - a[0]);
            out.push([180.0, a[1] + t * (b[1] - a[1])]);
        }
    }
    out.dedup();
    out
}

/// A polygon ready for a GIS format: its exterior ring (counter-clockwise) and holes
/// (clockwise), open (the first position is not repeated), in output coordinates.
pub(super) type OutputPolygon = (Vec<Point>, Vec<Vec<Point>>);

/// One polygon in longitude/latitude, as one or two polygons: a polygon that crosses the
/// 180-degree meridian is cut there, as RFC 7946 section 3.1.9 asks (and as GIS formats in
/// longitude/latitude expect). Positions are rounded to 7 decimals (about 1 cm).
pub(super) fn polygons_lon_lat(projection: &Projection, polygon: &Polygon) -> Vec<OutputPolygon> {
    let mut exterior: Vec<Point> = polygon
        .exterior
        .iter()
        .map(|p| projection.unproject(*p))
        .collect();
    unwrap(&mut exterior, None);
    let reference = exterior.first().map(|p| p[0]);
    let mut holes: Vec<Vec<Point>> = polygon
        .holes
        .iter()
        .map(|h| {
            let mut h: Vec<Point> = h.iter().map(|p| projection.unproject(*p)).collect();
            unwrap(&mut h, reference);
            h
        })
        .collect();
    let (lo, hi) = exterior
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(lo, hi), p| {
            (lo.min(p[0]), hi.max(p[0]))
        });
    // Bring the polygon into -180..180 where it fits whole.
    let shift = if lo < -180.0 {
        360.0
    } else if lo >= 180.0 {
        -360.0
    } else {
        0.0
    };
    for p in exterior.iter_mut().chain(holes.iter_mut().flatten()) {
        p[0] += shift;
    }
    let pieces: Vec<(Vec<Point>, Vec<Vec<Point>>, f64)> = if hi + shift > 180.0 {
        [(true, 0.0), (false, -360.0)]
            .iter()
            .map(|&(west, offset)| {
                let holes = holes.iter().map(|h| clip_at_180(h, west)).collect();
                (clip_at_180(&exterior, west), holes, offset)
            })
            .collect()
    } else {
        vec![(exterior, holes, 0.0)]
    };
    let finish = |ring: Vec<Point>, offset: f64| -> Vec<Point> {
        ring.iter()
            .map(|p| [round7(p[0] + offset), round7(p[1])])
            .collect()
    };
    pieces
        .into_iter()
        .filter(|(ext, _, _)| ext.len() >= 3 && ring_area(ext).abs() > 0.0)
        .map(|(ext, holes, offset)| {
            let holes = holes
                .into_iter()
                .filter(|h| h.len() >= 3 && ring_area(h).abs() > 0.0)
                .map(|h| finish(oriented(h, false), offset))
                .collect();
            (finish(oriented(ext, true), offset), holes)
        })
        .collect()
}

/// A polygon in the map's own planar units, oriented as [`OutputPolygon`] says.
pub(super) fn polygon_planar(polygon: &Polygon) -> Option<OutputPolygon> {
    (polygon.exterior.len() >= 3 && ring_area(&polygon.exterior).abs() > 0.0).then(|| {
        let holes = polygon
            .holes
            .iter()
            .filter(|h| h.len() >= 3 && ring_area(h).abs() > 0.0)
            .map(|h| oriented(h.clone(), false))
            .collect();
        (oriented(polygon.exterior.clone(), true), holes)
    })
}

/// A ring as GeoJSON coordinates, closed.
fn closed(ring: &[Point]) -> Value {
    let mut out: Vec<Value> = ring.iter().map(|p| json!([p[0], p[1]])).collect();
    if let Some(first) = out.first().cloned() {
        out.push(first);
    }
    Value::Array(out)
}

fn polygon_value((exterior, holes): &OutputPolygon) -> Value {
    let mut rings = vec![closed(exterior)];
    rings.extend(holes.iter().map(|h| closed(h)));
    Value::Array(rings)
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
    let projection = match (doc.settings().units, doc.settings().projection) {
        (Units::Metres, Some(projection)) => projection,
        (Units::Metres, None) => {
            return Err(ExportError::NotGeographic(
                "this map is in metres on a plane with no recorded position on the globe (planar \
                 data, an invented map, or a project saved before Tinct recorded its projection); \
                 GeoJSON (RFC 7946) must be longitude/latitude. If the map came from \
                 longitude/latitude data, import that file again and export from the new project"
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
    let mut features = Vec::with_capacity(doc.regions().len());
    for (id, region) in doc.regions() {
        let mut properties: Map<String, Value> = region
            .attributes
            .iter()
            .map(|(k, v)| (k.clone(), attr(v)))
            .collect();
        let colour = super::gis::colour_columns(doc, *id, region);
        properties.insert("name".into(), json!(region.name));
        properties.insert("tinct_id".into(), json!(id.0));
        properties.insert("tinct_colour".into(), json!(colour.slot));
        properties.insert("tinct_fill".into(), json!(colour.fill));
        properties.insert("tinct_group".into(), json!(colour.group));
        properties.insert("tinct_pinned".into(), json!(region.pin.is_some()));
        let geometry = match &region.geometry {
            Some(g) if !g.polygons.is_empty() => {
                let polygons: Vec<Value> = g
                    .polygons
                    .iter()
                    .flat_map(|p| polygons_lon_lat(&projection, p))
                    .map(|p| polygon_value(&p))
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
    let mut text =
        serde_json::to_string(&collection).map_err(|e| ExportError::Render(e.to_string()))?;
    text.push('\n');
    Ok(text)
}
