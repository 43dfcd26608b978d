//! TopoJSON reader (TopoJSON Format Specification 1.0, M. Bostock, 2013) and arc-based borders.
//!
//! A topology stores every boundary line once, as an arc; polygons list the arcs of their rings
//! (a negative index `~i` means arc `i` reversed). With a `transform`, arc positions are quantised
//! and delta-encoded: the first position is absolute, each later one is added to the previous.
//! Borders come straight from the topology: two regions whose rings use the same arc share that
//! arc's length, and two regions whose arcs end at the same node touch there (a corner when
//! they share no arc).

use std::collections::{BTreeMap, BTreeSet};

use serde_json::Value;

use super::adjacency::{self, AdjacencyOptions, Contacts};
use super::{
    Diagnostic, DiagnosticKind, ImportError, ImportedRegion, Point, Polygon, RawFeature, RawMap,
};

fn topology_error(reason: impl Into<String>) -> ImportError {
    ImportError::Topology {
        reason: reason.into(),
    }
}

pub(super) fn read_value(value: &Value, layer: Option<&str>) -> Result<RawMap, ImportError> {
    let objects = value
        .get("objects")
        .and_then(Value::as_object)
        .ok_or_else(|| topology_error("a Topology needs an \"objects\" object"))?;
    let arcs_json = value
        .get("arcs")
        .and_then(Value::as_array)
        .ok_or_else(|| topology_error("a Topology needs an \"arcs\" array"))?;
    let transform = match value.get("transform") {
        None | Some(Value::Null) => None,
        Some(t) => {
            let pair = |key: &str| -> Option<[f64; 2]> {
                let a = t.get(key)?.as_array()?;
                Some([a.first()?.as_f64()?, a.get(1)?.as_f64()?])
            };
            match (pair("scale"), pair("translate")) {
                (Some(s), Some(t)) => Some((s, t)),
                _ => {
                    return Err(topology_error(
                        "\"transform\" needs \"scale\" and \"translate\"",
                    ));
                }
            }
        }
    };

    let mut arcs = Vec::with_capacity(arcs_json.len());
    for (i, arc) in arcs_json.iter().enumerate() {
        let positions = arc
            .as_array()
            .ok_or_else(|| topology_error(format!("arc {i} is not an array")))?;
        let mut decoded = Vec::with_capacity(positions.len());
        let (mut x, mut y) = (0.0, 0.0);
        for p in positions {
            let pair = p
                .as_array()
                .and_then(|a| Some([a.first()?.as_f64()?, a.get(1)?.as_f64()?]));
            let [px, py] =
                pair.ok_or_else(|| topology_error(format!("arc {i} has a malformed position")))?;
            let point = match transform {
                Some(([sx, sy], [tx, ty])) => {
                    x += px;
                    y += py;
                    [x * sx + tx, y * sy + ty]
                }
                None => [px, py],
            };
            if !(point[0].is_finite() && point[1].is_finite()) {
                return Err(topology_error(format!(
                    "arc {i}, position {}: the coordinates are not finite numbers{}",
                    decoded.len(),
                    if transform.is_some() {
                        " after applying the transform (is its scale too large?)"
                    } else {
                        ""
                    }
                )));
            }
            decoded.push(point);
        }
        arcs.push(decoded);
    }
    // Rings copy the arcs they use. In a topology each arc bounds at most two polygons (one on
    // each side), so rings hold about twice the arc positions; a file that refers to one arc a
    // million times would otherwise turn a few kilobytes into gigabytes of positions.
    let arc_positions: usize = arcs.iter().map(Vec::len).sum();
    let mut budget = ring_position_limit(arc_positions);

    let name = match layer {
        Some(l) => {
            if !objects.contains_key(l) {
                return Err(ImportError::MissingLayer {
                    layer: l.to_string(),
                    available: objects.keys().cloned().collect(),
                });
            }
            l.to_string()
        }
        // The object with the most polygon geometries; ties go to the first name in sorted order.
        None => objects
            .iter()
            .map(|(k, v)| (count_polygons(v), k))
            .max_by(|a, b| a.0.cmp(&b.0).then(b.1.cmp(a.1)))
            .map(|(_, k)| k.clone())
            .ok_or_else(|| topology_error("\"objects\" is empty"))?,
    };
    let object = &objects[&name];

    let mut raw = RawMap::default();
    let members: Vec<&Value> =
        if object.get("type").and_then(Value::as_str) == Some("GeometryCollection") {
            object
                .get("geometries")
                .and_then(Value::as_array)
                .map(|a| a.iter().collect())
                .unwrap_or_default()
        } else {
            vec![object]
        };
    for (index, geometry) in members.into_iter().enumerate() {
        let mut feature = RawFeature {
            source_index: index,
            ..RawFeature::default()
        };
        feature.id = match geometry.get("id") {
            Some(Value::String(s)) => Some(s.clone()),
            Some(Value::Number(n)) => Some(n.to_string()),
            _ => None,
        };
        if let Some(Value::Object(properties)) = geometry.get("properties") {
            for (key, v) in properties {
                if !raw.field_names.contains(key) {
                    raw.field_names.push(key.clone());
                }
                feature.properties.insert(key.clone(), v.clone());
            }
        }
        if !read_geometry(
            geometry,
            index,
            &arcs,
            &mut feature,
            &mut raw.diagnostics,
            &mut budget,
        )? {
            continue;
        }
        raw.features.push(feature);
    }
    if name != "objects" && objects.len() > 1 {
        raw.diagnostics.push(Diagnostic {
            kind: DiagnosticKind::File,
            regions: vec![],
            message: format!(
                "imported TopoJSON object {name:?}; the file also has {}",
                objects
                    .keys()
                    .filter(|k| **k != name)
                    .map(|k| format!("{k:?}"))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        });
    }
    raw.arcs = Some(arcs);
    Ok(raw)
}

/// How many positions the rings of a topology may hold in all, given the positions of its arcs:
/// four uses of every arc (a valid topology needs two) and a million positions to spare.
pub(super) fn ring_position_limit(arc_positions: usize) -> usize {
    arc_positions.saturating_mul(4).saturating_add(1_000_000)
}

fn count_polygons(value: &Value) -> usize {
    match value.get("type").and_then(Value::as_str) {
        Some("Polygon" | "MultiPolygon") => 1,
        Some("GeometryCollection") => value
            .get("geometries")
            .and_then(Value::as_array)
            .map(|a| a.iter().map(count_polygons).sum())
            .unwrap_or(0),
        _ => 0,
    }
}

/// Reads one geometry object into the feature. Returns false when it should be skipped.
fn read_geometry(
    geometry: &Value,
    index: usize,
    arcs: &[Vec<Point>],
    feature: &mut RawFeature,
    diagnostics: &mut Vec<Diagnostic>,
    budget: &mut usize,
) -> Result<bool, ImportError> {
    let kind = geometry.get("type").and_then(Value::as_str);
    let polygon_arcs = |v: &Value| -> Result<Vec<Vec<i64>>, ImportError> {
        let rings = v.as_array().ok_or_else(|| {
            topology_error(format!("geometry {index}: polygon arcs are not an array"))
        })?;
        rings
            .iter()
            .map(|ring| {
                ring.as_array()
                    .and_then(|r| r.iter().map(Value::as_i64).collect::<Option<Vec<_>>>())
                    .ok_or_else(|| {
                        topology_error(format!(
                            "geometry {index}: a ring is not a list of arc indices"
                        ))
                    })
            })
            .collect()
    };
    let add_polygon = |rings: Vec<Vec<i64>>,
                       feature: &mut RawFeature,
                       budget: &mut usize|
     -> Result<(), ImportError> {
        let mut used = Vec::new();
        let mut decoded = Vec::new();
        for ring in rings {
            let mut positions: Vec<Point> = Vec::new();
            for arc_ref in ring {
                // Negative indices are one's complements: ~i is arc i reversed.
                let (i, reversed) = if arc_ref < 0 {
                    ((!arc_ref) as usize, true)
                } else {
                    (arc_ref as usize, false)
                };
                let arc = arcs.get(i).ok_or_else(|| {
                    topology_error(format!(
                        "geometry {index} refers to arc {arc_ref}, but there are only {} arcs",
                        arcs.len()
                    ))
                })?;
                used.push(i);
                *budget = budget.checked_sub(arc.len()).ok_or_else(|| {
                    topology_error(format!(
                        "geometry {index}: the rings refer to the arcs more often than a topology \
                         can (more than {} positions from {} arc positions)",
                        ring_position_limit(arcs.iter().map(Vec::len).sum()),
                        arcs.iter().map(Vec::len).sum::<usize>()
                    ))
                })?;
                let mut points: Vec<Point> = arc.clone();
                if reversed {
                    points.reverse();
                }
                // Consecutive arcs share their junction position; keep it once.
                let skip = usize::from(!positions.is_empty());
                positions.extend(points.into_iter().skip(skip));
            }
            decoded.push(positions);
        }
        let mut rings = decoded.into_iter();
        if let Some(exterior) = rings.next() {
            feature.parts.push(Polygon {
                exterior,
                holes: rings.collect(),
            });
            used.sort_unstable();
            used.dedup();
            feature.part_arcs.push(used);
        }
        Ok(())
    };
    match kind {
        Some("Polygon") => {
            let rings = polygon_arcs(geometry.get("arcs").unwrap_or(&Value::Null))?;
            add_polygon(rings, feature, budget)?;
            Ok(true)
        }
        Some("MultiPolygon") => {
            let polygons = geometry
                .get("arcs")
                .and_then(Value::as_array)
                .ok_or_else(|| {
                    topology_error(format!("geometry {index}: MultiPolygon without arcs"))
                })?;
            for p in polygons {
                let rings = polygon_arcs(p)?;
                add_polygon(rings, feature, budget)?;
            }
            Ok(true)
        }
        Some("GeometryCollection") => {
            let members = geometry
                .get("geometries")
                .and_then(Value::as_array)
                .cloned()
                .unwrap_or_default();
            for member in &members {
                read_geometry(member, index, arcs, feature, diagnostics, budget)?;
            }
            Ok(true)
        }
        // The specification allows a null type: a feature with no geometry.
        None => {
            feature.geometry_missing = true;
            Ok(true)
        }
        Some(other) => {
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::SkippedGeometry,
                regions: vec![],
                message: format!("geometry {index}: {other:?} is not a polygon; skipped"),
            });
            Ok(false)
        }
    }
}

