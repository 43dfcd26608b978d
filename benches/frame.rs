//! Frame time of the editor on a large map, measured headlessly: egui's layout of every panel, the
//! canvas (fills, outlines, names) and the tessellation into triangles, i.e. all the CPU work of a
//! frame before the GPU (or software rasteriser) draws it. Baseline in the same run: a frame of the
//! same window showing an empty project, so the ratio isolates what the map costs.
//!
//! Run: `cargo bench --bench frame`. Target (issue: the editor): under 8 ms per frame at 3,000 regions.
//!
//! Two more measurements:
//! - **edit to verdict**: on the editor's sample map, with the real background worker, the time
//!   from an edit to a frame that shows the analysis of the edited map (target 100 ms), against
//!   one frame at rest;
//! - **a real map**: with `TINCT_COUNTIES=…/counties-10m.json` (npm `us-atlas` 3.0.1, 3,231 US
//!   counties; not in the repository), the same rows for it (target: a wheel-zoom frame, "whole,
//!   zooming", under 16 ms).

#[path = "../tests/support/generators.rs"]
mod generators;
use generators as synthetic;

use std::time::{Duration, Instant};

use tinct::analysis;
use tinct::doc::{Document, Edit};
use tinct::geo::{ImportOptions, import_json};
use tinct::ui::App;
use tinct::worker::JobContext;

fn map(cols: usize, rows: usize) -> Document {
    let regions = synthetic::jittered_grid(cols, rows, 6, 0.25, 7);
    let json = synthetic::to_geojson(&regions);
    let options = ImportOptions {
        coordinates: tinct::geo::CoordinateMode::Planar,
        ..ImportOptions::default()
    };
    let imported = import_json(json.as_bytes(), &options).expect("synthetic map imports");
    let mut doc = imported.into_document(format!("Synthetic {cols} x {rows}"));
    // Colour it properly, as a finished map would be (a clash-free map is the common case).
    let ctx = JobContext {
        cancel: Default::default(),
        progress: Default::default(),
    };
    let verdict =
        ctx.with_control(|c| analysis::colour(&doc, c, analysis::ColourOptions::default()));
    let colouring = verdict.colouring.expect("the synthetic map colours");
    doc.apply(Edit::SetColouring(colouring))
        .expect("colouring applies");
    doc
}

/// Median frame time over `frames` frames; `zoom` magnifies the fitted view; with `step`, the
/// view zooms in and out by that factor every frame. A small step is a zoom gesture (the last
/// drawing of the map is moved); a step of 1.5 forces every frame to draw the map afresh, the
/// worst case.
fn frame_times(
    doc: Document,
    frames: usize,
    step: Option<f64>,
    zoom: f64,
) -> (Duration, usize, usize) {
    let ctx = egui::Context::default();
    let mut app = App::new_with(None, None, None);
    app.show_document(doc);
    let input = || egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(
            egui::Pos2::ZERO,
            egui::vec2(1280.0, 800.0),
        )),
        ..Default::default()
    };
    let mut times = Vec::with_capacity(frames);
    let mut shapes = 0;
    let mut triangles = 0;
    for i in 0..frames + 5 {
        if i == 2 {
            // The first frames fit the map to the window; then zoom in around its centre.
            app.panels.canvas.camera.pixels_per_unit *= zoom;
        }
        if let Some(step) = step
            && i >= 5
        {
            let factor = if i % 2 == 0 { step } else { 1.0 / step };
            app.panels.canvas.camera.pixels_per_unit *= factor;
        }
        let start = Instant::now();
        let mut output = ctx.run_ui(input(), |ui| app.ui(ui));
        // Nothing uploads textures here; say so, as a renderer would have applied them.
        output.textures_delta.clear();
        shapes = output.shapes.len();
        if std::env::var_os("TINCT_BENCH_SPLIT").is_some() && i == frames {
            eprintln!("  layout {:.2} ms", start.elapsed().as_secs_f64() * 1e3);
        }
        let primitives = ctx.tessellate(output.shapes, output.pixels_per_point);
        let elapsed = start.elapsed();
        triangles = primitives
            .iter()
            .map(|p| match &p.primitive {
                egui::epaint::Primitive::Mesh(m) => m.indices.len() / 3,
                egui::epaint::Primitive::Callback(_) => 0,
            })
            .sum();
        if i >= 5 {
            times.push(elapsed);
        }
    }
    times.sort();
    (times[times.len() / 2], shapes, triangles)
}

