//! Fewest relaxations for a flat drawing: cases known by construction, a brute-force oracle over
//! every subset of soft edges, the document mapping, the command line and the world map under
//! the queen rule. Every answer goes through the independent checker.

use std::sync::atomic::AtomicBool;

use proptest::prelude::*;
use tinct::engine::certify::check_planar_relaxation;
use tinct::engine::planarity::{KuratowskiKind, is_planar};
use tinct::engine::relax::{
    PlanarRelaxProblem, PlanarRelaxReport, RelaxOptions, SoftEdge, relax_planar,
};
use tinct::engine::{Graph, Vertex};

use super::support::generators::complete;

/// Runs the search and the independent checker; returns the report.
fn solve(problem: &PlanarRelaxProblem) -> PlanarRelaxReport {
    let cancel = AtomicBool::new(false);
    let report = relax_planar(problem, &RelaxOptions::default(), &cancel, &mut |_| {}).unwrap();
    let check = check_planar_relaxation(problem, &report).unwrap();
    assert_eq!(check.obstructions, report.obstructions.len());
    if report.proven_optimal {
        assert_eq!(check.proven_lower_bound, report.cost);
    }
    assert_eq!(check.faces.is_some(), report.relaxation.is_some());
    report
}

fn soft(u: Vertex, v: Vertex, cost: u64) -> SoftEdge {
    SoftEdge { u, v, cost }
}

/// K3,3 with sides {0, 1, 2} and {3, 4, 5}.
fn k33() -> Vec<(Vertex, Vertex)> {
    (0..3).flat_map(|a| (3..6).map(move |b| (a, b))).collect()
}

/// The problem with the listed pairs soft (cost given) and every other edge hard.
fn with_soft(
    n: usize,
    edges: &[(Vertex, Vertex)],
    soft_edges: &[(Vertex, Vertex, u64)],
) -> PlanarRelaxProblem {
    let is_soft = |&(a, b): &(Vertex, Vertex)| soft_edges.iter().any(|&(u, v, _)| (u, v) == (a, b));
    PlanarRelaxProblem {
        vertex_count: n,
        hard: edges.iter().copied().filter(|e| !is_soft(e)).collect(),
        soft: soft_edges.iter().map(|&(u, v, c)| soft(u, v, c)).collect(),
    }
}

#[test]
fn k5_with_one_soft_edge_drops_that_edge() {
    // By construction: K5 is not planar and K5 minus any edge is (Kuratowski 1930).
    let problem = with_soft(5, &complete(5), &[(1, 3, 4)]);
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![0]));
    assert_eq!(r.cost, Some(4));
    assert!(r.proven_optimal);
    assert_eq!(r.obstructions.len(), 1);
    assert_eq!(r.obstructions[0].kuratowski.kind, KuratowskiKind::K5);
    assert_eq!(r.obstructions[0].soft, vec![0]);
}

#[test]
fn k33_with_two_soft_edges_drops_either_at_cost_one() {
    // By construction: K3,3 minus any edge is planar, so one of the two soft edges suffices.
    let problem = with_soft(6, &k33(), &[(0, 3, 1), (1, 4, 1)]);
    let r = solve(&problem);
    assert_eq!(r.cost, Some(1));
    assert!(r.proven_optimal);
    assert_eq!(r.relaxation.as_ref().unwrap().len(), 1);
    assert_eq!(r.obstructions[0].kuratowski.kind, KuratowskiKind::K33);
    assert_eq!(r.obstructions[0].soft, vec![0, 1]);
}

#[test]
fn two_disjoint_k5s_cost_two() {
    // By construction: each K5 needs one of its own soft edges dropped; they share nothing.
    let mut edges = complete(5);
    edges.extend(complete(5).into_iter().map(|(a, b)| (a + 5, b + 5)));
    edges.push((4, 5));
    let problem = with_soft(10, &edges, &[(0, 1, 1), (2, 3, 1), (5, 6, 1), (7, 9, 1)]);
    let r = solve(&problem);
    assert_eq!(r.cost, Some(2));
    assert!(r.proven_optimal);
    let dropped = r.relaxation.unwrap();
    assert_eq!(dropped.iter().filter(|&&j| j < 2).count(), 1);
    assert_eq!(dropped.iter().filter(|&&j| j >= 2).count(), 1);
    assert!(r.obstructions.len() >= 2);
}