/// Borders from shared arcs (lengths in projected units) and shared arc end nodes (corners).
/// Diagnostics about ring validity, overlaps and gaps come from the geometric pass.
pub(super) fn borders_from_arcs(
    regions: &[ImportedRegion],
    region_arcs: &[Vec<usize>],
    arcs: &[Vec<Point>],
    options: &AdjacencyOptions,
) -> adjacency::Derived {
    let mut users: Vec<Vec<usize>> = vec![Vec::new(); arcs.len()];
    for (region, used) in region_arcs.iter().enumerate() {
        for &arc in used {
            if let Some(u) = users.get_mut(arc) {
                u.push(region);
            }
        }
    }
    let mut contacts: BTreeMap<(u32, u32), f64> = BTreeMap::new();
    let mut diagnostics = Vec::new();
    let mut nodes: BTreeMap<(u64, u64), BTreeSet<usize>> = BTreeMap::new();
    for (arc, u) in users.iter_mut().enumerate() {
        u.sort_unstable();
        u.dedup();
        let points = &arcs[arc];
        let length: f64 = points
            .windows(2)
            .map(|w| match &options.lengths_on_sphere {
                Some(sphere) => sphere.distance_m(w[0], w[1]),
                None => (w[1][0] - w[0][0]).hypot(w[1][1] - w[0][1]),
            })
            .sum();
        if u.len() > 2 {
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::Overlap,
                regions: u.clone(),
                message: format!(
                    "arc {arc} is used by {} regions ({}); a boundary line belongs to at most two \
                     (a spike in one ring, or overlapping regions)",
                    u.len(),
                    u.iter()
                        .map(|&r| format!("{:?}", regions[r].name))
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            });
        }
        for (i, &a) in u.iter().enumerate() {
            for &b in &u[i + 1..] {
                *contacts.entry((a as u32, b as u32)).or_default() += length;
            }
        }
        for end in [points.first(), points.last()].into_iter().flatten() {
            let key = (end[0].to_bits(), end[1].to_bits());
            nodes.entry(key).or_default().extend(u.iter().copied());
        }
    }
    for members in nodes.values() {
        let members: Vec<usize> = members.iter().copied().collect();
        for (i, &a) in members.iter().enumerate() {
            for &b in &members[i + 1..] {
                contacts.entry((a as u32, b as u32)).or_default();
            }
        }
    }
    let contacts = Contacts::from_sorted(contacts.into_iter().collect());

    // Ring validity, overlaps and gaps from the geometric pass; its borders are not used.
    let geometric = adjacency::derive_contacts(regions, options);
    diagnostics.extend(
        geometric
            .diagnostics
            .into_iter()
            .filter(|d| d.kind != DiagnosticKind::ShortBorder),
    );
    let mut derived = adjacency::apply_rule(regions, contacts, options);
    diagnostics.append(&mut derived.diagnostics);
    derived.diagnostics = diagnostics;
    derived
}
