//! The left-right planarity test and its embedding phase (Brandes 2009), iterative throughout.
//!
//! This follows U. Brandes, "The Left-Right Planarity Test" (2009): a first depth-first search
//! orients the graph and computes lowpoints and nesting depths; a second one, visiting children in
//! nesting order, merges conflict pairs of return-edge intervals on a stack; the embedding phase
//! turns the resulting left/right sides into a rotation system. Both searches use explicit stacks
//! so that graphs with millions of vertices (and depth-first trees just as deep) cannot overflow
//! the call stack. Lowpoints and nesting depths are small integers, so adjacency lists are ordered
//! by bucket sort, keeping the whole test linear.

use super::{Embedding, Monitor, Phase, PlanarityError};
use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

#[derive(Clone, Copy, PartialEq, Eq)]
pub(super) enum Mode {
    /// Only the yes/no answer.
    TestOnly,
    /// Remember what is needed for an embedding or for isolating a Kuratowski subgraph.
    Certify,
}

#[derive(Clone, Copy, PartialEq, Eq, Debug)]
pub(super) enum Outcome {
    Planar,
    NonPlanar,
}

/// An interval of return edges, from `low` (lowest return point) to `high`, linked through `lref`.
#[derive(Clone, Copy)]
struct Interval {
    low: u32,
    high: u32,
}

impl Interval {
    const EMPTY: Interval = Interval {
        low: NONE,
        high: NONE,
    };
    #[inline]
    fn is_empty(&self) -> bool {
        self.low == NONE && self.high == NONE
    }
}

#[derive(Clone, Copy)]
struct ConflictPair {
    left: Interval,
    right: Interval,
}

impl ConflictPair {
    #[inline]
    fn swap(&mut self) {
        std::mem::swap(&mut self.left, &mut self.right);
    }
}

/// What the test saw when it failed: the depth-first forest and the back edges it had processed,
/// with nested windows of them around the failure (smallest first).
pub(super) struct FailureClue {
    /// Parent of each vertex in the depth-first forest (`NONE` for roots).
    pub parent: Vec<u32>,
    /// Back edges in the order the testing search met them, as `(descendant, ancestor)`.
    pub processed: Vec<(Vertex, Vertex)>,
    /// Start indices into `processed`, decreasing: `processed[start..]` are the back edges met
    /// inside the subtree of the failing vertex or one of its ancestors.
    pub window_starts: Vec<usize>,
}

pub(super) struct LrState<'g> {
    g: &'g Graph,
    n: usize,
    m: usize,
    /// Undirected edge id of each half-edge (CSR index).
    edge_of_half: Vec<u32>,
    /// The reverse of each half-edge.
    twin: Vec<u32>,
    /// Per edge, after orientation: the half-edge at its source.
    half: Vec<u32>,
    src: Vec<u32>,
    dst: Vec<u32>,
    height: Vec<u32>,
    parent_edge: Vec<u32>,
    lowpt: Vec<u32>,
    lowpt2: Vec<u32>,
    nesting: Vec<u32>,
    /// Outgoing edges per vertex, in nesting order.
    out_offsets: Vec<u32>,
    out_edges: Vec<u32>,
    lref: Vec<u32>,
    side: Vec<i8>,
    lowpt_edge: Vec<u32>,
    stack_bottom: Vec<u32>,
    stack: Vec<ConflictPair>,
    roots: Vec<Vertex>,
    // failure bookkeeping (Certify mode only)
    processed: Vec<(Vertex, Vertex)>,
    entered_at: Vec<u32>,
    failed_at: u32,
}

