//! Checks 2-colourings and odd cycles.

use crate::engine::graph::{Graph, Vertex};

/// Why a 2-colouring was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum TwoColouringRejection {
    #[error("{found} colours given for {expected} vertices")]
    Length { expected: usize, found: usize },
    #[error("vertex {vertex} has colour {colour}, not 0 or 1")]
    NotTwoColours { vertex: Vertex, colour: u8 },
    #[error("edge {u}-{v} joins two vertices of the same colour")]
    Monochromatic { u: Vertex, v: Vertex },
}

/// Why an odd cycle was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum OddCycleRejection {
    #[error("a cycle of length {length} is not an odd cycle of length at least 3")]
    Length { length: usize },
    #[error("vertex {vertex} is not in the graph or appears twice")]
    Vertex { vertex: Vertex },
    #[error("{u}-{v} is not an edge of the graph")]
    NotAnEdge { u: Vertex, v: Vertex },
}

/// Checks that `colour` gives every edge of `g` two different colours out of {0, 1}.
///
/// # Complexity
/// O(n + m).
pub fn check_two_colouring(g: &Graph, colour: &[u8]) -> Result<(), TwoColouringRejection> {
    if colour.len() != g.vertex_count() {
        return Err(TwoColouringRejection::Length {
            expected: g.vertex_count(),
            found: colour.len(),
        });
    }
    if let Some((v, &c)) = colour.iter().enumerate().find(|&(_, &c)| c > 1) {
        return Err(TwoColouringRejection::NotTwoColours {
            vertex: v as Vertex,
            colour: c,
        });
    }
    for (u, v) in g.edges() {
        if colour[u as usize] == colour[v as usize] {
            return Err(TwoColouringRejection::Monochromatic { u, v });
        }
    }
    Ok(())
}

/// Checks that `cycle` is a cycle of odd length in `g`: distinct vertices, consecutive ones
/// adjacent, and the last adjacent to the first.
///
/// # Complexity
/// O(k log d) for a cycle of length k in a graph of maximum degree d, plus O(n) for the marks.
pub fn check_odd_cycle(g: &Graph, cycle: &[Vertex]) -> Result<(), OddCycleRejection> {
    let k = cycle.len();
    if k < 3 || k.is_multiple_of(2) {
        return Err(OddCycleRejection::Length { length: k });
    }
    let mut seen = vec![false; g.vertex_count()];
    for &v in cycle {
        if v as usize >= seen.len() || seen[v as usize] {
            return Err(OddCycleRejection::Vertex { vertex: v });
        }
        seen[v as usize] = true;
    }
    for i in 0..k {
        let (u, v) = (cycle[i], cycle[(i + 1) % k]);
        if !g.has_edge(u, v) {
            return Err(OddCycleRejection::NotAnEdge { u, v });
        }
    }
    Ok(())
}
