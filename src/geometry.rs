//! Plane geometry shared by the importers, the document, the exports and the editor: one ring
//! convention, exact orientation, one signed area, one point-in-ring test.
//!
//! **Rings are open**: the first point is not repeated at the end. The document stores rings so,
//! and the importers open the closed rings of their inputs when they clean them. Every function
//! here also gives the right answer for a closed ring, whose repeated point only adds an edge of
//! length zero, so a ring read from a file can be measured before it is cleaned.
//!
//! Orientation is decided exactly with Shewchuk's adaptive-precision predicate ("Adaptive
//! Precision Floating-Point Arithmetic and Fast Robust Geometric Predicates", Discrete &
//! Computational Geometry 18, 1997) from the `robust` crate: "collinear" means collinear, not
//! "within rounding of it". A leaf: it uses nothing else in the crate.

/// A point in world units: `[x, y]`.
pub type Point = [f64; 2];

/// Which way `c` lies seen from `a` towards `b`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Turn {
    /// Anticlockwise (to the left).
    Left,
    /// Clockwise (to the right).
    Right,
    /// On the line through `a` and `b`.
    Straight,
}

/// Twice the signed area of the triangle `a b c` (positive when anticlockwise), with its sign
/// exact.
#[inline]
pub fn orient2d(a: Point, b: Point, c: Point) -> f64 {
    let coord = |p: Point| robust::Coord { x: p[0], y: p[1] };
    robust::orient2d(coord(a), coord(b), coord(c))
}

/// The exact turn from `a -> b` to `c`.
#[inline]
pub fn turn(a: Point, b: Point, c: Point) -> Turn {
    let o = orient2d(a, b, c);
    if o > 0.0 {
        Turn::Left
    } else if o < 0.0 {
        Turn::Right
    } else {
        Turn::Straight
    }
}

/// The edges of a ring, closing edge included: `(p0, p1), (p1, p2), ..., (pn-1, p0)`.
pub fn edges(ring: &[Point]) -> impl Iterator<Item = (Point, Point)> + '_ {
    let n = ring.len();
    (0..if n < 2 { 0 } else { n }).map(move |i| (ring[i], ring[(i + 1) % n]))
}

/// The signed area of a ring by the shoelace formula: positive when anticlockwise.
pub fn signed_area(ring: &[Point]) -> f64 {
    if ring.len() < 3 {
        return 0.0;
    }
    edges(ring)
        .map(|(a, b)| a[0] * b[1] - b[0] * a[1])
        .sum::<f64>()
        / 2.0
}

/// True when `p` is inside the ring by the even-odd (crossing number) rule. Points exactly on the
/// boundary may go either way.
pub fn point_in_ring(ring: &[Point], p: Point) -> bool {
    let mut inside = false;
    for (a, b) in edges(ring) {
        if (a[1] > p[1]) != (b[1] > p[1]) {
            let x = a[0] + (p[1] - a[1]) / (b[1] - a[1]) * (b[0] - a[0]);
            if p[0] < x {
                inside = !inside;
            }
        }
    }
    inside
}

/// True when `p` is inside a set of rings by the even-odd rule (holes are outside).
pub fn point_in_rings<'a>(rings: impl IntoIterator<Item = &'a [Point]>, p: Point) -> bool {
    rings
        .into_iter()
        .fold(false, |inside, ring| inside ^ point_in_ring(ring, p))
}

fn on_segment_box(a: Point, b: Point, p: Point) -> bool {
    p[0] >= a[0].min(b[0])
        && p[0] <= a[0].max(b[0])
        && p[1] >= a[1].min(b[1])
        && p[1] <= a[1].max(b[1])
}

/// True when the closed segments `a b` and `c d` share a point (crossing, touching or
/// overlapping), decided exactly.
pub fn segments_intersect(a: Point, b: Point, c: Point, d: Point) -> bool {
    let (o1, o2, o3, o4) = (turn(a, b, c), turn(a, b, d), turn(c, d, a), turn(c, d, b));
    let opposite = |x: Turn, y: Turn| {
        matches!(
            (x, y),
            (Turn::Left, Turn::Right) | (Turn::Right, Turn::Left)
        )
    };
    if opposite(o1, o2) && opposite(o3, o4) {
        return true;
    }
    (o1 == Turn::Straight && on_segment_box(a, b, c))
        || (o2 == Turn::Straight && on_segment_box(a, b, d))
        || (o3 == Turn::Straight && on_segment_box(c, d, a))
        || (o4 == Turn::Straight && on_segment_box(c, d, b))
}

/// True when the segments cross at a point inside both (each separates the other's ends),
/// decided exactly.
pub fn segments_cross(a: Point, b: Point, c: Point, d: Point) -> bool {
    let opposite = |x: Turn, y: Turn| {
        matches!(
            (x, y),
            (Turn::Left, Turn::Right) | (Turn::Right, Turn::Left)
        )
    };
    opposite(turn(a, b, c), turn(a, b, d)) && opposite(turn(c, d, a), turn(c, d, b))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn orientation_is_exact_where_the_naive_product_rounds_to_the_wrong_sign() {
        // Points on the line y = x near (0.5, 0.5) in steps of one unit in the last place: the
        // plain cross product misjudges many of them (the example of Kettner et al., "Classroom
        // examples of robustness problems in geometric computations", 2008, from memory). The
        // exact test says the point on the line is on it, and neighbours lie on the right sides.
        let a = [12.0, 12.0];
        let b = [24.0, 24.0];
        let on = [0.5, 0.5];
        assert_eq!(turn(a, b, on), Turn::Straight);
        let above = [0.5, f64::from_bits(0.5f64.to_bits() + 1)];
        let below = [0.5, f64::from_bits(0.5f64.to_bits() - 1)];
        assert_eq!(turn(a, b, above), Turn::Left);
        assert_eq!(turn(a, b, below), Turn::Right);
    }

    #[test]
    fn open_and_closed_rings_measure_the_same() {
        let open = [[0.0, 0.0], [4.0, 0.0], [4.0, 3.0], [0.0, 3.0]];
        let mut closed = open.to_vec();
        closed.push(open[0]);
        assert_eq!(signed_area(&open), 12.0);
        assert_eq!(signed_area(&closed), 12.0);
        let clockwise: Vec<Point> = open.iter().rev().copied().collect();
        assert_eq!(signed_area(&clockwise), -12.0);
        for ring in [&open[..], &closed[..]] {
            assert!(point_in_ring(ring, [1.0, 1.0]));
            assert!(!point_in_ring(ring, [5.0, 1.0]));
        }
        // A hole makes its inside outside.
        let hole = [[1.0, 1.0], [2.0, 1.0], [2.0, 2.0], [1.0, 2.0]];
        assert!(!point_in_rings([&open[..], &hole[..]], [1.5, 1.5]));
        assert!(point_in_rings([&open[..], &hole[..]], [3.0, 2.5]));
    }

    #[test]
    fn segments_touching_at_an_end_intersect_but_do_not_cross() {
        let (a, b) = ([0.0, 0.0], [2.0, 0.0]);
        assert!(segments_intersect(a, b, [2.0, 0.0], [3.0, 1.0]));
        assert!(!segments_cross(a, b, [2.0, 0.0], [3.0, 1.0]));
        assert!(segments_cross(a, b, [1.0, -1.0], [1.0, 1.0]));
        assert!(!segments_intersect(a, b, [0.0, 1.0], [2.0, 1.0]));
        // Collinear and overlapping.
        assert!(segments_intersect(a, b, [1.0, 0.0], [3.0, 0.0]));
    }
}
