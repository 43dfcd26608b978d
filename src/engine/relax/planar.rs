//! Fewest relaxations for a flat drawing: which soft edges to drop, at least total cost, so that
//! the graph becomes planar.
//!
//! The same implicit hitting set loop as for colours (Moreno-Centeno and Karp 2013), with
//! Kuratowski subgraphs in place of colouring obstructions: every planar subgraph misses at least
//! one edge of every subdivision of K5 or K3,3 in the graph (Kuratowski 1930), so the soft edges
//! of each subdivision found form a set that any answer must meet.
//!
//! Only edges are modelled. A same-colour group is one vertex of the constraint graph, so the
//! caller merges its members before building the problem; a membership is not relaxable here.

use std::sync::atomic::AtomicBool;

use super::driver::{Tested, hitting_set_loop};
use super::{RelaxError, RelaxOptions, RelaxProgress};
use crate::engine::graph::{Graph, Vertex};
use crate::engine::planarity::{
    Embedding, Kuratowski, KuratowskiKind, Planarity, PlanarityError, is_planar, planarity,
};

/// An edge that may be dropped, at a cost.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SoftEdge {
    pub u: Vertex,
    pub v: Vertex,
    /// What dropping it costs; at least 1.
    pub cost: u64,
}

/// The question: which soft edges to drop so that the graph is planar. No pair of vertices may be
/// named twice (hard and soft together), and no edge may join a vertex to itself.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PlanarRelaxProblem {
    pub vertex_count: usize,
    pub hard: Vec<(Vertex, Vertex)>,
    pub soft: Vec<SoftEdge>,
}

/// A Kuratowski subgraph of the whole graph (hard and soft edges) and the soft edges on it: at
/// least one of them must be dropped. Empty `soft` means no relaxation makes the graph planar.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PlanarObstruction {
    pub kuratowski: Kuratowski,
    /// Indices into [`PlanarRelaxProblem::soft`], ascending.
    pub soft: Vec<usize>,
}

/// What the search found.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PlanarRelaxReport {
    /// The best set of soft edges to drop found (indices, ascending); `None` when no set works
    /// (`infeasible`) or the search stopped before it found one.
    pub relaxation: Option<Vec<usize>>,
    /// Its total cost.
    pub cost: Option<u64>,
    /// A plane embedding of the graph with `relaxation` dropped (all `vertex_count` vertices).
    pub embedding: Option<Embedding>,
    /// The least cost of a set meeting every obstruction found: no cheaper set works.
    pub lower_bound: u64,
    /// `cost == lower_bound`.
    pub proven_optimal: bool,
    /// The hard edges alone are not planar; the last obstruction has no soft edge and shows it.
    pub infeasible: bool,
    /// Every obstruction found, in the order found.
    pub obstructions: Vec<PlanarObstruction>,
    /// The search stopped (cancelled or out of time) before the answer was proven.
    pub stopped: bool,
    /// Rounds of the hitting set loop.
    pub rounds: usize,
}

