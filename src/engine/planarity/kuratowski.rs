//! Isolating a subdivision of K5 or K3,3 after the left-right test has failed.
//!
//! Four steps, each linear in the size of the graph it works on:
//! - *A local start.* The depth-first tree of the failed test plus the back edges the test had
//!   processed inside the subtree of the failing vertex is usually already non-planar; nested
//!   windows (ancestors' subtrees growing eightfold, then the whole graph) are tried in turn, each
//!   decided by edge addition (third step), so the start is always correct and the windows tried
//!   cost O(n + m) together.
//! - *Suppression.* Deleting vertices of degree 1 and replacing each vertex of degree 2 by one
//!   edge (its two edges joined into a "piece") never changes planarity, so the window shrinks to
//!   O(k) pieces for k back edges, whatever the tree's size.
//! - *Locating the obstruction.* Edge addition (J. M. Boyer and W. J. Myrvold, "On the Cutting
//!   Edge: Simplified O(n) Planarity by Edge Addition", JGAA 8(3), 2004; see [`edge_addition`])
//!   runs on the suppressed window and stops where a back edge cannot be added. The paths the
//!   paper's minors A to E are made of around that place form a non-planar subgraph with a
//!   constant number of pieces (at most 16 branch vertices over 60,000 random graphs in the unit
//!   tests).
//! - *Deletion.* Each of those pieces is dropped when the rest stays non-planar. An edge-minimal
//!   non-planar graph is a subdivision of K5 or K3,3 (Kuratowski 1930), so what is left is the
//!   certificate; a piece found essential stays essential after later deletions (a subgraph of a
//!   planar graph is planar), so one pass of a constant number of constant-size tests suffices.
//!
//! The certificate can still be Θ(n) edges long (its paths may be long), but the work is not:
//! on the rings of crossing chords of `tests/support/generators.rs`, where every certificate needs all
//! chords, the oracle is called 11 times whatever the ring's size (unit test below), and the
//! benchmark prints the growth of the running time.
//!
//! Should edge addition ever fail to locate a non-planar union (it never has in the tests, and
//! debug builds assert that it does not), the isolation falls back to QuickXplain (U. Junker,
//! "QuickXplain: Preferred Explanations and Relaxations for Over-Constrained Problems", AAAI
//! 2004) over the back-edge pieces, which is always correct but quadratic in the worst case.
//!
//! # Complexity
//! O(n + m) time and space.

use super::edge_addition;
use super::lr::{FailureClue, LrState, Mode, Outcome};
use super::{Kuratowski, KuratowskiKind, Monitor, Phase, PlanarityError};
use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// A piece: one input edge (leaf) or two pieces joined at a suppressed vertex.
#[derive(Clone, Copy)]
struct Node {
    a: Vertex,
    b: Vertex,
    /// For a join: `left` runs from `a` to the suppressed vertex, `right` from there to `b`.
    left: u32,
    right: u32,
    /// Contains at least one back edge.
    back: bool,
}

impl Node {
    #[inline]
    fn other(&self, end: Vertex) -> Vertex {
        if self.a == end { self.b } else { self.a }
    }
}

struct Isolator<'m, 'a> {
    arena: Vec<Node>,
    /// Scratch map from original vertex to local index; all `NONE` between calls.
    local: Vec<u32>,
    /// `protected[v] == epoch` marks the vertices `compress` must keep (ends of pieces that may
    /// be added later).
    protected: Vec<u32>,
    epoch: u32,
    monitor: &'m mut Monitor<'a>,
    work: OracleWork,
}

pub(super) fn isolate(
    g: &Graph,
    clue: FailureClue,
    monitor: &mut Monitor<'_>,
) -> Result<Kuratowski, PlanarityError> {
    isolate_counting(g, clue, monitor).map(|(k, _)| k)
}

