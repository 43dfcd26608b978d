//! The pole of inaccessibility of a polygon: the interior point farthest from its boundary, where
//! a label has the most room.
//!
//! The algorithm is the one Mapbox published as "polylabel" (Agafonkin, 2016), itself a faster
//! form of the grid search of Garcia-Castellanos & Lombardo, "Poles of inaccessibility: a
//! calculation algorithm for the remotest places on Earth" (Scottish Geographical Journal 123,
//! 2007): cover the polygon with square cells, keep them in a priority queue ordered by the best
//! distance any point of the cell could have (its centre's distance plus half its diagonal), and
//! split the most promising cell into four until no cell can beat the best centre found by more
//! than the precision.
//!
//! # Complexity
//! Each distance evaluation is `O(n)` in the polygon's vertices; the number of cells visited
//! grows with `log(size / precision)` for ordinary shapes (no worst-case bound is known).

use std::cmp::Ordering;
use std::collections::BinaryHeap;

use crate::geometry::{Point, edges, point_in_rings};

/// Signed distance from `p` to the polygon's boundary: positive inside (even-odd over `rings`),
/// negative outside.
pub fn signed_distance(rings: &[&[Point]], p: Point) -> f64 {
    let mut best = f64::INFINITY;
    for ring in rings {
        for (a, b) in edges(ring) {
            best = best.min(segment_distance_sq(p, a, b));
        }
    }
    let d = best.sqrt();
    if point_in_rings(rings.iter().copied(), p) {
        d
    } else {
        -d
    }
}

