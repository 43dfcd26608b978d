//! Independent checker for the answers of [`crate::engine::relax::relax_planar`].
//!
//! Written apart from the search and sharing none of its code: it reads the problem and the
//! report only. The relaxed graph (hard edges and the soft edges kept) is built here and its
//! embedding checked with [`check_embedding`]; every Kuratowski subgraph is checked with
//! [`check_kuratowski`] against the whole unrelaxed graph, its soft edges are listed again here
//! from its edges and compared with the report's list, and it must be met by the answer; the least
//! cost of a set meeting every obstruction is recomputed by this folder's own exhaustive search.

use std::collections::BTreeMap;

use super::cover_check::{CostFault, check_bounds, relaxation_mask};
use super::embedding_check::check_embedding;
use super::kuratowski_check::check_kuratowski;
use crate::engine::graph::{Graph, Vertex};
use crate::engine::relax::{PlanarRelaxProblem, PlanarRelaxReport};

/// Why an answer was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum PlanarRelaxRejection {
    #[error("the problem names a pair twice, a loop or a vertex out of range")]
    BadProblem,
    #[error("the relaxation lists soft edge {0}, which does not exist or is listed twice")]
    BadItem(usize),
    #[error("the relaxation costs {actual}, not the {claimed} reported")]
    WrongCost { claimed: u64, actual: u64 },
    #[error("a relaxation is reported without an embedding, or the other way round")]
    MissingEmbedding,
    #[error("the embedding of the relaxed graph is rejected: {0}")]
    Embedding(String),
    #[error("obstruction {index}: {why}")]
    BadObstruction { index: usize, why: String },
    #[error("the lower bound {claimed} is more than the {proven} the obstructions prove")]
    BoundTooHigh { claimed: u64, proven: u64 },
    #[error(
        "the answer is called optimal at cost {cost}, but the obstructions only prove {proven}"
    )]
    NotOptimal { cost: u64, proven: u64 },
    #[error(
        "the graph is called impossible to relax but no obstruction is made of hard edges only"
    )]
    NoHardObstruction,
}

impl From<CostFault> for PlanarRelaxRejection {
    fn from(fault: CostFault) -> PlanarRelaxRejection {
        match fault {
            CostFault::BadItem(j) => PlanarRelaxRejection::BadItem(j),
            CostFault::WrongCost { claimed, actual } => {
                PlanarRelaxRejection::WrongCost { claimed, actual }
            }
            CostFault::NoHardObstruction => PlanarRelaxRejection::NoHardObstruction,
            CostFault::BoundTooHigh { claimed, proven } => {
                PlanarRelaxRejection::BoundTooHigh { claimed, proven }
            }
            CostFault::NotOptimal { cost, proven } => {
                PlanarRelaxRejection::NotOptimal { cost, proven }
            }
        }
    }
}

/// What the check established.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PlanarRelaxCheck {
    /// The least cost of a set meeting every obstruction, recomputed here (`None` when an
    /// obstruction has no soft edge, so nothing meets it).
    pub proven_lower_bound: Option<u64>,
    /// Kuratowski subgraphs checked.
    pub obstructions: usize,
    /// Faces of the relaxed graph's embedding, counted here by its own face walk.
    pub faces: Option<usize>,
}

