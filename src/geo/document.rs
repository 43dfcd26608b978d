//! Turning an imported map into a project document.
//!
//! Every contact is recorded, including those the import rule left out, and the document's
//! settings say which ones constrain the colouring (`corners_count` for queen, the minimum border
//! length for rook), so the user can switch rules later without importing again.
//! Properties `role` ("land" or "water"), `group` (a name) and `pin` (a palette slot), as written
//! by Tinct's sample maps, become the region's role, same-colour group and pin. Parts of one
//! feature split into several regions (`split_parts`) share a same-colour group.

use std::collections::BTreeMap;
use std::sync::Arc;

use serde_json::Value;

use crate::geometry::{edges, point_in_rings, signed_area};

use super::{BorderKind as GeoBorderKind, ImportedMap, Point, Polygon as GeoPolygon, Rule, Units};
use crate::doc::{
    self, AttrValue, Border, Document, DocumentBuilder, Geometry, Group, GroupId, Region, RegionId,
    RegionPair, Role, Settings,
};

/// Imported regions are numbered from here, in import order.
const FIRST_ID: u64 = 1;

impl ImportedMap {
    /// Builds a fresh document titled `title`: one region per imported region (ids from 1 in
    /// import order), every contact as a border, settings from the import options.
    pub fn into_document(self, title: impl Into<String>) -> Document {
        let mut document = DocumentBuilder::new(title);
        document.settings(Settings {
            corners_count: self.rule == Rule::Queen,
            min_border_length: self.min_border_length,
            tolerance: self.tolerance,
            units: match self.units {
                Units::Metres => doc::Units::Metres,
                Units::MapUnits => doc::Units::Unitless,
            },
            projection: self.projection,
            greyscale_copies: false,
        });
        document.reserve(self.regions.len(), self.borders.len() + self.excluded.len());
        document.crs(self.crs);
        document.notes(
            self.diagnostics
                .iter()
                .map(|d| doc::Note {
                    message: d.message.clone(),
                    regions: d
                        .regions
                        .iter()
                        .map(|&i| RegionId(FIRST_ID + i as u64))
                        .collect(),
                })
                .collect(),
        );

        // A contact recorded twice keeps its last record, as inserting into a map would. Both
        // lists come sorted from the importers; they are merged as they are consumed, without a
        // combined copy (two million borders on a million-region map), and before the regions,
        // so that their memory is free again when the regions move into the document.
        let key = |b: &super::ImportedBorder| (b.a.min(b.b), b.a.max(b.b));
        let (mut kept, mut excluded) = (self.borders, self.excluded);
        for list in [&mut kept, &mut excluded] {
            if !list.is_sorted_by_key(key) {
                list.sort_by_key(key);
            }
        }
        let (mut kept, mut excluded) =
            (kept.into_iter().peekable(), excluded.into_iter().peekable());
        let mut pending: Option<(RegionPair, Border)> = None;
        loop {
            let next = match (kept.peek(), excluded.peek()) {
                (Some(x), Some(y)) if key(y) < key(x) => excluded.next(),
                (Some(_), _) => kept.next(),
                (None, _) => excluded.next(),
            };
            let Some(border) = next else { break };
            let pair = RegionPair::new(
                RegionId(FIRST_ID + border.a as u64),
                RegionId(FIRST_ID + border.b as u64),
            );
            let Some(pair) = pair else { continue };
            let value = match border.kind {
                GeoBorderKind::Shared { length } => Border::shared(length),
                GeoBorderKind::Corner => Border::corner(),
            };
            if let Some((previous, previous_value)) = pending.replace((pair, value))
                && previous != pair
            {
                document.border(previous, previous_value);
            }
        }
        if let Some((pair, value)) = pending {
            document.border(pair, value);
        }
        drop((kept, excluded));

        // Same-colour groups: named in the properties, or the parts of one split feature.
        // Source indices are feature positions in the file: count parts per feature densely.
        let features = self.regions.iter().map(|r| r.source_index + 1).max();
        let mut per_feature = vec![0u32; features.unwrap_or(0)];
        for region in &self.regions {
            per_feature[region.source_index] += 1;
        }
        let mut group_ids: BTreeMap<String, GroupId> = BTreeMap::new();
        let mut group_of = |name: String, document: &mut DocumentBuilder| {
            let next = GroupId(group_ids.len() as u64 + 1);
            if let Some(id) = group_ids.get(&name) {
                return *id;
            }
            group_ids.insert(name.clone(), next);
            document.group(next, Group { name });
            next
        };

        let region_count = self.regions.len() as u64;
        for (i, imported) in self.regions.into_iter().enumerate() {
            let properties = &imported.properties;
            let role = match properties.get("role").and_then(Value::as_str) {
                Some("water") => Role::Water,
                _ => Role::Land,
            };
            let group = match properties.get("group") {
                Some(Value::String(name)) if !name.trim().is_empty() => {
                    Some(group_of(name.trim().to_string(), &mut document))
                }
                _ if per_feature[imported.source_index] > 1 => {
                    let base = imported
                        .name
                        .rsplit_once(" (")
                        .map_or(imported.name.as_str(), |(b, _)| b);
                    Some(group_of(base.to_string(), &mut document))
                }
                _ => None,
            };
            let pin = properties
                .get("pin")
                .and_then(Value::as_u64)
                .and_then(|p| u32::try_from(p).ok());
            let anchor = imported
                .position
                .unwrap_or_else(|| anchor_of(&imported.parts));
            let geometry = (!imported.parts.is_empty()).then(|| {
                Arc::new(Geometry {
                    polygons: imported.parts.into_iter().map(to_doc_polygon).collect(),
                })
            });
            let attributes = imported
                .properties
                .into_iter()
                .map(|(k, v)| (k, attr_value(v)))
                .collect();
            let region = Region {
                name: imported.name,
                role,
                anchor,
                geometry,
                pin,
                group,
                source_index: Some(imported.source_index as u64),
                attributes,
            };
            document.region(RegionId(FIRST_ID + i as u64), region);
        }
        document.next_ids(FIRST_ID + region_count, group_ids.len() as u64 + 1);

        match document.build() {
            Ok(doc) => doc,
            Err(e) => {
                // Ids are numbered here and groups made here, so this cannot happen.
                debug_assert!(false, "an imported document is consistent: {e}");
                Document::new("")
            }
        }
    }
}

