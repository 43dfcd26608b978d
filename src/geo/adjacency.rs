//! Adjacency derivation: rook and queen contiguity with a distance tolerance and shared lengths.
//!
//! Every ring edge becomes a segment in an R-tree (`rstar`, bulk-loaded), with its bounding box
//! grown by half the search band; a self-join of the tree yields the candidate pairs of segments
//! whose boxes come within the band, so the work grows with the number of segments times the
//! (small) number of nearby segments, never with the square of the region count.
//!
//! For a candidate pair of segments from different regions within the tolerance `r`, we find
//! the part of each segment lying within distance `r` of the other: the intersection of the
//! segment with the other's capsule (the Minkowski sum of the segment and a disc of radius `r`),
//! which is one interval because the capsule is convex. Along each ring these intervals are
//! merged into runs per neighbouring region.
//!
//! * **Contact**: two regions touch when some run exists (their boundaries come within `r`).
//! * **Shared length**: each run is shortened by `r` at both ends (a run that covers the whole
//!   ring is kept whole), because near a point contact a boundary lies within `r` of the other
//!   region for about `r` on each side of the point; so a right-angled corner contact measures
//!   zero, and a border of length `L` measures about `L`. The border's length is the mean of
//!   what the two regions' boundaries measure. Contacts measuring less than twice the tolerance
//!   plus a millionth of the map's diagonal count as point contacts (boundaries meeting at a
//!   narrow angle stay within `r` of each other for `r / sin(angle)`).
//! * **Rook** (after the rook's move in chess; common practice in spatial statistics, e.g. Anselin,
//!   *Spatial Econometrics*, 1988): regions with a shared length of at least the minimum length.
//! * **Queen**: any contact; contacts without shared length become [`BorderKind::Corner`].
//!
//! A tolerance of zero means "exact": we still use a tiny tolerance of 1e-9 of the map's
//! diagonal so that a vertex lying on another region's edge (a T-junction) counts despite
//! rounding; edges that only share an end point then touch at that point alone, and runs are
//! not shortened.
//!
//! Diagnostics from the same pass: self-intersecting rings (non-adjacent edges of one ring that
//! meet), overlaps (edges of two regions that cross, with an end lying inside the other region
//! further than the tolerance from its boundary; two exterior outlines lying wholly along each
//! other; a region inside another without touching it, found with an R-tree of region boxes),
//! and gaps (regions that come within the gap band but not within the tolerance).

use std::borrow::Cow;
use std::collections::BTreeMap;

use rstar::{
    AABB, Envelope, ParentNode, RStarInsertionStrategy, RTree, RTreeNode, RTreeObject, RTreeParams,
};

use super::{
    BorderKind, Diagnostic, DiagnosticKind, ImportedBorder, ImportedRegion, Point, Projection, Rule,
};
use crate::geometry::{segments_cross, segments_intersect};

/// Settings for [`derive_borders`].
#[derive(Clone, Debug, PartialEq)]
pub struct AdjacencyOptions {
    pub rule: Rule,
    /// Boundaries within this distance count as touching (world units).
    pub tolerance: f64,
    /// Rook: shared borders shorter than this are left out.
    pub min_border_length: f64,
    /// Regions closer than this but not touching get a gap diagnostic; default: three times the
    /// tolerance, at least 1e-4 of the map's diagonal.
    pub gap_width: Option<f64>,
    /// For projected longitude/latitude data: measure shared lengths as great-circle distances
    /// on this projection's sphere instead of in the plane (an equal-area projection stretches
    /// lengths by a few per cent away from its centre).
    pub lengths_on_sphere: Option<Projection>,
}

impl Default for AdjacencyOptions {
    fn default() -> Self {
        Self {
            rule: Rule::Rook,
            tolerance: 0.0,
            min_border_length: 0.0,
            gap_width: None,
            lengths_on_sphere: None,
        }
    }
}

/// The contacts between regions before the rule is applied: region pairs `(a, b)` with
/// `a < b`, sorted, each with its shared length (`0` for a corner contact). A sorted vector costs
/// 16 bytes a contact; a map of them cost three times that on a million-region map.
#[derive(Clone, Debug, Default, PartialEq)]
pub(super) struct Contacts(Vec<((u32, u32), f64)>);

impl Contacts {
    /// From contacts already sorted by pair, each pair once.
    pub(super) fn from_sorted(list: Vec<((u32, u32), f64)>) -> Contacts {
        debug_assert!(list.windows(2).all(|w| w[0].0 < w[1].0));
        Contacts(list)
    }
    pub(super) fn contains(&self, a: usize, b: usize) -> bool {
        let key = (a.min(b) as u32, a.max(b) as u32);
        self.0.binary_search_by_key(&key, |c| c.0).is_ok()
    }
}

/// One ring edge, assembled on demand from the [`Geometry`] arrays (a stored copy costs 64 bytes
/// per edge: half a gigabyte on a million-region map).
#[derive(Clone, Copy, Debug)]
struct Segment {
    p: Point,
    q: Point,
    region: u32,
    ring: u32,
    /// Position of the edge within its ring and the ring's edge count, to tell adjacent edges.
    index: u32,
    ring_edges: u32,
    /// Distance along the ring from its first position to `p`, and the segment's length (both
    /// great-circle metres when measuring on the sphere).
    offset: f64,
    length: f64,
}

