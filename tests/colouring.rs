//! Colouring engine against published chromatic numbers, theorems as property tests, a brute-force
//! oracle, and the independent checkers (colourings, bounds, refutations, arguments).

use std::sync::atomic::AtomicBool;

use super::support::generators::{
    Rng, complete, even_triangulation, mycielski, queen, triangulation as random_triangulation,
    wheel,
};
use proptest::prelude::*;
use tinct::engine::Graph;
use tinct::engine::colouring::{
    Balance, BoundEvidence, ColouringError, ColouringProblem, ColouringReport, DratError,
    Obstruction, ObstructionKind, RefutationError, SolveOptions, Stage, StepKind, StoppedPart,
    check_bound, check_colouring, check_drat, check_refutation, colour_count, replay_argument,
    solve,
};

fn graph(n: usize, edges: &[(u32, u32)]) -> Graph {
    Graph::from_edges(n, edges).unwrap().0
}

fn run(problem: &ColouringProblem, options: &SolveOptions) -> ColouringReport {
    let cancel = AtomicBool::new(false);
    let report = solve(problem, options, &cancel, &mut |_| {}).unwrap();
    verify(problem, &report);
    report
}

/// Runs every independent checker over a report.
fn verify(problem: &ColouringProblem, report: &ColouringReport) {
    if let Some(c) = &report.colouring {
        // Slots past the palette are still slots: check against the palette widened to the
        // minimum, and hold the report's flag to what the colouring uses.
        let widened = ColouringProblem {
            max_colours: problem.max_colours.max(report.minimum.unwrap_or(0)),
            ..problem.clone()
        };
        check_colouring(&widened, c).unwrap();
        assert_eq!(
            report.palette_too_small,
            c.iter().any(|&s| s >= problem.max_colours)
        );
        assert_eq!(Some(colour_count(c)), report.colours_used);
        if problem.previous.is_none() {
            assert_eq!(report.colours_used, report.minimum);
        }
        if report.three_colourable == Some(false) {
            assert!(colour_count(c) > 3);
        }
    }
    assert!(check_bound(&problem.graph, &report.lower_bound));
    if report.proven {
        assert_eq!(report.minimum, Some(report.lower_bound.value));
    }
    for o in [&report.obstruction, &report.minimum_obstruction]
        .into_iter()
        .flatten()
    {
        verify_obstruction(problem, o);
    }
}

fn verify_obstruction(problem: &ColouringProblem, o: &Obstruction) {
    let g = &problem.graph;
    for &(u, v) in &o.edges {
        assert!(g.has_edge(u, v));
        assert!(o.vertices.contains(&u) && o.vertices.contains(&v));
    }
    let r = o
        .refutation
        .as_ref()
        .expect("every obstruction carries a refutation");
    assert_eq!(r.colours, o.colours);
    check_refutation(g, &problem.pins, r).unwrap();
    if let Some(steps) = &o.argument {
        assert!(replay_argument(g, o.colours, steps));
    }
}

fn chromatic(n: usize, edges: &[(u32, u32)], options: &SolveOptions) -> ColouringReport {
    let p = ColouringProblem::new(graph(n, edges), 64);
    let r = run(&p, options);
    assert!(r.proven, "not proven: {:?}", r.lower_bound);
    r
}

#[test]
fn mycielski_graphs_need_3_4_5_and_6_colours() {
    // Mycielski, "Sur le coloriage des graphes", Colloq. Math. 3 (1955): M_k is triangle-free
    // and needs k colours; M3..M6 have 5, 11, 23, 47 vertices (the DIMACS files number them one
    // higher: myciel5 has 47 vertices).
    let options = SolveOptions {
        prove_minimum: false,
        ..SolveOptions::default()
    };
    for (order, vertices, colours) in [(3, 5, 3), (4, 11, 4), (5, 23, 5)] {
        let (n, edges) = mycielski(order);
        assert_eq!(n, vertices);
        let r = chromatic(n, &edges, &options);
        assert_eq!(r.minimum, Some(colours), "M{order}");
        assert_eq!(r.three_colourable, Some(colours <= 3));
    }
    // M6 (47 vertices) needs 6: found and proven, with its obstruction to 5 colours checked.
    let (n, edges) = mycielski(6);
    assert_eq!(n, 47);
    let r = chromatic(n, &edges, &SolveOptions::default());
    assert_eq!(r.minimum, Some(6));
    let o = r
        .minimum_obstruction
        .expect("evidence beyond the largest clique");
    assert_eq!(o.colours, 5);
}

