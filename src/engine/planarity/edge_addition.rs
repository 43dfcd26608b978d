//! Edge addition (Boyer and Myrvold 2004), used to locate a Kuratowski subgraph in linear time.
//!
//! J. M. Boyer and W. J. Myrvold, "On the Cutting Edge: Simplified O(n) Planarity by Edge
//! Addition", Journal of Graph Algorithms and Applications 8(3), 2004. The method embeds a
//! depth-first tree, then visits the vertices from the deepest preorder number up and adds each
//! vertex's back edges to its descendants, merging (and lazily flipping) biconnected pieces of the
//! partial embedding. When a back edge cannot be added, the partial embedding around the blocked
//! piece shows where an obstruction lies: a biconnected piece B with root r, two vertices x and y
//! on its outer face that still have to reach ancestors of the current vertex v, and a vertex w
//! between them that still has to reach v (section 4 of the paper, minors A to E).
//!
//! Here the test is only run on graphs already known to be non-planar, and only the *location*
//! is used: [`obstruction_edges`] returns the union of every path the paper's five minors are
//! built from (B's outer face, the highest x-y path, a path from its inside to r, the unembedded
//! connections of x, y, w and a vertex z below the x-y path, and the tree path through v). That
//! union contains the minor that applies, so it is non-planar, and it is made of a constant number
//! of paths, so it suppresses to a constant number of pieces: the caller can then delete pieces
//! one by one with the planarity test as an oracle in constant time, and never needs the paper's
//! case analysis to be right for the answer to be right. Everything here is O(n + m).

use super::{Monitor, Phase, PlanarityError};

const NIL: u32 = u32::MAX;

/// What edge addition says about a graph.
pub(super) enum Outcome {
    Planar,
    /// Non-planar: the edges (indices into the input) of a non-planar subgraph made of a
    /// constant number of paths.
    Located(Vec<usize>),
    /// Non-planar, but the partial embedding was not as the paper describes (never seen in the
    /// tests); the caller falls back to a slower method.
    NotLocated,
}

/// Runs edge addition on the simple graph with `k` vertices and the given edges.
pub(super) fn obstruction_edges(
    k: usize,
    edges: &[(u32, u32)],
    monitor: &mut Monitor<'_>,
) -> Result<Outcome, PlanarityError> {
    if k == 0 || edges.is_empty() {
        return Ok(Outcome::Planar);
    }
    let mut ea = EdgeAddition::new(k, edges);
    let Some((v, root)) = ea.run(monitor)? else {
        return Ok(Outcome::Planar);
    };
    Ok(match ea.isolate(v, root) {
        Some(found) => Outcome::Located(found),
        None => Outcome::NotLocated,
    })
}

struct EdgeAddition {
    /// Number of real vertices; virtual root `n + c` stands for `parent[c]` in c's piece.
    n: usize,
    /// Ends of every edge in preorder numbers: ancestor (or parent) first.
    anc: Vec<u32>,
    desc: Vec<u32>,
    is_tree: Vec<bool>,
    parent: Vec<u32>,
    parent_edge: Vec<u32>,
    subtree_end: Vec<u32>,
    least_ancestor: Vec<u32>,
    least_edge: Vec<u32>,
    lowpoint: Vec<u32>,
    /// Back edges by their ancestor end: `fwd[fwd_off[v]..fwd_off[v + 1]]`.
    fwd_off: Vec<u32>,
    fwd: Vec<u32>,
    // The partial embedding. Arc `2e` sits at the ancestor end of edge `e`, `2e + 1` at the
    // descendant end. Adjacency lists are doubly linked; `link[node] = [first, last]`.
    link: Vec<[u32; 2]>,
    arc_link: Vec<[u32; 2]>,
    arc_nbr: Vec<u32>,
    /// On the arc from a piece's root to its child: the piece below was flipped (lazily).
    arc_flip: Vec<bool>,
    /// Outer-face neighbours, with short cuts over vertices that no longer matter.
    ext: Vec<[u32; 2]>,
    /// When short cuts leave a vertex with the root on both sides, whether the vertex is entered
    /// from the root's side s on its own side s (rather than 1 - s, as in a two-vertex piece).
    ext_inv: Vec<bool>,
    // Per vertex, for the current step.
    adjacent_to: Vec<u32>,
    pending_edge: Vec<u32>,
    visited: Vec<u32>,
    /// Children whose pieces still need the current vertex (pertinent roots), by child.
    pr_head: Vec<u32>,
    pr_tail: Vec<u32>,
    pr_next: Vec<u32>,
    pr_prev: Vec<u32>,
    /// Children not yet merged into their parent's piece, by lowpoint.
    sep_head: Vec<u32>,
    sep_next: Vec<u32>,
    sep_prev: Vec<u32>,
    stack: Vec<(u32, u32)>,
}

