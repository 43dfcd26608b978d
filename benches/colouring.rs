//! Colouring benchmark: time to a proven optimal colouring on random maximal planar graphs and a
//! map-like graph with pins and groups, against a plain SAT encoding on the same solver (batsat)
//! in the same run. Prints a table; run with `cargo bench --no-default-features --bench colouring`.

#[path = "../tests/support/generators.rs"]
mod generators;

use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use generators::{Rng, mycielski, queen, triangulation as random_triangulation};
use tinct::engine::Graph;
use tinct::engine::colouring::sat::{Sat, SatAnswer};
use tinct::engine::colouring::{
    ColouringProblem, SolveOptions, Symmetry, check_colouring, check_refutation, colouring_cnf,
    find_clique, solve,
};

fn graph(n: usize, edges: &[(u32, u32)]) -> Graph {
    Graph::from_edges(n, edges)
        .expect("generated edges are in range")
        .0
}

/// Plain encoding: the same k-colouring CNF with a greedy clique's colours fixed, solved directly.
fn plain_sat(g: &Graph, k: u32, cap: Duration) -> (Option<bool>, Duration) {
    let start = Instant::now();
    let symmetry = Symmetry {
        clique: find_clique(g, 10_000),
        first_free_class: 0,
    };
    let cnf = colouring_cnf(g, &[], k, &symmetry);
    let mut sat = Sat::new(cnf.variables, false, None, Some(start + cap));
    for c in &cnf.clauses {
        sat.add_clause(c);
    }
    let answer = match sat.solve(&[]) {
        SatAnswer::Sat => Some(true),
        SatAnswer::Unsat => Some(false),
        SatAnswer::Unknown => None,
    };
    (answer, start.elapsed())
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1000.0
}

fn triangulation_row(n: usize, seed: u64, cap: Duration) {
    let edges = random_triangulation(n, 2 * n, seed);
    let g = graph(n, &edges);
    let problem = ColouringProblem::new(g, 8);
    let cancel = AtomicBool::new(false);
    let start = Instant::now();
    let report =
        solve(&problem, &SolveOptions::default(), &cancel, &mut |_| {}).expect("valid problem");
    let ours = start.elapsed();
    // Checks (not timed).
    let colouring = report.colouring.as_ref().expect("a colouring");
    check_colouring(&problem, colouring).expect("valid colouring");
    let o = report.obstruction.as_ref().expect("3 colours refuted");
    check_refutation(
        &problem.graph,
        &problem.pins,
        o.refutation.as_ref().expect("proof"),
    )
    .expect("proof checks");
    assert!(report.proven && report.minimum == Some(4));
    let (plain, plain_time) = plain_sat(&problem.graph, 4, cap);
    let ratio = ms(plain_time) / ms(ours).max(1e-3);
    let (plain_text, ratio_text) = match plain {
        Some(_) => (
            format!("{:>10.1}", ms(plain_time)),
            format!("{ratio:>8.1}x"),
        ),
        None => (
            format!(">{:>9.0}", ms(plain_time)),
            format!(">{ratio:>7.1}x"),
        ),
    };
    println!(
        "| triangulation n={n:<8} | {:>5} | {:>10.1} | {} | {} | obstruction {:?} ({} vertices)",
        4,
        ms(ours),
        plain_text,
        ratio_text,
        o.kind,
        o.vertices.len()
    );
}

/// A map-like graph: a random triangulation with some borders removed (maps are rarely
/// triangulated), 150 same-colour groups merged (pairs of non-adjacent regions contracted), and
/// 20 pins on three slots.
fn map_row(seed: u64, cap: Duration) {
    let n0 = 3150;
    let mut rng = Rng::new(seed);
    let edges: Vec<(u32, u32)> = random_triangulation(n0, 2 * n0, seed)
        .into_iter()
        .filter(|_| rng.index(100) < 85)
        .collect();
    let g0 = graph(n0, &edges);
    // Merge 150 groups: map each grouped vertex onto a representative.
    // Each group is a pair of regions that were in no other group and do not border each other.
    let mut rep: Vec<u32> = (0..n0 as u32).collect();
    let mut grouped = vec![false; n0];
    let mut merged = 0;
    while merged < 150 {
        let a = rng.index(n0) as u32;
        let b = rng.index(n0) as u32;
        if a != b && !grouped[a as usize] && !grouped[b as usize] && !g0.has_edge(a, b) {
            rep[b as usize] = a;
            grouped[a as usize] = true;
            grouped[b as usize] = true;
            merged += 1;
        }
    }
    let mut index = vec![u32::MAX; n0];
    let mut n = 0u32;
    for v in 0..n0 {
        if rep[v] == v as u32 {
            index[v] = n;
            n += 1;
        }
    }
    let merged_edges: Vec<(u32, u32)> = edges
        .iter()
        .map(|&(a, b)| {
            (
                index[rep[a as usize] as usize],
                index[rep[b as usize] as usize],
            )
        })
        .filter(|(a, b)| a != b)
        .collect();
    let g = graph(n as usize, &merged_edges);
    let mut pins = vec![None; n as usize];
    let mut placed = 0;
    while placed < 20 {
        let v = rng.index(n as usize);
        // Three pinned slots: the pins alone do not decide the minimum.
        let slot = rng.index(3) as u32;
        if pins[v].is_none()
            && g.neighbours(v as u32)
                .iter()
                .all(|&w| pins[w as usize] != Some(slot))
        {
            pins[v] = Some(slot);
            placed += 1;
        }
    }
    let problem = ColouringProblem {
        graph: g,
        pins,
        previous: None,
        max_colours: 8,
    };
    let cancel = AtomicBool::new(false);
    let start = Instant::now();
    let report =
        solve(&problem, &SolveOptions::default(), &cancel, &mut |_| {}).expect("valid problem");
    let ours = start.elapsed();
    check_colouring(&problem, report.colouring.as_ref().expect("colouring")).expect("valid");
    let (plain, plain_time) = plain_sat(&problem.graph, report.minimum.unwrap_or(0), cap);
    println!(
        "| map n={:<5} pins+groups  | {:>5} | {:>10.1} | {:>10.1} | {:>8.1}x | proven {} lower bound {} plain {:?}",
        n,
        report.minimum.unwrap_or(0),
        ms(ours),
        ms(plain_time),
        ms(plain_time) / ms(ours).max(1e-3),
        report.proven,
        report.lower_bound.value,
        plain
    );
}

