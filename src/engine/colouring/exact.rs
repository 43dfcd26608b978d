//! Exact k-colourability with pins: peel low-degree vertices, split into components, and decide
//! each component with the SAT solver (clique symmetry breaking where the pins allow it).

use std::sync::atomic::AtomicBool;
use std::time::Instant;

use crate::engine::colouring::encoding::{Cnf, Symmetry, colouring_cnf, decode};
use crate::engine::colouring::lower_bound::find_clique;
use crate::engine::colouring::sat::{Sat, SatAnswer};
use crate::engine::components::connected_components;
use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// The answer to "is there a k-colouring that keeps the pins?".
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Decision {
    /// Yes: a class in `0..k` per vertex.
    Colourable(Vec<u32>),
    /// No: these vertices (a connected part of the k-core, ascending) already cannot be
    /// coloured; with the DRAT proof the search logged, when it was asked to.
    NotColourable {
        part: Vec<Vertex>,
        proof: Option<PartProof>,
    },
    /// Stopped before an answer.
    Unknown,
}

/// The refutation the exact search logged for a part: the part's colouring CNF (vertex `i` of
/// the CNF is `part[i]`, pins as the caller's classes) under `symmetry`, and its DRAT proof.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PartProof {
    /// The symmetry rule of the CNF, in part numbering.
    pub symmetry: Symmetry,
    /// The CNF.
    pub cnf: Cnf,
    /// DRAT proof text refuting it.
    pub drat: String,
}

/// Stop conditions shared by the long searches.
#[derive(Clone, Copy, Default)]
pub struct Limits<'a> {
    /// Set to true from outside to stop.
    pub cancel: Option<&'a AtomicBool>,
    /// Stop after this instant.
    pub deadline: Option<Instant>,
}

impl Limits<'_> {
    /// True if a search should stop now.
    pub fn stopped(&self) -> bool {
        self.cancel
            .is_some_and(|c| c.load(std::sync::atomic::Ordering::Relaxed))
            || self.deadline.is_some_and(|d| Instant::now() >= d)
    }
}

/// The symmetry rule allowed by the pins of `g`: a clique of unpinned vertices, valid only when
/// the pinned classes are exactly `0..p` (then classes from `p` up are interchangeable).
pub fn symmetry_for(g: &Graph, pin_class: &[Option<u32>], budget: u64) -> Symmetry {
    let mut pinned: Vec<u32> = pin_class.iter().flatten().copied().collect();
    pinned.sort_unstable();
    pinned.dedup();
    if pinned.iter().enumerate().any(|(i, &c)| c != i as u32) {
        return Symmetry::default();
    }
    let free: Vec<Vertex> = (0..g.vertex_count() as Vertex)
        .filter(|&v| pin_class.get(v as usize).copied().flatten().is_none())
        .collect();
    let sub = g.induced(&free);
    let clique = find_clique(&sub, budget);
    Symmetry {
        clique: clique.iter().map(|&i| free[i as usize]).collect(),
        first_free_class: pinned.len() as u32,
    }
}

/// Decides k-colourability respecting `pin_class` (class per pinned vertex).
///
/// Unpinned vertices of degree below k are peeled (repeatedly) and coloured last, since they always
/// find a free class; each connected component of what remains is solved on its own with the
/// k-colouring CNF. The answer never changes through these reductions.
///
/// # Complexity
/// O(k (n + m)) for the reductions and encoding, plus the SAT search (exponential in the worst case).
///
/// # Certificate
/// A colouring, or the part that could not be coloured (prove it with
/// [`crate::engine::colouring::find_obstruction`]).
pub fn k_colourable(g: &Graph, pin_class: &[Option<u32>], k: u32, limits: Limits) -> Decision {
    k_colourable_logged(g, pin_class, k, limits, 0)
}

