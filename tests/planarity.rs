//! Planarity verdicts and their certificates, checked against published facts and against
//! rustworkx-core's `planar::is_planar` (an independent left-right implementation).

use std::sync::atomic::AtomicBool;

use proptest::prelude::*;
use rustworkx_core::petgraph::graph::{NodeIndex, UnGraph};
use tinct::engine::Graph;
use tinct::engine::certify::{
    EmbeddingRejection, KuratowskiRejection, check_embedding, check_kuratowski,
};
use tinct::engine::planarity::{
    Embedding, Kuratowski, KuratowskiKind, Phase, Planarity, PlanarityError, is_planar, planarity,
    planarity_of_edges,
};

use crate::support::generators::{
    Rng, crossing_chord_ring, move_one_edge, permutation, random_non_edge, random_triangulation,
    relabel, subdivide,
};

/// Runs the test, checks the certificate with its independent checker, and cross-checks the
/// yes/no answer of `is_planar`. Returns the verdict.
fn verdict(n: usize, edges: &[(u32, u32)]) -> Planarity {
    let (g, _) = Graph::from_edges(n, edges).unwrap();
    let never = AtomicBool::new(false);
    let result = planarity(&g, &never, &mut |_| {}).unwrap();
    match &result {
        Planarity::Planar(embedding) => check_embedding(&g, embedding).unwrap(),
        Planarity::NonPlanar(k) => check_kuratowski(&g, k).unwrap(),
    }
    assert_eq!(
        is_planar(&g, &never, &mut |_| {}).unwrap(),
        result.is_planar()
    );
    result
}

fn expect_planar(n: usize, edges: &[(u32, u32)]) -> Embedding {
    match verdict(n, edges) {
        Planarity::Planar(e) => e,
        Planarity::NonPlanar(k) => panic!("expected planar, got {:?}", k.kind),
    }
}

fn expect_non_planar(n: usize, edges: &[(u32, u32)]) -> Kuratowski {
    match verdict(n, edges) {
        Planarity::NonPlanar(k) => k,
        Planarity::Planar(_) => panic!("expected non-planar"),
    }
}

/// The reference answer from rustworkx-core. It expects a simple graph (it panics on repeated
/// edges), so loops and repeats are dropped first; they never affect planarity.
fn reference_is_planar(n: usize, edges: &[(u32, u32)]) -> bool {
    let mut simple: Vec<(u32, u32)> = edges.iter().map(|&(a, b)| (a.min(b), a.max(b))).collect();
    simple.sort_unstable();
    simple.dedup();
    let mut g: UnGraph<(), ()> = UnGraph::with_capacity(n, simple.len());
    for _ in 0..n {
        g.add_node(());
    }
    for &(a, b) in &simple {
        if a != b {
            g.add_edge(NodeIndex::new(a as usize), NodeIndex::new(b as usize), ());
        }
    }
    rustworkx_core::planar::is_planar(&g)
}

fn complete(n: u32) -> Vec<(u32, u32)> {
    (0..n)
        .flat_map(|a| (a + 1..n).map(move |b| (a, b)))
        .collect()
}

fn complete_bipartite(p: u32, q: u32) -> Vec<(u32, u32)> {
    (0..p)
        .flat_map(|a| (0..q).map(move |b| (a, p + b)))
        .collect()
}

fn cycle(n: u32) -> Vec<(u32, u32)> {
    (0..n).map(|i| (i, (i + 1) % n)).collect()
}

fn grid(w: u32, h: u32) -> Vec<(u32, u32)> {
    let mut e = Vec::new();
    for y in 0..h {
        for x in 0..w {
            let v = y * w + x;
            if x + 1 < w {
                e.push((v, v + 1));
            }
            if y + 1 < h {
                e.push((v, v + w));
            }
        }
    }
    e
}

/// The wheel: a cycle on 1..=k and a hub 0 joined to all of it.
fn wheel(k: u32) -> Vec<(u32, u32)> {
    let mut e: Vec<(u32, u32)> = (0..k).map(|i| (1 + i, 1 + (i + 1) % k)).collect();
    e.extend((1..=k).map(|i| (0, i)));
    e
}

