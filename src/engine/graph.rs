//! The engine's compact undirected graph: compressed sparse rows of `u32`.
//!
//! Every algorithm in the engine copies its input into this form once and then works on plain arrays.
//! Vertices are `0..n`; each undirected edge `{u, v}` is stored twice (as `u -> v` and `v -> u`), and
//! every adjacency list is sorted ascending, so the layout is canonical: equal edge sets give equal
//! arrays, whatever order the edges came in.

use std::fmt;

/// A vertex index inside one [`Graph`]. Never saved, never shown to a user.
pub type Vertex = u32;

/// Why a graph could not be built.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum GraphError {
    /// An edge names a vertex that does not exist.
    #[error("edge {index} names vertex {vertex}, but the graph has only {vertex_count} vertices")]
    VertexOutOfRange {
        index: usize,
        vertex: u32,
        vertex_count: usize,
    },
    /// More vertices or edge ends than `u32` can index.
    #[error("graph too large: {what}")]
    TooLarge { what: &'static str },
}

/// What was dropped while building a simple graph from a raw edge list.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Cleanup {
    /// Vertices that had an edge to themselves (each listed once, ascending).
    pub self_loops: Vec<Vertex>,
    /// Edges `(u, v)` with `u < v` that appeared more than once (each listed once, ascending).
    pub parallel: Vec<(Vertex, Vertex)>,
}

impl Cleanup {
    /// True when nothing had to be dropped.
    pub fn is_clean(&self) -> bool {
        self.self_loops.is_empty() && self.parallel.is_empty()
    }
}

/// A simple undirected graph in compressed sparse row form.
#[derive(Clone, PartialEq, Eq, Default)]
pub struct Graph {
    /// `offsets[v]..offsets[v + 1]` is the slice of `targets` holding the neighbours of `v`.
    offsets: Vec<u32>,
    /// Neighbour lists, each sorted ascending.
    targets: Vec<Vertex>,
}

impl fmt::Debug for Graph {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("Graph")
            .field("vertices", &self.vertex_count())
            .field("edges", &self.edge_count())
            .finish()
    }
}

impl Graph {
    /// Builds a simple graph on `vertex_count` vertices from an edge list in any order.
    ///
    /// Self-loops and repeated edges are removed and reported in the returned [`Cleanup`].
    ///
    /// # Complexity
    /// O(n + m) time (two counting passes), O(n + m) extra space.
    pub fn from_edges(
        vertex_count: usize,
        edges: &[(Vertex, Vertex)],
    ) -> Result<(Graph, Cleanup), GraphError> {
        if vertex_count >= u32::MAX as usize {
            return Err(GraphError::TooLarge {
                what: "more than 2^32 - 1 vertices",
            });
        }
        if edges.len().saturating_mul(2) >= u32::MAX as usize {
            return Err(GraphError::TooLarge {
                what: "more than 2^31 - 1 edges",
            });
        }
        let mut self_loops = Vec::new();
        let mut degree = vec![0u32; vertex_count + 1];
        for (index, &(u, v)) in edges.iter().enumerate() {
            for w in [u, v] {
                if w as usize >= vertex_count {
                    return Err(GraphError::VertexOutOfRange {
                        index,
                        vertex: w,
                        vertex_count,
                    });
                }
            }
            if u == v {
                self_loops.push(u);
            } else {
                degree[u as usize] += 1;
                degree[v as usize] += 1;
            }
        }
        // Bucket the half-edges by source, then (because we fill sources in ascending target order
        // through a second bucket pass) every list comes out sorted without a comparison sort.
        let mut by_target_offsets = vec![0u32; vertex_count + 1];
        let mut acc = 0u32;
        for v in 0..vertex_count {
            by_target_offsets[v] = acc;
            acc += degree[v];
        }
        by_target_offsets[vertex_count] = acc;
        // First pass: half-edges grouped by target.
        let mut cursor = by_target_offsets.clone();
        let mut sources_by_target = vec![0u32; acc as usize];
        for &(u, v) in edges {
            if u == v {
                continue;
            }
            sources_by_target[cursor[v as usize] as usize] = u;
            cursor[v as usize] += 1;
            sources_by_target[cursor[u as usize] as usize] = v;
            cursor[u as usize] += 1;
        }
        // Second pass: walk targets in ascending order and append to their sources' lists.
        let offsets_all = by_target_offsets;
        let mut cursor = offsets_all.clone();
        let mut sorted = vec![0u32; acc as usize];
        for t in 0..vertex_count {
            for i in offsets_all[t]..offsets_all[t + 1] {
                let s = sources_by_target[i as usize];
                sorted[cursor[s as usize] as usize] = t as u32;
                cursor[s as usize] += 1;
            }
        }
        // Compact away repeated neighbours.
        let mut offsets = Vec::with_capacity(vertex_count + 1);
        let mut targets = Vec::with_capacity(acc as usize);
        let mut parallel = Vec::new();
        offsets.push(0u32);
        for v in 0..vertex_count {
            let list = &sorted[offsets_all[v] as usize..offsets_all[v + 1] as usize];
            let mut previous: Option<u32> = None;
            for &t in list {
                if previous == Some(t) {
                    if (v as u32) < t && parallel.last() != Some(&(v as u32, t)) {
                        parallel.push((v as u32, t));
                    }
                    continue;
                }
                previous = Some(t);
                targets.push(t);
            }
            offsets.push(targets.len() as u32);
        }
        self_loops.sort_unstable();
        self_loops.dedup();
        parallel.sort_unstable();
        Ok((
            Graph { offsets, targets },
            Cleanup {
                self_loops,
                parallel,
            },
        ))
    }

