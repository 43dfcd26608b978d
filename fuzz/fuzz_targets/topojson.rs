//! Fuzz target: TopoJSON import (arcs, transforms, arc-based borders). The seeds are topologies,
//! so most inputs take the TopoJSON path of `import_json`; queen contiguity exercises corners too.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let options = tinct::geo::ImportOptions {
        rule: tinct::geo::Rule::Queen,
        ..tinct::geo::ImportOptions::default()
    };
    if let Err(e) = tinct::geo::import_json(data, &options) {
        assert!(!e.to_string().is_empty());
    }
});
