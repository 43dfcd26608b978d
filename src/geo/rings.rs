//! Ring cleaning: opens rings (files repeat the first position at the end; Tinct's rings do not,
//! see [`crate::geometry`]), reports rings that were not closed in the file, drops repeated
//! positions and degenerate rings.
//!
//! Runs before projection and adjacency so that later stages can rely on open rings with at
//! least three distinct positions and no zero-length edges. Everything it changes is reported.

use super::{Diagnostic, DiagnosticKind, MultiPolygon, Polygon, Ring};

/// Something the cleaner fixed or dropped in one ring.
#[derive(Clone, Debug, PartialEq)]
pub(super) enum RingProblem {
    Unclosed { part: usize, hole: Option<usize> },
    Degenerate { part: usize, hole: Option<usize> },
    NonFinite { part: usize },
}

impl RingProblem {
    pub(super) fn into_diagnostic(self, region: usize, name: &str) -> Diagnostic {
        let which = |part: usize, hole: Option<usize>| match hole {
            None => format!("exterior ring of part {}", part + 1),
            Some(h) => format!("hole {} of part {}", h + 1, part + 1),
        };
        let (kind, message) = match self {
            RingProblem::Unclosed { part, hole } => (
                DiagnosticKind::UnclosedRing,
                format!(
                    "{} of region {name:?} does not end where it starts; closed it",
                    which(part, hole)
                ),
            ),
            RingProblem::Degenerate { part, hole } => (
                DiagnosticKind::DegenerateRing,
                format!(
                    "{} of region {name:?} has fewer than three distinct positions; dropped it",
                    which(part, hole)
                ),
            ),
            RingProblem::NonFinite { part } => (
                DiagnosticKind::DegenerateRing,
                format!(
                    "part {} of region {name:?} has a coordinate that is not a finite number; dropped it",
                    part + 1
                ),
            ),
        };
        Diagnostic {
            kind,
            regions: vec![region],
            message,
        }
    }
}

/// Cleans every ring of a feature; parts whose exterior is degenerate are dropped (with their
/// arcs). Returns the kept parts, their arcs (empty when the input had none) and the problems.
pub(super) fn clean_parts(
    parts: MultiPolygon,
    arcs: Vec<Vec<usize>>,
) -> (MultiPolygon, Vec<Vec<usize>>, Vec<RingProblem>) {
    let mut kept = Vec::with_capacity(parts.len());
    let mut kept_arcs = Vec::new();
    let mut problems = Vec::new();
    let has_arcs = !arcs.is_empty();
    let mut arcs = arcs.into_iter();
    for (k, polygon) in parts.into_iter().enumerate() {
        let part_arcs = arcs.next().unwrap_or_default();
        let finite = polygon
            .exterior
            .iter()
            .chain(polygon.holes.iter().flatten())
            .all(|p| p[0].is_finite() && p[1].is_finite());
        if !finite {
            problems.push(RingProblem::NonFinite { part: k });
            continue;
        }
        let Some(exterior) = clean_ring(polygon.exterior, k, None, &mut problems) else {
            continue;
        };
        let holes = polygon
            .holes
            .into_iter()
            .enumerate()
            .filter_map(|(h, ring)| clean_ring(ring, k, Some(h), &mut problems))
            .collect();
        kept.push(Polygon { exterior, holes });
        if has_arcs {
            kept_arcs.push(part_arcs);
        }
    }
    (kept, kept_arcs, problems)
}

fn clean_ring(
    ring: Ring,
    part: usize,
    hole: Option<usize>,
    problems: &mut Vec<RingProblem>,
) -> Option<Ring> {
    // In place: a million rings must not each be copied.
    let mut out = ring;
    out.dedup();
    if out.len() >= 2 && out.first() == out.last() {
        // Closed, as the file formats write rings: open it.
        out.pop();
    } else if out.len() >= 2 {
        // The file left it open, which its format does not allow: say so (it is used as if
        // closed, which is what an open ring means here).
        problems.push(RingProblem::Unclosed { part, hole });
    }
    // A ring needs three distinct positions.
    if out.len() < 3 {
        problems.push(RingProblem::Degenerate { part, hole });
        return None;
    }
    out.shrink_to_fit();
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn opens_closed_rings_and_reports_one_the_file_left_open() {
        // A closed ring, as files write them, comes out open and without a note.
        let closed = vec![Polygon {
            exterior: vec![[0.0, 0.0], [1.0, 0.0], [1.0, 1.0], [0.0, 0.0]],
            holes: vec![],
        }];
        let (kept, _, problems) = clean_parts(closed, vec![]);
        assert_eq!(kept[0].exterior, vec![[0.0, 0.0], [1.0, 0.0], [1.0, 1.0]]);
        assert!(problems.is_empty());
        let parts = vec![Polygon {
            exterior: vec![[0.0, 0.0], [1.0, 0.0], [1.0, 1.0]],
            holes: vec![],
        }];
        let (kept, _, problems) = clean_parts(parts, vec![]);
        assert_eq!(kept[0].exterior.len(), 3);
        assert_eq!(
            problems,
            vec![RingProblem::Unclosed {
                part: 0,
                hole: None
            }]
        );
    }

    #[test]
    fn drops_degenerate_ring_and_repeated_positions() {
        let parts = vec![Polygon {
            exterior: vec![[0.0, 0.0], [0.0, 0.0], [1.0, 0.0], [0.0, 0.0]],
            holes: vec![],
        }];
        let (kept, _, problems) = clean_parts(parts, vec![]);
        assert!(kept.is_empty());
        assert_eq!(
            problems,
            vec![RingProblem::Degenerate {
                part: 0,
                hole: None
            }]
        );
    }
}
