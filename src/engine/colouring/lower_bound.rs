//! Lower bounds on the number of colours, each with a small witness: a clique, an odd cycle, an
//! odd wheel, or the pinned slots.

use crate::engine::colouring::smallest_last::smallest_last_order;
use crate::engine::graph::{Graph, Vertex};

/// Why at least `value` colours are needed.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum BoundEvidence {
    /// The graph has no vertices.
    Empty,
    /// A clique: its vertices need pairwise different colours (one vertex or an edge included).
    Clique(Vec<Vertex>),
    /// An odd cycle (in cycle order, closing from last to first): not 2-colourable (König 1936).
    OddCycle(Vec<Vertex>),
    /// An odd wheel: a hub adjacent to every vertex of an odd cycle (the rim, in cycle order). The
    /// rim needs 3 colours and the hub a fourth.
    OddWheel { hub: Vertex, rim: Vec<Vertex> },
    /// Distinct palette slots named by pins: the colouring uses at least these.
    PinnedSlots(Vec<u32>),
    /// An exact search refuted `colours` colours (see the report's refutation for the proof).
    Refuted { colours: u32 },
}

/// A lower bound with its witness.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LowerBound {
    /// At least this many colours are needed.
    pub value: u32,
    /// The witness.
    pub evidence: BoundEvidence,
}

/// The best of the cheap lower bounds: pinned slots, a large clique, an odd cycle, an odd wheel.
///
/// The clique comes from a bounded branch-and-bound over each vertex's later neighbours in
/// smallest-last order (any clique lies in one such neighbourhood); odd cycles from breadth-first
/// 2-colouring; odd wheels from odd cycles in a neighbourhood.
///
/// # Complexity
/// O(n + m) plus the clique search (at most `budget` search nodes) plus O(sum of deg^2 log deg)
/// for the wheel scan, which runs only when no K4 was found.
///
/// # Certificate
/// The evidence; check it with [`check_bound`].
pub fn lower_bound(g: &Graph, pinned_slots: &[u32], budget: u64) -> LowerBound {
    let (order, degeneracy) = smallest_last_order(g);
    lower_bound_in_order(g, pinned_slots, budget, &order, degeneracy)
}

/// [`lower_bound`] with a precomputed smallest-last order and degeneracy.
pub fn lower_bound_in_order(
    g: &Graph,
    pinned_slots: &[u32],
    budget: u64,
    order: &[Vertex],
    degeneracy: u32,
) -> LowerBound {
    let n = g.vertex_count();
    let mut best = if n == 0 {
        LowerBound {
            value: 0,
            evidence: BoundEvidence::Empty,
        }
    } else {
        let clique = find_clique_in_order(g, order, degeneracy, budget, usize::MAX);
        LowerBound {
            value: clique.len() as u32,
            evidence: BoundEvidence::Clique(clique),
        }
    };
    if best.value < 3
        && let Some(cycle) = odd_cycle(g)
    {
        best = LowerBound {
            value: 3,
            evidence: BoundEvidence::OddCycle(cycle),
        };
    }
    if best.value < 4
        && best.value >= 3
        && let Some((hub, rim)) = odd_wheel(g)
    {
        best = LowerBound {
            value: 4,
            evidence: BoundEvidence::OddWheel { hub, rim },
        };
    }
    if pinned_slots.len() as u32 > best.value {
        best = LowerBound {
            value: pinned_slots.len() as u32,
            evidence: BoundEvidence::PinnedSlots(pinned_slots.to_vec()),
        };
    }
    best
}

/// Checks a bound's witness against the graph (written apart from the searches above).
pub fn check_bound(g: &Graph, bound: &LowerBound) -> bool {
    let n = g.vertex_count() as u32;
    let in_range = |vs: &[Vertex]| vs.iter().all(|&v| v < n);
    let distinct = |vs: &[Vertex]| {
        let mut s = vs.to_vec();
        s.sort_unstable();
        s.windows(2).all(|w| w[0] != w[1])
    };
    let closed_cycle = |vs: &[Vertex]| {
        vs.len() >= 3 && (0..vs.len()).all(|i| g.has_edge(vs[i], vs[(i + 1) % vs.len()]))
    };
    match &bound.evidence {
        BoundEvidence::Empty => bound.value == 0,
        BoundEvidence::Clique(c) => {
            in_range(c)
                && distinct(c)
                && bound.value as usize == c.len()
                && c.iter()
                    .enumerate()
                    .all(|(i, &u)| c[i + 1..].iter().all(|&v| g.has_edge(u, v)))
        }
        BoundEvidence::OddCycle(c) => {
            bound.value == 3 && c.len() % 2 == 1 && in_range(c) && distinct(c) && closed_cycle(c)
        }
        BoundEvidence::OddWheel { hub, rim } => {
            bound.value == 4
                && rim.len() % 2 == 1
                && *hub < n
                && in_range(rim)
                && distinct(rim)
                && !rim.contains(hub)
                && closed_cycle(rim)
                && rim.iter().all(|&r| g.has_edge(*hub, r))
        }
        BoundEvidence::PinnedSlots(s) => {
            let mut t = s.clone();
            t.sort_unstable();
            t.dedup();
            t.len() == s.len() && bound.value as usize == s.len()
        }
        // Checked through the refutation's own checker.
        BoundEvidence::Refuted { colours } => bound.value == colours + 1,
    }
}