impl<'g> LrState<'g> {
    pub(super) fn new(g: &'g Graph) -> Self {
        LrState {
            g,
            n: g.vertex_count(),
            m: g.edge_count(),
            edge_of_half: Vec::new(),
            twin: Vec::new(),
            half: Vec::new(),
            src: Vec::new(),
            dst: Vec::new(),
            height: Vec::new(),
            parent_edge: Vec::new(),
            lowpt: Vec::new(),
            lowpt2: Vec::new(),
            nesting: Vec::new(),
            out_offsets: Vec::new(),
            out_edges: Vec::new(),
            lref: Vec::new(),
            side: Vec::new(),
            lowpt_edge: Vec::new(),
            stack_bottom: Vec::new(),
            stack: Vec::new(),
            roots: Vec::new(),
            processed: Vec::new(),
            entered_at: Vec::new(),
            failed_at: NONE,
        }
    }

    pub(super) fn run(
        &mut self,
        monitor: &mut Monitor<'_>,
        mode: Mode,
    ) -> Result<Outcome, PlanarityError> {
        self.index_edges();
        self.orient(monitor)?;
        self.order_by_nesting(|_, depth| depth as u64, 2 * self.n as u64 + 2);
        self.lref = vec![NONE; self.m];
        self.side = vec![1; self.m];
        self.lowpt_edge = vec![NONE; self.m];
        self.stack_bottom = vec![0; self.m];
        let record = mode == Mode::Certify;
        if record {
            self.entered_at = vec![0; self.n];
        }
        let mut pos: Vec<u32> = self.out_offsets[..self.n].to_vec();
        for i in 0..self.roots.len() {
            let root = self.roots[i];
            if !self.test_from(root, &mut pos, record, monitor)? {
                return Ok(Outcome::NonPlanar);
            }
        }
        Ok(Outcome::Planar)
    }

    /// Numbers undirected edges and pairs each half-edge with its reverse in one sweep: because
    /// adjacency lists are sorted, the reverses of `u`'s half-edges towards larger vertices turn up
    /// in ascending order of `u` at the front of each neighbour's list.
    fn index_edges(&mut self) {
        let (offsets, targets) = self.g.csr();
        let halves = targets.len();
        let mut edge_of_half = vec![NONE; halves];
        let mut twin = vec![NONE; halves];
        let mut cursor: Vec<u32> = offsets[..self.n].to_vec();
        let mut next_id = 0u32;
        for u in 0..self.n {
            for i in offsets[u]..offsets[u + 1] {
                let v = targets[i as usize] as usize;
                if v > u {
                    let j = cursor[v];
                    cursor[v] += 1;
                    debug_assert_eq!(targets[j as usize] as usize, u);
                    twin[i as usize] = j;
                    twin[j as usize] = i;
                    edge_of_half[i as usize] = next_id;
                    edge_of_half[j as usize] = next_id;
                    next_id += 1;
                }
            }
        }
        self.edge_of_half = edge_of_half;
        self.twin = twin;
    }

    /// Phase one: depth-first orientation, lowpoints and nesting depths (Brandes 2009, Alg. 2).
    fn orient(&mut self, monitor: &mut Monitor<'_>) -> Result<(), PlanarityError> {
        let (offsets, targets) = self.g.csr();
        let (n, m) = (self.n, self.m);
        self.half = vec![NONE; m];
        self.src = vec![NONE; m];
        self.dst = vec![NONE; m];
        self.lowpt = vec![0; m];
        self.lowpt2 = vec![0; m];
        self.nesting = vec![0; m];
        self.height = vec![NONE; n];
        self.parent_edge = vec![NONE; n];
        let mut cursor: Vec<u32> = offsets[..n].to_vec();
        let mut dfs: Vec<u32> = Vec::new();
        let mut visited = 0u64;
        for s in 0..n as u32 {
            if self.height[s as usize] != NONE {
                continue;
            }
            self.height[s as usize] = 0;
            self.roots.push(s);
            dfs.push(s);
            while let Some(&v) = dfs.last() {
                let vi = v as usize;
                if cursor[vi] < offsets[vi + 1] {
                    let h = cursor[vi];
                    cursor[vi] += 1;
                    let e = self.edge_of_half[h as usize] as usize;
                    if self.half[e] != NONE {
                        continue;
                    }
                    let w = targets[h as usize];
                    self.half[e] = h;
                    self.src[e] = v;
                    self.dst[e] = w;
                    self.lowpt[e] = self.height[vi];
                    self.lowpt2[e] = self.height[vi];
                    if self.height[w as usize] == NONE {
                        self.parent_edge[w as usize] = e as u32;
                        self.height[w as usize] = self.height[vi] + 1;
                        dfs.push(w);
                        visited += 1;
                        monitor.step(Phase::Orientation, visited, n as u64)?;
                    } else {
                        self.lowpt[e] = self.height[w as usize];
                        self.finish_edge(v, e);
                    }
                } else {
                    dfs.pop();
                    let e = self.parent_edge[vi];
                    if e != NONE {
                        self.finish_edge(self.src[e as usize], e as usize);
                    }
                }
            }
        }
        Ok(())
    }

