//! Minimum-cost hitting sets by branch and bound, one group of overlapping sets at a time.

use std::sync::atomic::{AtomicBool, Ordering};
use std::time::Instant;

/// A hitting set and what is known about it.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct HittingSet {
    /// The chosen elements, ascending.
    pub elements: Vec<usize>,
    pub cost: u64,
    /// A proven lower bound on the cost of any hitting set (equal to `cost` when the search
    /// finished).
    pub lower_bound: u64,
}

/// A minimum-cost set of elements meeting every set in `sets` (elements index `cost`).
///
/// Sets that share no element (directly or through other sets) are solved apart and the costs
/// added. Within a group: depth-first branch and bound, branching on the unmet set with the fewest
/// elements (each of its elements in turn, cheapest first; an element tried and left is excluded
/// from the later branches), bounded below by a packing of pairwise disjoint unmet sets (each
/// adds its cheapest allowed element). Started from a greedy solution.
///
/// # Complexity
/// Exponential in the worst case (the problem is NP-hard); on the small groups met here a few
/// thousand nodes. Stopped by `cancel` or `deadline`, it returns the best set found and the bound
/// proven at the root (the packing bound).
///
/// An empty set in `sets` cannot be met; it is ignored here (the caller reports it).
pub fn min_cost_hitting_set(
    sets: &[Vec<usize>],
    cost: &[u64],
    cancel: Option<&AtomicBool>,
    deadline: Option<Instant>,
) -> HittingSet {
    // Group the sets by shared elements (union-find over sets through elements).
    let mut parent: Vec<usize> = (0..sets.len()).collect();
    fn find(parent: &mut [usize], mut x: usize) -> usize {
        while parent[x] != x {
            parent[x] = parent[parent[x]];
            x = parent[x];
        }
        x
    }
    let mut owner: std::collections::BTreeMap<usize, usize> = std::collections::BTreeMap::new();
    for (i, s) in sets.iter().enumerate() {
        for &e in s {
            if let Some(&j) = owner.get(&e) {
                let (a, b) = (find(&mut parent, i), find(&mut parent, j));
                if a != b {
                    parent[a.max(b)] = a.min(b);
                }
            } else {
                owner.insert(e, i);
            }
        }
    }
    let mut groups: std::collections::BTreeMap<usize, Vec<Vec<usize>>> = Default::default();
    for (i, s) in sets.iter().enumerate() {
        if s.is_empty() {
            continue;
        }
        let mut s = s.clone();
        s.sort_unstable();
        s.dedup();
        let root = find(&mut parent, i);
        groups.entry(root).or_default().push(s);
    }
    let mut elements = Vec::new();
    let mut total = 0;
    let mut bound = 0;
    for group in groups.values() {
        let r = solve_group(group, cost, cancel, deadline);
        elements.extend(r.elements);
        total += r.cost;
        bound += r.lower_bound;
    }
    elements.sort_unstable();
    elements.dedup();
    HittingSet {
        elements,
        cost: total,
        lower_bound: bound,
    }
}

struct Search<'a> {
    sets: &'a [Vec<usize>],
    cost: &'a [u64],
    chosen: Vec<usize>,
    excluded: Vec<usize>,
    best: Vec<usize>,
    best_cost: u64,
    nodes: u64,
    stopped: bool,
    cancel: Option<&'a AtomicBool>,
    deadline: Option<Instant>,
}

impl Search<'_> {
    fn hit(&self, s: &[usize]) -> bool {
        s.iter().any(|e| self.chosen.contains(e))
    }

    fn allowed_min(&self, s: &[usize]) -> Option<u64> {
        s.iter()
            .filter(|e| !self.excluded.contains(e))
            .map(|&e| self.cost[e])
            .min()
    }

    /// A lower bound on what the unmet sets still cost: pairwise disjoint unmet sets, taken
    /// smallest first, each adding its cheapest allowed element. `None` if an unmet set has no
    /// allowed element left.
    fn packing(&self) -> Option<u64> {
        let mut unmet: Vec<&Vec<usize>> = self.sets.iter().filter(|s| !self.hit(s)).collect();
        unmet.sort_by_key(|s| s.len());
        let mut used: Vec<usize> = Vec::new();
        let mut sum = 0;
        for s in unmet {
            let m = self.allowed_min(s)?;
            if s.iter().all(|e| !used.contains(e)) {
                used.extend(s.iter().copied());
                sum += m;
            }
        }
        Some(sum)
    }

    fn run(&mut self, so_far: u64) {
        self.nodes += 1;
        if self.nodes.is_multiple_of(256)
            && (self.cancel.is_some_and(|c| c.load(Ordering::Relaxed))
                || self.deadline.is_some_and(|d| Instant::now() >= d))
        {
            self.stopped = true;
        }
        if self.stopped {
            return;
        }
        let Some(rest) = self.packing() else { return };
        if so_far + rest >= self.best_cost {
            return;
        }
        let Some(branch) = self
            .sets
            .iter()
            .filter(|s| !self.hit(s))
            .min_by_key(|s| s.len())
        else {
            self.best = self.chosen.clone();
            self.best_cost = so_far;
            return;
        };
        let mut options: Vec<usize> = branch
            .iter()
            .copied()
            .filter(|e| !self.excluded.contains(e))
            .collect();
        options.sort_by_key(|&e| (self.cost[e], e));
        let excluded_before = self.excluded.len();
        for e in options {
            self.chosen.push(e);
            self.run(so_far + self.cost[e]);
            self.chosen.pop();
            self.excluded.push(e);
        }
        self.excluded.truncate(excluded_before);
    }
}