/// An R-tree entry: a chain of up to [`CHAIN`] consecutive edges of one ring, with their common
/// box grown by half the search band. Indexing short chains rather than single edges keeps the
/// tree several times smaller; pairs of chains are then checked edge by edge.
struct Boxed {
    envelope: AABB<Point>,
    first: u32,
    count: u32,
}

const CHAIN: usize = 8;

impl RTreeObject for Boxed {
    type Envelope = AABB<Point>;
    fn envelope(&self) -> Self::Envelope {
        self.envelope
    }
}

/// Wider nodes than rstar's default make bulk loading and the self-join cheaper for the many
/// small, evenly spread boxes of a map's edges (measured in benches/adjacency.rs).
struct WideNodes;

impl RTreeParams for WideNodes {
    const MIN_SIZE: usize = 6;
    const MAX_SIZE: usize = 16;
    const REINSERTION_COUNT: usize = 4;
    type DefaultInsertionStrategy = RStarInsertionStrategy;
}

fn node_envelope(node: &RTreeNode<Boxed>) -> AABB<Point> {
    match node {
        RTreeNode::Leaf(b) => b.envelope,
        RTreeNode::Parent(p) => p.envelope(),
    }
}

/// Calls `found` once for every unordered pair of distinct leaves whose boxes intersect.
/// (rstar's `intersection_candidates_with_other_tree` on the tree itself reports each pair in
/// both orders and every leaf with itself; this walk does half the work.)
fn self_join(node: &ParentNode<Boxed>, found: &mut dyn FnMut(&Boxed, &Boxed) -> bool) -> bool {
    let children = node.children();
    for (k, a) in children.iter().enumerate() {
        if let RTreeNode::Parent(p) = a
            && !self_join(p, found)
        {
            return false;
        }
        let envelope = node_envelope(a);
        for b in &children[k + 1..] {
            if envelope.intersects(&node_envelope(b)) && !cross_join(a, b, found) {
                return false;
            }
        }
    }
    true
}

/// Calls `found` for every pair of leaves under `a` and `b` whose envelopes meet; stops (and
/// returns false) as soon as `found` does.
fn cross_join(
    a: &RTreeNode<Boxed>,
    b: &RTreeNode<Boxed>,
    found: &mut dyn FnMut(&Boxed, &Boxed) -> bool,
) -> bool {
    match (a, b) {
        (RTreeNode::Leaf(x), RTreeNode::Leaf(y)) => found(x, y),
        (RTreeNode::Leaf(_), RTreeNode::Parent(p)) => {
            let envelope = node_envelope(a);
            for c in p.children() {
                if envelope.intersects(&node_envelope(c)) && !cross_join(a, c, found) {
                    return false;
                }
            }
            true
        }
        (RTreeNode::Parent(p), _) => {
            let envelope = node_envelope(b);
            for c in p.children() {
                if node_envelope(c).intersects(&envelope) && !cross_join(c, b, found) {
                    return false;
                }
            }
            true
        }
    }
}

/// How many candidate pairs of boundary pieces the geometric pass examines before it gives up:
/// clean maps need a few per segment (at most 4.6 across the test maps, with and without a
/// tolerance), so sixteen leaves room for unusually dense ones; a map where everything lies within the tolerance of
/// everything else (one coordinate far off makes the rounding tolerance and the gap band, both
/// fractions of the map's diagonal, cover the whole map) would otherwise take time and memory
/// quadratic in its size.
pub fn candidate_pair_limit(segments: usize) -> usize {
    segments.saturating_mul(16).saturating_add(10_000)
}

/// A stretch of one ring lying within the tolerance of another region's boundary.
#[derive(Clone, Copy, Debug)]
struct Run {
    ring: u32,
    other: u32,
    start: f64,
    end: f64,
}

/// Derives the borders between regions, sorted by `(a, b)`, and the diagnostics found on the way.
/// Contacts that the rule leaves out are dropped; [`derive_contacts`] keeps them.
///
/// # Complexity
/// `O((n + k) log n)` time for `n` segments and `k` candidate pairs within the search band
/// (for maps whose regions meet edge to edge, `k` is a small multiple of `n`); `O(n + k)` space.
pub fn derive_borders(
    regions: &[ImportedRegion],
    options: &AdjacencyOptions,
) -> (Vec<ImportedBorder>, Vec<Diagnostic>) {
    let derived = derive_contacts(regions, options);
    (derived.borders, derived.diagnostics)
}

/// Every contact between regions, split by the rule into borders and excluded contacts.
#[derive(Clone, Debug, PartialEq)]
pub struct Derived {
    /// The borders the rule selects, sorted by `(a, b)`.
    pub borders: Vec<ImportedBorder>,
    /// Contacts the rule leaves out (corner contacts and, for rook, shared borders shorter than
    /// the minimum length), sorted by `(a, b)`; kept so that a user can bring them back.
    pub excluded: Vec<ImportedBorder>,
    pub diagnostics: Vec<Diagnostic>,
}

