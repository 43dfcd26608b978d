//! Obstructions: is a set of vertices, with the constraints among them that are still kept,
//! k-colourable? If not, a small set of vertices and soft items that already cannot be coloured,
//! with a DRAT proof.
//!
//! Every vertex and every soft item gets a selector literal: a vertex's "some colour" clause, its
//! hard pins and the hard "same colour" clauses it takes part in hold only while its selector is
//! assumed true (with every colour variable false, a vertex left out satisfies every other clause);
//! a soft item's clauses hold only while its selector is assumed true, and a soft item is assumed
//! only together with its vertices. The solver's final conflict names the selectors it used; the
//! search then keeps a part of that size (rebuilding the solver on it while it shrinks by a fifth
//! or more) and runs a deletion pass, soft items first, then vertices, so that every soft item and
//! every vertex left is needed. The proof is logged by a fresh solver on the obstruction's own
//! CNF, with no selectors, so it refutes exactly the formula the checker rebuilds.

use std::sync::atomic::AtomicBool;
use std::time::Instant;

use super::{Constraint, RelaxObstruction, RelaxProblem};
use crate::engine::colouring::sat::{Sat, SatAnswer};
use crate::engine::graph::Vertex;

/// The answer for one set of vertices.
#[derive(Debug)]
pub(crate) enum Local {
    /// The vertices can be coloured with the kept constraints among them.
    Colourable,
    /// They cannot: here is why.
    Obstruction(RelaxObstruction),
    /// Stopped first.
    Unknown,
}

fn x(i: usize, c: u32, k: u32) -> i32 {
    (i as u32 * k + c + 1) as i32
}

/// The clauses of one constraint over local indices `a`, `b` (`b == a` for a pin), each prefixed
/// by `guard` (literals that switch it off when false).
fn constraint_clauses(c: Constraint, a: usize, b: usize, k: u32, guard: &[i32]) -> Vec<Vec<i32>> {
    let with = |mut lits: Vec<i32>| {
        let mut out: Vec<i32> = guard.iter().map(|&g| -g).collect();
        out.append(&mut lits);
        out
    };
    match c {
        Constraint::Differ(..) => (0..k)
            .map(|col| with(vec![-x(a, col, k), -x(b, col, k)]))
            .collect(),
        Constraint::Same(..) => (0..k)
            .flat_map(|col| {
                [
                    with(vec![-x(a, col, k), x(b, col, k)]),
                    with(vec![-x(b, col, k), x(a, col, k)]),
                ]
            })
            .collect(),
        Constraint::Pin(_, col) if col < k => vec![with(vec![x(a, col, k)])],
        Constraint::Pin(..) => vec![with(Vec::new())],
    }
}

fn ends(c: Constraint) -> (Vertex, Vertex) {
    match c {
        Constraint::Differ(u, v) | Constraint::Same(u, v) => (u, v),
        Constraint::Pin(v, _) => (v, v),
    }
}

/// The CNF of an obstruction as documented on [`RelaxObstruction`]: (variables, clauses).
pub(crate) fn obstruction_clauses(
    problem: &RelaxProblem,
    vertices: &[Vertex],
    soft: &[usize],
) -> (u32, Vec<Vec<i32>>) {
    let k = problem.colours;
    let local = |v: Vertex| vertices.binary_search(&v).ok();
    let mut clauses = Vec::new();
    for i in 0..vertices.len() {
        clauses.push((0..k).map(|c| x(i, c, k)).collect());
        for c in 0..k {
            for d in c + 1..k {
                clauses.push(vec![-x(i, c, k), -x(i, d, k)]);
            }
        }
    }
    let mut add = |c: Constraint| {
        let (u, v) = ends(c);
        if let (Some(a), Some(b)) = (local(u), local(v)) {
            clauses.extend(constraint_clauses(c, a, b, k, &[]));
        }
    };
    for &c in &problem.hard {
        add(c);
    }
    for &j in soft {
        add(problem.soft[j].constraint);
    }
    (vertices.len() as u32 * k, clauses)
}

struct Selectors<'p> {
    problem: &'p RelaxProblem,
    ball: Vec<Vertex>,
    /// The kept soft items inside the ball (indices into the problem).
    soft: Vec<usize>,
    /// Local vertex indices of each soft item.
    soft_ends: Vec<(usize, usize)>,
}