/// The generalised Petersen graph GP(n, k): outer cycle, spokes, inner star polygon.
fn generalised_petersen(n: u32, k: u32) -> Vec<(u32, u32)> {
    let mut e = Vec::new();
    for i in 0..n {
        e.push((i, (i + 1) % n));
        e.push((i, n + i));
        e.push((n + i, n + (i + k) % n));
    }
    e
}

fn cube() -> Vec<(u32, u32)> {
    let mut e = Vec::new();
    for v in 0..8u32 {
        for bit in [1, 2, 4] {
            if v & bit == 0 {
                e.push((v, v | bit));
            }
        }
    }
    e
}

fn octahedron() -> Vec<(u32, u32)> {
    // K6 minus the perfect matching {0-1, 2-3, 4-5}.
    complete(6)
        .into_iter()
        .filter(|&(a, b)| a / 2 != b / 2)
        .collect()
}

fn icosahedron() -> Vec<(u32, u32)> {
    // Apex 0, upper ring 1..=5, lower ring 6..=10, apex 11.
    let mut e = Vec::new();
    for i in 0..5u32 {
        let (u, u_next) = (1 + i, 1 + (i + 1) % 5);
        let (l, l_next) = (6 + i, 6 + (i + 1) % 5);
        e.extend([
            (0, u),
            (u, u_next),
            (l, l_next),
            (l, 11),
            (u, l),
            (u, l_next),
        ]);
    }
    e
}

// --- Published facts -------------------------------------------------------------------------

#[test]
fn kuratowski_graphs_are_not_planar() {
    // Kuratowski 1930: K5 and K3,3 are not planar.
    let k = expect_non_planar(5, &complete(5));
    assert_eq!(k.kind, KuratowskiKind::K5);
    assert_eq!(k.edges.len(), 10);
    let k = expect_non_planar(6, &complete_bipartite(3, 3));
    assert_eq!(k.kind, KuratowskiKind::K33);
    assert_eq!(k.branch_vertices, vec![0, 1, 2, 3, 4, 5]);
    // K6 and K3,4 contain them.
    expect_non_planar(6, &complete(6));
    expect_non_planar(7, &complete_bipartite(3, 4));
}

#[test]
fn subdivisions_of_kuratowski_graphs_are_not_planar() {
    // Kuratowski 1930: every subdivision of K5 or K3,3 is non-planar, and the certificate of a
    // subdivision is the whole graph with the same kind.
    let mut rng = Rng::new(7);
    for round in 0..40 {
        let (base_n, base, kind) = if round % 2 == 0 {
            (5, complete(5), KuratowskiKind::K5)
        } else {
            (6, complete_bipartite(3, 3), KuratowskiKind::K33)
        };
        let (n, edges) = subdivide(base_n, &base, 4, &mut rng);
        let p = permutation(n, &mut rng);
        let edges = relabel(&edges, &p, &mut rng);
        let k = expect_non_planar(n, &edges);
        assert_eq!(k.kind, kind);
        assert_eq!(k.edges.len(), edges.len());
    }
}

#[test]
fn almost_kuratowski_graphs_are_planar() {
    // Deleting any edge of K5 or K3,3 leaves a planar graph (they are minimal non-planar).
    for base in [complete(5), complete_bipartite(3, 3)] {
        for skip in 0..base.len() {
            let edges: Vec<_> = base
                .iter()
                .enumerate()
                .filter(|&(i, _)| i != skip)
                .map(|(_, &e)| e)
                .collect();
            expect_planar(6, &edges);
        }
    }
}

/// Vertex count, edges, and the face count Euler's formula predicts.
type Solid = (usize, Vec<(u32, u32)>, usize);

