//! The fewest colours, the three-colour verdict, and the parts of the map that rule out fewer
//! colours, in region terms: the engine's report mapped back to regions, with the arguments in
//! the regions' names and the proofs beside them.

use std::collections::{BTreeMap, BTreeSet};
use std::time::Duration;

use crate::doc::{ConstraintGraph, Document, RegionId, RegionPair};
use crate::engine::colouring::{
    BoundEvidence, ColouringError, ColouringProblem, Obstruction, ObstructionKind, SolveOptions,
    Stage, StoppedPart, solve, step_text,
};

use super::{COLOURING_TIME_LIMIT, Control, and_list, bordering_pair};

/// One step of the argument that fewer colours are impossible, in region terms.
#[derive(Clone, Debug, PartialEq)]
pub struct Step {
    /// Nesting depth of cases (0 = unconditional).
    pub depth: u32,
    pub text: String,
    /// The region the step is about (a group's first member).
    pub region: RegionId,
}

/// A small part of the map that cannot take `colours` colours, with its proofs.
#[derive(Clone, Debug, PartialEq)]
pub struct Impossibility {
    pub colours: u32,
    /// Its name in words ("an odd wheel", ...; for a pinned one, which pins it needs).
    pub kind: String,
    /// Its name for machines: `K4` (or `K<n>`), `odd_cycle`, `odd_wheel`, `grotzsch`, `pinned`, `critical`.
    pub code: String,
    /// Its regions, groups expanded, ascending.
    pub regions: Vec<RegionId>,
    /// Its borders (pairs that really border each other).
    pub links: Vec<RegionPair>,
    /// The pins it needs, `(region, palette slot)`; empty when it holds whatever the pins.
    pub pins: Vec<(RegionId, u32)>,
    /// True when every region (and pin) in it is needed; false when the time limit stopped the
    /// shrinking first.
    pub critical: bool,
    /// The case analysis, for small obstructions.
    pub steps: Option<Vec<Step>>,
    /// The DIMACS CNF and the DRAT proof that refutes it (checkable by any DRAT checker).
    pub cnf_and_proof: Option<(String, String)>,
}

impl Impossibility {
    /// The proof files' names for `colours` colours: `three-colours.*` for three (the name
    /// earlier versions wrote), `N-colours.*` for every number.
    pub fn proof_file_stem(colours: u32) -> String {
        format!("{colours}-colours")
    }
}

/// The colouring part of an analysis.
#[derive(Clone, Debug, PartialEq)]
pub struct ColouringVerdict {
    /// The fewest colours found; proven minimal when `proven`.
    pub minimum: Option<u32>,
    pub proven: bool,
    /// The proven lower bound, and why, in words.
    pub lower_bound: u32,
    pub lower_bound_reason: String,
    /// A colouring with that many colours (region -> slot). Slots past the palette are used when
    /// the palette is too small (`extra_slots_needed` says how many).
    pub colouring: Option<BTreeMap<RegionId, u32>>,
    /// How many slots the palette lacks for `colouring` (0 when it fits).
    pub extra_slots_needed: u32,
    /// Whether three colours suffice; `None` when not decided.
    pub three_colourable: Option<bool>,
    /// Why three colours are impossible, when they are.
    pub three_impossible: Option<Impossibility>,
    /// Why one colour fewer than the minimum is impossible, when a clique does not show it.
    pub minimum_impossible: Option<Impossibility>,
    /// With the current colouring kept where possible: how many regions change colour.
    pub changed: Option<usize>,
    /// The time limit (or cancellation) stopped the search before the minimum was proven.
    pub stopped: bool,
    /// Other parts the time limit cut short.
    pub stopped_parts: Vec<StoppedPart>,
    /// A reason no colouring can exist at all (contradictory rules, a palette too small).
    pub impossible: Option<String>,
}

