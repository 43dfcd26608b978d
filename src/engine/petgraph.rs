//! The engine for petgraph users: any petgraph graph becomes an engine [`Graph`] (directions
//! ignored) with the map back to its own node ids, so the planarity test with its certificates,
//! the 2-colouring with its odd cycle and the exact colouring with its proofs work on petgraph
//! graphs. (petgraph itself has no planarity test with certificates.)
//!
//! Example: the complete graph on five nodes is not planar, and the certificate names the
//! five branch nodes of its K5 in petgraph's own node ids:
//!
//! ```
//! use petgraph::graph::UnGraph;
//! use std::sync::atomic::AtomicBool;
//! use tinct::engine::petgraph::from_petgraph;
//! use tinct::engine::{Planarity, planarity};
//!
//! let mut g = UnGraph::<&str, ()>::new_undirected();
//! let nodes: Vec<_> = ["a", "b", "c", "d", "e"].iter().map(|n| g.add_node(*n)).collect();
//! for i in 0..5 {
//!     for j in i + 1..5 {
//!         g.add_edge(nodes[i], nodes[j], ());
//!     }
//! }
//! let converted = from_petgraph(&g).unwrap();
//! let verdict = planarity(&converted.graph, &AtomicBool::new(false), &mut |_| {}).unwrap();
//! let Planarity::NonPlanar(k) = verdict else { panic!("K5 is not planar") };
//! assert_eq!(k.kind.name(), "K5");
//! let branch: Vec<&str> = k.branch_vertices.iter().map(|&v| g[converted.node(v)]).collect();
//! assert_eq!(branch, ["a", "b", "c", "d", "e"]);
//! // The certificate passes the independent checker.
//! tinct::engine::certify::check_kuratowski(&converted.graph, &k).unwrap();
//! ```
//!
//! A 5-cycle is not bipartite, the odd cycle says why, and three colours are the fewest:
//!
//! ```
//! use petgraph::graph::UnGraph;
//! use std::sync::atomic::AtomicBool;
//! use tinct::engine::petgraph::from_petgraph;
//! use tinct::engine::{Bipartite, two_colouring};
//! use tinct::engine::colouring::{ColouringProblem, SolveOptions, check_colouring, solve};
//!
//! let g = UnGraph::<(), ()>::from_edges([(0, 1), (1, 2), (2, 3), (3, 4), (4, 0)]);
//! let converted = from_petgraph(&g).unwrap();
//! let Bipartite::OddCycle(cycle) = two_colouring(&converted.graph) else { panic!() };
//! assert_eq!(cycle.len(), 5);
//!
//! let problem = ColouringProblem::new(converted.graph.clone(), 4);
//! let report = solve(&problem, &SolveOptions::default(), &AtomicBool::new(false), &mut |_| {})
//!     .unwrap();
//! assert_eq!((report.minimum, report.proven), (Some(3), true));
//! let colouring = report.colouring.unwrap();
//! check_colouring(&problem, &colouring).unwrap();
//! // Colours per petgraph node:
//! let node_colour = |n: petgraph::graph::NodeIndex| colouring[converted.vertex(n) as usize];
//! assert_ne!(node_colour(0.into()), node_colour(1.into()));
//! ```

use petgraph::visit::{EdgeRef, IntoEdgeReferences, IntoNodeIdentifiers, NodeIndexable};

use crate::engine::graph::{Cleanup, Graph, GraphError, Vertex};

/// An engine graph made from a petgraph graph, with the way back and forth between vertices
/// and the petgraph graph's node ids.
#[derive(Debug, Clone)]
pub struct Converted<N> {
    /// The engine's graph: vertex `v` is node `nodes[v]`; directions, self-loops and repeated
    /// edges are gone (see `cleanup`).
    pub graph: Graph,
    /// The node id of every vertex.
    pub nodes: Vec<N>,
    /// Vertex per petgraph node index (`NodeIndexable::to_index`); `u32::MAX` for an index no
    /// node has (removed nodes of a `StableGraph`).
    index_vertex: Vec<Vertex>,
    /// What was dropped: self-loops and repeated (or antiparallel) edges.
    pub cleanup: Cleanup,
}

impl<N: Copy> Converted<N> {
    /// The petgraph node of engine vertex `v`.
    pub fn node(&self, v: Vertex) -> N {
        self.nodes[v as usize]
    }
}

impl<N> Converted<N> {
    /// The engine vertex of a petgraph node, given its index (`NodeIndexable::to_index`, which
    /// for `Graph` is the `NodeIndex` itself).
    pub fn vertex(&self, node: impl Into<petgraph::graph::NodeIndex>) -> Vertex {
        self.vertex_of_index(node.into().index())
    }

    /// The engine vertex of the node whose `NodeIndexable::to_index` is `index`.
    pub fn vertex_of_index(&self, index: usize) -> Vertex {
        self.index_vertex.get(index).copied().unwrap_or(u32::MAX)
    }
}

/// Converts any petgraph graph (`Graph`, `StableGraph`, `GraphMap`, `Csr`, directed or not) into
/// the engine's compact graph, ignoring edge directions. Vertices are numbered in the order of
/// `node_identifiers`.
///
/// # Complexity
/// O(n + m) time and space.
pub fn from_petgraph<G>(g: G) -> Result<Converted<G::NodeId>, GraphError>
where
    G: IntoNodeIdentifiers + IntoEdgeReferences + NodeIndexable,
{
    let nodes: Vec<G::NodeId> = g.node_identifiers().collect();
    let mut index_vertex = vec![u32::MAX; g.node_bound()];
    for (v, &n) in nodes.iter().enumerate() {
        index_vertex[g.to_index(n)] = v as Vertex;
    }
    let edges: Vec<(Vertex, Vertex)> = g
        .edge_references()
        .map(|e| {
            (
                index_vertex[g.to_index(e.source())],
                index_vertex[g.to_index(e.target())],
            )
        })
        .collect();
    let (graph, cleanup) = Graph::from_edges(nodes.len(), &edges)?;
    Ok(Converted {
        graph,
        nodes,
        index_vertex,
        cleanup,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use petgraph::stable_graph::StableUnGraph;

    #[test]
    fn removed_nodes_of_a_stable_graph_are_skipped_and_ids_map_back() {
        let mut g = StableUnGraph::<u32, ()>::default();
        let n: Vec<_> = (0..4).map(|i| g.add_node(i)).collect();
        g.add_edge(n[0], n[1], ());
        g.add_edge(n[1], n[3], ());
        g.add_edge(n[3], n[3], ());
        g.remove_node(n[2]);
        let c = from_petgraph(&g).unwrap();
        assert_eq!(c.graph.vertex_count(), 3);
        assert_eq!(c.graph.edge_count(), 2);
        assert_eq!(c.cleanup.self_loops, vec![c.vertex_of_index(3)]);
        assert_eq!(c.node(c.vertex_of_index(3)), n[3]);
        assert_eq!(c.vertex_of_index(2), u32::MAX);
    }
}
