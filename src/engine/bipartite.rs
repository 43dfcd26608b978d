//! Bipartiteness: a 2-colouring, or an odd cycle proving that none exists.

use super::graph::{Graph, Vertex};

/// The verdict of [`two_colouring`].
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Bipartite {
    /// `colour[v]` is 0 or 1, and every edge joins different colours.
    TwoColouring(Vec<u8>),
    /// A cycle of odd length (at least 3), listed in order; the last vertex is joined to the
    /// first. No 2-colouring can exist (König 1936: a graph is bipartite iff it has no odd cycle).
    OddCycle(Vec<Vertex>),
}

/// Two-colours `g` by breadth-first search, or finds an odd cycle.
///
/// Each component is searched from its smallest vertex, colouring by the parity of the BFS level.
/// An edge between two vertices of equal level closes an odd cycle: the two tree paths up to
/// their lowest common ancestor plus that edge (common practice; e.g. Kleinberg and Tardos,
/// "Algorithm Design", section 3.4).
///
/// # Complexity
/// O(n + m) time, O(n) extra space; iterative, so any size of graph is safe.
///
/// # Certificate
/// [`Bipartite::TwoColouring`] or [`Bipartite::OddCycle`]; check them with
/// [`crate::engine::certify::check_two_colouring`] and [`crate::engine::certify::check_odd_cycle`].
pub fn two_colouring(g: &Graph) -> Bipartite {
    let n = g.vertex_count();
    const UNSEEN: u32 = u32::MAX;
    let mut level = vec![UNSEEN; n];
    let mut parent = vec![UNSEEN; n];
    let mut queue: Vec<Vertex> = Vec::new();
    for start in 0..n as Vertex {
        if level[start as usize] != UNSEEN {
            continue;
        }
        level[start as usize] = 0;
        queue.clear();
        queue.push(start);
        let mut head = 0;
        while head < queue.len() {
            let v = queue[head];
            head += 1;
            for &w in g.neighbours(v) {
                if level[w as usize] == UNSEEN {
                    level[w as usize] = level[v as usize] + 1;
                    parent[w as usize] = v;
                    queue.push(w);
                } else if level[w as usize] == level[v as usize] {
                    return Bipartite::OddCycle(close_cycle(&parent, v, w));
                }
            }
        }
    }
    Bipartite::TwoColouring(level.iter().map(|&l| (l & 1) as u8).collect())
}

/// The cycle through the edge `v`-`w` (equal BFS levels) and the tree paths to their common
/// ancestor: `v, parent(v), ..., ancestor, ..., parent(w), w`.
fn close_cycle(parent: &[u32], v: Vertex, w: Vertex) -> Vec<Vertex> {
    let (mut a, mut b) = (v, w);
    let mut up_from_v = vec![a];
    let mut up_from_w = vec![b];
    while a != b {
        a = parent[a as usize];
        b = parent[b as usize];
        up_from_v.push(a);
        up_from_w.push(b);
    }
    // Both lists end with the common ancestor; keep it once.
    up_from_w.pop();
    up_from_v.extend(up_from_w.into_iter().rev());
    up_from_v
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::certify::{check_odd_cycle, check_two_colouring};

    #[test]
    fn even_cycle_is_two_coloured_and_odd_cycle_found() {
        // A cycle is bipartite iff its length is even (König 1936).
        let (c6, _) =
            Graph::from_edges(6, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 5), (5, 0)]).unwrap();
        match two_colouring(&c6) {
            Bipartite::TwoColouring(c) => check_two_colouring(&c6, &c).unwrap(),
            Bipartite::OddCycle(_) => panic!("C6 is bipartite"),
        }
        let (c5, _) =
            Graph::from_edges(7, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 0), (5, 6)]).unwrap();
        match two_colouring(&c5) {
            Bipartite::OddCycle(cycle) => {
                check_odd_cycle(&c5, &cycle).unwrap();
                assert_eq!(cycle.len(), 5);
            }
            Bipartite::TwoColouring(_) => panic!("C5 is not bipartite"),
        }
    }
}
