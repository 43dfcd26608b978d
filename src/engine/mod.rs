//! The engine: graph algorithms and their certificates.
//!
//! It knows only graphs. It does no I/O, starts no threads, and never names the GUI, serialisation
//! or file formats; the same input always gives the same output. Long searches take a cancellation
//! flag and a progress callback as parameters.

pub mod biconnected;
pub mod bipartite;
pub mod certify;
pub mod colouring;
pub mod components;
pub mod graph;
pub mod petgraph;
pub mod planarity;
pub mod relax;

pub use biconnected::{Biconnected, biconnected_components};
pub use bipartite::{Bipartite, two_colouring};
pub use components::{Components, connected_components};
pub use graph::{Cleanup, Graph, GraphError, Vertex};
pub use planarity::{
    Embedding, Kuratowski, KuratowskiKind, Planarity, PlanarityError, PlanarityReport, is_planar,
    planarity, planarity_of_edges,
};
