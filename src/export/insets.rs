//! Inset frames for the parts of a map that lie far from its main mass: Alaska, Hawaii and
//! Puerto Rico beside the conterminous US, overseas parts beside a country. Drawn where they
//! are, they shrink the main map to a corner of the page; common atlas practice moves them into
//! small framed boxes beside it, each at its own scale.
//!
//! **Which parts.** A map imported from longitude/latitude knows its projection, so every
//! outline is taken back to longitude/latitude and [`crate::projection::MainMass`] splits the
//! data into groups that lie close together (within about 220 km); the heaviest group is the
//! main mass. A region is *outlying* when all of its outlines lie outside the main mass.
//! Outlying regions that lie close to each other on the page (within 5 % of the main mass's
//! larger side) share one inset.
//!
//! **When.** Only when it pays: the map has a projection and is not a world map (on a world map
//! every continent has its place), the outlying regions together cover at most half the main
//! mass's area (so a map of two equal islands keeps both where they are), and the whole map's box
//! is at least 1.5 times the main mass's box (the far parts really do cost room).
//!
//! **Where.** Each inset keeps the map's scale when it fits in a box of 30 % of the main mass's
//! width and 32 % of its height, and is shrunk to fit otherwise; a small island group is enlarged
//! (at most four times) until the inset's longer side is a tenth of the main mass's larger side,
//! so that it and its name can be seen. The caption of an inset at another scale gives that scale
//! against the main map's. The insets sit in one row, west to east as they lie, in the
//! corner of the main mass's box where they cover the least land (sampled on a grid); when every
//! corner would cover land they go in a row below the map. Nothing is moved in the project: the
//! export draws a copy.
//!
//! # Complexity
//! O(v) for `v` outline vertices to find the groups and move them, plus O(k² + c · s · r) to
//! cluster `k` outlying regions and score `c` corners with `s` samples against the `r` main
//! regions whose boxes hold a sample.

use std::sync::Arc;

use crate::doc::{Document, Edit, Geometry, Point, RegionChange, RegionId};
use crate::projection::{MainMass, Projection};

/// One inset: its frame on the arranged map (map units) and its scale against the main map.
#[derive(Clone, Debug, PartialEq)]
pub struct Inset {
    /// The frame's box `[min, max]` in the arranged map's units (a margin around its regions).
    pub frame: [Point; 2],
    /// The inset's scale as a fraction of the main map's (1 when it kept the map's scale).
    pub scale: f64,
    /// The regions drawn in it.
    pub regions: Vec<RegionId>,
}

/// The map with its outlying parts moved into insets.
#[derive(Clone, Debug)]
pub struct Arranged {
    /// A copy of the document with the outlying regions' outlines and anchors moved.
    pub doc: Document,
    pub insets: Vec<Inset>,
}

impl Arranged {
    /// The box `[min, max]` of the main mass and every inset frame.
    pub fn extent(&self) -> Option<[Point; 2]> {
        let mut b = self.doc.bounds()?;
        for inset in &self.insets {
            b = union(b, inset.frame);
        }
        Some(b)
    }
}

const MAX_WIDTH: f64 = 0.30;
const MIN_SIDE: f64 = 0.10;
const MAX_ENLARGE: f64 = 4.0;
const MAX_HEIGHT: f64 = 0.32;
const CLUSTER_GAP: f64 = 0.05;
const PAD: f64 = 0.015;
const MAX_OUTLYING_SHARE: f64 = 0.5;
const MIN_SAVING: f64 = 1.5;
const SAMPLES: usize = 24;

fn union(a: [Point; 2], b: [Point; 2]) -> [Point; 2] {
    [
        [a[0][0].min(b[0][0]), a[0][1].min(b[0][1])],
        [a[1][0].max(b[1][0]), a[1][1].max(b[1][1])],
    ]
}

fn size(b: [Point; 2]) -> [f64; 2] {
    [b[1][0] - b[0][0], b[1][1] - b[0][1]]
}

fn region_box(doc: &Document, id: RegionId) -> [Point; 2] {
    let r = &doc.regions()[&id];
    r.geometry
        .as_ref()
        .and_then(|g| g.bounds())
        .map_or([r.anchor, r.anchor], |b| union(b, [r.anchor, r.anchor]))
}