    /// Nesting depth of `e` (leaving `v`) and the lowpoint update of `v`'s parent edge.
    #[inline]
    fn finish_edge(&mut self, v: Vertex, e: usize) {
        let hv = self.height[v as usize];
        self.nesting[e] = 2 * self.lowpt[e] + u32::from(self.lowpt2[e] < hv);
        let p = self.parent_edge[v as usize];
        if p != NONE {
            let p = p as usize;
            let (le, l2e) = (self.lowpt[e], self.lowpt2[e]);
            if le < self.lowpt[p] {
                self.lowpt2[p] = self.lowpt[p].min(l2e);
                self.lowpt[p] = le;
            } else if le > self.lowpt[p] {
                self.lowpt2[p] = self.lowpt2[p].min(le);
            } else {
                self.lowpt2[p] = self.lowpt2[p].min(l2e);
            }
        }
    }

    /// Sorts every vertex's outgoing edges by `key(edge, nesting)` with one global bucket sort.
    fn order_by_nesting(&mut self, key: impl Fn(usize, u32) -> u64, key_count: u64) {
        let (n, m) = (self.n, self.m);
        let mut bucket = vec![0u32; key_count as usize + 1];
        for e in 0..m {
            bucket[key(e, self.nesting[e]) as usize + 1] += 1;
        }
        for k in 1..bucket.len() {
            bucket[k] += bucket[k - 1];
        }
        let mut by_key = vec![0u32; m];
        for e in 0..m {
            let k = key(e, self.nesting[e]) as usize;
            by_key[bucket[k] as usize] = e as u32;
            bucket[k] += 1;
        }
        drop(bucket);
        let mut out_offsets = vec![0u32; n + 1];
        for e in 0..m {
            out_offsets[self.src[e] as usize + 1] += 1;
        }
        for v in 0..n {
            out_offsets[v + 1] += out_offsets[v];
        }
        let mut cursor = out_offsets.clone();
        let mut out_edges = vec![0u32; m];
        for &e in &by_key {
            let s = self.src[e as usize] as usize;
            out_edges[cursor[s] as usize] = e;
            cursor[s] += 1;
        }
        self.out_offsets = out_offsets;
        self.out_edges = out_edges;
    }

    #[inline]
    fn lowpt_of(&self, e: u32) -> u32 {
        self.lowpt[e as usize]
    }

    #[inline]
    fn conflicting(&self, i: Interval, b: u32) -> bool {
        !i.is_empty() && self.lowpt_of(i.high) > self.lowpt_of(b)
    }

    #[inline]
    fn lowest(&self, p: &ConflictPair) -> u32 {
        if p.left.is_empty() {
            return self.lowpt_of(p.right.low);
        }
        if p.right.is_empty() {
            return self.lowpt_of(p.left.low);
        }
        self.lowpt_of(p.left.low).min(self.lowpt_of(p.right.low))
    }

