//! The one entry point: fewest colours under pins, with a proven lower bound, the 3-colour verdict
//! and its obstruction, optional stable recolouring and balancing.

use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use crate::engine::colouring::balance::balance_colouring;
use crate::engine::colouring::dsatur::dsatur;
use crate::engine::colouring::exact::{Decision, Limits, k_colourable_logged, repair};
use crate::engine::colouring::lower_bound::{BoundEvidence, LowerBound, lower_bound_in_order};
use crate::engine::colouring::obstruction::{
    FailedPart, Obstruction, ObstructionOptions, find_obstruction,
};
use crate::engine::colouring::problem::{Classes, ColouringError, ColouringProblem};
use crate::engine::colouring::recolour::stable_recolour;
use crate::engine::colouring::smallest_last::{kempe_colouring_in_order, smallest_last_order};
use crate::engine::colouring::tabu::tabu_colouring;
use crate::engine::graph::{Graph, Vertex};

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
    /// Stop the search for the fewest colours after this long and report the best so far. The
    /// evidence that follows a settled minimum (obstructions and their proofs, stable
    /// recolouring) gets the same allowance again, so it never takes time from the minimum.
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
    /// Palette slot per vertex with `minimum` colours (`None` only when no colouring was found).
    /// Slots past the palette are still slots: when the palette is too small, the colouring uses
    /// slots `max_colours..` too, and `palette_too_small` says so.
    pub colouring: Option<Vec<u32>>,
    /// Whether 3 colours suffice (with the pins); `None` when undecided.
    pub three_colourable: Option<bool>,
    /// When 3 colours are impossible: why, with proofs.
    pub obstruction: Option<Obstruction>,
    /// When the minimum m is proven and m - 1 colours are ruled out by more than a clique of m
    /// vertices without pins: an obstruction to m - 1 colours (the same as `obstruction` when
    /// m - 1 is 3).
    pub minimum_obstruction: Option<Obstruction>,
    /// With a previous colouring: how many vertices changed colour.
    pub changed: Option<usize>,
    /// With stable recolouring: whether that change count is proven minimal.
    pub changed_optimal: Option<bool>,
    /// With balancing: total count or weight per colour used, in slot order.
    pub totals: Option<Vec<(u32, f64)>>,
    /// True when the palette has fewer slots than the colouring uses.
    pub palette_too_small: bool,
    /// True when the time limit or cancellation stopped the search before the minimum was
    /// proven. A proven minimum is never "stopped", whatever else was cut short.
    pub stopped: bool,
    /// Everything else the time limit or cancellation cut short, in the order it happened.
    pub stopped_parts: Vec<StoppedPart>,
}

/// A part of the answer that the time limit or cancellation cut short.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StoppedPart {
    /// Whether three colours suffice was not decided.
    ThreeColours,
    /// The obstruction to three colours was not found, or not shrunk until every vertex in it
    /// is needed, or its proof was not finished.
    ThreeColourObstruction,
    /// The obstruction to one colour fewer than the minimum was not found, shrunk or proven.
    MinimumObstruction,
    /// Stable recolouring kept colours, but did not prove it changed the fewest.
    Recolouring,
}

