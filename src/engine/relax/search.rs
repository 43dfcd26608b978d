//! The implicit hitting set loop: obstructions, a minimum-cost hitting set of them, a colouring
//! test of what is left, repeated until the test succeeds.

use std::sync::atomic::AtomicBool;

use super::driver::{Tested, hitting_set_loop};
use super::shrink::{Local, local_obstruction};
use super::{
    Constraint, RelaxError, RelaxObstruction, RelaxOptions, RelaxProblem, RelaxProgress,
    RelaxReport,
};
use crate::engine::colouring::exact::{Decision, Limits, k_colourable, repair};
use crate::engine::colouring::smallest_last::kempe_colouring;
use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// Finds a set of soft items of least total cost whose removal leaves `problem` k-colourable.
///
/// The implicit hitting set method (Moreno-Centeno and Karp 2013), as in core-guided MaxSAT:
/// each round takes a minimum-cost hitting set H of the obstructions found so far and tests
/// whether the problem without H can be coloured. If it can, H is optimal (every working set meets
/// every obstruction, so none is cheaper). If not, the test returns an obstruction disjoint from
/// H; its items are set aside too and the test repeats, so one round collects several disjoint
/// obstructions and ends with a working (not necessarily optimal) set, the best answer so far.
///
/// The colouring test never runs SAT on a large map first: groups of vertices that must share a
/// colour are merged, then smallest-last order with Kempe-chain interchanges colours the map; only
/// around vertices it leaves uncoloured does SAT look for an obstruction, on neighbourhoods of
/// growing radius up to [`RelaxOptions::local_vertices`] vertices; then the colouring engine's
/// local repair; and only then the exact search of the whole part that failed.
///
/// # Complexity
/// Each round: linear time for the heuristic, plus SAT on small neighbourhoods and a hitting set
/// search, both exponential in the worst case. The number of rounds is at most the number of
/// distinct obstructions.
///
/// # Certificate
/// The colouring of the relaxed problem, and the obstructions with their DRAT proofs: check them
/// with [`crate::engine::certify::check_relaxation`].
///
/// Stopped by `cancel` or `options.deadline`, it reports the best set found and the lower bound
/// proven so far, with `stopped` set.
pub fn relax(
    problem: &RelaxProblem,
    options: &RelaxOptions,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(RelaxProgress),
) -> Result<RelaxReport, RelaxError> {
    validate(problem)?;
    let cost: Vec<u64> = problem.soft.iter().map(|s| s.cost).collect();
    let found = hitting_set_loop(
        &cost,
        options.deadline,
        cancel,
        progress,
        |o: &RelaxObstruction| &o.soft,
        |dropped| decide(problem, dropped, options, cancel),
    );
    let report = RelaxReport {
        colours: problem.colours,
        relaxation: found.relaxation,
        cost: found.cost,
        colouring: found.witness,
        lower_bound: found.lower_bound,
        proven_optimal: found.proven_optimal,
        infeasible: found.infeasible,
        obstructions: found.obstructions,
        stopped: found.stopped,
        rounds: found.rounds,
    };
    Ok(report)
}

fn validate(problem: &RelaxProblem) -> Result<(), RelaxError> {
    if problem.colours == 0 {
        return Err(RelaxError::NoColours);
    }
    let n = problem.vertex_count;
    let constraints = problem
        .hard
        .iter()
        .chain(problem.soft.iter().map(|s| &s.constraint));
    for c in constraints {
        if let Some(v) = c.vertices().find(|&v| v as usize >= n) {
            return Err(RelaxError::VertexOutOfRange {
                vertex: v,
                vertices: n,
            });
        }
    }
    if let Some(item) = problem.soft.iter().position(|s| s.cost == 0) {
        return Err(RelaxError::ZeroCost { item });
    }
    Ok(())
}

/// A colouring of the problem without the dropped items, or an obstruction among those kept.
type Decided = Tested<Vec<u32>, RelaxObstruction>;

fn find(parent: &mut [u32], mut x: u32) -> u32 {
    while parent[x as usize] != x {
        parent[x as usize] = parent[parent[x as usize] as usize];
        x = parent[x as usize];
    }
    x
}

