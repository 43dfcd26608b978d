//! The line hierarchy of a printed map: which stretches of region outline are coast or outer
//! boundary, which are borders between two land regions, and which lie on water.
//!
//! Shared boundaries are found from the geometry itself: a segment between the same two vertices
//! in two rings (in either direction) is one boundary shared by the two regions. Imported maps
//! from topological sources (TopoJSON arcs, clean shapefiles, our own edits) repeat the shared
//! vertices exactly, so exact matching of the coordinates' bits is enough and decides the same
//! way on every machine. Where two outlines meet without sharing vertices, each side counts as
//! unshared and is drawn as coast: heavier than it should be, never missing.
//!
//! Each segment is drawn once, in chains of consecutive segments of one class (the same idea as
//! the editor's outline chains, written here for the library so the exporter does not depend on
//! the GUI).

use std::collections::{BTreeSet, HashMap};

use crate::doc::{Document, Point, RegionId, Role};

/// What a stretch of outline is, for its line weight.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum LineClass {
    /// An outline of land not shared with other land: the coast, or the map's outer boundary.
    Coast,
    /// A boundary shared by two land regions.
    Border,
    /// An outline with no land on either side: between two water regions, or water's outer edge.
    Water,
}

/// The classified outlines, as chains of points in world units, and what each region touches.
#[derive(Clone, Debug, Default)]
pub struct Lines {
    /// `(class, points)`; each chain is an open polyline.
    pub chains: Vec<(LineClass, Vec<Point>)>,
    /// For each region with an outline: the regions it shares boundary segments with, and how
    /// many of its segments are coast (shared with no land region).
    pub touches: HashMap<RegionId, Touches>,
}

/// What one region's outline meets.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Touches {
    /// Regions sharing at least one boundary segment with this one.
    pub neighbours: BTreeSet<RegionId>,
    /// Segments shared with no other region at all (open coast or the map's edge).
    pub unshared_segments: usize,
    /// Segments shared with a land region.
    pub land_segments: usize,
    /// All segments.
    pub segments: usize,
}

impl Touches {
    /// No boundary shared with land: an island (or a lake, for water).
    pub fn is_island(&self) -> bool {
        self.land_segments == 0
    }
    /// Every segment shared with one and the same neighbour: an enclave inside it.
    pub fn enclosed_by(&self) -> Option<RegionId> {
        (self.unshared_segments == 0 && self.neighbours.len() == 1)
            .then(|| self.neighbours.first().copied())
            .flatten()
    }
}

fn key(a: Point, b: Point) -> [u64; 4] {
    let (a, b) = (
        [a[0].to_bits(), a[1].to_bits()],
        [b[0].to_bits(), b[1].to_bits()],
    );
    if a <= b {
        [a[0], a[1], b[0], b[1]]
    } else {
        [b[0], b[1], a[0], a[1]]
    }
}