#[test]
fn grotzsch_graph_needs_four_with_a_checked_proof_and_argument() {
    // Grötzsch graph (= Mycielskian of C5): 11 vertices, 20 edges, triangle-free, chromatic
    // number 4 (Grötzsch 1959; also the M4 above).
    let (n, edges) = mycielski(4);
    assert_eq!(edges.len(), 20);
    let r = chromatic(n, &edges, &SolveOptions::default());
    assert_eq!(r.minimum, Some(4));
    let o = r.obstruction.as_ref().unwrap();
    assert_eq!(o.kind, ObstructionKind::Grotzsch);
    assert_eq!(o.vertices.len(), 11);
    assert!(o.vertex_critical);
    let steps = o
        .argument
        .as_ref()
        .expect("11 vertices: an argument is built");
    assert!(steps.iter().any(|s| s.kind == StepKind::Suppose));
    // No K4 here, so the proof has real lemmas (a K4 CNF falls to unit propagation).
    let summary = check_drat(
        &o.refutation.as_ref().unwrap().cnf,
        &o.refutation.as_ref().unwrap().drat,
    )
    .unwrap();
    assert!(summary.lemmas > 1);
    // The formula does not fall to unit propagation: the bare empty clause is rejected, and so
    // is the proof with its learnt clauses removed.
    let r = o.refutation.as_ref().unwrap();
    assert!(matches!(
        check_drat(&r.cnf, "0\n"),
        Err(DratError::NotImplied { index: 0, .. })
    ));
    let deletions_only: String = r
        .drat
        .lines()
        .filter(|l| l.starts_with('d'))
        .map(|l| format!("{l}\n"))
        .collect::<String>()
        + "0\n";
    assert!(check_drat(&r.cnf, &deletions_only).is_err());
}

/// The Chvátal graph (Chvátal 1970): 12 vertices, 4-regular, triangle-free, chromatic number 4.
/// Edge list as in networkx 3.6 `chvatal_graph` (reference library; compared when written).
const CHVATAL_EDGES: [(u32, u32); 24] = [
    (0, 1),
    (0, 4),
    (0, 6),
    (0, 9),
    (1, 2),
    (1, 5),
    (1, 7),
    (2, 3),
    (2, 6),
    (2, 8),
    (3, 4),
    (3, 7),
    (3, 9),
    (4, 5),
    (4, 8),
    (5, 10),
    (5, 11),
    (6, 10),
    (6, 11),
    (7, 8),
    (7, 11),
    (8, 10),
    (9, 10),
    (9, 11),
];

#[test]
fn chvatal_graph_needs_four() {
    // Chvátal graph (Chvátal 1970): 12 vertices, 4-regular, triangle-free, chromatic number 4.
    let edges = CHVATAL_EDGES;
    let r = chromatic(12, &edges, &SolveOptions::default());
    assert_eq!(r.minimum, Some(4));
    assert_eq!(r.three_colourable, Some(false));
}

#[test]
fn petersen_graph_needs_three() {
    // Petersen graph: chromatic number 3 (common practice; it has 5-cycles and is cubic, Brooks).
    let mut edges = Vec::new();
    for i in 0..5u32 {
        edges.push((i, (i + 1) % 5));
        edges.push((i, i + 5));
        edges.push((i + 5, (i + 2) % 5 + 5));
    }
    let r = chromatic(10, &edges, &SolveOptions::default());
    assert_eq!(r.minimum, Some(3));
    assert_eq!(r.three_colourable, Some(true));
    assert!(r.obstruction.is_none());
}

#[test]
fn queen_graphs_need_5_7_7() {
    // Queen graphs queen5_5, queen6_6, queen7_7: chromatic numbers 5, 7, 7 as tabulated with the
    // DIMACS colouring benchmarks (queen8_8: 9, see the benchmark `colouring`).
    for (side, colours) in [(5, 5), (6, 7), (7, 7)] {
        let (n, edges) = queen(side);
        let r = chromatic(n, &edges, &SolveOptions::default());
        assert_eq!(r.minimum, Some(colours), "queen{side}_{side}");
    }
}

#[test]
fn wheels_and_complete_graphs() {
    // Odd wheels need 4, even wheels 3, K_n needs n (common practice).
    for rim in 3..=12u32 {
        let r = chromatic(rim as usize + 1, &wheel(rim), &SolveOptions::default());
        let expected = if rim % 2 == 1 { 4 } else { 3 };
        assert_eq!(r.minimum, Some(expected), "W{rim}");
        if rim % 2 == 1 {
            let o = r.obstruction.as_ref().unwrap();
            let kind = if rim == 3 {
                ObstructionKind::Complete
            } else {
                ObstructionKind::OddWheel
            };
            assert_eq!(o.kind, kind);
        }
    }
    for n in 1..=9u32 {
        let r = chromatic(n as usize, &complete(n), &SolveOptions::default());
        assert_eq!(r.minimum, Some(n), "K{n}");
    }
}

