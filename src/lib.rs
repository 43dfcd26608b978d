//! Tinct: a map-colouring and region-adjacency editor.
//!
//! Layers, each using only those before it: [`engine`] (graph algorithms and certificates) <-
//! [`doc`] (the project document, edits, files) <- [`geo`] (importers), [`worker`] (background
//! jobs) and [`formats`] (every file kind by extension) <- the editor (`ui`) and [`cli`].

pub mod cli;
pub mod colour;
pub mod doc;
pub mod engine;
pub mod export;
pub mod formats;
pub mod geo;
#[cfg(feature = "gui")]
pub mod ui;
pub mod worker;
