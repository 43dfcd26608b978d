//! Scale benchmark: a synthetic map of a million regions imported from GeoJSON, saved, loaded,
//! analysed (planarity and the fewest colours) and saved again, with the time of each step, its
//! ratio against a baseline timed in the same run, and the peak resident memory so far.
//!
//! Baselines: parsing the GeoJSON text into a plain JSON value (for the import), and reading and
//! writing the project file's bytes with no parsing (for saving and loading). Run with
//! `cargo bench --no-default-features --bench scale` (optionally `-- REGIONS`, default 1,000,000).

use std::path::Path;
use std::sync::Arc;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use tinct::analysis::{Analysis, PlanarityVerdict, Request};
use tinct::doc::{Edit, check_colouring};
use tinct::geo::{ImportOptions, import_json, synthetic};
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
    let (loaded, took) = timed(|| tinct::formats::load(Path::new(path)).unwrap());
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

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if let Some(i) = args.iter().position(|a| a == "--load-and-analyse") {
        load_and_analyse(&args[i + 1]);
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

    let dir = tempfile::tempdir().unwrap();
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
    let (loaded, took) = timed(|| tinct::formats::load(Path::new(&path)).unwrap());
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
