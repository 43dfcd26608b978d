//! Fuzz target: the planarity test and its certificates. Every byte pair is an edge of a graph on
//! at most 64 vertices; whatever the verdict, its evidence must pass the independent checker, and
//! the plain test must agree with it.
#![no_main]

use std::sync::atomic::AtomicBool;

use libfuzzer_sys::fuzz_target;
use tinct::engine::Graph;
use tinct::engine::certify::{check_embedding, check_kuratowski};
use tinct::engine::planarity::{Planarity, is_planar, planarity};

fuzz_target!(|data: &[u8]| {
    let Some((&n, rest)) = data.split_first() else {
        return;
    };
    let n = usize::from(n % 64) + 1;
    let edges: Vec<(u32, u32)> = rest
        .chunks_exact(2)
        .map(|p| (u32::from(p[0]) % n as u32, u32::from(p[1]) % n as u32))
        .filter(|(a, b)| a != b)
        .collect();
    let Ok((g, _)) = Graph::from_edges(n, &edges) else {
        return;
    };
    let never = AtomicBool::new(false);
    let verdict = planarity(&g, &never, &mut |_| {}).expect("never cancelled");
    let plain = is_planar(&g, &never, &mut |_| {}).expect("never cancelled");
    match verdict {
        Planarity::Planar(e) => {
            assert!(plain);
            check_embedding(&g, &e).expect("embedding verifies");
        }
        Planarity::NonPlanar(k) => {
            assert!(!plain);
            check_kuratowski(&g, &k).expect("Kuratowski subgraph verifies");
        }
    }
});