impl EdgeAddition {
    fn new(k: usize, edges: &[(u32, u32)]) -> Self {
        let m = edges.len();
        // Adjacency of the input.
        let mut off = vec![0u32; k + 1];
        for &(a, b) in edges {
            off[a as usize + 1] += 1;
            off[b as usize + 1] += 1;
        }
        for i in 0..k {
            off[i + 1] += off[i];
        }
        let mut fill = off.clone();
        let mut adj = vec![0u32; 2 * m];
        for (e, &(a, b)) in edges.iter().enumerate() {
            adj[fill[a as usize] as usize] = e as u32;
            fill[a as usize] += 1;
            adj[fill[b as usize] as usize] = e as u32;
            fill[b as usize] += 1;
        }
        // Iterative depth-first search; everything afterwards uses preorder numbers.
        let mut pre = vec![NIL; k];
        let mut parent = vec![NIL; k];
        let mut parent_edge = vec![NIL; k];
        let mut anc = vec![NIL; m];
        let mut desc = vec![NIL; m];
        let mut is_tree = vec![false; m];
        let mut next = 0u32;
        let mut stack: Vec<(u32, u32)> = Vec::new();
        for s in 0..k {
            if pre[s] != NIL {
                continue;
            }
            pre[s] = next;
            next += 1;
            stack.push((s as u32, off[s]));
            while let Some(top) = stack.last_mut() {
                let (u, cursor) = *top;
                if cursor == off[u as usize + 1] {
                    stack.pop();
                    continue;
                }
                top.1 += 1;
                let e = adj[cursor as usize] as usize;
                let (a, b) = edges[e];
                let w = if a == u { b } else { a };
                let (pu, pw) = (pre[u as usize], pre[w as usize]);
                if pw == NIL {
                    let p = next;
                    next += 1;
                    pre[w as usize] = p;
                    parent[p as usize] = pu;
                    parent_edge[p as usize] = e as u32;
                    anc[e] = pu;
                    desc[e] = p;
                    is_tree[e] = true;
                    stack.push((w, off[w as usize]));
                } else if pw < pu && anc[e] == NIL {
                    anc[e] = pw;
                    desc[e] = pu;
                }
            }
        }
        let mut least_ancestor: Vec<u32> = (0..k as u32).collect();
        let mut least_edge = vec![NIL; k];
        let mut fwd_off = vec![0u32; k + 1];
        for e in 0..m {
            if !is_tree[e] {
                let (a, d) = (anc[e], desc[e] as usize);
                fwd_off[a as usize + 1] += 1;
                if a < least_ancestor[d] {
                    least_ancestor[d] = a;
                    least_edge[d] = e as u32;
                }
            }
        }
        for i in 0..k {
            fwd_off[i + 1] += fwd_off[i];
        }
        let mut fwd = vec![0u32; fwd_off[k] as usize];
        let mut fill = fwd_off.clone();
        for e in 0..m {
            if !is_tree[e] {
                let a = anc[e] as usize;
                fwd[fill[a] as usize] = e as u32;
                fill[a] += 1;
            }
        }
        let mut lowpoint = least_ancestor.clone();
        let mut subtree_end: Vec<u32> = (1..=k as u32).collect();
        for v in (0..k).rev() {
            let p = parent[v];
            if p != NIL {
                let p = p as usize;
                lowpoint[p] = lowpoint[p].min(lowpoint[v]);
                subtree_end[p] = subtree_end[p].max(subtree_end[v]);
            }
        }
        // Separated children in lowpoint order (counting sort).
        let mut start = vec![0u32; k + 1];
        for &low in &lowpoint {
            start[low as usize + 1] += 1;
        }
        for i in 0..k {
            start[i + 1] += start[i];
        }
        let mut by_low = vec![0u32; k];
        for (v, &low) in lowpoint.iter().enumerate() {
            by_low[start[low as usize] as usize] = v as u32;
            start[low as usize] += 1;
        }
        drop(start);
        let mut sep_head = vec![NIL; k];
        let mut sep_tail = vec![NIL; k];
        let mut sep_next = vec![NIL; k];
        let mut sep_prev = vec![NIL; k];
        for &c in &by_low {
            let p = parent[c as usize];
            if p == NIL {
                continue;
            }
            let p = p as usize;
            if sep_tail[p] == NIL {
                sep_head[p] = c;
            } else {
                sep_next[sep_tail[p] as usize] = c;
                sep_prev[c as usize] = sep_tail[p];
            }
            sep_tail[p] = c;
        }
        // The depth-first tree as singleton pieces.
        let nodes = 2 * k;
        let mut link = vec![[NIL; 2]; nodes];
        let arc_link = vec![[NIL; 2]; 2 * m];
        let mut arc_nbr = vec![NIL; 2 * m];
        let mut ext = vec![[NIL; 2]; nodes];
        for c in 0..k {
            let e = parent_edge[c];
            if e == NIL {
                continue;
            }
            let r = (k + c) as u32;
            let (ar, ac) = (2 * e, 2 * e + 1);
            arc_nbr[ar as usize] = c as u32;
            arc_nbr[ac as usize] = r;
            link[r as usize] = [ar, ar];
            link[c] = [ac, ac];
            ext[r as usize] = [c as u32, c as u32];
            ext[c] = [r, r];
        }
        EdgeAddition {
            n: k,
            anc,
            desc,
            is_tree,
            parent,
            parent_edge,
            subtree_end,
            least_ancestor,
            least_edge,
            lowpoint,
            fwd_off,
            fwd,
            link,
            arc_link,
            arc_nbr,
            arc_flip: vec![false; 2 * m],
            ext,
            ext_inv: vec![false; nodes],
            adjacent_to: vec![NIL; k],
            pending_edge: vec![NIL; k],
            visited: vec![NIL; nodes],
            pr_head: vec![NIL; k],
            pr_tail: vec![NIL; k],
            pr_next: vec![NIL; k],
            pr_prev: vec![NIL; k],
            sep_head,
            sep_next,
            sep_prev,
            stack: Vec::new(),
        }
    }