/// Edit to verdict on the sample map with the background worker: median of `edits` edits.
fn edit_to_verdict(edits: usize) -> (Duration, Duration) {
    let ctx = egui::Context::default();
    let mut app = App::new(Some(ctx.clone()), None);
    let input = || egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(
            egui::Pos2::ZERO,
            egui::vec2(1280.0, 800.0),
        )),
        ..Default::default()
    };
    let frame = |app: &mut App| {
        let mut output = ctx.run_ui(input(), |ui| app.ui(ui));
        output.textures_delta.clear();
        let _ = ctx.tessellate(output.shapes, output.pixels_per_point);
    };
    // Let the first analysis arrive (and teach the editor how long one takes).
    let deadline = Instant::now() + Duration::from_secs(30);
    while app.analysis_is_stale() && Instant::now() < deadline {
        frame(&mut app);
        std::thread::sleep(Duration::from_millis(1));
    }
    let mut rest = Vec::new();
    for _ in 0..20 {
        let start = Instant::now();
        frame(&mut app);
        rest.push(start.elapsed());
    }
    rest.sort();
    let mut times = Vec::with_capacity(edits);
    for k in 0..edits {
        let (id, region) = {
            let (id, r) = app.session.doc().land_regions().next().expect("land");
            (id, r.clone())
        };
        let start = Instant::now();
        app.edit(Edit::PutRegion {
            id,
            region: Some(tinct::doc::Region {
                name: format!("Renamed {k}"),
                ..region
            }),
        });
        while app.analysis_is_stale() && start.elapsed() < Duration::from_secs(10) {
            frame(&mut app);
            std::thread::sleep(Duration::from_micros(200));
        }
        frame(&mut app);
        times.push(start.elapsed());
    }
    times.sort();
    (times[times.len() / 2], rest[rest.len() / 2])
}

fn main() {
    let (verdict, rest) = edit_to_verdict(15);
    println!(
        "edit to verdict on the sample map (31 regions, background worker): {:.1} ms median, against a frame at rest {:.2} ms (target 100 ms)",
        ms(verdict),
        ms(rest)
    );
    let frames = 40;
    let (empty, _, _) = frame_times(Document::new("Empty"), frames, None, 1.0);
    println!(
        "editor frame time, median of {frames} frames, 1280 x 800 window (CPU work before rasterising)"
    );
    println!("baseline: an empty project, {:.2} ms/frame", ms(empty));
    println!(
        "{:>10} {:>10} {:>16} {:>8} {:>10} {:>10} {:>8}",
        "regions", "vertices", "view", "shapes", "triangles", "ms/frame", "ratio"
    );
    let sizes: &[(usize, usize)] = if std::env::var_os("TINCT_BENCH_QUICK").is_some() {
        &[(20, 15), (60, 50)]
    } else {
        &[(20, 15), (60, 50), (100, 100), (320, 320)]
    };
    let mut maps: Vec<Document> = Vec::new();
    if let Some(path) = std::env::var_os("TINCT_COUNTIES") {
        match tinct::geo::import_path(std::path::Path::new(&path), &ImportOptions::default()) {
            Ok(map) => {
                let mut doc = map.into_document("US counties");
                let ctx = JobContext {
                    cancel: Default::default(),
                    progress: Default::default(),
                };
                let verdict = ctx.with_control(|c| {
                    analysis::colour(&doc, c, analysis::ColourOptions::default())
                });
                if let Some(colouring) = verdict.colouring {
                    let _ = doc.apply(Edit::SetColouring(colouring));
                }
                println!(
                    "real map: {} ({} regions)",
                    path.to_string_lossy(),
                    doc.regions().len()
                );
                maps.push(doc);
            }
            Err(e) => println!("TINCT_COUNTIES: {e}"),
        }
    }
    maps.extend(sizes.iter().map(|&(cols, rows)| map(cols, rows)));
    for doc in maps {
        let vertices: usize = doc
            .regions()
            .values()
            .filter_map(|r| r.geometry.as_ref())
            .map(|g| g.vertex_count())
            .sum();
        let regions = doc.regions().len();
        for (view, step, zoom) in [
            ("whole, at rest", None, 1.0),
            ("whole, zooming", Some(1.01), 1.0),
            ("whole, redrawn", Some(1.5), 1.0),
            ("8x in, redrawn", Some(1.5), 8.0),
        ] {
            // TINCT_BENCH_ONLY="3000 redrawn" runs only the rows whose text contains both words
            // (for profiling one case).
            if let Ok(only) = std::env::var("TINCT_BENCH_ONLY") {
                let row = format!("{regions} {view}");
                if !only.split_whitespace().all(|w| row.contains(w)) {
                    continue;
                }
            }
            let frames = if std::env::var_os("TINCT_BENCH_ONLY").is_some() {
                frames * 10
            } else {
                frames
            };
            let (t, shapes, triangles) = frame_times(doc.clone(), frames, step, zoom);
            println!(
                "{:>10} {:>10} {:>16} {:>8} {:>10} {:>10.2} {:>8.2}",
                regions,
                vertices,
                view,
                shapes,
                triangles,
                ms(t),
                t.as_secs_f64() / empty.as_secs_f64()
            );
        }
    }
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1e3
}
