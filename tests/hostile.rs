//! Hostile input: every reader is fed mutated copies of the real and sample files (bit flips,
//! truncations, insertions, removals, duplicated chunks, numbers replaced by huge ones) and must
//! never panic, must refuse bad input with a clear message that names the place where it can,
//! and must never allocate for a count the file declares but does not back with bytes.
//!
//! Allocation is measured by a counting allocator (the most bytes live at once on the reading
//! thread), so "no unbounded allocation" is checked, not assumed. The mutation runs are seeded
//! (set `TINCT_HOSTILE_SEED` to try others) and bounded so the module stays fast in CI; the
//! cargo-fuzz targets in `fuzz/` run the same readers for as long as one likes.

// Calls into the C library (resource usage, signals, a counting allocator) need `unsafe`.
#![allow(unsafe_code)]

use std::alloc::{GlobalAlloc, Layout, System};
use std::cell::Cell;
use std::path::PathBuf;

use proptest::prelude::*;
use proptest::test_runner::{Config, RngAlgorithm, TestError, TestRng, TestRunner};

use tinct::doc::file::{self, FileError};
use tinct::doc::graph_formats::{self, MAX_VERTICES};
use tinct::geo::{self, ImportError, ImportOptions};

// ---- Counting allocator ----

struct Counting;

thread_local! {
    static LIVE: Cell<isize> = const { Cell::new(0) };
    static PEAK: Cell<isize> = const { Cell::new(0) };
}

fn note(delta: isize) {
    let _ = LIVE.try_with(|live| {
        let now = live.get() + delta;
        live.set(now);
        let _ = PEAK.try_with(|peak| {
            if now > peak.get() {
                peak.set(now);
            }
        });
    });
}

// SAFETY: every call is forwarded to the system allocator unchanged; the counters only observe.
unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        let p = unsafe { System.alloc(layout) };
        if !p.is_null() {
            note(layout.size() as isize);
        }
        p
    }
    unsafe fn alloc_zeroed(&self, layout: Layout) -> *mut u8 {
        let p = unsafe { System.alloc_zeroed(layout) };
        if !p.is_null() {
            note(layout.size() as isize);
        }
        p
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        unsafe { System.dealloc(ptr, layout) };
        note(-(layout.size() as isize));
    }
    unsafe fn realloc(&self, ptr: *mut u8, layout: Layout, new_size: usize) -> *mut u8 {
        let p = unsafe { System.realloc(ptr, layout, new_size) };
        if !p.is_null() {
            note(new_size as isize - layout.size() as isize);
        }
        p
    }
}

#[global_allocator]
static ALLOCATOR: Counting = Counting;

/// Runs `f` and returns its result and the most bytes it had allocated at once on this thread.
fn peak_bytes<T>(f: impl FnOnce() -> T) -> (T, usize) {
    let start = LIVE.with(Cell::get);
    PEAK.with(|p| p.set(start));
    let out = f();
    let peak = PEAK.with(Cell::get) - start;
    (out, peak.max(0) as usize)
}

/// The most a reader may hold at once for an input of `len` bytes: a fixed allowance plus a
/// multiple of the input. The multiple is generous (geometry import builds rings, an R-tree and
/// diagnostics; the largest ratio measured on the unmutated seeds is printed by
/// `seeds_load_and_stay_within_the_allocation_bound`), but a count trusted from the file (a
/// billion vertices, records or points) exceeds it by orders of magnitude.
fn allocation_bound(len: usize) -> usize {
    32 * 1024 * 1024 + 400 * len
}

// ---- The readers ----

#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Format {
    Project,
    GeoJson,
    TopoJson,
    Shapefile,
    Dbf,
    Dimacs,
    EdgeList,
    GeoPackage,
    FlatGeobuf,
}

impl Format {
    fn is_text(self) -> bool {
        !matches!(
            self,
            Format::Shapefile | Format::Dbf | Format::GeoPackage | Format::FlatGeobuf
        )
    }
}

fn data(path: &str) -> Vec<u8> {
    let full = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join(path);
    std::fs::read(&full).unwrap_or_else(|e| panic!("{}: {e}", full.display()))
}

fn columbus_shp() -> Vec<u8> {
    data("tests/data/geo/columbus.shp")
}

fn columbus_dbf() -> Vec<u8> {
    data("tests/data/geo/columbus.dbf")
}

