//! What the canvas draws, prepared once per document revision so that a frame only transforms and
//! culls: each region's triangles (egui fills only convex paths, so outlines are triangulated with
//! earcut, in world units, and cached until the outline changes), its bounding box, area and fill,
//! and the outlines as chains in which a boundary shared by two regions appears once.

use std::collections::HashSet;
use std::ops::Range;
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

/// An outlined region as the canvas needs it.
pub struct Outlined {
    pub id: RegionId,
    pub bounds: [Point; 2],
    pub area: f64,
    pub geometry: Arc<Geometry>,
    /// Made when the region is first drawn large enough to need them (a map of a million
    /// regions seen whole needs none), then kept while the outline is unchanged.
    pub triangles: Option<Arc<Triangles>>,
}

/// A run of outline points drawn as one line; `closed` when it is a whole ring.
pub struct Chain {
    pub points: Range<usize>,
    pub closed: bool,
    pub bounds: [Point; 2],
}

/// Above this many outline vertices, shared boundaries are not merged (the hash set would cost
/// more memory than drawing them twice costs time; such maps are mostly drawn at coarse detail).
const MERGE_LIMIT: usize = 2_000_000;

/// The prepared drawing of a document.
#[derive(Default)]
pub struct Scene {
    /// Outlined regions in id order.
    pub outlined: Vec<Outlined>,
    /// Outline chains and their points (built when first needed after the outlines change).
    pub chains: Vec<Chain>,
    pub chain_points: Vec<Point>,
    chains_stale: bool,
    /// The median size (larger side of the bounding box) of an outlined region, in world units:
    /// decides at which zoom names and border links are worth drawing.
    pub typical_size: f64,
    /// Regions drawn as markers (no outline), and regions with a pinned colour.
    pub markers: Vec<RegionId>,
    pub pinned: Vec<RegionId>,
    /// Counts the syncs, so that drawings made from an older state can tell they are stale.
    pub generation: u64,
}

impl Scene {
    /// Brings the scene up to date with `doc`. Call when the document or its revision changes.
    /// Linear in the number of regions and outline vertices, without hashing: the old and new
    /// region lists are both in id order and are merged; triangulations of unchanged outlines
    /// (the same `Arc`) are kept.
    pub fn sync(&mut self, doc: &Document) {
        self.generation += 1;
        let old = std::mem::take(&mut self.outlined);
        let mut old = old.into_iter().peekable();
        let mut outlines_changed = false;
        let mut outlined = Vec::with_capacity(doc.regions().len());
        self.markers.clear();
        self.pinned.clear();
        for (id, region) in doc.regions() {
            if region.pin.is_some() {
                self.pinned.push(*id);
            }
            let Some(g) = &region.geometry else {
                self.markers.push(*id);
                continue;
            };
            let Some(bounds) = g.bounds() else { continue };
            while old.peek().is_some_and(|o| o.id < *id) {
                old.next();
                outlines_changed = true;
            }
            let kept = match old.peek() {
                Some(o) if o.id == *id && Arc::ptr_eq(&o.geometry, g) => {
                    old.next().map(|o| (o.area, o.triangles))
                }
                _ => None,
            };
            let (area, triangles) = match kept {
                Some(k) => k,
                None => {
                    outlines_changed = true;
                    (g.area(), None)
                }
            };
            outlined.push(Outlined {
                id: *id,
                bounds,
                area,
                geometry: g.clone(),
                triangles,
            });
        }
        outlines_changed |= old.next().is_some();
        self.outlined = outlined;
        if outlines_changed {
            self.chains_stale = true;
            let mut sizes: Vec<f64> = self
                .outlined
                .iter()
                .map(|o| (o.bounds[1][0] - o.bounds[0][0]).max(o.bounds[1][1] - o.bounds[0][1]))
                .collect();
            sizes.sort_by(f64::total_cmp);
            self.typical_size = sizes.get(sizes.len() / 2).copied().unwrap_or(0.0);
        }
    }

    /// Triangulates the outlined regions that `wanted` picks and that have no triangles yet.
    pub fn triangulate_where(&mut self, wanted: impl Fn(&Outlined) -> bool) {
        for o in &mut self.outlined {
            if o.triangles.is_none() && wanted(o) {
                o.triangles = Some(Arc::new(triangulate(&o.geometry)));
            }
        }
    }

    /// Builds the outline chains if the outlines changed since they were last built.
    pub fn ensure_chains(&mut self) {
        if self.chains_stale {
            self.build_chains();
            self.chains_stale = false;
        }
    }