/// Checks `report` against `problem`; see the module comment for what is checked.
pub fn check_planar_relaxation(
    problem: &PlanarRelaxProblem,
    report: &PlanarRelaxReport,
) -> Result<PlanarRelaxCheck, PlanarRelaxRejection> {
    let n = problem.vertex_count;
    // Every pair once, with the soft edge it is (if any).
    let mut pair_item: BTreeMap<(Vertex, Vertex), Option<usize>> = BTreeMap::new();
    let all = problem.hard.iter().map(|&(u, v)| (u, v, None)).chain(
        problem
            .soft
            .iter()
            .enumerate()
            .map(|(j, s)| (s.u, s.v, Some(j))),
    );
    for (u, v, item) in all {
        if u == v || u as usize >= n || v as usize >= n {
            return Err(PlanarRelaxRejection::BadProblem);
        }
        if pair_item.insert((u.min(v), u.max(v)), item).is_some() {
            return Err(PlanarRelaxRejection::BadProblem);
        }
    }
    let whole_edges: Vec<(Vertex, Vertex)> = pair_item.keys().copied().collect();
    let whole = Graph::from_edges(n, &whole_edges)
        .map_err(|_| PlanarRelaxRejection::BadProblem)?
        .0;
    let cost: Vec<u64> = problem.soft.iter().map(|s| s.cost).collect();
    let mut dropped = vec![false; problem.soft.len()];
    let mut faces = None;
    match (&report.relaxation, &report.embedding) {
        (Some(set), Some(embedding)) => {
            dropped = relaxation_mask(set, &cost, report.cost)?;
            let relaxed_edges: Vec<(Vertex, Vertex)> = pair_item
                .iter()
                .filter(|(_, item)| item.is_none_or(|j| !dropped[j]))
                .map(|(&p, _)| p)
                .collect();
            let relaxed = Graph::from_edges(n, &relaxed_edges)
                .map_err(|_| PlanarRelaxRejection::BadProblem)?
                .0;
            check_embedding(&relaxed, embedding)
                .map_err(|e| PlanarRelaxRejection::Embedding(e.to_string()))?;
            faces = Some(count_faces(embedding.parts()));
        }
        (None, None) => {}
        _ => return Err(PlanarRelaxRejection::MissingEmbedding),
    }
    for (index, o) in report.obstructions.iter().enumerate() {
        let bad = |why: String| PlanarRelaxRejection::BadObstruction { index, why };
        check_kuratowski(&whole, &o.kuratowski).map_err(|e| bad(e.to_string()))?;
        let mut listed: Vec<usize> = o
            .kuratowski
            .edges
            .iter()
            .filter_map(|&(u, v)| pair_item.get(&(u.min(v), u.max(v))).copied().flatten())
            .collect();
        listed.sort_unstable();
        if listed != o.soft {
            return Err(bad(format!(
                "its soft edges are {listed:?}, not the {:?} reported",
                o.soft
            )));
        }
        if report.relaxation.is_some() && !o.soft.iter().any(|&j| dropped[j]) {
            return Err(bad("the relaxation drops none of its soft edges".into()));
        }
    }
    let claims = (report.infeasible, report.lower_bound, report.proven_optimal);
    let soft_sets = report.obstructions.iter().map(|o| o.soft.as_slice());
    // With no proven cover, a hard-only obstruction beside an embedding was caught above (the
    // relaxation drops none of its soft edges).
    let (proven, verdict) = check_bounds(soft_sets, &cost, claims, report.cost);
    verdict?;
    Ok(PlanarRelaxCheck {
        proven_lower_bound: proven,
        obstructions: report.obstructions.len(),
        faces,
    })
}

/// Faces of a rotation system that has passed the embedding check: orbits of the permutation
/// "arrive at w from v, leave w towards the neighbour after v in w's rotation", counted over the
/// whole drawing (one outer face for all components together).
fn count_faces((offsets, rotation): (&[u32], &[Vertex])) -> usize {
    let n = offsets.len().saturating_sub(1);
    let mut darts: Vec<(Vertex, Vertex, usize)> = Vec::with_capacity(rotation.len());
    for v in 0..n {
        let lo = offsets[v] as usize;
        for (i, &w) in rotation[lo..offsets[v + 1] as usize].iter().enumerate() {
            darts.push((v as Vertex, w, lo + i));
        }
    }
    let owner: Vec<Vertex> = darts.iter().map(|&(v, _, _)| v).collect();
    darts.sort_unstable();
    let mut seen = vec![false; rotation.len()];
    let mut orbits = 0usize;
    for start in 0..rotation.len() {
        if seen[start] {
            continue;
        }
        orbits += 1;
        let mut d = start;
        while !seen[d] {
            seen[d] = true;
            let (from, to) = (owner[d], rotation[d]);
            let i = darts
                .binary_search_by(|&(a, b, _)| (a, b).cmp(&(to, from)))
                .unwrap_or(0);
            let back = darts[i].2;
            let hi = offsets[to as usize + 1] as usize;
            d = if back + 1 == hi {
                offsets[to as usize] as usize
            } else {
                back + 1
            };
        }
    }
    // Each component with edges walked its own outer face; the drawing has one.
    let mut component: Vec<usize> = (0..n).collect();
    fn root(c: &mut [usize], mut x: usize) -> usize {
        while c[x] != x {
            c[x] = c[c[x]];
            x = c[x];
        }
        x
    }
    for &(u, v, _) in &darts {
        let (a, b) = (
            root(&mut component, u as usize),
            root(&mut component, v as usize),
        );
        if a != b {
            component[a] = b;
        }
    }
    let mut with_edges: Vec<usize> = darts
        .iter()
        .map(|&(u, _, _)| root(&mut component, u as usize))
        .collect();
    with_edges.sort_unstable();
    with_edges.dedup();
    (orbits + 1).saturating_sub(with_edges.len())
}
