//! Planarity: the left-right test, its embedding, and Kuratowski subgraphs as evidence.
//!
//! [`planarity`] answers "can this graph be drawn in the plane without crossings?" and always returns
//! evidence: a rotation system ([`Embedding`]) when the answer is yes, a subdivision of K5 or K3,3
//! ([`Kuratowski`]) when it is no. [`is_planar`] answers the same question without evidence.
//! The checkers in [`crate::engine::certify`] verify both kinds of evidence without sharing any code
//! with this module.

mod edge_addition;
mod kuratowski;
mod lr;

use std::sync::atomic::{AtomicBool, Ordering};

use super::graph::{Cleanup, Graph, GraphError, Vertex};

/// Why a planarity computation stopped without a verdict.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum PlanarityError {
    /// The caller raised the cancellation flag.
    #[error("planarity test cancelled")]
    Cancelled,
    /// The edge list could not be turned into a graph.
    #[error(transparent)]
    Graph(#[from] GraphError),
}

/// The stage a long planarity computation is in, reported through the progress callback.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Phase {
    /// First depth-first search: orienting edges and computing lowpoints.
    Orientation,
    /// Second depth-first search: the left-right constraints.
    Testing,
    /// Turning the left-right partition into a rotation system.
    Embedding,
    /// Isolating a subdivision of K5 or K3,3.
    Kuratowski,
}

/// A progress report: `done` of roughly `total` units of work in `phase`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Progress {
    pub phase: Phase,
    pub done: u64,
    pub total: u64,
}

/// Polls the cancellation flag and reports progress every few thousand steps, so that the hot loops
/// pay one counter increment per step.
pub(crate) struct Monitor<'a> {
    cancel: &'a AtomicBool,
    progress: &'a mut dyn FnMut(Progress),
    steps: u32,
    /// Set while the Kuratowski isolation runs the test on small graphs: their progress is
    /// reported as part of the isolation.
    pub(crate) inner: bool,
}

impl<'a> Monitor<'a> {
    pub(crate) fn new(cancel: &'a AtomicBool, progress: &'a mut dyn FnMut(Progress)) -> Self {
        Monitor {
            cancel,
            progress,
            steps: 0,
            inner: false,
        }
    }

    /// Counts one step; every 16384 steps checks the flag and reports.
    #[inline]
    pub(crate) fn step(
        &mut self,
        phase: Phase,
        done: u64,
        total: u64,
    ) -> Result<(), PlanarityError> {
        self.steps = self.steps.wrapping_add(1);
        if self.steps & 0x3fff == 0 {
            self.checkpoint(phase, done, total)?;
        }
        Ok(())
    }

    /// Checks the flag and reports now.
    pub(crate) fn checkpoint(
        &mut self,
        phase: Phase,
        done: u64,
        total: u64,
    ) -> Result<(), PlanarityError> {
        if self.cancel.load(Ordering::Relaxed) {
            return Err(PlanarityError::Cancelled);
        }
        let phase = if self.inner { Phase::Kuratowski } else { phase };
        (self.progress)(Progress { phase, done, total });
        Ok(())
    }
}

/// A combinatorial embedding: the clockwise cyclic order of neighbours around every vertex.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Embedding {
    /// `rotation[offsets[v]..offsets[v + 1]]` lists the neighbours of `v` in clockwise order.
    offsets: Vec<u32>,
    rotation: Vec<Vertex>,
}

impl Embedding {
    /// Builds an embedding from per-vertex rotation lists (`offsets.len() == vertex_count + 1`).
    /// No validation happens here: that is the checker's job.
    pub fn from_parts(offsets: Vec<u32>, rotation: Vec<Vertex>) -> Embedding {
        Embedding { offsets, rotation }
    }

    /// Number of vertices.
    pub fn vertex_count(&self) -> usize {
        self.offsets.len().saturating_sub(1)
    }

    /// The neighbours of `v` in clockwise order.
    pub fn rotation(&self, v: Vertex) -> &[Vertex] {
        let v = v as usize;
        &self.rotation[self.offsets[v] as usize..self.offsets[v + 1] as usize]
    }

