//! Bipartiteness and biconnected components, checked against rustworkx-core (`coloring::two_color`
//! and `connectivity::articulation_points`) and against published facts.

use hashbrown::HashMap;

use proptest::prelude::*;
use rustworkx_core::petgraph::graph::{NodeIndex, UnGraph};
use tinct::engine::certify::{OddCycleRejection, check_odd_cycle, check_two_colouring};
use tinct::engine::{Bipartite, Graph, biconnected_components, two_colouring};

use crate::support::generators::Rng;

fn reference_graph(n: usize, edges: &[(u32, u32)]) -> UnGraph<(), ()> {
    let mut simple: Vec<(u32, u32)> = edges
        .iter()
        .filter(|&&(a, b)| a != b)
        .map(|&(a, b)| (a.min(b), a.max(b)))
        .collect();
    simple.sort_unstable();
    simple.dedup();
    let mut g: UnGraph<(), ()> = UnGraph::with_capacity(n, simple.len());
    for _ in 0..n {
        g.add_node(());
    }
    for &(a, b) in &simple {
        g.add_edge(NodeIndex::new(a as usize), NodeIndex::new(b as usize), ());
    }
    g
}

/// Runs the 2-colouring, checks its certificate, and returns whether the graph is bipartite.
fn bipartite_checked(g: &Graph) -> bool {
    match two_colouring(g) {
        Bipartite::TwoColouring(colour) => {
            check_two_colouring(g, &colour).unwrap();
            true
        }
        Bipartite::OddCycle(cycle) => {
            check_odd_cycle(g, &cycle).unwrap();
            false
        }
    }
}

fn random_edges(n: usize, m: usize, rng: &mut Rng) -> Vec<(u32, u32)> {
    (0..m)
        .map(|_| (rng.below(n as u64) as u32, rng.below(n as u64) as u32))
        .collect()
}

#[test]
fn published_bipartite_facts() {
    // Grids and even cycles are bipartite, odd cycles are not (König 1936); the Petersen graph
    // has 5-cycles, so it is not bipartite (its chromatic number is 3).
    let grid: Vec<(u32, u32)> = (0..20u32)
        .flat_map(|y| (0..20u32).map(move |x| (x, y)))
        .flat_map(|(x, y)| {
            let v = y * 20 + x;
            let mut e = Vec::new();
            if x + 1 < 20 {
                e.push((v, v + 1));
            }
            if y + 1 < 20 {
                e.push((v, v + 20));
            }
            e
        })
        .collect();
    assert!(bipartite_checked(&Graph::from_edges(400, &grid).unwrap().0));
    let petersen: Vec<(u32, u32)> = (0..5u32)
        .flat_map(|i| [(i, (i + 1) % 5), (i, 5 + i), (5 + i, 5 + (i + 2) % 5)])
        .collect();
    assert!(!bipartite_checked(
        &Graph::from_edges(10, &petersen).unwrap().0
    ));
    // A path of a million vertices: no recursion, no overflow.
    let n = 1_000_000u32;
    let path: Vec<(u32, u32)> = (0..n - 1).map(|i| (i, i + 1)).collect();
    assert!(bipartite_checked(
        &Graph::from_edges(n as usize, &path).unwrap().0
    ));
}

#[test]
fn bipartiteness_agrees_with_rustworkx() {
    let mut rng = Rng::new(11);
    let (mut yes, mut no) = (0, 0);
    for round in 0..2000 {
        let n = 2 + round % 30;
        let m = rng.below(n as u64 + 3) as usize;
        let edges = random_edges(n, m, &mut rng);
        let (g, _) = Graph::from_edges(n, &edges).unwrap();
        let ours = bipartite_checked(&g);
        let theirs = rustworkx_core::coloring::two_color(&reference_graph(n, &edges)).is_some();
        assert_eq!(ours, theirs, "{edges:?}");
        if ours {
            yes += 1;
        } else {
            no += 1;
        }
    }
    assert!(yes > 300 && no > 300, "{yes} bipartite, {no} not");
}

#[test]
fn odd_cycle_checker_rejects_corruptions() {
    let (g, _) = Graph::from_edges(6, &[(0, 1), (1, 2), (2, 0), (2, 3), (3, 4), (4, 5)]).unwrap();
    assert!(check_odd_cycle(&g, &[0, 1, 2]).is_ok());
    assert_eq!(
        check_odd_cycle(&g, &[0, 1]),
        Err(OddCycleRejection::Length { length: 2 })
    );
    assert_eq!(
        check_odd_cycle(&g, &[2, 3, 4]),
        Err(OddCycleRejection::NotAnEdge { u: 4, v: 2 })
    );
    assert_eq!(
        check_odd_cycle(&g, &[0, 1, 0]),
        Err(OddCycleRejection::Vertex { vertex: 0 })
    );
    assert!(check_two_colouring(&g, &[0, 1, 0, 1, 0, 1]).is_err());
}

/// Our blocks and cut vertices against rustworkx-core's articulation points and edge components.
fn compare_blocks(n: usize, edges: &[(u32, u32)]) {
    let (g, _) = Graph::from_edges(n, edges).unwrap();
    let ours = biconnected_components(&g);
    let reference = reference_graph(n, edges);
    let mut components: HashMap<(NodeIndex, NodeIndex), usize> = HashMap::new();
    let points =
        rustworkx_core::connectivity::articulation_points(&reference, Some(&mut components));
    let mut theirs_points: Vec<u32> = points.iter().map(|v| v.index() as u32).collect();
    theirs_points.sort_unstable();
    assert_eq!(ours.articulation_points, theirs_points, "{edges:?}");
    let mut grouped: HashMap<usize, Vec<(u32, u32)>> = HashMap::new();
    for (&(a, b), &c) in &components {
        let (a, b) = (a.index() as u32, b.index() as u32);
        grouped.entry(c).or_default().push((a.min(b), a.max(b)));
    }
    let mut theirs_blocks: Vec<Vec<(u32, u32)>> = grouped
        .into_values()
        .map(|mut b| {
            b.sort_unstable();
            b
        })
        .collect();
    theirs_blocks.sort_unstable();
    assert_eq!(ours.blocks, theirs_blocks, "{edges:?}");
}

#[test]
fn biconnected_components_agree_with_rustworkx() {
    let mut rng = Rng::new(12);
    for round in 0..1500 {
        let n = 2 + round % 25;
        let m = rng.below(2 * n as u64) as usize;
        let edges = random_edges(n, m, &mut rng);
        compare_blocks(n, &edges);
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    #[test]
    fn blocks_partition_the_edges(n in 2usize..20, seed in any::<u64>()) {
        let mut rng = Rng::new(seed);
        let edges = random_edges(n, 2 * n, &mut rng);
        compare_blocks(n, &edges);
        let (g, _) = Graph::from_edges(n, &edges).unwrap();
        let b = biconnected_components(&g);
        let mut all: Vec<(u32, u32)> = b.blocks.concat();
        all.sort_unstable();
        prop_assert_eq!(all, g.edges().collect::<Vec<_>>());
    }
}