#[test]
fn odd_wheel_proofs_check_and_corruptions_are_rejected() {
    // W7 has no K4, so its 3-colouring CNF does not fall to unit propagation alone.
    let p = ColouringProblem::new(graph(8, &wheel(7)), 8);
    let r = run(&p, &SolveOptions::default());
    let o = r.obstruction.unwrap();
    let refutation = o.refutation.unwrap();
    assert!(check_refutation(&p.graph, &p.pins, &refutation).is_ok());

    // A truncated proof (no empty clause) is rejected.
    let mut cut = refutation.clone();
    cut.drat = String::new();
    assert!(matches!(
        check_refutation(&p.graph, &p.pins, &cut),
        Err(RefutationError::Drat(_))
    ));
    // A clause about a non-edge (rim vertices 1 and 3 are not adjacent) is rejected.
    let mut extra = refutation.clone();
    let k = refutation.colours;
    let pos = |v: u32| refutation.vertices.iter().position(|&x| x == v).unwrap() as u32;
    let var = |i: u32, c: u32| (i * k + c + 1) as i32;
    let lines: Vec<&str> = extra.cnf.lines().collect();
    let header = lines.iter().position(|l| l.starts_with("p ")).unwrap();
    let count: usize = lines[header]
        .split_whitespace()
        .nth(3)
        .unwrap()
        .parse()
        .unwrap();
    let mut text = String::new();
    for (i, l) in lines.iter().enumerate() {
        if i == header {
            text.push_str(&format!(
                "p cnf {} {}\n",
                refutation.vertices.len() as u32 * k,
                count + 1
            ));
        } else {
            text.push_str(l);
            text.push('\n');
        }
    }
    text.push_str(&format!("{} {} 0\n", -var(pos(1), 0), -var(pos(3), 0)));
    extra.cnf = text;
    assert!(matches!(
        check_refutation(&p.graph, &p.pins, &extra),
        Err(RefutationError::Clause { .. })
    ));
    // A symmetry clique that is not a clique is rejected.
    let mut fake = refutation.clone();
    fake.symmetry.clique = vec![pos(1), pos(3)];
    assert!(matches!(
        check_refutation(&p.graph, &p.pins, &fake),
        Err(RefutationError::Symmetry { .. })
    ));
    // Dropping the at-least-one clause of the hub weakens the formula: the proof must fail.
    let mut weak = refutation.clone();
    let hub = pos(0);
    let alo: String = (0..k)
        .map(|c| format!("{} ", var(hub, c)))
        .collect::<String>()
        + "0";
    let kept: Vec<&str> = weak.cnf.lines().filter(|l| l.trim() != alo).collect();
    let dropped = weak.cnf.lines().count() - kept.len();
    assert_eq!(dropped, 1);
    weak.cnf = kept
        .iter()
        .map(|l| {
            if l.starts_with("p ") {
                format!(
                    "p cnf {} {}\n",
                    refutation.vertices.len() as u32 * k,
                    count - 1
                )
            } else {
                format!("{l}\n")
            }
        })
        .collect();
    assert!(matches!(
        check_refutation(&p.graph, &p.pins, &weak),
        Err(RefutationError::Drat(DratError::NotImplied { .. }))
            | Err(RefutationError::Drat(DratError::NoEmptyClause))
    ));
}

#[test]
fn pins_change_the_answer_and_the_proof_names_them() {
    // An even cycle is 2-colourable, but pinning two vertices at even distance to different
    // slots forces a third colour (common practice).
    let edges: Vec<(u32, u32)> = (0..6).map(|i| (i, (i + 1) % 6)).collect();
    let mut p = ColouringProblem::new(graph(6, &edges), 5);
    p.pins = vec![Some(3), None, Some(1)];
    let r = run(&p, &SolveOptions::default());
    assert_eq!(r.minimum, Some(3));
    assert!(r.proven);
    let c = r.colouring.unwrap();
    assert_eq!((c[0], c[2]), (3, 1));
    // Three different pinned slots on a triangle-free graph: still 3; four pinned slots: 4.
    p.pins = vec![Some(0), None, Some(1), None, Some(2), None];
    assert_eq!(run(&p, &SolveOptions::default()).minimum, Some(3));
    p.pins = vec![Some(0), Some(1), Some(2), Some(3)];
    let r = run(&p, &SolveOptions::default());
    assert_eq!(r.minimum, Some(4));
    assert_eq!(
        r.lower_bound.evidence,
        BoundEvidence::PinnedSlots(vec![0, 1, 2, 3])
    );
}