/// The proof files a verdict has, as (file name, text): `three-colours.*` when three colours
/// are impossible, `N-colours.*` for the obstruction to one colour fewer than the minimum.
pub fn proof_texts(v: &ColouringVerdict) -> Vec<(String, String)> {
    let mut files = Vec::new();
    let mut add = |stem: String, i: &Impossibility| {
        if let Some((cnf, drat)) = &i.cnf_and_proof {
            files.push((format!("{stem}.cnf"), cnf.clone()));
            files.push((format!("{stem}.drat"), drat.clone()));
        }
    };
    if let Some(i) = &v.three_impossible {
        add("three-colours".into(), i);
    }
    if let Some(i) = &v.minimum_impossible {
        add(Impossibility::proof_file_stem(i.colours), i);
    }
    files
}

/// Names an obstruction kind in words.
fn kind_words(kind: ObstructionKind, colours: u32) -> &'static str {
    match kind {
        ObstructionKind::Complete if colours == 3 => "four regions that all border each other",
        ObstructionKind::Complete => "regions that all border each other",
        ObstructionKind::OddCycle => "an odd ring of regions",
        ObstructionKind::OddWheel => "an odd wheel: a region ringed by an odd number of neighbours",
        ObstructionKind::Grotzsch => "a Grötzsch configuration",
        ObstructionKind::Pinned => "a cluster of regions that their pins leave no way to colour",
        ObstructionKind::Critical => "a tightly knit cluster of regions",
    }
}

/// An engine obstruction in region terms, with its argument in the regions' names.
fn impossibility(doc: &Document, cg: &ConstraintGraph, o: &Obstruction) -> Impossibility {
    let label = |v: u32| cg.vertex_label(doc, v);
    let mut regions = BTreeSet::new();
    for &v in &o.vertices {
        regions.extend(cg.members(v).iter().copied());
    }
    let first = |v: u32| cg.first_member(v);
    let steps = o.argument.as_ref().map(|steps| {
        steps
            .iter()
            .map(|st| Step {
                depth: st.depth,
                text: step_text(st, &label),
                region: first(st.vertex),
            })
            .collect()
    });
    let mut kind = kind_words(o.kind, o.colours).to_string();
    if !o.pins.is_empty() {
        let pins: Vec<String> = o
            .pins
            .iter()
            .map(|&(v, slot)| format!("{} in slot {}", label(v), slot + 1))
            .collect();
        kind = format!(
            "{kind} (it needs the {} on {})",
            if pins.len() == 1 { "pin" } else { "pins" },
            and_list(&pins)
        );
    }
    Impossibility {
        colours: o.colours,
        kind,
        code: match o.kind {
            ObstructionKind::Complete => format!("K{}", o.colours + 1),
            ObstructionKind::OddCycle => "odd_cycle".into(),
            ObstructionKind::OddWheel => "odd_wheel".into(),
            ObstructionKind::Grotzsch => "grotzsch".into(),
            ObstructionKind::Pinned => "pinned".into(),
            ObstructionKind::Critical => "critical".into(),
        },
        regions: regions.into_iter().collect(),
        links: o
            .edges
            .iter()
            .filter_map(|&(u, v)| bordering_pair(doc, cg, u, v))
            .collect(),
        pins: o.pins.iter().map(|&(v, slot)| (first(v), slot)).collect(),
        critical: o.vertex_critical,
        steps,
        cnf_and_proof: o
            .refutation
            .as_ref()
            .map(|r| (r.cnf.clone(), r.drat.clone())),
    }
}

/// How to even out colour use.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum BalanceBy {
    /// About as many regions per colour.
    Count,
    /// About as much area per colour.
    Area,
}

/// How to colour.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ColourOptions {
    /// Keep the document's current colours where possible (stable recolouring).
    pub keep_current: bool,
    pub balance: Option<BalanceBy>,
    pub time_limit: Duration,
}