impl Selectors<'_> {
    fn t(&self, i: usize) -> i32 {
        (self.ball.len() as u32 * self.problem.colours + i as u32 + 1) as i32
    }
    fn s(&self, j: usize) -> i32 {
        (self.ball.len() as u32 * (self.problem.colours + 1) + j as u32 + 1) as i32
    }
    fn variables(&self) -> u32 {
        self.ball.len() as u32 * (self.problem.colours + 1) + self.soft.len() as u32
    }
}

/// Decides the vertices `ball` (ascending) with the hard constraints among them and the soft items
/// among them with `kept[j]`; when they cannot be coloured, returns a shrunken obstruction with
/// its proof.
pub(crate) fn local_obstruction(
    problem: &RelaxProblem,
    kept: &[bool],
    ball: &[Vertex],
    cancel: &AtomicBool,
    deadline: Option<Instant>,
) -> Local {
    let mut ball = ball.to_vec();
    let mut soft_filter: Option<Vec<usize>> = None;
    loop {
        let sel = selectors(problem, kept, &ball, soft_filter.as_deref());
        let mut sat = Sat::new(sel.variables(), false, Some(cancel), deadline);
        load(&sel, &mut sat);
        let all_v = vec![true; sel.ball.len()];
        let all_s = vec![true; sel.soft.len()];
        match try_assume(&sel, &mut sat, &all_v, &all_s) {
            Try::Sat => return Local::Colourable,
            Try::Unknown => return Local::Unknown,
            Try::Unsat(cv, cs) => {
                let size = cv.iter().filter(|&&b| b).count();
                if size * 5 <= sel.ball.len() * 4 {
                    // Rebuild on the core alone: the deletion pass is cheaper there.
                    ball = (0..sel.ball.len())
                        .filter(|&i| cv[i])
                        .map(|i| sel.ball[i])
                        .collect();
                    soft_filter = Some(
                        (0..sel.soft.len())
                            .filter(|&j| cs[j])
                            .map(|j| sel.soft[j])
                            .collect(),
                    );
                    continue;
                }
                let (cv, cs) = deletion(&sel, &mut sat, cv, cs);
                let vertices: Vec<Vertex> = (0..sel.ball.len())
                    .filter(|&i| cv[i])
                    .map(|i| sel.ball[i])
                    .collect();
                let soft: Vec<usize> = (0..sel.soft.len())
                    .filter(|&j| cs[j])
                    .map(|j| sel.soft[j])
                    .collect();
                return match prove(problem, &vertices, &soft, cancel) {
                    Some(drat) => Local::Obstruction(RelaxObstruction {
                        vertices,
                        soft,
                        drat,
                    }),
                    None => Local::Unknown,
                };
            }
        }
    }
}

fn selectors<'p>(
    problem: &'p RelaxProblem,
    kept: &[bool],
    ball: &[Vertex],
    only: Option<&[usize]>,
) -> Selectors<'p> {
    let local = |v: Vertex| ball.binary_search(&v).ok();
    let mut soft = Vec::new();
    let mut soft_ends = Vec::new();
    let candidates: Box<dyn Iterator<Item = usize>> = match only {
        Some(list) => Box::new(list.iter().copied()),
        None => Box::new((0..problem.soft.len()).filter(|&j| kept[j])),
    };
    for j in candidates {
        let (u, v) = ends(problem.soft[j].constraint);
        if let (Some(a), Some(b)) = (local(u), local(v)) {
            soft.push(j);
            soft_ends.push((a, b));
        }
    }
    Selectors {
        problem,
        ball: ball.to_vec(),
        soft,
        soft_ends,
    }
}

fn load(sel: &Selectors, sat: &mut Sat) {
    let k = sel.problem.colours;
    let local = |v: Vertex| sel.ball.binary_search(&v).ok();
    for i in 0..sel.ball.len() {
        let mut alo = vec![-sel.t(i)];
        alo.extend((0..k).map(|c| x(i, c, k)));
        sat.add_clause(&alo);
        for c in 0..k {
            for d in c + 1..k {
                sat.add_clause(&[-x(i, c, k), -x(i, d, k)]);
            }
        }
    }
    for &c in &sel.problem.hard {
        let (u, v) = ends(c);
        if let (Some(a), Some(b)) = (local(u), local(v)) {
            // "Differ" needs no guard: a vertex left out has no colour and meets it anyway.
            let guard: Vec<i32> = match c {
                Constraint::Differ(..) => Vec::new(),
                Constraint::Same(..) if a != b => vec![sel.t(a), sel.t(b)],
                _ => vec![sel.t(a)],
            };
            for clause in constraint_clauses(c, a, b, k, &guard) {
                sat.add_clause(&clause);
            }
        }
    }
    for (j, &item) in sel.soft.iter().enumerate() {
        let (a, b) = sel.soft_ends[j];
        for clause in constraint_clauses(sel.problem.soft[item].constraint, a, b, k, &[sel.s(j)]) {
            sat.add_clause(&clause);
        }
    }
}

