//! Fewest relaxations: cases whose answers are known by construction, a brute-force oracle over
//! every subset of soft items, the document mapping and its edit, the command line, and the US
//! counties. Every answer goes through the independent checker.

use std::sync::atomic::AtomicBool;

use proptest::prelude::*;
use tinct::engine::certify::{check_relaxation, obstruction_cnf};
use tinct::engine::relax::{Constraint, RelaxOptions, RelaxProblem, RelaxReport, SoftItem, relax};

use super::support::generators::{complete, wheel};

/// Runs the search and the independent checker; returns the report.
fn solve(problem: &RelaxProblem) -> RelaxReport {
    let cancel = AtomicBool::new(false);
    let report = relax(problem, &RelaxOptions::default(), &cancel, &mut |_| {}).unwrap();
    let check = check_relaxation(problem, &report).unwrap();
    assert_eq!(check.obstructions, report.obstructions.len());
    if report.proven_optimal {
        assert_eq!(check.proven_lower_bound, report.cost);
    }
    report
}

fn soft(constraint: Constraint, cost: u64) -> SoftItem {
    SoftItem { constraint, cost }
}

fn differ(edges: &[(u32, u32)]) -> Vec<Constraint> {
    edges
        .iter()
        .map(|&(u, v)| Constraint::Differ(u, v))
        .collect()
}

#[test]
fn disjoint_k5s_joined_by_paths_lose_one_edge_each() {
    // By construction: K5 needs 5 colours, K5 minus an edge needs 4, and paths need 2; so with
    // every edge soft at cost 1, the answer drops exactly one edge of each K5, and each K5 is an
    // obstruction.
    for copies in 1..=4u32 {
        let mut edges = Vec::new();
        let mut n = 0;
        let mut hubs = Vec::new();
        for _ in 0..copies {
            edges.extend(complete(5).into_iter().map(|(a, b)| (a + n, b + n)));
            hubs.push(n);
            n += 5;
        }
        // Paths of two new vertices between consecutive K5s.
        for w in hubs.windows(2) {
            edges.extend([(w[0], n), (n, n + 1), (n + 1, w[1])]);
            n += 2;
        }
        let problem = RelaxProblem {
            vertex_count: n as usize,
            hard: Vec::new(),
            soft: differ(&edges).into_iter().map(|c| soft(c, 1)).collect(),
            colours: 4,
        };
        let r = solve(&problem);
        assert!(r.proven_optimal);
        assert_eq!(r.cost, Some(u64::from(copies)));
        let dropped = r.relaxation.unwrap();
        for copy in 0..copies {
            let inside = |v: u32| (copy * 5..copy * 5 + 5).contains(&v);
            let count = dropped
                .iter()
                .filter(|&&j| match problem.soft[j].constraint {
                    Constraint::Differ(a, b) => inside(a) && inside(b),
                    _ => false,
                })
                .count();
            assert_eq!(count, 1, "copy {copy}");
        }
        for o in &r.obstructions {
            assert_eq!(o.vertices.len(), 5);
            assert_eq!(o.soft.len(), 10);
        }
    }
}

#[test]
fn k5_with_one_soft_edge_drops_that_edge() {
    // By construction: the only soft edge of a K5 must go.
    let edges = complete(5);
    let problem = RelaxProblem {
        vertex_count: 5,
        hard: differ(&edges[1..]),
        soft: vec![soft(Constraint::Differ(edges[0].0, edges[0].1), 7)],
        colours: 4,
    };
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![0]));
    assert_eq!(r.cost, Some(7));
    assert!(r.proven_optimal);
}

#[test]
fn odd_wheel_needs_one_edge_dropped_for_three_colours() {
    // By construction: an odd wheel (hub and a 5-cycle) needs 4 colours, and without any one of
    // its edges 3 do. No K4 inside, so the proof needs real lemmas.
    let problem = RelaxProblem {
        vertex_count: 6,
        hard: Vec::new(),
        soft: differ(&wheel(5)).into_iter().map(|c| soft(c, 1)).collect(),
        colours: 3,
    };
    let r = solve(&problem);
    assert_eq!(r.cost, Some(1));
    assert!(r.proven_optimal);
    assert_eq!(r.obstructions[0].vertices.len(), 6);
}