#[test]
fn a_hard_k5_cannot_be_relaxed_and_says_so() {
    // By construction: a K5 of hard edges stays whatever soft edge goes.
    let mut problem = with_soft(6, &complete(5), &[]);
    problem.soft.push(soft(0, 5, 1));
    let r = solve(&problem);
    assert!(r.infeasible && !r.proven_optimal);
    assert_eq!(r.relaxation, None);
    let last = r.obstructions.last().unwrap();
    assert!(last.soft.is_empty());
    assert_eq!(last.kuratowski.kind, KuratowskiKind::K5);
    assert_eq!(last.kuratowski.branch_vertices, vec![0, 1, 2, 3, 4]);
}

#[test]
fn the_cheapest_flat_answer_is_the_larger_set() {
    // By construction: K3,3 (sides {0,1,2}, {3,4,5}) plus a second route 0-6-3 beside edge 0-3.
    // Every Kuratowski subgraph uses 1-4 and one of the two routes, so the sets to hit are
    // {0-3, 1-4} and {0-6, 1-4}: dropping 1-4 costs 5, dropping 0-3 and 0-6 costs 2 + 2.
    let mut edges = k33();
    edges.extend([(0, 6), (3, 6)]);
    let problem = with_soft(7, &edges, &[(0, 3, 2), (0, 6, 2), (1, 4, 5)]);
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![0, 1]));
    assert_eq!(r.cost, Some(4));
    assert!(r.proven_optimal);
}

#[test]
fn a_planar_graph_drops_nothing() {
    // By construction: K4 is planar.
    let problem = with_soft(4, &complete(4), &[(0, 1, 1)]);
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![]));
    assert!(r.proven_optimal && r.obstructions.is_empty());
}

#[test]
fn a_pair_named_twice_is_refused() {
    let mut problem = with_soft(5, &complete(5), &[(0, 1, 1)]);
    problem.hard.push((1, 0));
    let cancel = AtomicBool::new(false);
    assert!(relax_planar(&problem, &RelaxOptions::default(), &cancel, &mut |_| {}).is_err());
}