    /// The raw arrays `(offsets, rotation)`.
    pub fn parts(&self) -> (&[u32], &[Vertex]) {
        (&self.offsets, &self.rotation)
    }

    /// Every face as the cyclic list of vertices met along its boundary.
    ///
    /// A walk leaves `v` towards `w`, then leaves `w` towards the neighbour that follows `v` in the
    /// clockwise order around `w`. Each directed edge belongs to exactly one face. Isolated vertices
    /// lie on no face walk. Faces come out in a fixed order (by their first directed edge).
    ///
    /// # Complexity
    /// O((n + m) log d) time for maximum degree d (a sort and a binary search per directed edge),
    /// O(n + m) space.
    pub fn faces(&self) -> Vec<Vec<Vertex>> {
        let n = self.vertex_count();
        let darts = self.rotation.len();
        // position of each dart's reverse inside the reverse's rotation list
        let mut sorted_pos: Vec<Vec<(Vertex, u32)>> = Vec::with_capacity(n);
        for v in 0..n as u32 {
            let mut list: Vec<(Vertex, u32)> = self
                .rotation(v)
                .iter()
                .enumerate()
                .map(|(i, &w)| (w, i as u32))
                .collect();
            list.sort_unstable();
            sorted_pos.push(list);
        }
        let position_of = |v: Vertex, w: Vertex| -> Option<usize> {
            let list = &sorted_pos[v as usize];
            list.binary_search_by_key(&w, |&(x, _)| x)
                .ok()
                .map(|i| list[i].1 as usize)
        };
        let mut used = vec![false; darts];
        let mut faces = Vec::new();
        for v in 0..n as u32 {
            let base = self.offsets[v as usize] as usize;
            for i in 0..self.rotation(v).len() {
                if used[base + i] {
                    continue;
                }
                let mut face = Vec::new();
                let (mut a, mut slot) = (v, i);
                while !used[self.offsets[a as usize] as usize + slot] {
                    used[self.offsets[a as usize] as usize + slot] = true;
                    face.push(a);
                    let b = self.rotation(a)[slot];
                    let Some(back) = position_of(b, a) else {
                        break;
                    };
                    let len = self.rotation(b).len();
                    slot = (back + 1) % len;
                    a = b;
                }
                faces.push(face);
            }
        }
        faces
    }
}

/// Which Kuratowski graph a certificate subdivides.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum KuratowskiKind {
    /// The complete graph on five vertices.
    K5,
    /// The complete bipartite graph with three vertices on each side.
    K33,
}

impl KuratowskiKind {
    /// The usual written name: `"K5"` or `"K3,3"`.
    pub fn name(self) -> &'static str {
        match self {
            KuratowskiKind::K5 => "K5",
            KuratowskiKind::K33 => "K3,3",
        }
    }
}

/// A subgraph that is a subdivision of K5 or K3,3: proof that the graph is not planar
/// (Kuratowski 1930).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Kuratowski {
    pub kind: KuratowskiKind,
    /// The 5 (K5) or 6 (K3,3) vertices of degree above two. For K3,3 the first three form one
    /// side and the last three the other; each side is ascending.
    pub branch_vertices: Vec<Vertex>,
    /// The 10 (K5) or 9 (K3,3) paths joining branch vertices, each from its smaller end to its
    /// larger end, sorted.
    pub paths: Vec<Vec<Vertex>>,
    /// All edges of the subgraph as `(u, v)` with `u < v`, ascending.
    pub edges: Vec<(Vertex, Vertex)>,
}

/// The verdict of [`planarity`], with its evidence.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Planarity {
    Planar(Embedding),
    NonPlanar(Kuratowski),
}

impl Planarity {
    pub fn is_planar(&self) -> bool {
        matches!(self, Planarity::Planar(_))
    }
}