/// [`isolate`], also returning how many graphs the planarity test was run on and their total
/// number of pieces (the work the oracle did).
fn isolate_counting(
    g: &Graph,
    clue: FailureClue,
    monitor: &mut Monitor<'_>,
) -> Result<(Kuratowski, OracleWork), PlanarityError> {
    // Everything below works in the test's internal numbering; the certificate is translated
    // back at the end.
    let n = g.vertex_count();
    monitor.checkpoint(Phase::Kuratowski, 0, 3)?;
    monitor.inner = true;
    let mut iso = Isolator {
        arena: Vec::new(),
        local: vec![NONE; n],
        protected: vec![0; n],
        epoch: 0,
        monitor,
        work: OracleWork::default(),
    };
    // Find a window of back edges that keeps the tree non-planar, and locate the obstruction in
    // it with edge addition (linear time, a constant number of pieces). For the subtree of `a`,
    // only the tree inside it and the path from `a` up to the highest return point matter: every
    // other tree edge hangs off that part without a back edge and would be pruned anyway. The
    // last window is the whole graph.
    let mut keep: Option<Vec<u32>> = None;
    for window in clue.windows.iter().map(Some).chain([None]) {
        let mut input: Vec<u32> = Vec::new();
        if let Some(&(start, a)) = window {
            // Preorder numbers increase down every root path.
            let mut top = a;
            for &(u, v) in &clue.processed[start..] {
                input.push(iso.leaf(u, v, true));
                top = top.min(v);
            }
            for x in a + 1..clue.subtree_end[a as usize] {
                input.push(iso.leaf(clue.parent[x as usize], x, false));
            }
            let mut x = a;
            while x > top {
                let p = clue.parent[x as usize];
                input.push(iso.leaf(p, x, false));
                x = p;
            }
        } else {
            // Every edge of the graph, in internal numbering.
            let mut internal = vec![NONE; n];
            for (v, &o) in clue.orig.iter().enumerate() {
                internal[o as usize] = v as u32;
            }
            input.reserve(g.edge_count());
            for (u, v) in g.edges() {
                let (iu, iv) = (internal[u as usize], internal[v as usize]);
                let tree = clue.parent[iv as usize] == iu || clue.parent[iu as usize] == iv;
                input.push(iso.leaf(iu, iv, !tree));
            }
        }
        let compressed = iso.compress(&input);
        match iso.locate(&compressed)? {
            Located::Found(found) => {
                keep = Some(found);
                break;
            }
            Located::Planar if window.is_some() => continue,
            _ => {
                // Edge addition should never miss (debug builds stop here); QuickXplain over the
                // back-edge pieces is slower but always right.
                debug_assert!(false, "edge addition did not locate the obstruction");
                // The whole graph (the last window) is non-planar: the test said so.
                if window.is_none() || !iso.test_compressed(&compressed)? {
                    keep = Some(iso.shrink(&compressed)?);
                    break;
                }
            }
        }
    }
    // The last window always sets `keep`.
    let mut keep = keep.unwrap_or_default();
    iso.monitor.checkpoint(Phase::Kuratowski, 2, 3)?;

    // Delete whatever piece can go. A piece found essential stays essential after later
    // deletions (a subgraph of a planar graph is planar), so one pass suffices.
    let mut i = 0;
    while i < keep.len() {
        let mut trial = keep.clone();
        trial.swap_remove(i);
        if !iso.planar_pieces(&trial)? {
            keep = trial;
        } else {
            i += 1;
        }
    }
    let keep = iso.compress(&keep);
    let result = iso.certificate(&keep, &clue.orig);
    iso.monitor.inner = false;
    iso.monitor.checkpoint(Phase::Kuratowski, 3, 3)?;
    Ok((result, iso.work))
}

/// What edge addition made of a window.
enum Located {
    Planar,
    /// A non-planar union of a constant number of pieces.
    Found(Vec<u32>),
    /// Non-planar, but no non-planar union was located (never seen; see the fallback).
    Lost,
}

/// What the planarity oracle was asked during one isolation.
#[derive(Clone, Copy, Debug, Default)]
struct OracleWork {
    calls: u64,
    pieces: u64,
}

