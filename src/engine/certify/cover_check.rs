//! What both relaxation checkers ask of a report's costs: the relaxation's items and total, the
//! least cost of a set meeting every obstruction, and the bounds claimed against it. Written apart
//! from the searches and sharing none of their code.

/// The least cost of a set meeting every one of `soft_sets` (`None` when one of them is empty, so
/// nothing meets it), and the verdict on what a report claims against it:
/// `(infeasible, lower_bound, proven_optimal)` and its `claimed_cost`. With no least cost there is
/// nothing to hold the claims against, and the verdict is `Ok`.
pub(super) fn check_bounds<'a>(
    soft_sets: impl Iterator<Item = &'a [usize]>,
    cost: &[u64],
    claims: (bool, u64, bool),
    claimed_cost: Option<u64>,
) -> (Option<u64>, Result<(), CostFault>) {
    let sets: Vec<&[usize]> = soft_sets.collect();
    if sets.iter().any(|s| s.is_empty()) {
        return (None, Ok(()));
    }
    let proven = least_cover(&sets, cost);
    (Some(proven), bound_verdict(claims, claimed_cost, proven))
}

/// Why a report's relaxation or claimed bounds are rejected.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(super) enum CostFault {
    /// The relaxation lists an item that does not exist, or lists it twice.
    BadItem(usize),
    /// The relaxation costs `actual`, not what was claimed.
    WrongCost { claimed: u64, actual: u64 },
    /// Called infeasible, though every obstruction can be met.
    NoHardObstruction,
    /// The claimed lower bound is above the proven cover.
    BoundTooHigh { claimed: u64, proven: u64 },
    /// Called optimal at a cost other than the proven cover.
    NotOptimal { cost: u64, proven: u64 },
}

/// The relaxation `set` as a mask over the items costing `cost`, once every item is found to
/// exist and be listed once and the total to be `claimed`.
pub(super) fn relaxation_mask(
    set: &[usize],
    cost: &[u64],
    claimed: Option<u64>,
) -> Result<Vec<bool>, CostFault> {
    let mut dropped = vec![false; cost.len()];
    let mut total = 0u64;
    for &j in set {
        if j >= cost.len() || dropped[j] {
            return Err(CostFault::BadItem(j));
        }
        dropped[j] = true;
        total += cost[j];
    }
    if claimed != Some(total) {
        return Err(CostFault::WrongCost {
            claimed: claimed.unwrap_or(0),
            actual: total,
        });
    }
    Ok(dropped)
}

/// Checks what a report claims, `(infeasible, lower_bound, proven_optimal)` and its `cost`,
/// against `proven`, the least cost of a set meeting every obstruction; the first fault found, in
/// the order of [`CostFault`].
fn bound_verdict(
    (infeasible, lower_bound, proven_optimal): (bool, u64, bool),
    cost: Option<u64>,
    proven: u64,
) -> Result<(), CostFault> {
    if infeasible {
        return Err(CostFault::NoHardObstruction);
    }
    if lower_bound > proven {
        return Err(CostFault::BoundTooHigh {
            claimed: lower_bound,
            proven,
        });
    }
    if proven_optimal && cost != Some(proven) {
        return Err(CostFault::NotOptimal {
            cost: cost.unwrap_or(0),
            proven,
        });
    }
    Ok(())
}

/// The least total cost of a set of elements meeting every set: sets are first split into groups
/// that share elements (the least costs add up over groups), then each group is searched
/// exhaustively, taking the first set not yet met and trying each of its elements, cutting off a
/// branch once it costs as much as the best found.
fn least_cover(sets: &[&[usize]], cost: &[u64]) -> u64 {
    // Groups: repeatedly pull in every set sharing an element with the group.
    let mut unassigned: Vec<usize> = (0..sets.len()).collect();
    let mut total = 0;
    while let Some(first) = unassigned.pop() {
        let mut group = vec![first];
        let mut elements: Vec<usize> = sets[first].to_vec();
        let mut grew = true;
        while grew {
            grew = false;
            let mut i = 0;
            while i < unassigned.len() {
                let s = sets[unassigned[i]];
                if s.iter().any(|e| elements.contains(e)) {
                    elements.extend_from_slice(s);
                    group.push(unassigned.swap_remove(i));
                    grew = true;
                } else {
                    i += 1;
                }
            }
        }
        let group_sets: Vec<&[usize]> = group.iter().map(|&i| sets[i]).collect();
        let mut best = elements.iter().map(|&e| cost[e]).sum::<u64>();
        let mut chosen = Vec::new();
        cover(&group_sets, cost, &mut chosen, 0, &mut best);
        total += best;
    }
    total
}

fn cover(sets: &[&[usize]], cost: &[u64], chosen: &mut Vec<usize>, spent: u64, best: &mut u64) {
    if spent >= *best {
        return;
    }
    match sets.iter().find(|s| !s.iter().any(|e| chosen.contains(e))) {
        None => *best = spent,
        Some(open) => {
            for &e in open.iter() {
                chosen.push(e);
                cover(sets, cost, chosen, spent + cost[e], best);
                chosen.pop();
            }
        }
    }
}
