//! The one entry point: fewest colours under pins, with a proven lower bound, the 3-colour verdict
//! and its obstruction, optional stable recolouring and balancing.

use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use crate::engine::colouring::balance::balance_colouring;
use crate::engine::colouring::dsatur::dsatur;
use crate::engine::colouring::exact::{Decision, Limits, k_colourable, repair};
use crate::engine::colouring::lower_bound::{BoundEvidence, LowerBound, lower_bound_in_order};
use crate::engine::colouring::obstruction::{Obstruction, ObstructionOptions, find_obstruction};
use crate::engine::colouring::problem::{Classes, ColouringError, ColouringProblem};
use crate::engine::colouring::recolour::stable_recolour;
use crate::engine::colouring::smallest_last::{kempe_colouring_in_order, smallest_last_order};
use crate::engine::graph::Vertex;

const NONE: u32 = u32::MAX;

/// How to even out colour use.
#[derive(Debug, Clone, PartialEq)]
pub enum Balance {
    /// Even out the number of vertices per colour.
    Count,
    /// Even out the total weight per colour (for example region area); one weight per vertex.
    Weight(Vec<f64>),
}

/// Options for [`solve`].
#[derive(Debug, Clone)]
pub struct SolveOptions {
    /// Stop after this long and report the best so far.
    pub time_limit: Option<Duration>,
    /// Decide 3-colourability and, when impossible, find an obstruction with its proofs.
    pub prove_three: bool,
    /// When the minimum is proven, also build an obstruction for one colour fewer (if not 3).
    pub prove_minimum: bool,
    /// Limits for obstructions.
    pub obstruction: ObstructionOptions,
    /// With a previous colouring: keep as many previous colours as possible.
    pub keep_previous: bool,
    /// Even out colour use (ignored when `keep_previous` applies).
    pub balance: Option<Balance>,
    /// Largest graph for exact stable recolouring.
    pub exact_recolour_max_vertices: usize,
}

impl Default for SolveOptions {
    fn default() -> Self {
        SolveOptions {
            time_limit: None,
            prove_three: true,
            prove_minimum: true,
            obstruction: ObstructionOptions::default(),
            keep_previous: true,
            balance: None,
            exact_recolour_max_vertices: 300,
        }
    }
}

/// Where [`solve`] is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Stage {
    /// Computing lower bounds.
    Bounds,
    /// Heuristic colouring.
    Heuristic,
    /// Exact search for the given number of colours.
    Exact { colours: u32 },
    /// Finding an obstruction.
    Obstruction,
    /// Stable recolouring or balancing.
    Finishing,
}

/// A progress report.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Progress {
    /// Current stage.
    pub stage: Stage,
    /// Best proven lower bound so far.
    pub lower_bound: u32,
    /// Colours in the best colouring so far.
    pub upper_bound: Option<u32>,
}

/// The answer of [`solve`].
#[derive(Debug, Clone, PartialEq)]
pub struct ColouringReport {
    /// The fewest colours found to suffice (proven optimal when `proven`); `None` only when
    /// nothing was coloured.
    pub minimum: Option<u32>,
    /// Distinct palette slots used by `colouring` (more than `minimum` when stable recolouring
    /// keeps the previous palette).
    pub colours_used: Option<u32>,
    /// True when `minimum` is proven optimal (it equals the lower bound).
    pub proven: bool,
    /// The proven lower bound and its evidence.
    pub lower_bound: LowerBound,
    /// Palette slot per vertex, when a colouring within the palette was found.
    pub colouring: Option<Vec<u32>>,
    /// Whether 3 colours suffice (with the pins); `None` when undecided.
    pub three_colourable: Option<bool>,
    /// When 3 colours are impossible: why, with proofs.
    pub obstruction: Option<Obstruction>,
    /// When the minimum m is proven and m - 1 is not 3: an obstruction to m - 1 colours.
    pub minimum_obstruction: Option<Obstruction>,
    /// With a previous colouring: how many vertices changed colour.
    pub changed: Option<usize>,
    /// With stable recolouring: whether that change count is proven minimal.
    pub changed_optimal: Option<bool>,
    /// With balancing: total count or weight per colour used, in slot order.
    pub totals: Option<Vec<(u32, f64)>>,
    /// True when the palette has fewer slots than the colours needed.
    pub palette_too_small: bool,
    /// True when the time limit or cancellation stopped the search early.
    pub stopped: bool,
}

