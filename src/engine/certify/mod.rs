//! Independent checkers for the engine's evidence.
//!
//! Each checker is written apart from the algorithm that produces the evidence and shares none of
//! its code: it reads only the input graph and the certificate, and recomputes everything it needs
//! (components, face walks, suppressed paths) in its own way. A checker returns `Ok(())` or the
//! first reason for rejection.

pub mod bipartite_check;
mod cover_check;
pub mod embedding_check;
pub mod kuratowski_check;
pub mod planar_relax_check;
pub mod relax_check;

pub use bipartite_check::{
    OddCycleRejection, TwoColouringRejection, check_odd_cycle, check_two_colouring,
};
pub use embedding_check::{EmbeddingRejection, check_embedding};
pub use kuratowski_check::{KuratowskiRejection, check_kuratowski};
pub use planar_relax_check::{PlanarRelaxCheck, PlanarRelaxRejection, check_planar_relaxation};
pub use relax_check::{RelaxCheck, RelaxRejection, check_relaxation, obstruction_cnf};