impl Isolator<'_, '_> {
    fn leaf(&mut self, a: Vertex, b: Vertex, back: bool) -> u32 {
        self.arena.push(Node {
            a,
            b,
            left: NONE,
            right: NONE,
            back,
        });
        (self.arena.len() - 1) as u32
    }

    /// Numbers the ends of `pieces` 0, 1, ... in order of first appearance: the vertices in
    /// that order, and each piece's ends in the new numbers.
    fn localise(&mut self, pieces: &[u32]) -> (Vec<Vertex>, Vec<[u32; 2]>) {
        let mut verts: Vec<Vertex> = Vec::new();
        let mut ends: Vec<[u32; 2]> = Vec::with_capacity(pieces.len());
        for &p in pieces {
            let node = self.arena[p as usize];
            let mut local = [0u32; 2];
            for (slot, v) in [node.a, node.b].into_iter().enumerate() {
                if self.local[v as usize] == NONE {
                    self.local[v as usize] = verts.len() as u32;
                    verts.push(v);
                }
                local[slot] = self.local[v as usize];
            }
            ends.push(local);
        }
        for &v in &verts {
            self.local[v as usize] = NONE;
        }
        (verts, ends)
    }

    /// Runs edge addition on the suppressed pieces `h`: planar, or the pieces on the paths it
    /// finds around the obstruction, suppressed again (a constant number of pieces).
    fn locate(&mut self, h: &[u32]) -> Result<Located, PlanarityError> {
        let (verts, local) = self.localise(h);
        let ends: Vec<(u32, u32, u32)> = local
            .iter()
            .zip(h)
            .filter(|(e, _)| e[0] != e[1])
            .map(|(e, &p)| (e[0].min(e[1]), e[0].max(e[1]), p))
            .collect();
        // One piece per pair of ends: parallel pieces never matter for planarity. Grouped by
        // the smaller end with a counting sort, then deduplicated with a mark per larger end.
        let k = verts.len();
        let mut start = vec![0u32; k + 1];
        for &(a, _, _) in &ends {
            start[a as usize + 1] += 1;
        }
        for i in 0..k {
            start[i + 1] += start[i];
        }
        let mut grouped = vec![(0u32, 0u32, 0u32); ends.len()];
        for &t in &ends {
            grouped[start[t.0 as usize] as usize] = t;
            start[t.0 as usize] += 1;
        }
        let mut seen = vec![NONE; k];
        grouped.retain(|&(a, b, _)| {
            let fresh = seen[b as usize] != a;
            seen[b as usize] = a;
            fresh
        });
        let ends = grouped;
        let edges: Vec<(u32, u32)> = ends.iter().map(|&(a, b, _)| (a, b)).collect();
        let found = match edge_addition::obstruction_edges(verts.len(), &edges, self.monitor)? {
            edge_addition::Outcome::Planar => return Ok(Located::Planar),
            edge_addition::Outcome::NotLocated => return Ok(Located::Lost),
            edge_addition::Outcome::Located(found) => found,
        };
        let pieces: Vec<u32> = found.into_iter().map(|e| ends[e].2).collect();
        let keep = self.compress(&pieces);
        if self.test_compressed(&keep)? {
            return Ok(Located::Lost);
        }
        Ok(Located::Found(keep))
    }

    /// Shrinks the back-edge pieces of `h0` to a minimal set with the tree pieces always
    /// present (QuickXplain), and suppresses the result.
    fn shrink(&mut self, h0: &[u32]) -> Result<Vec<u32>, PlanarityError> {
        let mut base: Vec<u32> = Vec::new();
        let mut candidates: Vec<u32> = Vec::new();
        for &p in h0 {
            if self.arena[p as usize].back {
                candidates.push(p);
            } else {
                base.push(p);
            }
        }
        // Back edges met just before the failure are the likeliest to be needed; QuickXplain
        // needs the fewest calls when the needed candidates come first.
        candidates.reverse();
        let background = self.compress_keeping(&base, &candidates);
        let needed = self.quick_xplain(&background, false, &candidates)?;
        let mut keep = base;
        keep.extend_from_slice(&needed);
        Ok(self.compress(&keep))
    }

