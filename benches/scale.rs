//! Scale benchmark: a synthetic map of a million regions imported from GeoJSON, saved, loaded,
//! analysed (planarity and the fewest colours) and saved again, with the time of each step, its
//! ratio against a baseline timed in the same run, and the peak resident memory so far.
//!
//! Baselines: parsing the GeoJSON text into a plain JSON value (for the import), and reading and
//! writing the project file's bytes with no parsing (for saving and loading). Run with
//! `cargo bench --no-default-features --bench scale` (optionally `-- REGIONS`, default 1,000,000).
//!
//! `-- --edits [REGIONS]` (default 100,000) times edits instead: how long until the checks reflect
//! a recolouring, a pin, a border added by hand, a deleted region and an undo, against rebuilding
//! the checks from scratch.

// Calls into the C library (resource usage, signals, a counting allocator) need `unsafe`.
#![allow(unsafe_code)]

#[path = "../tests/support/generators.rs"]
mod generators;
use generators as synthetic;
#[path = "support/process.rs"]
mod process;

use std::path::Path;
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use tinct::analysis::{Analysis, PlanarityVerdict, Request};
use tinct::doc::{Edit, check_colouring};
use tinct::geo::{ImportOptions, import_json};
use tinct::worker::{JobContext, Progress};

/// Peak and current resident memory in MiB, from /proc/self/status (Linux), else getrusage.
fn memory_mib() -> (f64, f64) {
    let status = std::fs::read_to_string("/proc/self/status").unwrap_or_default();
    let field = |name: &str| {
        status
            .lines()
            .find(|l| l.starts_with(name))
            .and_then(|l| l.split_whitespace().nth(1))
            .and_then(|kb| kb.parse::<f64>().ok())
            .map(|kb| kb / 1024.0)
    };
    let peak = field("VmHWM:").unwrap_or_else(|| {
        // SAFETY: getrusage fills the struct we pass; zeroed is a valid initial value.
        let mut usage: libc::rusage = unsafe { std::mem::zeroed() };
        unsafe { libc::getrusage(libc::RUSAGE_SELF, &mut usage) };
        usage.ru_maxrss as f64 / 1024.0
    });
    (peak, field("VmRSS:").unwrap_or(f64::NAN))
}

fn row(step: &str, took: Duration, baseline: Option<Duration>) {
    let (peak, now) = memory_mib();
    let ratio = baseline.map_or("-".to_string(), |b| {
        format!("{:.1}x", took.as_secs_f64() / b.as_secs_f64().max(1e-9))
    });
    println!(
        "{step:<34} {:>10.2} s {ratio:>9} {peak:>10.0} MiB {now:>10.0} MiB",
        took.as_secs_f64()
    );
}

fn timed<T>(f: impl FnOnce() -> T) -> (T, Duration) {
    let start = Instant::now();
    let out = f();
    (out, start.elapsed())
}

/// In a fresh process: load the project at `path` and analyse it, printing times and this
/// process's own peak memory (what `tinct analyse` on the file needs, without the import's).
fn load_and_analyse(path: &str) {
    let (loaded, took) =
        timed(|| tinct::formats::load(Path::new(path), &Default::default()).unwrap());
    row("  fresh process: load", took, None);
    let ctx = JobContext {
        cancel: Arc::new(AtomicBool::new(false)),
        progress: Arc::new(Progress::default()),
    };
    let (result, took) =
        timed(|| ctx.with_control(|c| Analysis::run(&loaded.doc, Request::everything(), c)));
    row("  fresh process: analyse", took, None);
    assert_eq!(result.planarity, Some(PlanarityVerdict::Planar));
}

/// A line of the edit table, in milliseconds.
fn row_ms(step: &str, took: Duration, baseline: Option<Duration>) {
    let ratio = baseline.map_or("-".to_string(), |b| {
        format!("{:.2}x", took.as_secs_f64() / b.as_secs_f64().max(1e-9))
    });
    println!(
        "{step:<34} {:>10.2} ms {ratio:>9}",
        took.as_secs_f64() * 1000.0
    );
}

/// Median of `runs` timings of `f`.
fn median(runs: usize, mut f: impl FnMut() -> Duration) -> Duration {
    let mut times: Vec<Duration> = (0..runs).map(|_| f()).collect();
    times.sort();
    times[runs / 2]
}