#[test]
fn pinned_obstruction_carries_pins_into_the_certificate() {
    // A diamond (triangle 0-1-2 plus vertex 3 joined to 1 and 2) is 3-colourable with 3 taking
    // the colour of 0. Pinning 0 and 3 to different slots forces 1 and 2 onto two more slots:
    // 4 colours (common practice). The obstruction must use the pins, and its certificate too.
    let p = ColouringProblem {
        graph: graph(4, &[(0, 1), (0, 2), (1, 2), (1, 3), (2, 3)]),
        pins: vec![Some(0), None, None, Some(1)],
        previous: None,
        max_colours: 6,
    };
    let r = run(&p, &SolveOptions::default());
    assert_eq!(r.minimum, Some(4));
    assert_eq!(r.three_colourable, Some(false));
    let o = r.obstruction.unwrap();
    assert_eq!(o.kind, ObstructionKind::Pinned);
    assert_eq!(o.pins, vec![(0, 0), (3, 1)]);
    let refutation = o.refutation.unwrap();
    // The same certificate fails against a problem whose pins differ.
    let mut other = p.clone();
    other.pins = vec![Some(0), None, None, Some(2)];
    assert!(matches!(
        check_refutation(&other.graph, &other.pins, &refutation),
        Err(RefutationError::Pin { .. })
    ));
    // Without the pins the diamond needs only 3.
    let free = ColouringProblem::new(p.graph.clone(), 6);
    assert_eq!(run(&free, &SolveOptions::default()).minimum, Some(3));
}

#[test]
fn palette_and_pin_errors_carry_evidence() {
    let mut p = ColouringProblem::new(graph(3, &complete(3)), 4);
    p.pins = vec![Some(7)];
    let cancel = AtomicBool::new(false);
    assert_eq!(
        solve(&p, &SolveOptions::default(), &cancel, &mut |_| {}),
        Err(ColouringError::PinOutsidePalette {
            vertex: 0,
            slot: 7,
            max_colours: 4
        })
    );
    p.pins = vec![Some(1), Some(1)];
    assert_eq!(
        solve(&p, &SolveOptions::default(), &cancel, &mut |_| {}),
        Err(ColouringError::PinnedNeighbours {
            u: 0,
            v: 1,
            slot: 1
        })
    );
    // K5 with a 4-slot palette: the report says so and still gives a colouring with 5 slots.
    let p = ColouringProblem::new(graph(5, &complete(5)), 4);
    let r = run(&p, &SolveOptions::default());
    assert!(r.palette_too_small);
    assert_eq!(r.minimum, Some(5));
    assert_eq!(r.colouring.as_ref().map(|c| colour_count(c)), Some(5));
}

#[test]
fn cancelled_search_reports_best_and_bound() {
    let (n, edges) = mycielski(6);
    let p = ColouringProblem::new(graph(n, &edges), 64);
    let cancel = AtomicBool::new(true);
    let r = solve(&p, &SolveOptions::default(), &cancel, &mut |_| {}).unwrap();
    verify(&p, &r);
    assert!(r.stopped);
    assert!(!r.proven);
    assert!(r.colouring.is_some());
    assert!(r.lower_bound.value >= 2);
}

#[test]
fn progress_is_reported_and_output_is_deterministic() {
    let (n, edges) = mycielski(4);
    let p = ColouringProblem::new(graph(n, &edges), 8);
    let cancel = AtomicBool::new(false);
    let mut stages = Vec::new();
    let a = solve(&p, &SolveOptions::default(), &cancel, &mut |s| {
        stages.push(s.stage)
    })
    .unwrap();
    let b = solve(&p, &SolveOptions::default(), &cancel, &mut |_| {}).unwrap();
    assert_eq!(a, b);
    assert!(stages.len() >= 3);
}

#[test]
fn large_triangulation_gets_four_colours_and_a_proof_against_three() {
    // Four colour theorem (Appel and Haken 1977) for the upper bound; a random maximal planar
    // graph has a vertex of odd degree, so it is not 3-colourable (Heawood 1898).
    let n = 3000;
    let edges = random_triangulation(n, 2 * n, 7);
    assert_eq!(edges.len(), 3 * n - 6);
    let p = ColouringProblem::new(graph(n, &edges), 8);
    let r = run(&p, &SolveOptions::default());
    assert_eq!(r.minimum, Some(4));
    assert!(r.proven);
    assert_eq!(r.three_colourable, Some(false));
    assert!(r.obstruction.unwrap().vertices.len() <= 8);
}