    /// A graph with `vertex_count` vertices and no edges.
    pub fn empty(vertex_count: usize) -> Graph {
        Graph {
            offsets: vec![0; vertex_count + 1],
            targets: Vec::new(),
        }
    }

    /// Number of vertices.
    pub fn vertex_count(&self) -> usize {
        self.offsets.len().saturating_sub(1)
    }

    /// Number of undirected edges.
    pub fn edge_count(&self) -> usize {
        self.targets.len() / 2
    }

    /// The sorted neighbours of `v`.
    #[inline]
    pub fn neighbours(&self, v: Vertex) -> &[Vertex] {
        let v = v as usize;
        &self.targets[self.offsets[v] as usize..self.offsets[v + 1] as usize]
    }

    /// The degree of `v`.
    #[inline]
    pub fn degree(&self, v: Vertex) -> usize {
        let v = v as usize;
        (self.offsets[v + 1] - self.offsets[v]) as usize
    }

    /// True when `{u, v}` is an edge (binary search in the shorter list).
    pub fn has_edge(&self, u: Vertex, v: Vertex) -> bool {
        let (a, b) = if self.degree(u) <= self.degree(v) {
            (u, v)
        } else {
            (v, u)
        };
        self.neighbours(a).binary_search(&b).is_ok()
    }

    /// Every edge once, as `(u, v)` with `u < v`, in ascending order.
    pub fn edges(&self) -> impl Iterator<Item = (Vertex, Vertex)> + '_ {
        (0..self.vertex_count() as u32).flat_map(move |u| {
            self.neighbours(u)
                .iter()
                .copied()
                .filter(move |&v| u < v)
                .map(move |v| (u, v))
        })
    }

    /// The raw CSR arrays `(offsets, targets)`, for algorithms that index half-edges directly.
    /// The half-edge `u -> targets[i]` has index `i` for `offsets[u] <= i < offsets[u + 1]`.
    pub fn csr(&self) -> (&[u32], &[Vertex]) {
        (&self.offsets, &self.targets)
    }

    /// The subgraph induced by `keep` (a vertex list without repeats), relabelled `0..keep.len()`
    /// in the order given. Returns the subgraph; `keep[i]` is the original of new vertex `i`.
    pub fn induced(&self, keep: &[Vertex]) -> Graph {
        let mut new_index = vec![u32::MAX; self.vertex_count()];
        for (i, &v) in keep.iter().enumerate() {
            new_index[v as usize] = i as u32;
        }
        let mut edges = Vec::new();
        for (i, &v) in keep.iter().enumerate() {
            for &w in self.neighbours(v) {
                let j = new_index[w as usize];
                if j != u32::MAX && (i as u32) < j {
                    edges.push((i as u32, j));
                }
            }
        }
        // Indices come from `keep`, so they are in range and the edge set is simple.
        match Graph::from_edges(keep.len(), &edges) {
            Ok((g, _)) => g,
            Err(_) => Graph::empty(keep.len()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn builds_sorted_simple_graph_and_reports_cleanup() {
        let (g, cleanup) =
            Graph::from_edges(4, &[(2, 0), (0, 1), (1, 0), (3, 3), (2, 1), (0, 2), (0, 2)])
                .unwrap();
        assert_eq!(g.vertex_count(), 4);
        assert_eq!(g.edge_count(), 3);
        assert_eq!(g.neighbours(0), &[1, 2]);
        assert_eq!(g.neighbours(1), &[0, 2]);
        assert_eq!(g.neighbours(2), &[0, 1]);
        assert_eq!(g.neighbours(3), &[] as &[u32]);
        assert_eq!(cleanup.self_loops, vec![3]);
        assert_eq!(cleanup.parallel, vec![(0, 1), (0, 2)]);
        assert_eq!(g.edges().collect::<Vec<_>>(), vec![(0, 1), (0, 2), (1, 2)]);
        assert!(g.has_edge(2, 1) && !g.has_edge(3, 0));
    }

    #[test]
    fn rejects_out_of_range_vertex() {
        let err = Graph::from_edges(2, &[(0, 1), (1, 5)]).unwrap_err();
        assert_eq!(
            err,
            GraphError::VertexOutOfRange {
                index: 1,
                vertex: 5,
                vertex_count: 2
            }
        );
    }

    #[test]
    fn induced_subgraph_relabels() {
        let (g, _) = Graph::from_edges(5, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 0)]).unwrap();
        let h = g.induced(&[4, 0, 1]);
        assert_eq!(h.edges().collect::<Vec<_>>(), vec![(0, 1), (1, 2)]);
    }
}
