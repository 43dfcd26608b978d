//! Tinct: a map-colouring and region-adjacency editor.
//!
//! Layers, each using only those before it: [`engine`] (graph algorithms and certificates) and
//! [`colour`] (colour science for palettes) <- [`doc`] (the project document, edits, files) <-
//! [`geo`] (importers), [`analysis`] (rules, planarity and colouring of one revision, in region
//! terms), [`formats`] (every file kind by extension) and [`export`] (SVG, PNG, GeoJSON, CSV) <-
//! [`worker`] (background jobs) and [`session`] (an open project with its history and rules) <- the
//! editor (`ui`) and [`cli`]; [`atomic`] writes files for all of them; [`geometry`] holds the plane geometry they share, and
//! [`projection`] the map projections from longitude/latitude to metres.

pub mod analysis;
pub mod atomic;
pub mod cli;
pub mod colour;
pub mod doc;
pub mod engine;
pub mod export;
pub mod formats;
pub mod geo;
pub mod geometry;
pub mod projection;
pub mod session;
#[cfg(feature = "gui")]
pub mod ui;
pub mod worker;