/// Cleaned rings are open, as the document keeps them; they move into the document uncopied.
fn to_doc_polygon(polygon: GeoPolygon) -> doc::Polygon {
    debug_assert!(
        polygon.exterior.len() < 2 || polygon.exterior.first() != polygon.exterior.last(),
        "rings are opened when they are cleaned"
    );
    doc::Polygon {
        exterior: polygon.exterior,
        holes: polygon.holes,
    }
}

fn attr_value(value: Value) -> AttrValue {
    match value {
        Value::Null => AttrValue::Null,
        Value::Bool(b) => AttrValue::Bool(b),
        Value::Number(n) => n.as_f64().map_or(AttrValue::Null, AttrValue::Number),
        Value::String(s) => AttrValue::Text(s),
        other => AttrValue::Text(other.to_string()),
    }
}

/// A label point inside the largest part: its centroid when that lies inside, otherwise the
/// middle of the widest inside stretch of the horizontal line through the centroid.
pub fn anchor_of(parts: &[GeoPolygon]) -> Point {
    let Some(largest) = parts.iter().max_by(|a, b| {
        signed_area(&a.exterior)
            .abs()
            .total_cmp(&signed_area(&b.exterior).abs())
    }) else {
        return [0.0, 0.0];
    };
    let ring = &largest.exterior;
    let area = signed_area(ring);
    let centroid = if area.abs() > 0.0 {
        let (mut cx, mut cy) = (0.0, 0.0);
        for (a, b) in edges(ring) {
            let f = a[0] * b[1] - b[0] * a[1];
            cx += (a[0] + b[0]) * f;
            cy += (a[1] + b[1]) * f;
        }
        [cx / (6.0 * area), cy / (6.0 * area)]
    } else {
        ring.first().copied().unwrap_or([0.0, 0.0])
    };
    let rings: Vec<&Vec<Point>> = std::iter::once(ring).chain(&largest.holes).collect();
    if point_in_rings(rings.iter().map(|r| r.as_slice()), centroid) {
        return centroid;
    }
    let y = centroid[1];
    let mut xs: Vec<f64> = Vec::new();
    for r in &rings {
        for (a, b) in edges(r) {
            if (a[1] > y) != (b[1] > y) {
                xs.push(a[0] + (y - a[1]) / (b[1] - a[1]) * (b[0] - a[0]));
            }
        }
    }
    xs.sort_by(f64::total_cmp);
    xs.chunks_exact(2)
        .max_by(|a, b| (a[1] - a[0]).total_cmp(&(b[1] - b[0])))
        .map_or(centroid, |w| [(w[0] + w[1]) / 2.0, y])
}

