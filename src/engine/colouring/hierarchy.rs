//! Colours that follow a hierarchy: every vertex belongs to one parent unit (a county to its
//! state, a district to its province). Each parent gets a *family* so that neighbouring parents
//! (parents with neighbouring children) get different families, and each child a *tint* of its
//! parent's family so that neighbouring children of one parent get different tints. Children on
//! either side of a parent border differ because their families do.
//!
//! Both levels are ordinary colourings, solved exactly by [`solve`] with its evidence:
//! - **families**: the fewest colours of the *parent graph* (one vertex per parent, an edge where
//!   any two of their children are neighbours);
//! - **tints**: the fewest colours of each parent's children (the subgraph its children induce);
//!   the map needs the largest of these, since every parent draws its tints from the same number.
//!
//! Each is proven when the solve that set it is: the families by the parent graph's report, the
//! tints by the report of the parent that needs the most (its lower bound is a lower bound for
//! the whole map, and every other parent was coloured with no more).
//!
//! Pins are not part of this question (a pinned palette slot means nothing in a palette of
//! families); callers say so.

use std::sync::atomic::AtomicBool;

use super::problem::{ColouringError, ColouringProblem};
use super::solve::{ColouringReport, Progress, SolveOptions, solve};
use crate::engine::graph::{Graph, Vertex};

/// A hierarchical colouring and its evidence.
#[derive(Debug, Clone)]
pub struct HierarchyReport {
    /// How many families the colouring uses (the fewest, when `families_proven`).
    pub families: u32,
    pub families_proven: bool,
    /// The family of each parent, `0..families`.
    pub family_of_parent: Vec<u32>,
    /// How many tints the colouring uses per family (the fewest, when `tints_proven`).
    pub tints: u32,
    pub tints_proven: bool,
    /// The tint of each vertex, `0..tints`.
    pub tint: Vec<u32>,
    /// The parent graph's colouring report: the families' evidence.
    pub parent_report: ColouringReport,
    /// The parent that needs the most tints, and its children's colouring report: the tints'
    /// evidence. `None` when no parent has a child.
    pub hardest_parent: Option<(u32, ColouringReport)>,
    /// Some search stopped at the time limit or was cancelled: a count may not be the fewest.
    pub stopped: bool,
}

impl HierarchyReport {
    /// The combined colour of vertex `v` for `parent_of`: family-major, `family * tints + tint`.
    pub fn slot(&self, parent_of: &[u32], v: Vertex) -> u32 {
        self.family_of_parent[parent_of[v as usize] as usize] * self.tints + self.tint[v as usize]
    }
}

/// Why a hierarchical colouring cannot be made.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum HierarchyError {
    #[error("{parents} parents given for a graph of {vertices} vertices")]
    ParentCount { parents: usize, vertices: usize },
    #[error("vertex {vertex} has parent {parent}, but there are only {count} parents")]
    ParentOutOfRange {
        vertex: Vertex,
        parent: u32,
        count: usize,
    },
    #[error(transparent)]
    Colouring(#[from] ColouringError),
    #[error("the search was stopped before any colouring was found")]
    NoColouring,
}

/// The parent graph: one vertex per parent, an edge where two parents' children are neighbours.
pub fn parent_graph(graph: &Graph, parent_of: &[u32], parents: usize) -> Graph {
    let mut edges: Vec<(Vertex, Vertex)> = graph
        .edges()
        .filter_map(|(u, v)| {
            let (p, q) = (parent_of[u as usize], parent_of[v as usize]);
            (p != q).then_some((p.min(q), p.max(q)))
        })
        .collect();
    edges.sort_unstable();
    edges.dedup();
    // Parents are in range (checked by the caller) and the edges have no loops or repeats.
    Graph::from_edges(parents, &edges)
        .map(|(g, _)| g)
        .unwrap_or_else(|_| Graph::empty(parents))
}

