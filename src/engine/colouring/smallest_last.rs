//! Smallest-last ordering and k-colouring with Kempe-chain interchanges, for large sparse maps.
//!
//! Planar graphs are 5-degenerate, so colouring in reverse smallest-last order leaves every vertex
//! at most five coloured neighbours; when all k colours are present, Kempe-chain interchanges
//! (Kempe 1879) usually free one. Morgenstern and Shapiro, "Heuristics for rapidly four-coloring
//! large planar graphs", Algorithmica 6 (1991), found this combination fast and rarely stuck.

use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// The smallest-last order (Matula and Beck 1983): repeatedly remove a vertex of minimum degree.
/// Returns the removal order and the degeneracy (largest degree seen at removal).
///
/// # Complexity
/// O(n + m) time with a bucket queue; O(n) extra space.
pub fn smallest_last_order(g: &Graph) -> (Vec<Vertex>, u32) {
    let n = g.vertex_count();
    let mut degree: Vec<u32> = (0..n as u32).map(|v| g.degree(v) as u32).collect();
    let max_degree = degree.iter().copied().max().unwrap_or(0) as usize;
    // Bucket queue as doubly linked lists.
    let mut head = vec![NONE; max_degree + 1];
    let mut next = vec![NONE; n];
    let mut prev = vec![NONE; n];
    for v in (0..n).rev() {
        let d = degree[v] as usize;
        next[v] = head[d];
        if head[d] != NONE {
            prev[head[d] as usize] = v as u32;
        }
        head[d] = v as u32;
    }
    let mut removed = vec![false; n];
    let mut order = Vec::with_capacity(n);
    let mut degeneracy = 0u32;
    let mut low = 0usize;
    for _ in 0..n {
        while head[low] == NONE {
            low += 1;
        }
        let v = head[low] as usize;
        // Unlink v.
        head[low] = next[v];
        if next[v] != NONE {
            prev[next[v] as usize] = NONE;
        }
        removed[v] = true;
        degeneracy = degeneracy.max(low as u32);
        order.push(v as u32);
        for &w in g.neighbours(v as u32) {
            let w = w as usize;
            if removed[w] {
                continue;
            }
            let d = degree[w] as usize;
            // Unlink w from bucket d.
            if prev[w] != NONE {
                next[prev[w] as usize] = next[w];
            } else {
                head[d] = next[w];
            }
            if next[w] != NONE {
                prev[next[w] as usize] = prev[w];
            }
            degree[w] -= 1;
            let d = d - 1;
            prev[w] = NONE;
            next[w] = head[d];
            if head[d] != NONE {
                prev[head[d] as usize] = w as u32;
            }
            head[d] = w as u32;
        }
        low = low.saturating_sub(1);
    }
    (order, degeneracy)
}

/// Result of [`kempe_colouring`]: classes per vertex, `u32::MAX` for vertices it could not colour.
#[derive(Debug, Clone)]
pub struct KempeOutcome {
    /// Class per vertex (`u32::MAX` = uncoloured).
    pub colour: Vec<u32>,
    /// Vertices left uncoloured, ascending.
    pub uncoloured: Vec<Vertex>,
    /// How many Kempe-chain interchanges were made.
    pub interchanges: u64,
    /// Vertices left stuck by the first (short-chain) pass and retried.
    pub retried: usize,
}

/// Tries to colour `g` with classes `0..k` in reverse smallest-last order, using Kempe-chain
/// interchanges when a vertex sees all k classes. Pinned vertices keep their class and never lie on
/// an interchanged chain. Vertices that stay stuck are left uncoloured for an exact repair.
///
/// # Complexity
/// O(n + m) for the ordering and greedy pass; each interchange costs the size of the chains it
/// explores (bounded per attempt by `chain_limit`), O(n) extra space.
///
/// # Certificate
/// The colouring (check with [`crate::engine::colouring::check_colouring`] once complete).
pub fn kempe_colouring(g: &Graph, pin_class: &[Option<u32>], k: u32) -> KempeOutcome {
    let (order, _) = smallest_last_order(g);
    kempe_colouring_in_order(g, pin_class, k, &order)
}

