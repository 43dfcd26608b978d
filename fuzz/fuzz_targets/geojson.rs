//! Fuzz target: GeoJSON import (parsing, ring cleaning, projection, adjacency, diagnostics).
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let options = tinct::geo::ImportOptions::default();
    if let Err(e) = tinct::geo::import_json(data, &options) {
        assert!(!e.to_string().is_empty());
    }
});