    /// QuickXplain: a minimal subset D of `candidates` with `background + D` non-planar, given
    /// that `background + candidates` is non-planar. `check` says whether `background` alone
    /// must be tested first (Junker 2004, Alg. QUICKXPLAIN).
    ///
    /// `background` must already be suppressed with the ends of all `candidates` kept. Each
    /// level suppresses its new background again, keeping only the ends of the candidates still
    /// open, so a call costs O(|candidates| + |D| + b) where b is the number of back-edge pieces
    /// in the background, rather than the size of the whole window: suppression commutes with
    /// adding pieces whose ends were kept, so every oracle answer is the one the unsuppressed
    /// graph would give.
    fn quick_xplain(
        &mut self,
        background: &[u32],
        check: bool,
        candidates: &[u32],
    ) -> Result<Vec<u32>, PlanarityError> {
        if check && !self.test_compressed(background)? {
            return Ok(Vec::new());
        }
        if candidates.len() <= 1 {
            return Ok(candidates.to_vec());
        }
        let (c1, c2) = candidates.split_at(candidates.len() / 2);
        let mut with_c1 = background.to_vec();
        with_c1.extend_from_slice(c1);
        let with_c1 = self.compress_keeping(&with_c1, c2);
        let d2 = self.quick_xplain(&with_c1, !c1.is_empty(), c2)?;
        drop(with_c1);
        let mut with_d2 = background.to_vec();
        with_d2.extend_from_slice(&d2);
        let with_d2 = self.compress_keeping(&with_d2, c1);
        let mut d1 = self.quick_xplain(&with_d2, !d2.is_empty(), c1)?;
        d1.extend_from_slice(&d2);
        Ok(d1)
    }

    /// [`Isolator::compress`] that keeps the ends of `kept` unsuppressed.
    fn compress_keeping(&mut self, input: &[u32], kept: &[u32]) -> Vec<u32> {
        self.epoch += 1;
        if self.epoch == u32::MAX {
            self.protected.fill(0);
            self.epoch = 1;
        }
        for &p in kept {
            let node = self.arena[p as usize];
            self.protected[node.a as usize] = self.epoch;
            self.protected[node.b as usize] = self.epoch;
        }
        let out = self.compress_inner(input, true);
        self.epoch += 1;
        out
    }

    fn planar_pieces(&mut self, pieces: &[u32]) -> Result<bool, PlanarityError> {
        let compressed = self.compress(pieces);
        self.test_compressed(&compressed)
    }

    /// Runs the left-right test on the simple graph underlying some pieces.
    fn test_compressed(&mut self, pieces: &[u32]) -> Result<bool, PlanarityError> {
        self.work.calls += 1;
        self.work.pieces += pieces.len() as u64;
        self.monitor
            .checkpoint(Phase::Kuratowski, self.work.calls, 0)?;
        if pieces.is_empty() {
            return Ok(true);
        }
        let (verts, local) = self.localise(pieces);
        let edges: Vec<(u32, u32)> = local.iter().map(|e| (e[0], e[1])).collect();
        let Ok((h, _)) = Graph::from_edges(verts.len(), &edges) else {
            debug_assert!(false, "local indices are always in range");
            return Ok(true);
        };
        let k = h.vertex_count();
        if k >= 3 && h.edge_count() > 3 * k - 6 {
            return Ok(false);
        }
        let mut state = LrState::new(&h);
        Ok(state.run(self.monitor, Mode::TestOnly)? == Outcome::Planar)
    }

    /// Deletes degree-1 vertices and suppresses degree-2 vertices until neither is left, and
    /// returns the surviving pieces. Loops are dropped (they never affect planarity); parallel
    /// pieces are kept, since removing one of them later must leave the other.
    fn compress(&mut self, input: &[u32]) -> Vec<u32> {
        self.compress_inner(input, false)
    }

