//! Tabu search for a k-colouring (TabuCol, Hertz and de Werra 1987): a strong upper bound on
//! small, dense graphs where greedy orders fall several colours short of the optimum.

use crate::engine::colouring::exact::Limits;
use crate::engine::graph::{Graph, Vertex};

const NONE: u32 = u32::MAX;

/// A small deterministic generator (xorshift64*, Vigna 2016) so runs repeat exactly.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        self.0.wrapping_mul(0x2545_f491_4f6c_dd1d)
    }
    fn below(&mut self, n: u32) -> u32 {
        (self.next() % u64::from(n.max(1))) as u32
    }
}

/// Looks for a colouring with classes `0..k` that keeps the pins, starting from `start` (a class
/// per vertex; classes `k` and up, or `u32::MAX`, are reassigned). Each step moves one vertex
/// in conflict to the class that lowers the number of conflicting edges most, never moving a
/// vertex back to a class it left within the last few steps (the tabu tenure: 0.6 times the
/// conflicts plus a random 0 to 9, as Galinier and Hao 1999 tune it). Returns the colouring
/// when the conflicts reach zero within `max_steps` steps.
///
/// Hertz and de Werra, "Using tabu search techniques for graph coloring", Computing 39 (1987).
///
/// # Complexity
/// O(n k) extra space; each step O(c k + deg) for c vertices in conflict.
///
/// # Certificate
/// The colouring; check it with [`crate::engine::colouring::check_colouring`].
pub fn tabu_colouring(
    g: &Graph,
    pin_class: &[Option<u32>],
    k: u32,
    start: &[u32],
    max_steps: u64,
    limits: Limits,
) -> Option<Vec<u32>> {
    let n = g.vertex_count();
    if k == 0 {
        return (n == 0).then(Vec::new);
    }
    let ku = k as usize;
    let pinned = |v: usize| pin_class.get(v).copied().flatten();
    if (0..n).any(|v| pinned(v).is_some_and(|c| c >= k)) {
        return None;
    }
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15 ^ (n as u64) ^ (u64::from(k) << 32));
    let mut colour: Vec<u32> = (0..n)
        .map(|v| match pinned(v) {
            Some(c) => c,
            None => match start.get(v) {
                Some(&c) if c < k => c,
                _ => rng.below(k),
            },
        })
        .collect();
    // conflicts[v * k + c]: neighbours of v that have class c.
    let mut conflicts = vec![0u32; n * ku];
    for v in 0..n {
        for &w in g.neighbours(v as Vertex) {
            conflicts[v * ku + colour[w as usize] as usize] += 1;
        }
    }
    let mut total: u64 = (0..n)
        .map(|v| u64::from(conflicts[v * ku + colour[v] as usize]))
        .sum::<u64>()
        / 2;
    // tabu[v * k + c]: the step until which v may not take class c.
    let mut tabu = vec![0u64; n * ku];
    let mut in_conflict: Vec<Vertex> = Vec::new();
    let mut best_total = total;
    for step in 0..max_steps {
        if total == 0 {
            debug_assert!(colour.iter().all(|&c| c != NONE && c < k));
            return Some(colour);
        }
        if step % 1024 == 0 && limits.stopped() {
            return None;
        }
        in_conflict.clear();
        in_conflict.extend((0..n as Vertex).filter(|&v| {
            pinned(v as usize).is_none()
                && conflicts[v as usize * ku + colour[v as usize] as usize] > 0
        }));
        if in_conflict.is_empty() {
            // Only pinned vertices conflict: pins contradict each other here.
            return None;
        }
        // The best move: least change in conflicts; a tabu move only if it beats the best seen.
        let mut best: Option<(i64, u32, Vertex, u32)> = None;
        for &v in &in_conflict {
            let vi = v as usize;
            let now = i64::from(conflicts[vi * ku + colour[vi] as usize]);
            for c in 0..k {
                if c == colour[vi] {
                    continue;
                }
                let delta = i64::from(conflicts[vi * ku + c as usize]) - now;
                let aspiration = (total as i64 + delta) < best_total as i64;
                if tabu[vi * ku + c as usize] > step && !aspiration {
                    continue;
                }
                // Ties are broken at random so the search does not cycle.
                let tie = rng.below(1 << 16);
                if best.is_none_or(|(d, t, _, _)| delta < d || (delta == d && tie < t)) {
                    best = Some((delta, tie, v, c));
                }
            }
        }
        let Some((delta, _, v, c)) = best else {
            continue;
        };
        let vi = v as usize;
        let old = colour[vi];
        colour[vi] = c;
        for &w in g.neighbours(v) {
            let wi = w as usize;
            conflicts[wi * ku + old as usize] -= 1;
            conflicts[wi * ku + c as usize] += 1;
        }
        total = (total as i64 + delta) as u64;
        best_total = best_total.min(total);
        let tenure = (0.6 * in_conflict.len() as f64) as u64 + u64::from(rng.below(10));
        tabu[vi * ku + old as usize] = step + 1 + tenure;
    }
    (total == 0).then_some(colour)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::colouring::check_colouring;
    use crate::engine::colouring::problem::ColouringProblem;

    /// The queen graph of an n x n board: squares are vertices, queens' moves are edges.
    fn queen(n: u32) -> Graph {
        let mut edges = Vec::new();
        for a in 0..n * n {
            for b in a + 1..n * n {
                let (ra, ca, rb, cb) = (a / n, a % n, b / n, b % n);
                if ra == rb || ca == cb || ra.abs_diff(rb) == ca.abs_diff(cb) {
                    edges.push((a, b));
                }
            }
        }
        Graph::from_edges((n * n) as usize, &edges).unwrap().0
    }

    #[test]
    fn finds_an_optimal_colouring_of_the_8x8_queen_graph() {
        // The 8x8 queen graph has chromatic number 9 (DIMACS colouring benchmark queen8_8).
        let g = queen(8);
        let c = tabu_colouring(&g, &[], 9, &[], 200_000, Limits::default()).unwrap();
        let problem = ColouringProblem::new(g, 9);
        assert!(check_colouring(&problem, &c).is_ok());
    }

    #[test]
    fn keeps_pins_and_gives_up_when_they_contradict() {
        // A triangle with two vertices pinned to one class cannot be coloured at all.
        let (g, _) = Graph::from_edges(3, &[(0, 1), (1, 2), (0, 2)]).unwrap();
        assert_eq!(
            tabu_colouring(&g, &[Some(0), Some(0)], 3, &[], 1000, Limits::default()),
            None
        );
        let c =
            tabu_colouring(&g, &[Some(2), None, None], 3, &[], 1000, Limits::default()).unwrap();
        assert_eq!(c[0], 2);
        assert!(c[0] != c[1] && c[1] != c[2] && c[0] != c[2]);
    }
}