/// The unmutated inputs for each format: the repository's real and sample files.
fn seeds(format: Format) -> Vec<Vec<u8>> {
    match format {
        Format::Project => vec![
            data("tests/golden/v1/minimal.tinct"),
            data("tests/golden/v1/full.tinct"),
            data("sample-maps/three-valleys.tinct"),
            data("sample-maps/exclave-coast.tinct"),
        ],
        Format::GeoJson => vec![
            data("sample-maps/exclave-coast.geojson"),
            data("sample-maps/three-valleys.geojson"),
            data("sample-maps/vessland-province.geojson"),
        ],
        Format::TopoJson => vec![
            data("tests/data/geo/world_subset.topojson"),
            data("tests/data/geo/us_states_subset.topojson"),
        ],
        Format::Shapefile => vec![columbus_shp()],
        Format::Dbf => vec![columbus_dbf()],
        // Written by GDAL's ogr2ogr (tests/data/geo/PROVENANCE.md).
        Format::GeoPackage => vec![
            data("tests/data/geo/columbus.gpkg"),
            data("tests/data/geo/us_states_subset.gpkg"),
        ],
        Format::FlatGeobuf => vec![
            data("tests/data/geo/columbus.fgb"),
            data("tests/data/geo/us_states_subset.fgb"),
        ],
        Format::Dimacs | Format::EdgeList => [
            "tests/golden/v1/full.tinct",
            "sample-maps/three-valleys.tinct",
        ]
        .iter()
        .map(|p| {
            let doc = file::from_bytes(&data(p)).unwrap();
            if format == Format::Dimacs {
                graph_formats::write_dimacs(&doc).into_bytes()
            } else {
                graph_formats::write_edge_list(&doc).into_bytes()
            }
        })
        .collect(),
    }
}

/// Feeds `bytes` to the reader for `format`. `Ok(regions)` when it loads; `Err(message)` when it
/// refuses, after checking that the message is clear. A panic fails the calling test.
fn read(format: Format, bytes: &[u8]) -> Result<usize, String> {
    let options = ImportOptions::default();
    let position_named = |e: &ImportError| match e {
        ImportError::Json { line, column, .. } => *line >= 1 && *column >= 1,
        _ => true,
    };
    let outcome: Result<usize, String> = match format {
        Format::Project => match file::from_bytes(bytes) {
            Ok(doc) => Ok(doc.regions().len()),
            Err(e) => {
                if let FileError::Syntax { line, column, .. } = &e {
                    // Lines and columns count from 1 and lie within the text (or just past it).
                    let lines = bytes.iter().filter(|&&b| b == b'\n').count() + 2;
                    assert!(
                        (1..=lines).contains(line) && *column >= 1,
                        "position {line}:{column} outside the text: {e}"
                    );
                    assert!(e.to_string().starts_with("line "), "{e}");
                }
                Err(e.to_string())
            }
        },
        Format::GeoJson | Format::TopoJson => match geo::import_json(bytes, &options) {
            Ok(map) => Ok(map.regions.len()),
            Err(e) => {
                assert!(position_named(&e), "{e}");
                Err(e.to_string())
            }
        },
        Format::Shapefile | Format::Dbf => {
            let (shp, dbf) = if format == Format::Shapefile {
                (bytes.to_vec(), columbus_dbf())
            } else {
                (columbus_shp(), bytes.to_vec())
            };
            match geo::import_shapefile_bytes("hostile", &shp, Some(&dbf), None, &options) {
                Ok(map) => Ok(map.regions.len()),
                Err(e) => {
                    let text = e.to_string();
                    // Errors name the file they are about.
                    assert!(
                        text.contains("hostile.shp") || text.contains("hostile.dbf"),
                        "{text}"
                    );
                    Err(text)
                }
            }
        }
        Format::GeoPackage => match geo::import_geopackage_bytes(bytes, &options) {
            Ok(map) => Ok(map.regions.len()),
            Err(e) => {
                let text = e.to_string();
                assert!(text.starts_with("invalid GeoPackage"), "{text}");
                Err(text)
            }
        },
        Format::FlatGeobuf => match geo::import_flatgeobuf_bytes(bytes, &options) {
            Ok(map) => Ok(map.regions.len()),
            Err(e) => {
                let text = e.to_string();
                assert!(text.starts_with("invalid FlatGeobuf"), "{text}");
                Err(text)
            }
        },
        Format::Dimacs | Format::EdgeList => {
            // Graph files are text; the loader refuses other bytes before parsing (its own test
            // below), so a mutation that breaks UTF-8 checks only that refusal.
            let Ok(text) = std::str::from_utf8(bytes) else {
                return Err("not UTF-8".into());
            };
            let result = if format == Format::Dimacs {
                graph_formats::read_dimacs(text, "hostile")
            } else {
                graph_formats::read_edge_list(text, "hostile")
            };
            match result {
                Ok((doc, _)) => Ok(doc.regions().len()),
                Err(e) => {
                    let lines = text.lines().count().max(1);
                    assert!(
                        (1..=lines).contains(&e.line),
                        "line {} of {lines}: {e}",
                        e.line
                    );
                    Err(e.to_string())
                }
            }
        }
    };
    if let Err(message) = &outcome {
        assert!(
            message.trim().len() >= 8,
            "an error message should say what is wrong: {message:?}"
        );
    }
    outcome
}