    fn compress_inner(&mut self, input: &[u32], protect: bool) -> Vec<u32> {
        let (verts, local) = self.localise(input);
        let mut slot_node: Vec<u32> = Vec::with_capacity(input.len());
        let mut slot_ends: Vec<(u32, u32)> = Vec::with_capacity(input.len());
        for (&p, e) in input.iter().zip(&local) {
            if e[0] != e[1] {
                slot_node.push(p);
                slot_ends.push((e[0], e[1]));
            }
        }
        drop(local);
        let k = verts.len();
        let mut head = vec![NONE; k];
        let mut next: Vec<u32> = Vec::with_capacity(2 * slot_ends.len());
        let mut incident_slot: Vec<u32> = Vec::with_capacity(2 * slot_ends.len());
        let mut degree = vec![0u32; k];
        fn attach(head: &mut [u32], next: &mut Vec<u32>, incident: &mut Vec<u32>, x: u32, s: u32) {
            incident.push(s);
            next.push(head[x as usize]);
            head[x as usize] = (incident.len() - 1) as u32;
        }
        for (s, &(a, b)) in slot_ends.iter().enumerate() {
            attach(&mut head, &mut next, &mut incident_slot, a, s as u32);
            attach(&mut head, &mut next, &mut incident_slot, b, s as u32);
            degree[a as usize] += 1;
            degree[b as usize] += 1;
        }
        let mut dead = vec![false; slot_ends.len()];
        let mut removed = vec![false; k];
        let kept: Vec<bool> = if protect {
            verts
                .iter()
                .map(|&v| self.protected[v as usize] == self.epoch)
                .collect()
        } else {
            vec![false; k]
        };
        let mut queue: Vec<u32> = (0..k as u32).filter(|&x| degree[x as usize] <= 2).collect();
        while let Some(x) = queue.pop() {
            let xi = x as usize;
            if removed[xi] || degree[xi] > 2 || kept[xi] {
                continue;
            }
            let mut alive = [NONE; 2];
            let mut found = 0;
            let mut r = head[xi];
            while r != NONE && found < degree[xi] as usize {
                let s = incident_slot[r as usize];
                if !dead[s as usize] {
                    alive[found] = s;
                    found += 1;
                }
                r = next[r as usize];
            }
            removed[xi] = true;
            let other = |s: u32| {
                let (a, b) = slot_ends[s as usize];
                if a == x { b } else { a }
            };
            match degree[xi] {
                1 => {
                    let s = alive[0];
                    dead[s as usize] = true;
                    let y = other(s);
                    degree[y as usize] -= 1;
                    if degree[y as usize] <= 2 {
                        queue.push(y);
                    }
                }
                2 => {
                    let (s1, s2) = (alive[0], alive[1]);
                    dead[s1 as usize] = true;
                    dead[s2 as usize] = true;
                    let (y1, y2) = (other(s1), other(s2));
                    if y1 == y2 {
                        degree[y1 as usize] -= 2;
                        if degree[y1 as usize] <= 2 {
                            queue.push(y1);
                        }
                    } else {
                        let (n1, n2) = (slot_node[s1 as usize], slot_node[s2 as usize]);
                        let back = self.arena[n1 as usize].back || self.arena[n2 as usize].back;
                        self.arena.push(Node {
                            a: verts[y1 as usize],
                            b: verts[y2 as usize],
                            left: n1,
                            right: n2,
                            back,
                        });
                        let s = slot_ends.len() as u32;
                        slot_node.push((self.arena.len() - 1) as u32);
                        slot_ends.push((y1, y2));
                        dead.push(false);
                        attach(&mut head, &mut next, &mut incident_slot, y1, s);
                        attach(&mut head, &mut next, &mut incident_slot, y2, s);
                    }
                }
                _ => {}
            }
            degree[xi] = 0;
        }
        slot_node
            .iter()
            .zip(&dead)
            .filter(|&(_, &d)| !d)
            .map(|(&p, _)| p)
            .collect()
    }