/// One instance of the published benchmark set: time to a proven optimum (the minimum and its
/// lower bound, without building the evidence afterwards) against the plain encoding asked the
/// two questions that settle the same answer: a colouring with `chi` colours, none with `chi - 1`.
fn benchmark_row(name: &str, chi: u32, n: usize, edges: &[(u32, u32)], cap: Duration) {
    let problem = ColouringProblem::new(graph(n, edges), 64);
    let cancel = AtomicBool::new(false);
    let options = SolveOptions {
        time_limit: Some(cap),
        prove_three: false,
        prove_minimum: false,
        ..SolveOptions::default()
    };
    let start = Instant::now();
    let report = solve(&problem, &options, &cancel, &mut |_| {}).expect("valid");
    let ours = start.elapsed();
    check_colouring(&problem, report.colouring.as_ref().expect("a colouring")).expect("valid");
    let (found, found_time) = plain_sat(&problem.graph, chi, cap);
    let (refuted, refuted_time) =
        plain_sat(&problem.graph, chi - 1, cap.saturating_sub(found_time));
    let plain = found_time + refuted_time;
    let plain_done = found == Some(true) && refuted == Some(false);
    let ours_done = report.proven && report.minimum == Some(chi);
    let ratio = ms(plain) / ms(ours).max(1e-3);
    let (plain_text, ratio_text) = match (plain_done, ours_done) {
        (true, true) => (format!("{:>10.1}", ms(plain)), format!("{ratio:>8.2}x")),
        (false, true) => (format!(">{:>9.0}", ms(plain)), format!(">{ratio:>7.2}x")),
        (true, false) => (format!("{:>10.1}", ms(plain)), format!("<{ratio:>7.2}x")),
        (false, false) => (format!(">{:>9.0}", ms(plain)), "      n/a".to_string()),
    };
    println!(
        "| {name:<24} | {:>5} | {:>10.1} | {} | {} | needs {chi}; ours: {} found, {} proven{}",
        chi,
        ms(ours),
        plain_text,
        ratio_text,
        report.minimum.unwrap_or(0),
        report.lower_bound.value,
        if report.stopped {
            " (stopped at the time cap)"
        } else {
            ""
        }
    );
}

fn main() {
    // `cargo bench --bench colouring -- WORD` runs only the rows whose name contains WORD.
    let filter: Option<String> = std::env::args().skip(1).find(|a| !a.starts_with("--"));
    let wanted = |name: &str| filter.as_ref().is_none_or(|f| name.contains(f.as_str()));
    let cap = Duration::from_secs(60);
    println!("| instance                 | col.  | ours (ms)  | plain (ms) | ratio     | notes");
    println!("|--------------------------|-------|------------|------------|-----------|------");
    for (n, seed) in [(10_000, 1), (100_000, 2), (1_000_000, 3)] {
        if wanted("triangulation") {
            triangulation_row(n, seed, cap);
        }
    }
    if wanted("map") {
        map_row(4, cap);
    }
    // Published chromatic numbers, from the DIMACS colouring benchmark list (Trick's table of
    // the DIMACS instances): the Mycielski graphs myciel3 to myciel6 (Mycielski 1955: 4, 5, 6, 7;
    // no triangles, so no clique shows the bound) and the queen graphs queen5_5 to queen8_8
    // (5, 7, 7, 9). "ratio" is plain time over ours: above 1 means ours is faster.
    for (name, order, chi) in [
        ("myciel3 (11 vertices)", 4, 4),
        ("myciel4 (23 vertices)", 5, 5),
        ("myciel5 (47 vertices)", 6, 6),
        ("myciel6 (95 vertices)", 7, 7),
    ] {
        if wanted(name) {
            let (n, edges) = mycielski(order);
            benchmark_row(name, chi, n, &edges, cap);
        }
    }
    for (side, chi) in [(5, 5), (6, 7), (7, 7), (8, 9)] {
        let name = format!("queen{side}_{side}");
        if wanted(&name) {
            let (n, edges) = queen(side);
            benchmark_row(&name, chi, n, &edges, cap);
        }
    }
}
