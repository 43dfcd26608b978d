//! Whether the constraint graph can be drawn flat, with its certificate in region terms: a
//! Kuratowski subdivision named by regions (and the borders that really carry it, for drawing),
//! or the embedding's clockwise neighbours. The one place certificates are mapped back to regions.

use std::collections::{BTreeMap, BTreeSet};
use std::sync::atomic::AtomicBool;

use crate::doc::{ConstraintGraph, Document, RegionId, RegionPair};
use crate::engine::Vertex;
use crate::engine::planarity::{Embedding, Phase, Planarity, PlanarityError, planarity};

use super::{Control, bordering_pair};

/// A Kuratowski subdivision in region terms. A vertex of the constraint graph is named by its
/// smallest region (a same-colour group by its first member).
#[derive(Clone, Debug, PartialEq)]
pub struct Obstacle {
    /// `"K5"` or `"K3,3"`.
    pub kind: &'static str,
    /// The 5 or 6 branch vertices, in the certificate's order (for K3,3 the first three form one
    /// side).
    pub branch_regions: Vec<RegionId>,
    /// The 10 or 9 paths between branch vertices.
    pub paths: Vec<Vec<RegionId>>,
    /// Every edge of the subdivision between the naming regions, sorted.
    pub edges: Vec<RegionPair>,
    /// Every region the subdivision passes through, groups expanded, ascending.
    pub regions: Vec<RegionId>,
    /// The subdivision's edges as pairs of regions that really border each other (for a group,
    /// the member on that border), for drawing.
    pub links: Vec<RegionPair>,
    /// The groups on the subdivision: naming region to every member.
    pub groups: BTreeMap<RegionId, Vec<RegionId>>,
}

/// The planarity part of an analysis.
#[derive(Clone, Debug, PartialEq)]
pub enum PlanarityVerdict {
    Planar,
    NotPlanar(Obstacle),
    /// The job was cancelled before a verdict.
    Unknown,
}

/// A planar embedding in region terms: the clockwise neighbours of every vertex.
#[derive(Clone, Debug, PartialEq)]
pub struct RegionEmbedding {
    embedding: Embedding,
}

impl RegionEmbedding {
    /// The embedding of the border graph's vertices, as the engine's checker reads it.
    pub fn engine(&self) -> &Embedding {
        &self.embedding
    }

    /// `(vertex, clockwise neighbours)` for every vertex, vertices named by their first region.
    pub fn rotations<'a>(
        &'a self,
        cg: &'a ConstraintGraph,
    ) -> impl Iterator<Item = (RegionId, Vec<RegionId>)> + 'a {
        (0..self.embedding.vertex_count() as Vertex).map(move |v| {
            (
                cg.first_member(v),
                self.embedding
                    .rotation(v)
                    .iter()
                    .map(|&w| cg.first_member(w))
                    .collect(),
            )
        })
    }
}

/// Tests the constraint graph `cg` of `doc`; keeps the embedding when `with_embedding`.
pub fn planarity_of(
    doc: &Document,
    cg: &ConstraintGraph,
    with_embedding: bool,
    control: &Control,
) -> (PlanarityVerdict, Option<RegionEmbedding>) {
    let mut report = |p: crate::engine::planarity::Progress| {
        let stage = match p.phase {
            Phase::Orientation | Phase::Testing => "Testing planarity",
            Phase::Embedding => "Embedding the map",
            Phase::Kuratowski => "Finding the regions that prevent a flat drawing",
        };
        let fraction = if p.total == 0 {
            0.0
        } else {
            p.done as f64 / p.total as f64
        };
        (control.progress)(stage, fraction);
    };
    let cancel: &AtomicBool = control.cancel;
    match planarity(&cg.graph, cancel, &mut report) {
        Ok(Planarity::Planar(embedding)) => (
            PlanarityVerdict::Planar,
            with_embedding.then_some(RegionEmbedding { embedding }),
        ),
        Ok(Planarity::NonPlanar(k)) => {
            let name = |v: Vertex| cg.first_member(v);
            let mut vertices: Vec<Vertex> = k.edges.iter().flat_map(|&(a, b)| [a, b]).collect();
            vertices.sort_unstable();
            vertices.dedup();
            let mut regions = BTreeSet::new();
            let mut groups = BTreeMap::new();
            for &v in &vertices {
                let members = cg.members(v);
                regions.extend(members.iter().copied());
                if members.len() > 1 {
                    groups.insert(name(v), members.to_vec());
                }
            }
            let mut edges: Vec<RegionPair> = k
                .edges
                .iter()
                .filter_map(|&(a, b)| RegionPair::new(name(a), name(b)))
                .collect();
            edges.sort_unstable();
            let obstacle = Obstacle {
                kind: k.kind.name(),
                branch_regions: k.branch_vertices.iter().map(|&v| name(v)).collect(),
                paths: k
                    .paths
                    .iter()
                    .map(|p| p.iter().map(|&v| name(v)).collect())
                    .collect(),
                edges,
                regions: regions.into_iter().collect(),
                links: k
                    .edges
                    .iter()
                    .filter_map(|&(u, v)| bordering_pair(doc, cg, u, v))
                    .collect(),
                groups,
            };
            (PlanarityVerdict::NotPlanar(obstacle), None)
        }
        Err(PlanarityError::Cancelled) | Err(PlanarityError::Graph(_)) => {
            (PlanarityVerdict::Unknown, None)
        }
    }
}