/// Squared distance from `p` to the segment `a b`.
pub fn segment_distance_sq(p: Point, a: Point, b: Point) -> f64 {
    let (dx, dy) = (b[0] - a[0], b[1] - a[1]);
    let len_sq = dx * dx + dy * dy;
    let t = if len_sq > 0.0 {
        (((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / len_sq).clamp(0.0, 1.0)
    } else {
        0.0
    };
    let (x, y) = (a[0] + t * dx - p[0], a[1] + t * dy - p[1]);
    x * x + y * y
}

#[derive(Clone, Copy)]
struct Cell {
    centre: Point,
    half: f64,
    distance: f64,
    potential: f64,
}

impl Cell {
    fn new(centre: Point, half: f64, rings: &[&[Point]]) -> Cell {
        let distance = signed_distance(rings, centre);
        Cell {
            centre,
            half,
            distance,
            potential: distance + half * std::f64::consts::SQRT_2,
        }
    }
}

impl PartialEq for Cell {
    fn eq(&self, other: &Cell) -> bool {
        self.potential == other.potential
    }
}
impl Eq for Cell {}
impl PartialOrd for Cell {
    fn partial_cmp(&self, other: &Cell) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for Cell {
    fn cmp(&self, other: &Cell) -> Ordering {
        self.potential.total_cmp(&other.potential)
    }
}

/// The pole of inaccessibility of the polygon made of `rings` (the exterior first, then holes;
/// even-odd), to within `precision`, and its distance to the boundary. `None` when the rings hold
/// no area.
pub fn pole_of_inaccessibility(rings: &[&[Point]], precision: f64) -> Option<(Point, f64)> {
    let mut points = rings.iter().flat_map(|r| r.iter());
    let first = *points.next()?;
    let (mut lo, mut hi) = (first, first);
    for p in points {
        lo = [lo[0].min(p[0]), lo[1].min(p[1])];
        hi = [hi[0].max(p[0]), hi[1].max(p[1])];
    }
    let (width, height) = (hi[0] - lo[0], hi[1] - lo[1]);
    let cell_size = width.min(height);
    if !(cell_size > 0.0 && cell_size.is_finite()) {
        return None;
    }
    let precision = precision.max(cell_size * 1e-6);
    let half = cell_size / 2.0;
    let mut queue = BinaryHeap::new();
    let mut x = lo[0];
    while x < hi[0] {
        let mut y = lo[1];
        while y < hi[1] {
            queue.push(Cell::new([x + half, y + half], half, rings));
            y += cell_size;
        }
        x += cell_size;
    }
    // First guesses: the centroid of the exterior and the centre of the bounding box.
    let mut best = Cell::new(centroid(rings[0]).unwrap_or(lo), 0.0, rings);
    let box_cell = Cell::new([lo[0] + width / 2.0, lo[1] + height / 2.0], 0.0, rings);
    if box_cell.distance > best.distance {
        best = box_cell;
    }
    // A bound on the work, far above what real outlines need, so a pathological ring cannot
    // keep an export busy.
    let mut budget = 200_000usize;
    while let Some(cell) = queue.pop() {
        if cell.distance > best.distance {
            best = cell;
        }
        if cell.potential - best.distance <= precision || budget == 0 {
            continue;
        }
        split(&cell, rings, &mut queue);
        budget = budget.saturating_sub(4);
    }
    (best.distance > 0.0).then_some((best.centre, best.distance))
}

fn split(cell: &Cell, rings: &[&[Point]], queue: &mut BinaryHeap<Cell>) {
    let h = cell.half / 2.0;
    let [x, y] = cell.centre;
    for (dx, dy) in [(-h, -h), (h, -h), (-h, h), (h, h)] {
        queue.push(Cell::new([x + dx, y + dy], h, rings));
    }
}

/// The area centroid of a ring, `None` for a ring without area.
fn centroid(ring: &[Point]) -> Option<Point> {
    let (mut a, mut cx, mut cy) = (0.0, 0.0, 0.0);
    for (p, q) in edges(ring) {
        let f = p[0] * q[1] - q[0] * p[1];
        a += f;
        cx += (p[0] + q[0]) * f;
        cy += (p[1] + q[1]) * f;
    }
    (a != 0.0).then(|| [cx / (3.0 * a), cy / (3.0 * a)])
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn square_pole_is_its_centre() {
        // A fact of plane geometry: the point of a square farthest from its sides is the centre,
        // half a side from each.
        let square = [[0.0, 0.0], [10.0, 0.0], [10.0, 10.0], [0.0, 10.0]];
        let (p, d) = pole_of_inaccessibility(&[&square[..]], 0.01).unwrap();
        assert!(
            (p[0] - 5.0).abs() < 0.02 && (p[1] - 5.0).abs() < 0.02,
            "{p:?}"
        );
        assert!((d - 5.0).abs() < 0.01);
    }

    #[test]
    fn an_l_shape_puts_the_pole_in_its_thick_corner() {
        // An L of two 10 x 4 arms. By hand: along the diagonal, the point (2 + t, 2 + t) is
        // 2 + t from the outer sides and sqrt(2) (2 - t) from the inner corner (4, 4); the two
        // are equal at t = (2 sqrt(2) - 2) / (1 + sqrt(2)), so the pole is (2 + t, 2 + t) at
        // distance 2 + t, about 2.343, more than the half-thickness 2 of either arm.
        let l = [
            [0.0, 0.0],
            [10.0, 0.0],
            [10.0, 4.0],
            [4.0, 4.0],
            [4.0, 10.0],
            [0.0, 10.0],
        ];
        let t = (2.0 * 2f64.sqrt() - 2.0) / (1.0 + 2f64.sqrt());
        let (p, d) = pole_of_inaccessibility(&[&l[..]], 0.0001).unwrap();
        assert!((d - (2.0 + t)).abs() < 0.001, "{d}");
        assert!(
            (p[0] - (2.0 + t)).abs() < 0.01 && (p[1] - (2.0 + t)).abs() < 0.01,
            "{p:?}"
        );
    }

    #[test]
    fn a_hole_pushes_the_pole_away() {
        // A 10 x 10 square with a 4 x 4 hole in its middle: the pole is in the ring between
        // them, at distance 1.5 from the boundary (the band is 3 wide), not at the centre.
        let outer = [[0.0, 0.0], [10.0, 0.0], [10.0, 10.0], [0.0, 10.0]];
        let hole = [[3.0, 3.0], [7.0, 3.0], [7.0, 7.0], [3.0, 7.0]];
        let (p, d) = pole_of_inaccessibility(&[&outer[..], &hole[..]], 0.001).unwrap();
        assert!(d >= 1.5 - 0.002, "{d}");
        assert!(!(3.0..=7.0).contains(&p[0]) || !(3.0..=7.0).contains(&p[1]));
        assert!(pole_of_inaccessibility(&[&[[0.0, 0.0], [1.0, 0.0]][..]], 0.1).is_none());
    }
}