// ---- Mutations ----

/// Numbers a hostile file might declare: past `u32`, past `u64`, negative, not finite.
const HUGE_TEXT: [&str; 8] = [
    "4000000000",
    "4294967296",
    "18446744073709551616",
    "99999999999999999999999999",
    "-1",
    "1e308",
    "-9223372036854775808",
    "2147483648",
];
const HUGE_WORDS: [u32; 5] = [
    0xFFFF_FFFF,
    0x7FFF_FFFF,
    0x8000_0000,
    0x4000_0000,
    0x0010_0000,
];

#[derive(Clone, Debug)]
enum Mutation {
    Flip {
        at: u32,
        bit: u8,
    },
    Truncate {
        keep: u32,
    },
    Insert {
        at: u32,
        bytes: Vec<u8>,
    },
    Remove {
        at: u32,
        len: u16,
    },
    Duplicate {
        from: u32,
        len: u16,
        to: u32,
    },
    /// Text: the number at or after `at` becomes `HUGE_TEXT[which]`. Binary: a 32-bit word at
    /// `at` (or at one of the format's count fields) becomes `HUGE_WORDS[which]`.
    Huge {
        at: u32,
        which: u8,
        field: bool,
        big_endian: bool,
    },
}

fn mutation(text: bool) -> impl Strategy<Value = Mutation> {
    // Text formats get printable ASCII and newlines, so most mutants stay valid UTF-8 and reach
    // the parser; bit flips stay in the low seven bits for the same reason.
    let byte = if text {
        prop_oneof![Just(b'\n'), Just(b' '), 0x21u8..0x7f].boxed()
    } else {
        any::<u8>().boxed()
    };
    let bits = if text { 7u8 } else { 8u8 };
    prop_oneof![
        3 => (any::<u32>(), 0..bits).prop_map(|(at, bit)| Mutation::Flip { at, bit }),
        1 => any::<u32>().prop_map(|keep| Mutation::Truncate { keep }),
        2 => (any::<u32>(), proptest::collection::vec(byte, 1..12))
            .prop_map(|(at, bytes)| Mutation::Insert { at, bytes }),
        1 => (any::<u32>(), 1u16..64).prop_map(|(at, len)| Mutation::Remove { at, len }),
        1 => (any::<u32>(), 1u16..512, any::<u32>())
            .prop_map(|(from, len, to)| Mutation::Duplicate { from, len, to }),
        3 => (any::<u32>(), any::<u8>(), any::<bool>(), any::<bool>()).prop_map(
            |(at, which, field, big_endian)| Mutation::Huge { at, which, field, big_endian }
        ),
    ]
}

/// Byte offsets of count and length fields: shapefile header and first record (ESRI Shapefile
/// Technical Description, 1998, tables 1 and 6: file length at 24, content length at 104, part
/// and point counts at 144 and 148); dBASE header (record count at 4, header and record sizes
/// at 8 and 10; dBASE III file structure, common practice).
fn count_fields(format: Format) -> &'static [usize] {
    match format {
        Format::Shapefile => &[24, 104, 144, 148, 32, 112],
        Format::Dbf => &[4, 8, 10],
        // SQLite's header: page size, change counter, page count, first freelist page, schema
        // cookie (big-endian).
        Format::GeoPackage => &[16, 24, 28, 32, 40],
        // FlatGeobuf: the header's size prefix.
        Format::FlatGeobuf => &[8],
        _ => &[],
    }
}