#[test]
fn stable_recolouring_changes_few_and_matches_brute_force() {
    // After an edit, the fewest changes among colourings with the same slots, checked against
    // brute force over all colourings (common practice: exhaustive search as the oracle).
    let mut rng = Rng::new(11);
    for _ in 0..30 {
        let n = 4 + rng.index(4);
        let mut edges = Vec::new();
        for a in 0..n as u32 {
            for b in (a + 1)..n as u32 {
                if rng.index(100) < 45 {
                    edges.push((a, b));
                }
            }
        }
        let g = graph(n, &edges);
        let previous: Vec<Option<u32>> = (0..n).map(|_| Some(rng.index(3) as u32)).collect();
        let p = ColouringProblem {
            graph: g.clone(),
            pins: Vec::new(),
            previous: Some(previous.clone()),
            max_colours: 3,
        };
        let cancel = AtomicBool::new(false);
        let Ok(r) = solve(&p, &SolveOptions::default(), &cancel, &mut |_| {}) else {
            panic!("no error expected")
        };
        if r.palette_too_small {
            continue;
        }
        verify(&p, &r);
        // Brute force over 3^n colourings.
        let mut best = usize::MAX;
        for code in 0..3usize.pow(n as u32) {
            let c: Vec<u32> = (0..n)
                .map(|i| ((code / 3usize.pow(i as u32)) % 3) as u32)
                .collect();
            if g.edges().all(|(a, b)| c[a as usize] != c[b as usize]) {
                let changed = (0..n).filter(|&i| previous[i] != Some(c[i])).count();
                best = best.min(changed);
            }
        }
        assert_eq!(r.changed, Some(best));
        assert_eq!(r.changed_optimal, Some(true));
    }
}

#[test]
fn balanced_colouring_keeps_colours_and_evens_counts() {
    // A star K_{1,8}: DSATUR-style colourings put all leaves together; balancing cannot move the
    // centre's colour onto a leaf, but with a path it can even counts out (common practice).
    let edges: Vec<(u32, u32)> = (0..9).map(|i| (i, i + 1)).collect();
    let p = ColouringProblem::new(graph(10, &edges), 4);
    let options = SolveOptions {
        balance: Some(Balance::Count),
        ..SolveOptions::default()
    };
    let r = run(&p, &options);
    assert_eq!(r.minimum, Some(2));
    let totals = r.totals.unwrap();
    assert_eq!(totals, vec![(0, 5.0), (1, 5.0)]);
    // By weight (area): vertex 0 is heavy; totals are recomputed from the colouring.
    let mut w = vec![1.0; 10];
    w[0] = 5.0;
    let options = SolveOptions {
        balance: Some(Balance::Weight(w.clone())),
        ..SolveOptions::default()
    };
    let r = run(&p, &options);
    let c = r.colouring.unwrap();
    for (slot, total) in r.totals.unwrap() {
        let sum: f64 = (0..10).filter(|&v| c[v] == slot).map(|v| w[v]).sum();
        assert_eq!(sum, total);
    }
}

