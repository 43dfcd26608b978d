//! Adjacency benchmark: rook and queen derivation on synthetic maps, against parse time.
//!
//! For each map we write it as GeoJSON, then time (best of several runs, same process):
//! parsing the file text into JSON values (the baseline), the full import, and border
//! derivation alone with the rook and the queen rule. Ratios are against the parse time.
//! Targets (issue 5): ~3,000 regions / ~70,000 vertices under 50 ms; 100,000 regions under 2 s.

use std::hint::black_box;
use std::time::{Duration, Instant};

use tinct::geo::{self, AdjacencyOptions, ImportOptions, Rule, synthetic};

fn best_of<T>(runs: usize, mut f: impl FnMut() -> T) -> Duration {
    let mut best = Duration::MAX;
    for _ in 0..runs {
        let start = Instant::now();
        black_box(f());
        best = best.min(start.elapsed());
    }
    best
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1e3
}

fn main() {
    println!(
        "{:<28} {:>8} {:>9} {:>9} {:>10} {:>9} {:>9} {:>10} {:>10}",
        "map",
        "regions",
        "vertices",
        "parse ms",
        "import ms",
        "rook ms",
        "queen ms",
        "rook/parse",
        "queen/parse"
    );
    real_map();
    // (label, cols, rows, steps per cell edge, runs)
    let cases = [
        ("grid 60x50, 6 steps/edge", 60, 50, 6, 10),
        ("grid 400x250, 2 steps/edge", 400, 250, 2, 3),
    ];
    for (label, cols, rows, steps, runs) in cases {
        let regions = synthetic::jittered_grid(cols, rows, steps, 0.2, 42);
        let vertices: usize = regions
            .iter()
            .map(|r| r.parts.iter().map(|p| p.exterior.len() - 1).sum::<usize>())
            .sum();
        let text = synthetic::to_geojson(&regions);
        let parse = best_of(runs, || {
            serde_json::from_str::<serde_json::Value>(&text).map(|_| ())
        });
        let import_options = ImportOptions {
            coordinates: geo::CoordinateMode::Planar,
            ..ImportOptions::default()
        };
        let import = best_of(runs, || {
            geo::import_json(text.as_bytes(), &import_options).map(|m| m.borders.len())
        });
        let rook = AdjacencyOptions::default();
        let queen = AdjacencyOptions {
            rule: Rule::Queen,
            ..AdjacencyOptions::default()
        };
        let rook_time = best_of(runs, || geo::derive_borders(&regions, &rook).0.len());
        let queen_time = best_of(runs, || geo::derive_borders(&regions, &queen).0.len());
        let (borders, _) = geo::derive_borders(&regions, &rook);
        assert_eq!(
            borders.len(),
            rows * (cols - 1) + cols * (rows - 1),
            "grid rook count"
        );
        println!(
            "{:<28} {:>8} {:>9} {:>9.1} {:>10.1} {:>9.1} {:>9.1} {:>10.2} {:>10.2}",
            label,
            regions.len(),
            vertices,
            ms(parse),
            ms(import),
            ms(rook_time),
            ms(queen_time),
            rook_time.as_secs_f64() / parse.as_secs_f64(),
            queen_time.as_secs_f64() / parse.as_secs_f64(),
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
    let runs = 20;
    let parse = best_of(runs, || {
        serde_json::from_str::<serde_json::Value>(&text).map(|_| ())
    });
    let import = best_of(runs, || {
        geo::import_json(text.as_bytes(), &ImportOptions::default()).map(|m| m.borders.len())
    });
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
    let rook_time = best_of(runs, || geo::derive_borders(&map.regions, &rook).0.len());
    let queen_time = best_of(runs, || geo::derive_borders(&map.regions, &queen).0.len());
    println!(
        "{:<28} {:>8} {:>9} {:>9.1} {:>10.1} {:>9.1} {:>9.1} {:>10.2} {:>10.2}",
        "us-atlas 14 states (real)",
        map.regions.len(),
        vertices,
        ms(parse),
        ms(import),
        ms(rook_time),
        ms(queen_time),
        rook_time.as_secs_f64() / parse.as_secs_f64(),
        queen_time.as_secs_f64() / parse.as_secs_f64(),
    );
}
