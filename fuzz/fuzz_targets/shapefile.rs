//! Fuzz target: Shapefile import. The input is a 4-byte little-endian length `n`, then `n` bytes
//! of .shp, then the .dbf (absent when nothing follows); `fuzz/make_corpus.sh` writes seeds so.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Some(head) = data.get(..4) else { return };
    let n = u32::from_le_bytes([head[0], head[1], head[2], head[3]]) as usize;
    let rest = &data[4..];
    let (shp, dbf) = rest.split_at(n.min(rest.len()));
    let dbf = (!dbf.is_empty()).then_some(dbf);
    let options = tinct::geo::ImportOptions::default();
    if let Err(e) = tinct::geo::import_shapefile_bytes("fuzz", shp, dbf, None, &options) {
        assert!(!e.to_string().is_empty());
    }
});