#[test]
fn platonic_solids_grids_and_wheels_are_planar() {
    // The five Platonic solids have planar graphs (their Schlegel diagrams); Euler's formula
    // V - E + F = 2 gives F = 4, 6, 8, 12, 20 faces.
    let solids: [Solid; 5] = [
        (4, complete(4), 4),
        (8, cube(), 6),
        (6, octahedron(), 8),
        (20, generalised_petersen(10, 2), 12),
        (12, icosahedron(), 20),
    ];
    for (n, edges, faces) in solids {
        let embedding = expect_planar(n, &edges);
        assert_eq!(embedding.faces().len(), faces);
    }
    // Grids and wheels are planar (common practice: they are drawn without crossings).
    for (w, h) in [(1, 1), (2, 2), (5, 7), (30, 30)] {
        expect_planar((w * h) as usize, &grid(w, h));
    }
    for k in [3, 4, 10, 100] {
        expect_planar(k as usize + 1, &wheel(k));
    }
}

#[test]
fn petersen_graph_is_not_planar_with_a_k33_certificate() {
    // The Petersen graph GP(5, 2) is non-planar; being cubic it has no K5 subdivision, so its
    // Kuratowski subgraph is a K3,3 subdivision (e.g. Bondy and Murty, "Graph Theory", 2008).
    let k = expect_non_planar(10, &generalised_petersen(5, 2));
    assert_eq!(k.kind, KuratowskiKind::K33);
}

#[test]
fn small_cases_and_disconnected_graphs() {
    // Trivial graphs, isolated vertices and forests are planar (common practice).
    expect_planar(0, &[]);
    expect_planar(1, &[]);
    expect_planar(5, &[]);
    expect_planar(3, &[(0, 1)]);
    // Several components, one of them K4 and some isolated vertices.
    let mut edges = complete(4);
    edges.extend([(5, 6), (6, 7), (7, 5), (9, 10)]);
    let embedding = expect_planar(12, &edges);
    assert_eq!(embedding.faces().len(), 4 + 2 + 1);
    // A non-planar component beside planar ones: the certificate stays inside it.
    let mut edges: Vec<(u32, u32)> = complete_bipartite(3, 3)
        .iter()
        .map(|&(a, b)| (a + 4, b + 4))
        .collect();
    edges.extend(complete(4));
    let k = expect_non_planar(10, &edges);
    assert!(k.branch_vertices.iter().all(|&v| v >= 4));
}

#[test]
fn edge_list_entry_point_keeps_input_numbering_and_reports_cleanup() {
    let mut edges = complete(5);
    edges.push((3, 3));
    edges.push((1, 0));
    let never = AtomicBool::new(false);
    let report = planarity_of_edges(5, &edges, &never, &mut |_| {}).unwrap();
    assert_eq!(report.cleanup.self_loops, vec![3]);
    assert_eq!(report.cleanup.parallel, vec![(0, 1)]);
    match report.verdict {
        Planarity::NonPlanar(k) => assert_eq!(k.edges, complete(5)),
        Planarity::Planar(_) => panic!("K5 is not planar"),
    }
    let err = planarity_of_edges(2, &[(0, 5)], &never, &mut |_| {}).unwrap_err();
    assert!(matches!(err, PlanarityError::Graph(_)));
}

#[test]
fn cancellation_stops_the_test_and_progress_is_reported() {
    let mut rng = Rng::new(3);
    let edges = random_triangulation(50_000, 1000, &mut rng);
    let (g, _) = Graph::from_edges(50_000, &edges).unwrap();
    let raised = AtomicBool::new(true);
    assert_eq!(
        planarity(&g, &raised, &mut |_| {}).unwrap_err(),
        PlanarityError::Cancelled
    );
    let never = AtomicBool::new(false);
    let mut phases = Vec::new();
    let verdict = planarity(&g, &never, &mut |p| phases.push(p.phase)).unwrap();
    assert!(verdict.is_planar());
    assert!(phases.contains(&Phase::Orientation) && phases.contains(&Phase::Embedding));
}