#[test]
fn the_planar_checker_rejects_a_wrong_answer() {
    // The checker must be able to fail: a relaxation that leaves a K5, a cost that lies, an
    // obstruction whose soft list is wrong or which is not in the graph, and a claimed optimum
    // the obstructions do not prove.
    let mut edges = complete(5);
    edges.extend(complete(5).into_iter().map(|(a, b)| (a + 5, b + 5)));
    let problem = with_soft(10, &edges, &[(0, 1, 1), (5, 6, 1)]);
    let good = solve(&problem);
    let mut bad = good.clone();
    bad.relaxation = Some(vec![0]);
    bad.cost = Some(1);
    assert!(check_planar_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.cost = Some(1);
    assert!(check_planar_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.obstructions[0].soft.clear();
    assert!(check_planar_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.obstructions[0].kuratowski.edges.pop();
    assert!(check_planar_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.obstructions.pop();
    assert!(check_planar_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.embedding = None;
    assert!(check_planar_relaxation(&problem, &bad).is_err());
}

fn planar(n: usize, edges: &[(Vertex, Vertex)]) -> bool {
    let (g, _) = Graph::from_edges(n, edges).unwrap();
    is_planar(&g, &AtomicBool::new(false), &mut |_| {}).unwrap()
}

/// Small random graphs: each of the pairs of up to 8 vertices is left out, hard or soft (at most
/// 8 soft, costs 1 to 3), dense enough that most are not planar.
fn problem_strategy() -> impl Strategy<Value = PlanarRelaxProblem> {
    (5usize..=8).prop_flat_map(|n| {
        let pairs = n * (n - 1) / 2;
        proptest::collection::vec((0u8..10, 1u64..=3), pairs).prop_map(move |choice| {
            let mut problem = PlanarRelaxProblem {
                vertex_count: n,
                hard: Vec::new(),
                soft: Vec::new(),
            };
            let all = (0..n as Vertex).flat_map(|a| (a + 1..n as Vertex).map(move |b| (a, b)));
            for ((a, b), (x, cost)) in all.zip(choice) {
                if x < 3 && problem.soft.len() < 8 {
                    problem.soft.push(soft(a, b, cost));
                } else if x < 8 {
                    problem.hard.push((a, b));
                }
            }
            problem
        })
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(128))]

    #[test]
    fn least_cost_flat_equals_brute_force_over_all_subsets(problem in problem_strategy()) {
        let r = solve(&problem);
        let m = problem.soft.len();
        let best = (0u32..1 << m)
            .filter(|mask| {
                let mut edges = problem.hard.clone();
                edges.extend((0..m).filter(|j| mask & (1 << j) == 0).map(|j| (problem.soft[j].u, problem.soft[j].v)));
                planar(problem.vertex_count, &edges)
            })
            .map(|mask| (0..m).filter(|j| mask & (1 << j) != 0).map(|j| problem.soft[j].cost).sum::<u64>())
            .min();
        prop_assert!(r.proven_optimal || r.infeasible);
        prop_assert_eq!(r.cost, best);
        prop_assert_eq!(r.infeasible, best.is_none());
    }
}

// ---- The document mapping, its edit, the command line and real data ----

use tinct::analysis::relax::{
    Allowed, Relaxation, fewest_relaxations_planar_uncontrolled, planar_relaxation_edit,
};
use tinct::doc::{ConstraintGraph, Document, RegionId, RegionPair};
use tinct::engine::certify::check_embedding;
use tinct::engine::planarity::{Planarity, planarity};

use super::relax::demo_map;

/// The borders of a document can be drawn flat: the engine's verdict, its embedding checked.
fn drawn_flat(doc: &Document) -> bool {
    let cg = ConstraintGraph::build(doc);
    match planarity(&cg.graph, &AtomicBool::new(false), &mut |_| {}).unwrap() {
        Planarity::Planar(e) => {
            check_embedding(&cg.graph, &e).unwrap();
            true
        }
        Planarity::NonPlanar(_) => false,
    }
}

#[test]
fn the_demo_map_is_drawn_flat_without_its_one_corner_contact() {
    // By construction (invented demo map, tests/relax.rs): Ashby, Brell, Corlen, Esk and Fallow
    // all touch, Ashby and Corlen only at a corner, so the K5 they form is broken by that corner
    // alone; Dunmere is in Ashby's group, so the hand-made border between them lies inside one
    // vertex and is not a candidate.
    let doc = demo_map();
    assert!(!drawn_flat(&doc));
    let v = fewest_relaxations_planar_uncontrolled(
        &doc,
        &Allowed::default(),
        std::time::Duration::from_secs(30),
    )
    .unwrap();
    let check = v.check.as_ref().unwrap();
    assert!(v.report.proven_optimal);
    let corner = Relaxation::Border {
        pair: RegionPair::new(RegionId(1), RegionId(3)).unwrap(),
        kind: "corner",
    };
    assert_eq!(v.relaxations(), vec![corner]);
    assert_eq!(
        v.summary(&doc),
        "the corner contact of Ashby and Corlen makes these borders impossible to draw flat"
    );
    let obstacles = v.obstacles();
    assert_eq!(obstacles.len(), 1);
    assert_eq!(obstacles[0].kind, "K5");
    assert_eq!(obstacles[0].candidates, vec![corner]);
    // Euler's formula: 6 vertices (Ashby with Dunmere as one), 10 borders, connected: 6 faces.
    assert_eq!(check.faces, Some(6));
    // Applied as one undoable edit; the border stays on record, suppressed.
    let mut relaxed = doc.clone();
    let undo = relaxed
        .apply(planar_relaxation_edit(&doc, &v.relaxations()).unwrap())
        .unwrap();
    assert_eq!(relaxed.borders().len(), doc.borders().len());
    assert!(relaxed.borders().values().filter(|b| b.suppressed).count() == 1);
    assert!(drawn_flat(&relaxed));
    relaxed.apply(undo).unwrap();
    assert_eq!(relaxed, doc);
    // With no kind allowed, nothing helps, and the K5 shows why.
    let none = Allowed::parse("", tinct::doc::Units::Unitless).unwrap();
    let v = fewest_relaxations_planar_uncontrolled(&doc, &none, std::time::Duration::from_secs(30))
        .unwrap();
    v.check.as_ref().unwrap();
    assert!(v.report.infeasible);
    assert!(v.summary(&doc).contains("cannot be drawn flat whatever"));
}

#[test]
fn relax_planar_on_the_command_line_prints_words_json_and_applies() {
    use super::support::{stderr, stdout, tinct_path};
    let dir = tempfile::tempdir().unwrap();
    let project = dir.path().join("demo.tinct");
    tinct::formats::save(&demo_map(), &project).unwrap();
    let out = tinct_path(&["relax"], &project, &["--planar"]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let text = stdout(&out);
    assert!(
        text.contains(
            "the corner contact of Ashby and Corlen makes these borders impossible to draw flat"
        ),
        "{text}"
    );
    assert!(text.contains("this is the fewest"), "{text}");
    let out = tinct_path(&["relax"], &project, &["--planar", "--json"]);
    let json: serde_json::Value = serde_json::from_str(&stdout(&out)).unwrap();
    assert_eq!(json["planar"], true);
    assert_eq!(json["cost"], 1);
    assert_eq!(json["proven_optimal"], true);
    assert!(json.get("colouring").is_none() && json.get("colours").is_none());
    assert_eq!(json["evidence"]["checked"], true);
    assert_eq!(json["evidence"]["embedding"]["faces"], 6);
    let k = &json["evidence"]["kuratowski"][0];
    assert_eq!(k["kind"], "K5");
    assert_eq!(k["branch_regions"].as_array().unwrap().len(), 5);
    assert_eq!(k["candidates"][0]["kind"], "corner");
    assert_eq!(json["relaxations"][0]["a"], 1);
    assert_eq!(json["relaxations"][0]["b"], 3);
    // Both questions at once, or neither, is bad input (exit 2) with a clear message.
    let out = tinct_path(&["relax"], &project, &["--planar", "--colours", "4"]);
    assert_eq!(out.status.code(), Some(2));
    assert!(
        stderr(&out).contains("give one of them"),
        "{}",
        stderr(&out)
    );
    let out = tinct_path(&["relax"], &project, &[]);
    assert_eq!(out.status.code(), Some(2));
    // --apply writes a project whose borders are drawn flat as they are.
    let relaxed = dir.path().join("relaxed.tinct");
    let out = tinct_path(
        &["relax"],
        &project,
        &["--planar", "--apply", "--out", relaxed.to_str().unwrap()],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let out = tinct_path(&["relax"], &relaxed, &["--planar", "--json"]);
    let json: serde_json::Value = serde_json::from_str(&stdout(&out)).unwrap();
    assert_eq!(json["cost"], 0);
}

fn world(file: &str) -> Document {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("tests/data/geo")
        .join(file);
    let options = tinct::geo::ImportOptions {
        rule: tinct::geo::Rule::Queen,
        ..Default::default()
    };
    tinct::geo::import_path(&path, &options)
        .unwrap()
        .into_document(file)
}

fn region(doc: &Document, name: &str) -> RegionId {
    doc.regions()
        .iter()
        .find(|(_, r)| r.name == name)
        .map(|(&id, _)| id)
        .unwrap()
}

#[test]
fn the_world_under_the_queen_rule_is_drawn_flat_without_turkey_touching_azerbaijan() {
    // Source: Natural Earth 1:110m countries (npm world-atlas 2.0.2,
    // tests/data/geo/PROVENANCE.md), imported by Tinct under the queen rule. At this scale
    // Turkey meets Azerbaijan's exclave (Nakhchivan) at a single point, which Tinct marks as a
    // corner contact; Tinct's planarity test finds the map not planar (a K3,3 through the
    // Caucasus). The answer must be that one corner contact, proven fewest and checked.
    let doc = world("world110m.topojson");
    assert!(!drawn_flat(&doc));
    let v = fewest_relaxations_planar_uncontrolled(
        &doc,
        &Allowed::default(),
        std::time::Duration::from_secs(120),
    )
    .unwrap();
    v.check.as_ref().unwrap();
    assert!(v.report.proven_optimal && !v.report.stopped);
    let turkey_azerbaijan =
        RegionPair::new(region(&doc, "Turkey"), region(&doc, "Azerbaijan")).unwrap();
    assert_eq!(
        v.relaxations(),
        vec![Relaxation::Border {
            pair: turkey_azerbaijan,
            kind: "corner"
        }]
    );
    let summary = v.summary(&doc);
    assert!(
        summary.contains("makes these borders impossible to draw flat"),
        "{summary}"
    );
    assert!(
        summary.contains("Turkey") && summary.contains("Azerbaijan"),
        "{summary}"
    );
    // Every Kuratowski subgraph of the evidence goes through that corner contact.
    for o in v.obstacles() {
        assert_eq!(
            o.candidates,
            vec![Relaxation::Border {
                pair: turkey_azerbaijan,
                kind: "corner"
            }]
        );
    }
    let mut relaxed = doc.clone();
    relaxed
        .apply(planar_relaxation_edit(&doc, &v.relaxations()).unwrap())
        .unwrap();
    assert!(drawn_flat(&relaxed));
}

#[test]
fn the_caucasus_at_1_to_50m_is_already_flat() {
    // Source: Natural Earth 1:50m (npm world-atlas 2.0.2, tests/data/geo/PROVENANCE.md): at this
    // scale Turkey and Azerbaijan share a border of about 7 km (Tinct's import), not a point, and
    // the five countries' nine borders are K5 less Georgia-Iran, which is planar; nothing is
    // dropped.
    let doc = world("world50m_caucasus.topojson");
    assert!(drawn_flat(&doc));
    let v = fewest_relaxations_planar_uncontrolled(
        &doc,
        &Allowed::default(),
        std::time::Duration::from_secs(30),
    )
    .unwrap();
    v.check.as_ref().unwrap();
    assert_eq!(v.report.relaxation, Some(vec![]));
    assert!(v.summary(&doc).contains("can be drawn flat as they are"));
}
