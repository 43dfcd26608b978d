//! Tinct: a map-colouring and region-adjacency editor.
//!
//! Layers, each using only those before it: [`engine`] (graph algorithms and certificates) <-
//! [`doc`] (the project document, edits, files) <- [`geo`] and the workers <- the GUI and [`cli`].

pub mod cli;
pub mod doc;
pub mod engine;