/// Brute-force chromatic number with pins (palette slots `0..palette`): the fewest distinct slots
/// over all proper colourings that keep the pins. Exhaustive search; the only pruning is that a
/// branch using as many slots as the best so far is cut, and among slots not yet used and not
/// pinned anywhere only the first is tried (they are interchangeable).
fn brute_force(n: usize, edges: &[(u32, u32)], pins: &[Option<u32>], palette: u32) -> u32 {
    struct Search<'a> {
        n: usize,
        edges: &'a [(u32, u32)],
        pins: &'a [Option<u32>],
        palette: u32,
        colour: Vec<u32>,
        used: Vec<u32>,
        best: u32,
    }
    impl Search<'_> {
        fn rec(&mut self, v: usize, distinct: u32) {
            if distinct >= self.best {
                return;
            }
            if v == self.n {
                self.best = distinct;
                return;
            }
            let mut fresh_tried = false;
            for col in 0..self.palette {
                if self
                    .pins
                    .get(v)
                    .copied()
                    .flatten()
                    .is_some_and(|p| p != col)
                {
                    continue;
                }
                let pinned_slot = self.pins.contains(&Some(col));
                if self.used[col as usize] == 0 && !pinned_slot {
                    if fresh_tried {
                        continue;
                    }
                    fresh_tried = true;
                }
                let clash = self.edges.iter().any(|&(a, b)| {
                    (a as usize == v && (b as usize) < v && self.colour[b as usize] == col)
                        || (b as usize == v && (a as usize) < v && self.colour[a as usize] == col)
                });
                if clash {
                    continue;
                }
                self.colour[v] = col;
                self.used[col as usize] += 1;
                let d = distinct + u32::from(self.used[col as usize] == 1);
                self.rec(v + 1, d);
                self.used[col as usize] -= 1;
            }
        }
    }
    let mut s = Search {
        n,
        edges,
        pins,
        palette,
        colour: vec![0; n],
        used: vec![0; palette as usize],
        best: u32::MAX,
    };
    s.rec(0, 0);
    s.best
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    #[test]
    fn agrees_with_brute_force_oracle(
        n in 1usize..=9,
        density in 0u32..100,
        seed in any::<u64>(),
        pin_count in 0usize..4,
    ) {
        let mut rng = Rng::new(seed);
        let mut edges = Vec::new();
        for a in 0..n as u32 {
            for b in (a + 1)..n as u32 {
                if (rng.index(100) as u32) < density {
                    edges.push((a, b));
                }
            }
        }
        let palette = 7;
        let mut pins = vec![None; n];
        for _ in 0..pin_count {
            let v = rng.index(n);
            pins[v] = Some(rng.index(palette as usize) as u32);
        }
        let g = graph(n, &edges);
        let clash = edges.iter().any(|&(a, b)| pins[a as usize].is_some() && pins[a as usize] == pins[b as usize]);
        let p = ColouringProblem { graph: g, pins: pins.clone(), previous: None, max_colours: palette };
        let cancel = AtomicBool::new(false);
        let result = solve(&p, &SolveOptions::default(), &cancel, &mut |_| {});
        if clash {
            let pinned_neighbours = matches!(result, Err(ColouringError::PinnedNeighbours { .. }));
            prop_assert!(pinned_neighbours);
        } else {
            let r = result.unwrap();
            verify(&p, &r);
            let expected = brute_force(n, &edges, &pins, palette);
            prop_assert!(r.proven);
            if expected == u32::MAX {
                // No colouring within the 7-slot palette: the report must say so.
                prop_assert!(r.palette_too_small);
                prop_assert!(r.minimum.unwrap() > palette);
            } else {
                prop_assert_eq!(r.minimum, Some(expected));
            }
            let three = brute_force(n, &edges, &pins, palette) <= 3;
            prop_assert_eq!(r.three_colourable, Some(three));
            if !three && pins.iter().flatten().count() <= 3 {
                prop_assert!(r.obstruction.is_some());
            }
        }
    }

    #[test]
    fn triangulation_three_colourable_iff_all_degrees_even(
        n in 6usize..80,
        seed in any::<u64>(),
        rounds in 0u32..3,
        even in any::<bool>(),
    ) {
        // Heawood 1898: a planar triangulation is 3-colourable iff every vertex has even degree.
        let (n, edges) = if even { even_triangulation(rounds, seed) } else {
            (n, random_triangulation(n, 3 * n, seed))
        };
        let g = graph(n, &edges);
        let all_even = (0..n as u32).all(|v| g.degree(v).is_multiple_of(2));
        let p = ColouringProblem::new(g, 8);
        let r = run(&p, &SolveOptions::default());
        prop_assert!(r.proven);
        prop_assert_eq!(r.three_colourable, Some(all_even));
        prop_assert_eq!(r.minimum, Some(if all_even { 3 } else { 4 }));
        if !all_even {
            prop_assert!(r.obstruction.is_some());
        }
    }

    #[test]
    fn planar_graphs_get_at_most_four_and_triangle_free_ones_three(
        n in 4usize..120,
        seed in any::<u64>(),
        keep in 30u32..100,
    ) {
        // Four colour theorem (Appel and Haken 1977) and Grötzsch's theorem (1959): subgraphs of
        // triangulations are planar; deleting an edge of every triangle makes them triangle-free.
        let mut rng = Rng::new(seed ^ 0x5eed);
        let edges: Vec<(u32, u32)> = random_triangulation(n, 2 * n, seed)
            .into_iter()
            .filter(|_| (rng.index(100) as u32) < keep)
            .collect();
        let p = ColouringProblem::new(graph(n, &edges), 8);
        let r = run(&p, &SolveOptions::default());
        prop_assert!(r.minimum.unwrap() <= 4);
        // Now remove triangles greedily.
        let mut tf: Vec<(u32, u32)> = Vec::new();
        let mut adj = vec![Vec::<u32>::new(); n];
        for &(a, b) in &edges {
            if !adj[a as usize].iter().any(|x| adj[b as usize].contains(x)) {
                adj[a as usize].push(b);
                adj[b as usize].push(a);
                tf.push((a, b));
            }
        }
        let p = ColouringProblem::new(graph(n, &tf), 8);
        let r = run(&p, &SolveOptions::default());
        prop_assert!(r.minimum.unwrap() <= 3);
        prop_assert_eq!(r.three_colourable, Some(true));
    }

    #[test]
    fn brooks_bound_holds(n in 2usize..24, density in 5u32..45, seed in any::<u64>()) {
        // Brooks 1941: chi <= max degree, except complete graphs and odd cycles (max degree + 1).
        let mut rng = Rng::new(seed);
        let mut edges = Vec::new();
        for a in 0..n as u32 {
            for b in (a + 1)..n as u32 {
                if (rng.index(100) as u32) < density {
                    edges.push((a, b));
                }
            }
        }
        let g = graph(n, &edges);
        let max_degree = (0..n as u32).map(|v| g.degree(v)).max().unwrap() as u32;
        let p = ColouringProblem::new(g, 64);
        let r = run(&p, &SolveOptions {
            prove_minimum: false,
            time_limit: Some(std::time::Duration::from_secs(5)),
            ..SolveOptions::default()
        });
        prop_assert!(r.minimum.unwrap() <= max_degree + 1);
        let components = tinct::engine::connected_components(&p.graph);
        let exceptional = components.members().iter().any(|m| {
            let sub = p.graph.induced(m);
            let k = m.len();
            let complete = sub.edge_count() == k * (k - 1) / 2;
            let odd_cycle = k % 2 == 1 && k >= 3 && (0..k as u32).all(|v| sub.degree(v) == 2);
            (complete && k as u32 == max_degree + 1) || (odd_cycle && max_degree == 2)
        });
        if !exceptional && max_degree >= 1 && r.proven {
            prop_assert!(r.minimum.unwrap() <= max_degree.max(1));
        }
    }
}