fn apply(format: Format, bytes: &mut Vec<u8>, m: &Mutation) {
    let pos = |at: u32, len: usize| if len == 0 { 0 } else { at as usize % (len + 1) };
    match m {
        Mutation::Flip { at, bit } => {
            if !bytes.is_empty() {
                let i = *at as usize % bytes.len();
                bytes[i] ^= 1 << bit;
            }
        }
        Mutation::Truncate { keep } => {
            let keep = pos(*keep, bytes.len());
            bytes.truncate(keep);
        }
        Mutation::Insert { at, bytes: new } => {
            let i = pos(*at, bytes.len());
            bytes.splice(i..i, new.iter().copied());
        }
        Mutation::Remove { at, len } => {
            let i = pos(*at, bytes.len());
            let end = (i + *len as usize).min(bytes.len());
            bytes.drain(i..end);
        }
        Mutation::Duplicate { from, len, to } => {
            let i = pos(*from, bytes.len());
            let end = (i + *len as usize).min(bytes.len());
            let chunk = bytes[i..end].to_vec();
            let j = pos(*to, bytes.len());
            bytes.splice(j..j, chunk);
        }
        Mutation::Huge {
            at,
            which,
            field,
            big_endian,
        } => {
            if format.is_text() {
                let start = pos(*at, bytes.len());
                let Some(first) = bytes[start..]
                    .iter()
                    .position(u8::is_ascii_digit)
                    .map(|p| p + start)
                else {
                    return;
                };
                let end = bytes[first..]
                    .iter()
                    .position(|b| !b.is_ascii_digit())
                    .map_or(bytes.len(), |p| p + first);
                let huge = HUGE_TEXT[*which as usize % HUGE_TEXT.len()];
                bytes.splice(first..end, huge.bytes());
            } else {
                let fields = count_fields(format);
                let i = if *field && !fields.is_empty() {
                    fields[*at as usize % fields.len()]
                } else {
                    *at as usize % bytes.len().max(1)
                };
                let word = HUGE_WORDS[*which as usize % HUGE_WORDS.len()];
                let word = if *big_endian {
                    word.to_be_bytes()
                } else {
                    word.to_le_bytes()
                };
                for (k, b) in word.into_iter().enumerate() {
                    if let Some(slot) = bytes.get_mut(i + k) {
                        *slot = b;
                    }
                }
            }
        }
    }
}

/// Runs `cases` mutants of the seeds of `format` through its reader.
fn hostile(format: Format, cases: u32) {
    let seeds = seeds(format);
    let seed: u64 = std::env::var("TINCT_HOSTILE_SEED")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(0x7115_7C7A);
    let mut key = [0u8; 32];
    key[..8].copy_from_slice(&seed.to_le_bytes());
    key[8] = format as u8;
    let config = Config {
        cases,
        failure_persistence: None,
        // Shrinking a failure through a large file is slow; a handful of steps finds a small one.
        max_shrink_iters: 200,
        ..Config::default()
    };
    let mut runner =
        TestRunner::new_with_rng(config, TestRng::from_seed(RngAlgorithm::ChaCha, &key));
    let strategy = (
        0..seeds.len(),
        proptest::collection::vec(mutation(format.is_text()), 1..4),
    );
    let result = runner.run(&strategy, |(which, mutations)| {
        let mut bytes = seeds[which].clone();
        for m in &mutations {
            apply(format, &mut bytes, m);
        }
        let (_, peak) = peak_bytes(|| read(format, &bytes));
        prop_assert!(
            peak <= allocation_bound(bytes.len()),
            "{format:?}: {peak} bytes live at once for a {}-byte input",
            bytes.len()
        );
        Ok(())
    });
    match result {
        Ok(()) => {}
        Err(TestError::Fail(reason, (which, mutations))) => {
            panic!("{format:?} seed {which} with {mutations:?}: {reason}")
        }
        Err(e) => panic!("{format:?}: {e}"),
    }
}

#[test]
fn seeds_load_and_stay_within_the_allocation_bound() {
    for format in [
        Format::Project,
        Format::GeoJson,
        Format::TopoJson,
        Format::Shapefile,
        Format::Dbf,
        Format::Dimacs,
        Format::EdgeList,
        Format::GeoPackage,
        Format::FlatGeobuf,
    ] {
        for (i, bytes) in seeds(format).iter().enumerate() {
            let (regions, peak) = peak_bytes(|| read(format, bytes));
            let regions = regions.unwrap_or_else(|e| panic!("{format:?} seed {i}: {e}"));
            // The minimal golden project is the only seed without regions.
            assert!(
                regions > 0 || bytes.len() < 400,
                "{format:?} seed {i} has no regions"
            );
            println!(
                "{format:?} seed {i}: {} bytes, {regions} regions, peak {peak} bytes ({:.1}x)",
                bytes.len(),
                peak as f64 / bytes.len() as f64
            );
            assert!(peak <= allocation_bound(bytes.len()), "{format:?} seed {i}");
        }
    }
}