    #[inline]
    fn pertinent(&self, w: u32, v: u32) -> bool {
        self.adjacent_to[w as usize] == v || self.pr_head[w as usize] != NIL
    }

    #[inline]
    fn externally_active(&self, w: u32, v: u32) -> bool {
        let wi = w as usize;
        self.least_ancestor[wi] < v
            || (self.sep_head[wi] != NIL && self.lowpoint[self.sep_head[wi] as usize] < v)
    }

    /// The next vertex along the outer face (short cuts included), leaving `node` on the side
    /// opposite to `came_in`, and the side it is entered on.
    #[inline]
    fn ext_next(&self, node: u32, came_in: u32) -> (u32, u32) {
        let next = self.ext[node as usize][1 ^ came_in as usize];
        (next, self.entry_side(next, node, came_in))
    }

    /// Which side of `next` points back to `from`; in a two-vertex piece both do, and the side is
    /// kept as it was so that the piece is walked like a cycle.
    #[inline]
    fn entry_side(&self, next: u32, from: u32, came_in: u32) -> u32 {
        let e = self.ext[next as usize];
        if e[0] == e[1] {
            came_in ^ u32::from(self.ext_inv[next as usize])
        } else if e[0] == from {
            0
        } else {
            1
        }
    }

    /// The first vertex seen from root `r` on side `side`, and the side it is entered on.
    #[inline]
    fn first_below(&self, r: u32, side: u32) -> (u32, u32) {
        let w = self.ext[r as usize][side as usize];
        (w, self.entry_side(w, r, 1 ^ side))
    }

    /// Runs the test; on failure returns the current vertex and the root of the blocked piece.
    fn run(&mut self, monitor: &mut Monitor<'_>) -> Result<Option<(u32, u32)>, PlanarityError> {
        let n = self.n as u32;
        for v in (0..n).rev() {
            monitor.step(Phase::Kuratowski, u64::from(n - v), u64::from(n))?;
            let (lo, hi) = (self.fwd_off[v as usize], self.fwd_off[v as usize + 1]);
            for i in lo..hi {
                let e = self.fwd[i as usize];
                self.walkup(v, e);
            }
            while self.pr_head[v as usize] != NIL {
                let c = self.pr_head[v as usize];
                self.pr_remove(v, c);
                if !self.walkdown(v, n + c) {
                    let top = self.stack.last().map(|&(r, _)| r).unwrap_or(n + c);
                    return Ok(Some((v, top)));
                }
            }
            for i in lo..hi {
                let d = self.desc[self.fwd[i as usize] as usize];
                if self.adjacent_to[d as usize] == v {
                    let mut c = d;
                    while self.parent[c as usize] != v {
                        c = self.parent[c as usize];
                    }
                    return Ok(Some((v, n + c)));
                }
            }
        }
        Ok(None)
    }