#[test]
fn hard_k5_cannot_be_relaxed_and_says_why() {
    // By construction: a K5 of hard edges needs 5 colours whatever soft items are dropped.
    let mut soft_items = vec![soft(Constraint::Pin(0, 1), 1)];
    soft_items.push(soft(Constraint::Differ(0, 5), 1));
    let problem = RelaxProblem {
        vertex_count: 6,
        hard: differ(&complete(5)),
        soft: soft_items,
        colours: 4,
    };
    let r = solve(&problem);
    assert!(r.infeasible);
    assert_eq!(r.relaxation, None);
    let last = r.obstructions.last().unwrap();
    assert!(last.soft.is_empty());
    assert_eq!(last.vertices, vec![0, 1, 2, 3, 4]);
}

#[test]
fn two_pinned_neighbours_lose_one_pin() {
    // By construction: neighbours pinned to the same colour; the border is hard, so one pin goes,
    // the cheaper one.
    let problem = RelaxProblem {
        vertex_count: 2,
        hard: vec![Constraint::Differ(0, 1)],
        soft: vec![
            soft(Constraint::Pin(0, 2), 3),
            soft(Constraint::Pin(1, 2), 2),
        ],
        colours: 4,
    };
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![1]));
    assert!(r.proven_optimal);
    let colouring = r.colouring.unwrap();
    assert_eq!(colouring[0], 2);
}

#[test]
fn a_pin_outside_the_colours_must_go() {
    // By construction: colour 5 does not exist among 4 colours.
    let problem = RelaxProblem {
        vertex_count: 1,
        hard: Vec::new(),
        soft: vec![soft(Constraint::Pin(0, 5), 1)],
        colours: 4,
    };
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![0]));
}

#[test]
fn a_group_whose_members_border_each_other_loses_one_membership() {
    // By construction: regions 0 and 1 border each other; both belong to a same-colour group
    // (vertex 2 stands for the group's colour). One membership must go.
    let problem = RelaxProblem {
        vertex_count: 3,
        hard: vec![Constraint::Differ(0, 1)],
        soft: vec![
            soft(Constraint::Same(0, 2), 1),
            soft(Constraint::Same(1, 2), 1),
        ],
        colours: 4,
    };
    let r = solve(&problem);
    assert_eq!(r.cost, Some(1));
    assert!(r.proven_optimal);
    assert_eq!(r.obstructions[0].soft, vec![0, 1]);
}

#[test]
fn the_cheapest_answer_is_not_the_smallest() {
    // By construction: two K4s sharing the edge ab need 4 colours; dropping ab (cost 5) or one
    // other edge of each K4 (cost 2 + 2) leaves 3-colourable graphs, so the answer is two edges at
    // cost 4, not the single edge.
    let (a, b) = (0, 1);
    let mut edges = vec![(a, b)];
    for (c, d) in [(2, 3), (4, 5)] {
        edges.extend([(a, c), (a, d), (b, c), (b, d), (c, d)]);
    }
    let items: Vec<SoftItem> = differ(&edges)
        .into_iter()
        .enumerate()
        .map(|(i, c)| soft(c, if i == 0 { 5 } else { 2 }))
        .collect();
    let problem = RelaxProblem {
        vertex_count: 6,
        hard: Vec::new(),
        soft: items,
        colours: 3,
    };
    let r = solve(&problem);
    assert_eq!(r.cost, Some(4));
    assert_eq!(r.relaxation.as_ref().unwrap().len(), 2);
    assert!(!r.relaxation.unwrap().contains(&0));
    assert!(r.proven_optimal);
}