/// [`kempe_colouring`] with a precomputed smallest-last `order` (as from [`smallest_last_order`]).
pub fn kempe_colouring_in_order(
    g: &Graph,
    pin_class: &[Option<u32>],
    k: u32,
    order: &[Vertex],
) -> KempeOutcome {
    let n = g.vertex_count();
    let mut state = KempeState {
        g,
        colour: vec![NONE; n],
        pinned: vec![false; n],
        stamp: vec![0; n],
        epoch: 0,
        queue: Vec::new(),
        chain: Vec::new(),
        k,
        interchanges: 0,
    };
    for v in 0..n {
        if let Some(Some(c)) = pin_class.get(v) {
            state.colour[v] = *c;
            state.pinned[v] = true;
        }
    }
    let mut stuck = Vec::new();
    for &v in order.iter().rev() {
        if state.colour[v as usize] == NONE && !state.colour_one(v, 64) {
            stuck.push(v);
        }
    }
    // Later colourings changed the neighbourhoods: try the stuck ones again with longer chains,
    // shaking the neighbourhood with random interchanges between attempts (seeded, so the
    // result is deterministic).
    let mut uncoloured = Vec::new();
    let mut seed = 0x9E37_79B9_7F4A_7C15u64;
    // Shaking pays off for a few isolated defects; many stuck vertices mean k is too few.
    let shake_attempts = if stuck.len() <= 16 + n / 1000 { 400 } else { 0 };
    for &v in &stuck {
        // Growing chain limits: two-colour chains can span much of a large map.
        let mut done = state.colour_one(v, 256) || state.colour_one(v, 4096);
        let mut attempt = 0;
        while !done && attempt < shake_attempts && g.degree(v) > 0 {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            let nb = g.neighbours(v);
            let u = nb[(seed % nb.len() as u64) as usize];
            let b = ((seed >> 32) % k as u64) as u32;
            state.shake(u, b, 4096);
            done =
                state.colour_one(v, 256) || (attempt % 25 == 24 && state.colour_one(v, u32::MAX));
            attempt += 1;
        }
        if !done {
            done = state.colour_one(v, u32::MAX);
        }
        if !done {
            uncoloured.push(v);
        }
    }
    uncoloured.sort_unstable();
    KempeOutcome {
        colour: state.colour,
        uncoloured,
        interchanges: state.interchanges,
        retried: stuck.len(),
    }
}

struct KempeState<'a> {
    g: &'a Graph,
    colour: Vec<u32>,
    pinned: Vec<bool>,
    stamp: Vec<u32>,
    epoch: u32,
    queue: Vec<Vertex>,
    chain: Vec<Vertex>,
    k: u32,
    interchanges: u64,
}