/// Tests planarity and returns a rotation system or a Kuratowski subdivision.
///
/// Uses the left-right planarity test of de Fraysseix and Rosenstiehl in the formulation of
/// U. Brandes, "The Left-Right Planarity Test" (2009), including its embedding phase. When the
/// test fails, a Kuratowski subdivision is isolated as described in `kuratowski.rs`: a window of
/// back edges around the point where the test failed, suppressed to pieces; edge addition (Boyer
/// and Myrvold 2004) run on it to locate the obstruction as a constant number of paths; then one
/// deletion pass over those pieces with the test as an oracle.
///
/// # Complexity
/// O(n + m) time and space, for planar and non-planar graphs alike.
///
/// # Certificate
/// [`Planarity::Planar`] carries an [`Embedding`] whose face walks satisfy Euler's formula;
/// [`Planarity::NonPlanar`] carries a [`Kuratowski`] subgraph of the input. Check them with
/// [`crate::engine::certify::check_embedding`] and [`crate::engine::certify::check_kuratowski`].
///
/// # Example
/// ```
/// use std::sync::atomic::AtomicBool;
/// use tinct::engine::{Graph, planarity::{planarity, Planarity, KuratowskiKind}};
/// let k5: Vec<(u32, u32)> = (0..5).flat_map(|a| (a + 1..5).map(move |b| (a, b))).collect();
/// let (g, _) = Graph::from_edges(5, &k5).unwrap();
/// let verdict = planarity(&g, &AtomicBool::new(false), &mut |_| {}).unwrap();
/// match verdict {
///     Planarity::NonPlanar(k) => assert_eq!(k.kind, KuratowskiKind::K5),
///     Planarity::Planar(_) => unreachable!(),
/// }
/// ```
pub fn planarity(
    g: &Graph,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(Progress),
) -> Result<Planarity, PlanarityError> {
    let mut monitor = Monitor::new(cancel, progress);
    let mut state = lr::LrState::new(g);
    match state.run(&mut monitor, lr::Mode::Certify)? {
        lr::Outcome::Planar => Ok(Planarity::Planar(state.embedding(&mut monitor)?)),
        lr::Outcome::NonPlanar => {
            let clue = state.failure_clue();
            drop(state);
            Ok(Planarity::NonPlanar(kuratowski::isolate(
                g,
                clue,
                &mut monitor,
            )?))
        }
    }
}

/// Tests planarity without producing evidence (answers early when `m > 3n - 6`).
///
/// Same algorithm as [`planarity`] (Brandes 2009) without the embedding phase.
///
/// # Complexity
/// O(n + m) time and space.
///
/// # Certificate
/// None; call [`planarity`] for evidence.
pub fn is_planar(
    g: &Graph,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(Progress),
) -> Result<bool, PlanarityError> {
    let n = g.vertex_count();
    // Euler's formula bounds a simple planar graph with n >= 3 vertices by 3n - 6 edges.
    if n >= 3 && g.edge_count() > 3 * n - 6 {
        return Ok(false);
    }
    let mut monitor = Monitor::new(cancel, progress);
    let mut state = lr::LrState::new(g);
    Ok(matches!(
        state.run(&mut monitor, lr::Mode::TestOnly)?,
        lr::Outcome::Planar
    ))
}

/// The verdict for a raw edge list, for callers outside the engine.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PlanarityReport {
    /// Self-loops and repeated edges that were dropped first (they never affect planarity).
    pub cleanup: Cleanup,
    /// The verdict; vertex numbers are the caller's own (`0..vertex_count`).
    pub verdict: Planarity,
}

/// Tests the graph on `vertex_count` vertices with the given edges (any order, loops and repeats
/// allowed) and returns the verdict with evidence in the caller's vertex numbering.
///
/// See [`planarity`] for the method, complexity and certificate.
pub fn planarity_of_edges(
    vertex_count: usize,
    edges: &[(Vertex, Vertex)],
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(Progress),
) -> Result<PlanarityReport, PlanarityError> {
    let (g, cleanup) = Graph::from_edges(vertex_count, edges)?;
    let verdict = planarity(&g, cancel, progress)?;
    Ok(PlanarityReport { cleanup, verdict })
}