/// A large clique (maximum when the search finishes within `budget` nodes).
pub fn find_clique(g: &Graph, budget: u64) -> Vec<Vertex> {
    let (order, degeneracy) = smallest_last_order(g);
    find_clique_in_order(g, &order, degeneracy, budget, usize::MAX)
}

/// [`find_clique`] with a precomputed smallest-last order; stops as soon as a clique of
/// `enough` vertices is known.
pub fn find_clique_in_order(
    g: &Graph,
    order: &[Vertex],
    degeneracy: u32,
    budget: u64,
    enough: usize,
) -> Vec<Vertex> {
    let n = g.vertex_count();
    if n == 0 {
        return Vec::new();
    }
    let mut position = vec![0u32; n];
    for (i, &v) in order.iter().enumerate() {
        position[v as usize] = i as u32;
    }
    let mut best: Vec<Vertex> = vec![order[n - 1]];
    let mut nodes = 0u64;
    let mut later: Vec<Vertex> = Vec::new();
    // Dense vertices come last in smallest-last order: start there, big cliques show up early.
    for &v in order.iter().rev() {
        if best.len() as u32 > degeneracy || nodes > budget || best.len() >= enough {
            break; // no clique can exceed degeneracy + 1
        }
        later.clear();
        later.extend(
            g.neighbours(v)
                .iter()
                .copied()
                .filter(|&w| position[w as usize] > position[v as usize]),
        );
        if later.len() < best.len() {
            continue;
        }
        // Local adjacency as bit rows.
        let m = later.len();
        let words = m.div_ceil(64);
        let mut adj = vec![0u64; m * words];
        for i in 0..m {
            for j in (i + 1)..m {
                if g.has_edge(later[i], later[j]) {
                    adj[i * words + j / 64] |= 1 << (j % 64);
                    adj[j * words + i / 64] |= 1 << (i % 64);
                }
            }
        }
        let mut all = vec![0u64; words];
        for i in 0..m {
            all[i / 64] |= 1 << (i % 64);
        }
        let mut current = Vec::new();
        let mut local_best: Vec<usize> = Vec::new();
        expand(
            &adj,
            words,
            &all,
            &mut current,
            &mut local_best,
            best.len().saturating_sub(1),
            &mut nodes,
            budget,
        );
        if local_best.len() + 1 > best.len() {
            best = std::iter::once(v)
                .chain(local_best.iter().map(|&i| later[i]))
                .collect();
        }
    }
    best.sort_unstable();
    best
}

#[allow(clippy::too_many_arguments)]
fn expand(
    adj: &[u64],
    words: usize,
    candidates: &[u64],
    current: &mut Vec<usize>,
    best: &mut Vec<usize>,
    floor: usize,
    nodes: &mut u64,
    budget: u64,
) {
    *nodes += 1;
    let count: usize = candidates.iter().map(|w| w.count_ones() as usize).sum();
    if count == 0 {
        if current.len() > best.len().max(floor) {
            *best = current.clone();
        }
        return;
    }
    let mut cand = candidates.to_vec();
    loop {
        let remaining: usize = cand.iter().map(|w| w.count_ones() as usize).sum();
        if remaining == 0 || current.len() + remaining <= best.len().max(floor) || *nodes > budget {
            return;
        }
        let Some(wi) = cand.iter().position(|&w| w != 0) else {
            return;
        };
        let i = wi * 64 + cand[wi].trailing_zeros() as usize;
        cand[wi] &= !(1 << (i % 64));
        let next: Vec<u64> = (0..words).map(|w| cand[w] & adj[i * words + w]).collect();
        current.push(i);
        expand(adj, words, &next, current, best, floor, nodes, budget);
        current.pop();
    }
}

