//! The colouring problem as the engine sees it: a graph, pins, an optional previous colouring and
//! the number of palette slots; plus the mapping between palette slots and interchangeable classes.

use crate::engine::graph::{Graph, Vertex};

/// One colouring question: colour every vertex with a palette slot so that neighbours differ.
///
/// Same-colour groups are merged into single vertices by the caller before the problem is built.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ColouringProblem {
    /// The constraint graph (regions after merging groups; edges join regions that must differ).
    pub graph: Graph,
    /// `pins[v] = Some(slot)` fixes vertex `v` to palette slot `slot`. Empty means "no pins".
    pub pins: Vec<Option<u32>>,
    /// A previous colouring (palette slot per vertex, `None` for new vertices), for stable recolouring.
    pub previous: Option<Vec<Option<u32>>>,
    /// How many palette slots exist; every colour used is a slot `0..max_colours`.
    pub max_colours: u32,
}

impl ColouringProblem {
    /// A problem with no pins and no previous colouring.
    pub fn new(graph: Graph, max_colours: u32) -> ColouringProblem {
        ColouringProblem {
            graph,
            pins: Vec::new(),
            previous: None,
            max_colours,
        }
    }

    /// The pin of `v`, if any.
    #[inline]
    pub fn pin(&self, v: Vertex) -> Option<u32> {
        self.pins.get(v as usize).copied().flatten()
    }
}

/// Why a colouring problem cannot be answered at all. Each variant carries its evidence.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum ColouringError {
    /// The pin list is longer than the vertex list.
    #[error("{pins} pins given for a graph of {vertices} vertices")]
    PinCount { pins: usize, vertices: usize },
    /// The previous colouring has the wrong length.
    #[error("previous colouring has {given} entries for a graph of {vertices} vertices")]
    PreviousCount { given: usize, vertices: usize },
    /// A pin names a slot outside the palette.
    #[error(
        "vertex {vertex} is pinned to slot {slot}, but the palette has only {max_colours} slots"
    )]
    PinOutsidePalette {
        vertex: Vertex,
        slot: u32,
        max_colours: u32,
    },
    /// Two neighbours are pinned to the same slot: no colouring can exist.
    #[error("neighbours {u} and {v} are both pinned to slot {slot}")]
    PinnedNeighbours { u: Vertex, v: Vertex, slot: u32 },
    /// The palette has too few slots for the colours this graph needs (the lower bound, with its
    /// evidence, is in the report carried here).
    #[error("the map needs at least {needed} colours but the palette has {max_colours} slots")]
    PaletteTooSmall { needed: u32, max_colours: u32 },
}

/// Pinned slots become the first classes (fixed identities); all other classes are interchangeable.
///
/// Solvers work with classes `0..k`: class `i < pinned_slots.len()` is palette slot
/// `pinned_slots[i]`; classes from `pinned_slots.len()` upwards are free and may be permuted.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Classes {
    /// The distinct pinned slots, ascending.
    pub pinned_slots: Vec<u32>,
    /// `pin_class[v]` is the class of a pinned vertex.
    pub pin_class: Vec<Option<u32>>,
}

impl Classes {
    /// Validates pins and builds the class mapping.
    pub fn new(problem: &ColouringProblem) -> Result<Classes, ColouringError> {
        let n = problem.graph.vertex_count();
        if problem.pins.len() > n {
            return Err(ColouringError::PinCount {
                pins: problem.pins.len(),
                vertices: n,
            });
        }
        if let Some(prev) = &problem.previous
            && prev.len() != n
        {
            return Err(ColouringError::PreviousCount {
                given: prev.len(),
                vertices: n,
            });
        }
        let mut pinned_slots = Vec::new();
        for (v, pin) in problem.pins.iter().enumerate() {
            if let Some(slot) = *pin {
                if slot >= problem.max_colours {
                    return Err(ColouringError::PinOutsidePalette {
                        vertex: v as Vertex,
                        slot,
                        max_colours: problem.max_colours,
                    });
                }
                pinned_slots.push(slot);
            }
        }
        pinned_slots.sort_unstable();
        pinned_slots.dedup();
        for (u, v) in problem.graph.edges() {
            if let (Some(a), Some(b)) = (problem.pin(u), problem.pin(v))
                && a == b
            {
                return Err(ColouringError::PinnedNeighbours { u, v, slot: a });
            }
        }
        let mut pin_class = vec![None; n];
        for (v, pin) in problem.pins.iter().enumerate() {
            if let Some(slot) = *pin {
                // The slot is in the list by construction.
                let class = pinned_slots.partition_point(|&s| s < slot) as u32;
                pin_class[v] = Some(class);
            }
        }
        Ok(Classes {
            pinned_slots,
            pin_class,
        })
    }