#[test]
fn deep_search_trees_do_not_overflow_the_stack() {
    // A Hamiltonian cycle of 10^6 vertices gives a depth-first tree just as deep.
    let n = 1_000_000u32;
    let edges = cycle(n);
    let (g, _) = Graph::from_edges(n as usize, &edges).unwrap();
    let never = AtomicBool::new(false);
    match planarity(&g, &never, &mut |_| {}).unwrap() {
        Planarity::Planar(e) => check_embedding(&g, &e).unwrap(),
        Planarity::NonPlanar(_) => panic!("a cycle is planar"),
    }
    // The same depth with a K3,3 hidden at the far end.
    let mut edges = edges;
    let far = n - 10;
    edges.extend([
        (far, far + 3),
        (far + 1, far + 5),
        (far + 2, far + 7),
        (far + 4, far + 8),
    ]);
    let k = expect_non_planar(n as usize, &edges);
    assert_eq!(k.kind, KuratowskiKind::K33);
}

// --- Differential testing against rustworkx-core ---------------------------------------------

#[test]
fn random_graphs_around_the_threshold_agree_with_rustworkx() {
    // Random graphs with n vertices and about 1.5n to 3n edges straddle the planarity threshold.
    let mut rng = Rng::new(2026);
    let (mut planar, mut non_planar) = (0, 0);
    for round in 0..3000 {
        let n = 5 + (round % 40) as usize;
        let m = n + (rng.below(2 * n as u64 + 1)) as usize;
        let edges: Vec<(u32, u32)> = (0..m)
            .map(|_| (rng.below(n as u64) as u32, rng.below(n as u64) as u32))
            .collect();
        let ours = verdict(n, &edges).is_planar();
        assert_eq!(
            ours,
            reference_is_planar(n, &edges),
            "round {round}: {edges:?}"
        );
        if ours {
            planar += 1;
        } else {
            non_planar += 1;
        }
    }
    // Both answers must be well represented, or the comparison says little.
    assert!(
        planar > 500 && non_planar > 500,
        "{planar} planar, {non_planar} not"
    );
}

#[test]
fn triangulations_with_one_edge_added_or_moved_agree_with_rustworkx() {
    let mut rng = Rng::new(99);
    for round in 0..300 {
        let n = 6 + (round % 60) as usize;
        let tri = random_triangulation(n, n, &mut rng);
        let p = permutation(n, &mut rng);
        let tri = relabel(&tri, &p, &mut rng);
        // Maximal planar: 3n - 6 edges (Euler's formula), planar.
        assert_eq!(tri.len(), 3 * n - 6);
        assert!(verdict(n, &tri).is_planar());
        assert!(reference_is_planar(n, &tri));
        // One more edge breaks Euler's bound: non-planar.
        let mut added = tri.clone();
        added.push(random_non_edge(n, &tri, &mut rng));
        assert!(!verdict(n, &added).is_planar());
        assert!(!reference_is_planar(n, &added));
        // One edge moved: usually non-planar; the reference decides.
        let moved = move_one_edge(n, &tri, &mut rng);
        assert_eq!(
            verdict(n, &moved).is_planar(),
            reference_is_planar(n, &moved)
        );
    }
}

#[test]
fn sparse_random_graphs_near_the_phase_transition_agree_with_rustworkx() {
    // G(n, m) stops being planar around m = n / 2 (Luczak, Pittel and Wierman, "The structure of
    // a random graph at the point of the phase transition", 1994): many components, long paths
    // and sparse cores, unlike the dense cases above.
    let mut rng = Rng::new(4242);
    let (mut planar, mut non_planar) = (0, 0);
    for round in 0..120 {
        let n = 500 + 10 * round;
        let m = n / 2 + rng.below(n as u64 / 2) as usize;
        let edges: Vec<(u32, u32)> = (0..m)
            .map(|_| (rng.below(n as u64) as u32, rng.below(n as u64) as u32))
            .collect();
        let ours = verdict(n, &edges).is_planar();
        assert_eq!(ours, reference_is_planar(n, &edges), "round {round}");
        if ours {
            planar += 1;
        } else {
            non_planar += 1;
        }
    }
    assert!(
        planar > 10 && non_planar > 10,
        "{planar} planar, {non_planar} not"
    );
}

