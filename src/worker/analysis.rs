//! The analysis the editor runs in the background after every change: the constraint graph, the
//! planarity verdict with its certificate, mapped back to regions so the map can highlight them.

use std::collections::BTreeSet;
use std::sync::atomic::Ordering;

use crate::doc::{ConstraintGraph, Document, RegionId, RegionPair};
use crate::engine::planarity::{Phase, Planarity, PlanarityError, planarity};

use super::JobContext;

/// A Kuratowski subdivision in region terms.
#[derive(Clone, Debug, PartialEq)]
pub struct Obstacle {
    /// `"K5"` or `"K3,3"`.
    pub kind: &'static str,
    /// One region per branch vertex (for a group, its first member), in the certificate's order.
    pub branch_regions: Vec<RegionId>,
    /// Every region the subdivision passes through, groups expanded, ascending.
    pub regions: Vec<RegionId>,
    /// The subdivision's edges as pairs of regions (a group is represented by its first member).
    pub links: Vec<RegionPair>,
}

/// The planarity part of an analysis.
#[derive(Clone, Debug, PartialEq)]
pub enum PlanarityVerdict {
    Planar,
    NotPlanar(Obstacle),
    /// The job was cancelled before a verdict.
    Unknown,
}

/// Everything the background analysis found for one revision.
#[derive(Clone, Debug)]
pub struct Analysis {
    pub revision: u64,
    pub vertices: usize,
    pub edges: usize,
    pub planarity: PlanarityVerdict,
}

/// The two regions behind a graph edge that actually border each other. For a same-colour group
/// this is the member on that border, not just any member, so the map shows the real contact.
fn bordering_pair(doc: &Document, cg: &ConstraintGraph, u: u32, v: u32) -> Option<RegionPair> {
    let (us, vs) = (
        &cg.vertex_regions[u as usize],
        &cg.vertex_regions[v as usize],
    );
    us.iter()
        .flat_map(|a| vs.iter().map(move |b| (*a, *b)))
        .filter_map(|(a, b)| RegionPair::new(a, b))
        .find(|pair| {
            doc.borders
                .get(pair)
                .is_some_and(|border| doc.border_is_active(*pair, border))
        })
        .or_else(|| RegionPair::new(us[0], vs[0]))
}

/// Runs the analysis of `doc`. Stops early (with `Unknown` parts) when the job is cancelled.
pub fn analyse(doc: &Document, ctx: &JobContext) -> Analysis {
    ctx.progress.set("Building the border graph", 0.0);
    let cg = ConstraintGraph::build(doc);
    let mut report = |p: crate::engine::planarity::Progress| {
        let stage = match p.phase {
            Phase::Orientation | Phase::Testing => "Testing planarity",
            Phase::Embedding => "Embedding the map",
            Phase::Kuratowski => "Finding the regions that prevent a flat drawing",
        };
        ctx.progress.set(
            stage,
            if p.total == 0 {
                0.0
            } else {
                p.done as f64 / p.total as f64
            },
        );
    };
    let planarity = match planarity(&cg.graph, &ctx.cancel, &mut report) {
        Ok(Planarity::Planar(_)) => PlanarityVerdict::Planar,
        Ok(Planarity::NonPlanar(k)) => {
            let first = |v: u32| cg.vertex_regions[v as usize][0];
            let mut regions = BTreeSet::new();
            for &(u, v) in &k.edges {
                for w in [u, v] {
                    regions.extend(cg.vertex_regions[w as usize].iter().copied());
                }
            }
            PlanarityVerdict::NotPlanar(Obstacle {
                kind: k.kind.name(),
                branch_regions: k.branch_vertices.iter().map(|&v| first(v)).collect(),
                regions: regions.into_iter().collect(),
                links: k
                    .edges
                    .iter()
                    .filter_map(|&(u, v)| bordering_pair(doc, &cg, u, v))
                    .collect(),
            })
        }
        Err(PlanarityError::Cancelled) | Err(PlanarityError::Graph(_)) => PlanarityVerdict::Unknown,
    };
    debug_assert!(planarity != PlanarityVerdict::Unknown || ctx.cancel.load(Ordering::Relaxed));
    ctx.progress.set("Done", 1.0);
    Analysis {
        revision: doc.revision(),
        vertices: cg.graph.vertex_count(),
        edges: cg.graph.edge_count(),
        planarity,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::worker::Progress;
    use std::sync::Arc;
    use std::sync::atomic::AtomicBool;

    #[test]
    fn the_exclave_sample_is_not_planar_and_its_obstacle_names_both_parts_of_the_group() {
        let text = std::fs::read_to_string(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/sample-maps/exclave-coast.tinct"
        ))
        .unwrap();
        let doc = crate::doc::file::from_str(&text).unwrap();
        let ctx = JobContext {
            cancel: Arc::new(AtomicBool::new(false)),
            progress: Arc::new(Progress::default()),
        };
        let a = analyse(&doc, &ctx);
        let PlanarityVerdict::NotPlanar(o) = a.planarity else {
            panic!("expected non-planar")
        };
        assert_eq!(o.kind, "K3,3");
        let aldwyn = doc.region_by_name("Aldwyn").unwrap();
        let tessary = doc.region_by_name("Port Tessary (Aldwyn exclave)").unwrap();
        assert!(o.regions.contains(&aldwyn) && o.regions.contains(&tessary));
    }
}