    fn walkup(&mut self, v: u32, e: u32) {
        let n = self.n as u32;
        let w = self.desc[e as usize];
        self.adjacent_to[w as usize] = v;
        self.pending_edge[w as usize] = e;
        let (mut x, mut xin, mut y, mut yin) = (w, 1u32, w, 0u32);
        loop {
            if self.visited[x as usize] == v || self.visited[y as usize] == v {
                break;
            }
            self.visited[x as usize] = v;
            self.visited[y as usize] = v;
            let r = if x >= n {
                x
            } else if y >= n {
                y
            } else {
                NIL
            };
            if r == NIL {
                (x, xin) = self.ext_next(x, xin);
                (y, yin) = self.ext_next(y, yin);
                continue;
            }
            let c = r - n;
            let z = self.parent[c as usize];
            if z == v {
                self.pr_push(v, c, true);
                break;
            }
            let front = self.lowpoint[c as usize] >= v;
            self.pr_push(z, c, front);
            (x, xin, y, yin) = (z, 1, z, 0);
        }
    }

    /// Returns false when blocked inside a child piece (the stack is left as it was).
    fn walkdown(&mut self, v: u32, root: u32) -> bool {
        let n = self.n as u32;
        self.stack.clear();
        for side in 0..2u32 {
            let (mut w, mut win) = self.first_below(root, side);
            while w != root {
                if w >= n {
                    return false;
                }
                if self.adjacent_to[w as usize] == v {
                    self.merge_pieces();
                    self.embed_back_edge(root, side, w, win);
                    self.adjacent_to[w as usize] = NIL;
                }
                if self.pr_head[w as usize] != NIL {
                    self.stack.push((w, win));
                    let r2 = n + self.pr_head[w as usize];
                    let (x, xin) = self.first_below(r2, 0);
                    let (y, yin) = self.first_below(r2, 1);
                    let x_int = self.pertinent(x, v) && !self.externally_active(x, v);
                    let y_int = self.pertinent(y, v) && !self.externally_active(y, v);
                    let (next, next_in, out) = if x_int {
                        (x, xin, 0)
                    } else if y_int {
                        (y, yin, 1)
                    } else if self.pertinent(x, v) {
                        (x, xin, 0)
                    } else {
                        (y, yin, 1)
                    };
                    self.stack.push((r2, out));
                    (w, win) = (next, next_in);
                } else if !self.pertinent(w, v) && !self.externally_active(w, v) {
                    (w, win) = self.ext_next(w, win);
                } else {
                    if self.stack.is_empty() {
                        self.ext[root as usize][side as usize] = w;
                        self.ext[w as usize][win as usize] = root;
                        let e = self.ext[w as usize];
                        self.ext_inv[w as usize] = e[0] == e[1] && win == side;
                    }
                    break;
                }
            }
            if !self.stack.is_empty() {
                return false;
            }
        }
        true
    }

    fn embed_back_edge(&mut self, root: u32, side: u32, w: u32, win: u32) {
        let e = self.pending_edge[w as usize];
        let (ar, aw) = (2 * e, 2 * e + 1);
        self.arc_nbr[ar as usize] = w;
        self.arc_nbr[aw as usize] = root;
        self.insert(root, ar, side);
        self.insert(w, aw, win);
        self.ext[root as usize][side as usize] = w;
        self.ext[w as usize][win as usize] = root;
        let e = self.ext[w as usize];
        self.ext_inv[w as usize] = e[0] == e[1] && win == side;
    }

    fn insert(&mut self, node: u32, arc: u32, end: u32) {
        let (node, arc, end) = (node as usize, arc as usize, end as usize);
        let old = self.link[node][end];
        self.arc_link[arc][end] = NIL;
        self.arc_link[arc][1 - end] = old;
        if old == NIL {
            self.link[node] = [arc as u32, arc as u32];
        } else {
            self.arc_link[old as usize][end] = arc as u32;
            self.link[node][end] = arc as u32;
        }
    }

    fn merge_pieces(&mut self) {
        let n = self.n as u32;
        while let Some((r, out)) = self.stack.pop() {
            let Some((z, zin)) = self.stack.pop() else {
                return;
            };
            let c = r - n;
            let far = self.ext[r as usize][1 ^ out as usize];
            self.ext[z as usize][zin as usize] = far;
            let fe = self.ext[far as usize];
            if fe[0] == r && fe[1] == r {
                let s = out ^ u32::from(self.ext_inv[far as usize]);
                self.ext[far as usize][s as usize] = z;
            } else if fe[0] == r {
                self.ext[far as usize][0] = z;
            } else {
                self.ext[far as usize][1] = z;
            }
            if zin == out {
                self.invert(r);
                let tree_arc = 2 * self.parent_edge[c as usize];
                self.arc_flip[tree_arc as usize] ^= true;
            }
            // Hand r's arcs over to z.
            let mut a = self.link[r as usize][0];
            while a != NIL {
                self.arc_nbr[(a ^ 1) as usize] = z;
                a = self.arc_link[a as usize][1];
            }
            let [rf, rl] = self.link[r as usize];
            let (zi, z_end) = (z as usize, zin as usize);
            let old = self.link[zi][z_end];
            if z_end == 1 {
                self.arc_link[old as usize][1] = rf;
                self.arc_link[rf as usize][0] = old;
                self.link[zi][1] = rl;
            } else {
                self.arc_link[old as usize][0] = rl;
                self.arc_link[rl as usize][1] = old;
                self.link[zi][0] = rf;
            }
            self.link[r as usize] = [NIL, NIL];
            self.pr_remove(z, c);
            self.sep_remove(z, c);
        }
    }