#[test]
fn large_triangulation_and_moved_edge() {
    let n = 100_000;
    let mut rng = Rng::new(5);
    let tri = random_triangulation(n, n, &mut rng);
    let p = permutation(n, &mut rng);
    let tri = relabel(&tri, &p, &mut rng);
    assert!(verdict(n, &tri).is_planar());
    let moved = move_one_edge(n, &tri, &mut rng);
    assert_eq!(
        verdict(n, &moved).is_planar(),
        reference_is_planar(n, &moved)
    );
}

// --- Checkers reject corrupted certificates --------------------------------------------------

#[test]
fn embedding_checker_rejects_corruptions() {
    let edges = icosahedron();
    let (g, _) = Graph::from_edges(12, &edges).unwrap();
    let embedding = expect_planar(12, &edges);
    let (offsets, rotation) = embedding.parts();
    // A wrong rotation: swap two neighbours around vertex 0 (degree 5, so the cyclic order
    // really changes). Euler's formula then fails: a plane embedding is unique up to mirroring
    // for a 3-connected planar graph (Whitney 1933).
    let mut swapped = rotation.to_vec();
    let base = offsets[0] as usize;
    swapped.swap(base, base + 1);
    let bad = Embedding::from_parts(offsets.to_vec(), swapped);
    assert!(matches!(
        check_embedding(&g, &bad),
        Err(EmbeddingRejection::Euler { .. })
    ));
    // A missing neighbour.
    let mut short_offsets = offsets.to_vec();
    let mut short_rotation = rotation.to_vec();
    short_rotation.remove(base);
    for o in short_offsets.iter_mut().skip(1) {
        *o -= 1;
    }
    let bad = Embedding::from_parts(short_offsets, short_rotation);
    assert!(matches!(
        check_embedding(&g, &bad),
        Err(EmbeddingRejection::Rotation { vertex: 0 })
    ));
    // An embedding of a different graph (one edge missing from the graph).
    let (g_minus, _) = Graph::from_edges(12, &edges[1..]).unwrap();
    assert!(check_embedding(&g_minus, &embedding).is_err());
    // Wrong vertex count.
    let (g_more, _) = Graph::from_edges(13, &edges).unwrap();
    assert!(matches!(
        check_embedding(&g_more, &embedding),
        Err(EmbeddingRejection::VertexCount { .. })
    ));
}

#[test]
fn kuratowski_checker_rejects_corruptions() {
    let edges = generalised_petersen(5, 2);
    let (g, _) = Graph::from_edges(10, &edges).unwrap();
    let k = expect_non_planar(10, &edges);
    // A missing edge.
    let mut bad = k.clone();
    bad.edges.remove(0);
    assert!(check_kuratowski(&g, &bad).is_err());
    // An edge that is not in the input.
    let mut bad = k.clone();
    let (a, b) = (0..10u32)
        .flat_map(|a| (a + 1..10).map(move |b| (a, b)))
        .find(|&(a, b)| !g.has_edge(a, b))
        .unwrap();
    bad.edges.push((a, b));
    bad.edges.sort_unstable();
    assert!(matches!(
        check_kuratowski(&g, &bad),
        Err(KuratowskiRejection::NotAnInputEdge { .. })
    ));
    // The wrong kind.
    let mut bad = k.clone();
    bad.kind = KuratowskiKind::K5;
    assert!(check_kuratowski(&g, &bad).is_err());
    // Branch vertices not split by side.
    let mut bad = k.clone();
    bad.branch_vertices.swap(0, 5);
    assert!(matches!(
        check_kuratowski(&g, &bad),
        Err(KuratowskiRejection::BranchVertices)
    ));
    // Paths that share an inner vertex or are missing.
    let mut bad = k.clone();
    bad.paths.pop();
    assert!(check_kuratowski(&g, &bad).is_err());
    // A planar subgraph passed off as K3,3: K4 plus a pendant path is not a subdivision.
    let k4 = complete(4);
    let (g4, _) = Graph::from_edges(4, &k4).unwrap();
    let fake = Kuratowski {
        kind: KuratowskiKind::K33,
        branch_vertices: vec![0, 1, 2, 3],
        paths: k4.iter().map(|&(a, b)| vec![a, b]).collect(),
        edges: k4.clone(),
    };
    assert!(matches!(
        check_kuratowski(&g4, &fake),
        Err(KuratowskiRejection::BranchCount { .. })
    ));
}

