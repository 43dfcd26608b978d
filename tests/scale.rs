//! Scale at a size CI can afford: a synthetic map of tens of thousands of regions is imported,
//! saved, loaded and analysed, and every result is checked by the independent checkers. The
//! million-region measurement (times and peak memory) is `benches/scale.rs`. Also: the limits
//! the readers and the border detection enforce give messages that name them.

use std::sync::Arc;
use std::sync::atomic::AtomicBool;

use super::support::generators as synthetic;
use tinct::analysis::{Analysis, PlanarityVerdict, Request};
use tinct::doc::{ConstraintGraph, Edit, check_colouring, file};
use tinct::engine::certify::check_embedding;
use tinct::engine::planarity::{Planarity, planarity};
use tinct::geo::{ImportOptions, import_json};
use tinct::worker::{JobContext, Progress};

#[test]
fn a_map_of_forty_thousand_regions_imports_saves_loads_and_analyses_correctly() {
    let (cols, rows) = (200, 200);
    let grid = synthetic::jittered_grid(cols, rows, 2, 0.2, 8);
    let text = synthetic::to_geojson(&grid);
    drop(grid);
    let map = import_json(text.as_bytes(), &ImportOptions::default()).unwrap();
    drop(text);
    // Rook neighbours of a grid are the four lattice neighbours (tests/support/generators.rs; checked on small
    // grids against the definition in tests/geo.rs): cols(rows-1) + rows(cols-1) borders.
    assert_eq!(map.regions.len(), cols * rows);
    assert_eq!(map.borders.len(), cols * (rows - 1) + rows * (cols - 1));
    let mut doc = map.into_document("Forty thousand regions");

    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("large.tinct");
    tinct::formats::save(&doc, &path).unwrap();
    let loaded = tinct::formats::load(&path, &Default::default()).unwrap();
    assert_eq!(loaded.doc, doc);
    assert!(loaded.notices.is_empty());

    // Planarity with its certificate, checked by the embedding checker (face walks and Euler's
    // formula), which shares no code with the planarity test.
    let cg = ConstraintGraph::build(&doc);
    let cancel = AtomicBool::new(false);
    match planarity(&cg.graph, &cancel, &mut |_| {}) {
        Ok(Planarity::Planar(embedding)) => check_embedding(&cg.graph, &embedding).unwrap(),
        Ok(Planarity::NonPlanar(_)) => panic!("a map drawn in the plane is planar"),
        Err(e) => panic!("{e:?}"),
    }

    // The analysis the editor runs: a grid graph is bipartite (colour cell c,r by the parity of
    // c + r; common practice), so two colours, proven by any single border.
    let ctx = JobContext {
        cancel: Arc::new(AtomicBool::new(false)),
        progress: Arc::new(Progress::default()),
    };
    let result = ctx.with_control(|c| Analysis::run(&doc, Request::everything(), c));
    assert_eq!(result.planarity, Some(PlanarityVerdict::Planar));
    assert_eq!(result.rules.graph_vertices, cols * rows);
    let colouring = result.colouring.unwrap();
    assert_eq!((colouring.minimum, colouring.proven), (Some(2), true));
    doc.apply(Edit::SetColouring(colouring.colouring.unwrap()))
        .unwrap();
    let check = check_colouring(&doc);
    assert!(check.is_clean(), "{check:?}");
    // Saved with its colouring and read back whole.
    file::save(&doc, &path).unwrap();
    assert_eq!(file::load(&path).unwrap(), doc);
}

#[test]
fn border_detection_on_a_map_with_one_far_off_region_stops_at_its_limit_and_says_why() {
    // A 10 x 10 grid of unit squares and one square a trillion units away: the rounding
    // tolerance (a billionth of the map's diagonal) then spans the whole grid, so every boundary
    // is "near" every other. The import must finish and say that border detection stopped.
    let mut features: Vec<String> = Vec::new();
    let square = |x: f64, y: f64, s: f64| {
        format!(
            r#"{{"type":"Feature","properties":{{"name":"{x},{y}"}},"geometry":{{"type":"Polygon","coordinates":[[[{x},{y}],[{},{y}],[{},{}],[{x},{}],[{x},{y}]]]}}}}"#,
            x + s,
            x + s,
            y + s,
            y + s
        )
    };
    for c in 0..10 {
        for r in 0..10 {
            features.push(square(c as f64, r as f64, 1.0));
        }
    }
    features.push(square(1e12, 1e12, 1.0));
    let text = format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features.join(",")
    );
    let map = import_json(text.as_bytes(), &ImportOptions::default()).unwrap();
    assert_eq!(map.regions.len(), 101);
    let stopped: Vec<&str> = map
        .diagnostics
        .iter()
        .map(|d| d.message.as_str())
        .filter(|m| m.contains("border detection stopped after"))
        .collect();
    assert_eq!(stopped.len(), 1, "{:?}", map.diagnostics);
    assert!(
        stopped[0].contains("candidate pairs") && stopped[0].contains("Is a coordinate far"),
        "{}",
        stopped[0]
    );
    // Without the far-off square the same grid has every one of its 180 rook borders and no
    // such diagnostic.
    let text = format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features[..100].join(",")
    );
    let map = import_json(text.as_bytes(), &ImportOptions::default()).unwrap();
    assert_eq!(map.borders.len(), 180);
    assert!(
        map.diagnostics
            .iter()
            .all(|d| !d.message.contains("border detection stopped"))
    );
}