    /// Reverses a node's adjacency list and its outer-face sides.
    fn invert(&mut self, node: u32) {
        self.reverse_list(node);
        self.ext[node as usize].swap(0, 1);
    }

    /// Reverses a node's adjacency list.
    fn reverse_list(&mut self, node: u32) {
        let node = node as usize;
        let mut a = self.link[node][0];
        while a != NIL {
            let next = self.arc_link[a as usize][1];
            self.arc_link[a as usize].swap(0, 1);
            a = next;
        }
        self.link[node].swap(0, 1);
    }

    fn pr_push(&mut self, z: u32, c: u32, front: bool) {
        let (zi, ci) = (z as usize, c as usize);
        if self.pr_head[zi] == NIL {
            self.pr_head[zi] = c;
            self.pr_tail[zi] = c;
            self.pr_next[ci] = NIL;
            self.pr_prev[ci] = NIL;
        } else if front {
            let h = self.pr_head[zi];
            self.pr_next[ci] = h;
            self.pr_prev[ci] = NIL;
            self.pr_prev[h as usize] = c;
            self.pr_head[zi] = c;
        } else {
            let t = self.pr_tail[zi];
            self.pr_prev[ci] = t;
            self.pr_next[ci] = NIL;
            self.pr_next[t as usize] = c;
            self.pr_tail[zi] = c;
        }
    }

    fn pr_remove(&mut self, z: u32, c: u32) {
        let (zi, ci) = (z as usize, c as usize);
        let (p, q) = (self.pr_prev[ci], self.pr_next[ci]);
        if p == NIL {
            self.pr_head[zi] = q;
        } else {
            self.pr_next[p as usize] = q;
        }
        if q == NIL {
            self.pr_tail[zi] = p;
        } else {
            self.pr_prev[q as usize] = p;
        }
        self.pr_prev[ci] = NIL;
        self.pr_next[ci] = NIL;
    }

    fn sep_remove(&mut self, z: u32, c: u32) {
        let ci = c as usize;
        let (p, q) = (self.sep_prev[ci], self.sep_next[ci]);
        if p == NIL {
            if self.sep_head[z as usize] == c {
                self.sep_head[z as usize] = q;
            }
        } else {
            self.sep_next[p as usize] = q;
        }
        if q != NIL {
            self.sep_prev[q as usize] = p;
        }
        self.sep_prev[ci] = NIL;
        self.sep_next[ci] = NIL;
    }

    // ---- Isolation -----------------------------------------------------------------------

    /// The real vertex a node stands for.
    #[inline]
    fn real(&self, node: u32) -> u32 {
        if node as usize >= self.n {
            self.parent[node as usize - self.n]
        } else {
            node
        }
    }

    /// Applies the lazy flips inside the piece rooted at `root`, so that every adjacency list in
    /// it runs the same way round.
    fn orient(&mut self, root: u32) {
        let mut todo: Vec<(u32, bool)> = vec![(root, false)];
        while let Some((u, flipped)) = todo.pop() {
            if flipped {
                self.reverse_list(u);
            }
            let mut a = self.link[u as usize][0];
            while a != NIL {
                let e = (a / 2) as usize;
                if a.is_multiple_of(2) && self.is_tree[e] {
                    let d = self.arc_nbr[a as usize];
                    todo.push((d, flipped ^ self.arc_flip[a as usize]));
                    self.arc_flip[a as usize] = false;
                }
                a = self.arc_link[a as usize][1];
            }
        }
    }

    /// The next vertex along the real outer face of a piece (no short cuts).
    fn face_next(&self, u: u32, came_in: u32) -> (u32, u32, u32) {
        let a = self.link[u as usize][1 ^ came_in as usize];
        let next = self.arc_nbr[a as usize];
        let t = a ^ 1;
        let l = self.link[next as usize];
        let side = if l[0] == l[1] {
            came_in
        } else if l[0] == t {
            0
        } else {
            1
        };
        (next, side, a / 2)
    }

