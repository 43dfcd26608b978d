//! The engine: graph algorithms and their certificates.
//!
//! It knows only graphs. It does no I/O, starts no threads, and never names the GUI, serialisation
//! or file formats; the same input always gives the same output. Long searches take a cancellation
//! flag and a progress callback as parameters.

pub mod components;
pub mod graph;

pub use components::{Components, connected_components};
pub use graph::{Cleanup, Graph, GraphError, Vertex};
pub mod colouring;
