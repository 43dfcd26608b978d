//! Fuzz target: the .dbf attribute table, read beside a fixed, valid .shp (the Columbus
//! neighbourhoods from tests/data/geo), so every input reaches the dBASE reader.
#![no_main]

use libfuzzer_sys::fuzz_target;

const SHP: &[u8] = include_bytes!("../../tests/data/geo/columbus.shp");

fuzz_target!(|data: &[u8]| {
    let options = tinct::geo::ImportOptions::default();
    if let Err(e) = tinct::geo::import_shapefile_bytes("fuzz", SHP, Some(data), None, &options) {
        assert!(!e.to_string().is_empty());
    }
});