// --- Crossing-chord rings: certificates that need many back edges --------------------------

#[test]
fn crossing_chord_rings_need_every_chord() {
    // A cycle plus chords whose conflict graph is an odd cycle is not planar, and removing any
    // chord makes it planar (common practice: a Hamiltonian cycle plus chords is planar exactly
    // when the chords' conflict graph is bipartite). The verdicts are cross-checked against
    // rustworkx-core, and every certificate goes through the checker in `verdict`.
    for (k, padding, seed) in [(3, 0, 1), (5, 0, 2), (7, 20, 3), (31, 50, 4), (201, 400, 5)] {
        let mut rng = Rng::new(seed);
        let (n, edges) = crossing_chord_ring(k, padding, &mut rng);
        assert!(!reference_is_planar(n, &edges), "k = {k}");
        let certificate = expect_non_planar(n, &edges);
        // The ring is cubic, so no subdivided K5 fits in it (K5 needs degree 4; the padding
        // hangs off one cut vertex and cannot help). Every chord lies in every Kuratowski
        // subgraph, so all 2k ring vertices do: six of degree 3 and the rest of degree 2 make
        // exactly (6 * 3 + (2k - 6) * 2) / 2 = 2k + 3 edges. For k = 3 that is K3,3 itself.
        assert_eq!(certificate.kind, KuratowskiKind::K33, "k = {k}");
        assert_eq!(certificate.edges.len(), 2 * k + 3, "k = {k}");
    }
}

#[test]
fn crossing_chord_rings_with_an_even_number_of_chords_are_planar() {
    // Even conflict cycles are bipartite: the chords alternate inside and outside.
    for (k, padding, seed) in [(4, 0, 6), (6, 10, 7), (40, 60, 8)] {
        let mut rng = Rng::new(seed);
        let (n, edges) = crossing_chord_ring(k, padding, &mut rng);
        assert!(reference_is_planar(n, &edges), "k = {k}");
        expect_planar(n, &edges);
    }
}

// --- Properties ------------------------------------------------------------------------------

