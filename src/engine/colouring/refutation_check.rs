//! Checks a colouring refutation end to end, apart from the code that made it: the CNF must say
//! only things that hold for every colouring of the named subgraph (edge clauses on real edges,
//! pins that really exist (a refutation may leave some of the problem's pins out), symmetry units
//! that name a clique of vertices it does not pin), and the DRAT proof must refute it.

use crate::engine::colouring::drat_check::{DratError, DratSummary, check_drat, parse_dimacs};
use crate::engine::colouring::obstruction::Refutation;
use crate::engine::graph::{Graph, Vertex};

/// Why a refutation was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum RefutationError {
    /// The vertex list repeats a vertex or names one outside the graph.
    #[error("bad vertex list")]
    Vertices,
    /// The pinned slots repeat, or a pin does not match the problem's pins.
    #[error("pin {index} does not match the problem")]
    Pin { index: usize },
    /// The symmetry clique is not a clique of unpinned vertices, or a pinned class is above the
    /// first free class.
    #[error("the symmetry rule is not justified: {reason}")]
    Symmetry { reason: &'static str },
    /// The CNF declares the wrong number of variables.
    #[error("CNF has {found} variables, expected {expected}")]
    Variables { found: u32, expected: u32 },
    /// A clause is not one the colouring rules allow.
    #[error("clause {index} ({clause:?}) is not a colouring constraint of this subgraph")]
    Clause { index: usize, clause: Vec<i32> },
    /// The proof does not refute the CNF.
    #[error(transparent)]
    Drat(#[from] DratError),
}

/// Checks `r` against the graph and the problem's pins (palette slot per vertex).
///
/// # Complexity
/// O(size of the CNF * log) for the clause rules plus the DRAT check.
pub fn check_refutation(
    g: &Graph,
    pins: &[Option<u32>],
    r: &Refutation,
) -> Result<DratSummary, RefutationError> {
    let n = g.vertex_count() as u32;
    let k = r.colours;
    let s = r.vertices.len() as u32;
    let mut sorted = r.vertices.clone();
    sorted.sort_unstable();
    if sorted.windows(2).any(|w| w[0] == w[1]) || sorted.iter().any(|&v| v >= n) {
        return Err(RefutationError::Vertices);
    }
    let original = |i: u32| r.vertices[i as usize];
    let pin_of = |v: Vertex| pins.get(v as usize).copied().flatten();
    // Pinned slots distinct, every pin entry true to the problem.
    let mut slots = r.pinned_slots.clone();
    slots.sort_unstable();
    if slots.windows(2).any(|w| w[0] == w[1]) {
        return Err(RefutationError::Pin { index: 0 });
    }
    let mut pinned_class: Vec<Option<u32>> = vec![None; s as usize];
    for (index, &(i, class)) in r.pins.iter().enumerate() {
        if i >= s
            || class >= k
            || class as usize >= r.pinned_slots.len()
            || pin_of(original(i)) != Some(r.pinned_slots[class as usize])
            || pinned_class[i as usize].is_some()
        {
            return Err(RefutationError::Pin { index });
        }
        pinned_class[i as usize] = Some(class);
    }
    // Symmetry: clique of unpinned vertices, and no pin uses a class from first_free up.
    let sym = &r.symmetry;
    if r.pins.iter().any(|&(_, c)| c >= sym.first_free_class) {
        return Err(RefutationError::Symmetry {
            reason: "a pin names a class counted as free",
        });
    }
    for (a, &x) in sym.clique.iter().enumerate() {
        // Pinned in this refutation's CNF. A vertex pinned in the problem but not here is only
        // a constraint left out, and refuting fewer constraints refutes the problem too.
        if x >= s || pinned_class[x as usize].is_some() {
            return Err(RefutationError::Symmetry {
                reason: "clique vertex outside the subgraph or pinned",
            });
        }
        for &y in &sym.clique[a + 1..] {
            if y >= s || x == y || !g.has_edge(original(x), original(y)) {
                return Err(RefutationError::Symmetry {
                    reason: "clique vertices not adjacent",
                });
            }
        }
    }
    let cnf = parse_dimacs(&r.cnf)?;
    if cnf.variables != s * k {
        return Err(RefutationError::Variables {
            found: cnf.variables,
            expected: s * k,
        });
    }
    // Variable v = i*k + c + 1.
    let split = |lit: i32| {
        let x = lit.unsigned_abs() - 1;
        (x / k, x % k)
    };
    for (index, clause) in cnf.clauses.iter().enumerate() {
        let bad = || RefutationError::Clause {
            index,
            clause: clause.clone(),
        };
        let allowed = match clause.as_slice() {
            [] => false,
            [lit] if *lit > 0 => {
                // A pin: vertex i has its pinned class.
                let (i, c) = split(*lit);
                pinned_class[i as usize] == Some(c)
            }
            [lit] => {
                // A symmetry unit: clique vertex number a may not take a free class above
                // first_free + a.
                let (i, c) = split(*lit);
                sym.clique
                    .iter()
                    .position(|&x| x == i)
                    .is_some_and(|a| c > sym.first_free_class + a as u32)
            }
            [a, b] if *a < 0 && *b < 0 => {
                let (i, c) = split(*a);
                let (j, d) = split(*b);
                c == d && i != j && g.has_edge(original(i), original(j))
            }
            lits => {
                // At least one colour for one vertex: all k of its variables, positive.
                let (i, _) = split(lits[0]);
                let mut cs: Vec<u32> = lits
                    .iter()
                    .filter(|&&l| l > 0 && split(l).0 == i)
                    .map(|&l| split(l).1)
                    .collect();
                cs.sort_unstable();
                cs.dedup();
                cs.len() == lits.len() && cs.len() == k as usize
            }
        };
        if !allowed {
            return Err(bad());
        }
    }
    Ok(check_drat(&r.cnf, &r.drat)?)
}