/// The regions that lie away from the main mass, or `None` when the map has no projection or is
/// a world map.
pub fn outlying_regions(doc: &Document) -> Option<Vec<RegionId>> {
    let projection = doc.settings().projection?;
    if matches!(projection, Projection::EqualEarth { .. }) {
        return None;
    }
    // One part per exterior ring (or the anchor of a region without an outline), in
    // longitude/latitude, remembering whose it is.
    let mut parts: Vec<Vec<[f64; 2]>> = Vec::new();
    let mut owner: Vec<RegionId> = Vec::new();
    for (id, region) in doc.regions() {
        match &region.geometry {
            Some(g) if !g.polygons.is_empty() => {
                for polygon in &g.polygons {
                    parts.push(
                        polygon
                            .exterior
                            .iter()
                            .map(|&p| projection.unproject(p))
                            .collect(),
                    );
                    owner.push(*id);
                }
            }
            _ => {
                parts.push(vec![projection.unproject(region.anchor)]);
                owner.push(*id);
            }
        }
    }
    let mass = MainMass::find(&parts)?;
    let mut out: Vec<RegionId> = Vec::new();
    let mut i = 0;
    while i < parts.len() {
        let id = owner[i];
        let mut all = true;
        while i < parts.len() && owner[i] == id {
            all &= mass.outlying[i];
            i += 1;
        }
        if all {
            out.push(id);
        }
    }
    Some(out)
}