    /// Number of classes with a fixed identity.
    pub fn pinned_count(&self) -> u32 {
        self.pinned_slots.len() as u32
    }

    /// Maps a class colouring to palette slots. Free classes take the lowest slots not pinned,
    /// in class order, unless `preferred` (slot per free class) says otherwise.
    pub fn to_slots(&self, classes: &[u32], max_colours: u32) -> Vec<u32> {
        let used = classes.iter().copied().max().map_or(0, |c| c + 1);
        let mut slot_of_class = self.pinned_slots.clone();
        let mut next = 0u32;
        while (slot_of_class.len() as u32) < used {
            while self.pinned_slots.binary_search(&next).is_ok() {
                next += 1;
            }
            slot_of_class.push(next);
            next += 1;
        }
        debug_assert!(slot_of_class.iter().all(|&s| s < max_colours.max(used)));
        classes.iter().map(|&c| slot_of_class[c as usize]).collect()
    }

    /// Maps a slot colouring back to classes (free slots are numbered after the pinned ones in
    /// ascending slot order).
    pub fn from_slots(&self, slots: &[u32]) -> Vec<u32> {
        let mut free: Vec<u32> = slots
            .iter()
            .copied()
            .filter(|s| self.pinned_slots.binary_search(s).is_err())
            .collect();
        free.sort_unstable();
        free.dedup();
        let p = self.pinned_count();
        slots
            .iter()
            .map(|s| match self.pinned_slots.binary_search(s) {
                Ok(i) => i as u32,
                Err(_) => p + free.partition_point(|f| f < s) as u32,
            })
            .collect()
    }
}

/// Number of distinct values in a colouring.
pub fn colour_count(colouring: &[u32]) -> u32 {
    let mut seen: Vec<u32> = colouring.to_vec();
    seen.sort_unstable();
    seen.dedup();
    seen.len() as u32
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pinned_slots_become_first_classes() {
        let (g, _) = Graph::from_edges(4, &[(0, 1), (1, 2), (2, 3)]).unwrap();
        let problem = ColouringProblem {
            graph: g,
            pins: vec![Some(5), None, Some(2)],
            previous: None,
            max_colours: 8,
        };
        let classes = Classes::new(&problem).unwrap();
        assert_eq!(classes.pinned_slots, vec![2, 5]);
        assert_eq!(classes.pin_class, vec![Some(1), None, Some(0), None]);
        // Classes 0, 1 are slots 2, 5; free classes take slots 0, 1, 3 ...
        assert_eq!(classes.to_slots(&[1, 2, 0, 3], 8), vec![5, 0, 2, 1]);
        assert_eq!(classes.from_slots(&[5, 0, 2, 1]), vec![1, 2, 0, 3]);
    }

    #[test]
    fn pinned_neighbours_are_reported_with_the_edge() {
        let (g, _) = Graph::from_edges(2, &[(0, 1)]).unwrap();
        let problem = ColouringProblem {
            graph: g,
            pins: vec![Some(1), Some(1)],
            previous: None,
            max_colours: 4,
        };
        assert_eq!(
            Classes::new(&problem),
            Err(ColouringError::PinnedNeighbours {
                u: 0,
                v: 1,
                slot: 1
            })
        );
    }
}