    /// Builds the union of the paths of the paper's minors around the blocked piece.
    fn isolate(&mut self, v: u32, root: u32) -> Option<Vec<usize>> {
        let n = self.n as u32;
        let limit = 2 * self.arc_nbr.len() + 8;
        self.orient(root);
        // The outer face from the root, leaving on side 0, all the way round.
        let mut face: Vec<u32> = Vec::new();
        let mut face_edges: Vec<u32> = Vec::new();
        let (mut u, mut came) = (root, 1u32);
        loop {
            let (next, side, e) = self.face_next(u, came);
            face_edges.push(e);
            if next == root {
                break;
            }
            if next >= n || face.len() > limit {
                return None;
            }
            face.push(next);
            (u, came) = (next, side);
        }
        let active = |s: &Self, x: u32| s.pertinent(x, v) || s.externally_active(x, v);
        let xi = face.iter().position(|&f| active(self, f))?;
        let yi = face.iter().rposition(|&f| active(self, f))?;
        if yi <= xi + 1 {
            return None;
        }
        let wi = (xi + 1..yi).find(|&i| self.pertinent(face[i], v))?;
        let (x, y, w) = (face[xi], face[yi], face[wi]);
        // Sides of the outer face: 1 for the x side (before w), 2 for the y side (after w).
        let mut side_of = vec![0u8; self.n];
        for (i, &f) in face.iter().enumerate() {
            side_of[f as usize] = match i.cmp(&wi) {
                std::cmp::Ordering::Less => 1,
                std::cmp::Ordering::Greater => 2,
                std::cmp::Ordering::Equal => 3,
            };
        }
        let mut keep = vec![false; self.anc.len()];
        for &e in &face_edges {
            keep[e as usize] = true;
        }
        // Unembedded connections.
        let mut top = v;
        for u in [x, y] {
            top = top.min(self.connect_up(u, v, &mut keep)?);
        }
        // Minor B: w's last pertinent child piece also reaches above v; one vertex of that
        // subtree then branches towards v and towards the ancestor.
        let last = self.pr_tail[w as usize];
        let minor_b = last != NIL && self.lowpoint[last as usize] < v;
        if minor_b {
            let low = self.lowpoint[last as usize];
            let d = self.find_in_subtree(last, |s, d| s.least_ancestor[d as usize] == low)?;
            self.tree_path(d, w, &mut keep);
            keep[self.least_edge[d as usize] as usize] = true;
            top = top.min(low);
            let d = self.find_in_subtree(last, |s, d| s.adjacent_to[d as usize] == v)?;
            self.tree_path(d, w, &mut keep);
            keep[self.pending_edge[d as usize] as usize] = true;
        } else if !self.connect_to_v(w, v, &mut keep) {
            return None;
        }
        if self.externally_active(w, v)
            && let Some(anc) = self.connect_up(w, v, &mut keep)
        {
            top = top.min(anc);
        }
        if self.real(root) == v && !minor_b {
            self.inner_paths(v, root, &face, wi, &side_of, &mut keep, &mut top)?;
        }
        // The tree path from the highest ancestor used down to the root's vertex.
        let r_real = self.real(root);
        self.tree_path(r_real, top, &mut keep);
        Some(
            keep.iter()
                .enumerate()
                .filter(|&(_, &k)| k)
                .map(|(e, _)| e)
                .collect(),
        )
    }