/// [`k_colourable`], logging a DRAT proof for a failing part of at most `proof_max_vertices`
/// vertices (proof logging costs about a tenth more time, and memory for the proof text).
pub fn k_colourable_logged(
    g: &Graph,
    pin_class: &[Option<u32>],
    k: u32,
    limits: Limits,
    proof_max_vertices: usize,
) -> Decision {
    let n = g.vertex_count();
    let pin = |v: usize| pin_class.get(v).copied().flatten();
    if let Some(v) = (0..n).find(|&v| pin(v).is_some_and(|c| c >= k)) {
        return Decision::NotColourable {
            part: vec![v as Vertex],
            proof: None,
        };
    }
    // Peel unpinned vertices of degree < k.
    let mut degree: Vec<u32> = (0..n as u32).map(|v| g.degree(v) as u32).collect();
    let mut peeled = vec![false; n];
    let mut stack: Vec<Vertex> = (0..n as u32)
        .filter(|&v| pin(v as usize).is_none() && degree[v as usize] < k)
        .collect();
    let mut peel_order = Vec::new();
    while let Some(v) = stack.pop() {
        if peeled[v as usize] {
            continue;
        }
        peeled[v as usize] = true;
        peel_order.push(v);
        for &w in g.neighbours(v) {
            let w = w as usize;
            if !peeled[w] {
                degree[w] -= 1;
                if degree[w] < k && pin(w).is_none() {
                    stack.push(w as Vertex);
                }
            }
        }
    }
    let core: Vec<Vertex> = (0..n as Vertex).filter(|&v| !peeled[v as usize]).collect();
    let mut colour = vec![NONE; n];
    if !core.is_empty() {
        let core_graph = g.induced(&core);
        let comps = connected_components(&core_graph).members();
        for members in comps {
            let original: Vec<Vertex> = members.iter().map(|&i| core[i as usize]).collect();
            let sub = g.induced(&original);
            let sub_pins: Vec<Option<u32>> = original.iter().map(|&v| pin(v as usize)).collect();
            let log = original.len() <= proof_max_vertices;
            match decide_component(&sub, &sub_pins, k, limits, log) {
                Decision::Colourable(c) => {
                    for (i, &v) in original.iter().enumerate() {
                        colour[v as usize] = c[i];
                    }
                }
                Decision::NotColourable { proof, .. } => {
                    return Decision::NotColourable {
                        part: original,
                        proof,
                    };
                }
                Decision::Unknown => return Decision::Unknown,
            }
        }
    }
    for &v in peel_order.iter().rev() {
        colour[v as usize] = lowest_free(g, &colour, v);
        debug_assert!(colour[v as usize] < k);
    }
    Decision::Colourable(colour)
}

fn lowest_free(g: &Graph, colour: &[u32], v: Vertex) -> u32 {
    let mut used: Vec<u32> = g
        .neighbours(v)
        .iter()
        .map(|&w| colour[w as usize])
        .filter(|&c| c != NONE)
        .collect();
    used.sort_unstable();
    used.dedup();
    let mut c = 0;
    for u in used {
        if u == c {
            c += 1;
        } else if u > c {
            break;
        }
    }
    c
}

fn decide_component(
    g: &Graph,
    pin_class: &[Option<u32>],
    k: u32,
    limits: Limits,
    log_proof: bool,
) -> Decision {
    let symmetry = symmetry_for(g, pin_class, 20_000);
    let cnf = colouring_cnf(g, pin_class, k, &symmetry);
    let mut sat = Sat::new(cnf.variables, log_proof, limits.cancel, limits.deadline);
    for c in &cnf.clauses {
        sat.add_clause(c);
    }
    match sat.solve(&[]) {
        SatAnswer::Sat => Decision::Colourable(decode(sat.model(), g.vertex_count(), k)),
        SatAnswer::Unsat => {
            let proof = sat.proof().map(|drat| PartProof {
                symmetry,
                cnf,
                drat,
            });
            Decision::NotColourable {
                part: (0..g.vertex_count() as Vertex).collect(),
                proof,
            }
        }
        SatAnswer::Unknown => Decision::Unknown,
    }
}