    /// The vertex sequence of a piece walked from its end `from`.
    fn expand(&self, piece: u32, from: Vertex) -> Vec<Vertex> {
        let mut out = vec![from];
        let mut tasks = vec![(piece, from)];
        while let Some((p, f)) = tasks.pop() {
            let node = self.arena[p as usize];
            if node.left == NONE {
                out.push(node.other(f));
                continue;
            }
            if f == node.a {
                let mid = self.arena[node.left as usize].other(node.a);
                tasks.push((node.right, mid));
                tasks.push((node.left, node.a));
            } else {
                let mid = self.arena[node.right as usize].other(node.b);
                tasks.push((node.left, mid));
                tasks.push((node.right, node.b));
            }
        }
        out
    }

    /// Turns the suppressed minimal non-planar graph into the certificate.
    fn certificate(&self, pieces: &[u32], orig: &[u32]) -> Kuratowski {
        let mut branch: Vec<Vertex> = pieces
            .iter()
            .flat_map(|&p| [self.arena[p as usize].a, self.arena[p as usize].b])
            .map(|v| orig[v as usize])
            .collect();
        branch.sort_unstable();
        branch.dedup();
        let kind = if branch.len() == 5 {
            KuratowskiKind::K5
        } else {
            KuratowskiKind::K33
        };
        if kind == KuratowskiKind::K33 {
            // Two-colour the six branch vertices along the pieces; the side of the smallest first.
            let index = |v: Vertex| branch.binary_search(&v).unwrap_or(0);
            let mut colour = vec![u8::MAX; branch.len()];
            colour[0] = 0;
            for _ in 0..branch.len() {
                for &p in pieces {
                    let node = self.arena[p as usize];
                    let (i, j) = (index(orig[node.a as usize]), index(orig[node.b as usize]));
                    if colour[i] != u8::MAX && colour[j] == u8::MAX {
                        colour[j] = 1 - colour[i];
                    } else if colour[j] != u8::MAX && colour[i] == u8::MAX {
                        colour[i] = 1 - colour[j];
                    }
                }
            }
            let mut sides: Vec<Vertex> = Vec::with_capacity(branch.len());
            for c in [0u8, 1] {
                sides.extend(
                    branch
                        .iter()
                        .zip(&colour)
                        .filter(|&(_, &k)| k == c)
                        .map(|(&v, _)| v),
                );
            }
            if sides.len() == branch.len() {
                branch = sides;
            }
        }
        let mut paths: Vec<Vec<Vertex>> = pieces
            .iter()
            .map(|&p| {
                let node = self.arena[p as usize];
                let mut path: Vec<Vertex> = self
                    .expand(p, node.a)
                    .into_iter()
                    .map(|v| orig[v as usize])
                    .collect();
                if path.first() > path.last() {
                    path.reverse();
                }
                path
            })
            .collect();
        paths.sort_unstable();
        let mut edges: Vec<(Vertex, Vertex)> = paths
            .iter()
            .flat_map(|path| path.windows(2).map(|w| (w[0].min(w[1]), w[0].max(w[1]))))
            .collect();
        edges.sort_unstable();
        edges.dedup();
        Kuratowski {
            kind,
            branch_vertices: branch,
            paths,
            edges,
        }
    }
}

#[cfg(test)]
mod tests {
    use std::sync::atomic::AtomicBool;

    use super::*;
    use crate::engine::certify::check_kuratowski;

    /// Runs the test in certifying mode on a graph that must fail it, then isolates: the
    /// certificate (checked) and the oracle's work. Without windows, the isolation starts from
    /// the whole graph.
    fn isolate_checked(g: &Graph, use_windows: bool) -> (Kuratowski, OracleWork) {
        let never = AtomicBool::new(false);
        let mut progress = |_| {};
        let mut monitor = Monitor::new(&never, &mut progress);
        let mut state = LrState::new(g);
        assert_eq!(
            state.run(&mut monitor, Mode::Certify).unwrap(),
            Outcome::NonPlanar
        );
        let mut clue = state.failure_clue();
        drop(state);
        if !use_windows {
            clue.windows.clear();
        }
        let (k, work) = isolate_counting(g, clue, &mut monitor).unwrap();
        check_kuratowski(g, &k).unwrap();
        (k, work)
    }

