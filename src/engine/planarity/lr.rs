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

/// What the test saw when it failed, in the test's internal vertex numbering (depth-first
/// preorder, so every subtree is a contiguous range and ancestors have smaller numbers).
pub(super) struct FailureClue {
    /// `orig[v]` is the caller's label of internal vertex `v`.
    pub orig: Vec<u32>,
    /// Parent in the depth-first forest (`NONE` for roots).
    pub parent: Vec<u32>,
    /// The subtree of `v` is `v..subtree_end[v]`.
    pub subtree_end: Vec<u32>,
    /// Back edges in the order the testing search met them, as `(descendant, ancestor)`.
    pub processed: Vec<(Vertex, Vertex)>,
    /// `(start, a)`, smallest first: `processed[start..]` are the back edges met inside the
    /// subtree of `a`, the failing vertex or one of its ancestors.
    pub windows: Vec<(usize, Vertex)>,
}

pub(super) struct LrState<'g> {
    g: &'g Graph,
    n: usize,
    m: usize,
    /// Internal vertex numbers are depth-first preorder numbers; `orig[v]` is the caller's vertex.
    /// Renumbering once makes subtrees contiguous, so the later phases mostly touch nearby memory
    /// even when the caller's labels are shuffled.
    orig: Vec<u32>,
    /// The caller's labels of each edge's ends (Certify mode only), for the embedding output.
    src_orig: Vec<u32>,
    dst_orig: Vec<u32>,
    /// Edges are numbered by source vertex, then nesting order: the outgoing edges of `v` are
    /// exactly `out_offsets[v]..out_offsets[v + 1]`, already in the order the test visits them.
    out_offsets: Vec<u32>,
    dst: Vec<u32>,
    parent: Vec<u32>,
    parent_edge: Vec<u32>,
    lowpt: Vec<u32>,
    nesting: Vec<u32>,
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
            orig: Vec::new(),
            src_orig: Vec::new(),
            dst_orig: Vec::new(),
            out_offsets: Vec::new(),
            dst: Vec::new(),
            parent: Vec::new(),
            parent_edge: Vec::new(),
            lowpt: Vec::new(),
            nesting: Vec::new(),
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
        self.orient(monitor, mode)?;
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

    /// Phase one: depth-first orientation, lowpoints and nesting depths (Brandes 2009, Alg. 2),
    /// on the caller's graph; then the renumbering into preorder and nesting order.
    ///
    /// An undirected depth-first search only produces tree edges and edges between a vertex and
    /// an ancestor, so an edge to an already visited vertex is a new back edge exactly when that
    /// vertex is higher up and is not the parent; from the other side it was already oriented.
    fn orient(&mut self, monitor: &mut Monitor<'_>, mode: Mode) -> Result<(), PlanarityError> {
        let (offsets, targets) = self.g.csr();
        let (n, m) = (self.n, self.m);
        // Per edge, numbered in the order the search orients them. Ends are kept both as
        // preorder numbers (for the renumbering) and as the caller's labels (for the output).
        let mut src_pre: Vec<u32> = Vec::with_capacity(m);
        let mut dst_pre: Vec<u32> = Vec::with_capacity(m);
        let keep_labels = mode == Mode::Certify;
        let mut dst_o: Vec<u32> = Vec::with_capacity(if keep_labels { m } else { 0 });
        let mut lowpt_o: Vec<u32> = Vec::with_capacity(m);
        let mut lowpt2_o: Vec<u32> = Vec::with_capacity(m);
        let mut nesting_o: Vec<u32> = vec![0; m];
        // The only array read once per half-edge at a random place is `pre_o` (caller's labels,
        // `NONE` while unvisited): four bytes per vertex. Lowpoints are preorder numbers rather
        // than heights (Hopcroft and Tarjan's convention): both increase strictly along every
        // root path, and the test only ever compares return points on one root path, so the
        // same array also tells ancestors apart and no height is needed. Everything else per
        // vertex is written once, in preorder (sequential), or lives on the search stack.
        let mut pre_o: Vec<u32> = vec![NONE; n];
        let mut orig = vec![0u32; n];
        let mut parent = vec![NONE; n];
        let mut parent_edge_o = vec![NONE; n];
        /// One vertex on the search stack.
        #[derive(Clone, Copy)]
        struct Frame {
            v: u32,
            cursor: u32,
            end: u32,
            parent_edge: u32,
            pre: u32,
            /// The parent's label (`NONE` for a root): the one earlier neighbour that is not a
            /// back edge.
            parent: u32,
        }
        let mut next_pre = 0u32;
        let mut dfs: Vec<Frame> = Vec::new();
        // Nesting depth of `e` (leaving vertex `hv` whose parent edge is `p`) and the
        // lowpoint update of `p`.
        let finish = |e: usize,
                      hv: u32,
                      p: u32,
                      lowpt_o: &mut [u32],
                      lowpt2_o: &mut [u32],
                      nesting_o: &mut [u32]| {
            nesting_o[e] = 2 * lowpt_o[e] + u32::from(lowpt2_o[e] < hv);
            if p != NONE {
                let p = p as usize;
                let (le, l2e) = (lowpt_o[e], lowpt2_o[e]);
                if le < lowpt_o[p] {
                    lowpt2_o[p] = lowpt_o[p].min(l2e);
                    lowpt_o[p] = le;
                } else if le > lowpt_o[p] {
                    lowpt2_o[p] = lowpt2_o[p].min(le);
                } else {
                    lowpt2_o[p] = lowpt2_o[p].min(l2e);
                }
            }
        };
        for s in 0..n {
            if pre_o[s] != NONE {
                continue;
            }
            pre_o[s] = next_pre;
            orig[next_pre as usize] = s as u32;
            self.roots.push(next_pre);
            dfs.push(Frame {
                v: s as u32,
                cursor: offsets[s],
                end: offsets[s + 1],
                parent_edge: NONE,
                pre: next_pre,
                parent: NONE,
            });
            next_pre += 1;
            while let Some(top) = dfs.last_mut() {
                let Frame {
                    v,
                    cursor,
                    end,
                    parent_edge: pe,
                    pre: v_pre,
                    parent: par,
                } = *top;
                // Scan v's remaining neighbours until one leads down the tree.
                let mut h = cursor;
                let mut child = NONE;
                while h < end {
                    let w = targets[h as usize];
                    h += 1;
                    let pw = pre_o[w as usize];
                    if pw == NONE {
                        child = w;
                        break;
                    }
                    if pw < v_pre && w != par {
                        let e = src_pre.len();
                        src_pre.push(v_pre);
                        dst_pre.push(pw);
                        if keep_labels {
                            dst_o.push(w);
                        }
                        lowpt_o.push(pw);
                        lowpt2_o.push(v_pre);
                        finish(e, v_pre, pe, &mut lowpt_o, &mut lowpt2_o, &mut nesting_o);
                    }
                }
                top.cursor = h;
                if child != NONE {
                    let w = child;
                    let e = src_pre.len() as u32;
                    src_pre.push(v_pre);
                    dst_pre.push(next_pre);
                    if keep_labels {
                        dst_o.push(w);
                    }
                    lowpt_o.push(v_pre);
                    lowpt2_o.push(v_pre);
                    let wi = w as usize;
                    pre_o[wi] = next_pre;
                    let p = next_pre as usize;
                    orig[p] = w;
                    parent[p] = v_pre;
                    parent_edge_o[p] = e;
                    dfs.push(Frame {
                        v: w,
                        cursor: offsets[wi],
                        end: offsets[wi + 1],
                        parent_edge: e,
                        pre: next_pre,
                        parent: v,
                    });
                    next_pre += 1;
                    monitor.step(Phase::Orientation, u64::from(next_pre), n as u64)?;
                    continue;
                }
                dfs.pop();
                if pe != NONE
                    && let Some(below) = dfs.last()
                {
                    finish(
                        pe as usize,
                        below.pre,
                        below.parent_edge,
                        &mut lowpt_o,
                        &mut lowpt2_o,
                        &mut nesting_o,
                    );
                }
            }
        }
        drop(pre_o);
        debug_assert_eq!(src_pre.len(), m);
        drop(lowpt2_o);
        // Renumber: vertices by preorder, edges by (source, nesting depth) through one global
        // bucket sort on nesting depth followed by a stable distribution by source.
        let mut out_offsets = vec![0u32; n + 1];
        for &s in &src_pre {
            out_offsets[s as usize + 1] += 1;
        }
        for v in 0..n {
            out_offsets[v + 1] += out_offsets[v];
        }
        let key_count = 2 * n + 2;
        let mut bucket = vec![0u32; key_count + 1];
        for &d in &nesting_o {
            bucket[d as usize + 1] += 1;
        }
        for k in 1..bucket.len() {
            bucket[k] += bucket[k - 1];
        }
        let mut by_key = vec![0u32; m];
        for (e, &d) in nesting_o.iter().enumerate() {
            by_key[bucket[d as usize] as usize] = e as u32;
            bucket[d as usize] += 1;
        }
        drop(bucket);
        let mut fill = out_offsets.clone();
        let mut new_id = vec![0u32; m];
        for &e in &by_key {
            let s = src_pre[e as usize] as usize;
            new_id[e as usize] = fill[s];
            fill[s] += 1;
        }
        drop(by_key);
        drop(fill);
        let mut dst = vec![0u32; m];
        let mut lowpt = vec![0u32; m];
        let mut nesting = vec![0u32; m];
        let (mut src_orig, mut dst_orig) = if keep_labels {
            (vec![0u32; m], vec![0u32; m])
        } else {
            (Vec::new(), Vec::new())
        };
        for e in 0..m {
            let k = new_id[e] as usize;
            dst[k] = dst_pre[e];
            lowpt[k] = lowpt_o[e];
            nesting[k] = nesting_o[e];
            if keep_labels {
                dst_orig[k] = dst_o[e];
            }
        }
        drop((dst_pre, dst_o, lowpt_o, nesting_o));
        let mut parent_edge = parent_edge_o;
        for e in parent_edge.iter_mut() {
            if *e != NONE {
                *e = new_id[*e as usize];
            }
        }
        if keep_labels {
            for (p, &v) in orig.iter().enumerate() {
                for k in out_offsets[p]..out_offsets[p + 1] {
                    src_orig[k as usize] = v;
                }
            }
        }
        self.src_orig = src_orig;
        self.dst_orig = dst_orig;
        self.orig = orig;
        self.out_offsets = out_offsets;
        self.dst = dst;
        self.parent = parent;
        self.parent_edge = parent_edge;
        self.lowpt = lowpt;
        self.nesting = nesting;
        Ok(())
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
                let ei = pos[vi];
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
                let u = self.parent[vi];
                self.trim_back_edges(u);
                // The side of `e` follows a highest return edge.
                if self.lowpt_of(e) < u
                    && let Some(top) = self.stack.last()
                {
                    let (hl, hr) = (top.left.high, top.right.high);
                    self.lref[e as usize] =
                        if hl != NONE && (hr == NONE || self.lowpt_of(hl) > self.lowpt_of(hr)) {
                            hl
                        } else {
                            hr
                        };
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
        if self.lowpt_of(ei) < v {
            let e = self.parent_edge[vi];
            if self.out_offsets[vi] == ei {
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
        while let Some(mut q) = self.stack.pop() {
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
        let hu = u;
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
        // Preorder numbering: a reverse sweep accumulates subtree sizes.
        let mut subtree_end: Vec<u32> = (1..=n as u32).collect();
        for v in (0..n).rev() {
            let p = self.parent[v];
            if p != NONE {
                subtree_end[p as usize] = subtree_end[p as usize].max(subtree_end[v]);
            }
        }
        let processed = std::mem::take(&mut self.processed);
        let mut windows = Vec::new();
        if self.failed_at != NONE && !self.entered_at.is_empty() {
            // The failing vertex's subtree, then ancestors whose windows grow eightfold each time.
            let total = processed.len();
            let mut v = self.failed_at;
            let mut last_size = 0usize;
            loop {
                let start = self.entered_at[v as usize] as usize;
                let size = total - start + (subtree_end[v as usize] - v) as usize;
                let p = self.parent[v as usize];
                if windows.is_empty() || size >= 8 * last_size.max(1) || p == NONE {
                    windows.push((start, v));
                    last_size = size;
                }
                if p == NONE {
                    break;
                }
                v = p;
            }
        }
        FailureClue {
            orig: std::mem::take(&mut self.orig),
            parent: std::mem::take(&mut self.parent),
            subtree_end,
            processed,
            windows,
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
        // Re-sort every vertex's outgoing edges by signed nesting depth. They are already sorted
        // by nesting depth, so the new order is the left edges from deepest to shallowest, then
        // the right edges from shallowest to deepest: one local pass, no sort.
        let mut order = vec![0u32; m];
        for v in 0..n {
            let (lo, hi) = (self.out_offsets[v], self.out_offsets[v + 1]);
            let mut k = lo as usize;
            for e in (lo..hi).rev() {
                if self.side[e as usize] < 0 {
                    order[k] = e;
                    k += 1;
                }
            }
            for e in lo..hi {
                if self.side[e as usize] > 0 {
                    order[k] = e;
                    k += 1;
                }
            }
        }

        // Brandes' Alg. 7 inserts every back edge into the rotation of its target `w` next to
        // the tree edge from `w` towards the back edge's source: to the right of it when the back
        // edge is on the right, to the left otherwise, each new one nearest to the tree edge. So
        // around `w` the clockwise order is: the parent, then for each outgoing edge in the
        // final order either the edge itself (a back edge) or, for a tree edge to child `c`, the
        // left back edges coming up from `c`'s subtree in reverse order of the embedding
        // search, the tree edge, and the right ones in reverse order of the search. The search
        // below only records, for each back edge, its group `2c + side` and its source's label;
        // a counting sort by group then gives every rotation in one sequential pass, without
        // linked lists.
        let mut current_child = vec![NONE; n];
        let mut back_group: Vec<u32> = Vec::with_capacity(m);
        let mut back_label: Vec<u32> = Vec::with_capacity(m);
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
                let ei = order[pos[vi] as usize] as usize;
                pos[vi] += 1;
                let w = self.dst[ei] as usize;
                if self.parent_edge[w] == ei as u32 {
                    current_child[vi] = w as u32;
                    dfs.push(w as u32);
                    visited += 1;
                    monitor.step(Phase::Embedding, m as u64 + visited, 2 * m as u64)?;
                } else {
                    let c = current_child[w];
                    back_group.push(2 * c + u32::from(self.side[ei] == 1));
                    back_label.push(self.orig[vi]);
                }
            }
        }
        drop((pos, dfs, current_child));
        // Counting sort of the back edges by group, keeping the search order inside a group.
        let mut group_start = vec![0u32; 2 * n + 1];
        for &gr in &back_group {
            group_start[gr as usize + 1] += 1;
        }
        for k in 1..group_start.len() {
            group_start[k] += group_start[k - 1];
        }
        let mut grouped = vec![0u32; back_group.len()];
        {
            let mut fill: Vec<u32> = group_start[..2 * n].to_vec();
            for (&gr, &label) in back_group.iter().zip(&back_label) {
                grouped[fill[gr as usize] as usize] = label;
                fill[gr as usize] += 1;
            }
        }
        drop((back_group, back_label));
        // Write every rotation where the caller's CSR layout puts it. The start of each block is
        // gathered first in a loop of independent loads, which the processor overlaps; inside
        // the main loop each of those cache misses would stall it.
        let (offsets, _) = self.g.csr();
        let start: Vec<u32> = self.orig.iter().map(|&o| offsets[o as usize]).collect();
        let mut rotation = vec![0u32; 2 * m];
        for v in 0..n {
            let mut slot = start[v] as usize;
            let pe = self.parent_edge[v];
            if pe != NONE {
                rotation[slot] = self.src_orig[pe as usize];
                slot += 1;
            }
            for k in self.out_offsets[v]..self.out_offsets[v + 1] {
                let e = order[k as usize] as usize;
                let c = self.dst[e] as usize;
                let tree = self.parent_edge[c] == e as u32;
                if tree {
                    let (lo, hi) = (group_start[2 * c] as usize, group_start[2 * c + 1] as usize);
                    for &label in grouped[lo..hi].iter().rev() {
                        rotation[slot] = label;
                        slot += 1;
                    }
                }
                rotation[slot] = self.dst_orig[e];
                slot += 1;
                if tree {
                    let (lo, hi) = (
                        group_start[2 * c + 1] as usize,
                        group_start[2 * c + 2] as usize,
                    );
                    for &label in grouped[lo..hi].iter().rev() {
                        rotation[slot] = label;
                        slot += 1;
                    }
                }
            }
            debug_assert_eq!(slot, offsets[self.orig[v] as usize + 1] as usize);
        }
        Ok(Embedding::from_parts(offsets.to_vec(), rotation))
    }
}
