//! Checks a Kuratowski certificate: a subgraph of the input that is a subdivision of K5 or K3,3.

use std::collections::{BTreeMap, BTreeSet};

use crate::engine::graph::{Graph, Vertex};
use crate::engine::planarity::{Kuratowski, KuratowskiKind};

/// Why a Kuratowski certificate was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum KuratowskiRejection {
    #[error("{u}-{v} is not an edge of the input graph")]
    NotAnInputEdge { u: Vertex, v: Vertex },
    #[error("edge {u}-{v} is listed twice")]
    RepeatedEdge { u: Vertex, v: Vertex },
    #[error(
        "vertex {vertex} has degree {degree} in the subgraph (only 2 or the branch degree is allowed)"
    )]
    BadDegree { vertex: Vertex, degree: usize },
    #[error("the subgraph has {found} branch vertices, but {kind} needs {needed}")]
    BranchCount {
        kind: &'static str,
        needed: usize,
        found: usize,
    },
    #[error("the subgraph contains a cycle without branch vertices through vertex {vertex}")]
    StrayCycle { vertex: Vertex },
    #[error("after suppressing degree-2 vertices the graph is not {kind}: {why}")]
    NotKuratowski {
        kind: &'static str,
        why: &'static str,
    },
    #[error("the listed branch vertices do not match the subgraph")]
    BranchVertices,
    #[error("path {index} is not valid: {why}")]
    BadPath { index: usize, why: &'static str },
    #[error("the paths do not cover exactly the listed edges")]
    PathsDoNotCoverEdges,
}