impl StoppedPart {
    /// A stable name for machines.
    pub fn code(self) -> &'static str {
        match self {
            StoppedPart::ThreeColours => "three_colours",
            StoppedPart::ThreeColourObstruction => "three_colour_obstruction",
            StoppedPart::MinimumObstruction => "minimum_obstruction",
            StoppedPart::Recolouring => "recolouring",
        }
    }
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

    let mut best = heuristic_colouring(g, pin_class, lb.value.max(p), &order, degeneracy, limits);
    let mut ub = used_classes(&best);
    report_progress(Stage::Heuristic, lb.value, Some(ub));

    // Exact search. Downwards first: colourings with a few colours more than the optimum are
    // usually quick to find, so the best colouring improves early, and the first k found
    // impossible settles the minimum at k + 1 without trying any smaller k. Each step down may
    // use half of the time left, so a hard step leaves time for the climb below.
    // The parts each ruled-out k failed on, with the proofs their searches logged.
    let mut unsat_parts: Vec<(u32, FailedPart)> = Vec::new();
    let decide = |k: u32, limits: Limits| {
        k_colourable_logged(
            g,
            pin_class,
            k,
            limits,
            options.obstruction.proof_max_vertices,
        )
    };
    let floor = lb.value.max(p);
    let mut settled = false;
    while ub > floor && !settled {
        let k = ub - 1;
        report_progress(Stage::Exact { colours: k }, lb.value, Some(ub));
        let step_limits = Limits {
            cancel: limits.cancel,
            deadline: limits
                .deadline
                .map(|d| Instant::now() + d.saturating_duration_since(Instant::now()) / 2),
        };
        match decide(k, step_limits) {
            Decision::Colourable(c) => {
                best = c;
                ub = used_classes(&best).min(k);
            }
            Decision::NotColourable { part, proof } => {
                unsat_parts.push((k, (part, proof)));
                lb = LowerBound {
                    value: k + 1,
                    evidence: BoundEvidence::Refuted { colours: k },
                };
                settled = true;
            }
            Decision::Unknown => break,
        }
    }
    // Then upwards from the lower bound: each k ruled out raises what is proven.
    let mut stopped = false;
    let mut k = lb.value.max(p);
    while k < ub {
        report_progress(Stage::Exact { colours: k }, lb.value, Some(ub));
        match decide(k, limits) {
            Decision::Colourable(c) => {
                best = c;
                ub = used_classes(&best);
                break;
            }
            Decision::NotColourable { part, proof } => {
                unsat_parts.push((k, (part, proof)));
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
    let mut stopped_parts = Vec::new();

    // The evidence gets an allowance of its own, so it never delays the minimum.
    let limits = Limits {
        cancel: Some(cancel),
        deadline: options.time_limit.map(|t| Instant::now() + t),
    };

    // The 3-colour verdict: settled by the bounds when it can be, else decided here.
    let mut three_colourable = if ub <= 3 {
        Some(true)
    } else if lb.value > 3 {
        Some(false)
    } else {
        None
    };
    if options.prove_three && three_colourable.is_none() {
        report_progress(Stage::Exact { colours: 3 }, lb.value, Some(ub));
        match decide(3, limits) {
            Decision::Colourable(c) => {
                // Found after the main search stopped: a better colouring than it had.
                three_colourable = Some(true);
                best = c;
                ub = used_classes(&best);
            }
            Decision::NotColourable { part, proof } => {
                three_colourable = Some(false);
                unsat_parts.push((3, (part, proof)));
                if lb.value < 4 {
                    lb = LowerBound {
                        value: 4,
                        evidence: BoundEvidence::Refuted { colours: 3 },
                    };
                }
            }
            Decision::Unknown => stopped_parts.push(StoppedPart::ThreeColours),
        }
    }
    let proven = lb.value >= ub;
    let stopped = stopped && !proven;
    let part_for = |k: u32, parts: &mut Vec<(u32, FailedPart)>| {
        let i = parts.iter().position(|(c, _)| *c == k)?;
        Some(parts.swap_remove(i).1)
    };
    let mut obstruction = None;
    if options.prove_three && three_colourable == Some(false) && p <= 3 {
        report_progress(Stage::Obstruction, lb.value, Some(ub));
        obstruction = find_obstruction(
            g,
            pin_class,
            &classes.pinned_slots,
            3,
            part_for(3, &mut unsat_parts),
            Some(&first_bound),
            limits,
            &options.obstruction,
        );
        if !obstruction.as_ref().is_some_and(finished) {
            stopped_parts.push(StoppedPart::ThreeColourObstruction);
        }
    }
    let mut minimum_obstruction = None;
    if options.prove_minimum && proven && needs_minimum_obstruction(&lb, &first_bound, ub, p) {
        if ub - 1 == 3 && obstruction.is_some() {
            minimum_obstruction = obstruction.clone();
        } else {
            report_progress(Stage::Obstruction, lb.value, Some(ub));
            minimum_obstruction = find_obstruction(
                g,
                pin_class,
                &classes.pinned_slots,
                ub - 1,
                part_for(ub - 1, &mut unsat_parts),
                Some(&first_bound),
                limits,
                &options.obstruction,
            );
        }
        if !minimum_obstruction.as_ref().is_some_and(finished) {
            stopped_parts.push(StoppedPart::MinimumObstruction);
        }
    }

    // Palette slots, stable recolouring, balance.
    let mut changed = None;
    let mut changed_optimal = None;
    let mut totals = None;
    // Slots past the palette are still slots: a palette that is too small is reported, and the
    // colouring says how many slots it needs.
    let slot_count = problem.max_colours.max(ub);
    let colouring = if best.contains(&NONE) {
        None
    } else {
        report_progress(Stage::Finishing, lb.value, Some(ub));
        let mut slots = classes.to_slots(&best, slot_count);
        if let (Some(previous), true) = (&problem.previous, options.keep_previous) {
            // Same colours as before where possible: the previous slots (if enough), else add.
            let mut allowed: Vec<u32> = previous.iter().flatten().copied().collect();
            allowed.extend(classes.pinned_slots.iter().copied());
            allowed.retain(|&s| s < slot_count);
            allowed.sort_unstable();
            allowed.dedup();
            let extra: Vec<u32> = (0..slot_count)
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
            if !r.optimal && limits.stopped() {
                stopped_parts.push(StoppedPart::Recolouring);
            }
            slots = r.colouring;
        } else if let Some(balance) = &options.balance {
            let weights = match balance {
                Balance::Count => Vec::new(),
                Balance::Weight(w) => w.clone(),
            };
            let pinned: Vec<bool> = pin_class.iter().map(|c| c.is_some()).collect();
            let mut classes_now = best.clone();
            let class_totals = balance_colouring(g, &pinned, &mut classes_now, ub, &weights, 100);
            slots = classes.to_slots(&classes_now, slot_count);
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
    let palette_too_small = colouring
        .as_ref()
        .is_some_and(|c| c.iter().any(|&s| s >= problem.max_colours));
    Ok(ColouringReport {
        minimum: Some(ub),
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
        stopped,
        stopped_parts,
    })
}

/// The first colouring: smallest-last order with Kempe-chain interchanges aimed at `target`
/// (the lower bound), with exact repair of a few stuck vertices; then DSATUR. On small graphs,
/// where they are cheap, tabu search then brings the count down one colour at a time for as
/// long as it succeeds (dense graphs such as the queen graphs, where greedy orders fall several
/// colours short). Kempe chains suit sparse graphs such as maps (every planar graph has
/// degeneracy at most 5); on small dense graphs their interchanges cost more than the tabu
/// search and are skipped.
fn heuristic_colouring(
    g: &Graph,
    pin_class: &[Option<u32>],
    target: u32,
    order: &[Vertex],
    degeneracy: u32,
    limits: Limits,
) -> Vec<u32> {
    let n = g.vertex_count();
    if n == 0 {
        return Vec::new();
    }
    let target = target.max(1);
    if target <= 64 && (degeneracy <= 5 || n > SMALL_GRAPH) {
        let mut out = kempe_colouring_in_order(g, pin_class, target, order);
        let few = out.uncoloured.len() <= 8 + n / 1000;
        if out.uncoloured.is_empty()
            || (few && repair(g, pin_class, target, &mut out.colour, 4000, limits))
        {
            return out.colour;
        }
    }
    let mut best = dsatur(g, pin_class);
    if n <= SMALL_GRAPH {
        let steps = 2_000 + 10 * n as u64;
        while used_classes(&best) > target && !limits.stopped() {
            let k = used_classes(&best) - 1;
            match tabu_colouring(g, pin_class, k, &best, steps, limits) {
                Some(c) => best = c,
                None => break,
            }
        }
    }
    best
}

/// Graphs up to this many vertices get the wider heuristic search.
const SMALL_GRAPH: usize = 5_000;

/// Whether a proven minimum `ub` needs an obstruction to `ub - 1` colours as its evidence:
/// always, unless a clique of `ub` vertices already shows it (the lower-bound evidence says so
/// by itself), or pins alone force the count (`ub - 1` is fewer than the pinned slots).
fn needs_minimum_obstruction(lb: &LowerBound, first: &LowerBound, ub: u32, p: u32) -> bool {
    if ub < 2 || ub - 1 < p {
        return false;
    }
    let clique_shows_it =
        |b: &LowerBound| matches!(&b.evidence, BoundEvidence::Clique(c) if c.len() as u32 >= ub);
    !(clique_shows_it(lb) || clique_shows_it(first))
}

/// An obstruction is finished when it is shrunk to a critical one and carries its proof.
fn finished(o: &Obstruction) -> bool {
    o.vertex_critical && o.refutation.is_some()
}

fn used_classes(c: &[u32]) -> u32 {
    c.iter()
        .copied()
        .filter(|&x| x != NONE)
        .max()
        .map_or(0, |m| m + 1)
}