/// Finds a set of soft edges of least total cost whose removal leaves the graph planar.
///
/// The implicit hitting set method (Moreno-Centeno and Karp 2013): each round takes a minimum-cost
/// hitting set H of the obstructions found so far and tests the graph without H with the
/// left-right planarity test. Planar: H is optimal. Not planar: the test's Kuratowski subgraph is
/// made into an obstruction whose soft edges are as few as possible, its soft edges are set aside
/// as well and the test repeats, so a round ends with a working set (the best so far).
///
/// An obstruction is made from a Kuratowski subgraph K of the current graph in three steps: the
/// graph is cut down to the hard edges and the soft edges of K (still not planar, as it contains
/// K); each of those soft edges is then dropped in turn if the rest stays non-planar, so that
/// every soft edge left lies on every Kuratowski subgraph of what remains (its soft set is
/// minimal: none can be left out); finally the search looks for a short subgraph near those soft
/// edges, in balls of growing radius around their ends, and isolates the Kuratowski subgraph
/// there. When the hard edges alone are not planar, the obstruction has no soft edge and the
/// search ends with `infeasible`.
///
/// # Complexity
/// Each round: O(s (n + m)) for the planarity tests on a subgraph with s soft edges, plus the
/// hitting set search, exponential in the worst case. The number of rounds is at most the number
/// of distinct minimal soft sets.
///
/// # Certificate
/// The embedding of the relaxed graph and the Kuratowski subgraphs: check them with
/// [`crate::engine::certify::check_planar_relaxation`].
///
/// Stopped by `cancel` or `options.deadline`, it reports the best set found and the lower bound
/// proven so far, with `stopped` set.
pub fn relax_planar(
    problem: &PlanarRelaxProblem,
    options: &RelaxOptions,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(RelaxProgress),
) -> Result<PlanarRelaxReport, RelaxError> {
    validate(problem)?;
    let cost: Vec<u64> = problem.soft.iter().map(|s| s.cost).collect();
    let soft_of = SoftIndex::new(problem);
    let found = hitting_set_loop(
        &cost,
        options.deadline,
        cancel,
        progress,
        |o: &PlanarObstruction| &o.soft,
        |dropped| {
            let kept: Vec<usize> = (0..problem.soft.len()).filter(|&j| !dropped[j]).collect();
            let g = graph_of(problem, &kept);
            match planarity(&g, cancel, &mut |_| {}) {
                Ok(Planarity::Planar(embedding)) => Tested::Works(embedding),
                Ok(Planarity::NonPlanar(k)) => match obstruction(problem, &soft_of, &k, cancel) {
                    Ok(o) => Tested::Obstruction(o),
                    Err(_) => Tested::Stopped,
                },
                Err(_) => Tested::Stopped,
            }
        },
    );
    let report = PlanarRelaxReport {
        relaxation: found.relaxation,
        cost: found.cost,
        embedding: found.witness,
        lower_bound: found.lower_bound,
        proven_optimal: found.proven_optimal,
        infeasible: found.infeasible,
        obstructions: found.obstructions,
        stopped: found.stopped,
        rounds: found.rounds,
    };
    Ok(report)
}

fn validate(problem: &PlanarRelaxProblem) -> Result<(), RelaxError> {
    let n = problem.vertex_count;
    let pairs = problem
        .hard
        .iter()
        .copied()
        .chain(problem.soft.iter().map(|s| (s.u, s.v)));
    let mut seen = Vec::new();
    for (u, v) in pairs {
        if let Some(w) = [u, v].into_iter().find(|&w| w as usize >= n) {
            return Err(RelaxError::VertexOutOfRange {
                vertex: w,
                vertices: n,
            });
        }
        if u == v {
            return Err(RelaxError::RepeatedPair { u, v });
        }
        seen.push((u.min(v), u.max(v)));
    }
    seen.sort_unstable();
    if let Some(w) = seen.windows(2).find(|w| w[0] == w[1]) {
        return Err(RelaxError::RepeatedPair {
            u: w[0].0,
            v: w[0].1,
        });
    }
    if let Some(item) = problem.soft.iter().position(|s| s.cost == 0) {
        return Err(RelaxError::ZeroCost { item });
    }
    Ok(())
}

/// The soft edge of each vertex pair, by binary search over sorted pairs.
struct SoftIndex {
    pairs: Vec<((Vertex, Vertex), usize)>,
}

impl SoftIndex {
    fn new(problem: &PlanarRelaxProblem) -> SoftIndex {
        let mut pairs: Vec<((Vertex, Vertex), usize)> = problem
            .soft
            .iter()
            .enumerate()
            .map(|(j, s)| ((s.u.min(s.v), s.u.max(s.v)), j))
            .collect();
        pairs.sort_unstable();
        SoftIndex { pairs }
    }

    fn of(&self, u: Vertex, v: Vertex) -> Option<usize> {
        let key = (u.min(v), u.max(v));
        self.pairs
            .binary_search_by(|p| p.0.cmp(&key))
            .ok()
            .map(|i| self.pairs[i].1)
    }
}

/// The graph of the hard edges and the listed soft edges, on all vertices.
fn graph_of(problem: &PlanarRelaxProblem, soft: &[usize]) -> Graph {
    let mut edges = problem.hard.clone();
    edges.extend(soft.iter().map(|&j| (problem.soft[j].u, problem.soft[j].v)));
    // Validated: no loops, no repeats, every vertex in range, so this cannot fail.
    Graph::from_edges(problem.vertex_count, &edges)
        .map(|(g, _)| g)
        .unwrap_or_else(|_| unreachable!("a validated problem always makes a graph"))
}

