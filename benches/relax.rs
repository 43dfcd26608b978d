//! Fewest-relaxations benchmark: time to the proven answer (the fewest relaxations for k colours,
//! with every obstruction's DRAT proof), against one plain run of the colouring engine (`solve`:
//! the fewest colours, proven) on the same graph in the same run; the independent check is timed
//! apart. Instances: the US counties under the queen rule (tests/data/geo/us_counties_queen.txt,
//! from us-atlas 3.0.1, public domain) for 4 colours, and chains of K5s joined by paths with every
//! edge soft. Run with `cargo bench --no-default-features --bench relax`.
//!
//! Then the fewest relaxations for a flat drawing (the world at 1:110m and the counties under the
//! queen rule, K5 chains), against one planarity test with its certificate of the same graph.
//!
//! Also colours that follow a hierarchy on the same counties, by state (the first two digits of
//! each FIPS code): time to the proven fewest families and tints, with the tints arranged against
//! clashes, against the same plain `solve`.

use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use tinct::analysis::relax::{
    Allowed, fewest_relaxations_planar_uncontrolled, fewest_relaxations_uncontrolled,
};
use tinct::doc::{
    Border, ConstraintGraph, Document, DocumentBuilder, Region, RegionId, RegionPair, Settings,
};
use tinct::engine::certify::{check_planar_relaxation, check_relaxation};
use tinct::engine::colouring::{
    ColouringProblem, SolveOptions, arrange_tints, hierarchy_colouring, solve,
};
use tinct::engine::planarity::planarity;

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1000.0
}

/// A document from "a b kind" lines (kind `c` is a corner contact, anything else shared).
fn document(lines: &[(u64, u64, bool)], regions: u64) -> Document {
    let mut b = DocumentBuilder::new("bench");
    for i in 1..=regions {
        b.region(RegionId(i), Region::new(format!("R{i}"), [0.0, 0.0]));
    }
    for &(x, y, corner) in lines {
        let border = if corner {
            Border::corner()
        } else {
            Border::shared(1.0)
        };
        b.border(
            RegionPair::new(RegionId(x), RegionId(y)).expect("distinct"),
            border,
        );
    }
    b.settings(Settings {
        corners_count: true,
        ..Settings::default()
    });
    b.next_ids(regions + 1, 1);
    b.build().expect("a valid document")
}

fn counties() -> Document {
    let text = include_str!("../tests/data/geo/us_counties_queen.txt");
    let mut ids: Vec<&str> = Vec::new();
    let mut raw = Vec::new();
    for line in text.lines().filter(|l| !l.starts_with('#')) {
        let p: Vec<&str> = line.split_whitespace().collect();
        ids.extend([p[0], p[1]]);
        raw.push((p[0], p[1], p[2] == "c"));
    }
    ids.sort_unstable();
    ids.dedup();
    let id = |f: &str| ids.binary_search(&f).expect("listed") as u64 + 1;
    let lines: Vec<(u64, u64, bool)> = raw.iter().map(|&(a, b, c)| (id(a), id(b), c)).collect();
    document(&lines, ids.len() as u64)
}

/// `copies` K5s joined in a chain by two-edge paths; the K5s' edges are corner contacts (so they
/// may be dropped), the paths shared boundaries.
fn k5_chain(copies: u64) -> Document {
    let mut lines = Vec::new();
    let mut next = 1;
    let mut hubs = Vec::new();
    for _ in 0..copies {
        for i in 0..5 {
            for j in i + 1..5 {
                lines.push((next + i, next + j, true));
            }
        }
        hubs.push(next);
        next += 5;
    }
    for w in hubs.windows(2) {
        lines.extend([(w[0], next, false), (next, w[1], false)]);
        next += 1;
    }
    document(&lines, next - 1)
}

fn row(name: &str, doc: &Document, k: u32) {
    let cg = ConstraintGraph::build(doc);
    let problem = ColouringProblem::new(cg.graph.clone(), 8);
    let cancel = AtomicBool::new(false);
    let start = Instant::now();
    let baseline = solve(&problem, &SolveOptions::default(), &cancel, &mut |_| {}).expect("valid");
    let base = start.elapsed();
    let start = Instant::now();
    let v = fewest_relaxations_uncontrolled(doc, k, &Allowed::default(), Duration::from_secs(600))
        .expect("valid");
    let ours = start.elapsed();
    let start = Instant::now();
    check_relaxation(&v.model.problem, &v.report).expect("the answer passes the checker");
    let check = start.elapsed();
    assert!(v.report.proven_optimal);
    println!(
        "| {name:<26} | {:>7} | {:>3} -> {k:<2} | {:>7} | {:>4} | {:>10.1} | {:>10.1} | {:>7.2}x | {:>9.1}",
        cg.vertex_count(),
        baseline.minimum.unwrap_or(0),
        v.report.cost.unwrap_or(0),
        v.report.obstructions.len(),
        ms(ours),
        ms(base),
        ms(ours) / ms(base).max(1e-3),
        ms(check),
    );
}