#[test]
fn a_colourable_problem_drops_nothing() {
    // By construction: a 5-cycle needs 3 colours.
    let edges: Vec<(u32, u32)> = (0..5).map(|i| (i, (i + 1) % 5)).collect();
    let problem = RelaxProblem {
        vertex_count: 5,
        hard: differ(&edges),
        soft: vec![soft(Constraint::Pin(0, 0), 1)],
        colours: 3,
    };
    let r = solve(&problem);
    assert_eq!(r.relaxation, Some(vec![]));
    assert!(r.proven_optimal && r.obstructions.is_empty());
}

#[test]
fn the_checker_rejects_a_wrong_answer() {
    // The checker must be able to fail: a colouring that breaks a kept edge, a cost that lies,
    // an obstruction with another's proof, and a claimed optimum the obstructions do not prove.
    let edges = complete(5);
    let problem = RelaxProblem {
        vertex_count: 5,
        hard: Vec::new(),
        soft: differ(&edges).into_iter().map(|c| soft(c, 1)).collect(),
        colours: 4,
    };
    let good = solve(&problem);
    let mut bad = good.clone();
    let kept = (0..problem.soft.len())
        .find(|j| !good.relaxation.as_ref().unwrap().contains(j))
        .unwrap();
    let Constraint::Differ(u, v) = problem.soft[kept].constraint else {
        unreachable!("every item is an edge")
    };
    bad.colouring.as_mut().unwrap()[u as usize] = bad.colouring.as_ref().unwrap()[v as usize];
    assert!(check_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.cost = Some(0);
    assert!(check_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.obstructions[0].soft.pop();
    assert!(check_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.obstructions.clear();
    assert!(check_relaxation(&problem, &bad).is_err());
    let mut bad = good.clone();
    bad.obstructions[0].drat = "0\n".into();
    assert!(check_relaxation(&problem, &bad).is_err());
}

#[test]
fn proof_files_for_outside_checkers() {
    // The odd wheel and the two K4s have no refutation by unit propagation alone. With
    // TINCT_PROOF_DIR set, each obstruction's CNF (rebuilt by the checker) and its DRAT proof are
    // written for tests/scripts/check_drat.py, which runs dratify (PyPI), a checker independent
    // of Tinct; here they pass Tinct's own checker.
    let dir = std::env::var_os("TINCT_PROOF_DIR").map(std::path::PathBuf::from);
    let wheel_problem = RelaxProblem {
        vertex_count: 8,
        hard: Vec::new(),
        soft: differ(&wheel(7)).into_iter().map(|c| soft(c, 1)).collect(),
        colours: 3,
    };
    let k5 = RelaxProblem {
        vertex_count: 5,
        hard: differ(&complete(5)[1..]),
        soft: vec![soft(Constraint::Differ(0, 1), 1)],
        colours: 4,
    };
    for (name, problem) in [("relax-wheel7", wheel_problem), ("relax-k5", k5)] {
        let r = solve(&problem);
        for (i, o) in r.obstructions.iter().enumerate() {
            let cnf = obstruction_cnf(&problem, o).unwrap();
            assert!(tinct::engine::colouring::check_drat(&cnf, &o.drat).is_ok());
            outside_solver_refutes(&cnf, name);
            if let Some(dir) = &dir {
                std::fs::create_dir_all(dir).unwrap();
                std::fs::write(dir.join(format!("{name}-{i}.cnf")), &cnf).unwrap();
                std::fs::write(dir.join(format!("{name}-{i}.drat")), &o.drat).unwrap();
            }
        }
    }
}

/// An outside SAT solver, PicoSAT (Debian `picosat`, Biere 2008), must find `cnf` unsatisfiable
/// (its exit status 20; 10 means satisfiable). CI installs it and sets
/// `TINCT_REQUIRE_SAT_SOLVER=1`; elsewhere a machine without it skips this check.
fn outside_solver_refutes(cnf: &str, what: &str) {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("obstruction.cnf");
    std::fs::write(&path, cnf).unwrap();
    match std::process::Command::new("picosat").arg(&path).output() {
        Ok(out) => assert_eq!(
            out.status.code(),
            Some(20),
            "{what}: PicoSAT does not find the obstruction unsatisfiable: {}",
            String::from_utf8_lossy(&out.stdout)
                .lines()
                .next()
                .unwrap_or("")
        ),
        Err(e) => assert!(
            std::env::var_os("TINCT_REQUIRE_SAT_SOLVER").is_none(),
            "TINCT_REQUIRE_SAT_SOLVER is set but picosat cannot run: {e}"
        ),
    }
}

/// k-colourability of small problems by plain backtracking (the oracle).
fn colourable(n: usize, constraints: &[Constraint], k: u32) -> bool {
    fn go(v: usize, n: usize, cs: &[Constraint], k: u32, col: &mut Vec<u32>) -> bool {
        if v == n {
            return true;
        }
        for c in 0..k {
            col.push(c);
            let ok = cs.iter().all(|cons| match *cons {
                Constraint::Differ(a, b) if (a as usize) <= v && (b as usize) <= v => {
                    col[a as usize] != col[b as usize]
                }
                Constraint::Same(a, b) if (a as usize) <= v && (b as usize) <= v => {
                    col[a as usize] == col[b as usize]
                }
                Constraint::Pin(a, p) if (a as usize) <= v => col[a as usize] == p,
                _ => true,
            });
            if ok && go(v + 1, n, cs, k, col) {
                return true;
            }
            col.pop();
        }
        false
    }
    go(0, n, constraints, k, &mut Vec::new())
}

fn constraint_strategy(n: u32) -> impl Strategy<Value = Constraint> {
    prop_oneof![
        6 => (0..n, 0..n).prop_filter("distinct", |(a, b)| a != b).prop_map(|(a, b)| Constraint::Differ(a, b)),
        1 => (0..n, 0..n).prop_filter("distinct", |(a, b)| a != b).prop_map(|(a, b)| Constraint::Same(a, b)),
        1 => (0..n, 0..4u32).prop_map(|(a, c)| Constraint::Pin(a, c)),
    ]
}

fn problem_strategy() -> impl Strategy<Value = RelaxProblem> {
    (3u32..=9, 2u32..=4).prop_flat_map(|(n, k)| {
        (
            proptest::collection::vec(
                (0..n, 0..n)
                    .prop_filter("distinct", |(a, b)| a != b)
                    .prop_map(|(a, b)| Constraint::Differ(a, b)),
                0..=(2 * n as usize),
            ),
            proptest::collection::vec((constraint_strategy(n), 1u64..=3), 0..=8),
        )
            .prop_map(move |(hard, soft)| RelaxProblem {
                vertex_count: n as usize,
                hard,
                soft: soft
                    .into_iter()
                    .map(|(constraint, cost)| SoftItem { constraint, cost })
                    .collect(),
                colours: k,
            })
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]

    #[test]
    fn least_cost_equals_brute_force_over_all_subsets(problem in problem_strategy()) {
        let r = solve(&problem);
        let m = problem.soft.len();
        let best = (0u32..1 << m)
            .filter(|mask| {
                let mut cs = problem.hard.clone();
                cs.extend((0..m).filter(|j| mask & (1 << j) == 0).map(|j| problem.soft[j].constraint));
                colourable(problem.vertex_count, &cs, problem.colours)
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
    Allowed, Relaxation, fewest_relaxations_uncontrolled, relaxation_edit,
};
use tinct::doc::{
    Border, BorderKind, ConstraintGraph, Document, DocumentBuilder, Edit, Group, GroupId, Region,
    RegionId, RegionPair, Settings, Units,
};

fn pair(a: u64, b: u64) -> RegionPair {
    RegionPair::new(RegionId(a), RegionId(b)).unwrap()
}

/// Checks a region colouring against the document's own rules, read from the document (active
/// borders, groups, pins), not from the relaxation problem.
fn honours_every_rule(doc: &Document, colours: &std::collections::BTreeMap<RegionId, u32>, k: u32) {
    for (p, _) in doc.active_borders() {
        assert_ne!(colours[&p.a()], colours[&p.b()], "{p:?}");
    }
    for (id, region) in doc.land_regions() {
        assert!(colours[&id] < k);
        if let Some(pin) = region.pin {
            assert_eq!(colours[&id], pin, "pin of {id}");
        }
        if let Some(g) = region.group {
            for other in doc.group_members(g) {
                assert_eq!(colours[&id], colours[&other], "group of {id}");
            }
        }
    }
}

/// Invented demo map: five regions that all touch, four of them through shared boundaries and
/// the fifth pair (Ashby and Corlen) at a single corner; a sixth region Dunmere in a group with
/// Ashby although they border each other by hand; Edony pinned to slot 0 beside Fallow, also
/// pinned to slot 0.
pub fn demo_map() -> Document {
    let mut b = DocumentBuilder::new("demo");
    let names = [
        "Ashby", "Brell", "Corlen", "Dunmere", "Esk", "Fallow", "Edony",
    ];
    for (i, name) in names.iter().enumerate() {
        let mut r = Region::new(*name, [i as f64, 0.0]);
        if *name == "Ashby" || *name == "Dunmere" {
            r.group = Some(GroupId(1));
        }
        if *name == "Edony" || *name == "Fallow" {
            r.pin = Some(0);
        }
        b.region(RegionId(i as u64 + 1), r);
    }
    b.group(
        GroupId(1),
        Group {
            name: "Ashby with Dunmere".into(),
        },
    );
    // K5 on 1, 2, 3, 5 and 6 ... built so that 1-3 is the only corner contact.
    for (x, y) in [
        (1, 2),
        (1, 5),
        (1, 6),
        (2, 3),
        (2, 5),
        (2, 6),
        (3, 5),
        (3, 6),
        (5, 6),
    ] {
        b.border(pair(x, y), Border::shared(10.0));
    }
    b.border(pair(1, 3), Border::corner());
    b.border(pair(1, 4), Border::manual());
    b.border(pair(6, 7), Border::shared(10.0));
    b.settings(Settings {
        corners_count: true,
        ..Settings::default()
    });
    b.next_ids(8, 2);
    b.build().unwrap()
}

#[test]
fn the_document_answer_drops_the_corner_one_membership_and_one_pin() {
    // By construction (see demo_map): the K5 needs its only corner contact dropped; Ashby and
    // Dunmere border each other by hand yet share a group, so the hand-made border or a
    // membership goes; the two pinned neighbours need a pin dropped, and pins are allowed here.
    let doc = demo_map();
    let allowed = Allowed::parse("corner,manual,group,pin", Units::Unitless).unwrap();
    let v = fewest_relaxations_uncontrolled(&doc, 4, &allowed, std::time::Duration::from_secs(30))
        .unwrap();
    v.check.as_ref().unwrap();
    assert!(v.report.proven_optimal);
    assert_eq!(v.report.cost, Some(3));
    let relaxations = v.relaxations();
    assert!(relaxations.contains(&Relaxation::Border {
        pair: pair(1, 3),
        kind: "corner"
    }));
    assert_eq!(relaxations.iter().filter(|r| r.kind() == "pin").count(), 1);

    // The edit applies it as one undoable step and keeps the borders on record.
    let mut relaxed = doc.clone();
    let edit = relaxation_edit(&doc, &relaxations, 4).unwrap();
    assert!(matches!(edit, Edit::Batch { ref edits, .. } if edits.len() == 3));
    let undo = relaxed.apply(edit).unwrap();
    assert_eq!(relaxed.borders().len(), doc.borders().len());
    assert!(relaxed.borders().get(&pair(1, 3)).unwrap().suppressed);
    let colours = v
        .model
        .region_colouring(v.report.colouring.as_ref().unwrap());
    honours_every_rule(&relaxed, &colours, 4);
    assert!(ConstraintGraph::build(&relaxed).conflicts.is_empty());
    relaxed.apply(undo).unwrap();
    assert_eq!(relaxed, doc);
}

#[test]
fn without_pins_allowed_the_pinned_neighbours_cannot_be_helped() {
    // By construction: with pins hard, Edony and Fallow are neighbours pinned to one colour, so
    // no allowed relaxation helps; the obstruction is those two regions.
    let doc = demo_map();
    let v = fewest_relaxations_uncontrolled(
        &doc,
        4,
        &Allowed::default(),
        std::time::Duration::from_secs(30),
    )
    .unwrap();
    v.check.as_ref().unwrap();
    assert!(v.report.infeasible);
    let last = v.report.obstructions.last().unwrap();
    assert_eq!(
        v.model.regions_of(&last.vertices),
        vec![RegionId(6), RegionId(7)]
    );
}

#[test]
fn short_borders_are_read_in_the_maps_units() {
    assert_eq!(
        Allowed::parse("short:2km", Units::Metres).unwrap().short,
        Some(2000.0)
    );
    assert_eq!(
        Allowed::parse("short:500m,pin", Units::Metres)
            .unwrap()
            .short,
        Some(500.0)
    );
    assert!(Allowed::parse("short:5km", Units::Unitless).is_err());
    assert!(Allowed::parse("corners", Units::Unitless).is_err());
    // By construction: a K5 whose shortest shared border is below the limit drops that one.
    let mut b = DocumentBuilder::new("short");
    for i in 1..=5u64 {
        b.region(RegionId(i), Region::new(format!("R{i}"), [i as f64, 0.0]));
    }
    for (x, y) in complete(5) {
        let length = if (x, y) == (1, 3) { 0.5 } else { 5.0 };
        b.border(
            pair(u64::from(x) + 1, u64::from(y) + 1),
            Border::shared(length),
        );
    }
    b.next_ids(6, 1);
    let doc = b.build().unwrap();
    let allowed = Allowed::parse("short:1", Units::Unitless).unwrap();
    let v = fewest_relaxations_uncontrolled(&doc, 4, &allowed, std::time::Duration::from_secs(30))
        .unwrap();
    v.check.as_ref().unwrap();
    assert_eq!(
        v.relaxations(),
        vec![Relaxation::Border {
            pair: pair(2, 4),
            kind: "short"
        }]
    );
    assert_eq!(
        doc.borders().get(&pair(2, 4)).unwrap().kind,
        BorderKind::Shared
    );
}

#[test]
fn relax_on_the_command_line_prints_words_json_and_applies() {
    use super::support::{stderr, stdout, tinct_path};
    let dir = tempfile::tempdir().unwrap();
    let project = dir.path().join("demo.tinct");
    tinct::formats::save(&demo_map(), &project).unwrap();
    // Words: the corner contact by its regions' names.
    let out = tinct_path(
        &["relax"],
        &project,
        &["--colours", "4", "--allow", "corner,manual,group,pin"],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let text = stdout(&out);
    assert!(text.contains("Ashby\u{2013}Corlen"), "{text}");
    assert!(text.contains("this is the fewest"), "{text}");
    // JSON: the documented fields.
    let out = tinct_path(
        &["relax"],
        &project,
        &[
            "--colours",
            "4",
            "--allow",
            "corner,manual,group,pin",
            "--json",
        ],
    );
    let json: serde_json::Value = serde_json::from_str(&stdout(&out)).unwrap();
    assert_eq!(json["colours"], 4);
    assert_eq!(json["cost"], 3);
    assert_eq!(json["proven_optimal"], true);
    assert_eq!(json["evidence"]["checked"], true);
    assert!(
        json["relaxations"]
            .as_array()
            .unwrap()
            .iter()
            .any(|r| r["kind"] == "corner" && r["a"] == 1 && r["b"] == 3)
    );
    assert!(json["colouring"]["assignment"].as_object().unwrap().len() == 7);
    // Nothing allowed helps: exit 1, and the part that cannot take 4 colours is named.
    let out = tinct_path(&["relax"], &project, &["--colours", "4"]);
    assert_eq!(out.status.code(), Some(1), "{}", stderr(&out));
    assert!(
        stdout(&out).contains("Fallow and Edony"),
        "{}",
        stdout(&out)
    );
    // --apply writes a project whose rules now fit 4 colours; bad input is exit 2.
    let relaxed = dir.path().join("relaxed.tinct");
    let out = tinct_path(
        &["relax"],
        &project,
        &[
            "--colours",
            "4",
            "--allow",
            "corner,manual,group,pin",
            "--apply",
            "--out",
            relaxed.to_str().unwrap(),
        ],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let out = tinct_path(&["relax"], &relaxed, &["--colours", "4", "--json"]);
    let json: serde_json::Value = serde_json::from_str(&stdout(&out)).unwrap();
    assert_eq!(json["cost"], 0);
    let out = tinct_path(
        &["relax"],
        &project,
        &["--colours", "4", "--allow", "corners"],
    );
    assert_eq!(out.status.code(), Some(2));
}

/// The US counties under the queen rule, from the committed fixture (see
/// tests/data/geo/PROVENANCE.md): regions named by FIPS code, shared boundaries and corner
/// contacts as Tinct's import found them; each county's FIPS code also as its attribute GEOID.
pub fn counties() -> Document {
    let text = include_str!("data/geo/us_counties_queen.txt");
    let mut ids: Vec<&str> = Vec::new();
    let mut borders = Vec::new();
    for line in text.lines().filter(|l| !l.starts_with('#')) {
        let parts: Vec<&str> = line.split_whitespace().collect();
        ids.extend([parts[0], parts[1]]);
        borders.push((parts[0], parts[1], parts[2] == "c"));
    }
    ids.sort_unstable();
    ids.dedup();
    let id = |fips: &str| RegionId(ids.binary_search(&fips).unwrap() as u64 + 1);
    let mut b = DocumentBuilder::new("US counties, queen");
    for (i, fips) in ids.iter().enumerate() {
        // The FIPS code also as the attribute GEOID, as Census files carry it: its first two
        // digits name the state.
        let mut region = Region::new(*fips, [0.0, 0.0]);
        region.attributes = [(
            "GEOID".to_string(),
            tinct::doc::AttrValue::Text(fips.to_string()),
        )]
        .into_iter()
        .collect();
        b.region(RegionId(i as u64 + 1), region);
    }
    for (x, y, corner) in borders {
        b.border(
            RegionPair::new(id(x), id(y)).unwrap(),
            if corner {
                Border::corner()
            } else {
                Border::shared(1.0)
            },
        );
    }
    b.settings(Settings {
        corners_count: true,
        ..Settings::default()
    });
    b.next_ids(ids.len() as u64 + 1, 1);
    b.build().unwrap()
}

#[test]
fn us_counties_under_the_queen_rule_fit_four_colours_with_the_fewest_corners_dropped() {
    // Source: us-atlas 3.0.1 (npm; US Census Bureau boundaries, public domain), imported by Tinct
    // under the queen rule. The colouring engine proves (with its checked refutation) that the map
    // needs 5 colours; the relaxation must then be proven fewest and pass the independent checker,
    // and must drop only corner contacts (shared boundaries are hard under the default kinds).
    let doc = counties();
    let cg = ConstraintGraph::build(&doc);
    let problem = tinct::engine::colouring::ColouringProblem::new(cg.graph.clone(), 8);
    let cancel = AtomicBool::new(false);
    let report = tinct::engine::colouring::solve(
        &problem,
        &tinct::engine::colouring::SolveOptions::default(),
        &cancel,
        &mut |_| {},
    )
    .unwrap();
    assert_eq!((report.minimum, report.proven), (Some(5), true));
    tinct::engine::colouring::check_colouring(&problem, report.colouring.as_ref().unwrap())
        .unwrap();

    let v = fewest_relaxations_uncontrolled(
        &doc,
        4,
        &Allowed::default(),
        std::time::Duration::from_secs(300),
    )
    .unwrap();
    v.check.as_ref().unwrap();
    assert!(v.report.proven_optimal && !v.report.stopped);
    let relaxations = v.relaxations();
    assert!(!relaxations.is_empty());
    assert!(relaxations.iter().all(|r| r.kind() == "corner"));
    assert_eq!(v.report.cost, Some(relaxations.len() as u64));
    // Each obstruction's CNF is unsatisfiable for an outside SAT solver, and its proof refutes it
    // for outside DRAT checkers too (TINCT_PROOF_DIR).
    let dir = std::env::var_os("TINCT_PROOF_DIR").map(std::path::PathBuf::from);
    for (i, o) in v.report.obstructions.iter().enumerate() {
        outside_solver_refutes(
            &obstruction_cnf(&v.model.problem, o).unwrap(),
            "a county obstruction",
        );
        if let Some(dir) = &dir {
            let cnf = obstruction_cnf(&v.model.problem, o).unwrap();
            std::fs::create_dir_all(dir).unwrap();
            std::fs::write(dir.join(format!("relax-counties-{i}.cnf")), &cnf).unwrap();
            std::fs::write(dir.join(format!("relax-counties-{i}.drat")), &o.drat).unwrap();
        }
    }
    // Applied, the map takes 4 colours: the colouring engine agrees, independently of the search.
    let mut relaxed = doc.clone();
    relaxed
        .apply(relaxation_edit(&doc, &relaxations, 4).unwrap())
        .unwrap();
    let colours = v
        .model
        .region_colouring(v.report.colouring.as_ref().unwrap());
    honours_every_rule(&relaxed, &colours, 4);
    let cg = ConstraintGraph::build(&relaxed);
    let problem = tinct::engine::colouring::ColouringProblem::new(cg.graph.clone(), 8);
    let after = tinct::engine::colouring::solve(
        &problem,
        &tinct::engine::colouring::SolveOptions::default(),
        &cancel,
        &mut |_| {},
    )
    .unwrap();
    assert_eq!(after.minimum, Some(4));
}

#[test]
fn weighed_by_length_the_shortest_shared_border_goes_first() {
    // By construction: five regions all sharing borders (a K5) of lengths 10, 20, ..., 100 map
    // units, every one of them short enough to drop. Unweighed, any one border is an answer of
    // cost 1; weighed by length, only the shortest is the cheapest (cost 1 + 10/10 = 2), for
    // four colours and for a flat drawing alike.
    let mut b = DocumentBuilder::new("five shared borders");
    for i in 1..=5u64 {
        b.region(RegionId(i), Region::new(format!("R{i}"), [i as f64, 0.0]));
    }
    let mut length = 0.0;
    let mut shortest = None;
    for i in 1..=5u64 {
        for j in i + 1..=5 {
            length += 10.0;
            let pair = RegionPair::new(RegionId(i), RegionId(j)).unwrap();
            shortest.get_or_insert(pair);
            b.border(pair, Border::shared(length));
        }
    }
    b.next_ids(6, 1);
    let doc = b.build().unwrap();
    let shortest = shortest.unwrap();
    let allowed = Allowed {
        by_length: true,
        ..Allowed::parse("short:1000", Units::Unitless).unwrap()
    };
    let v = fewest_relaxations_uncontrolled(&doc, 4, &allowed, std::time::Duration::from_secs(60))
        .unwrap();
    v.check.as_ref().unwrap();
    assert!(v.report.proven_optimal);
    assert_eq!(v.report.cost, Some(2));
    assert_eq!(
        v.relaxations(),
        vec![Relaxation::Border {
            pair: shortest,
            kind: "short"
        }]
    );
    let flat = tinct::analysis::relax::fewest_relaxations_planar_uncontrolled(
        &doc,
        &allowed,
        std::time::Duration::from_secs(60),
    )
    .unwrap();
    flat.check.as_ref().unwrap();
    assert_eq!(flat.report.cost, Some(2));
    assert_eq!(flat.relaxations().len(), 1);
    assert_eq!(
        flat.relaxations()[0].regions(),
        vec![shortest.a(), shortest.b()]
    );
    // The costs do not depend on the units: the shortest costs 2, corners and hand-made 1.
    assert_eq!(
        tinct::analysis::relax::border_costs(&[0.0, 0.5, 1.0, 5.0]),
        vec![1, 2, 3, 11]
    );
}