    fn isolate_with(n: usize, edges: &[(u32, u32)], use_windows: bool) -> Kuratowski {
        let (g, _) = Graph::from_edges(n, edges).unwrap();
        isolate_checked(&g, use_windows).0
    }

    #[test]
    fn fallback_without_windows_still_finds_a_certificate() {
        // K6 (not planar, Kuratowski 1930) and a wheel-like graph with a K3,3 inside.
        let k6: Vec<(u32, u32)> = (0..6)
            .flat_map(|a| (a + 1..6).map(move |b| (a, b)))
            .collect();
        for use_windows in [true, false] {
            isolate_with(6, &k6, use_windows);
        }
        // The Petersen graph: its certificate must be K3,3 (it is cubic).
        let petersen: Vec<(u32, u32)> = (0..5u32)
            .flat_map(|i| [(i, (i + 1) % 5), (i, 5 + i), (5 + i, 5 + (i + 2) % 5)])
            .collect();
        for use_windows in [true, false] {
            assert_eq!(
                isolate_with(10, &petersen, use_windows).kind,
                KuratowskiKind::K33
            );
        }
    }

    #[test]
    fn oracle_work_stays_linear_on_crossing_chord_rings() {
        // A ring of 2k vertices with chords (2i, 2i + 3): each chord crosses only its two
        // neighbours, so for odd k the crossings form an odd cycle and the graph is not planar,
        // while every Kuratowski subgraph needs all k chords (a chord-crossing argument, common
        // practice). Shrinking by oracle calls alone took quadratic time here; the oracle's total
        // work must now stay within a constant factor of the graph's size.
        for k in [51u32, 201, 801, 3201] {
            let ring = 2 * k;
            let mut edges: Vec<(u32, u32)> = (0..ring).map(|i| (i, (i + 1) % ring)).collect();
            edges.extend((0..k).map(|i| (2 * i, (2 * i + 3) % ring)));
            let (g, _) = Graph::from_edges(ring as usize, &edges).unwrap();
            let (cert, work) = isolate_checked(&g, true);
            let chords = cert
                .edges
                .iter()
                .filter(|&&(a, b)| (a + 1) % ring != b && (b + 1) % ring != a)
                .count();
            assert_eq!(chords, k as usize, "every chord is needed");
            let size = (g.vertex_count() + g.edge_count()) as u64;
            assert!(
                work.pieces <= size + 200 && work.calls <= 32,
                "k = {k}: {work:?} for a graph of size {size}"
            );
        }
    }

    #[test]
    fn suppression_keeps_paths_and_drops_trees() {
        // A K4 with one edge subdivided twice and a pendant tree: compressing keeps the four
        // degree-3 vertices and six pieces, and the subdivided piece expands back to its path.
        let (g, _) = Graph::from_edges(
            9,
            &[
                (0, 1),
                (0, 2),
                (0, 3),
                (1, 2),
                (1, 3),
                (2, 4),
                (4, 5),
                (5, 3),
                (3, 6),
                (6, 7),
                (6, 8),
            ],
        )
        .unwrap();
        let never = AtomicBool::new(false);
        let mut progress = |_| {};
        let mut monitor = Monitor::new(&never, &mut progress);
        let mut iso = Isolator {
            arena: Vec::new(),
            local: vec![NONE; g.vertex_count()],
            protected: vec![0; g.vertex_count()],
            epoch: 0,
            monitor: &mut monitor,
            work: OracleWork::default(),
        };
        let input: Vec<u32> = g.edges().map(|(a, b)| iso.leaf(a, b, false)).collect();
        let pieces = iso.compress(&input);
        assert_eq!(pieces.len(), 6);
        let long = pieces
            .iter()
            .map(|&p| {
                let node = iso.arena[p as usize];
                iso.expand(p, node.a.min(node.b))
            })
            .find(|path| path.len() > 2)
            .unwrap();
        assert_eq!(long, vec![2, 4, 5, 3]);
        assert!(iso.test_compressed(&pieces).unwrap());
    }
}
