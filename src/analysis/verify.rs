//! Every certificate of an analysis, checked by the independent checkers (`engine::certify` for
//! the planarity certificates, the DRAT checker for the colouring refutations, the document's
//! own colouring check for a colouring), against the document it claims to be about.

use super::{Analysis, PlanarityVerdict};
use crate::doc::{Document, Edit};
use crate::engine::certify::{check_embedding, check_kuratowski};
use crate::engine::colouring::check_drat;
use crate::engine::planarity::{Kuratowski, KuratowskiKind};

impl Analysis {
    /// Checks every certificate this analysis carries against `doc` (the document of its
    /// revision): the colouring honours every rule, each refutation's DRAT proof checks, the
    /// embedding is planar, the Kuratowski subdivision is one. Returns how many were checked.
    pub fn verify(&self, doc: &Document) -> Result<usize, String> {
        let graph = crate::doc::ConstraintGraph::build(doc);
        if graph.graph.vertex_count() != self.graph.graph.vertex_count()
            || graph.graph.edge_count() != self.graph.graph.edge_count()
        {
            return Err(
                "the analysis is not about this document (its border graph differs)".into(),
            );
        }
        let mut checked = 0;
        match &self.planarity {
            Some(PlanarityVerdict::Planar) => {
                let Some(embedding) = &self.embedding else {
                    return Err("planar without an embedding".into());
                };
                check_embedding(&graph.graph, embedding.engine())
                    .map_err(|e| format!("the embedding is rejected: {e:?}"))?;
                checked += 1;
            }
            Some(PlanarityVerdict::NotPlanar(o)) => {
                let vertex = |r| {
                    graph
                        .vertex_of(r)
                        .ok_or_else(|| format!("region {r} of the subdivision is not in the graph"))
                };
                let mut edges = Vec::new();
                for pair in &o.edges {
                    let (a, b) = (vertex(pair.a())?, vertex(pair.b())?);
                    edges.push((a.min(b), a.max(b)));
                }
                edges.sort_unstable();
                let k = Kuratowski {
                    kind: if o.kind == "K5" {
                        KuratowskiKind::K5
                    } else {
                        KuratowskiKind::K33
                    },
                    branch_vertices: o
                        .branch_regions
                        .iter()
                        .map(|r| vertex(*r))
                        .collect::<Result<_, _>>()?,
                    paths: o
                        .paths
                        .iter()
                        .map(|p| p.iter().map(|r| vertex(*r)).collect::<Result<_, _>>())
                        .collect::<Result<_, _>>()?,
                    edges,
                };
                check_kuratowski(&graph.graph, &k)
                    .map_err(|e| format!("the Kuratowski subdivision is rejected: {e:?}"))?;
                checked += 1;
            }
            Some(PlanarityVerdict::Unknown) | None => {}
        }
        if let Some(verdict) = &self.colouring {
            if let Some(colouring) = &verdict.colouring {
                let mut coloured = doc.clone();
                if verdict.extra_slots_needed > 0 {
                    let grow =
                        crate::doc::palette_edit::grow_palette(doc, verdict.extra_slots_needed);
                    coloured.apply(grow).map_err(|e| e.to_string())?;
                }
                coloured
                    .apply(Edit::SetColouring(colouring.clone()))
                    .map_err(|e| e.to_string())?;
                let check = crate::doc::check_colouring(&coloured);
                if !check.is_clean() {
                    return Err(format!("the colouring breaks the rules: {check:?}"));
                }
                checked += 1;
            }
            for why in [&verdict.three_impossible, &verdict.minimum_impossible]
                .into_iter()
                .flatten()
            {
                if let Some((cnf, proof)) = &why.cnf_and_proof {
                    check_drat(cnf, proof).map_err(|e| {
                        format!("the proof for {} colours is rejected: {e}", why.colours)
                    })?;
                    checked += 1;
                }
            }
        }
        Ok(checked)
    }
}
