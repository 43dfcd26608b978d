//! Exact graph colouring with proofs: bounds, heuristics, exact search, obstructions, checkers.

pub mod argument;
pub mod balance;
pub mod check;
pub mod drat_check;
pub mod dsatur;
pub mod encoding;
pub mod exact;
pub mod hierarchy;
pub mod lower_bound;
pub mod obstruction;
pub mod problem;
pub mod recolour;
pub mod refutation_check;
pub mod sat;
pub mod smallest_last;
pub mod solve;
pub mod tabu;

pub use argument::{
    ArgumentStep, StepKind, case_analysis, colour_letter, replay_argument, step_text,
};
pub use balance::balance_colouring;
pub use check::{ColouringViolation, check_colouring};
pub use drat_check::{DratError, DratSummary, check_drat, parse_dimacs};
pub use dsatur::dsatur;
pub use encoding::{Cnf, Symmetry, colour_var, colouring_cnf};
pub use exact::{Decision, Limits, PartProof, k_colourable, k_colourable_logged, repair};
pub use hierarchy::{
    HierarchyError, HierarchyReport, arrange_tints, hierarchy_colouring, parent_graph,
};
pub use lower_bound::{
    BoundEvidence, LowerBound, check_bound, find_clique, find_clique_in_order, lower_bound,
    lower_bound_in_order,
};
pub use obstruction::{
    FailedPart, Obstruction, ObstructionKind, ObstructionOptions, Refutation, find_obstruction,
};
pub use problem::{Classes, ColouringError, ColouringProblem, colour_count};
pub use recolour::{Recolouring, stable_recolour};
pub use refutation_check::{RefutationError, check_refutation};
pub use smallest_last::{
    KempeOutcome, kempe_colouring, kempe_colouring_in_order, smallest_last_order,
};
pub use solve::{Balance, ColouringReport, Progress, SolveOptions, Stage, StoppedPart, solve};
pub use tabu::tabu_colouring;