impl KempeState<'_> {
    fn next_epoch(&mut self) -> u32 {
        self.epoch = self.epoch.wrapping_add(1);
        if self.epoch == 0 {
            self.stamp.iter_mut().for_each(|s| *s = 0);
            self.epoch = 1;
        }
        self.epoch
    }

    /// Colours `v` directly or after one round of interchanges; false if it stays stuck.
    fn colour_one(&mut self, v: Vertex, chain_limit: u32) -> bool {
        let k = self.k as usize;
        let mut count = [0u32; 64];
        if k > 64 {
            return self.colour_greedy(v);
        }
        for &w in self.g.neighbours(v) {
            let c = self.colour[w as usize];
            if c != NONE && (c as usize) < k {
                count[c as usize] += 1;
            }
        }
        if let Some(c) = (0..k).find(|&c| count[c] == 0) {
            self.colour[v as usize] = c as u32;
            return true;
        }
        // Free the rarest colour first: fewer chains to move.
        let mut freeable: Vec<usize> = (0..k).collect();
        freeable.sort_by_key(|&c| (count[c], c));
        for &a in &freeable {
            for b in 0..k {
                if b != a && self.try_interchange(v, a as u32, b as u32, chain_limit) {
                    self.colour[v as usize] = a as u32;
                    return true;
                }
            }
        }
        // Kempe's argument for degree five: free a colour by moving each of its neighbours along
        // its own chain (a different partner colour per neighbour), one interchange at a time.
        for &a in &freeable {
            if self.free_one_by_one(v, a as u32, chain_limit) {
                self.colour[v as usize] = a as u32;
                return true;
            }
        }
        false
    }

    /// Moves every a-coloured neighbour of v off colour a, each by an interchange with some
    /// partner colour whose chain avoids v's neighbours of that colour. The interchanges made are
    /// valid even when the attempt fails, so nothing needs undoing.
    fn free_one_by_one(&mut self, v: Vertex, a: u32, chain_limit: u32) -> bool {
        let g = self.g;
        loop {
            let Some(u) = g
                .neighbours(v)
                .iter()
                .copied()
                .find(|&u| self.colour[u as usize] == a)
            else {
                return true;
            };
            let moved = (0..self.k)
                .filter(|&b| b != a)
                .any(|b| self.try_chain(v, u, a, b, chain_limit));
            if !moved {
                return false;
            }
        }
    }

    /// Swaps a and b on the (a, b)-chain through `start` unless it reaches a b-coloured
    /// neighbour of v or a pinned vertex.
    fn try_chain(&mut self, v: Vertex, start: Vertex, a: u32, b: u32, chain_limit: u32) -> bool {
        let g = self.g;
        if self.pinned[start as usize] {
            return false;
        }
        let forbid = self.next_epoch();
        for &w in g.neighbours(v) {
            if self.colour[w as usize] == b {
                self.stamp[w as usize] = forbid;
            }
        }
        let visit = self.next_epoch();
        self.chain.clear();
        let walk = ChainWalk {
            a,
            b,
            visit,
            forbid,
            avoid: v,
            limit: chain_limit,
        };
        if !self.grow_chain(start, walk) {
            return false;
        }
        self.swap_chain(a, b);
        true
    }

    /// An unconditional interchange on the chain through `start` (used to shake a stuck
    /// neighbourhood); refused if the chain holds a pinned vertex or is too long.
    fn shake(&mut self, start: Vertex, b: u32, chain_limit: u32) -> bool {
        let a = self.colour[start as usize];
        if a == NONE || a == b {
            return false;
        }
        // No vertex is forbidden: pass a vertex that is not adjacent to anything coloured b.
        let g = self.g;
        if self.pinned[start as usize] {
            return false;
        }
        let visit = self.next_epoch();
        self.chain.clear();
        self.queue.clear();
        self.queue.push(start);
        self.stamp[start as usize] = visit;
        let mut head = 0;
        while head < self.queue.len() {
            let x = self.queue[head];
            head += 1;
            self.chain.push(x);
            if self.chain.len() as u32 > chain_limit {
                return false;
            }
            for &y in g.neighbours(x) {
                let cy = self.colour[y as usize];
                if (cy == a || cy == b) && self.stamp[y as usize] != visit {
                    if self.pinned[y as usize] {
                        return false;
                    }
                    self.stamp[y as usize] = visit;
                    self.queue.push(y);
                }
            }
        }
        for &x in &self.chain {
            let c = &mut self.colour[x as usize];
            *c = if *c == a { b } else { a };
        }
        self.interchanges += 1;
        true
    }

    fn colour_greedy(&mut self, v: Vertex) -> bool {
        let mut used: Vec<u32> = self
            .g
            .neighbours(v)
            .iter()
            .map(|&w| self.colour[w as usize])
            .filter(|&c| c != NONE)
            .collect();
        used.sort_unstable();
        used.dedup();
        let mut c = 0;
        for &u in &used {
            if u == c {
                c += 1;
            }
        }
        if c < self.k {
            self.colour[v as usize] = c;
            true
        } else {
            false
        }
    }

    /// Swaps colours a and b on the (a, b)-chains through every a-coloured neighbour of `v`,
    /// unless one of those chains reaches a b-coloured neighbour of `v` or a pinned vertex.
    fn try_interchange(&mut self, v: Vertex, a: u32, b: u32, chain_limit: u32) -> bool {
        let g = self.g;
        // Mark the b-coloured neighbours of v with a separate epoch.
        let forbid = self.next_epoch();
        for &w in g.neighbours(v) {
            if self.colour[w as usize] == b {
                self.stamp[w as usize] = forbid;
            }
        }
        let visit = self.next_epoch();
        self.chain.clear();
        for &start in g.neighbours(v) {
            if self.colour[start as usize] != a || self.stamp[start as usize] == visit {
                continue;
            }
            if self.pinned[start as usize] {
                return false;
            }
            let walk = ChainWalk {
                a,
                b,
                visit,
                forbid,
                avoid: NONE,
                limit: chain_limit,
            };
            if !self.grow_chain(start, walk) {
                return false;
            }
        }
        self.swap_chain(a, b);
        true
    }

    /// Adds the (a, b)-chain through `start` to `self.chain` by breadth-first search, stamping
    /// what it visits. False if the chain reaches a vertex stamped `forbid`, a pinned vertex or
    /// `avoid`, or grows beyond `limit`; `self.chain` is then partial and must not be swapped.
    fn grow_chain(&mut self, start: Vertex, walk: ChainWalk) -> bool {
        let g = self.g;
        self.stamp[start as usize] = walk.visit;
        self.queue.clear();
        self.queue.push(start);
        let mut head = 0;
        while head < self.queue.len() {
            let x = self.queue[head];
            head += 1;
            self.chain.push(x);
            if self.chain.len() as u32 > walk.limit {
                return false;
            }
            for &y in g.neighbours(x) {
                let cy = self.colour[y as usize];
                if cy != walk.a && cy != walk.b {
                    continue;
                }
                let s = self.stamp[y as usize];
                if s == walk.visit {
                    continue;
                }
                if s == walk.forbid || self.pinned[y as usize] || y == walk.avoid {
                    return false;
                }
                self.stamp[y as usize] = walk.visit;
                self.queue.push(y);
            }
        }
        true
    }

    /// Exchanges colours a and b on every vertex of `self.chain` (a Kempe interchange).
    fn swap_chain(&mut self, a: u32, b: u32) {
        for &x in &self.chain {
            let c = &mut self.colour[x as usize];
            *c = if *c == a { b } else { a };
        }
        self.interchanges += 1;
    }
}

