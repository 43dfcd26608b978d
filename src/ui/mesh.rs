//! Filled outlines. egui fills only convex paths, so each region's polygons (with their holes) are
//! triangulated once, in world units, with earcut, and cached until the outline changes.

use std::collections::HashMap;
use std::sync::Arc;

use crate::doc::{Document, Geometry, Point, RegionId};

/// One region's triangles in world units.
pub struct Triangles {
    pub vertices: Vec<Point>,
    pub indices: Vec<u32>,
}

/// Triangulates a multi-polygon with holes.
pub fn triangulate(geometry: &Geometry) -> Triangles {
    let mut vertices = Vec::new();
    let mut indices = Vec::new();
    for polygon in &geometry.polygons {
        let mut flat = Vec::new();
        let mut hole_starts = Vec::new();
        for p in &polygon.exterior {
            flat.extend_from_slice(p);
        }
        for hole in &polygon.holes {
            hole_starts.push(flat.len() / 2);
            for p in hole {
                flat.extend_from_slice(p);
            }
        }
        let base = vertices.len() as u32;
        if let Ok(tri) = earcutr::earcut(&flat, &hole_starts, 2) {
            indices.extend(tri.into_iter().map(|i| base + i as u32));
            vertices.extend(flat.chunks_exact(2).map(|c| [c[0], c[1]]));
        }
    }
    Triangles { vertices, indices }
}

/// Triangles per region, rebuilt only for regions whose outline changed (compared by pointer:
/// outlines are shared `Arc`s, and an edit that changes one replaces the `Arc`).
#[derive(Default)]
pub struct MeshCache {
    entries: HashMap<RegionId, (Arc<Geometry>, Arc<Triangles>)>,
}

impl MeshCache {
    /// Brings the cache up to date with `doc` and returns the triangles of one region.
    pub fn sync(&mut self, doc: &Document) {
        self.entries.retain(|id, (g, _)| {
            doc.regions
                .get(id)
                .and_then(|r| r.geometry.as_ref())
                .is_some_and(|now| Arc::ptr_eq(now, g))
        });
        for (id, region) in &doc.regions {
            if let Some(g) = &region.geometry
                && !self.entries.contains_key(id)
            {
                self.entries
                    .insert(*id, (g.clone(), Arc::new(triangulate(g))));
            }
        }
    }

    pub fn get(&self, id: RegionId) -> Option<&Arc<Triangles>> {
        self.entries.get(&id).map(|(_, t)| t)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::Polygon;

    #[test]
    fn square_with_hole_has_eight_triangles_and_the_right_area() {
        let g = Geometry {
            polygons: vec![Polygon {
                exterior: vec![[0.0, 0.0], [4.0, 0.0], [4.0, 4.0], [0.0, 4.0]],
                holes: vec![vec![[1.0, 1.0], [1.0, 3.0], [3.0, 3.0], [3.0, 1.0]]],
            }],
        };
        let t = triangulate(&g);
        assert_eq!(t.indices.len() / 3, 8);
        let area: f64 = t
            .indices
            .chunks_exact(3)
            .map(|c| {
                let [a, b, d] = [
                    t.vertices[c[0] as usize],
                    t.vertices[c[1] as usize],
                    t.vertices[c[2] as usize],
                ];
                ((b[0] - a[0]) * (d[1] - a[1]) - (d[0] - a[0]) * (b[1] - a[1])).abs() / 2.0
            })
            .sum();
        assert!((area - 12.0).abs() < 1e-9, "{area}");
    }
}
