//! Integration tests, built as one binary to keep link time down on a small machine.

mod blocks;
mod cli;
mod colour;
mod colouring;
#[cfg(feature = "gui")]
mod editor_random;
mod edits;
mod export;
mod export_labels;
mod export_pdf;
mod geo;
mod gis_export;
mod graph_formats;
#[cfg(feature = "gui")]
mod gui;
mod hierarchy;
mod hostile;
mod interrupted_saves;
mod invariants;
mod planarity;
mod project_file;
mod projections;
mod recovery;
mod relax;
mod relax_planar;
mod sample_maps;
mod scale;
mod support;
mod worker_faults;