fn small_graph() -> impl Strategy<Value = (usize, Vec<(u32, u32)>)> {
    (3usize..16).prop_flat_map(|n| {
        let edge = (0..n as u32, 0..n as u32);
        (Just(n), proptest::collection::vec(edge, 0..4 * n))
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn certificates_always_pass_their_checkers((n, edges) in small_graph()) {
        // `verdict` runs the checker on every certificate.
        let ours = verdict(n, &edges).is_planar();
        prop_assert_eq!(ours, reference_is_planar(n, &edges));
    }

    #[test]
    fn relabelling_never_changes_the_verdict((n, edges) in small_graph(), seed in any::<u64>()) {
        let mut rng = Rng::new(seed);
        let p = permutation(n, &mut rng);
        let renamed = relabel(&edges, &p, &mut rng);
        prop_assert_eq!(verdict(n, &edges).is_planar(), verdict(n, &renamed).is_planar());
    }

    #[test]
    fn subdivided_kuratowski_graphs_are_never_planar(seed in any::<u64>(), k5 in any::<bool>()) {
        let mut rng = Rng::new(seed);
        let (base_n, base) = if k5 { (5, complete(5)) } else { (6, complete_bipartite(3, 3)) };
        let (n, edges) = subdivide(base_n, &base, 3, &mut rng);
        // Extra random chords keep it non-planar (a supergraph of a non-planar graph).
        let mut edges = edges;
        for _ in 0..rng.below(6) {
            edges.push(random_non_edge(n, &edges, &mut rng));
        }
        let p = permutation(n, &mut rng);
        let edges = relabel(&edges, &p, &mut rng);
        prop_assert!(!verdict(n, &edges).is_planar());
    }

    #[test]
    fn crossing_chord_rings_agree_with_rustworkx(seed in any::<u64>(), k in 3usize..40, padding in 0usize..30) {
        // Odd k: not planar; even k: planar (see `crossing_chord_ring`). `verdict` checks the
        // certificate; rustworkx-core gives the reference answer.
        let mut rng = Rng::new(seed);
        let (n, edges) = crossing_chord_ring(k, padding, &mut rng);
        let ours = verdict(n, &edges).is_planar();
        prop_assert_eq!(ours, reference_is_planar(n, &edges));
        prop_assert_eq!(ours, k % 2 == 0);
    }

    #[test]
    fn random_triangulations_are_planar(seed in any::<u64>(), n in 3usize..80) {
        let mut rng = Rng::new(seed);
        let edges = random_triangulation(n, n, &mut rng);
        let embedding = match verdict(n, &edges) {
            Planarity::Planar(e) => e,
            Planarity::NonPlanar(_) => return Err(TestCaseError::fail("triangulation not planar")),
        };
        // Euler: a triangulation on n >= 3 vertices has 2n - 4 faces, all triangles.
        let faces = embedding.faces();
        prop_assert_eq!(faces.len(), 2 * n - 4);
        prop_assert!(faces.iter().all(|f| f.len() == 3));
    }
}

// --- Sample maps and the command line ---------------------------------------------------------

/// The land adjacency of a sample map from its GeoJSON (`tinct_borders` of kind `shared` between
/// land regions), with each same-colour group merged into one vertex when `merge_groups` is set.
/// Returns the vertex count, the edges, and the vertex of the group named `group` if any.
fn sample_map_graph(
    file: &str,
    merge_groups: bool,
    group: &str,
) -> (usize, Vec<(u32, u32)>, Option<u32>) {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("sample-maps")
        .join(file);
    let text = std::fs::read_to_string(&path).unwrap();
    let value: serde_json::Value = serde_json::from_str(&text).unwrap();
    let mut vertex_of: std::collections::BTreeMap<u64, u32> = Default::default();
    let mut group_vertex: std::collections::BTreeMap<String, u32> = Default::default();
    let mut count = 0u32;
    for feature in value["features"].as_array().unwrap() {
        let props = &feature["properties"];
        if props["role"] != "land" {
            continue;
        }
        let id = feature["id"].as_u64().unwrap();
        let v = match props["group"].as_str() {
            Some(g) if merge_groups => *group_vertex.entry(g.to_string()).or_insert_with(|| {
                count += 1;
                count - 1
            }),
            _ => {
                count += 1;
                count - 1
            }
        };
        vertex_of.insert(id, v);
    }
    let mut edges = Vec::new();
    for border in value["tinct_borders"].as_array().unwrap() {
        if border["kind"] != "shared" {
            continue;
        }
        let (a, b) = (border["a"].as_u64().unwrap(), border["b"].as_u64().unwrap());
        if let (Some(&u), Some(&v)) = (vertex_of.get(&a), vertex_of.get(&b))
            && u != v
        {
            edges.push((u, v));
        }
    }
    (count as usize, edges, group_vertex.get(group).copied())
}

#[test]
fn sample_maps_agree_with_their_generator() {
    // sample-maps/README.md (facts asserted by make_samples.py with networkx.check_planarity):
    // Vessland and the Three Valleys are planar; the Exclave Coast is planar until the group
    // "Aldwyn" (a district and its exclave) is merged into one vertex, and then it is not.
    for file in ["vessland-province.geojson", "three-valleys.geojson"] {
        let (n, edges, _) = sample_map_graph(file, true, "");
        assert!(verdict(n, &edges).is_planar(), "{file}");
    }
    let (n, edges, _) = sample_map_graph("exclave-coast.geojson", false, "Aldwyn");
    assert!(verdict(n, &edges).is_planar());
    let (n, edges, aldwyn) = sample_map_graph("exclave-coast.geojson", true, "Aldwyn");
    let k = expect_non_planar(n, &edges);
    // Without the merged vertex the graph is a subgraph of the planar unmerged map, so every
    // Kuratowski subgraph must pass through it.
    let aldwyn = aldwyn.unwrap();
    assert!(k.edges.iter().any(|&(a, b)| a == aldwyn || b == aldwyn));
}

#[test]
fn analyse_json_and_certificate_file_round_trip() {
    use tinct::cli::Section;
    use tinct::cli::planarity::attach;
    use tinct::doc::graph_formats::read_edge_list;
    // The Petersen graph as an edge list: not planar (Bondy and Murty 2008).
    let mut text = String::from("10 15\n");
    for (a, b) in generalised_petersen(5, 2) {
        text.push_str(&format!("{a} {b}\n"));
    }
    let analyse = |doc: &tinct::doc::Document| {
        let request = tinct::analysis::Request {
            planarity: true,
            embedding: true,
            colouring: None,
        };
        tinct::analysis::uncontrolled(|c| tinct::analysis::Analysis::run(doc, request, c))
    };
    let (doc, notices) = read_edge_list(&text, "petersen").unwrap();
    let analysis = analyse(&doc);
    let report = tinct::cli::analyse::report("petersen.edges", &doc, &analysis.rules, &notices);
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("certificate.json");
    let json = attach(
        &report,
        &doc,
        &analysis,
        true,
        Some(Section::Planarity),
        false,
        Some(&out),
    )
    .unwrap();
    let value: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(value["planarity"]["planar"], false);
    assert_eq!(value["planarity"]["kind"], "K3,3");
    // The certificate file, read back as a third party would, passes our checker.
    let written: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&out).unwrap()).unwrap();
    let edges: Vec<(u32, u32)> = written["edges"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| (e[0].as_u64().unwrap() as u32, e[1].as_u64().unwrap() as u32))
        .collect();
    let paths: Vec<Vec<u32>> = written["paths"]
        .as_array()
        .unwrap()
        .iter()
        .map(|p| {
            p.as_array()
                .unwrap()
                .iter()
                .map(|v| v.as_u64().unwrap() as u32)
                .collect()
        })
        .collect();
    let branch: Vec<u32> = written["branch_vertices"]
        .as_array()
        .unwrap()
        .iter()
        .map(|v| v.as_u64().unwrap() as u32)
        .collect();
    let (g, _) = Graph::from_edges(10, &generalised_petersen(5, 2)).unwrap();
    let k = Kuratowski {
        kind: KuratowskiKind::K33,
        branch_vertices: branch,
        paths,
        edges,
    };
    check_kuratowski(&g, &k).unwrap();
    // The full report keeps its other keys and gains `planarity`; text mode names the verdict.
    let json = attach(&report, &doc, &analysis, true, None, false, None).unwrap();
    let value: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert!(value.get("summary").is_some() && value.get("planarity").is_some());
    let text = attach(&report, &doc, &analysis, false, None, false, None).unwrap();
    assert!(text.contains("NOT planar: a K3,3 subdivision"));
    // A planar map with --embedding lists every vertex's rotation.
    let (doc, notices) = read_edge_list("4 6\n0 1\n0 2\n0 3\n1 2\n1 3\n2 3\n", "k4").unwrap();
    let analysis = analyse(&doc);
    let report = tinct::cli::analyse::report("k4.edges", &doc, &analysis.rules, &notices);
    let json = attach(&report, &doc, &analysis, true, None, true, None).unwrap();
    let value: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(value["planarity"]["planar"], true);
    assert_eq!(value["planarity"]["embedding"].as_array().unwrap().len(), 4);
}