#[test]
fn mutated_project_files_are_refused_clearly() {
    hostile(Format::Project, 800);
}

#[test]
fn mutated_geojson_is_refused_clearly() {
    hostile(Format::GeoJson, 400);
}

#[test]
fn mutated_topojson_is_refused_clearly() {
    hostile(Format::TopoJson, 500);
}

#[test]
fn mutated_shapefiles_are_refused_clearly() {
    hostile(Format::Shapefile, 800);
}

#[test]
fn mutated_dbf_tables_are_refused_clearly() {
    hostile(Format::Dbf, 500);
}

#[test]
fn mutated_geopackages_are_refused_clearly() {
    hostile(Format::GeoPackage, 300);
}

#[test]
fn mutated_flatgeobuf_files_are_refused_clearly() {
    hostile(Format::FlatGeobuf, 600);
}

/// The GeoPackage seeds with one feature's geometry blob replaced by `damage(blob)`, through
/// SQLite, so that the database stays sound and only the blob is hostile.
fn damaged_blob(seed: &[u8], fid: i64, damage: impl Fn(&mut Vec<u8>)) -> Vec<u8> {
    let mut db = rusqlite::Connection::open_in_memory().unwrap();
    db.deserialize_read_exact(rusqlite::MAIN_DB, seed, seed.len(), false)
        .unwrap();
    let table: String = db
        .query_row("SELECT table_name FROM gpkg_geometry_columns", [], |r| {
            r.get(0)
        })
        .unwrap();
    let mut blob: Vec<u8> = db
        .query_row(
            &format!("SELECT geom FROM \"{table}\" WHERE fid = ?1"),
            [fid],
            |r| r.get(0),
        )
        .unwrap();
    damage(&mut blob);
    // The spatial index's triggers call GeoPackage SQL functions that plain SQLite lacks.
    let triggers: Vec<String> = db
        .prepare("SELECT name FROM sqlite_master WHERE type = 'trigger'")
        .unwrap()
        .query_map([], |r| r.get(0))
        .unwrap()
        .collect::<Result<_, _>>()
        .unwrap();
    for trigger in triggers {
        db.execute(&format!("DROP TRIGGER \"{trigger}\""), [])
            .unwrap();
    }
    db.execute(
        &format!("UPDATE \"{table}\" SET geom = ?1 WHERE fid = ?2"),
        rusqlite::params![blob, fid],
    )
    .unwrap();
    db.serialize(rusqlite::MAIN_DB).unwrap().to_vec()
}

#[test]
fn geopackage_blobs_cut_short_or_declaring_huge_counts_are_refused_naming_the_feature() {
    // GeoPackage Encoding Standard (OGC 12-128r18) clause 2.1.3: "GP", version, flags (envelope
    // code in bits 1-3, 5 to 7 invalid), SRS id, envelope, then WKB (OGC 06-103r4).
    let seed = data("tests/data/geo/columbus.gpkg");
    type Damage = Box<dyn Fn(&mut Vec<u8>)>;
    let cases: Vec<(&str, Damage, &str)> = vec![
        (
            "shorter than its header",
            Box::new(|b| b.truncate(5)),
            "fewer than the 8",
        ),
        (
            "cut inside the WKB",
            Box::new(|b| b.truncate(b.len() / 2)),
            "bytes are left",
        ),
        (
            "envelope code 7",
            Box::new(|b| b[3] = (b[3] & !0b1110) | 0b1110),
            "envelope code 7",
        ),
        ("not GP", Box::new(|b| b[0] = b'X'), "does not start"),
        (
            "four billion rings",
            Box::new(|b| {
                let start = 8 + 32 + 5; // header, xy envelope, WKB byte order and type
                b[start..start + 4].copy_from_slice(&u32::MAX.to_le_bytes());
            }),
            "declares 4294967295 rings",
        ),
    ];
    for (what, damage, expected) in cases {
        let bytes = damaged_blob(&seed, 7, damage);
        let (result, peak) = peak_bytes(|| read(Format::GeoPackage, &bytes));
        let message = result.expect_err(what);
        assert!(message.contains("feature 7"), "{what}: {message}");
        assert!(message.contains(expected), "{what}: {message}");
        assert!(
            peak <= allocation_bound(bytes.len()),
            "{what}: {peak} bytes"
        );
    }
}