/// Checks that `k` is a subdivision of K5 or K3,3 (as its `kind` says) inside `g`.
///
/// Every listed edge must be an input edge, listed once. In the subgraph they form, every vertex
/// must have degree 2 or the branch degree (4 for K5, 3 for K3,3); walking from each branch vertex
/// through degree-2 vertices must reach another branch vertex, which suppresses the subdivision;
/// the suppressed graph must be K5 or K3,3 exactly, with no degree-2 cycle left over. The listed
/// paths must join branch vertices, be internally vertex-disjoint, and use every edge exactly once.
///
/// # Complexity
/// O(s log s) time and O(s) space for a certificate with s edges.
pub fn check_kuratowski(g: &Graph, k: &Kuratowski) -> Result<(), KuratowskiRejection> {
    let (kind_name, branch_needed, branch_degree) = match k.kind {
        KuratowskiKind::K5 => ("K5", 5usize, 4usize),
        KuratowskiKind::K33 => ("K3,3", 6, 3),
    };
    let n = g.vertex_count();
    let mut edge_set: BTreeSet<(Vertex, Vertex)> = BTreeSet::new();
    for &(a, b) in &k.edges {
        if a as usize >= n || b as usize >= n || a == b || !g.has_edge(a, b) {
            return Err(KuratowskiRejection::NotAnInputEdge { u: a, v: b });
        }
        if !edge_set.insert((a.min(b), a.max(b))) {
            return Err(KuratowskiRejection::RepeatedEdge { u: a, v: b });
        }
    }
    let mut adjacent: BTreeMap<Vertex, Vec<Vertex>> = BTreeMap::new();
    for &(a, b) in &edge_set {
        adjacent.entry(a).or_default().push(b);
        adjacent.entry(b).or_default().push(a);
    }
    let mut branch: Vec<Vertex> = Vec::new();
    for (&v, list) in &adjacent {
        if list.len() == branch_degree {
            branch.push(v);
        } else if list.len() != 2 {
            return Err(KuratowskiRejection::BadDegree {
                vertex: v,
                degree: list.len(),
            });
        }
    }
    if branch.len() != branch_needed {
        return Err(KuratowskiRejection::BranchCount {
            kind: kind_name,
            needed: branch_needed,
            found: branch.len(),
        });
    }
    let is_branch = |v: Vertex| branch.binary_search(&v).is_ok();
    // Suppress: walk from every branch vertex along each of its edges to the next branch vertex.
    let mut reached: BTreeSet<Vertex> = BTreeSet::new();
    let mut joins: BTreeMap<(Vertex, Vertex), usize> = BTreeMap::new();
    for &b in &branch {
        for &first in &adjacent[&b] {
            let (mut previous, mut current) = (b, first);
            while !is_branch(current) {
                // A degree-2 walk that left a branch vertex can only end at a branch vertex.
                reached.insert(current);
                let list = &adjacent[&current];
                let next = if list[0] == previous {
                    list[1]
                } else {
                    list[0]
                };
                previous = current;
                current = next;
            }
            if current == b {
                return Err(KuratowskiRejection::NotKuratowski {
                    kind: kind_name,
                    why: "a path returns to where it started",
                });
            }
            *joins.entry((b.min(current), b.max(current))).or_default() += 1;
        }
    }
    for &v in adjacent.keys() {
        if !is_branch(v) && !reached.contains(&v) {
            return Err(KuratowskiRejection::StrayCycle { vertex: v });
        }
    }
    // Every join was seen from both of its ends.
    if joins.values().any(|&c| c != 2) {
        return Err(KuratowskiRejection::NotKuratowski {
            kind: kind_name,
            why: "two branch vertices are joined by more than one path",
        });
    }
    let mut sides: Option<(Vec<Vertex>, Vec<Vertex>)> = None;
    match k.kind {
        KuratowskiKind::K5 => {
            if joins.len() != 10 {
                return Err(KuratowskiRejection::NotKuratowski {
                    kind: kind_name,
                    why: "not every pair of branch vertices is joined",
                });
            }
        }
        KuratowskiKind::K33 => {
            // The side of branch[0] is the set of branch vertices not joined to it.
            let b0 = branch[0];
            let joined = |x: Vertex, y: Vertex| joins.contains_key(&(x.min(y), x.max(y)));
            let left: Vec<Vertex> = branch
                .iter()
                .copied()
                .filter(|&v| v == b0 || !joined(b0, v))
                .collect();
            let right: Vec<Vertex> = branch.iter().copied().filter(|&v| joined(b0, v)).collect();
            if left.len() != 3 || right.len() != 3 {
                return Err(KuratowskiRejection::NotKuratowski {
                    kind: kind_name,
                    why: "the branch vertices do not split into two sides of three",
                });
            }
            for &x in &left {
                for &y in &right {
                    if !joined(x, y) {
                        return Err(KuratowskiRejection::NotKuratowski {
                            kind: kind_name,
                            why: "a vertex is not joined to every vertex on the other side",
                        });
                    }
                }
            }
            if joins.len() != 9 {
                return Err(KuratowskiRejection::NotKuratowski {
                    kind: kind_name,
                    why: "two vertices on the same side are joined",
                });
            }
            sides = Some((left, right));
        }
    }
    // The listed branch vertices: same set; for K3,3 the first three are one side.
    let mut listed = k.branch_vertices.clone();
    listed.sort_unstable();
    if listed != branch {
        return Err(KuratowskiRejection::BranchVertices);
    }
    if let Some((left, right)) = sides {
        if k.branch_vertices.len() != 6 {
            return Err(KuratowskiRejection::BranchVertices);
        }
        let mut first: Vec<Vertex> = k.branch_vertices[..3].to_vec();
        first.sort_unstable();
        if first != left && first != right {
            return Err(KuratowskiRejection::BranchVertices);
        }
    }
    // The listed paths.
    if k.paths.len() != joins.len() {
        return Err(KuratowskiRejection::BadPath {
            index: k.paths.len(),
            why: "wrong number of paths",
        });
    }
    let mut inner_seen: BTreeSet<Vertex> = BTreeSet::new();
    let mut ends_seen: BTreeSet<(Vertex, Vertex)> = BTreeSet::new();
    let mut used: BTreeSet<(Vertex, Vertex)> = BTreeSet::new();
    for (index, path) in k.paths.iter().enumerate() {
        let bad = |why| KuratowskiRejection::BadPath { index, why };
        if path.len() < 2 {
            return Err(bad("fewer than two vertices"));
        }
        let (a, b) = (path[0], path[path.len() - 1]);
        if !is_branch(a) || !is_branch(b) || a == b {
            return Err(bad("does not join two different branch vertices"));
        }
        if !joins.contains_key(&(a.min(b), a.max(b))) || !ends_seen.insert((a.min(b), a.max(b))) {
            return Err(bad(
                "joins a pair that is not an edge of the Kuratowski graph, or twice",
            ));
        }
        for &v in &path[1..path.len() - 1] {
            if is_branch(v) {
                return Err(bad("passes through a branch vertex"));
            }
            if !inner_seen.insert(v) {
                return Err(bad("shares an inner vertex with another path"));
            }
        }
        for w in path.windows(2) {
            let e = (w[0].min(w[1]), w[0].max(w[1]));
            if !edge_set.contains(&e) {
                return Err(bad("uses an edge that is not listed"));
            }
            if !used.insert(e) {
                return Err(bad("uses an edge twice"));
            }
        }
    }
    if used.len() != edge_set.len() {
        return Err(KuratowskiRejection::PathsDoNotCoverEdges);
    }
    Ok(())
}