    /// Bounding boxes and areas of every outlined region, for `view::hit_test`.
    pub fn hit_boxes(&self) -> impl Iterator<Item = (RegionId, [Point; 2], f64)> + '_ {
        self.outlined.iter().map(|o| (o.id, o.bounds, o.area))
    }

    fn build_chains(&mut self) {
        self.chains.clear();
        self.chain_points.clear();
        let total: usize = self
            .outlined
            .iter()
            .map(|o| o.geometry.vertex_count())
            .sum();
        let mut seen: Option<HashSet<[u64; 4]>> =
            (total <= MERGE_LIMIT).then(|| HashSet::with_capacity(total));
        let outlined = std::mem::take(&mut self.outlined);
        for o in &outlined {
            for poly in &o.geometry.polygons {
                for ring in std::iter::once(&poly.exterior).chain(poly.holes.iter()) {
                    self.add_ring(ring, seen.as_mut());
                }
            }
        }
        self.outlined = outlined;
    }

    /// Adds the segments of `ring` not drawn yet (by an earlier ring sharing them) as chains.
    fn add_ring(&mut self, ring: &[Point], seen: Option<&mut HashSet<[u64; 4]>>) {
        let n = ring.len();
        if n < 2 {
            return;
        }
        let new: Vec<bool> = match seen {
            Some(seen) => (0..n)
                .map(|i| {
                    let (p, q) = (ring[i], ring[(i + 1) % n]);
                    let (a, b) = if (p[0], p[1]) <= (q[0], q[1]) {
                        (p, q)
                    } else {
                        (q, p)
                    };
                    seen.insert([
                        a[0].to_bits(),
                        a[1].to_bits(),
                        b[0].to_bits(),
                        b[1].to_bits(),
                    ])
                })
                .collect(),
            None => vec![true; n],
        };
        if new.iter().all(|&x| x) {
            self.push_chain(ring.iter().copied(), true);
            return;
        }
        // Runs of new segments, starting after an old one so that a run never wraps unseen.
        let Some(start) = new.iter().position(|&x| !x) else {
            return;
        };
        let mut i = 0;
        while i < n {
            let s = (start + 1 + i) % n;
            if !new[s] {
                i += 1;
                continue;
            }
            let mut len = 0;
            while i + len < n && new[(start + 1 + i + len) % n] {
                len += 1;
            }
            self.push_chain((0..=len).map(|k| ring[(s + k) % n]), false);
            i += len;
        }
    }

    fn push_chain(&mut self, points: impl Iterator<Item = Point>, closed: bool) {
        let from = self.chain_points.len();
        let mut lo = [f64::INFINITY; 2];
        let mut hi = [f64::NEG_INFINITY; 2];
        for p in points {
            lo = [lo[0].min(p[0]), lo[1].min(p[1])];
            hi = [hi[0].max(p[0]), hi[1].max(p[1])];
            self.chain_points.push(p);
        }
        self.chains.push(Chain {
            points: from..self.chain_points.len(),
            closed,
            bounds: [lo, hi],
        });
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::fixtures::square;
    use crate::doc::{Edit, Polygon, Region};

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

    fn segments(scene: &Scene) -> usize {
        scene
            .chains
            .iter()
            .map(|c| c.points.len() - usize::from(!c.closed))
            .sum()
    }

    #[test]
    fn a_shared_side_is_drawn_once_and_edits_are_followed() {
        let mut doc = Document::new("Two squares");
        let add = |doc: &mut Document, x: f64| {
            let mut r = Region::new(format!("Square at {x}"), [x + 0.5, 0.5]);
            r.geometry = Some(Arc::new(square(x, 0.0, 1.0)));
            let (id, edit) = doc.add_region_edit(r);
            doc.apply(edit).unwrap();
            id
        };
        let a = add(&mut doc, 0.0);
        add(&mut doc, 1.0);
        let mut scene = Scene::default();
        scene.sync(&doc);
        scene.ensure_chains();
        // Two unit squares side by side: 8 sides, one of them shared (common practice: a shared
        // boundary is drawn once so it is not twice as dark).
        assert_eq!(segments(&scene), 7);
        assert_eq!(scene.outlined.len(), 2);
        assert!((scene.typical_size - 1.0).abs() < 1e-12);
        // Moving one square apart: the outline changes, so both squares are whole again.
        doc.apply(Edit::UpdateRegion {
            id: a,
            change: crate::doc::RegionChange::Geometry(Some(Arc::new(square(-5.0, 0.0, 1.0)))),
        })
        .unwrap();
        scene.sync(&doc);
        scene.ensure_chains();
        assert_eq!(segments(&scene), 8);
        assert_eq!(scene.chains.iter().filter(|c| c.closed).count(), 2);
    }
}