impl Default for ColourOptions {
    fn default() -> ColourOptions {
        ColourOptions {
            keep_current: true,
            balance: None,
            time_limit: COLOURING_TIME_LIMIT,
        }
    }
}

/// Colours the document's constraint graph with the fewest colours, under its pins and groups.
pub fn colour(doc: &Document, control: &Control, options: ColourOptions) -> ColouringVerdict {
    let cg = ConstraintGraph::build(doc);
    colour_graph(doc, &cg, control, options)
}

/// [`colour`] on a constraint graph already built for `doc`.
pub fn colour_graph(
    doc: &Document,
    cg: &ConstraintGraph,
    control: &Control,
    how: ColourOptions,
) -> ColouringVerdict {
    let mut verdict = ColouringVerdict {
        minimum: None,
        proven: false,
        lower_bound: 0,
        lower_bound_reason: String::new(),
        colouring: None,
        extra_slots_needed: 0,
        three_colourable: None,
        three_impossible: None,
        minimum_impossible: None,
        changed: None,
        stopped: false,
        stopped_parts: Vec::new(),
        impossible: None,
    };
    if let Some(conflict) = cg.conflicts.first() {
        verdict.impossible = Some(format!(
            "the rules contradict each other: {}",
            conflict.describe(doc)
        ));
        return verdict;
    }
    let label = |v: u32| cg.vertex_label(doc, v);
    let current = cg.vertex_colouring(doc);
    let has_previous = how.keep_current && current.iter().any(Option::is_some);
    let problem = ColouringProblem {
        graph: cg.graph.clone(),
        pins: cg.pins.clone(),
        previous: has_previous.then(|| current.clone()),
        max_colours: doc.palette().slots.len() as u32,
    };
    let options = SolveOptions {
        time_limit: Some(how.time_limit),
        keep_previous: has_previous && how.balance.is_none(),
        balance: how.balance.map(|by| match by {
            BalanceBy::Count => crate::engine::colouring::Balance::Count,
            BalanceBy::Area => crate::engine::colouring::Balance::Weight(
                (0..cg.vertex_count() as u32)
                    .map(|v| {
                        cg.members(v)
                            .iter()
                            .filter_map(|id| {
                                doc.regions().get(id)?.geometry.as_ref().map(|g| g.area())
                            })
                            .sum::<f64>()
                    })
                    .collect(),
            ),
        }),
        ..SolveOptions::default()
    };
    let mut progress = |p: crate::engine::colouring::Progress| {
        let stage = match p.stage {
            Stage::Bounds => "Looking for regions that force many colours".to_string(),
            Stage::Heuristic => "Colouring".to_string(),
            Stage::Exact { colours } => format!("Checking whether {colours} colours can work"),
            Stage::Obstruction => "Building the proof".to_string(),
            Stage::Finishing => "Keeping colours stable".to_string(),
        };
        let fraction = match p.upper_bound {
            Some(ub) if ub > 0 => p.lower_bound as f64 / ub as f64,
            _ => 0.0,
        };
        (control.progress)(&stage, fraction);
    };
    let report = match solve(&problem, &options, control.cancel, &mut progress) {
        Ok(r) => r,
        Err(ColouringError::PinnedNeighbours { u, v, slot }) => {
            verdict.impossible = Some(format!(
                "{} and {} border each other but are both pinned to colour {}",
                label(u),
                label(v),
                slot + 1
            ));
            return verdict;
        }
        Err(ColouringError::PaletteTooSmall {
            needed,
            max_colours,
        }) => {
            verdict.impossible = Some(format!(
                "the map needs at least {needed} colours but the palette has only {max_colours}"
            ));
            return verdict;
        }
        Err(e) => {
            verdict.impossible = Some(e.to_string());
            return verdict;
        }
    };
    let names = |vs: &[u32]| and_list(&vs.iter().map(|&v| label(v)).collect::<Vec<_>>());
    verdict.minimum = report.minimum;
    verdict.proven = report.proven;
    verdict.stopped = report.stopped;
    verdict.stopped_parts = report.stopped_parts.clone();
    verdict.lower_bound = report.lower_bound.value;
    verdict.three_colourable = report.three_colourable;
    verdict.three_impossible = report
        .obstruction
        .as_ref()
        .map(|o| impossibility(doc, cg, o));
    verdict.minimum_impossible = report
        .minimum_obstruction
        .as_ref()
        .map(|o| impossibility(doc, cg, o));
    verdict.lower_bound_reason = match (&report.lower_bound.evidence, &verdict.minimum_impossible) {
        (BoundEvidence::Refuted { colours }, Some(part)) if part.colours == *colours => {
            let n = part.regions.len();
            format!(
                "{n} region{} ({}) cannot take {colours} colours, as the proof shows",
                if n == 1 { "" } else { "s" },
                part.kind,
            )
        }
        (BoundEvidence::Empty, _) => "there is no land to colour".into(),
        (BoundEvidence::Clique(c), _) if c.len() == 1 => "there is land to colour".into(),
        (BoundEvidence::Clique(c), _) => format!("{} all border each other", names(c)),
        (BoundEvidence::OddCycle(c), _) => format!("{} form an odd ring", names(c)),
        (BoundEvidence::OddWheel { hub, rim }, _) => {
            format!(
                "{} is ringed by an odd number of neighbours ({})",
                label(*hub),
                names(rim)
            )
        }
        (BoundEvidence::PinnedSlots(s), _) => format!("pins name {} different colours", s.len()),
        (BoundEvidence::Refuted { colours }, _) => {
            format!("an exhaustive search ruled out {colours} colours")
        }
    };
    let mut colouring = report.colouring.clone();
    let mut changed = report.changed;
    if let Some(c) = &mut colouring
        && heaviest_fill_off_most(doc, cg, c)
        && has_previous
    {
        // The classes moved: count again the regions' groups whose colour is not what it was.
        changed = Some(
            c.iter()
                .zip(&current)
                .filter(|(new, old)| old.is_some_and(|o| o != **new))
                .count(),
        );
    }
    verdict.colouring = colouring.as_ref().map(|c| {
        let per_vertex: Vec<Option<u32>> = c.iter().map(|&s| Some(s)).collect();
        cg.to_region_colouring(&per_vertex)
    });
    verdict.extra_slots_needed = report
        .colouring
        .as_ref()
        .and_then(|c| c.iter().max())
        .map_or(0, |&top| (top + 1).saturating_sub(problem.max_colours));
    verdict.changed = changed;
    verdict
}

