//! Independent checker for colourings: every edge has two different colours, pins are kept,
//! every colour is a palette slot. Written separately from every solver (it shares none of their code).

use crate::engine::colouring::problem::ColouringProblem;
use crate::engine::graph::Vertex;

/// What is wrong with a proposed colouring.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum ColouringViolation {
    /// The colouring does not have one entry per vertex.
    #[error("colouring has {given} entries for {vertices} vertices")]
    Length { given: usize, vertices: usize },
    /// A colour is not a palette slot.
    #[error("vertex {vertex} has colour {colour}, outside the {max_colours}-slot palette")]
    OutsidePalette {
        vertex: Vertex,
        colour: u32,
        max_colours: u32,
    },
    /// A pinned vertex has another colour.
    #[error("vertex {vertex} is pinned to {pin} but has colour {colour}")]
    PinIgnored {
        vertex: Vertex,
        pin: u32,
        colour: u32,
    },
    /// Two neighbours share a colour.
    #[error("neighbours {u} and {v} both have colour {colour}")]
    Clash { u: Vertex, v: Vertex, colour: u32 },
}

/// Checks `colouring` (palette slot per vertex) against the problem: proper, pinned, in palette.
///
/// # Complexity
/// O(n + m).
pub fn check_colouring(
    problem: &ColouringProblem,
    colouring: &[u32],
) -> Result<(), ColouringViolation> {
    let g = &problem.graph;
    if colouring.len() != g.vertex_count() {
        return Err(ColouringViolation::Length {
            given: colouring.len(),
            vertices: g.vertex_count(),
        });
    }
    for (v, &colour) in colouring.iter().enumerate() {
        if colour >= problem.max_colours {
            return Err(ColouringViolation::OutsidePalette {
                vertex: v as Vertex,
                colour,
                max_colours: problem.max_colours,
            });
        }
        if let Some(Some(pin)) = problem.pins.get(v)
            && *pin != colour
        {
            return Err(ColouringViolation::PinIgnored {
                vertex: v as Vertex,
                pin: *pin,
                colour,
            });
        }
    }
    for u in 0..g.vertex_count() as Vertex {
        for &v in g.neighbours(u) {
            if u < v && colouring[u as usize] == colouring[v as usize] {
                return Err(ColouringViolation::Clash {
                    u,
                    v,
                    colour: colouring[u as usize],
                });
            }
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::graph::Graph;

    #[test]
    fn finds_a_clash_on_a_closed_six_cycle() {
        // The 6-cycle must close (0-5): a colouring that only counts colours would miss this.
        let (g, _) =
            Graph::from_edges(6, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 5), (5, 0)]).unwrap();
        let p = ColouringProblem::new(g, 3);
        assert_eq!(check_colouring(&p, &[0, 1, 0, 1, 0, 1]), Ok(()));
        assert_eq!(
            check_colouring(&p, &[0, 1, 0, 1, 2, 0]),
            Err(ColouringViolation::Clash {
                u: 0,
                v: 5,
                colour: 0
            })
        );
        assert!(matches!(
            check_colouring(&p, &[0, 1, 0, 1, 0, 3]),
            Err(ColouringViolation::OutsidePalette { vertex: 5, .. })
        ));
    }
}