/// Like [`derive_borders`], keeping the contacts the rule leaves out. Same complexity.
pub fn derive_contacts(regions: &[ImportedRegion], options: &AdjacencyOptions) -> Derived {
    let geometry = Geometry::build(regions, options.lengths_on_sphere.as_ref());
    let (contacts, mut diagnostics) = geometry.contacts(regions, options);
    let mut derived = apply_rule(regions, contacts, options);
    diagnostics.append(&mut derived.diagnostics);
    derived.diagnostics = diagnostics;
    derived
}

/// The rings' edges, numbered ring by ring: edge `k` runs from the `k - first`-th position of its
/// ring to the next one (wrapping round). The positions stay where the regions hold them (rings
/// cleaned by the importer have no repeated consecutive positions); only a ring that is not clean
/// is copied. An edge costs 12 bytes (its ring and offset) beside its position.
struct Geometry<'a> {
    /// Per edge: the distance along its ring from the ring's first position to the edge's start.
    offsets: Vec<f64>,
    /// Per edge: its ring.
    edge_ring: Vec<u32>,
    rings: Vec<RingInfo<'a>>,
    /// Edges of region `r` are `region_edges[r]..region_edges[r + 1]`.
    region_edges: Vec<u32>,
    diagonal: f64,
}

struct RingInfo<'a> {
    points: Cow<'a, [Point]>,
    region: u32,
    /// Its first edge.
    first: u32,
    perimeter: f64,
    exterior: bool,
}

/// The ring as the edges need it: finite positions, no position repeating the one before it
/// (nor the last repeating the first), at least two; borrowed when it already is.
fn edge_ready(ring: &[Point]) -> Option<Cow<'_, [Point]>> {
    let finite = |v: &Point| v[0].is_finite() && v[1].is_finite();
    let clean = ring.len() >= 2
        && ring.iter().all(finite)
        && ring.windows(2).all(|w| w[0] != w[1])
        && ring.first() != ring.last();
    if clean {
        return Some(Cow::Borrowed(ring));
    }
    let mut out: Vec<Point> = ring.iter().copied().filter(finite).collect();
    out.dedup();
    while out.len() > 1 && out.last() == out.first() {
        out.pop();
    }
    (out.len() >= 2).then_some(Cow::Owned(out))
}

impl<'a> Geometry<'a> {
    fn build(regions: &'a [ImportedRegion], sphere: Option<&Projection>) -> Self {
        let total: usize = regions
            .iter()
            .flat_map(|r| &r.parts)
            .map(|p| p.exterior.len() + p.holes.iter().map(Vec::len).sum::<usize>())
            .sum();
        let mut offsets = Vec::with_capacity(total);
        let mut edge_ring = Vec::with_capacity(total);
        let mut rings = Vec::new();
        let mut region_edges = Vec::with_capacity(regions.len() + 1);
        let (mut min, mut max) = ([f64::INFINITY; 2], [f64::NEG_INFINITY; 2]);
        for (r, region) in regions.iter().enumerate() {
            region_edges.push(offsets.len() as u32);
            for polygon in &region.parts {
                for (k, ring) in std::iter::once(&polygon.exterior)
                    .chain(&polygon.holes)
                    .enumerate()
                {
                    let Some(points) = edge_ready(ring) else {
                        continue;
                    };
                    let ring_id = rings.len() as u32;
                    let first = offsets.len() as u32;
                    let mut offset = 0.0;
                    for (p, q) in crate::geometry::edges(&points) {
                        min = [min[0].min(p[0]), min[1].min(p[1])];
                        max = [max[0].max(p[0]), max[1].max(p[1])];
                        offsets.push(offset);
                        edge_ring.push(ring_id);
                        offset += sphere.map_or_else(
                            || (q[0] - p[0]).hypot(q[1] - p[1]),
                            |s| s.distance_m(p, q),
                        );
                    }
                    rings.push(RingInfo {
                        points,
                        region: r as u32,
                        first,
                        perimeter: offset,
                        exterior: k == 0,
                    });
                }
            }
        }
        region_edges.push(offsets.len() as u32);
        let diagonal = if offsets.is_empty() {
            0.0
        } else {
            (max[0] - min[0]).hypot(max[1] - min[1])
        };
        Self {
            offsets,
            edge_ring,
            rings,
            region_edges,
            diagonal,
        }
    }

    fn edge_count(&self) -> usize {
        self.offsets.len()
    }

    /// Where ring `ring`'s edges end.
    fn ring_end(&self, ring: usize) -> usize {
        let info = &self.rings[ring];
        info.first as usize + info.points.len()
    }

    fn segment(&self, k: usize) -> Segment {
        let ring = self.edge_ring[k] as usize;
        let info = &self.rings[ring];
        let i = k - info.first as usize;
        let n = info.points.len();
        let offset = self.offsets[k];
        let (next, to) = if i + 1 < n {
            (i + 1, self.offsets[k + 1])
        } else {
            (0, info.perimeter)
        };
        Segment {
            p: info.points[i],
            q: info.points[next],
            region: info.region,
            ring: ring as u32,
            index: i as u32,
            ring_edges: n as u32,
            offset,
            length: to - offset,
        }
    }