#[test]
fn files_that_are_not_geopackages_are_refused_saying_what_they_are() {
    let refused = |bytes: &[u8], expected: &str| {
        let e = geo::import_geopackage_bytes(bytes, &ImportOptions::default()).unwrap_err();
        assert!(e.to_string().contains(expected), "{e}");
    };
    refused(b"", "not an SQLite database");
    refused(
        &data("tests/data/geo/columbus.shp"),
        "not an SQLite database",
    );
    // A sound SQLite database without the GeoPackage tables.
    let mut db = rusqlite::Connection::open_in_memory().unwrap();
    db.execute("CREATE TABLE t (x)", []).unwrap();
    let plain = db.serialize(rusqlite::MAIN_DB).unwrap().to_vec();
    refused(&plain, "no gpkg_contents");
    // The first pages only, as an interrupted copy leaves it.
    let seed = data("tests/data/geo/columbus.gpkg");
    let e = geo::import_geopackage_bytes(&seed[..8192], &ImportOptions::default()).unwrap_err();
    assert!(e.to_string().starts_with("invalid GeoPackage"), "{e}");
}

#[test]
fn mutated_dimacs_files_are_refused_clearly() {
    hostile(Format::Dimacs, 800);
}

#[test]
fn mutated_edge_lists_are_refused_clearly() {
    hostile(Format::EdgeList, 800);
}

// ---- Tiny files declaring huge counts ----

/// Asserts that reading `bytes` fails with a message containing every one of `expected`, and
/// that the reader held little memory while refusing (it did not trust the declared count).
fn refused_small(format: Format, bytes: &[u8], expected: &[&str]) {
    let (result, peak) = peak_bytes(|| read(format, bytes));
    let message = match result {
        Err(m) => m,
        Ok(n) => panic!("{format:?}: expected a refusal, loaded {n} regions"),
    };
    for e in expected {
        assert!(message.contains(e), "{message:?} should mention {e:?}");
    }
    assert!(
        peak <= allocation_bound(bytes.len()),
        "{format:?}: {peak} bytes allocated to refuse a {}-byte file",
        bytes.len()
    );
}

#[test]
fn dimacs_declaring_four_billion_vertices_is_refused_naming_the_limit() {
    refused_small(
        Format::Dimacs,
        b"p edge 4000000000 1\ne 1 2\n",
        &["line 1", "4000000000 vertices", "2000000"],
    );
    // One past the limit is refused too; the limit itself is a documented constant.
    let text = format!("p edge {} 0\n", MAX_VERTICES + 1);
    refused_small(Format::Dimacs, text.as_bytes(), &["line 1", "the limit is"]);
    // A count that does not fit in 64 bits is a plain syntax error, not an overflow.
    refused_small(
        Format::Dimacs,
        b"c\np edge 99999999999999999999999 1\n",
        &["line 2", "whole number"],
    );
}

#[test]
fn edge_list_declaring_four_billion_vertices_is_refused_naming_the_limit() {
    refused_small(
        Format::EdgeList,
        b"4000000000 1\n0 1\n",
        &["line 1", "the limit is 2000000 vertices"],
    );
}

/// A 100-byte shapefile header (ESRI Shapefile Technical Description, 1998, table 1: file code
/// 9994 big-endian at 0, file length in 16-bit words big-endian at 24, version 1000 and shape
/// type little-endian at 28 and 32) followed by `records`.
fn shapefile(shape_type: i32, records: &[u8]) -> Vec<u8> {
    let mut out = vec![0u8; 100];
    out[0..4].copy_from_slice(&9994i32.to_be_bytes());
    let words = ((100 + records.len()) / 2) as i32;
    out[24..28].copy_from_slice(&words.to_be_bytes());
    out[28..32].copy_from_slice(&1000i32.to_le_bytes());
    out[32..36].copy_from_slice(&shape_type.to_le_bytes());
    out.extend_from_slice(records);
    out
}

#[test]
fn shapefile_record_claiming_four_gigabytes_is_refused_naming_the_record() {
    // Record header: number 1, content length 0x7FFFFFFF words (4 GB), then a polygon type.
    let mut record = Vec::new();
    record.extend_from_slice(&1i32.to_be_bytes());
    record.extend_from_slice(&i32::MAX.to_be_bytes());
    record.extend_from_slice(&5i32.to_le_bytes());
    let bytes = shapefile(5, &record);
    refused_small(
        Format::Shapefile,
        &bytes,
        &["hostile.shp", "record 1 (byte 100)", "truncated"],
    );
}