/// Classifies every outline segment of `doc` and joins them into chains.
pub fn classify(doc: &Document) -> Lines {
    // Who owns each segment: up to two owners are kept, and how many there were.
    let mut owners: HashMap<[u64; 4], (RegionId, Option<RegionId>, u32)> = HashMap::new();
    let outlined: Vec<_> = doc
        .regions()
        .iter()
        .filter_map(|(id, r)| r.geometry.as_ref().map(|g| (*id, g)))
        .collect();
    for (id, geometry) in &outlined {
        for polygon in &geometry.polygons {
            for ring in std::iter::once(&polygon.exterior).chain(polygon.holes.iter()) {
                for (a, b) in crate::geometry::edges(ring) {
                    if a == b {
                        continue;
                    }
                    let entry = owners.entry(key(a, b)).or_insert((*id, None, 0));
                    if entry.2 > 0 && entry.0 != *id && entry.1.is_none() {
                        entry.1 = Some(*id);
                    }
                    entry.2 += 1;
                }
            }
        }
    }
    let is_land = |id: RegionId| doc.regions().get(&id).is_some_and(|r| r.role == Role::Land);
    let class_of = |owner: &(RegionId, Option<RegionId>, u32)| {
        let land = usize::from(is_land(owner.0)) + owner.1.map_or(0, |b| usize::from(is_land(b)));
        match land {
            0 => LineClass::Water,
            1 => LineClass::Coast,
            _ => LineClass::Border,
        }
    };

    let mut lines = Lines::default();
    let mut drawn: std::collections::HashSet<[u64; 4]> = std::collections::HashSet::new();
    for (id, geometry) in &outlined {
        let touches = lines.touches.entry(*id).or_default();
        for polygon in &geometry.polygons {
            for ring in std::iter::once(&polygon.exterior).chain(polygon.holes.iter()) {
                let n = ring.len();
                if n < 2 {
                    continue;
                }
                // Each segment's class, or None when it was drawn already (by the neighbour).
                let mut classes: Vec<Option<LineClass>> = Vec::with_capacity(n);
                for i in 0..n {
                    let (a, b) = (ring[i], ring[(i + 1) % n]);
                    if a == b {
                        classes.push(None);
                        continue;
                    }
                    let k = key(a, b);
                    let owner = owners[&k];
                    touches.segments += 1;
                    let other = if owner.0 == *id {
                        owner.1
                    } else {
                        Some(owner.0)
                    };
                    match other {
                        Some(o) => {
                            touches.neighbours.insert(o);
                            if is_land(o) {
                                touches.land_segments += 1;
                            }
                        }
                        None => touches.unshared_segments += 1,
                    }
                    classes.push(drawn.insert(k).then(|| class_of(&owner)));
                }
                // Start where the class changes, so that no chain is cut at the ring's seam.
                let start = (0..n)
                    .find(|&i| classes[i] != classes[(i + n - 1) % n])
                    .unwrap_or(0);
                let mut current: Option<(LineClass, Vec<Point>)> = None;
                for step in 0..n {
                    let i = (start + step) % n;
                    match (classes[i], current.as_mut()) {
                        (Some(c), Some((cc, points))) if *cc == c => points.push(ring[(i + 1) % n]),
                        (Some(c), _) => {
                            if let Some(done) = current.take() {
                                lines.chains.push(done);
                            }
                            current = Some((c, vec![ring[i], ring[(i + 1) % n]]));
                        }
                        (None, _) => {
                            if let Some(done) = current.take() {
                                lines.chains.push(done);
                            }
                        }
                    }
                }
                if let Some(done) = current.take() {
                    lines.chains.push(done);
                }
            }
        }
    }
    lines
}

#[cfg(test)]
mod tests {
    use std::sync::Arc;

    use super::*;
    use crate::doc::{Edit, Geometry, Polygon, Region};

    fn square(doc: &mut Document, id: u64, x: f64, y: f64, role: Role) {
        let mut region = Region::new(format!("R{id}"), [x + 0.5, y + 0.5]);
        region.role = role;
        region.geometry = Some(Arc::new(Geometry {
            polygons: vec![Polygon {
                exterior: vec![[x, y], [x + 1.0, y], [x + 1.0, y + 1.0], [x, y + 1.0]],
                holes: vec![],
            }],
        }));
        doc.apply(Edit::PutRegion {
            id: RegionId(id),
            region: Some(region),
        })
        .unwrap();
    }

    fn total(lines: &Lines, class: LineClass) -> f64 {
        lines
            .chains
            .iter()
            .filter(|(c, _)| *c == class)
            .flat_map(|(_, p)| p.windows(2))
            .map(|w| ((w[1][0] - w[0][0]).powi(2) + (w[1][1] - w[0][1]).powi(2)).sqrt())
            .sum()
    }

    #[test]
    fn two_land_squares_and_a_lake_square_in_a_row() {
        // Land 1 | Land 2 | Water 3, unit squares side by side, and land square 4 apart. By hand:
        // the shared side of 1 and 2 is one border of length 1; the outside of 1 and 2 plus the
        // side 2 shares with the water is coast, 3 + 2 + 1 = 6, and the island's four sides make
        // 10; the water's own three free sides are water lines: 3.
        let mut doc = Document::new("row");
        square(&mut doc, 1, 0.0, 0.0, Role::Land);
        square(&mut doc, 2, 1.0, 0.0, Role::Land);
        square(&mut doc, 3, 2.0, 0.0, Role::Water);
        square(&mut doc, 4, 5.0, 5.0, Role::Land);
        let lines = classify(&doc);
        assert!((total(&lines, LineClass::Border) - 1.0).abs() < 1e-12);
        assert!((total(&lines, LineClass::Coast) - 10.0).abs() < 1e-12);
        assert!((total(&lines, LineClass::Water) - 3.0).abs() < 1e-12);
        let t2 = &lines.touches[&RegionId(2)];
        assert_eq!(t2.neighbours, [RegionId(1), RegionId(3)].into());
        assert_eq!(
            (t2.land_segments, t2.unshared_segments, t2.segments),
            (1, 2, 4)
        );
        assert!(!t2.is_island() && t2.enclosed_by().is_none());
        assert!(!lines.touches[&RegionId(3)].is_island());
        assert!(lines.touches[&RegionId(4)].is_island());
        assert_eq!(lines.touches[&RegionId(4)].unshared_segments, 4);
    }
}