/// An odd cycle of `g`, without chords, if `g` is not bipartite.
pub fn odd_cycle(g: &Graph) -> Option<Vec<Vertex>> {
    let n = g.vertex_count();
    let mut side = vec![u8::MAX; n];
    let mut parent = vec![u32::MAX; n];
    let mut depth = vec![0u32; n];
    let mut queue = Vec::new();
    for root in 0..n {
        if side[root] != u8::MAX {
            continue;
        }
        side[root] = 0;
        queue.clear();
        queue.push(root as u32);
        let mut head = 0;
        while head < queue.len() {
            let x = queue[head];
            head += 1;
            for &y in g.neighbours(x) {
                if side[y as usize] == u8::MAX {
                    side[y as usize] = 1 - side[x as usize];
                    parent[y as usize] = x;
                    depth[y as usize] = depth[x as usize] + 1;
                    queue.push(y);
                } else if side[y as usize] == side[x as usize] {
                    // Walk both ends up to their common ancestor.
                    let (mut a, mut b) = (x, y);
                    let mut left = vec![a];
                    let mut right = vec![b];
                    while a != b {
                        if depth[a as usize] >= depth[b as usize] {
                            a = parent[a as usize];
                            left.push(a);
                        } else {
                            b = parent[b as usize];
                            right.push(b);
                        }
                    }
                    right.pop(); // the common ancestor is already in `left`
                    right.reverse();
                    left.extend(right);
                    return Some(remove_chords(g, left));
                }
            }
        }
    }
    None
}

/// Shortens an odd cycle along chords until it has none (a chord splits it into two cycles, one odd).
fn remove_chords(g: &Graph, mut cycle: Vec<Vertex>) -> Vec<Vertex> {
    'again: loop {
        let len = cycle.len();
        if len <= 3 || len > 4000 {
            return cycle;
        }
        for i in 0..len {
            for j in (i + 2)..len {
                if i == 0 && j == len - 1 {
                    continue;
                }
                if g.has_edge(cycle[i], cycle[j]) {
                    let inner: Vec<Vertex> = cycle[i..=j].to_vec();
                    if inner.len() % 2 == 1 {
                        cycle = inner;
                    } else {
                        let mut outer: Vec<Vertex> = cycle[j..].to_vec();
                        outer.extend_from_slice(&cycle[..=i]);
                        cycle = outer;
                    }
                    continue 'again;
                }
            }
        }
        return cycle;
    }
}

/// An odd wheel: a vertex whose neighbourhood holds an odd cycle. Returns `(hub, rim)` with a
/// chordless rim; a rim of 3 means the hub and rim form a K4.
pub fn odd_wheel(g: &Graph) -> Option<(Vertex, Vec<Vertex>)> {
    let mut best: Option<(Vertex, Vec<Vertex>)> = None;
    for v in 0..g.vertex_count() as Vertex {
        let nb = g.neighbours(v);
        if nb.len() < 3 {
            continue;
        }
        let local = g.induced(nb);
        if let Some(cycle) = odd_cycle(&local) {
            let rim: Vec<Vertex> = cycle.iter().map(|&i| nb[i as usize]).collect();
            let better = best.as_ref().is_none_or(|(_, r)| rim.len() < r.len());
            if better {
                let short = rim.len() <= 5;
                best = Some((v, rim));
                if short {
                    break; // W5 is the smallest wheel without a K4
                }
            }
        }
    }
    best
}

#[cfg(test)]
mod tests {
    use super::*;

    fn wheel(rim: u32) -> Graph {
        let edges: Vec<(u32, u32)> = (1..=rim)
            .flat_map(|i| [(0, i), (i, if i == rim { 1 } else { i + 1 })])
            .collect();
        Graph::from_edges(rim as usize + 1, &edges).unwrap().0
    }

    #[test]
    fn odd_wheel_gives_four_even_wheel_three() {
        // Odd wheels need 4 colours, even wheels 3 (common practice).
        let b = lower_bound(&wheel(5), &[], 10_000);
        assert_eq!(b.value, 4);
        assert!(check_bound(&wheel(5), &b));
        let b = lower_bound(&wheel(6), &[], 10_000);
        assert_eq!(b.value, 3);
        assert!(check_bound(&wheel(6), &b));
    }

    #[test]
    fn finds_k5_in_k5() {
        let edges: Vec<(u32, u32)> = (0..5)
            .flat_map(|i| ((i + 1)..5).map(move |j| (i, j)))
            .collect();
        let (g, _) = Graph::from_edges(5, &edges).unwrap();
        assert_eq!(find_clique(&g, 1000), vec![0, 1, 2, 3, 4]);
    }

    #[test]
    fn rejects_a_fake_clique() {
        let g = wheel(6);
        let fake = LowerBound {
            value: 3,
            evidence: BoundEvidence::Clique(vec![1, 3, 0]),
        };
        assert!(!check_bound(&g, &fake));
    }
}
