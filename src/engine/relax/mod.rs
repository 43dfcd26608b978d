//! Fewest relaxations: which soft constraints to drop, at least total cost, so that k colours do.
//!
//! A problem is a set of vertices, hard constraints (two vertices differ, two vertices share a
//! colour, a vertex has a given colour) and soft constraints of the same kinds, each with a positive
//! integer cost. The answer is a set of soft constraints of least total cost whose removal leaves a
//! k-colourable problem, with a colouring of what remains and, as evidence of optimality, the
//! obstructions found on the way: sets of soft constraints that together with the hard ones cannot be
//! k-coloured, each with a DRAT proof. The least cost of a set meeting every obstruction is a lower
//! bound; when it equals the cost of the answer, the answer is proven optimal.
//!
//! The search is the implicit hitting set method (Moreno-Centeno and Karp, "The implicit hitting
//! set approach to solve combinatorial optimization problems with an application to multigenome
//! alignment", Operations Research 61(2), 2013), the scheme of core-guided MaxSAT: `driver.rs`
//! runs the loop for both searches, `search.rs` tests colourings, `shrink.rs` finds and shrinks
//! obstructions with selector literals, `hitting_set.rs` computes minimum-cost hitting sets by
//! branch and bound. `planar.rs` asks the same question for
//! a flat drawing (which soft edges to drop so that the graph is planar), with Kuratowski
//! subgraphs as the obstructions. The independent checker is
//! [`crate::engine::certify::relax_check`], which shares no code with any of them.

mod driver;
pub mod hitting_set;
pub mod planar;
pub mod search;
pub mod shrink;

use crate::engine::graph::Vertex;

pub use hitting_set::{HittingSet, min_cost_hitting_set};
pub use planar::{
    PlanarObstruction, PlanarRelaxProblem, PlanarRelaxReport, SoftEdge, relax_planar,
};
pub use search::relax;

/// One constraint on a colouring.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Constraint {
    /// The two vertices take different colours (a border).
    Differ(Vertex, Vertex),
    /// The two vertices take the same colour (a membership of a same-colour group).
    Same(Vertex, Vertex),
    /// The vertex takes this colour (a pin), a colour in `0..k`.
    Pin(Vertex, u32),
}

impl Constraint {
    /// The vertices it names (one or two; a constraint on a vertex and itself names it once).
    pub fn vertices(&self) -> impl Iterator<Item = Vertex> {
        let (a, b) = match *self {
            Constraint::Differ(u, v) | Constraint::Same(u, v) => (u, Some(v).filter(|&v| v != u)),
            Constraint::Pin(v, _) => (v, None),
        };
        std::iter::once(a).chain(b)
    }
}

/// A constraint that may be dropped, at a cost.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SoftItem {
    pub constraint: Constraint,
    /// What dropping it costs; at least 1.
    pub cost: u64,
}

/// The question: which soft items to drop so that `colours` colours do.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RelaxProblem {
    pub vertex_count: usize,
    pub hard: Vec<Constraint>,
    pub soft: Vec<SoftItem>,
    /// k: colours are `0..colours`.
    pub colours: u32,
}

/// Why a problem cannot be answered at all.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum RelaxError {
    /// A constraint names a vertex that does not exist.
    #[error("a constraint names vertex {vertex} of a problem with {vertices} vertices")]
    VertexOutOfRange { vertex: Vertex, vertices: usize },
    /// A soft item costs nothing.
    #[error("soft item {item} has cost 0; costs must be positive")]
    ZeroCost { item: usize },
    /// An edge joins a vertex to itself, or a pair of vertices is named twice (a flat drawing
    /// problem needs each pair once, hard or soft).
    #[error("the pair {u}-{v} is a loop or is named more than once")]
    RepeatedPair { u: Vertex, v: Vertex },
    /// No colours at all were asked for.
    #[error("at least one colour is needed")]
    NoColours,
}

/// A set of soft items that, with the hard constraints among the same vertices, cannot be
/// coloured with k colours.
///
/// Its CNF (what the DRAT proof refutes) is determined by the problem, `vertices` and `soft`:
/// variable `i * k + c + 1` says "vertex `vertices[i]` has colour `c`"; for every listed vertex one
/// clause "some colour" and, for every two colours, "not both"; then every hard constraint whose
/// vertices are all listed, in problem order; then every listed soft item, in problem order. A
/// constraint "differ" gives, per colour, "not both"; "same" gives, per colour, "if one then the
/// other" both ways; a pin gives a unit clause (the empty clause for a colour outside `0..k`).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RelaxObstruction {
    /// The vertices involved, ascending.
    pub vertices: Vec<Vertex>,
    /// The soft items involved (indices into [`RelaxProblem::soft`]), ascending. Empty when the
    /// hard constraints alone cannot be coloured.
    pub soft: Vec<usize>,
    /// The DRAT proof refuting the CNF.
    pub drat: String,
}

/// What the search found.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RelaxReport {
    /// k.
    pub colours: u32,
    /// The best set of soft items to drop found (indices, ascending); `None` when no set works
    /// (`infeasible`) or the search stopped before it found one.
    pub relaxation: Option<Vec<usize>>,
    /// Its total cost.
    pub cost: Option<u64>,
    /// A colouring (`0..k` per vertex) of the problem with `relaxation` dropped.
    pub colouring: Option<Vec<u32>>,
    /// A proven lower bound on the cost of any working set: the least cost of a set meeting every
    /// obstruction found.
    pub lower_bound: u64,
    /// `cost == lower_bound`: no cheaper set exists.
    pub proven_optimal: bool,
    /// Even dropping every soft item leaves the hard constraints not k-colourable; the last
    /// obstruction has no soft item and shows it.
    pub infeasible: bool,
    /// Every obstruction found, in the order found.
    pub obstructions: Vec<RelaxObstruction>,
    /// The search stopped (cancelled or out of time) before the answer was proven.
    pub stopped: bool,
    /// Rounds of the hitting set loop.
    pub rounds: usize,
}

/// How far the search got, for a progress bar.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct RelaxProgress {
    pub obstructions: usize,
    pub lower_bound: u64,
    pub best_cost: Option<u64>,
}

/// Stop conditions and sizes.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct RelaxOptions {
    /// Stop at this instant and report the best set and bound found.
    pub deadline: Option<std::time::Instant>,
    /// The largest neighbourhood (in vertices) searched by SAT around a vertex the heuristics could
    /// not colour, before the exact search of the whole part.
    pub local_vertices: usize,
}

impl Default for RelaxOptions {
    fn default() -> RelaxOptions {
        RelaxOptions {
            deadline: None,
            local_vertices: 300,
        }
    }
}
