//! DSATUR greedy colouring (Brélaz 1979), respecting pinned classes.

use std::cmp::Reverse;
use std::collections::BinaryHeap;

use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// Colours `g` greedily, always next colouring the uncoloured vertex whose neighbours already show
/// the most distinct colours (ties: most uncoloured neighbours, then lowest index), with the lowest
/// class it may take.
///
/// Brélaz, "New methods to color the vertices of a graph", CACM 22 (1979). Pinned vertices
/// (`pin_class[v] = Some(c)`) are coloured first with their class.
///
/// # Complexity
/// O((n + m) log n) time with a lazy heap; O(n + m) extra space.
///
/// # Certificate
/// The colouring itself; check it with [`crate::engine::colouring::check_colouring`].
pub fn dsatur(g: &Graph, pin_class: &[Option<u32>]) -> Vec<u32> {
    let n = g.vertex_count();
    let mut colour = vec![NONE; n];
    // Distinct neighbour colours per vertex, kept sorted (lists stay short on sparse graphs).
    let mut seen: Vec<Vec<u32>> = vec![Vec::new(); n];
    let mut uncoloured_degree: Vec<u32> = (0..n as u32).map(|v| g.degree(v) as u32).collect();
    let mut heap = BinaryHeap::new();

    let paint = |v: Vertex,
                 c: u32,
                 colour: &mut Vec<u32>,
                 seen: &mut Vec<Vec<u32>>,
                 uncoloured_degree: &mut Vec<u32>,
                 heap: &mut BinaryHeap<(u32, u32, Reverse<u32>)>| {
        colour[v as usize] = c;
        for &w in g.neighbours(v) {
            let w = w as usize;
            uncoloured_degree[w] = uncoloured_degree[w].saturating_sub(1);
            if colour[w] != NONE {
                continue;
            }
            if let Err(pos) = seen[w].binary_search(&c) {
                seen[w].insert(pos, c);
            }
            heap.push((
                seen[w].len() as u32,
                uncoloured_degree[w],
                Reverse(w as u32),
            ));
        }
    };

    for v in 0..n {
        if let Some(Some(c)) = pin_class.get(v) {
            paint(
                v as Vertex,
                *c,
                &mut colour,
                &mut seen,
                &mut uncoloured_degree,
                &mut heap,
            );
        }
    }
    for v in 0..n {
        if colour[v] == NONE {
            heap.push((
                seen[v].len() as u32,
                uncoloured_degree[v],
                Reverse(v as u32),
            ));
        }
    }
    while let Some((sat, udeg, Reverse(v))) = heap.pop() {
        let vi = v as usize;
        if colour[vi] != NONE || sat != seen[vi].len() as u32 || udeg != uncoloured_degree[vi] {
            continue; // stale entry
        }
        let mut c = 0u32;
        for &s in &seen[vi] {
            if s == c {
                c += 1;
            } else if s > c {
                break;
            }
        }
        paint(
            v,
            c,
            &mut colour,
            &mut seen,
            &mut uncoloured_degree,
            &mut heap,
        );
        seen[vi] = Vec::new();
    }
    colour
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn colours_an_odd_cycle_with_three_classes() {
        let (g, _) = Graph::from_edges(5, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 0)]).unwrap();
        let c = dsatur(&g, &[]);
        for (u, v) in g.edges() {
            assert_ne!(c[u as usize], c[v as usize]);
        }
        assert_eq!(*c.iter().max().unwrap(), 2);
    }

    #[test]
    fn keeps_pinned_classes() {
        let (g, _) = Graph::from_edges(3, &[(0, 1), (1, 2)]).unwrap();
        let c = dsatur(&g, &[None, Some(1), None]);
        assert_eq!(c[1], 1);
        assert_ne!(c[0], 1);
        assert_ne!(c[2], 1);
    }
}
