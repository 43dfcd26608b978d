//! Stable recolouring: after the map changed, a valid colouring with a given set of colours that
//! changes as few previously coloured vertices as possible.

use crate::engine::colouring::exact::Limits;
use crate::engine::colouring::sat::{Sat, SatAnswer};
use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// A recolouring and how many vertices changed colour.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Recolouring {
    /// Palette slot per vertex.
    pub colouring: Vec<u32>,
    /// Vertices that had a previous colour and now have another.
    pub changed: usize,
    /// True when no valid colouring with these slots changes fewer vertices (proved by search).
    pub optimal: bool,
}

fn count_changed(colouring: &[u32], previous: &[Option<u32>]) -> usize {
    colouring
        .iter()
        .zip(previous)
        .filter(|(c, p)| p.is_some_and(|p| p != **c))
        .count()
}

fn valid(g: &Graph, pins: &[Option<u32>], allowed: &[u32], c: &[u32]) -> bool {
    c.iter().enumerate().all(|(v, s)| {
        allowed.binary_search(s).is_ok() && pins.get(v).copied().flatten().is_none_or(|p| p == *s)
    }) && g.edges().all(|(u, v)| c[u as usize] != c[v as usize])
}

/// Finds a colouring with slots from `allowed` (ascending) that keeps pins (slots) and changes few
/// vertices of `previous`. `fallback` must be a valid colouring with slots from `allowed`: the
/// answer is never worse than the best relabelling of it.
///
/// Small graphs (at most `exact_max_vertices`) are solved exactly: SAT with a sequential counter
/// (Sinz, "Towards an optimal CNF encoding of Boolean cardinality constraints", CP 2005) bounding
/// the number of changes, lowered until unsatisfiable. Larger graphs use a greedy repair of the
/// previous colouring and a relabelling of the fallback that best matches it.
///
/// # Complexity
/// Heuristics O((n + m) k + k^2 log k); exact: one SAT call per improvement.
///
/// # Certificate
/// The colouring; `optimal` is backed by the final unsatisfiable call (not exported as a proof).
pub fn stable_recolour(
    g: &Graph,
    pins: &[Option<u32>],
    previous: &[Option<u32>],
    allowed: &[u32],
    fallback: &[u32],
    exact_max_vertices: usize,
    limits: Limits,
) -> Recolouring {
    let mut best = relabel(pins, previous, allowed, fallback);
    if let Some(c) = greedy_repair(g, pins, previous, allowed)
        && count_changed(&c, previous) < count_changed(&best, previous)
    {
        best = c;
    }
    debug_assert!(valid(g, pins, allowed, &best));
    let mut changed = count_changed(&best, previous);
    let mut optimal = changed == 0;
    if !optimal && g.vertex_count() <= exact_max_vertices {
        loop {
            match exact_at_most(g, pins, previous, allowed, changed - 1, limits) {
                Some(Some(c)) => {
                    changed = count_changed(&c, previous);
                    best = c;
                    if changed == 0 {
                        optimal = true;
                        break;
                    }
                }
                Some(None) => {
                    optimal = true;
                    break;
                }
                None => break,
            }
        }
    }
    Recolouring {
        colouring: best,
        changed,
        optimal,
    }
}

/// Permutes the unpinned slots of `fallback` to agree with `previous` as much as possible
/// (greedy on overlap counts).
fn relabel(
    pins: &[Option<u32>],
    previous: &[Option<u32>],
    allowed: &[u32],
    fallback: &[u32],
) -> Vec<u32> {
    let pinned: Vec<u32> = {
        let mut p: Vec<u32> = pins.iter().flatten().copied().collect();
        p.sort_unstable();
        p.dedup();
        p
    };
    let free: Vec<u32> = allowed
        .iter()
        .copied()
        .filter(|s| pinned.binary_search(s).is_err())
        .collect();
    let index = |s: u32| free.binary_search(&s).ok();
    let f = free.len();
    let mut overlap = vec![0usize; f * f];
    for (v, &c) in fallback.iter().enumerate() {
        if let (Some(a), Some(Some(p))) = (index(c), previous.get(v))
            && let Some(b) = index(*p)
        {
            overlap[a * f + b] += 1;
        }
    }
    let mut pairs: Vec<(usize, usize, usize)> = (0..f)
        .flat_map(|a| (0..f).map(move |b| (a, b)))
        .map(|(a, b)| (overlap[a * f + b], a, b))
        .collect();
    pairs.sort_by(|x, y| y.0.cmp(&x.0).then(x.1.cmp(&y.1)).then(x.2.cmp(&y.2)));
    let mut map = vec![usize::MAX; f];
    let mut taken = vec![false; f];
    for (_, a, b) in pairs {
        if map[a] == usize::MAX && !taken[b] {
            map[a] = b;
            taken[b] = true;
        }
    }
    fallback
        .iter()
        .map(|&c| match index(c) {
            Some(a) => free[map[a]],
            None => c,
        })
        .collect()
}