/// Turns a Kuratowski subgraph `k` of the current graph into an obstruction with a minimal set of
/// soft edges and a short subgraph (see [`relax_planar`]).
fn obstruction(
    problem: &PlanarRelaxProblem,
    soft_of: &SoftIndex,
    k: &Kuratowski,
    cancel: &AtomicBool,
) -> Result<PlanarObstruction, PlanarityError> {
    let mut soft: Vec<usize> = k
        .edges
        .iter()
        .filter_map(|&(a, b)| soft_of.of(a, b))
        .collect();
    soft.sort_unstable();
    // Deletion: drop each soft edge whose loss leaves the graph non-planar. Costlier edges are
    // tried first, so that the cheap ones stay in the set to hit.
    let mut order = soft.clone();
    order.sort_by_key(|&j| (std::cmp::Reverse(problem.soft[j].cost), j));
    for j in order {
        let rest: Vec<usize> = soft.iter().copied().filter(|&x| x != j).collect();
        if !is_planar(&graph_of(problem, &rest), cancel, &mut |_| {})? {
            soft = rest;
        }
    }
    let g = graph_of(problem, &soft);
    // A short subgraph: balls around the soft edges' ends (or around the given subgraph when it
    // has no soft edge), growing until what they induce is not planar.
    let mut seeds: Vec<Vertex> = if soft.is_empty() {
        k.branch_vertices.clone()
    } else {
        soft.iter()
            .flat_map(|&j| [problem.soft[j].u, problem.soft[j].v])
            .collect()
    };
    seeds.sort_unstable();
    seeds.dedup();
    let n = g.vertex_count();
    let mut inside = vec![false; n];
    let mut frontier = Vec::new();
    let mut members = Vec::new();
    for &s in &seeds {
        inside[s as usize] = true;
        frontier.push(s);
        members.push(s);
    }
    loop {
        let mut next = Vec::new();
        for &v in &frontier {
            for &w in g.neighbours(v) {
                if !inside[w as usize] {
                    inside[w as usize] = true;
                    next.push(w);
                    members.push(w);
                }
            }
        }
        let grew = !next.is_empty();
        frontier = next;
        if grew && members.len() < n {
            let (sub, back) = induced(&g, &members);
            if let Planarity::NonPlanar(found) = planarity(&sub, cancel, &mut |_| {})? {
                return Ok(PlanarObstruction {
                    kuratowski: renumber(&found, &back),
                    soft,
                });
            }
        }
        if !grew || members.len() >= n {
            break;
        }
    }
    match planarity(&g, cancel, &mut |_| {})? {
        Planarity::NonPlanar(found) => Ok(PlanarObstruction {
            kuratowski: found,
            soft,
        }),
        Planarity::Planar(_) => {
            debug_assert!(
                false,
                "a graph containing a Kuratowski subgraph tested planar"
            );
            Err(PlanarityError::Cancelled)
        }
    }
}

/// The subgraph induced by `members`, numbered by position in `members` sorted, and the way back.
fn induced(g: &Graph, members: &[Vertex]) -> (Graph, Vec<Vertex>) {
    let mut back = members.to_vec();
    back.sort_unstable();
    let position = |v: Vertex| back.binary_search(&v).ok();
    let mut edges = Vec::new();
    for (i, &v) in back.iter().enumerate() {
        for &w in g.neighbours(v) {
            if v < w
                && let Some(j) = position(w)
            {
                edges.push((i as Vertex, j as Vertex));
            }
        }
    }
    let sub = Graph::from_edges(back.len(), &edges)
        .map(|(s, _)| s)
        .unwrap_or_else(|_| unreachable!("edges of a simple graph stay simple"));
    (sub, back)
}

/// A Kuratowski subgraph in the numbering of the whole graph, in the engine's normal form.
fn renumber(k: &Kuratowski, back: &[Vertex]) -> Kuratowski {
    let map = |v: Vertex| back[v as usize];
    let mut branch: Vec<Vertex> = k.branch_vertices.iter().map(|&v| map(v)).collect();
    match k.kind {
        KuratowskiKind::K5 => branch.sort_unstable(),
        KuratowskiKind::K33 => {
            branch[..3].sort_unstable();
            branch[3..].sort_unstable();
        }
    }
    let mut paths: Vec<Vec<Vertex>> = k
        .paths
        .iter()
        .map(|p| {
            let mut p: Vec<Vertex> = p.iter().map(|&v| map(v)).collect();
            if p.first() > p.last() {
                p.reverse();
            }
            p
        })
        .collect();
    paths.sort();
    let mut edges: Vec<(Vertex, Vertex)> = k
        .edges
        .iter()
        .map(|&(a, b)| (map(a).min(map(b)), map(a).max(map(b))))
        .collect();
    edges.sort_unstable();
    Kuratowski {
        kind: k.kind,
        branch_vertices: branch,
        paths,
        edges,
    }
}