    /// The edges of region `r`.
    fn region_segments(&self, r: usize) -> impl Iterator<Item = Segment> + '_ {
        (self.region_edges[r] as usize..self.region_edges[r + 1] as usize).map(|k| self.segment(k))
    }

    fn contacts(
        &self,
        regions: &[ImportedRegion],
        options: &AdjacencyOptions,
    ) -> (Contacts, Vec<Diagnostic>) {
        let mut diagnostics = Vec::new();
        if self.offsets.is_empty() {
            return (Contacts::default(), diagnostics);
        }
        let tolerance = options.tolerance.max(0.0).max(1e-9 * self.diagonal);
        let band = options
            .gap_width
            .unwrap_or((3.0 * options.tolerance).max(1e-4 * self.diagonal))
            .max(tolerance);
        let grow = band / 2.0;
        let exact = options.tolerance <= 0.0;
        // Runs are shortened by the tolerance at both ends (see the module notes); with no
        // tolerance, edges meeting at a point give point runs, so there is nothing to remove.
        let erosion = if exact { 0.0 } else { tolerance };
        // Each segment's box grown by half the band, computed when needed rather than stored
        // (a stored copy is a quarter of a gigabyte on a million-region map).
        let box_of = |k: usize| {
            let s = self.segment(k);
            [
                s.p[0].min(s.q[0]) - grow,
                s.p[1].min(s.q[1]) - grow,
                s.p[0].max(s.q[0]) + grow,
                s.p[1].max(s.q[1]) + grow,
            ]
        };
        let mut chains: Vec<Boxed> = Vec::with_capacity(self.edge_count() / CHAIN + 1);
        let mut k = 0;
        while k < self.edge_count() {
            let ring = self.edge_ring[k];
            let mut end = k + 1;
            while end < self.edge_count() && end - k < CHAIN && self.edge_ring[end] == ring {
                end += 1;
            }
            let mut b = box_of(k);
            for x in (k + 1..end).map(box_of) {
                b = [
                    b[0].min(x[0]),
                    b[1].min(x[1]),
                    b[2].max(x[2]),
                    b[3].max(x[3]),
                ];
            }
            chains.push(Boxed {
                envelope: AABB::from_corners([b[0], b[1]], [b[2], b[3]]),
                first: k as u32,
                count: (end - k) as u32,
            });
            k = end;
        }
        let overlap = |a: &[f64; 4], b: &[f64; 4]| {
            a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3]
        };
        let tree: RTree<Boxed, WideNodes> = RTree::bulk_load_with_params(chains);

        // Runs come in three sizes: a whole edge shared with another region's edge (the common
        // case: the edge and the neighbour, 8 bytes), a point contact (exact mode; only the pair
        // of regions matters, 8 bytes) and a partial stretch (24 bytes). On a clean
        // million-region map the first two are tens of millions.
        let mut runs: Vec<Run> = Vec::new();
        let mut edge_runs: Vec<(u32, u32)> = Vec::new();
        let mut touches: Vec<(u32, u32)> = Vec::new();
        let mut recent_touches = vec![(u32::MAX, u32::MAX); 1 << 12];
        let mut self_crossing_rings: Vec<u32> = Vec::new();
        let mut near: BTreeMap<(u32, u32), f64> = BTreeMap::new();
        let mut crossings: BTreeMap<(u32, u32), Vec<(u32, u32)>> = BTreeMap::new();
        let mut visit = |i: u32, j: u32| {
            let (i, j) = (i.min(j), i.max(j));
            let (s, t) = (self.segment(i as usize), self.segment(j as usize));
            if s.ring == t.ring {
                let gap = s.index.abs_diff(t.index);
                let adjacent = gap == 1 || gap + 1 == s.ring_edges;
                if !adjacent && segments_intersect(s.p, s.q, t.p, t.q) {
                    self_crossing_rings.push(s.ring);
                }
                return;
            }
            if s.region == t.region {
                return;
            }
            let key = (s.region.min(t.region), s.region.max(t.region));
            // The common case in clean data: the same edge in both regions (usually reversed).
            // Each lies wholly within the other's capsule, and they cannot cross.
            if (s.p == t.q && s.q == t.p) || (s.p == t.p && s.q == t.q) {
                edge_runs.push((i, t.region));
                edge_runs.push((j, s.region));
                return;
            }
            // Edges meeting only at a common end point (not along a line): with the tolerance at
            // its rounding floor the part within reach is that point, so record it as such.
            if exact {
                // The directions of s and of t away from the shared point.
                let away =
                    |from_p: bool, a: Point, b: Point| if from_p { sub(b, a) } else { sub(a, b) };
                let shared = [(true, true), (true, false), (false, true), (false, false)]
                    .into_iter()
                    .find(|&(sv, tv)| (if sv { s.p } else { s.q }) == (if tv { t.p } else { t.q }))
                    .map(|(sv, tv)| (away(sv, s.p, s.q), away(tv, t.p, t.q)));
                // Every vertex of a ring starts exactly one of its edges (zero-length edges are
                // skipped, so the next edge starts there), so the pair of edges that both start
                // at a shared point records a point contact once; the other pairs meeting there
                // would only repeat it (four times as many runs at every corner of a map).
                let first_pair = s.p == t.p;
                if let Some((ds, dt)) = shared {
                    // Only edges leaving the point in the same direction run along each other.
                    let along = cross(ds, dt).abs()
                        <= 1e-12 * dot(ds, ds).sqrt() * dot(dt, dt).sqrt()
                        && dot(ds, dt) > 0.0;
                    if !along {
                        if first_pair {
                            // A point adds no length; the contact alone is recorded, once per
                            // pair as far as a small cache of recent pairs can tell (the
                            // neighbouring vertices of a border repeat it).
                            let slot = &mut recent_touches[touch_slot(key)];
                            if *slot != key {
                                *slot = key;
                                touches.push(key);
                            }
                        }
                        return;
                    }
                }
            }
            // The capsule test is empty exactly when the segments are further apart than the
            // tolerance; only then is the distance needed, for the gap band.
            let Some((u0, u1)) = capsule_interval(s.p, s.q, t.p, t.q, tolerance) else {
                if band > tolerance {
                    let distance = segment_distance(s.p, s.q, t.p, t.q);
                    if distance <= band {
                        let d = near.entry(key).or_insert(f64::INFINITY);
                        *d = d.min(distance);
                    }
                }
                return;
            };
            runs.push(Run {
                ring: s.ring,
                other: t.region,
                start: s.offset + u0 * s.length,
                end: s.offset + u1 * s.length,
            });
            if let Some((u0, u1)) = capsule_interval(t.p, t.q, s.p, s.q, tolerance) {
                runs.push(Run {
                    ring: t.ring,
                    other: s.region,
                    start: t.offset + u0 * t.length,
                    end: t.offset + u1 * t.length,
                });
            }
            if segments_cross(s.p, s.q, t.p, t.q) {
                let list = crossings.entry(key).or_default();
                // A few crossings per pair are enough to find an overlap if there is one.
                if list.len() < 16 {
                    list.push((i, j));
                }
            }
        };
        let limit = candidate_pair_limit(self.edge_count());
        let mut examined = 0usize;
        let mut found = |a: &Boxed, b: &Boxed| {
            examined += 1;
            for i in a.first..a.first + a.count {
                let bi = box_of(i as usize);
                for j in b.first..b.first + b.count {
                    if overlap(&bi, &box_of(j as usize)) {
                        examined += 1;
                        visit(i, j);
                    }
                }
            }
            examined <= limit
        };
        let complete = self_join(tree.root(), &mut found);
        if !complete {
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::File,
                regions: vec![],
                message: format!(
                    "border detection stopped after {limit} candidate pairs: nearly every \
                     boundary lies within the tolerance ({tolerance}) or the gap band ({band}) \
                     of every other, so borders and gaps are incomplete. Is a coordinate far \
                     from the rest? The map's diagonal is {}",
                    self.diagonal
                ),
            });
        }
        // Pairs within one chain: only self-intersections of its ring can show there.
        for chain in tree.iter() {
            for i in chain.first..chain.first + chain.count {
                for j in i + 2..chain.first + chain.count {
                    if overlap(&box_of(i as usize), &box_of(j as usize)) {
                        visit(i, j);
                    }
                }
            }
        }

        drop(tree);
        // Group the runs by ring (edges are numbered ring by ring, so sorting whole-edge runs by
        // edge groups them too; in place, no second copy), then merge them along each ring per
        // neighbouring region and measure them.
        runs.sort_unstable_by_key(|r| r.ring);
        edge_runs.sort_unstable();
        let (mut next_run, mut next_edge_run) = (0, 0);
        let mut ring_runs: Vec<Run> = Vec::new();
        let eps = 1e-9 * self.diagonal;
        let mut side: Vec<((u32, u32), f64)> = Vec::new();
        let mut merged: Vec<(f64, f64)> = Vec::new();
        // (region, other): an exterior ring of `region` lies wholly along `other`'s boundary.
        // (region, other, the ring's perimeter): an exterior ring of `region` lies wholly along
        // `other`'s boundary.
        let mut outline_covered: Vec<(u32, u32, f64)> = Vec::new();
        for ring in 0..self.rings.len() {
            ring_runs.clear();
            while let Some(&run) = runs.get(next_run).filter(|r| r.ring as usize == ring) {
                ring_runs.push(run);
                next_run += 1;
            }
            let end = self.ring_end(ring) as u32;
            while let Some(&(edge, other)) = edge_runs.get(next_edge_run).filter(|e| e.0 < end) {
                let s = self.segment(edge as usize);
                ring_runs.push(Run {
                    ring: ring as u32,
                    other,
                    start: s.offset,
                    end: s.offset + s.length,
                });
                next_edge_run += 1;
            }
            let runs = &mut ring_runs;
            if runs.is_empty() {
                continue;
            }
            runs.sort_unstable_by(|a, b| a.other.cmp(&b.other).then(a.start.total_cmp(&b.start)));
            let (region, perimeter) = (self.rings[ring].region, self.rings[ring].perimeter);
            for group in runs.chunk_by(|a, b| a.other == b.other) {
                merged.clear();
                for run in group {
                    match merged.last_mut() {
                        Some(last) if run.start <= last.1 + eps => last.1 = last.1.max(run.end),
                        _ => merged.push((run.start, run.end)),
                    }
                }
                // A run through the ring's first position appears as two pieces; join them.
                if merged.len() >= 2
                    && merged[0].0 <= eps
                    && merged[merged.len() - 1].1 >= perimeter - eps
                {
                    let (a, b) = merged.pop().unwrap_or((0.0, 0.0));
                    merged[0].0 -= b - a;
                }
                let measured: f64 = merged
                    .iter()
                    .map(|&(a, b)| {
                        let l = b - a;
                        if l >= perimeter - eps {
                            perimeter
                        } else {
                            (l - 2.0 * erosion).max(0.0)
                        }
                    })
                    .sum();
                let other = group[0].other;
                if self.rings[ring].exterior
                    && merged.iter().any(|&(a, b)| b - a >= perimeter - eps)
                {
                    outline_covered.push((region, other, perimeter));
                }
                side.push(((region.min(other), region.max(other)), measured));
            }
        }
        drop((runs, edge_runs, ring_runs));
        // Both sides of a shared border measure it: the contact's length is half their sum. A
        // point contact adds nothing to a pair that shares a border, and is the pair's only
        // record otherwise. The pairs are gathered, sorted and folded in the one vector.
        touches.sort_unstable();
        touches.dedup();
        side.extend(touches.into_iter().map(|pair| (pair, 0.0)));
        side.sort_unstable_by_key(|a| a.0);
        // Near a point contact a boundary stays within the tolerance for about `r / sin(angle)`
        // beside the point, where `angle` is the angle between the two boundaries there; the
        // erosion removes `r` of it. A contact measuring less than twice the user's tolerance
        // (plus a millionth of the map's diagonal, for rounding and thin angles when the
        // tolerance is zero) is therefore taken as a point contact.
        let floor = 2.0 * options.tolerance.max(0.0) + 1e-6 * self.diagonal;
        let mut kept = 0;
        let mut start = 0;
        while start < side.len() {
            let pair = side[start].0;
            let mut end = start;
            let mut sum = 0.0;
            while end < side.len() && side[end].0 == pair {
                sum += side[end].1;
                end += 1;
            }
            let length = sum / 2.0;
            side[kept] = (pair, if length <= floor { 0.0 } else { length });
            kept += 1;
            start = end;
        }
        side.truncate(kept);
        side.shrink_to_fit();
        let contacts = Contacts::from_sorted(side);

        self_crossing_rings.sort_unstable();
        self_crossing_rings.dedup();
        for ring in self_crossing_rings {
            let region = self.rings[ring as usize].region as usize;
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::SelfIntersection,
                regions: vec![region],
                message: format!(
                    "a ring of region {:?} crosses or touches itself",
                    regions[region].name
                ),
            });
        }

        // Two exterior outlines lying wholly along each other: the same area twice (a duplicate
        // feature), not an enclave (whose outline lies along a hole of its neighbour).
        // Both ways, and by rings of the same length: an enclave of each inside the other (their
        // outlines lie along holes of the neighbour) is not the same outline, however often it
        // happens (Azerbaijan and Armenia each hold enclaves of the other in Natural Earth).
        outline_covered
            .sort_unstable_by(|x, y| (x.0, x.1).cmp(&(y.0, y.1)).then(x.2.total_cmp(&y.2)));
        let same_length = |p: f64, q: f64| (p - q).abs() <= 2.0 * tolerance + 1e-6 * p.max(q);
        let mut reported: Vec<(u32, u32)> = Vec::new();
        for &(a, b, perimeter) in &outline_covered {
            let twin = outline_covered
                .iter()
                .any(|&(x, y, q)| x == b && y == a && same_length(perimeter, q));
            if a < b && twin && !reported.contains(&(a, b)) {
                reported.push((a, b));
                let (a, b) = (a as usize, b as usize);
                diagnostics.push(Diagnostic {
                    kind: DiagnosticKind::Overlap,
                    regions: vec![a, b],
                    message: format!(
                        "regions {:?} and {:?} have the same outline: one covers the other",
                        regions[a].name, regions[b].name
                    ),
                });
            }
        }
        self.nested_without_contact(regions, &contacts, tolerance, &mut diagnostics);

        for (&(a, b), list) in &crossings {
            let mut depth: f64 = 0.0;
            for &(i, j) in list {
                let (s, t) = (self.segment(i as usize), self.segment(j as usize));
                for (p, other) in [
                    (s.p, t.region),
                    (s.q, t.region),
                    (t.p, s.region),
                    (t.q, s.region),
                ] {
                    if let Some(d) = self.depth_inside(other as usize, p) {
                        depth = depth.max(d);
                    }
                }
            }
            if depth > tolerance {
                let (a, b) = (a as usize, b as usize);
                diagnostics.push(Diagnostic {
                    kind: DiagnosticKind::Overlap,
                    regions: vec![a, b],
                    message: format!(
                        "regions {:?} and {:?} overlap: a boundary vertex lies {} inside the other \
                         region, more than the tolerance {}",
                        regions[a].name,
                        regions[b].name,
                        fmt_length(depth),
                        fmt_length(options.tolerance)
                    ),
                });
            }
        }

        for (&(a, b), &d) in &near {
            let (a, b) = (a as usize, b as usize);
            if contacts.contains(a, b) {
                continue;
            }
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::Gap,
                regions: vec![a, b],
                message: format!(
                    "regions {:?} and {:?} come within {} of each other but do not touch within \
                     the tolerance {}",
                    regions[a].name,
                    regions[b].name,
                    fmt_length(d),
                    fmt_length(options.tolerance)
                ),
            });
        }
        (contacts, diagnostics)
    }

    /// Reports regions lying inside another region without touching its boundary (so no edge
    /// pair shows the overlap): an R-tree of region boxes finds the candidates, and a vertex of
    /// the inner region is tested against the outer one.
    fn nested_without_contact(
        &self,
        regions: &[ImportedRegion],
        contacts: &Contacts,
        tolerance: f64,
        diagnostics: &mut Vec<Diagnostic>,
    ) {
        let mut boxes = Vec::new();
        for r in 0..regions.len() {
            let mut points = self.region_segments(r).map(|s| s.p).peekable();
            let Some(&first) = points.peek() else {
                continue;
            };
            let (mut lo, mut hi) = (first, first);
            for v in points {
                lo = [lo[0].min(v[0]), lo[1].min(v[1])];
                hi = [hi[0].max(v[0]), hi[1].max(v[1])];
            }
            boxes.push(Boxed {
                envelope: AABB::from_corners(lo, hi),
                first: r as u32,
                count: 0,
            });
        }
        let tree: RTree<Boxed, WideNodes> = RTree::bulk_load_with_params(boxes);
        let mut found = Vec::new();
        for inner in tree.iter() {
            let b = inner.first as usize;
            let p = self.segment(self.region_edges[b] as usize).p;
            for outer in tree.locate_in_envelope_intersecting(inner.envelope) {
                let a = outer.first as usize;
                if a == b
                    || !outer.envelope.contains_envelope(&inner.envelope)
                    || contacts.contains(a, b)
                {
                    continue;
                }
                if self.depth_inside(a, p).is_some_and(|d| d > tolerance) {
                    found.push((a, b));
                }
            }
        }
        found.sort_unstable();
        for (a, b) in found {
            diagnostics.push(Diagnostic {
                kind: DiagnosticKind::Overlap,
                regions: vec![a.min(b), a.max(b)],
                message: format!(
                    "region {:?} lies inside region {:?} without touching its boundary",
                    regions[b].name, regions[a].name
                ),
            });
        }
    }

    /// How far `p` lies inside region `r` (distance to its boundary), or `None` if outside.
    fn depth_inside(&self, r: usize, p: Point) -> Option<f64> {
        let mut inside = false;
        let mut best = f64::INFINITY;
        for s in self.region_segments(r) {
            let (a, b) = (s.p, s.q);
            if (a[1] > p[1]) != (b[1] > p[1]) {
                let x = a[0] + (p[1] - a[1]) / (b[1] - a[1]) * (b[0] - a[0]);
                if p[0] < x {
                    inside = !inside;
                }
            }
            best = best.min(point_segment_distance(p, a, b));
        }
        inside.then_some(best)
    }
}

