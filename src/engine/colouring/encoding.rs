//! The k-colouring CNF: one variable per (vertex, class), with pins and clique symmetry breaking.

use std::fmt::Write;

use crate::engine::graph::{Graph, Vertex};

/// Symmetry breaking by a clique of unpinned vertices.
///
/// Classes from `first_free_class` upwards are interchangeable (no pin names them). In any
/// colouring, permuting those classes so that the clique's free classes appear in clique order
/// gives another colouring; so clique vertex `i` (0-based) can be required to take a pinned class
/// or a free class below `first_free_class + i + 1`. Without pins this fixes the clique's colours.
#[derive(Debug, Clone, PartialEq, Eq, Default)]
pub struct Symmetry {
    /// Pairwise adjacent, unpinned vertices, in the order the rule uses.
    pub clique: Vec<Vertex>,
    /// The number of pinned classes (classes `0..first_free_class` are pinned slots).
    pub first_free_class: u32,
}

/// A CNF formula in DIMACS numbering (variables from 1; a negative number is a negated variable).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Cnf {
    /// Number of variables.
    pub variables: u32,
    /// Clauses.
    pub clauses: Vec<Vec<i32>>,
}

/// The DIMACS variable meaning "vertex `v` has class `c`" when `k` classes exist.
#[inline]
pub fn colour_var(v: Vertex, c: u32, k: u32) -> i32 {
    (v * k + c + 1) as i32
}

/// Builds the k-colouring CNF of `g`: at least one class per vertex; for each edge and class, not
/// both ends; a unit per pinned vertex; the symmetry units of [`Symmetry`]. (At-most-one clauses
/// are not needed: any model can be read by taking a vertex's first true class.)
///
/// # Complexity
/// O(k (n + m)) clauses and time.
pub fn colouring_cnf(g: &Graph, pin_class: &[Option<u32>], k: u32, symmetry: &Symmetry) -> Cnf {
    let n = g.vertex_count() as u32;
    let mut clauses = Vec::with_capacity((n as usize) + g.edge_count() * k as usize);
    for v in 0..n {
        clauses.push((0..k).map(|c| colour_var(v, c, k)).collect());
    }
    for (u, v) in g.edges() {
        for c in 0..k {
            clauses.push(vec![-colour_var(u, c, k), -colour_var(v, c, k)]);
        }
    }
    for v in 0..n {
        if let Some(Some(c)) = pin_class.get(v as usize) {
            if *c < k {
                clauses.push(vec![colour_var(v, *c, k)]);
            } else {
                // A pin on a class that does not exist: no k-colouring at all.
                clauses.push(Vec::new());
            }
        }
    }
    for (i, &v) in symmetry.clique.iter().enumerate() {
        for c in (symmetry.first_free_class + i as u32 + 1)..k {
            clauses.push(vec![-colour_var(v, c, k)]);
        }
    }
    Cnf {
        variables: n * k,
        clauses,
    }
}

impl Cnf {
    /// DIMACS CNF text, with comment lines saying what the variables mean.
    pub fn to_dimacs(&self, comments: &[String]) -> String {
        let mut out = String::new();
        for c in comments {
            let _ = writeln!(out, "c {c}");
        }
        let _ = writeln!(out, "p cnf {} {}", self.variables, self.clauses.len());
        for clause in &self.clauses {
            for lit in clause {
                let _ = write!(out, "{lit} ");
            }
            out.push_str("0\n");
        }
        out
    }
}

/// Reads a class per vertex out of a model (`model[var - 1]` is the value of DIMACS variable `var`).
pub fn decode(model: &[bool], n: usize, k: u32) -> Vec<u32> {
    (0..n as u32)
        .map(|v| {
            (0..k)
                .find(|&c| model[(colour_var(v, c, k) - 1) as usize])
                .unwrap_or(0)
        })
        .collect()
}