/// Keeps the heaviest fill off the most regions ([`crate::colour::heaviest_off_most`]): swaps
/// its class with the smallest unpinned one when it colours at least as many regions as any
/// other. Returns whether classes moved.
fn heaviest_fill_off_most(doc: &Document, cg: &ConstraintGraph, colouring: &mut [u32]) -> bool {
    let slots = doc.palette().slots.len();
    let mut counts = vec![0usize; slots];
    let mut pinned = vec![false; slots];
    for (v, &s) in colouring.iter().enumerate() {
        if let Some(n) = counts.get_mut(s as usize) {
            *n += cg.members(v as u32).len().max(1);
        }
    }
    for &s in cg.pins.iter().flatten() {
        if let Some(p) = pinned.get_mut(s as usize) {
            *p = true;
        }
    }
    let weights: Vec<f64> = doc
        .palette()
        .slots
        .iter()
        .map(|s| crate::colour::visual_weight(s.colour.0))
        .collect();
    let Some((a, b)) = crate::colour::heaviest_off_most(&counts, &weights, &pinned) else {
        return false;
    };
    let (a, b) = (a as u32, b as u32);
    for s in colouring.iter_mut() {
        if *s == a {
            *s = b;
        } else if *s == b {
            *s = a;
        }
    }
    true
}