/// The problem without the `dropped` soft items: a colouring, or an obstruction among the items
/// kept.
fn decide(
    problem: &RelaxProblem,
    dropped: &[bool],
    options: &RelaxOptions,
    cancel: &AtomicBool,
) -> Decided {
    let n = problem.vertex_count;
    let k = problem.colours;
    let kept: Vec<bool> = dropped.iter().map(|d| !d).collect();
    let constraints: Vec<Constraint> = problem
        .hard
        .iter()
        .copied()
        .chain(
            problem
                .soft
                .iter()
                .zip(&kept)
                .filter(|(_, k)| **k)
                .map(|(s, _)| s.constraint),
        )
        .collect();
    // Vertices that must share a colour become one class.
    let mut parent: Vec<u32> = (0..n as u32).collect();
    for c in &constraints {
        if let Constraint::Same(u, v) = *c {
            let (a, b) = (find(&mut parent, u), find(&mut parent, v));
            if a != b {
                parent[a.max(b) as usize] = a.min(b);
            }
        }
    }
    let mut class_of = vec![NONE; n];
    let mut classes = 0u32;
    let mut first_member: Vec<Vertex> = Vec::new();
    for v in 0..n as u32 {
        let r = find(&mut parent, v) as usize;
        if class_of[r] == NONE {
            class_of[r] = classes;
            first_member.push(v);
            classes += 1;
        }
        class_of[v as usize] = class_of[r];
    }
    // Contradictions visible at once: a seed to grow an obstruction from.
    let mut conflict: Option<Vertex> = None;
    let mut pin: Vec<Option<u32>> = vec![None; classes as usize];
    let mut edges = Vec::new();
    for c in &constraints {
        match *c {
            Constraint::Pin(v, col) => {
                let cl = class_of[v as usize] as usize;
                if col >= k || pin[cl].is_some_and(|p| p != col) {
                    conflict.get_or_insert(v);
                }
                pin[cl] = Some(col);
            }
            Constraint::Differ(u, v) => {
                let (a, b) = (class_of[u as usize], class_of[v as usize]);
                if a == b {
                    conflict.get_or_insert(u);
                } else {
                    edges.push((a, b));
                }
            }
            Constraint::Same(..) => {}
        }
    }
    for &(a, b) in &edges {
        if pin[a as usize].is_some() && pin[a as usize] == pin[b as usize] {
            conflict.get_or_insert(first_member[a as usize]);
        }
    }
    let adjacency = Adjacency::new(n, &constraints);
    let limits = Limits {
        cancel: Some(cancel),
        deadline: options.deadline,
    };
    if let Some(seed) = conflict {
        return grow(
            problem,
            &kept,
            &adjacency,
            seed,
            None,
            usize::MAX,
            options,
            cancel,
        )
        .certain();
    }
    let Ok((g, _)) = Graph::from_edges(classes as usize, &edges) else {
        return Tested::Stopped;
    };
    let expand = |class_colour: &[u32]| -> Vec<u32> {
        (0..n).map(|v| class_colour[class_of[v] as usize]).collect()
    };
    let outcome = kempe_colouring(&g, &pin, k);
    if outcome.uncoloured.is_empty() {
        return Tested::Works(expand(&outcome.colour));
    }
    // SAT on small neighbourhoods of the vertices the heuristic could not colour.
    for &stuck in outcome.uncoloured.iter().take(3) {
        let seed = first_member[stuck as usize];
        match grow(
            problem,
            &kept,
            &adjacency,
            seed,
            None,
            options.local_vertices,
            options,
            cancel,
        ) {
            Grown::Nothing => {}
            Grown::Found(o) => return Tested::Obstruction(o),
            Grown::Stopped => return Tested::Stopped,
        }
    }
    let mut colour = outcome.colour.clone();
    if repair(&g, &pin, k, &mut colour, options.local_vertices, limits)
        && colour.iter().all(|&c| c < k)
    {
        return Tested::Works(expand(&colour));
    }
    if limits.stopped() {
        return Tested::Stopped;
    }
    match k_colourable(&g, &pin, k, limits) {
        Decision::Colourable(c) => Tested::Works(expand(&c)),
        Decision::NotColourable { part, .. } => {
            let mut allowed = vec![false; n];
            let mut seed = None;
            for v in 0..n {
                if part.binary_search(&class_of[v]).is_ok() {
                    allowed[v] = true;
                    seed.get_or_insert(v as Vertex);
                }
            }
            match seed {
                Some(seed) => grow(
                    problem,
                    &kept,
                    &adjacency,
                    seed,
                    Some(&allowed),
                    usize::MAX,
                    options,
                    cancel,
                )
                .certain(),
                None => Tested::Stopped,
            }
        }
        Decision::Unknown => Tested::Stopped,
    }
}

