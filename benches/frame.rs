//! Frame time of the editor on a large map, measured headlessly: egui's layout of every panel, the
//! canvas (fills, outlines, names) and the tessellation into triangles, i.e. all the CPU work of a
//! frame before the GPU (or software rasteriser) draws it. Baseline in the same run: a frame of the
//! same window showing an empty project, so the ratio isolates what the map costs.
//!
//! Run: `cargo bench --bench frame`. Target (issue: the editor): under 8 ms per frame at 3,000 regions.

use std::time::{Duration, Instant};

use tinct::doc::{Document, Edit};
use tinct::geo::{ImportOptions, import_json, synthetic};
use tinct::ui::App;
use tinct::worker::JobContext;
use tinct::worker::analysis;

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
    let verdict = analysis::colour(&doc, &ctx, analysis::ColourOptions::default());
    let colouring = verdict.colouring.expect("the synthetic map colours");
    doc.apply(Edit::SetColouring(colouring))
        .expect("colouring applies");
    doc
}

fn frame_times(doc: Document, frames: usize) -> (Duration, usize, usize) {
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
        let start = Instant::now();
        let output = ctx.run_ui(input(), |ui| app.ui(ui));
        shapes = output.shapes.len();
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

fn main() {
    let frames = 40;
    let (empty, _, _) = frame_times(Document::new("Empty"), frames);
    println!(
        "editor frame time, median of {frames} frames, 1280 x 800 window (CPU work before rasterising)"
    );
    println!(
        "{:>10} {:>10} {:>10} {:>12} {:>10} {:>8}",
        "regions", "vertices", "shapes", "triangles", "ms/frame", "ratio"
    );
    println!(
        "{:>10} {:>10} {:>10} {:>12} {:>10.2} {:>8}",
        0,
        0,
        "-",
        "-",
        empty.as_secs_f64() * 1e3,
        "1.00"
    );
    for (cols, rows) in [(20, 15), (60, 50), (100, 100)] {
        let doc = map(cols, rows);
        let vertices: usize = doc
            .regions
            .values()
            .filter_map(|r| r.geometry.as_ref())
            .map(|g| g.vertex_count())
            .sum();
        let regions = doc.regions.len();
        let (t, shapes, triangles) = frame_times(doc, frames);
        println!(
            "{:>10} {:>10} {:>10} {:>12} {:>10.2} {:>8.2}",
            regions,
            vertices,
            shapes,
            triangles,
            t.as_secs_f64() * 1e3,
            t.as_secs_f64() / empty.as_secs_f64()
        );
    }
}
