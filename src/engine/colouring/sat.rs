//! A thin wrapper over the batsat CDCL solver that records a DRAT proof from its clause callbacks.
//!
//! Why batsat: it is pure Rust (the build stays free of C++ and libclang), it is a MiniSat-style
//! CDCL solver (clause learning matters on obstructions without large cliques, where plain
//! backtracking stalls), and its learnt/deleted-clause callbacks give a DRAT proof that standard
//! checkers accept (measured, see the project's SAT notes).

use std::fmt::Write;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::Instant;

use batsat::{Callbacks, ClauseKind, Lit, SolverInterface, SolverOpts, Var, lbool};

/// The answer of one solver call.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum SatAnswer {
    /// A model was found.
    Sat,
    /// No model exists (under the assumptions, if any).
    Unsat,
    /// Stopped by the cancellation flag or the deadline.
    Unknown,
}

struct Recorder<'a> {
    proof: Option<String>,
    cancel: Option<&'a AtomicBool>,
    deadline: Option<Instant>,
}

fn write_lits(out: &mut String, c: &[Lit]) {
    for l in c {
        let v = l.var().idx() as i64 + 1;
        let _ = write!(out, "{} ", if l.sign() { v } else { -v });
    }
    out.push_str("0\n");
}

impl Callbacks for Recorder<'_> {
    fn on_new_clause(&mut self, c: &[Lit], kind: ClauseKind) {
        if let Some(p) = &mut self.proof
            && !matches!(kind, ClauseKind::Axiom)
        {
            write_lits(p, c);
        }
    }
    fn on_delete_clause(&mut self, c: &[Lit]) {
        if let Some(p) = &mut self.proof {
            p.push_str("d ");
            write_lits(p, c);
        }
    }
    fn stop(&self) -> bool {
        self.cancel.is_some_and(|c| c.load(Ordering::Relaxed))
            || self.deadline.is_some_and(|d| Instant::now() >= d)
    }
}

/// An incremental SAT solver over DIMACS-numbered literals, optionally logging DRAT.
pub struct Sat<'a> {
    solver: batsat::Solver<Recorder<'a>>,
    ok: bool,
    model: Vec<bool>,
    core: Vec<i32>,
}

impl<'a> Sat<'a> {
    /// A solver with `variables` variables. With `proof`, every learnt and deleted clause is logged
    /// (switched on before the first clause, as DRAT needs).
    pub fn new(
        variables: u32,
        proof: bool,
        cancel: Option<&'a AtomicBool>,
        deadline: Option<Instant>,
    ) -> Sat<'a> {
        let recorder = Recorder {
            proof: proof.then(String::new),
            cancel,
            deadline,
        };
        let mut solver = batsat::Solver::new(SolverOpts::default(), recorder);
        for _ in 0..variables {
            solver.new_var_default();
        }
        Sat {
            solver,
            ok: true,
            model: Vec::new(),
            core: Vec::new(),
        }
    }

    fn lit(&mut self, l: i32) -> Lit {
        let var: Var = self.solver.var_of_int(l.unsigned_abs() - 1);
        Lit::new(var, l > 0)
    }

    /// Adds a clause (DIMACS literals).
    pub fn add_clause(&mut self, clause: &[i32]) {
        let mut lits: Vec<Lit> = clause.iter().map(|&l| self.lit(l)).collect();
        if !self.solver.add_clause_reuse(&mut lits) {
            self.ok = false;
        }
    }

    /// Solves under `assumptions` (DIMACS literals).
    pub fn solve(&mut self, assumptions: &[i32]) -> SatAnswer {
        if !self.ok {
            self.core.clear();
            return SatAnswer::Unsat;
        }
        let lits: Vec<Lit> = assumptions.iter().map(|&l| self.lit(l)).collect();
        let r = self.solver.solve_limited(&lits);
        if r == lbool::TRUE {
            self.model = self
                .solver
                .get_model()
                .iter()
                .map(|&b| b == lbool::TRUE)
                .collect();
            SatAnswer::Sat
        } else if r == lbool::FALSE {
            let core: Vec<i32> = self
                .solver
                .unsat_core()
                .iter()
                .map(|l| {
                    let v = l.var().idx() as i32 + 1;
                    if l.sign() { v } else { -v }
                })
                .collect();
            self.core = core;
            if assumptions.is_empty() {
                self.ok = false;
            }
            SatAnswer::Unsat
        } else {
            SatAnswer::Unknown
        }
    }

    /// The last model (`model()[var - 1]`).
    pub fn model(&self) -> &[bool] {
        &self.model
    }

    /// After an unsatisfiable call with assumptions: literals whose negations are the assumptions
    /// used (as batsat reports them). Either sign may appear; callers compare variables.
    pub fn core_vars(&self) -> Vec<u32> {
        let mut v: Vec<u32> = self.core.iter().map(|l| l.unsigned_abs()).collect();
        v.sort_unstable();
        v.dedup();
        v
    }

    /// The DRAT proof text so far, ending with the empty clause if the formula was refuted.
    pub fn proof(&self) -> Option<String> {
        let mut p = self.solver.cb().proof.clone()?;
        if !self.ok && !p.ends_with("\n0\n") && p != "0\n" {
            p.push_str("0\n");
        }
        Some(p)
    }
}