/// Colours the problem with the fewest palette slots, proving optimality when it can.
///
/// Lower bounds come from cliques, odd cycles, odd wheels and pins; the first colouring from
/// smallest-last order with Kempe-chain interchanges (Morgenstern and Shapiro 1991) aimed at the
/// lower bound, with exact repair of any stuck vertices, or DSATUR (Brélaz 1979). Between the
/// bounds, exact search decides each k upwards (peeling, components, SAT with clique symmetry
/// breaking). Obstructions and DRAT proofs explain why fewer colours fail.
///
/// # Complexity
/// Near-linear on maps where the heuristics meet the lower bound; exponential in the worst case
/// for the exact search, cut off by the time limit and `cancel`.
///
/// # Certificate
/// The colouring (check with [`crate::engine::colouring::check_colouring`]), the lower-bound
/// evidence (check with [`crate::engine::colouring::check_bound`]) and refutations (check with
/// [`crate::engine::colouring::check_refutation`]).
pub fn solve(
    problem: &ColouringProblem,
    options: &SolveOptions,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(Progress),
) -> Result<ColouringReport, ColouringError> {
    let classes = Classes::new(problem)?;
    let g = &problem.graph;
    let n = g.vertex_count();
    let pin_class = &classes.pin_class;
    let p = classes.pinned_count();
    let limits = Limits {
        cancel: Some(cancel),
        deadline: options.time_limit.map(|t| Instant::now() + t),
    };
    let mut report_progress = |stage, lb: u32, ub: Option<u32>| {
        progress(Progress {
            stage,
            lower_bound: lb,
            upper_bound: ub,
        })
    };

    report_progress(Stage::Bounds, 0, None);
    // One smallest-last order serves the clique search and the Kempe colouring.
    let (order, degeneracy) = smallest_last_order(g);
    let mut lb = lower_bound_in_order(g, &classes.pinned_slots, 200_000, &order, degeneracy);
    let first_bound = lb.clone();
    report_progress(Stage::Heuristic, lb.value, None);

    // Upper bound: aim straight at the lower bound; fall back to DSATUR.
    let mut best: Option<Vec<u32>> = None;
    let target = lb.value.max(p).max(u32::from(n > 0));
    if n > 0 && target <= 64 {
        let mut out = kempe_colouring_in_order(g, pin_class, target, &order);
        let few = out.uncoloured.len() <= 8 + n / 1000;
        if out.uncoloured.is_empty()
            || (few && repair(g, pin_class, target, &mut out.colour, 4000, limits))
        {
            best = Some(out.colour);
        }
    }
    if best.is_none() {
        best = Some(dsatur(g, pin_class));
    }
    let mut best = best.unwrap_or_default();
    let mut ub = used_classes(&best);
    report_progress(Stage::Heuristic, lb.value, Some(ub));

    // Exact search from the lower bound upwards.
    let mut stopped = false;
    let mut unsat_parts: Vec<(u32, Vec<Vertex>)> = Vec::new();
    let mut k = lb.value.max(p);
    while k < ub {
        report_progress(Stage::Exact { colours: k }, lb.value, Some(ub));
        match k_colourable(g, pin_class, k, limits) {
            Decision::Colourable(c) => {
                best = c;
                ub = used_classes(&best);
                break;
            }
            Decision::NotColourable { part } => {
                unsat_parts.push((k, part));
                lb = LowerBound {
                    value: k + 1,
                    evidence: BoundEvidence::Refuted { colours: k },
                };
                k += 1;
            }
            Decision::Unknown => {
                stopped = true;
                break;
            }
        }
    }
    let proven = !stopped && lb.value >= ub;

    // The 3-colour verdict.
    let mut three_colourable = if ub <= 3 {
        Some(true)
    } else if lb.value > 3 {
        Some(false)
    } else {
        None
    };
    let part_for = |k: u32, parts: &[(u32, Vec<Vertex>)]| {
        parts
            .iter()
            .find(|(c, _)| *c == k)
            .map(|(_, part)| part.clone())
    };
    let mut obstruction = None;
    if options.prove_three && three_colourable != Some(true) && p <= 3 && !limits.stopped() {
        report_progress(Stage::Obstruction, lb.value, Some(ub));
        obstruction = find_obstruction(
            g,
            pin_class,
            &classes.pinned_slots,
            3,
            part_for(3, &unsat_parts),
            Some(&first_bound),
            limits,
            &options.obstruction,
        );
        if obstruction.is_some() {
            three_colourable = Some(false);
        } else if !limits.stopped() && three_colourable.is_none() {
            // No obstruction and not stopped: the search found 3 colours possible.
            three_colourable = Some(true);
        }
    }
    let mut minimum_obstruction = None;
    if options.prove_minimum && proven && ub >= 5 && ub - 1 > p && !limits.stopped() {
        report_progress(Stage::Obstruction, lb.value, Some(ub));
        minimum_obstruction = find_obstruction(
            g,
            pin_class,
            &classes.pinned_slots,
            ub - 1,
            part_for(ub - 1, &unsat_parts),
            Some(&first_bound),
            limits,
            &options.obstruction,
        );
    }

    // Palette, stable recolouring, balance.
    let palette_too_small = ub > problem.max_colours;
    let mut changed = None;
    let mut changed_optimal = None;
    let mut totals = None;
    let colouring = if palette_too_small || best.contains(&NONE) {
        None
    } else {
        report_progress(Stage::Finishing, lb.value, Some(ub));
        let mut slots = classes.to_slots(&best, problem.max_colours);
        if let (Some(previous), true) = (&problem.previous, options.keep_previous) {
            // Same colours as before where possible: the previous slots (if enough), else add.
            let mut allowed: Vec<u32> = previous.iter().flatten().copied().collect();
            allowed.extend(classes.pinned_slots.iter().copied());
            allowed.retain(|&s| s < problem.max_colours);
            allowed.sort_unstable();
            allowed.dedup();
            let extra: Vec<u32> = (0..problem.max_colours)
                .filter(|s| allowed.binary_search(s).is_err())
                .collect();
            let missing = (ub as usize).saturating_sub(allowed.len());
            allowed.extend(extra.into_iter().take(missing));
            allowed.sort_unstable();
            // The fallback must use allowed slots only: relabel free classes onto allowed slots.
            let free_allowed: Vec<u32> = allowed
                .iter()
                .copied()
                .filter(|s| classes.pinned_slots.binary_search(s).is_err())
                .collect();
            let fallback: Vec<u32> = best
                .iter()
                .map(|&c| {
                    if c < p {
                        classes.pinned_slots[c as usize]
                    } else {
                        free_allowed[(c - p) as usize]
                    }
                })
                .collect();
            let r = stable_recolour(
                g,
                &problem.pins,
                previous,
                &allowed,
                &fallback,
                options.exact_recolour_max_vertices,
                limits,
            );
            changed = Some(r.changed);
            changed_optimal = Some(r.optimal);
            slots = r.colouring;
        } else if let Some(balance) = &options.balance {
            let weights = match balance {
                Balance::Count => Vec::new(),
                Balance::Weight(w) => w.clone(),
            };
            let pinned: Vec<bool> = pin_class.iter().map(|c| c.is_some()).collect();
            let mut classes_now = best.clone();
            let class_totals = balance_colouring(g, &pinned, &mut classes_now, ub, &weights, 100);
            slots = classes.to_slots(&classes_now, problem.max_colours);
            let mut t: Vec<(u32, f64)> = Vec::new();
            for (c, total) in class_totals.iter().enumerate() {
                if let Some(v) = classes_now.iter().position(|&x| x == c as u32) {
                    t.push((slots[v], *total));
                }
            }
            t.sort_by_key(|a| a.0);
            totals = Some(t);
        }
        Some(slots)
    };
    let colours_used = colouring
        .as_ref()
        .map(|c| crate::engine::colouring::problem::colour_count(c));
    let minimum = Some(ub);
    Ok(ColouringReport {
        minimum,
        colours_used,
        proven,
        lower_bound: lb,
        colouring,
        three_colourable,
        obstruction,
        minimum_obstruction,
        changed,
        changed_optimal,
        totals,
        palette_too_small,
        stopped: stopped || limits.stopped(),
    })
}

fn used_classes(c: &[u32]) -> u32 {
    c.iter()
        .copied()
        .filter(|&x| x != NONE)
        .max()
        .map_or(0, |m| m + 1)
}
