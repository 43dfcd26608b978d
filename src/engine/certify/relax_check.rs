//! Independent checker for the answers of [`crate::engine::relax::relax`].
//!
//! Written apart from the search and sharing none of its code: it reads the problem and the
//! report only. It checks the colouring constraint by constraint, rebuilds each obstruction's CNF
//! from its list of vertices and soft items (its own encoder) and has its DRAT proof checked by
//! [`crate::engine::colouring::check_drat`] (itself independent of the solver), and recomputes the
//! least cost of a set meeting every obstruction with its own exhaustive search, which must bound
//! the claimed cost from below and equal it when the answer is claimed optimal.

use std::fmt::Write;

use crate::engine::colouring::check_drat;
use crate::engine::relax::{Constraint, RelaxObstruction, RelaxProblem, RelaxReport};

/// Why an answer was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum RelaxRejection {
    #[error("the relaxation lists soft item {0}, which does not exist or is listed twice")]
    BadItem(usize),
    #[error("the relaxation costs {actual}, not the {claimed} reported")]
    WrongCost { claimed: u64, actual: u64 },
    #[error("a relaxation is reported without a colouring, or the other way round")]
    MissingColouring,
    #[error("the colouring has {given} colours for {vertices} vertices")]
    ColouringLength { given: usize, vertices: usize },
    #[error("vertex {vertex} has colour {colour}, outside 0..{colours}")]
    ColourOutOfRange {
        vertex: u32,
        colour: u32,
        colours: u32,
    },
    #[error("the colouring breaks {which} constraint {index}: {constraint:?}")]
    Broken {
        which: &'static str,
        index: usize,
        constraint: Constraint,
    },
    #[error("obstruction {index}: {why}")]
    BadObstruction { index: usize, why: String },
    #[error("the lower bound {claimed} is more than the {proven} the obstructions prove")]
    BoundTooHigh { claimed: u64, proven: u64 },
    #[error(
        "the answer is called optimal at cost {cost}, but the obstructions only prove {proven}"
    )]
    NotOptimal { cost: u64, proven: u64 },
    #[error("the problem is called impossible but no obstruction is made of hard constraints only")]
    NoHardObstruction,
}

/// What the check established.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RelaxCheck {
    /// The least cost of a set meeting every obstruction, recomputed here (`None` when an
    /// obstruction has no soft item, so nothing meets it).
    pub proven_lower_bound: Option<u64>,
    /// Obstructions whose proofs were checked.
    pub obstructions: usize,
}

/// Checks `report` against `problem`; see the module comment for what is checked.
pub fn check_relaxation(
    problem: &RelaxProblem,
    report: &RelaxReport,
) -> Result<RelaxCheck, RelaxRejection> {
    let k = problem.colours;
    match (&report.relaxation, &report.colouring) {
        (Some(set), Some(colouring)) => {
            let mut dropped = vec![false; problem.soft.len()];
            let mut total = 0u64;
            for &j in set {
                if j >= problem.soft.len() || dropped[j] {
                    return Err(RelaxRejection::BadItem(j));
                }
                dropped[j] = true;
                total += problem.soft[j].cost;
            }
            if report.cost != Some(total) {
                return Err(RelaxRejection::WrongCost {
                    claimed: report.cost.unwrap_or(0),
                    actual: total,
                });
            }
            if colouring.len() != problem.vertex_count {
                return Err(RelaxRejection::ColouringLength {
                    given: colouring.len(),
                    vertices: problem.vertex_count,
                });
            }
            for (v, &c) in colouring.iter().enumerate() {
                if c >= k {
                    return Err(RelaxRejection::ColourOutOfRange {
                        vertex: v as u32,
                        colour: c,
                        colours: k,
                    });
                }
            }
            let holds = |c: &Constraint| match *c {
                Constraint::Differ(u, v) => colouring[u as usize] != colouring[v as usize],
                Constraint::Same(u, v) => colouring[u as usize] == colouring[v as usize],
                Constraint::Pin(v, col) => colouring[v as usize] == col,
            };
            for (index, c) in problem.hard.iter().enumerate() {
                if !holds(c) {
                    return Err(RelaxRejection::Broken {
                        which: "hard",
                        index,
                        constraint: *c,
                    });
                }
            }
            for (index, item) in problem.soft.iter().enumerate() {
                if !dropped[index] && !holds(&item.constraint) {
                    return Err(RelaxRejection::Broken {
                        which: "kept soft",
                        index,
                        constraint: item.constraint,
                    });
                }
            }
        }
        (None, None) => {}
        _ => return Err(RelaxRejection::MissingColouring),
    }
    for (index, o) in report.obstructions.iter().enumerate() {
        let cnf = obstruction_cnf(problem, o)
            .map_err(|why| RelaxRejection::BadObstruction { index, why })?;
        check_drat(&cnf, &o.drat).map_err(|e| RelaxRejection::BadObstruction {
            index,
            why: format!("proof rejected: {e}"),
        })?;
    }
    let sets: Vec<&[usize]> = report
        .obstructions
        .iter()
        .map(|o| o.soft.as_slice())
        .collect();
    let proven = if sets.iter().any(|s| s.is_empty()) {
        None
    } else {
        let cost: Vec<u64> = problem.soft.iter().map(|s| s.cost).collect();
        Some(least_cover(&sets, &cost))
    };
    match proven {
        None => {
            if report.relaxation.is_some() {
                // A colouring was checked above, yet an obstruction of hard constraints alone was
                // accepted: that cannot both be right.
                return Err(RelaxRejection::BadObstruction {
                    index: report
                        .obstructions
                        .iter()
                        .position(|o| o.soft.is_empty())
                        .unwrap_or(0),
                    why: "hard-only obstruction beside a colouring".into(),
                });
            }
        }
        Some(p) => {
            if report.infeasible {
                return Err(RelaxRejection::NoHardObstruction);
            }
            if report.lower_bound > p {
                return Err(RelaxRejection::BoundTooHigh {
                    claimed: report.lower_bound,
                    proven: p,
                });
            }
            if report.proven_optimal && report.cost != Some(p) {
                return Err(RelaxRejection::NotOptimal {
                    cost: report.cost.unwrap_or(0),
                    proven: p,
                });
            }
        }
    }
    Ok(RelaxCheck {
        proven_lower_bound: proven,
        obstructions: report.obstructions.len(),
    })
}