/// The map with its outlying parts in insets (see the module documentation), or `None` when
/// insets would not help.
pub fn arrange(doc: &Document) -> Option<Arranged> {
    let outlying = outlying_regions(doc)?;
    if outlying.is_empty() {
        return None;
    }
    let far: std::collections::BTreeSet<RegionId> = outlying.iter().copied().collect();
    let main_ids: Vec<RegionId> = doc
        .regions()
        .keys()
        .filter(|id| !far.contains(id))
        .copied()
        .collect();
    let area = |ids: &[RegionId]| -> f64 {
        ids.iter()
            .filter_map(|id| doc.regions()[id].geometry.as_ref())
            .map(|g| g.area())
            .sum()
    };
    let main_area = area(&main_ids);
    if main_ids.is_empty() || area(&outlying) > MAX_OUTLYING_SHARE * main_area {
        return None;
    }
    let main_box = main_ids
        .iter()
        .map(|&id| region_box(doc, id))
        .reduce(union)?;
    let whole = doc.bounds()?;
    let box_area =
        |b: [Point; 2]| size(b)[0].max(f64::MIN_POSITIVE) * size(b)[1].max(f64::MIN_POSITIVE);
    if box_area(whole) < MIN_SAVING * box_area(main_box) {
        return None;
    }
    let [w, h] = size(main_box);
    let side = w.max(h);
    if side <= 0.0 {
        return None;
    }

    // Outlying regions close together share an inset (single linkage on their boxes).
    let boxes: Vec<[Point; 2]> = outlying.iter().map(|&id| region_box(doc, id)).collect();
    let gap = CLUSTER_GAP * side;
    let mut root: Vec<usize> = (0..boxes.len()).collect();
    fn find(root: &mut [usize], mut i: usize) -> usize {
        while root[i] != i {
            root[i] = root[root[i]];
            i = root[i];
        }
        i
    }
    for i in 0..boxes.len() {
        for j in i + 1..boxes.len() {
            let (a, b) = (boxes[i], boxes[j]);
            let dx = (a[0][0] - b[1][0]).max(b[0][0] - a[1][0]).max(0.0);
            let dy = (a[0][1] - b[1][1]).max(b[0][1] - a[1][1]).max(0.0);
            if dx.hypot(dy) <= gap {
                let (ri, rj) = (find(&mut root, i), find(&mut root, j));
                root[ri.max(rj)] = ri.min(rj);
            }
        }
    }
    let mut clusters: Vec<(Vec<RegionId>, [Point; 2])> = Vec::new();
    let mut index_of = std::collections::BTreeMap::new();
    for i in 0..boxes.len() {
        let r = find(&mut root, i);
        let k = *index_of.entry(r).or_insert_with(|| {
            clusters.push((Vec::new(), boxes[i]));
            clusters.len() - 1
        });
        clusters[k].0.push(outlying[i]);
        clusters[k].1 = union(clusters[k].1, boxes[i]);
    }
    // West to east, as they lie.
    clusters.sort_by(|a, b| (a.1[0][0] + a.1[1][0]).total_cmp(&(b.1[0][0] + b.1[1][0])));

    // Sizes at their scales.
    let pad = PAD * side;
    let scaled: Vec<(f64, [f64; 2])> = clusters
        .iter()
        .map(|(_, b)| {
            let [cw, ch] = size(*b);
            let longest = cw.max(ch).max(f64::MIN_POSITIVE);
            // Small islands are enlarged until the inset's longer side is a tenth of the main
            // mass's, at most four times, so that they and their names can be seen.
            let s = (MIN_SIDE * side / longest)
                .clamp(1.0, MAX_ENLARGE)
                .min(MAX_WIDTH * w / cw.max(f64::MIN_POSITIVE))
                .min(MAX_HEIGHT * h / ch.max(f64::MIN_POSITIVE));
            (s, [cw * s + 2.0 * pad, ch * s + 2.0 * pad])
        })
        .collect();
    let row_width: f64 =
        scaled.iter().map(|(_, d)| d[0]).sum::<f64>() + pad * (scaled.len() - 1) as f64;
    let row_height = scaled.iter().map(|(_, d)| d[1]).fold(0.0, f64::max);

    // The frames of a row starting at `x0` (going east when `east`), bottom edge or top edge at `y`.
    let frames_at = |x0: f64, east: bool, y: f64, top: bool| -> Vec<[Point; 2]> {
        let mut x = if east { x0 } else { x0 - row_width };
        scaled
            .iter()
            .map(|(_, d)| {
                let lo_y = if top { y - d[1] } else { y };
                let f = [[x, lo_y], [x + d[0], lo_y + d[1]]];
                x += d[0] + pad;
                f
            })
            .collect()
    };
    let [lo, hi] = main_box;
    let corners = [
        frames_at(lo[0], true, lo[1], false),  // bottom left
        frames_at(hi[0], false, lo[1], false), // bottom right
        frames_at(lo[0], true, hi[1], true),   // top left
        frames_at(hi[0], false, hi[1], true),  // top right
    ];
    let covered = |frames: &[[Point; 2]]| -> usize {
        let mut n = 0;
        for f in frames {
            let [fw, fh] = size(*f);
            for i in 0..SAMPLES {
                for j in 0..SAMPLES {
                    let p = [
                        f[0][0] + fw * (i as f64 + 0.5) / SAMPLES as f64,
                        f[0][1] + fh * (j as f64 + 0.5) / SAMPLES as f64,
                    ];
                    if main_ids.iter().any(|id| land_at(doc, *id, p)) {
                        n += 1;
                    }
                }
            }
        }
        n
    };
    let fits = row_width <= w;
    let best = if fits {
        corners
            .iter()
            .map(|frames| (covered(frames), frames))
            .min_by_key(|(n, _)| *n)
            .filter(|(n, _)| *n == 0)
            .map(|(_, f)| f.clone())
    } else {
        None
    };
    // Else a row below the map, starting at its west edge.
    let frames = best.unwrap_or_else(|| frames_at(lo[0], true, lo[1] - pad, true));
    let _ = row_height;

    let mut arranged = doc.clone();
    let mut insets = Vec::new();
    for (((ids, b), (s, _)), frame) in clusters.iter().zip(&scaled).zip(&frames) {
        let origin = [frame[0][0] + pad, frame[0][1] + pad];
        let place = |p: Point| {
            [
                origin[0] + (p[0] - b[0][0]) * s,
                origin[1] + (p[1] - b[0][1]) * s,
            ]
        };
        for id in ids {
            let region = &doc.regions()[id];
            if let Some(g) = &region.geometry {
                let mut moved: Geometry = (**g).clone();
                for polygon in &mut moved.polygons {
                    for p in polygon
                        .exterior
                        .iter_mut()
                        .chain(polygon.holes.iter_mut().flatten())
                    {
                        *p = place(*p);
                    }
                }
                let _ = arranged.apply(Edit::UpdateRegion {
                    id: *id,
                    change: RegionChange::Geometry(Some(Arc::new(moved))),
                });
            }
            let _ = arranged.apply(Edit::UpdateRegion {
                id: *id,
                change: RegionChange::Anchor(place(region.anchor)),
            });
        }
        insets.push(Inset {
            frame: *frame,
            scale: *s,
            regions: ids.clone(),
        });
    }
    Some(Arranged {
        doc: arranged,
        insets,
    })
}

/// Whether `p` lies on the land or water of region `id` (inside an outline, not in a hole).
fn land_at(doc: &Document, id: RegionId, p: Point) -> bool {
    let Some(g) = &doc.regions()[&id].geometry else {
        return false;
    };
    let Some(b) = g.bounds() else {
        return false;
    };
    if p[0] < b[0][0] || p[0] > b[1][0] || p[1] < b[0][1] || p[1] > b[1][1] {
        return false;
    }
    g.polygons.iter().any(|polygon| {
        crate::geometry::point_in_ring(&polygon.exterior, p)
            && !polygon
                .holes
                .iter()
                .any(|h| crate::geometry::point_in_ring(h, p))
    })
}