/// Keeps previous colours where they are still allowed and consistent, then colours the rest
/// greedily (previous colour first). `None` if some vertex finds no free slot.
fn greedy_repair(
    g: &Graph,
    pins: &[Option<u32>],
    previous: &[Option<u32>],
    allowed: &[u32],
) -> Option<Vec<u32>> {
    let n = g.vertex_count();
    let mut c = vec![NONE; n];
    for (v, cv) in c.iter_mut().enumerate() {
        *cv = match pins.get(v).copied().flatten() {
            Some(p) => p,
            None => match previous.get(v).copied().flatten() {
                Some(p) if allowed.binary_search(&p).is_ok() => p,
                _ => NONE,
            },
        };
    }
    // Break clashes: uncolour the unpinned end with more clashes (then the larger index).
    let clashes = |c: &[u32], v: usize| {
        g.neighbours(v as Vertex)
            .iter()
            .filter(|&&w| c[w as usize] == c[v] && c[v] != NONE)
            .count()
    };
    let is_pinned = |v: usize| pins.get(v).copied().flatten().is_some();
    for (u, v) in g.edges().collect::<Vec<_>>() {
        let (u, v) = (u as usize, v as usize);
        if c[u] == NONE || c[u] != c[v] {
            continue;
        }
        let drop = match (is_pinned(u), is_pinned(v)) {
            (true, true) => return None,
            (true, false) => v,
            (false, true) => u,
            (false, false) => {
                if clashes(&c, u) > clashes(&c, v) {
                    u
                } else {
                    v
                }
            }
        };
        c[drop] = NONE;
    }
    for v in 0..n {
        if c[v] != NONE {
            continue;
        }
        let used: Vec<u32> = g
            .neighbours(v as Vertex)
            .iter()
            .map(|&w| c[w as usize])
            .collect();
        let pick = previous
            .get(v)
            .copied()
            .flatten()
            .filter(|p| allowed.binary_search(p).is_ok() && !used.contains(p))
            .or_else(|| allowed.iter().copied().find(|s| !used.contains(s)))?;
        c[v] = pick;
    }
    Some(c)
}

/// A colouring with at most `bound` changes, `Some(None)` if none exists, `None` if stopped.
fn exact_at_most(
    g: &Graph,
    pins: &[Option<u32>],
    previous: &[Option<u32>],
    allowed: &[u32],
    bound: usize,
    limits: Limits,
) -> Option<Option<Vec<u32>>> {
    let n = g.vertex_count() as u32;
    let k = allowed.len() as u32;
    let x = |v: u32, j: u32| (v * k + j + 1) as i32;
    let mut clauses: Vec<Vec<i32>> = Vec::new();
    for v in 0..n {
        clauses.push((0..k).map(|j| x(v, j)).collect());
        for a in 0..k {
            for b in (a + 1)..k {
                clauses.push(vec![-x(v, a), -x(v, b)]);
            }
        }
        if let Some(p) = pins.get(v as usize).copied().flatten() {
            match allowed.binary_search(&p) {
                Ok(j) => clauses.push(vec![x(v, j as u32)]),
                Err(_) => return Some(None),
            }
        }
    }
    for (u, v) in g.edges() {
        for j in 0..k {
            clauses.push(vec![-x(u, j), -x(v, j)]);
        }
    }
    // y_i = "vertex i changed": the negation of keeping its previous slot.
    let mut forced = 0usize;
    let mut ys: Vec<i32> = Vec::new();
    for v in 0..n {
        if let Some(p) = previous.get(v as usize).copied().flatten() {
            match allowed.binary_search(&p) {
                Ok(j) => ys.push(-x(v, j as u32)),
                Err(_) => forced += 1,
            }
        }
    }
    if forced > bound {
        return Some(None);
    }
    let t = bound - forced;
    let mut next_var = (n * k) as i32;
    if t == 0 {
        for &y in &ys {
            clauses.push(vec![-y]);
        }
    } else if ys.len() > t {
        // Sequential counter: s[i][j] = "at least j+1 of y_0..y_i are true".
        let m = ys.len();
        let mut s = vec![vec![0i32; t]; m];
        for row in s.iter_mut() {
            for cell in row.iter_mut() {
                next_var += 1;
                *cell = next_var;
            }
        }
        clauses.push(vec![-ys[0], s[0][0]]);
        for cell in &s[0][1..] {
            clauses.push(vec![-*cell]);
        }
        for i in 1..m {
            clauses.push(vec![-ys[i], s[i][0]]);
            clauses.push(vec![-s[i - 1][0], s[i][0]]);
            for j in 1..t {
                clauses.push(vec![-ys[i], -s[i - 1][j - 1], s[i][j]]);
                clauses.push(vec![-s[i - 1][j], s[i][j]]);
            }
            clauses.push(vec![-ys[i], -s[i - 1][t - 1]]);
        }
    }
    let mut sat = Sat::new(next_var as u32, false, limits.cancel, limits.deadline);
    for c in &clauses {
        sat.add_clause(c);
    }
    match sat.solve(&[]) {
        SatAnswer::Sat => {
            let model = sat.model();
            let colouring = (0..n)
                .map(|v| {
                    let j = (0..k).find(|&j| model[(x(v, j) - 1) as usize]).unwrap_or(0);
                    allowed[j as usize]
                })
                .collect();
            Some(Some(colouring))
        }
        SatAnswer::Unsat => Some(None),
        SatAnswer::Unknown => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn adding_an_edge_changes_one_vertex() {
        // Path 0-1-2 coloured 0,1,0; the edit adds edge 0-2: one vertex must change.
        let (g, _) = Graph::from_edges(3, &[(0, 1), (1, 2), (0, 2)]).unwrap();
        let previous = vec![Some(0), Some(1), Some(0)];
        let r = stable_recolour(
            &g,
            &[],
            &previous,
            &[0, 1, 2],
            &[2, 0, 1],
            100,
            Limits::default(),
        );
        assert_eq!(r.changed, 1);
        assert!(r.optimal);
        assert!(valid(&g, &[], &[0, 1, 2], &r.colouring));
    }
}
