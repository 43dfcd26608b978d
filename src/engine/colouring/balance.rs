//! Balanced colouring: even out how many vertices (or how much weight, such as area) each colour
//! gets, without changing the number of colours or any pinned colour.

use crate::engine::graph::{Graph, Vertex};

/// Moves single unpinned vertices to a lighter colour that none of their neighbours has, as long
/// as the move strictly lowers the sum of squared colour totals. Returns the totals per class.
///
/// Each move lowers the sum of squares, so the loop ends; a class never empties (a move needs
/// the source class to stay heavier than the target). This is the single-vertex-move local search
/// common in equitable-colouring heuristics (common practice).
///
/// # Complexity
/// O(passes * (n + m) * k) time with at most `max_passes` passes; O(k) extra space.
///
/// # Certificate
/// The colouring (check it as usual); totals can be recomputed from it.
pub fn balance_colouring(
    g: &Graph,
    pinned: &[bool],
    colouring: &mut [u32],
    k: u32,
    weights: &[f64],
    max_passes: usize,
) -> Vec<f64> {
    let k = k as usize;
    let weight = |v: usize| weights.get(v).copied().unwrap_or(1.0).max(0.0);
    let mut total = vec![0.0f64; k];
    for (v, &c) in colouring.iter().enumerate() {
        if (c as usize) < k {
            total[c as usize] += weight(v);
        }
    }
    let mut blocked = vec![false; k];
    for _ in 0..max_passes {
        let mut moved = false;
        for v in 0..g.vertex_count() {
            if pinned.get(v).copied().unwrap_or(false) {
                continue;
            }
            let a = colouring[v] as usize;
            if a >= k {
                continue;
            }
            let w = weight(v);
            blocked.iter_mut().for_each(|b| *b = false);
            for &u in g.neighbours(v as Vertex) {
                let c = colouring[u as usize] as usize;
                if c < k {
                    blocked[c] = true;
                }
            }
            let target = (0..k)
                .filter(|&b| b != a && !blocked[b] && total[a] - total[b] > w + 1e-12)
                .min_by(|&x, &y| total[x].total_cmp(&total[y]).then(x.cmp(&y)));
            if let Some(b) = target {
                colouring[v] = b as u32;
                total[a] -= w;
                total[b] += w;
                moved = true;
            }
        }
        if !moved {
            break;
        }
    }
    total
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn evens_out_an_edgeless_graph() {
        let g = Graph::empty(6);
        let mut c = vec![0, 0, 0, 0, 0, 1];
        let totals = balance_colouring(&g, &[], &mut c, 2, &[], 10);
        assert_eq!(totals, vec![3.0, 3.0]);
    }
}
