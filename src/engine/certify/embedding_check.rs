//! Checks a rotation system: it must list each vertex's neighbours once, and its faces must
//! satisfy Euler's formula, which holds exactly when the rotation system is a plane embedding.

use crate::engine::graph::{Graph, Vertex};
use crate::engine::planarity::Embedding;

/// Why an embedding was rejected.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum EmbeddingRejection {
    #[error("the embedding has {found} vertices but the graph has {expected}")]
    VertexCount { expected: usize, found: usize },
    #[error("the rotation around vertex {vertex} is not a permutation of its neighbours")]
    Rotation { vertex: Vertex },
    #[error("edge {u}-{v} lies on {sides} face sides instead of 2")]
    EdgeSides { u: Vertex, v: Vertex, sides: u32 },
    #[error(
        "Euler's formula fails: V - E + F = {vertices} - {edges} + {faces} but 1 + C = {}",
        1 + components
    )]
    Euler {
        vertices: usize,
        edges: usize,
        faces: usize,
        components: usize,
    },
}

/// Checks that `embedding` is a plane embedding of `g`.
///
/// Walks every face (leave `v` towards `w`, then leave `w` towards the neighbour after `v` in
/// `w`'s clockwise rotation), checks that each edge is walked exactly once in each direction, and
/// checks Euler's formula V - E + F = 1 + C for a plane graph with C components (isolated vertices
/// count as components; each component's walks include its own outer face, so the outer faces of
/// all components with edges are counted once).
///
/// # Complexity
/// O((n + m) log m) time, O(n + m) space.
pub fn check_embedding(g: &Graph, embedding: &Embedding) -> Result<(), EmbeddingRejection> {
    let n = g.vertex_count();
    let (offsets, rotation) = embedding.parts();
    if offsets.len() != n + 1 {
        return Err(EmbeddingRejection::VertexCount {
            expected: n,
            found: offsets.len().saturating_sub(1),
        });
    }
    // Darts are positions in the rotation array. The rotation at v must be its neighbour set.
    let mut darts: Vec<(Vertex, Vertex, usize)> = Vec::with_capacity(rotation.len());
    for v in 0..n {
        let (lo, hi) = (offsets[v] as usize, offsets[v + 1] as usize);
        if lo > hi || hi > rotation.len() {
            return Err(EmbeddingRejection::Rotation {
                vertex: v as Vertex,
            });
        }
        let mut listed: Vec<Vertex> = rotation[lo..hi].to_vec();
        listed.sort_unstable();
        if listed.as_slice() != g.neighbours(v as Vertex) {
            return Err(EmbeddingRejection::Rotation {
                vertex: v as Vertex,
            });
        }
        for (i, &w) in rotation[lo..hi].iter().enumerate() {
            darts.push((v as Vertex, w, lo + i));
        }
    }
    if offsets[n] as usize != rotation.len() {
        return Err(EmbeddingRejection::Rotation {
            vertex: n.saturating_sub(1) as Vertex,
        });
    }
    darts.sort_unstable();
    let reverse = |from: Vertex, to: Vertex| -> usize {
        match darts.binary_search_by(|&(a, b, _)| (a, b).cmp(&(from, to))) {
            Ok(i) => darts[i].2,
            Err(_) => usize::MAX,
        }
    };
    let owner = |dart: usize| -> Vertex {
        // the vertex whose rotation slice contains `dart`
        (offsets.partition_point(|&o| o as usize <= dart) - 1) as Vertex
    };
    let mut walked = vec![0u32; rotation.len()];
    let mut faces = 0usize;
    for start in 0..rotation.len() {
        if walked[start] > 0 {
            continue;
        }
        faces += 1;
        let mut dart = start;
        loop {
            walked[dart] += 1;
            if walked[dart] > 1 {
                break;
            }
            let from = owner(dart);
            let to = rotation[dart];
            let back = reverse(to, from);
            if back == usize::MAX {
                return Err(EmbeddingRejection::EdgeSides {
                    u: from,
                    v: to,
                    sides: 1,
                });
            }
            let (lo, hi) = (
                offsets[to as usize] as usize,
                offsets[to as usize + 1] as usize,
            );
            dart = if back + 1 == hi { lo } else { back + 1 };
            if dart == start {
                break;
            }
        }
    }
    for &(u, v, d) in &darts {
        if u < v {
            let sides = walked[d] + walked[reverse(v, u)];
            if sides != 2 {
                return Err(EmbeddingRejection::EdgeSides { u, v, sides });
            }
        }
    }
    // Components by union-find, counted with and without edges.
    let mut root: Vec<usize> = (0..n).collect();
    fn find(root: &mut [usize], mut x: usize) -> usize {
        while root[x] != x {
            root[x] = root[root[x]];
            x = root[x];
        }
        x
    }
    for (u, v) in g.edges() {
        let (a, b) = (find(&mut root, u as usize), find(&mut root, v as usize));
        if a != b {
            root[a] = b;
        }
    }
    let mut components = 0usize;
    let mut with_edges = 0usize;
    for v in 0..n {
        if find(&mut root, v) == v {
            components += 1;
        }
    }
    let mut counted = vec![false; n];
    for v in 0..n {
        if g.degree(v as Vertex) > 0 {
            let r = find(&mut root, v);
            if !counted[r] {
                counted[r] = true;
                with_edges += 1;
            }
        }
    }
    let edges = g.edge_count();
    // Merge the per-component outer faces into the single outer face of the drawing.
    let plane_faces = faces as i64 + 1 - with_edges as i64;
    if n as i64 - edges as i64 + plane_faces != 1 + components as i64 {
        return Err(EmbeddingRejection::Euler {
            vertices: n,
            edges,
            faces: plane_faces.max(0) as usize,
            components,
        });
    }
    Ok(())
}