/// Colours `graph` so that colours follow `parent_of` (the parent of each vertex, `0..parents`).
/// `options` apply to every solve (the time limit to each, so the whole takes at most about
/// `parents + 1` times it). `progress(done, total)` is called before each of the `parents + 1`
/// colourings.
pub fn hierarchy_colouring(
    graph: &Graph,
    parent_of: &[u32],
    parents: usize,
    options: &SolveOptions,
    cancel: &AtomicBool,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<HierarchyReport, HierarchyError> {
    let n = graph.vertex_count();
    if parent_of.len() != n {
        return Err(HierarchyError::ParentCount {
            parents: parent_of.len(),
            vertices: n,
        });
    }
    if let Some((v, &p)) = parent_of
        .iter()
        .enumerate()
        .find(|(_, p)| **p as usize >= parents)
    {
        return Err(HierarchyError::ParentOutOfRange {
            vertex: v as Vertex,
            parent: p,
            count: parents,
        });
    }
    let options = SolveOptions {
        keep_previous: false,
        balance: None,
        ..options.clone()
    };
    let total = parents + 1;
    // Families.
    progress(0, total);
    let pg = parent_graph(graph, parent_of, parents);
    let slots = (parents as u32).max(1);
    // Families evened out by parent count, so that no family stands for most of the map.
    let family_options = SolveOptions {
        balance: Some(super::solve::Balance::Count),
        ..options.clone()
    };
    let parent_report = solve(
        &ColouringProblem::new(pg, slots),
        &family_options,
        cancel,
        &mut |_: Progress| {},
    )?;
    let family_of_parent = parent_report
        .colouring
        .clone()
        .ok_or(HierarchyError::NoColouring)?;
    let families = family_of_parent.iter().max().map_or(0, |m| m + 1);
    let mut stopped = parent_report.stopped;

    // Tints, parent by parent.
    let mut children: Vec<Vec<Vertex>> = vec![Vec::new(); parents];
    for (v, &p) in parent_of.iter().enumerate() {
        children[p as usize].push(v as Vertex);
    }
    let mut tint = vec![0u32; n];
    let mut tints = 0u32;
    let mut lower = 0u32;
    let mut hardest: Option<(u32, ColouringReport)> = None;
    for (p, kids) in children.iter().enumerate() {
        progress(p + 1, total);
        if kids.is_empty() {
            continue;
        }
        let sub = graph.induced(kids);
        let report = solve(
            &ColouringProblem::new(sub, kids.len() as u32),
            &options,
            cancel,
            &mut |_: Progress| {},
        )?;
        let colouring = report
            .colouring
            .clone()
            .ok_or(HierarchyError::NoColouring)?;
        for (i, &v) in kids.iter().enumerate() {
            tint[v as usize] = colouring[i];
        }
        let used = colouring.iter().max().map_or(0, |m| m + 1);
        stopped |= report.stopped;
        tints = tints.max(used);
        let bound = if report.proven {
            used
        } else {
            report.lower_bound.value
        };
        // The evidence comes from the parent with the highest proven bound (ties: the first).
        if bound > lower || hardest.is_none() {
            lower = lower.max(bound);
            hardest = Some((p as u32, report));
        }
    }
    Ok(HierarchyReport {
        families,
        families_proven: parent_report.proven,
        family_of_parent,
        tints,
        tints_proven: lower == tints,
        tint,
        parent_report,
        hardest_parent: hardest,
        stopped,
    })
}

/// Rearranges the tints inside each parent (a permutation of its tint classes, so its children
/// still differ from each other) to make fewer *clashing* pairs across parent borders: pairs of
/// neighbours in different parents whose combined colours `clash(a, b)` says a reader may
/// confuse. The last (darkest) tint always goes to the parent's smallest tint class. Local
/// search, parent by parent in order, until a pass changes nothing (at most 20
/// passes); deterministic. Returns the clashing pairs before and after.
pub fn arrange_tints(
    graph: &Graph,
    parent_of: &[u32],
    report: &mut HierarchyReport,
    clash: &dyn Fn(u32, u32) -> bool,
) -> (usize, usize) {
    let t = report.tints as usize;
    let parents = report.family_of_parent.len();
    let mut children: Vec<Vec<Vertex>> = vec![Vec::new(); parents];
    for (v, &p) in parent_of.iter().enumerate() {
        children[p as usize].push(v as Vertex);
    }
    let slot = |tint: &[u32], v: Vertex| {
        report.family_of_parent[parent_of[v as usize] as usize] * report.tints + tint[v as usize]
    };
    let count = |tint: &[u32]| {
        graph
            .edges()
            .filter(|&(u, v)| {
                parent_of[u as usize] != parent_of[v as usize]
                    && clash(slot(tint, u), slot(tint, v))
            })
            .count()
    };
    let before = count(&report.tint);
    if t < 2 {
        return (before, before);
    }
    let perms = permutations(t);
    let mut tint = report.tint.clone();
    for _pass in 0..20 {
        let mut changed = false;
        for (p, kids) in children.iter().enumerate() {
            if kids.is_empty() {
                continue;
            }
            let family = report.family_of_parent[p] * report.tints;
            // (clashes, children on the darkest tint) for a permutation of this parent's tints.
            let score = |perm: &[u32]| {
                let mut clashes = 0usize;
                let mut darkest = 0usize;
                for &v in kids {
                    let mine = family + perm[tint[v as usize] as usize];
                    if perm[tint[v as usize] as usize] as usize == t - 1 {
                        darkest += 1;
                    }
                    for &w in graph.neighbours(v) {
                        if parent_of[w as usize] as usize != p && clash(mine, slot(&tint, w)) {
                            clashes += 1;
                        }
                    }
                }
                (clashes, darkest)
            };
            // The darkest tint stays on the parent's smallest tint class (the heaviest fill never
            // goes to the most regions), and the other tints are arranged against clashes.
            let mut sizes = vec![0usize; t];
            for &v in kids {
                sizes[tint[v as usize] as usize] += 1;
            }
            let smallest = (0..t).min_by_key(|&c| (sizes[c], c)).unwrap_or(0);
            let mut best: Option<((usize, usize), Vec<u32>)> = None;
            for perm in perms.iter().filter(|p| p[smallest] as usize == t - 1) {
                let s = score(perm);
                if best.as_ref().is_none_or(|(b, _)| s < *b) {
                    best = Some((s, perm.clone()));
                }
            }
            let Some(best) = best else { continue };
            if best.1.iter().enumerate().any(|(i, &x)| i as u32 != x) {
                for &v in kids {
                    tint[v as usize] = best.1[tint[v as usize] as usize];
                }
                changed = true;
            }
        }
        if !changed {
            break;
        }
    }
    report.tint = tint;
    (before, count(&report.tint))
}

/// Every permutation of `0..n`, in lexicographic order.
fn permutations(n: usize) -> Vec<Vec<u32>> {
    let mut out = Vec::new();
    let mut current: Vec<u32> = (0..n as u32).collect();
    loop {
        out.push(current.clone());
        // The next permutation in lexicographic order.
        let Some(i) = (0..n.saturating_sub(1))
            .rev()
            .find(|&i| current[i] < current[i + 1])
        else {
            return out;
        };
        let j = (i + 1..n)
            .rev()
            .find(|&j| current[j] > current[i])
            .unwrap_or(i);
        current.swap(i, j);
        current[i + 1..].reverse();
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::colouring::check_colouring;

    fn graph(n: usize, edges: &[(u32, u32)]) -> Graph {
        Graph::from_edges(n, edges).unwrap().0
    }

    fn run(g: &Graph, parent_of: &[u32], parents: usize) -> HierarchyReport {
        hierarchy_colouring(
            g,
            parent_of,
            parents,
            &SolveOptions::default(),
            &AtomicBool::new(false),
            &mut |_, _| {},
        )
        .unwrap()
    }

    #[test]
    fn two_triangles_joined_by_one_edge_take_two_families_of_three_tints() {
        // By construction: each parent's children form a triangle (3 tints needed), and the
        // parents touch (2 families).
        let g = graph(6, &[(0, 1), (1, 2), (0, 2), (3, 4), (4, 5), (3, 5), (2, 3)]);
        let parent_of = [0, 0, 0, 1, 1, 1];
        let r = run(&g, &parent_of, 2);
        assert_eq!((r.families, r.tints), (2, 3));
        assert!(r.families_proven && r.tints_proven && !r.stopped);
        assert_ne!(r.family_of_parent[0], r.family_of_parent[1]);
        // The combined colouring is proper on the whole graph.
        let slots: Vec<u32> = (0..6).map(|v| r.slot(&parent_of, v)).collect();
        assert!(check_colouring(&ColouringProblem::new(g.clone(), 6), &slots).is_ok());
    }

    #[test]
    fn parents_that_do_not_touch_share_a_family() {
        // Three parents in a row, A - B - C: A and C share a family.
        let g = graph(6, &[(0, 1), (1, 2), (2, 3), (3, 4), (4, 5)]);
        let parent_of = [0, 0, 1, 1, 2, 2];
        let r = run(&g, &parent_of, 3);
        assert_eq!((r.families, r.tints), (2, 2));
        assert_eq!(r.family_of_parent[0], r.family_of_parent[2]);
    }

    #[test]
    fn an_odd_wheel_inside_one_parent_proves_four_tints() {
        // A wheel with a 5-cycle rim needs 4 colours (common practice: an odd wheel).
        let mut edges = vec![(0, 1), (1, 2), (2, 3), (3, 4), (4, 0)];
        edges.extend((0..5).map(|k| (5, k)));
        edges.push((6, 0));
        let g = graph(7, &edges);
        let parent_of = [0, 0, 0, 0, 0, 0, 1];
        let r = run(&g, &parent_of, 2);
        assert_eq!(r.tints, 4);
        assert!(r.tints_proven);
        assert_eq!(r.hardest_parent.as_ref().unwrap().0, 0);
    }

    #[test]
    fn bad_parent_lists_are_refused() {
        let g = graph(2, &[(0, 1)]);
        let cancel = AtomicBool::new(false);
        let opts = SolveOptions::default();
        assert!(matches!(
            hierarchy_colouring(&g, &[0], 1, &opts, &cancel, &mut |_, _| {}),
            Err(HierarchyError::ParentCount { .. })
        ));
        assert!(matches!(
            hierarchy_colouring(&g, &[0, 3], 2, &opts, &cancel, &mut |_, _| {}),
            Err(HierarchyError::ParentOutOfRange { .. })
        ));
    }

    #[test]
    fn arranging_tints_removes_clashes_across_a_parent_border_and_keeps_the_colouring_proper() {
        // Two parents, each a path of two; the clash rule: equal tints across parents clash.
        // Edges across: 1-2 and 0-3.
        let g = graph(4, &[(0, 1), (2, 3), (1, 2), (0, 3)]);
        let parent_of = [0, 0, 1, 1];
        let mut r = run(&g, &parent_of, 2);
        let tints = r.tints;
        let clash = move |a: u32, b: u32| a % tints == b % tints;
        let (before, after) = arrange_tints(&g, &parent_of, &mut r, &clash);
        assert!(after <= before);
        assert_eq!(after, 0, "a swap inside one parent clears both");
        let slots: Vec<u32> = (0..4).map(|v| r.slot(&parent_of, v)).collect();
        let problem = ColouringProblem::new(g.clone(), 4);
        assert!(check_colouring(&problem, &slots).is_ok());
        assert_eq!(permutations(3).len(), 6);
        assert_eq!(permutations(1), vec![vec![0]]);
    }
}