enum Try {
    Sat,
    Unknown,
    /// The selectors of the final conflict, closed under "a soft item's vertices".
    Unsat(Vec<bool>, Vec<bool>),
}

fn try_assume(sel: &Selectors, sat: &mut Sat, vs: &[bool], ss: &[bool]) -> Try {
    let mut assumptions: Vec<i32> = (0..vs.len()).filter(|&i| vs[i]).map(|i| sel.t(i)).collect();
    assumptions.extend((0..ss.len()).filter(|&j| ss[j]).map(|j| sel.s(j)));
    match sat.solve(&assumptions) {
        SatAnswer::Sat => Try::Sat,
        SatAnswer::Unknown => Try::Unknown,
        SatAnswer::Unsat => {
            let core = sat.core_vars();
            let base = sel.ball.len() as u32 * sel.problem.colours;
            let mut cv = vec![false; vs.len()];
            let mut cs = vec![false; ss.len()];
            for var in core {
                let var = var - 1;
                if var >= base && var < base + vs.len() as u32 {
                    cv[(var - base) as usize] = true;
                } else if var >= base + vs.len() as u32 {
                    cs[(var - base - vs.len() as u32) as usize] = true;
                }
            }
            // The core is a subset of the assumptions; keep it so even if the solver said more.
            for i in 0..vs.len() {
                cv[i] &= vs[i];
            }
            for j in 0..ss.len() {
                cs[j] &= ss[j];
                if cs[j] {
                    let (a, b) = sel.soft_ends[j];
                    cv[a] = true;
                    cv[b] = true;
                }
            }
            Try::Unsat(cv, cs)
        }
    }
}

/// Deletion pass: drop each soft item, then each vertex (with its soft items), whenever what is
/// left still cannot be coloured. Stopping early keeps what is known to be unsatisfiable.
fn deletion(
    sel: &Selectors,
    sat: &mut Sat,
    mut cv: Vec<bool>,
    mut cs: Vec<bool>,
) -> (Vec<bool>, Vec<bool>) {
    for j in 0..cs.len() {
        if !cs[j] {
            continue;
        }
        let mut ts = cs.clone();
        ts[j] = false;
        match try_assume(sel, sat, &cv, &ts) {
            Try::Unsat(nv, ns) => {
                cv = nv;
                cs = ns;
            }
            Try::Sat => {}
            Try::Unknown => return (cv, cs),
        }
    }
    for i in 0..cv.len() {
        if !cv[i] {
            continue;
        }
        let mut tv = cv.clone();
        tv[i] = false;
        let mut ts = cs.clone();
        for (j, &(a, b)) in sel.soft_ends.iter().enumerate() {
            if a == i || b == i {
                ts[j] = false;
            }
        }
        match try_assume(sel, sat, &tv, &ts) {
            Try::Unsat(nv, ns) => {
                cv = nv;
                cs = ns;
            }
            Try::Sat => {}
            Try::Unknown => return (cv, cs),
        }
    }
    (cv, cs)
}

/// Refutes the obstruction's own CNF with a proof-logging solver; `None` if cancelled (or, which
/// would be a bug, if the CNF turned out satisfiable).
fn prove(
    problem: &RelaxProblem,
    vertices: &[Vertex],
    soft: &[usize],
    cancel: &AtomicBool,
) -> Option<String> {
    let (variables, clauses) = obstruction_clauses(problem, vertices, soft);
    let mut sat = Sat::new(variables, true, Some(cancel), None);
    for c in &clauses {
        sat.add_clause(c);
    }
    match sat.solve(&[]) {
        SatAnswer::Unsat => sat.proof(),
        SatAnswer::Sat => {
            debug_assert!(false, "an obstruction's CNF was satisfiable");
            None
        }
        SatAnswer::Unknown => None,
    }
}
