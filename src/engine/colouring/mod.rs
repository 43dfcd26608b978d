//! Exact graph colouring with proofs: bounds, heuristics, exact search, obstructions, checkers.

pub mod check;
pub mod dsatur;
pub mod lower_bound;
pub mod problem;
pub mod smallest_last;

pub use check::{ColouringViolation, check_colouring};
pub use dsatur::dsatur;
pub use lower_bound::{BoundEvidence, LowerBound, check_bound, find_clique, lower_bound};
pub use problem::{Classes, ColouringError, ColouringProblem, colour_count};
pub use smallest_last::{KempeOutcome, kempe_colouring, smallest_last_order};
