//! Fuzz target: GeoPackage import from bytes (the SQLite database, its GeoPackage tables and the
//! geometry blobs). Seeds: the GDAL-written fixtures in tests/data/geo (`fuzz/make_corpus.sh`).
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let options = tinct::geo::ImportOptions::default();
    if let Err(e) = tinct::geo::import_geopackage_bytes(data, &options) {
        assert!(e.to_string().starts_with("invalid GeoPackage"));
    }
});