/// Applies the rook or queen rule to contacts; shared length `0` means a corner contact.
pub(super) fn apply_rule(
    regions: &[ImportedRegion],
    contacts: Contacts,
    options: &AdjacencyOptions,
) -> Derived {
    let kept = |length: f64| match options.rule {
        Rule::Queen => true,
        Rule::Rook => length > 0.0 && length >= options.min_border_length,
    };
    let borders = contacts.0.iter().filter(|c| kept(c.1)).count();
    let mut derived = Derived {
        borders: Vec::with_capacity(borders),
        excluded: Vec::with_capacity(contacts.0.len() - borders),
        diagnostics: Vec::new(),
    };
    for ((a, b), length) in contacts.0 {
        let (a, b) = (a as usize, b as usize);
        let kind = if length > 0.0 {
            BorderKind::Shared { length }
        } else {
            BorderKind::Corner
        };
        let keep = kept(length);
        if !keep && matches!(kind, BorderKind::Shared { .. }) {
            derived.diagnostics.push(Diagnostic {
                kind: DiagnosticKind::ShortBorder,
                regions: vec![a, b],
                message: format!(
                    "the border between {:?} and {:?} is {} long, shorter than the minimum {}; \
                     left out",
                    regions[a].name,
                    regions[b].name,
                    fmt_length(length),
                    fmt_length(options.min_border_length)
                ),
            });
        }
        let border = ImportedBorder { a, b, kind };
        if keep {
            derived.borders.push(border);
        } else {
            derived.excluded.push(border);
        }
    }
    derived
}

