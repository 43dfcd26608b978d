//! Fuzz target: FlatGeobuf import from bytes. Seeds: the GDAL-written fixtures in tests/data/geo
//! (`fuzz/make_corpus.sh`).
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let options = tinct::geo::ImportOptions::default();
    if let Err(e) = tinct::geo::import_flatgeobuf_bytes(data, &options) {
        assert!(e.to_string().starts_with("invalid FlatGeobuf"));
    }
});