    /// Phase two from one root (Brandes 2009, Alg. 3-5). Returns false when a constraint fails.
    fn test_from(
        &mut self,
        root: Vertex,
        pos: &mut [u32],
        record: bool,
        monitor: &mut Monitor<'_>,
    ) -> Result<bool, PlanarityError> {
        let n = self.n as u64;
        let mut dfs: Vec<u32> = vec![root];
        if record {
            self.entered_at[root as usize] = self.processed.len() as u32;
        }
        let mut visited = 0u64;
        while let Some(&v) = dfs.last() {
            let vi = v as usize;
            if pos[vi] < self.out_offsets[vi + 1] {
                let ei = self.out_edges[pos[vi] as usize];
                pos[vi] += 1;
                let w = self.dst[ei as usize];
                self.stack_bottom[ei as usize] = self.stack.len() as u32;
                if self.parent_edge[w as usize] == ei {
                    if record {
                        self.entered_at[w as usize] = self.processed.len() as u32;
                    }
                    dfs.push(w);
                    visited += 1;
                    monitor.step(Phase::Testing, visited, n)?;
                    continue;
                }
                self.lowpt_edge[ei as usize] = ei;
                self.stack.push(ConflictPair {
                    left: Interval::EMPTY,
                    right: Interval { low: ei, high: ei },
                });
                if record {
                    self.processed.push((v, w));
                }
                if !self.integrate(v, ei) {
                    self.failed_at = v;
                    return Ok(false);
                }
            } else {
                dfs.pop();
                let e = self.parent_edge[vi];
                if e == NONE {
                    continue;
                }
                let u = self.src[e as usize];
                self.trim_back_edges(u);
                // The side of `e` follows a highest return edge.
                if self.lowpt_of(e) < self.height[u as usize] {
                    if let Some(top) = self.stack.last() {
                        let (hl, hr) = (top.left.high, top.right.high);
                        self.lref[e as usize] = if hl != NONE
                            && (hr == NONE || self.lowpt_of(hl) > self.lowpt_of(hr))
                        {
                            hl
                        } else {
                            hr
                        };
                    }
                }
                if !self.integrate(u, e) {
                    self.failed_at = u;
                    return Ok(false);
                }
            }
        }
        Ok(true)
    }

    /// Integrates the return edges of `ei` (leaving `v`) into the constraints of `v`'s parent edge.
    #[inline]
    fn integrate(&mut self, v: Vertex, ei: u32) -> bool {
        let vi = v as usize;
        if self.lowpt_of(ei) < self.height[vi] {
            let e = self.parent_edge[vi];
            if self.out_edges[self.out_offsets[vi] as usize] == ei {
                if e != NONE {
                    self.lowpt_edge[e as usize] = self.lowpt_edge[ei as usize];
                }
            } else if !self.add_constraints(ei, e) {
                return false;
            }
        }
        true
    }

    fn add_constraints(&mut self, ei: u32, e: u32) -> bool {
        let mut p = ConflictPair {
            left: Interval::EMPTY,
            right: Interval::EMPTY,
        };
        let bottom = self.stack_bottom[ei as usize] as usize;
        // Merge the return edges of `ei` into p.right.
        loop {
            let Some(mut q) = self.stack.pop() else {
                break;
            };
            if !q.left.is_empty() {
                q.swap();
            }
            if !q.left.is_empty() {
                return false;
            }
            if self.lowpt_of(q.right.low) > self.lowpt_of(e) {
                if p.right.is_empty() {
                    p.right = q.right;
                } else {
                    self.lref[p.right.low as usize] = q.right.high;
                }
                p.right.low = q.right.low;
            } else {
                self.lref[q.right.low as usize] = self.lowpt_edge[e as usize];
            }
            if self.stack.len() == bottom {
                break;
            }
        }
        // Merge the conflicting return edges of earlier siblings into p.left.
        while let Some(top) = self.stack.last() {
            if !(self.conflicting(top.left, ei) || self.conflicting(top.right, ei)) {
                break;
            }
            let mut q = self.stack.pop().unwrap_or(ConflictPair {
                left: Interval::EMPTY,
                right: Interval::EMPTY,
            });
            if self.conflicting(q.right, ei) {
                q.swap();
            }
            if self.conflicting(q.right, ei) {
                return false;
            }
            if p.right.low != NONE {
                self.lref[p.right.low as usize] = q.right.high;
            }
            if q.right.low != NONE {
                p.right.low = q.right.low;
            }
            if p.left.is_empty() {
                p.left = q.left;
            } else if p.left.low != NONE {
                self.lref[p.left.low as usize] = q.left.high;
            }
            p.left.low = q.left.low;
        }
        if !(p.left.is_empty() && p.right.is_empty()) {
            self.stack.push(p);
        }
        true
    }