#[test]
fn proof_files_for_outside_checkers() {
    // Obstructions without a K4 (odd wheels, Grötzsch, Chvátal) and a 4-colour refutation of the
    // 23-vertex Mycielski graph (Mycielski 1955: it needs 5). Each is checked here; with
    // TINCT_PROOF_DIR set, the CNF and DRAT files are also written for tests/scripts/check_drat.py.
    let chvatal = CHVATAL_EDGES;
    let (m4n, m4) = mycielski(4);
    let (m5n, m5) = mycielski(5);
    type Case = (&'static str, usize, Vec<(u32, u32)>, u32);
    let cases: Vec<Case> = vec![
        ("wheel5", 6, wheel(5), 3),
        ("wheel9", 10, wheel(9), 3),
        ("grotzsch", m4n, m4, 3),
        ("chvatal", 12, chvatal.to_vec(), 3),
        ("mycielski23", m5n, m5, 4),
    ];
    let dir = std::env::var_os("TINCT_PROOF_DIR").map(std::path::PathBuf::from);
    for (name, n, edges, k) in cases {
        let p = ColouringProblem::new(graph(n, &edges), 8);
        let pins: Vec<Option<u32>> = vec![None; n];
        let o = tinct::engine::colouring::find_obstruction(
            &p.graph,
            &pins,
            &[],
            k,
            None,
            None,
            tinct::engine::colouring::Limits::default(),
            &tinct::engine::colouring::ObstructionOptions::default(),
        )
        .unwrap();
        verify_obstruction(&p, &o);
        let r = o.refutation.unwrap();
        if let Some(dir) = &dir {
            std::fs::create_dir_all(dir).unwrap();
            std::fs::write(dir.join(format!("{name}.cnf")), &r.cnf).unwrap();
            std::fs::write(dir.join(format!("{name}.drat")), &r.drat).unwrap();
        }
    }
}

#[test]
fn a_palette_too_small_still_gets_a_colouring_with_the_minimum() {
    // Regression: with more colours needed than the palette has, the report gave the minimum
    // and an empty colouring. K8 needs 8 colours (common practice); queen6_6 and queen7_7 need 7
    // (the DIMACS colouring benchmark table).
    let (q6, q6_edges) = queen(6);
    let (q7, q7_edges) = queen(7);
    for (n, edges, colours) in [(8, complete(8), 8), (q6, q6_edges, 7), (q7, q7_edges, 7)] {
        let p = ColouringProblem::new(graph(n, &edges), 6);
        let r = run(&p, &SolveOptions::default());
        assert_eq!(r.minimum, Some(colours));
        assert!(r.proven && r.palette_too_small);
        let c = r
            .colouring
            .expect("a colouring, with slots past the palette");
        assert_eq!(colour_count(&c), colours);
        assert_eq!(c.iter().max(), Some(&(colours - 1)), "the lowest slots");
    }
}

/// Solves and raises the cancellation flag as soon as the search turns to obstructions, so the
/// minimum is settled and everything after it is cut short.
fn cancelled_at_the_evidence(p: &ColouringProblem) -> ColouringReport {
    let cancel = AtomicBool::new(false);
    let r = solve(p, &SolveOptions::default(), &cancel, &mut |progress| {
        if progress.stage == Stage::Obstruction {
            cancel.store(true, std::sync::atomic::Ordering::Relaxed);
        }
    })
    .unwrap();
    if let Some(c) = &r.colouring {
        check_colouring(p, c).unwrap();
    }
    r
}

#[test]
fn a_proven_minimum_is_never_stopped_and_what_was_cut_short_is_named() {
    // Regression: "proven": true came with "stopped": true when the time ran out while shrinking
    // an obstruction. The 23-vertex Mycielski graph needs 5 (Mycielski 1955).
    let (n, edges) = mycielski(5);
    let r = cancelled_at_the_evidence(&ColouringProblem::new(graph(n, &edges), 8));
    assert_eq!((r.minimum, r.proven, r.stopped), (Some(5), true, false));
    assert!(
        r.stopped_parts
            .contains(&StoppedPart::ThreeColourObstruction)
    );
    assert!(r.stopped_parts.contains(&StoppedPart::MinimumObstruction));
    assert_eq!(r.three_colourable, Some(false));
    // Cancelled before anything: the minimum is what is unproven.
    let cancel = AtomicBool::new(true);
    let p = ColouringProblem::new(graph(n, &edges), 8);
    let r = solve(&p, &SolveOptions::default(), &cancel, &mut |_| {}).unwrap();
    assert!(r.stopped && !r.proven);
}

#[test]
fn the_8x8_queen_graph_gets_nine_colours_proven_and_a_close_first_bound() {
    // queen8_8: chromatic number 9, clique number 8 (the DIMACS colouring benchmark table).
    // Regression: the first upper bound was 12, three above the optimum, and with a 10 s limit
    // the answer stayed there. The first bound must be within one colour; the minimum proven.
    let (n, edges) = queen(8);
    let p = ColouringProblem::new(graph(n, &edges), 6);
    let cancel = AtomicBool::new(false);
    let mut first_upper = None;
    let r = solve(&p, &SolveOptions::default(), &cancel, &mut |progress| {
        if first_upper.is_none() {
            first_upper = progress.upper_bound;
        }
        if progress.stage == Stage::Obstruction {
            cancel.store(true, std::sync::atomic::Ordering::Relaxed);
        }
    })
    .unwrap();
    assert!(first_upper.is_some_and(|u| u <= 10), "{first_upper:?}");
    assert_eq!((r.minimum, r.proven, r.stopped), (Some(9), true, false));
    assert_eq!(
        r.lower_bound.evidence,
        BoundEvidence::Refuted { colours: 8 }
    );
}

#[test]
fn an_obstruction_leans_on_pins_only_when_they_are_needed() {
    // Regression: a map whose three-colour obstruction holds without its pins was reported as
    // "pinned", and the argument began from a pin. The Grötzsch graph (triangle-free, no odd
    // wheel, needs 4: Grötzsch 1959) with a pin on one vertex: the obstruction needs no pin.
    let (n, edges) = mycielski(4);
    let mut p = ColouringProblem::new(graph(n, &edges), 6);
    p.pins = vec![Some(2)];
    let r = run(&p, &SolveOptions::default());
    let o = r.obstruction.expect("three colours fail");
    assert!(o.pins.is_empty(), "{:?}", o.pins);
    assert_ne!(o.kind, ObstructionKind::Pinned);
    let steps = o.argument.expect("a small argument");
    assert!(steps.iter().all(|s| s.pinned_slot.is_none()));

    // A star whose three leaves are pinned to three different slots leaves its centre no
    // colour; a fourth pin elsewhere plays no part (common practice). The obstruction names
    // exactly the three pins it needs.
    let edges = [(0, 1), (0, 2), (0, 3), (4, 5)];
    let mut p = ColouringProblem::new(graph(6, &edges), 6);
    p.pins = vec![None, Some(0), Some(1), Some(2), Some(0)];
    let r = run(&p, &SolveOptions::default());
    let o = r.obstruction.expect("three colours fail with these pins");
    assert_eq!(o.kind, ObstructionKind::Pinned);
    assert_eq!(o.vertices, vec![0, 1, 2, 3]);
    assert_eq!(o.pins, vec![(1, 0), (2, 1), (3, 2)]);
}

#[test]
fn a_bound_beyond_the_largest_clique_comes_with_a_checked_obstruction() {
    // The 23-vertex Mycielski graph needs 5 colours and has no triangle (Mycielski 1955): its
    // bound needs evidence of its own, an obstruction to 4 colours with a DRAT proof.
    let (n, edges) = mycielski(5);
    let r = chromatic(n, &edges, &SolveOptions::default());
    assert_eq!(r.minimum, Some(5));
    let o = r.minimum_obstruction.expect("an obstruction to 4 colours");
    assert_eq!(o.colours, 4);
    assert!(o.vertex_critical);
    // (`run` has checked its refutation; check that the proof is not trivial either.)
    let proof = o.refutation.unwrap();
    assert!(proof.drat.lines().count() > 1);
    // K5 needs 5 because of its clique alone: no obstruction is needed beyond it.
    let r = chromatic(5, &complete(5), &SolveOptions::default());
    assert!(r.minimum_obstruction.is_none());
}