/// Edits on a map of `regions` regions, as the editor makes them: how long until the checks
/// (clashes, uncoloured land, pins, groups, rule conflicts, counts) reflect each edit, against
/// rebuilding them from scratch. Target: at most 50 ms at 100,000 regions.
fn edit_latency(regions: usize) {
    use tinct::doc::{Border, ConstraintGraph, RegionChange, RegionPair};
    use tinct::session::Session;
    let cols = (regions as f64).sqrt().round().max(1.0) as usize;
    let rows = regions.div_ceil(cols);
    let grid = synthetic::jittered_grid(cols, rows, 2, 0.2, 1);
    let text = synthetic::to_geojson(&grid);
    let map = import_json(text.as_bytes(), &ImportOptions::default()).unwrap();
    let mut doc = map.into_document("Edits");
    let colouring = tinct::analysis::uncontrolled(|c| {
        tinct::analysis::colour(&doc, c, tinct::analysis::ColourOptions::default())
    })
    .colouring
    .expect("a colouring");
    doc.apply(Edit::SetColouring(colouring)).unwrap();
    let mut session = Session::new(doc, None);
    println!(
        "Edits on a {} x {} grid ({} regions, {} borders): time until the checks reflect the edit",
        cols,
        rows,
        session.doc().regions().len(),
        session.doc().borders().len()
    );
    let rebuild = median(5, || {
        let doc = session.doc();
        timed(|| tinct::analysis::Rules::of(doc, &ConstraintGraph::build(doc))).1
    });
    row_ms("baseline: rebuild the checks", rebuild, None);
    let ids: Vec<_> = session.doc().regions().keys().copied().collect();
    let mut k = 0usize;
    let mut next = || {
        k = (k * 7919 + 104_729) % ids.len();
        ids[k]
    };
    let recolour = median(21, || {
        let id = next();
        let slot = session.doc().colouring().get(&id).copied().unwrap_or(0);
        let edit = Edit::PutColour {
            id,
            slot: Some((slot + 1) % 4),
        };
        timed(|| session.apply(edit).unwrap()).1
    });
    row_ms("recolour one region", recolour, Some(rebuild));
    let pin = median(21, || {
        let id = next();
        let edit = Edit::UpdateRegion {
            id,
            change: RegionChange::Pin(Some(1)),
        };
        timed(|| session.apply(edit).unwrap()).1
    });
    row_ms("pin one region", pin, Some(rebuild));
    let border = median(21, || {
        let (a, b) = (next(), next());
        let Some(pair) = RegionPair::new(a, b) else {
            return Duration::ZERO;
        };
        let edit = Edit::PutBorder {
            pair,
            border: Some(Border::manual()),
        };
        timed(|| session.apply(edit).unwrap()).1
    });
    row_ms("add a border by hand", border, Some(rebuild));
    let delete = median(11, || {
        let id = next();
        if session.doc().regions().get(&id).is_none() {
            return Duration::ZERO;
        }
        let edit = Edit::PutRegion { id, region: None };
        timed(|| session.apply(edit).unwrap()).1
    });
    row_ms("delete a region", delete, Some(rebuild));
    let undo = median(11, || timed(|| drop(session.undo().unwrap())).1);
    row_ms("undo", undo, Some(rebuild));
    let worst = [recolour, pin, border, delete, undo]
        .into_iter()
        .max()
        .unwrap_or_default();
    println!(
        "  slowest edit {:.1} ms (target at 100,000 regions: at most 50 ms)",
        worst.as_secs_f64() * 1000.0
    );
}

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if let Some(i) = args.iter().position(|a| a == "--load-and-analyse") {
        load_and_analyse(&args[i + 1]);
        return;
    }
    if let Some(i) = args.iter().position(|a| a == "--edits") {
        let regions = args
            .get(i + 1)
            .and_then(|a| a.parse().ok())
            .unwrap_or(100_000);
        edit_latency(regions);
        return;
    }
    let regions: usize = std::env::args()
        .skip(1)
        .find_map(|a| a.parse().ok())
        .unwrap_or(1_000_000);
    let cols = (regions as f64).sqrt().round().max(1.0) as usize;
    let rows = regions.div_ceil(cols);
    println!(
        "Scale: a jittered {cols} x {rows} grid ({} regions, 8 boundary points each), rook rule",
        cols * rows
    );
    println!(
        "{:<34} {:>12} {:>9} {:>14} {:>14}",
        "step", "time", "ratio", "peak RSS", "RSS now"
    );
    row("start", Duration::ZERO, None);

    let (grid, took) = timed(|| synthetic::jittered_grid(cols, rows, 2, 0.2, 1));
    row("generate the regions", took, None);
    let (text, took) = timed(|| synthetic::to_geojson(&grid));
    drop(grid);
    row(
        &format!("write GeoJSON ({} MB)", text.len() / 1_000_000),
        took,
        None,
    );

    // The whole `tinct import` process on the file: its own peak memory against the target of
    // twice the file's size plus 100 MB.
    let dir = tempfile::tempdir().unwrap();
    let geojson = dir.path().join("million.geojson");
    std::fs::write(&geojson, &text).unwrap();
    let imported = dir.path().join("imported.tinct");
    let (took, peak, code) = process::run_process(
        env!("CARGO_BIN_EXE_tinct"),
        &[
            "import",
            &geojson.to_string_lossy(),
            "--out",
            &imported.to_string_lossy(),
        ],
    )
    .expect("tinct import runs");
    assert_eq!(code, 0, "tinct import failed");
    let file_mib = text.len() as f64 / (1024.0 * 1024.0);
    println!(
        "{:<34} {:>10.2} s {:>9} {peak:>10.0} MiB   (peak {:.2}x the file; target {:.0} MiB, \
         twice the file plus 100 MB)",
        "whole `tinct import` process",
        took.as_secs_f64(),
        "-",
        peak / file_mib,
        2.0 * file_mib + 100.0 / 1.048_576,
    );
    let _ = std::fs::remove_file(&geojson);
    let _ = std::fs::remove_file(&imported);

    let (value, parse) = timed(|| serde_json::from_str::<serde_json::Value>(&text).unwrap());
    drop(value);
    row("baseline: parse the JSON only", parse, None);
    let (map, took) = timed(|| import_json(text.as_bytes(), &ImportOptions::default()).unwrap());
    drop(text);
    row("import (parse, clean, borders)", took, Some(parse));
    let (mut doc, took) = timed(|| map.into_document("A million regions"));
    row("make the document", took, None);
    println!(
        "  {} regions, {} borders",
        doc.regions().len(),
        doc.borders().len()
    );

    let path = dir.path().join("million.tinct");
    let ((), save) = timed(|| tinct::formats::save(&doc, &path).unwrap());
    let bytes = std::fs::metadata(&path).map(|m| m.len()).unwrap_or(0);
    let copy_path = dir.path().join("copy.tinct");
    let ((), copy) = timed(|| {
        let b = std::fs::read(&path).unwrap();
        std::fs::write(&copy_path, b).unwrap();
    });
    let _ = std::fs::remove_file(&copy_path);
    row(
        &format!("baseline: copy the file ({} MB)", bytes / 1_000_000),
        copy,
        None,
    );
    row("save the project", save, Some(copy));
    // The same file opened by a process that did not import it: its own peak memory.
    let child = std::process::Command::new(std::env::current_exe().unwrap())
        .arg("--load-and-analyse")
        .arg(&path)
        .output()
        .unwrap();
    print!("{}", String::from_utf8_lossy(&child.stdout));
    drop(doc);
    let (loaded, took) =
        timed(|| tinct::formats::load(Path::new(&path), &Default::default()).unwrap());
    row("load the project", took, Some(copy));
    doc = loaded.doc;

    let ctx = JobContext {
        cancel: Arc::new(AtomicBool::new(false)),
        progress: Arc::new(Progress::default()),
    };
    let (result, took) =
        timed(|| ctx.with_control(|c| Analysis::run(&doc, Request::everything(), c)));
    row("analyse (planarity, colours)", took, None);
    let colouring = result.colouring.as_ref().expect("not cancelled");
    println!(
        "  planar: {}, fewest colours: {:?} (proven: {}), {} vertices, {} edges",
        result.planarity == Some(PlanarityVerdict::Planar),
        colouring.minimum,
        colouring.proven,
        result.rules.graph_vertices,
        result.rules.graph_edges
    );
    let slots = colouring.colouring.clone().expect("a colouring");
    doc.apply(Edit::SetColouring(slots)).unwrap();
    let (check, took) = timed(|| check_colouring(&doc));
    row("check the colouring", took, None);
    assert!(check.is_clean(), "the colouring has problems");
    let ((), took) = timed(|| tinct::formats::save(&doc, &path).unwrap());
    row("save the coloured project", took, Some(copy));
}