    /// Drops return edges that end at `u` from the top of the stack.
    fn trim_back_edges(&mut self, u: Vertex) {
        let hu = self.height[u as usize];
        while let Some(top) = self.stack.last() {
            if self.lowest(top) != hu {
                break;
            }
            let p = self.stack.pop().unwrap_or(ConflictPair {
                left: Interval::EMPTY,
                right: Interval::EMPTY,
            });
            if p.left.low != NONE {
                self.side[p.left.low as usize] = -1;
            }
        }
        let Some(mut p) = self.stack.pop() else {
            return;
        };
        while p.left.high != NONE && self.dst[p.left.high as usize] == u {
            p.left.high = self.lref[p.left.high as usize];
        }
        if p.left.high == NONE && p.left.low != NONE {
            self.lref[p.left.low as usize] = p.right.low;
            self.side[p.left.low as usize] = -1;
            p.left.low = NONE;
        }
        while p.right.high != NONE && self.dst[p.right.high as usize] == u {
            p.right.high = self.lref[p.right.high as usize];
        }
        if p.right.high == NONE && p.right.low != NONE {
            self.lref[p.right.low as usize] = p.left.low;
            self.side[p.right.low as usize] = -1;
            p.right.low = NONE;
        }
        self.stack.push(p);
    }

    /// What the Kuratowski isolation needs after a failed run in `Certify` mode.
    pub(super) fn failure_clue(&mut self) -> FailureClue {
        let n = self.n;
        let mut parent = vec![NONE; n];
        for (w, &e) in self.parent_edge.iter().enumerate() {
            if e != NONE {
                parent[w] = self.src[e as usize];
            }
        }
        let processed = std::mem::take(&mut self.processed);
        let mut window_starts = Vec::new();
        if self.failed_at != NONE && !self.entered_at.is_empty() {
            // The failing vertex's subtree, then ancestors whose windows grow eightfold each time.
            let total = processed.len();
            let mut v = self.failed_at;
            let mut last_size = 0usize;
            loop {
                let start = self.entered_at[v as usize] as usize;
                let size = total - start;
                if window_starts.is_empty() || size >= 8 * last_size.max(1) {
                    window_starts.push(start);
                    last_size = size;
                }
                let p = parent[v as usize];
                if p == NONE {
                    break;
                }
                v = p;
            }
            if window_starts.last() != Some(&0) {
                window_starts.push(0);
            }
        }
        FailureClue {
            parent,
            processed,
            window_starts,
        }
    }