#[test]
fn shapefile_polygon_claiming_two_billion_points_is_refused_naming_the_record() {
    // A polygon record of 48 bytes: type 5, bounding box, 1 part, i32::MAX points, part index 0.
    let mut content = Vec::new();
    content.extend_from_slice(&5i32.to_le_bytes());
    content.extend_from_slice(&[0u8; 32]);
    content.extend_from_slice(&1i32.to_le_bytes());
    content.extend_from_slice(&i32::MAX.to_le_bytes());
    content.extend_from_slice(&0i32.to_le_bytes());
    let mut record = Vec::new();
    record.extend_from_slice(&1i32.to_be_bytes());
    record.extend_from_slice(&((content.len() / 2) as i32).to_be_bytes());
    record.extend_from_slice(&content);
    let bytes = shapefile(5, &record);
    refused_small(
        Format::Shapefile,
        &bytes,
        &[
            "record 1 (byte 100)",
            "2147483647 points",
            "the record holds 48",
        ],
    );
}

#[test]
fn dbf_claiming_four_billion_records_reads_the_records_present_and_says_so() {
    // The real table with its record count (bytes 4..8, little-endian) raised to u32::MAX.
    let mut dbf = columbus_dbf();
    dbf[4..8].copy_from_slice(&u32::MAX.to_le_bytes());
    let options = ImportOptions::default();
    let (map, peak) = peak_bytes(|| {
        geo::import_shapefile_bytes("hostile", &columbus_shp(), Some(&dbf), None, &options)
    });
    let map = map.unwrap();
    // Columbus has 49 neighbourhoods (Anselin 1988, the dataset's source; see PROVENANCE.md).
    assert_eq!(map.regions.len(), 49);
    assert!(
        map.diagnostics.iter().any(|d| d
            .message
            .contains("declares 4294967295 records but holds only 49")),
        "{:?}",
        map.diagnostics
    );
    assert!(peak <= allocation_bound(dbf.len() + columbus_shp().len()));
    // Records of zero bytes cannot exist (each starts with its deletion flag): refused.
    let mut zero = columbus_dbf();
    zero[10..12].copy_from_slice(&0u16.to_le_bytes());
    refused_small(Format::Dbf, &zero, &["hostile.dbf", "0 bytes"]);
}

#[test]
fn topojson_with_an_overflowing_transform_is_refused_naming_the_arc() {
    let text = br#"{"type":"Topology","transform":{"scale":[1e308,1e308],"translate":[0,0]},
        "objects":{"a":{"type":"GeometryCollection","geometries":[{"type":"Polygon","arcs":[[0]]}]}},
        "arcs":[[[0,0],[1e10,0],[0,1],[-1e10,-1]]]}"#;
    refused_small(
        Format::TopoJson,
        text,
        &["arc 0, position 1", "not finite", "transform"],
    );
}

#[test]
fn topojson_with_a_huge_arc_index_is_refused_naming_it() {
    let text = br#"{"type":"Topology","objects":{"a":{"type":"GeometryCollection","geometries":[
        {"type":"Polygon","arcs":[[4000000000]]}]}},"arcs":[[[0,0],[1,0],[1,1],[0,0]]]}"#;
    refused_small(
        Format::TopoJson,
        text,
        &["geometry 0", "arc 4000000000", "only 1 arcs"],
    );
    let text =
        br#"{"type":"Topology","objects":{"a":{"type":"Polygon","arcs":[[-9223372036854775808]]}},
        "arcs":[[[0,0],[1,0],[1,1],[0,0]]]}"#;
    refused_small(Format::TopoJson, text, &["arc -9223372036854775808"]);
}

#[test]
fn topojson_referring_to_one_arc_a_million_times_is_refused() {
    // One arc of 1,000 positions used 2,000 times in one ring: two million positions from a
    // file of 30 kB, past the limit of four uses per arc plus a million positions.
    let arc: Vec<String> = (0..1000).map(|i| format!("[{i},{}]", i % 7)).collect();
    let refs = vec!["0"; 2000].join(",");
    let text = format!(
        r#"{{"type":"Topology","objects":{{"a":{{"type":"Polygon","arcs":[[{refs}]]}}}},"arcs":[[{}]]}}"#,
        arc.join(",")
    );
    refused_small(
        Format::TopoJson,
        text.as_bytes(),
        &[
            "geometry 0",
            "more often than a topology can",
            "1000 arc positions",
        ],
    );
}

#[test]
fn graph_files_that_are_not_utf8_are_refused_naming_the_line() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("broken.col");
    std::fs::write(&path, b"c ok\np edge 2 1\ne 1 \xff2\n").unwrap();
    let e = tinct::formats::load(&path, &Default::default())
        .err()
        .unwrap()
        .to_string();
    assert!(
        e.contains("broken.col") && e.contains("line 3") && e.contains("UTF-8"),
        "{e}"
    );
    let path = dir.path().join("broken.tinct");
    std::fs::write(&path, b"(\n  format_version: 1,\n  title: \"\xc3\x28\",\n").unwrap();
    let e = tinct::formats::load(&path, &Default::default())
        .err()
        .unwrap()
        .to_string();
    assert!(e.contains("line 3") && e.contains("UTF-8"), "{e}");
}

