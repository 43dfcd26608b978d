//! Fuzz target: the DIMACS graph reader.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data)
        && let Err(e) = tinct::doc::graph_formats::read_dimacs(text, "fuzz")
    {
        assert!(e.line >= 1 && !e.message.is_empty());
    }
});