/// Neighbours through every kept constraint on two vertices.
struct Adjacency {
    offsets: Vec<usize>,
    targets: Vec<Vertex>,
}

impl Adjacency {
    fn new(n: usize, constraints: &[Constraint]) -> Adjacency {
        let mut degree = vec![0usize; n + 1];
        let pairs: Vec<(Vertex, Vertex)> = constraints
            .iter()
            .filter_map(|c| match *c {
                Constraint::Differ(u, v) | Constraint::Same(u, v) if u != v => Some((u, v)),
                _ => None,
            })
            .collect();
        for &(u, v) in &pairs {
            degree[u as usize] += 1;
            degree[v as usize] += 1;
        }
        let mut offsets = vec![0usize; n + 1];
        for v in 0..n {
            offsets[v + 1] = offsets[v] + degree[v];
        }
        let mut fill = offsets.clone();
        let mut targets = vec![0; offsets[n]];
        for &(u, v) in &pairs {
            targets[fill[u as usize]] = v;
            fill[u as usize] += 1;
            targets[fill[v as usize]] = u;
            fill[v as usize] += 1;
        }
        Adjacency { offsets, targets }
    }

    fn of(&self, v: Vertex) -> &[Vertex] {
        &self.targets[self.offsets[v as usize]..self.offsets[v as usize + 1]]
    }

    /// The vertices within `radius` steps of `seed` (inside `allowed`), ascending.
    fn ball(&self, seed: Vertex, radius: usize, allowed: Option<&[bool]>) -> Vec<Vertex> {
        let ok = |v: Vertex| allowed.is_none_or(|a| a[v as usize]);
        let mut seen = std::collections::BTreeSet::new();
        seen.insert(seed);
        let mut frontier = vec![seed];
        for _ in 0..radius {
            let mut next = Vec::new();
            for &v in &frontier {
                for &w in self.of(v) {
                    if ok(w) && seen.insert(w) {
                        next.push(w);
                    }
                }
            }
            if next.is_empty() {
                break;
            }
            frontier = next;
        }
        seen.into_iter().collect()
    }
}

/// What a search around one vertex found.
enum Grown {
    Found(RelaxObstruction),
    /// No obstruction within the limit.
    Nothing,
    Stopped,
}

impl Grown {
    /// For a search that must find an obstruction (the part around `seed` is known not to be
    /// colourable): finding none would be a bug, reported as a stop rather than as a colouring.
    fn certain(self) -> Decided {
        match self {
            Grown::Found(o) => Tested::Obstruction(o),
            Grown::Nothing => {
                debug_assert!(false, "no obstruction in a part known not to be colourable");
                Tested::Stopped
            }
            Grown::Stopped => Tested::Stopped,
        }
    }
}

/// Looks for an obstruction on neighbourhoods of `seed` of growing radius, up to `max_vertices`
/// vertices or until the neighbourhood stops growing.
#[allow(clippy::too_many_arguments)]
fn grow(
    problem: &RelaxProblem,
    kept: &[bool],
    adjacency: &Adjacency,
    seed: Vertex,
    allowed: Option<&[bool]>,
    max_vertices: usize,
    options: &RelaxOptions,
    cancel: &AtomicBool,
) -> Grown {
    let mut radius = 1;
    let mut previous = 0;
    loop {
        let ball = adjacency.ball(seed, radius, allowed);
        // A neighbourhood that stopped growing is the whole part, already found colourable.
        if ball.len() == previous || ball.len() > max_vertices {
            return Grown::Nothing;
        }
        match local_obstruction(problem, kept, &ball, cancel, options.deadline) {
            Local::Obstruction(o) => return Grown::Found(o),
            Local::Unknown => return Grown::Stopped,
            Local::Colourable => {}
        }
        previous = ball.len();
        radius += radius.div_ceil(2);
    }
}
