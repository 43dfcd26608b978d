//! The implicit hitting set loop shared by both searches: a minimum-cost hitting set of the
//! obstructions found so far, a test of what is left, repeated until the test succeeds. What a
//! test is (colouring or planarity) and what an obstruction holds are the caller's.

use std::sync::atomic::{AtomicBool, Ordering};
use std::time::Instant;

use super::RelaxProgress;
use super::hitting_set::min_cost_hitting_set;

/// What a test of the problem without the dropped soft items found.
pub(crate) enum Tested<W, O> {
    /// It works; `W` shows it (a colouring, an embedding).
    Works(W),
    /// It does not; an obstruction among the soft items kept.
    Obstruction(O),
    /// The test was stopped (cancelled or out of time).
    Stopped,
}

/// What the loop found, for the caller to put in its report.
pub(crate) struct Found<W, O> {
    pub relaxation: Option<Vec<usize>>,
    pub cost: Option<u64>,
    pub witness: Option<W>,
    pub lower_bound: u64,
    pub proven_optimal: bool,
    pub infeasible: bool,
    pub obstructions: Vec<O>,
    pub stopped: bool,
    pub rounds: usize,
}

/// Runs the implicit hitting set loop over soft items costing `cost`. Each round takes a
/// minimum-cost hitting set H of the obstructions' soft sets (`soft` of each) and calls `test`
/// with the items dropped (`dropped[j]`); an obstruction's items are dropped as well and the test
/// repeats, so a round ends with a working set or stops. An obstruction with no soft item ends the
/// search as infeasible. Stopped by `cancel` or `deadline` between rounds and inside the hitting
/// set search; `progress` hears after every obstruction and every round.
pub(crate) fn hitting_set_loop<W, O>(
    cost: &[u64],
    deadline: Option<Instant>,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(RelaxProgress),
    soft: impl Fn(&O) -> &[usize],
    mut test: impl FnMut(&[bool]) -> Tested<W, O>,
) -> Found<W, O> {
    let stopped =
        || cancel.load(Ordering::Relaxed) || deadline.is_some_and(|d| Instant::now() >= d);
    let mut found = Found {
        relaxation: None,
        cost: None,
        witness: None,
        lower_bound: 0,
        proven_optimal: false,
        infeasible: false,
        obstructions: Vec::new(),
        stopped: false,
        rounds: 0,
    };
    let tell = |found: &Found<W, O>, progress: &mut dyn FnMut(RelaxProgress)| {
        progress(RelaxProgress {
            obstructions: found.obstructions.len(),
            lower_bound: found.lower_bound,
            best_cost: found.cost,
        })
    };
    'rounds: loop {
        if stopped() {
            found.stopped = true;
            break;
        }
        found.rounds += 1;
        let sets: Vec<Vec<usize>> = found
            .obstructions
            .iter()
            .map(|o| soft(o).to_vec())
            .collect();
        let hs = min_cost_hitting_set(&sets, cost, Some(cancel), deadline);
        found.lower_bound = found.lower_bound.max(hs.lower_bound);
        if found.cost == Some(found.lower_bound) {
            break;
        }
        if hs.lower_bound < hs.cost {
            found.stopped = true;
            break;
        }
        let mut dropped = vec![false; cost.len()];
        for &e in &hs.elements {
            dropped[e] = true;
        }
        loop {
            match test(&dropped) {
                Tested::Works(witness) => {
                    let set: Vec<usize> = (0..dropped.len()).filter(|&j| dropped[j]).collect();
                    let total: u64 = set.iter().map(|&j| cost[j]).sum();
                    if found.cost.is_none_or(|c| total < c) {
                        found.relaxation = Some(set);
                        found.cost = Some(total);
                        found.witness = Some(witness);
                    }
                    break;
                }
                Tested::Obstruction(o) => {
                    let hard_only = soft(&o).is_empty();
                    for &j in soft(&o) {
                        dropped[j] = true;
                    }
                    found.obstructions.push(o);
                    tell(&found, progress);
                    if hard_only {
                        found.infeasible = true;
                        found.relaxation = None;
                        found.cost = None;
                        found.witness = None;
                        break 'rounds;
                    }
                }
                Tested::Stopped => {
                    found.stopped = true;
                    break 'rounds;
                }
            }
        }
        tell(&found, progress);
    }
    found.proven_optimal = !found.infeasible && found.cost == Some(found.lower_bound);
    if found.proven_optimal {
        found.stopped = false;
    }
    found
}
