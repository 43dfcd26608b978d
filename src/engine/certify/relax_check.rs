//! Independent checker for the answers of [`crate::engine::relax::relax`].
//!
//! Written apart from the search and sharing none of its code: it reads the problem and the
//! report only. It checks the colouring constraint by constraint, rebuilds each obstruction's CNF
//! from its list of vertices and soft items (its own encoder) and has its DRAT proof checked by
//! [`crate::engine::colouring::check_drat`] (itself independent of the solver), and recomputes the
//! least cost of a set meeting every obstruction with its own exhaustive search, which must bound
//! the claimed cost from below and equal it when the answer is claimed optimal.

use std::fmt::Write;

use super::cover_check::{CostFault, check_bounds, relaxation_mask};
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

impl From<CostFault> for RelaxRejection {
    fn from(fault: CostFault) -> RelaxRejection {
        match fault {
            CostFault::BadItem(j) => RelaxRejection::BadItem(j),
            CostFault::WrongCost { claimed, actual } => {
                RelaxRejection::WrongCost { claimed, actual }
            }
            CostFault::NoHardObstruction => RelaxRejection::NoHardObstruction,
            CostFault::BoundTooHigh { claimed, proven } => {
                RelaxRejection::BoundTooHigh { claimed, proven }
            }
            CostFault::NotOptimal { cost, proven } => RelaxRejection::NotOptimal { cost, proven },
        }
    }
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
    let cost: Vec<u64> = problem.soft.iter().map(|s| s.cost).collect();
    match (&report.relaxation, &report.colouring) {
        (Some(set), Some(colouring)) => {
            let dropped = relaxation_mask(set, &cost, report.cost)?;
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
    let claims = (report.infeasible, report.lower_bound, report.proven_optimal);
    let soft_sets = report.obstructions.iter().map(|o| o.soft.as_slice());
    let (proven, verdict) = check_bounds(soft_sets, &cost, claims, report.cost);
    verdict?;
    if proven.is_none() && report.relaxation.is_some() {
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