/// The DIMACS text of an obstruction's CNF, rebuilt from the problem and its lists (the formula
/// documented on [`RelaxObstruction`]); an error says what is wrong with the lists.
pub fn obstruction_cnf(problem: &RelaxProblem, o: &RelaxObstruction) -> Result<String, String> {
    let k = problem.colours;
    if o.vertices.windows(2).any(|w| w[0] >= w[1]) {
        return Err("vertices are not strictly ascending".into());
    }
    if o.soft.windows(2).any(|w| w[0] >= w[1]) {
        return Err("soft items are not strictly ascending".into());
    }
    if let Some(&v) = o
        .vertices
        .iter()
        .find(|&&v| v as usize >= problem.vertex_count)
    {
        return Err(format!("vertex {v} does not exist"));
    }
    // Position of each listed vertex, by a plain scan into a dense table.
    let mut position = vec![usize::MAX; problem.vertex_count];
    for (i, &v) in o.vertices.iter().enumerate() {
        position[v as usize] = i;
    }
    let var =
        |v: u32, c: u32| -> i64 { (position[v as usize] as i64) * i64::from(k) + i64::from(c) + 1 };
    let inside = |c: &Constraint| match *c {
        Constraint::Differ(u, v) | Constraint::Same(u, v) => {
            position[u as usize] != usize::MAX && position[v as usize] != usize::MAX
        }
        Constraint::Pin(v, _) => position[v as usize] != usize::MAX,
    };
    let mut clauses: Vec<Vec<i64>> = Vec::new();
    for &v in &o.vertices {
        clauses.push((0..k).map(|c| var(v, c)).collect());
        for c in 0..k {
            for d in (c + 1)..k {
                clauses.push(vec![-var(v, c), -var(v, d)]);
            }
        }
    }
    let emit = |c: &Constraint, clauses: &mut Vec<Vec<i64>>| match *c {
        Constraint::Differ(u, v) => {
            for col in 0..k {
                clauses.push(vec![-var(u, col), -var(v, col)]);
            }
        }
        Constraint::Same(u, v) => {
            for col in 0..k {
                clauses.push(vec![-var(u, col), var(v, col)]);
                clauses.push(vec![-var(v, col), var(u, col)]);
            }
        }
        Constraint::Pin(v, col) => {
            if col < k {
                clauses.push(vec![var(v, col)]);
            } else {
                clauses.push(Vec::new());
            }
        }
    };
    for c in problem.hard.iter().filter(|c| inside(c)) {
        emit(c, &mut clauses);
    }
    for &j in &o.soft {
        let Some(item) = problem.soft.get(j) else {
            return Err(format!("soft item {j} does not exist"));
        };
        if !inside(&item.constraint) {
            return Err(format!("soft item {j} names a vertex not listed"));
        }
        emit(&item.constraint, &mut clauses);
    }
    let mut text = format!(
        "c obstruction to {k} colours: {} vertices, {} soft items\np cnf {} {}\n",
        o.vertices.len(),
        o.soft.len(),
        o.vertices.len() as u64 * u64::from(k),
        clauses.len()
    );
    for clause in clauses {
        for lit in clause {
            let _ = write!(text, "{lit} ");
        }
        text.push_str("0\n");
    }
    Ok(text)
}

/// The least total cost of a set of elements meeting every set: sets are first split into groups
/// that share elements (the least costs add up over groups), then each group is searched
/// exhaustively, taking the first set not yet met and trying each of its elements, cutting off a
/// branch once it costs as much as the best found.
pub(super) fn least_cover(sets: &[&[usize]], cost: &[u64]) -> u64 {
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