fn main() {
    println!(
        "| instance                   | regions | colours | dropped | obst | relax (ms) | solve (ms) | ratio    | check (ms)"
    );
    println!(
        "|----------------------------|---------|---------|---------|------|------------|------------|----------|-----------"
    );
    row("US counties, queen", &counties(), 4);
    for copies in [10, 100] {
        row(&format!("{copies} K5s in a chain"), &k5_chain(copies), 4);
    }
    println!(
        "ratio: time to the proven fewest relaxations over one proven `solve` of the same graph"
    );
    println!();
    println!(
        "| flat drawing               | regions | dropped    | K-subgraphs | relax (ms) | planarity (ms) | ratio    | check (ms)"
    );
    println!(
        "|----------------------------|---------|------------|-------------|------------|----------------|----------|-----------"
    );
    // Natural Earth 1:110m countries (npm world-atlas 2.0.2, tests/data/geo/PROVENANCE.md).
    let path =
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/geo/world110m.topojson");
    let options = tinct::geo::ImportOptions {
        rule: tinct::geo::Rule::Queen,
        ..Default::default()
    };
    let world = tinct::geo::import_path(&path, &options)
        .expect("the fixture imports")
        .into_document("world");
    planar_row("world 1:110m, queen", &world);
    planar_row("US counties, queen", &counties());
    for copies in [10, 100] {
        planar_row(&format!("{copies} K5s in a chain"), &k5_chain(copies));
    }
    println!(
        "ratio: time to the proven fewest relaxations for a flat drawing over one planarity test (with its certificate) of the same graph"
    );
    println!();
    hierarchy_row();
}

fn planar_row(name: &str, doc: &Document) {
    let cg = ConstraintGraph::build(doc);
    let cancel = AtomicBool::new(false);
    let start = Instant::now();
    planarity(&cg.graph, &cancel, &mut |_| {}).expect("not cancelled");
    let base = start.elapsed();
    let start = Instant::now();
    let v =
        fewest_relaxations_planar_uncontrolled(doc, &Allowed::default(), Duration::from_secs(600))
            .expect("valid");
    let ours = start.elapsed();
    let start = Instant::now();
    check_planar_relaxation(&v.model.problem, &v.report).expect("the answer passes the checker");
    let check = start.elapsed();
    let outcome = if v.report.infeasible {
        "none helps".to_string()
    } else {
        assert!(v.report.proven_optimal);
        v.report.cost.unwrap_or(0).to_string()
    };
    println!(
        "| {name:<26} | {:>7} | {:>10} | {:>11} | {:>10.1} | {:>14.2} | {:>7.1}x | {:>9.1}",
        cg.vertex_count(),
        outcome,
        v.report.obstructions.len(),
        ms(ours),
        ms(base),
        ms(ours) / ms(base).max(1e-3),
        ms(check),
    );
}

/// The counties by state: families and tints, proven, then arranged (every tint pair of one
/// lightness clashing, as a stand-in for the palette check's thresholds).
fn hierarchy_row() {
    let text = include_str!("../tests/data/geo/us_counties_queen.txt");
    let mut ids: Vec<&str> = text
        .lines()
        .filter(|l| !l.starts_with('#'))
        .flat_map(|l| l.split_whitespace().take(2))
        .collect();
    ids.sort_unstable();
    ids.dedup();
    let doc = counties();
    let cg = ConstraintGraph::build(&doc);
    let states: Vec<&str> = {
        let mut s: Vec<&str> = ids.iter().map(|f| &f[..2]).collect();
        s.sort_unstable();
        s.dedup();
        s
    };
    // Region i + 1 is ids[i]; its vertex's parent is its state's index.
    let mut parent_of = vec![0u32; cg.vertex_count()];
    for (i, fips) in ids.iter().enumerate() {
        if let Some(v) = cg.vertex_of(RegionId(i as u64 + 1)) {
            parent_of[v as usize] = states.binary_search(&&fips[..2]).expect("listed") as u32;
        }
    }
    let cancel = AtomicBool::new(false);
    let start = Instant::now();
    let baseline = solve(
        &ColouringProblem::new(cg.graph.clone(), 8),
        &SolveOptions::default(),
        &cancel,
        &mut |_| {},
    )
    .expect("valid");
    let base = start.elapsed();
    let start = Instant::now();
    let mut report = hierarchy_colouring(
        &cg.graph,
        &parent_of,
        states.len(),
        &SolveOptions::default(),
        &cancel,
        &mut |_, _| {},
    )
    .expect("valid");
    let coloured = start.elapsed();
    let tints = report.tints;
    let start = Instant::now();
    let (before, after) = arrange_tints(&cg.graph, &parent_of, &mut report, &|a, b| {
        a % tints == b % tints
    });
    let arranged = start.elapsed();
    assert!(report.families_proven && report.tints_proven);
    println!(
        "| instance                   | parents | families | tints | hierarchy (ms) | arrange (ms) | solve (ms) | ratio"
    );
    println!(
        "|----------------------------|---------|----------|-------|----------------|--------------|------------|------"
    );
    println!(
        "| {:<26} | {:>7} | {:>8} | {:>5} | {:>14.1} | {:>12.1} | {:>10.1} | {:>5.2}x",
        "US counties by state",
        states.len(),
        report.families,
        report.tints,
        ms(coloured),
        ms(arranged),
        ms(base),
        ms(coloured + arranged) / ms(base).max(1e-3),
    );
    println!(
        "same-lightness pairs across state lines: {before} before arranging, {after} after; ratio: families, tints and arranging over one proven `solve` (fewest colours: {})",
        baseline.minimum.unwrap_or(0)
    );
}