fn solve_group(
    sets: &[Vec<usize>],
    cost: &[u64],
    cancel: Option<&AtomicBool>,
    deadline: Option<Instant>,
) -> HittingSet {
    // Greedy start: repeatedly take the element with the least cost per unmet set it meets.
    let mut greedy: Vec<usize> = Vec::new();
    loop {
        let unmet: Vec<&Vec<usize>> = sets
            .iter()
            .filter(|s| !s.iter().any(|e| greedy.contains(e)))
            .collect();
        if unmet.is_empty() {
            break;
        }
        let mut candidates: Vec<usize> = unmet.iter().flat_map(|s| s.iter().copied()).collect();
        candidates.sort_unstable();
        candidates.dedup();
        let score = |e: usize| {
            let meets = unmet.iter().filter(|s| s.contains(&e)).count() as u64;
            // cost / meets, compared exactly as cost * other_meets.
            (cost[e], meets)
        };
        let mut best = candidates[0];
        for &e in &candidates[1..] {
            let (ce, me) = score(e);
            let (cb, mb) = score(best);
            if ce * mb < cb * me {
                best = e;
            }
        }
        greedy.push(best);
    }
    let greedy_cost: u64 = greedy.iter().map(|&e| cost[e]).sum();
    let mut search = Search {
        sets,
        cost,
        chosen: Vec::new(),
        excluded: Vec::new(),
        best: greedy.clone(),
        best_cost: greedy_cost,
        nodes: 0,
        stopped: false,
        cancel,
        deadline,
    };
    let root_bound = search.packing().unwrap_or(0);
    search.run(0);
    let mut elements = search.best;
    elements.sort_unstable();
    HittingSet {
        elements,
        cost: search.best_cost,
        lower_bound: if search.stopped {
            root_bound.min(search.best_cost)
        } else {
            search.best_cost
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn brute(sets: &[Vec<usize>], cost: &[u64]) -> u64 {
        let n = cost.len();
        (0u32..1 << n)
            .filter(|mask| sets.iter().all(|s| s.iter().any(|&e| mask & (1 << e) != 0)))
            .map(|mask| {
                (0..n)
                    .filter(|e| mask & (1 << e) != 0)
                    .map(|e| cost[e])
                    .sum()
            })
            .min()
            .unwrap()
    }

    #[test]
    fn matches_brute_force_on_small_families() {
        // Deterministic pseudo-random families of sets over 10 elements.
        let mut state = 0x2545_f491_4f6c_dd1du64;
        let mut next = |m: u64| {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            state % m
        };
        for _ in 0..200 {
            let cost: Vec<u64> = (0..10).map(|_| 1 + next(5)).collect();
            let count = 1 + next(7) as usize;
            let sets: Vec<Vec<usize>> = (0..count)
                .map(|_| {
                    let size = 1 + next(4) as usize;
                    (0..size).map(|_| next(10) as usize).collect()
                })
                .collect();
            let h = min_cost_hitting_set(&sets, &cost, None, None);
            assert_eq!(h.cost, brute(&sets, &cost), "{sets:?} {cost:?}");
            assert_eq!(h.lower_bound, h.cost);
            assert_eq!(h.cost, h.elements.iter().map(|&e| cost[e]).sum::<u64>());
            assert!(
                sets.iter()
                    .all(|s| s.iter().any(|e| h.elements.contains(e)))
            );
        }
    }

    #[test]
    fn cheapest_is_not_the_smallest() {
        // By construction: {0,1} and {0,2}; element 0 costs 5, elements 1 and 2 cost 2 each, so the
        // two-element answer {1,2} (cost 4) beats the one-element answer {0} (cost 5).
        let h = min_cost_hitting_set(&[vec![0, 1], vec![0, 2]], &[5, 2, 2], None, None);
        assert_eq!((h.elements, h.cost), (vec![1, 2], 4));
    }
}