/// The edit that derives `doc`'s borders again from its outlines with another `tolerance`, as
/// importing with it would have, and records the tolerance: one undoable step. Borders added by
/// hand stay; a derived border the user suppressed stays suppressed when it is found again;
/// derived borders no longer found go. Regions drawn as markers keep their borders. `None` when
/// the map has no outlines to derive anything from.
pub fn rederive_borders(doc: &Document, tolerance: f64) -> Option<doc::Edit> {
    use crate::doc::{BorderKind as DocKind, Edit};
    let outlined: Vec<(RegionId, &doc::Region)> = doc
        .regions()
        .iter()
        .filter(|(_, r)| r.geometry.as_ref().is_some_and(|g| !g.polygons.is_empty()))
        .map(|(id, r)| (*id, r))
        .collect();
    if outlined.is_empty() {
        return None;
    }
    let regions: Vec<super::ImportedRegion> = outlined
        .iter()
        .enumerate()
        .map(|(i, (_, r))| super::ImportedRegion {
            source_index: i,
            name: r.name.clone(),
            parts: r
                .geometry
                .as_ref()
                .map(|g| {
                    g.polygons
                        .iter()
                        .map(|p| GeoPolygon {
                            exterior: p.exterior.clone(),
                            holes: p.holes.clone(),
                        })
                        .collect()
                })
                .unwrap_or_default(),
            properties: super::Properties::new(),
            position: None,
        })
        .collect();
    let settings = doc.settings();
    let options = super::AdjacencyOptions {
        rule: Rule::Queen,
        tolerance: tolerance.max(0.0),
        min_border_length: 0.0,
        gap_width: None,
        lengths_on_sphere: match settings.units {
            doc::Units::Metres => settings.projection,
            doc::Units::Unitless => None,
        },
    };
    let derived = super::derive_contacts(&regions, &options);
    let mut found: BTreeMap<RegionPair, Border> = BTreeMap::new();
    for b in derived.borders.iter().chain(&derived.excluded) {
        if let Some(pair) = RegionPair::new(outlined[b.a].0, outlined[b.b].0) {
            found.insert(
                pair,
                match b.kind {
                    GeoBorderKind::Shared { length } => Border::shared(length),
                    GeoBorderKind::Corner => Border::corner(),
                },
            );
        }
    }
    let is_outlined = |id: RegionId| outlined.binary_search_by_key(&id, |(i, _)| *i).is_ok();
    let mut edits = Vec::new();
    for (pair, old) in doc.borders().iter() {
        let derived_kind = matches!(old.kind, DocKind::Shared | DocKind::Corner);
        if derived_kind
            && is_outlined(pair.a())
            && is_outlined(pair.b())
            && !found.contains_key(pair)
        {
            edits.push(Edit::PutBorder {
                pair: *pair,
                border: None,
            });
        }
    }
    for (pair, mut border) in found {
        match doc.borders().get(&pair) {
            Some(old) if old.kind == DocKind::Manual => continue,
            Some(old) => {
                border.suppressed = old.suppressed;
                if *old == border {
                    continue;
                }
            }
            None => {}
        }
        edits.push(Edit::PutBorder {
            pair,
            border: Some(border),
        });
    }
    edits.push(Edit::SetSettings(doc::Settings {
        tolerance: tolerance.max(0.0),
        ..*settings
    }));
    Some(Edit::Batch {
        label: "Derive borders with another tolerance".into(),
        edits,
    })
}