/// The parameters of one chain search in [`KempeState::grow_chain`].
#[derive(Clone, Copy)]
struct ChainWalk {
    a: u32,
    b: u32,
    visit: u32,
    forbid: u32,
    /// A vertex the chain must not reach (`NONE`: none).
    avoid: Vertex,
    limit: u32,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn smallest_last_finds_degeneracy_of_a_wheel() {
        // A wheel is 3-degenerate (the rim vertices have degree 3): common practice.
        let edges: Vec<(u32, u32)> = (1..=6)
            .flat_map(|i| [(0, i), (i, if i == 6 { 1 } else { i + 1 })])
            .collect();
        let (g, _) = Graph::from_edges(7, &edges).unwrap();
        let (order, d) = smallest_last_order(&g);
        assert_eq!(d, 3);
        let mut sorted = order.clone();
        sorted.sort_unstable();
        assert_eq!(sorted, (0..7).collect::<Vec<_>>());
    }

    #[test]
    fn four_colours_an_icosahedron() {
        // The icosahedron is planar (5-regular), so it has a 4-colouring (four colour theorem).
        let edges = [
            (0, 1),
            (0, 2),
            (0, 3),
            (0, 4),
            (0, 5),
            (1, 2),
            (2, 3),
            (3, 4),
            (4, 5),
            (5, 1),
            (1, 6),
            (2, 6),
            (2, 7),
            (3, 7),
            (3, 8),
            (4, 8),
            (4, 9),
            (5, 9),
            (5, 10),
            (1, 10),
            (6, 7),
            (7, 8),
            (8, 9),
            (9, 10),
            (10, 6),
            (11, 6),
            (11, 7),
            (11, 8),
            (11, 9),
            (11, 10),
        ];
        let (g, _) = Graph::from_edges(12, &edges).unwrap();
        let out = kempe_colouring(&g, &[], 4);
        assert!(out.uncoloured.is_empty());
        for (u, v) in g.edges() {
            assert_ne!(out.colour[u as usize], out.colour[v as usize]);
            assert!(out.colour[u as usize] < 4);
        }
    }
}
