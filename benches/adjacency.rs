//! Adjacency benchmark: rook and queen derivation on synthetic and real maps, against parse time.
//!
//! For each map we write it as GeoJSON, then time (best of several runs, same process):
//! parsing the file text into JSON values (the baseline), the full import, and border
//! derivation alone with the rook and the queen rule. Each is shown as wall-clock time and as
//! this thread's CPU time (the machine is shared, so wall-clock times include waiting); the
//! ratios are of CPU times against the parse time.
//! Targets (issue 5): ~3,000 regions / ~70,000 vertices under 50 ms; 100,000 regions under 2 s.
//!
//! A last section times the whole import of the same 3,000-region map from a GeoPackage and a
//! FlatGeobuf file against the GeoJSON file (target: at most 1.5x). The GeoPackage is Tinct's own
//! export; both are also made by GDAL's `ogr2ogr` when it is installed (Debian `gdal-bin`).
//! Run: `cargo bench --no-default-features --bench adjacency [-- FILTER]` (`formats` for that
//! section alone).

// Calls into the C library (resource usage, signals, a counting allocator) need `unsafe`.
#![allow(unsafe_code)]

#[path = "../tests/support/generators.rs"]
mod generators;
use generators as synthetic;

use std::hint::black_box;
use std::time::{Duration, Instant};

use tinct::geo::{self, AdjacencyOptions, ImportOptions, Rule};

/// CPU time of this thread in nanoseconds (`CLOCK_THREAD_CPUTIME_ID`), so that other processes
/// on a busy machine do not count against us.
fn cpu_ns() -> Option<u64> {
    let mut t = libc::timespec {
        tv_sec: 0,
        tv_nsec: 0,
    };
    // SAFETY: `t` is a valid, writable timespec; the call only writes to it.
    let rc = unsafe { libc::clock_gettime(libc::CLOCK_THREAD_CPUTIME_ID, &mut t) };
    (rc == 0).then(|| t.tv_sec as u64 * 1_000_000_000 + t.tv_nsec as u64)
}

/// Best wall-clock time and best on-CPU time over `runs` runs.
fn best_of<T>(runs: usize, mut f: impl FnMut() -> T) -> (Duration, Duration) {
    let mut best = Duration::MAX;
    let mut best_cpu = Duration::MAX;
    for _ in 0..runs {
        let cpu = cpu_ns();
        let start = Instant::now();
        black_box(f());
        best = best.min(start.elapsed());
        let used = match (cpu, cpu_ns()) {
            (Some(a), Some(b)) => Duration::from_nanos(b.saturating_sub(a)),
            _ => start.elapsed(),
        };
        best_cpu = best_cpu.min(used);
    }
    (best, best_cpu)
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1e3
}

type Timing = (Duration, Duration);

/// Prints one row: wall-clock times, then on-CPU times and the ratios of the CPU times.
fn row(label: &str, regions: usize, vertices: usize, t: [Timing; 4]) {
    let [parse, import, rook, queen] = t;
    println!(
        "{:<28} {:>7} {:>8} | {:>7.1} {:>7.1} {:>7.1} {:>7.1} | {:>7.1} {:>7.1} {:>7.1} {:>7.1} | {:>6.2} {:>6.2}",
        label,
        regions,
        vertices,
        ms(parse.0),
        ms(import.0),
        ms(rook.0),
        ms(queen.0),
        ms(parse.1),
        ms(import.1),
        ms(rook.1),
        ms(queen.1),
        rook.1.as_secs_f64() / parse.1.as_secs_f64(),
        queen.1.as_secs_f64() / parse.1.as_secs_f64(),
    );
}

fn main() {
    println!(
        "{:<28} {:>7} {:>8} | {:^31} | {:^31} | {:^13}",
        "", "", "", "wall-clock ms (best)", "on-CPU ms (best)", "CPU ratio"
    );
    println!(
        "{:<28} {:>7} {:>8} | {:>7} {:>7} {:>7} {:>7} | {:>7} {:>7} {:>7} {:>7} | {:>6} {:>6}",
        "map",
        "regions",
        "vertices",
        "parse",
        "import",
        "rook",
        "queen",
        "parse",
        "import",
        "rook",
        "queen",
        "rook/p",
        "queen/p"
    );
    // `cargo bench --bench adjacency -- 60x50` runs only the rows whose label contains the text.
    let filter = std::env::args()
        .skip(1)
        .find(|a| !a.starts_with('-'))
        .unwrap_or_default();
    if "us-atlas".contains(filter.as_str()) {
        real_map();
    }
    if "formats".contains(filter.as_str()) {
        formats();
    }
    // (label, cols, rows, steps per cell edge, runs)
    let cases = [
        ("grid 60x50, 6 steps/edge", 60, 50, 6, 10),
        ("grid 400x250, 2 steps/edge", 400, 250, 2, 3),
    ];
    for (label, cols, rows, steps, runs) in cases {
        if !label.contains(filter.as_str()) {
            continue;
        }
        let regions = synthetic::jittered_grid(cols, rows, steps, 0.2, 42);
        let vertices: usize = regions
            .iter()
            .map(|r| r.parts.iter().map(|p| p.exterior.len() - 1).sum::<usize>())
            .sum();
        let text = synthetic::to_geojson(&regions);
        let import_options = ImportOptions {
            coordinates: geo::CoordinateMode::Planar,
            ..ImportOptions::default()
        };
        let rook = AdjacencyOptions::default();
        let queen = AdjacencyOptions {
            rule: Rule::Queen,
            ..AdjacencyOptions::default()
        };
        let (borders, _) = geo::derive_borders(&regions, &rook);
        assert_eq!(
            borders.len(),
            rows * (cols - 1) + cols * (rows - 1),
            "grid rook count"
        );
        row(
            label,
            regions.len(),
            vertices,
            [
                best_of(runs, || {
                    serde_json::from_str::<serde_json::Value>(&text).map(|_| ())
                }),
                best_of(runs, || {
                    geo::import_json(text.as_bytes(), &import_options).map(|m| m.borders.len())
                }),
                best_of(runs, || geo::derive_borders(&regions, &rook).0.len()),
                best_of(runs, || geo::derive_borders(&regions, &queen).0.len()),
            ],
        );
    }
}