// ---- Regressions found by the mutation tests above ----

#[test]
fn regression_json_error_just_after_a_line_break_names_column_one() {
    // serde_json reports column 0 for a position just after a line break; the message named
    // "column 0" and repeated the position.
    let text = b"{\"type\": \"FeatureCollection\", \"features\": [\n{\"type\": \"Feature\", \"properties\": {\"name\": \"a\n\"}}]}";
    match geo::import_json(text, &ImportOptions::default()) {
        Err(ImportError::Json {
            line,
            column,
            message,
        }) => {
            assert!(line >= 2 && column >= 1, "{line}:{column}");
            assert!(message.contains("control character"), "{message}");
            assert!(!message.contains(" at line "), "{message}");
        }
        other => panic!("expected a JSON error, got {other:?}"),
    }
}

/// The exact mutants that once made border detection hold hundreds of megabytes: one coordinate
/// turned huge, so the rounding tolerance (a fraction of the map's diagonal) covered every
/// boundary and every pair of boundary pieces was examined and kept.
#[test]
fn regression_one_far_off_coordinate_no_longer_makes_border_detection_quadratic() {
    let cases = [
        (
            Format::Shapefile,
            0,
            Mutation::Flip {
                at: 139_660_031,
                bit: 1,
            },
        ),
        (
            Format::TopoJson,
            0,
            Mutation::Huge {
                at: 1_029_108_905,
                which: 138,
                field: false,
                big_endian: false,
            },
        ),
        (
            Format::GeoJson,
            1,
            Mutation::Huge {
                at: 1_291_922_341,
                which: 15,
                field: false,
                big_endian: false,
            },
        ),
    ];
    for (format, seed, mutation) in cases {
        let mut bytes = seeds(format)[seed].clone();
        apply(format, &mut bytes, &mutation);
        let (_, peak) = peak_bytes(|| read(format, &bytes));
        assert!(
            peak <= allocation_bound(bytes.len()),
            "{format:?}: {peak} bytes for {} input bytes",
            bytes.len()
        );
    }
}

/// Found by the `geojson` fuzz target (`fuzz/artifacts/geojson/slow-unit-2c14d6ce...`, 11 s per
/// run): the Vessland sample with some coordinates mangled into values millions of units away,
/// which made border detection examine every pair of boundary pieces.
#[test]
fn regression_fuzz_geojson_slow_far_coordinate() {
    let bytes = data("tests/data/fuzz-regressions/geojson-slow-far-coordinate.geojson");
    let (map, peak) = peak_bytes(|| geo::import_json(&bytes, &ImportOptions::default()));
    let map = map.unwrap();
    assert!(peak <= allocation_bound(bytes.len()), "{peak} bytes");
    assert!(
        map.diagnostics
            .iter()
            .any(|d| d.message.contains("border detection stopped after")),
        "{:?}",
        map.diagnostics
    );
}

/// Found by the `shapefile` fuzz target (`crash-e31318ec...`, out of memory: 29 GB asked for):
/// record 32, a polygon whose first part starts at point -1,840,700,269. The decoder sizes each
/// part by the difference of two starts, so that part asked for 1.8 billion points.
/// The input is in the fuzz target's layout: a 4-byte little-endian .shp length, the .shp, the .dbf.
#[test]
fn regression_fuzz_shapefile_out_of_step_point_count() {
    let bytes = data("tests/data/fuzz-regressions/shapefile-out-of-step-point-count.bin");
    let n = u32::from_le_bytes([bytes[0], bytes[1], bytes[2], bytes[3]]) as usize;
    let (shp, dbf) = bytes[4..].split_at(n);
    let dbf = (!dbf.is_empty()).then_some(dbf);
    let options = ImportOptions::default();
    let (result, peak) =
        peak_bytes(|| geo::import_shapefile_bytes("hostile", shp, dbf, None, &options));
    assert!(peak <= allocation_bound(bytes.len()), "{peak} bytes");
    let message = result.unwrap_err().to_string();
    assert!(
        message.contains("hostile.shp")
            && message.contains("record 32 (byte 14428): part 1 starts at point -1840700269"),
        "{message}"
    );
}