/// Completes a partial colouring (`u32::MAX` = uncoloured) with classes `0..k` by exact search on
/// growing balls around each uncoloured vertex, keeping the colours just outside each ball fixed.
/// Returns false if stopped or if even a ball of `max_ball` vertices could not be recoloured.
pub fn repair(
    g: &Graph,
    pin_class: &[Option<u32>],
    k: u32,
    colour: &mut [u32],
    max_ball: usize,
    limits: Limits,
) -> bool {
    let n = g.vertex_count();
    let mut stamp = vec![0u32; n];
    let mut epoch = 0u32;
    for v in 0..n as Vertex {
        if colour[v as usize] != NONE {
            continue;
        }
        let mut radius = 2;
        let mut previous_size = 0;
        loop {
            if limits.stopped() {
                return false;
            }
            epoch += 1;
            // The ball of the given radius around v.
            let mut ball = vec![v];
            stamp[v as usize] = epoch;
            let mut frontier_start = 0;
            for _ in 0..radius {
                let end = ball.len();
                for i in frontier_start..end {
                    for &w in g.neighbours(ball[i]) {
                        if stamp[w as usize] != epoch && ball.len() < max_ball {
                            stamp[w as usize] = epoch;
                            ball.push(w);
                        }
                    }
                }
                frontier_start = end;
            }
            // Fixed boundary: coloured neighbours outside the ball.
            let mut boundary = Vec::new();
            for &x in &ball {
                for &w in g.neighbours(x) {
                    if stamp[w as usize] != epoch && colour[w as usize] != NONE {
                        stamp[w as usize] = epoch;
                        boundary.push(w);
                    }
                }
            }
            // Repair is for a few stuck vertices in a large graph: a ball over half the graph
            // would only redo the exact search's work, without its time share.
            if 2 * ball.len() >= n {
                return false;
            }
            let region: Vec<Vertex> = ball.iter().chain(boundary.iter()).copied().collect();
            let sub = g.induced(&region);
            let sub_pins: Vec<Option<u32>> = region
                .iter()
                .enumerate()
                .map(|(i, &x)| {
                    if i >= ball.len() {
                        Some(colour[x as usize])
                    } else {
                        pin_class.get(x as usize).copied().flatten()
                    }
                })
                .collect();
            // Uncoloured vertices outside this ball are simply left out (they are not in `region`).
            match k_colourable(&sub, &sub_pins, k, limits) {
                Decision::Colourable(c) => {
                    for (i, &x) in ball.iter().enumerate() {
                        colour[x as usize] = c[i];
                    }
                    break;
                }
                Decision::Unknown => return false,
                Decision::NotColourable { .. } => {
                    // Stop when the ball covers its whole component (it stopped growing).
                    if ball.len() >= max_ball || ball.len() == n || ball.len() == previous_size {
                        return false;
                    }
                    previous_size = ball.len();
                    radius += 1;
                }
            }
        }
    }
    true
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn five_cycle_needs_three() {
        // Odd cycles need 3 colours (common practice).
        let (g, _) = Graph::from_edges(5, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 0)]).unwrap();
        assert!(matches!(
            k_colourable(&g, &[], 2, Limits::default()),
            Decision::NotColourable { .. }
        ));
        match k_colourable(&g, &[], 3, Limits::default()) {
            Decision::Colourable(c) => {
                for (u, v) in g.edges() {
                    assert_ne!(c[u as usize], c[v as usize]);
                }
            }
            other => panic!("expected a colouring, got {other:?}"),
        }
    }

    #[test]
    fn repair_gives_up_on_a_disconnected_graph_without_looping() {
        // Regression: the ball stopped growing at its component and the radius grew forever.
        // Two disjoint triangles, one vertex uncoloured, only 2 classes: no repair exists.
        let (g, _) =
            Graph::from_edges(6, &[(0, 1), (1, 2), (2, 0), (3, 4), (4, 5), (5, 3)]).unwrap();
        let mut colour = vec![0, 1, NONE, 0, 1, 0];
        colour[5] = 2;
        assert!(!repair(&g, &[], 2, &mut colour, 100, Limits::default()));
    }

    #[test]
    fn pins_can_make_a_path_impossible() {
        // Path a-b-c with a pinned 0, c pinned 1, two classes: b has no class left.
        let (g, _) = Graph::from_edges(3, &[(0, 1), (1, 2)]).unwrap();
        let pins = [Some(0), None, Some(1)];
        assert!(matches!(
            k_colourable(&g, &pins, 2, Limits::default()),
            Decision::NotColourable { .. }
        ));
        assert!(matches!(
            k_colourable(&g, &pins, 3, Limits::default()),
            Decision::Colourable(_)
        ));
    }
}
