//! Fuzz target: the `.tinct` project file reader, from raw bytes as `doc::file::load` sees them.
#![no_main]

use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    // The loader rejects text that is not UTF-8 before parsing; mirror that here.
    if let Ok(text) = std::str::from_utf8(data)
        && let Err(e) = tinct::doc::file::from_str(text)
    {
        assert!(!e.to_string().is_empty());
    }
});