/// Where a pair of regions goes in the cache of recent point contacts.
fn touch_slot((a, b): (u32, u32)) -> usize {
    let h = (u64::from(a) << 32 | u64::from(b)).wrapping_mul(0x9E37_79B9_7F4A_7C15);
    (h >> 52) as usize
}

fn fmt_length(x: f64) -> String {
    if x == 0.0 {
        "0".to_string()
    } else if x.abs() >= 100.0 {
        format!("{x:.0}")
    } else {
        format!("{x:.3}")
    }
}

fn sub(a: Point, b: Point) -> Point {
    [a[0] - b[0], a[1] - b[1]]
}

fn dot(a: Point, b: Point) -> f64 {
    a[0] * b[0] + a[1] * b[1]
}

fn cross(a: Point, b: Point) -> f64 {
    a[0] * b[1] - a[1] * b[0]
}

pub(super) fn point_segment_distance(p: Point, a: Point, b: Point) -> f64 {
    let d = sub(b, a);
    let len2 = dot(d, d);
    let u = if len2 > 0.0 {
        (dot(sub(p, a), d) / len2).clamp(0.0, 1.0)
    } else {
        0.0
    };
    let c = [a[0] + u * d[0], a[1] + u * d[1]];
    (p[0] - c[0]).hypot(p[1] - c[1])
}