    /// Minors C, D and E: the highest x-y path, a path from inside it to the root, and an
    /// externally active vertex below it, with its connection.
    #[allow(clippy::too_many_arguments)]
    fn inner_paths(
        &mut self,
        v: u32,
        root: u32,
        face: &[u32],
        wi: usize,
        side_of: &[u8],
        keep: &mut [bool],
        top: &mut u32,
    ) -> Option<()> {
        let n = self.n as u32;
        let limit = 2 * self.arc_nbr.len() + 8;
        let w = face[wi];
        // The highest x-y path: the boundary of the face the root's inner edges enclose, walked
        // with those edges hidden.
        let [rf, rl] = self.link[root as usize];
        let hidden =
            |s: &Self, a: u32| s.arc_nbr[a as usize] == root && (a ^ 1) != rf && (a ^ 1) != rl;
        let first_y = self.arc_nbr[rl as usize];
        let forward = self.link[first_y as usize][0] == (rl ^ 1);
        let step = |s: &Self, u: u32, a: u32| -> u32 {
            let d = usize::from(forward);
            let next = s.arc_link[a as usize][d];
            if next == NIL {
                s.link[u as usize][1 - d]
            } else {
                next
            }
        };
        let mut walk: Vec<(u32, u32)> = Vec::new();
        let mut a = rl;
        loop {
            let u = self.arc_nbr[a as usize];
            if u == root {
                break;
            }
            if u >= n || walk.len() > limit {
                return None;
            }
            walk.push((u, a / 2));
            let mut t = a ^ 1;
            let mut guard = 0usize;
            loop {
                t = step(self, u, t);
                guard += 1;
                if !hidden(self, t) || guard > limit {
                    break;
                }
            }
            a = t;
        }
        let pxi = walk.iter().position(|&(u, _)| side_of[u as usize] == 1)?;
        let pyi = walk[..pxi]
            .iter()
            .rposition(|&(u, _)| side_of[u as usize] == 2)?;
        if walk[pyi..pxi]
            .iter()
            .any(|&(u, _)| side_of[u as usize] == 3)
        {
            return None;
        }
        let (py, px) = (walk[pyi].0, walk[pxi].0);
        // Loop-erase the walk from py to px into a simple path.
        let mut on_path = vec![NIL; self.n];
        let mut path: Vec<(u32, u32)> = vec![(py, NIL)];
        on_path[py as usize] = 0;
        for &(u, e) in &walk[pyi + 1..=pxi] {
            let at = on_path[u as usize];
            if at != NIL {
                while path.len() > at as usize + 1 {
                    let (p, _) = path.pop().unwrap_or((py, NIL));
                    on_path[p as usize] = NIL;
                }
            } else {
                on_path[u as usize] = path.len() as u32;
                path.push((u, e));
            }
        }
        for &(_, e) in &path[1..] {
            keep[e as usize] = true;
        }
        let inner = |s: &[u32], u: u32| s[u as usize] != NIL && u != px && u != py;
        // A path from the root to an inner vertex of the x-y path, avoiding the outer face and
        // the rest of the x-y path (minor D): breadth-first from the root's inner edges.
        let r_real = self.real(root);
        let mut from = vec![NIL; self.n];
        let mut queue: Vec<u32> = vec![root];
        let mut head = 0;
        'search: while head < queue.len() {
            let u = queue[head];
            head += 1;
            let mut a = self.link[u as usize][0];
            while a != NIL {
                let t = self.arc_nbr[a as usize];
                let usable = if u == root {
                    a != rf && a != rl
                } else {
                    t != root
                };
                if usable {
                    if inner(&on_path, t) {
                        keep[(a / 2) as usize] = true;
                        let mut p = u;
                        while p != root && p != r_real {
                            let e = from[p as usize];
                            keep[e as usize] = true;
                            let (ea, ed) = (self.anc[e as usize], self.desc[e as usize]);
                            p = if ea == p { ed } else { ea };
                        }
                        break 'search;
                    }
                    if side_of[t as usize] == 0
                        && on_path[t as usize] == NIL
                        && from[t as usize] == NIL
                    {
                        from[t as usize] = a / 2;
                        queue.push(t);
                    }
                }
                a = self.arc_link[a as usize][1];
            }
        }
        // Minor E: an externally active vertex below the x-y path.
        let (pxf, pyf) = (
            face.iter().position(|&f| f == px)?,
            face.iter().position(|&f| f == py)?,
        );
        let (lo, hi) = (pxf.min(pyf), pxf.max(pyf));
        if let Some(&z) = face[lo + 1..hi]
            .iter()
            .find(|&&f| f != w && self.externally_active(f, v))
            && let Some(anc) = self.connect_up(z, v, keep)
        {
            *top = (*top).min(anc);
        }
        Some(())
    }

    /// Marks the tree path from `d` up to its ancestor `a`.
    fn tree_path(&self, d: u32, a: u32, keep: &mut [bool]) {
        let mut u = d;
        while u != a && self.parent[u as usize] != NIL {
            keep[self.parent_edge[u as usize] as usize] = true;
            u = self.parent[u as usize];
        }
    }

    fn find_in_subtree(&self, c: u32, test: impl Fn(&Self, u32) -> bool) -> Option<u32> {
        (c..self.subtree_end[c as usize]).find(|&d| test(self, d))
    }

    /// Marks an unembedded path from `u` to a proper ancestor of `v` and returns that ancestor.
    fn connect_up(&self, u: u32, v: u32, keep: &mut [bool]) -> Option<u32> {
        if self.least_ancestor[u as usize] < v {
            keep[self.least_edge[u as usize] as usize] = true;
            return Some(self.least_ancestor[u as usize]);
        }
        let c = self.sep_head[u as usize];
        if c == NIL || self.lowpoint[c as usize] >= v {
            return None;
        }
        let low = self.lowpoint[c as usize];
        let d = self.find_in_subtree(c, |s, d| s.least_ancestor[d as usize] == low)?;
        self.tree_path(d, u, keep);
        keep[self.least_edge[d as usize] as usize] = true;
        Some(low)
    }

    /// Marks an unembedded path from `w` to `v`.
    fn connect_to_v(&self, w: u32, v: u32, keep: &mut [bool]) -> bool {
        if self.adjacent_to[w as usize] == v {
            keep[self.pending_edge[w as usize] as usize] = true;
            return true;
        }
        let c = self.pr_head[w as usize];
        if c == NIL {
            return false;
        }
        let Some(d) = self.find_in_subtree(c, |s, d| s.adjacent_to[d as usize] == v) else {
            return false;
        };
        self.tree_path(d, w, keep);
        keep[self.pending_edge[d as usize] as usize] = true;
        true
    }
}