/// The committed us-atlas extract (14 states, longitude/latitude GeoJSON), as a real-data row.
fn real_map() {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/data/geo/us_states_subset.geojson"
    );
    let Ok(text) = std::fs::read_to_string(path) else {
        return;
    };
    let Ok(map) = geo::import_json(text.as_bytes(), &ImportOptions::default()) else {
        return;
    };
    let vertices: usize = map
        .regions
        .iter()
        .map(|r| r.parts.iter().map(|p| p.exterior.len() - 1).sum::<usize>())
        .sum();
    let rook = AdjacencyOptions::default();
    let queen = AdjacencyOptions {
        rule: Rule::Queen,
        ..AdjacencyOptions::default()
    };
    let runs = 20;
    row(
        "us-atlas 14 states (real)",
        map.regions.len(),
        vertices,
        [
            best_of(runs, || {
                serde_json::from_str::<serde_json::Value>(&text).map(|_| ())
            }),
            best_of(runs, || {
                geo::import_json(text.as_bytes(), &ImportOptions::default())
                    .map(|m| m.borders.len())
            }),
            best_of(runs, || geo::derive_borders(&map.regions, &rook).0.len()),
            best_of(runs, || geo::derive_borders(&map.regions, &queen).0.len()),
        ],
    );
}

/// The whole import of one 3,000-region map from each boundary format, against its GeoJSON.
fn formats() {
    let regions = synthetic::jittered_grid(60, 50, 6, 0.2, 42);
    let dir = tempfile::tempdir().expect("a temporary folder");
    let geojson = dir.path().join("grid.geojson");
    std::fs::write(&geojson, synthetic::to_geojson(&regions)).expect("write GeoJSON");
    let options = ImportOptions {
        coordinates: geo::CoordinateMode::Planar,
        ..ImportOptions::default()
    };
    let doc = geo::import_path(&geojson, &options)
        .expect("GeoJSON imports")
        .into_document("grid");
    let own = dir.path().join("grid-tinct.gpkg");
    std::fs::write(
        &own,
        tinct::export::to_geopackage(&doc, "grid").expect("GeoPackage export"),
    )
    .expect("write GeoPackage");
    let mut files = vec![("GeoPackage (Tinct's export)", own)];
    for (label, driver, name) in [
        ("GeoPackage (ogr2ogr)", "GPKG", "grid-gdal.gpkg"),
        ("FlatGeobuf (ogr2ogr)", "FlatGeobuf", "grid.fgb"),
    ] {
        let out = dir.path().join(name);
        let made = std::process::Command::new("ogr2ogr")
            .args(["-f", driver])
            .arg(&out)
            .arg(&geojson)
            .status()
            .is_ok_and(|s| s.success());
        if made {
            files.push((label, out));
        } else {
            println!("{label}: ogr2ogr is not installed (apt install gdal-bin); row skipped");
        }
    }
    let runs = 10;
    let time = |path: &std::path::Path| {
        best_of(runs, || {
            geo::import_path(path, &options)
                .map(|m| m.borders.len())
                .expect("imports")
        })
    };
    let (base_wall, base_cpu) = time(&geojson);
    println!();
    println!(
        "Whole import of a 3,000-region grid by format (best of {runs}; target at most 1.5x GeoJSON)"
    );
    println!(
        "{:<28} {:>10} {:>10} {:>10}",
        "format", "wall ms", "CPU ms", "CPU ratio"
    );
    println!(
        "{:<28} {:>10.1} {:>10.1} {:>10}",
        "GeoJSON",
        ms(base_wall),
        ms(base_cpu),
        "1.00x"
    );
    for (label, path) in files {
        let (wall, cpu) = time(&path);
        println!(
            "{label:<28} {:>10.1} {:>10.1} {:>9.2}x",
            ms(wall),
            ms(cpu),
            cpu.as_secs_f64() / base_cpu.as_secs_f64().max(1e-9)
        );
    }
}