pub(super) fn segment_distance(a: Point, b: Point, c: Point, d: Point) -> f64 {
    if segments_intersect(a, b, c, d) {
        return 0.0;
    }
    point_segment_distance(a, c, d)
        .min(point_segment_distance(b, c, d))
        .min(point_segment_distance(c, a, b))
        .min(point_segment_distance(d, a, b))
}

/// The parameter interval `[u0, u1]` of segment `p0 + u (p1 - p0)`, `u` in `[0, 1]`, lying within
/// distance `r` of segment `q0 q1`: the segment clipped by the capsule around `q0 q1`.
///
/// The capsule is the union of two discs and a rectangle; it is convex, so the clipped part is
/// the hull of the three clipped parts.
pub(super) fn capsule_interval(
    p0: Point,
    p1: Point,
    q0: Point,
    q1: Point,
    r: f64,
) -> Option<(f64, f64)> {
    let d = sub(p1, p0);
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    let a = dot(d, d);
    if a <= 0.0 {
        return None;
    }
    for c in [q0, q1] {
        let w = sub(p0, c);
        let b = 2.0 * dot(d, w);
        let cc = dot(w, w) - r * r;
        let disc = b * b - 4.0 * a * cc;
        if disc >= 0.0 {
            let s = disc.sqrt();
            lo = lo.min((-b - s) / (2.0 * a));
            hi = hi.max((-b + s) / (2.0 * a));
        }
    }
    let e = sub(q1, q0);
    let len = dot(e, e).sqrt();
    if len > 0.0 {
        let ex = [e[0] / len, e[1] / len];
        let n = [-ex[1], ex[0]];
        let w = sub(p0, q0);
        // Along the line: s(u) = s0 + u ds must stay in [0, len], t(u) = t0 + u dt in [-r, r].
        let (s0, ds) = (dot(w, ex), dot(d, ex));
        let (t0, dt) = (dot(w, n), dot(d, n));
        let mut u_lo = f64::NEG_INFINITY;
        let mut u_hi = f64::INFINITY;
        let mut clip = |v0: f64, dv: f64, min: f64, max: f64| {
            if dv == 0.0 {
                if v0 < min || v0 > max {
                    u_lo = f64::INFINITY;
                }
            } else {
                let (x, y) = ((min - v0) / dv, (max - v0) / dv);
                u_lo = u_lo.max(x.min(y));
                u_hi = u_hi.min(x.max(y));
            }
        };
        clip(s0, ds, 0.0, len);
        clip(t0, dt, -r, r);
        if u_lo <= u_hi {
            lo = lo.min(u_lo);
            hi = hi.max(u_hi);
        }
    }
    let (lo, hi) = (lo.max(0.0), hi.min(1.0));
    (lo <= hi).then_some((lo, hi))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn capsule_interval_of_parallel_segments_is_their_overlap() {
        // Two parallel segments 0.5 apart, overlapping on x in [2, 4]; radius 1 reaches
        // sqrt(1 - 0.25) beyond the overlap at the discs' edges.
        let (u0, u1) =
            capsule_interval([0.0, 0.0], [4.0, 0.0], [2.0, 0.5], [6.0, 0.5], 1.0).unwrap();
        let reach = (1.0f64 - 0.25).sqrt();
        assert!((u0 * 4.0 - (2.0 - reach)).abs() < 1e-12);
        assert!((u1 - 1.0).abs() < 1e-12);
        assert!(capsule_interval([0.0, 0.0], [4.0, 0.0], [0.0, 2.0], [4.0, 2.0], 1.0).is_none());
    }

    #[test]
    fn segment_predicates() {
        assert!(segments_intersect(
            [0.0, 0.0],
            [2.0, 2.0],
            [0.0, 2.0],
            [2.0, 0.0]
        ));
        assert!(segments_cross(
            [0.0, 0.0],
            [2.0, 2.0],
            [0.0, 2.0],
            [2.0, 0.0]
        ));
        // Touching at an end point intersects but does not cross.
        assert!(segments_intersect(
            [0.0, 0.0],
            [1.0, 0.0],
            [1.0, 0.0],
            [1.0, 1.0]
        ));
        assert!(!segments_cross(
            [0.0, 0.0],
            [1.0, 0.0],
            [1.0, 0.0],
            [1.0, 1.0]
        ));
        assert_eq!(
            segment_distance([0.0, 0.0], [1.0, 0.0], [0.0, 3.0], [1.0, 3.0]),
            3.0
        );
    }
}