    /// Phase three: the sides of all edges, the final nesting order and the rotation system
    /// (Brandes 2009, Alg. 6-7).
    pub(super) fn embedding(
        &mut self,
        monitor: &mut Monitor<'_>,
    ) -> Result<Embedding, PlanarityError> {
        let (n, m) = (self.n, self.m);
        // Resolve each edge's side by following its reference chain once.
        let mut chain: Vec<u32> = Vec::new();
        for e in 0..m as u32 {
            let mut x = e;
            while self.lref[x as usize] != NONE {
                chain.push(x);
                x = self.lref[x as usize];
            }
            while let Some(y) = chain.pop() {
                let r = self.lref[y as usize];
                self.side[y as usize] *= self.side[r as usize];
                self.lref[y as usize] = NONE;
            }
            monitor.step(Phase::Embedding, u64::from(e), 2 * m as u64)?;
        }
        let base = 2 * n as u64 + 1;
        let side = std::mem::take(&mut self.side);
        self.order_by_nesting(
            |e, depth| {
                if side[e] > 0 {
                    base + u64::from(depth)
                } else {
                    base - u64::from(depth)
                }
            },
            2 * base + 1,
        );
        self.side = side;

        let (offsets, targets) = self.g.csr();
        let halves = targets.len();
        let mut cw = vec![NONE; halves];
        let mut ccw = vec![NONE; halves];
        let mut first = vec![NONE; n];
        for v in 0..n {
            let range = self.out_offsets[v] as usize..self.out_offsets[v + 1] as usize;
            let mut previous = NONE;
            for k in range.clone() {
                let h = self.half[self.out_edges[k] as usize];
                if previous == NONE {
                    first[v] = h;
                } else {
                    cw[previous as usize] = h;
                    ccw[h as usize] = previous;
                }
                previous = h;
            }
            if previous != NONE {
                cw[previous as usize] = first[v];
                ccw[first[v] as usize] = previous;
            }
        }
        let insert_after = |cw: &mut Vec<u32>, ccw: &mut Vec<u32>, reference: u32, h: u32| {
            let next = cw[reference as usize];
            cw[reference as usize] = h;
            ccw[h as usize] = reference;
            cw[h as usize] = next;
            ccw[next as usize] = h;
        };
        let mut left_ref = vec![NONE; n];
        let mut right_ref = vec![NONE; n];
        let mut pos: Vec<u32> = self.out_offsets[..n].to_vec();
        let mut dfs: Vec<u32> = Vec::new();
        let mut visited = 0u64;
        for i in 0..self.roots.len() {
            dfs.push(self.roots[i]);
            while let Some(&v) = dfs.last() {
                let vi = v as usize;
                if pos[vi] >= self.out_offsets[vi + 1] {
                    dfs.pop();
                    continue;
                }
                let ei = self.out_edges[pos[vi] as usize] as usize;
                pos[vi] += 1;
                let w = self.dst[ei] as usize;
                let h_out = self.half[ei];
                let h_in = self.twin[h_out as usize];
                if self.parent_edge[w] == ei as u32 {
                    // The parent becomes the first neighbour of w, just before its children.
                    if first[w] == NONE {
                        cw[h_in as usize] = h_in;
                        ccw[h_in as usize] = h_in;
                    } else {
                        let before = ccw[first[w] as usize];
                        insert_after(&mut cw, &mut ccw, before, h_in);
                    }
                    first[w] = h_in;
                    left_ref[vi] = h_out;
                    right_ref[vi] = h_out;
                    dfs.push(w as u32);
                    visited += 1;
                    monitor.step(Phase::Embedding, m as u64 + visited, 2 * m as u64)?;
                } else if self.side[ei] == 1 {
                    insert_after(&mut cw, &mut ccw, right_ref[w], h_in);
                } else {
                    let before = ccw[left_ref[w] as usize];
                    insert_after(&mut cw, &mut ccw, before, h_in);
                    left_ref[w] = h_in;
                }
            }
        }
        // Read the rotation lists out of the linked lists.
        let mut rotation = Vec::with_capacity(halves);
        for v in 0..n {
            let degree = (offsets[v + 1] - offsets[v]) as usize;
            if degree == 0 {
                continue;
            }
            let start = first[v];
            let mut h = start;
            for _ in 0..degree {
                rotation.push(targets[h as usize]);
                h = cw[h as usize];
            }
            debug_assert_eq!(h, start);
        }
        Ok(Embedding::from_parts(offsets.to_vec(), rotation))
    }
}