/// The projections offered for `doc` (a map imported from longitude/latitude): Albers, Lambert
/// azimuthal and Equal Earth fitted to its main mass (see [`crate::projection::MainMass::choices`]).
/// Empty for a map without a projection.
pub fn projection_choices(doc: &Document) -> Vec<crate::projection::Projection> {
    let Some(current) = doc.settings().projection else {
        return Vec::new();
    };
    let parts: Vec<Vec<[f64; 2]>> = doc
        .regions()
        .values()
        .flat_map(|r| match &r.geometry {
            Some(g) if !g.polygons.is_empty() => g
                .polygons
                .iter()
                .map(|p| p.exterior.iter().map(|&q| current.unproject(q)).collect())
                .collect::<Vec<_>>(),
            _ => vec![vec![current.unproject(r.anchor)]],
        })
        .collect();
    crate::projection::MainMass::find(&parts).map_or_else(Vec::new, |m| m.choices().to_vec())
}

/// The edit that draws `doc` (a map imported from longitude/latitude) in the projection `to`:
/// every outline and marker taken back to longitude/latitude with the current projection and
/// projected again, and the projection recorded; one undoable step. Shared border lengths are
/// measured on the sphere and the tolerances are in metres on the ground, so they stay. On a
/// world projection, rings are kept on their side of the map's edge as at import, but a ring that
/// comes to cross the new edge is not cut (import the file again for that). `None` when the map
/// has no projection, the projection is already `to`, or `to` is not a valid projection.
pub fn reproject(doc: &Document, to: crate::projection::Projection) -> Option<doc::Edit> {
    let from = doc.settings().projection?;
    if from == to || to.check().is_err() {
        return None;
    }
    let mut edits = Vec::new();
    for (id, region) in doc.regions() {
        if let Some(g) = &region.geometry {
            let mut moved: doc::Geometry = (**g).clone();
            for polygon in &mut moved.polygons {
                for ring in std::iter::once(&mut polygon.exterior).chain(polygon.holes.iter_mut()) {
                    for p in ring.iter_mut() {
                        *p = from.unproject(*p);
                    }
                    to.project_ring(ring);
                }
            }
            edits.push(doc::Edit::UpdateRegion {
                id: *id,
                change: doc::RegionChange::Geometry(Some(Arc::new(moved))),
            });
        }
        edits.push(doc::Edit::UpdateRegion {
            id: *id,
            change: doc::RegionChange::Anchor(to.project(from.unproject(region.anchor))),
        });
    }
    edits.push(doc::Edit::SetSettings(doc::Settings {
        projection: Some(to),
        ..*doc.settings()
    }));
    Some(doc::Edit::Batch {
        label: format!("Change the projection to {}", to.name()),
        edits,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn anchor_of_a_c_shape_lies_inside_it() {
        // A C-shaped polygon whose centroid falls in the notch.
        let ring = vec![
            [0.0, 0.0],
            [3.0, 0.0],
            [3.0, 1.0],
            [1.0, 1.0],
            [1.0, 2.0],
            [3.0, 2.0],
            [3.0, 3.0],
            [0.0, 3.0],
            [0.0, 0.0],
        ];
        let p = anchor_of(&[GeoPolygon {
            exterior: ring,
            holes: vec![],
        }]);
        assert!(p[0] > 0.0 && p[0] < 1.0, "{p:?}");
    }
}
