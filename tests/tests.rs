//! Integration tests, built as one binary to keep link time down.

mod blocks;
mod planar_gen;
mod planarity;