#[cfg(test)]
mod tests {
    use std::sync::atomic::AtomicBool;

    use super::*;
    use crate::engine::graph::Graph;

    fn monitor_run<T>(f: impl FnOnce(&mut Monitor<'_>) -> T) -> T {
        let never = AtomicBool::new(false);
        let mut progress = |_| {};
        let mut monitor = Monitor::new(&never, &mut progress);
        f(&mut monitor)
    }

    fn lr_planar(k: usize, edges: &[(u32, u32)]) -> bool {
        let (g, _) = Graph::from_edges(k, edges).unwrap();
        let never = AtomicBool::new(false);
        super::super::is_planar(&g, &never, &mut |_| {}).unwrap()
    }

    /// Random simple graphs from a xorshift generator (G. Marsaglia, "Xorshift RNGs", 2003).
    fn random_simple(k: usize, m: usize, seed: &mut u64) -> Vec<(u32, u32)> {
        let mut next = || {
            *seed ^= *seed << 13;
            *seed ^= *seed >> 7;
            *seed ^= *seed << 17;
            *seed
        };
        let mut edges: Vec<(u32, u32)> = Vec::new();
        for _ in 0..m {
            let a = (next() % k as u64) as u32;
            let b = (next() % k as u64) as u32;
            if a != b {
                edges.push((a.min(b), a.max(b)));
            }
        }
        edges.sort_unstable();
        edges.dedup();
        edges
    }

    /// Vertices of degree at least 3 in the subgraph: a subgraph made of c paths has O(c).
    fn branch_vertices(k: usize, sub: &[(u32, u32)]) -> usize {
        let mut degree = vec![0u32; k];
        for &(a, b) in sub {
            degree[a as usize] += 1;
            degree[b as usize] += 1;
        }
        degree.iter().filter(|&&d| d >= 3).count()
    }

    #[test]
    fn edge_addition_agrees_with_the_left_right_test_and_locates_an_obstruction() {
        // The two tests are independent implementations of different published methods (Brandes
        // 2009, Boyer and Myrvold 2004); on 60,000 random graphs around the planarity threshold
        // they must agree, and every located union must be non-planar and small.
        let mut seed = 0x9e37_79b9_7f4a_7c15_u64;
        let (mut non_planar, mut most_branches) = (0, 0);
        for round in 0..60_000 {
            let k = 5 + round % 60;
            let m = k + (round * 7) % (3 * k);
            let edges = random_simple(k, m, &mut seed);
            let planar = lr_planar(k, &edges);
            let mut ea = EdgeAddition::new(k, &edges);
            let failed = monitor_run(|mon| ea.run(mon)).unwrap();
            assert_eq!(planar, failed.is_none(), "verdicts differ on {edges:?}");
            let Some((v, root)) = failed else { continue };
            non_planar += 1;
            let found = ea
                .isolate(v, root)
                .unwrap_or_else(|| panic!("nothing located in {edges:?}"));
            let sub: Vec<(u32, u32)> = found.iter().map(|&e| edges[e]).collect();
            assert!(!lr_planar(k, &sub), "located union is planar in {edges:?}");
            most_branches = most_branches.max(branch_vertices(k, &sub));
        }
        assert!(
            non_planar > 10_000,
            "only {non_planar} non-planar graphs drawn"
        );
        assert!(
            most_branches <= 16,
            "a located union had {most_branches} branch vertices"
        );
    }

    #[test]
    fn planar_inputs_are_not_reported() {
        // K4, a wheel and a grid (planar, common practice) leave nothing to locate.
        let k4: Vec<(u32, u32)> = (0..4u32)
            .flat_map(|a| (a + 1..4).map(move |b| (a, b)))
            .collect();
        let wheel: Vec<(u32, u32)> = (1..9u32).flat_map(|i| [(0, i), (i, i % 8 + 1)]).collect();
        let grid: Vec<(u32, u32)> = (0..25u32)
            .flat_map(|i| {
                let mut out = Vec::new();
                if i % 5 < 4 {
                    out.push((i, i + 1));
                }
                if i < 20 {
                    out.push((i, i + 5));
                }
                out
            })
            .collect();
        for (k, edges) in [(4, k4), (9, wheel), (25, grid)] {
            let found = monitor_run(|mon| obstruction_edges(k, &edges, mon)).unwrap();
            assert!(matches!(found, Outcome::Planar));
        }
    }
}
