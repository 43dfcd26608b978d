//! The `planarity` section of `tinct analyse`: the verdict on the constraint graph and its certificate,
//! in region ids (which are the input's own vertex labels for `.edges` and `.col` files).
//!
//! JSON shape (`--json`, key `planarity`; the same object is what `--certificate-out FILE` writes):
//! - `planar`: bool.
//! - `kind`: `"K5"` or `"K3,3"`, only when not planar.
//! - `branch_vertices`: the 5 or 6 vertices of the Kuratowski subdivision (for K3,3 the first
//!   three form one side); `paths`: the 10 or 9 paths between them; `edges`: every edge of the
//!   subdivision as `[a, b]` with `a < b`. Empty when planar.
//! - `regions`: every region on the certificate, group members included, ascending: what to
//!   highlight on the map.
//! - `groups`: for certificate vertices that stand for a same-colour group, the group's regions
//!   (`{"<vertex>": [ids]}`); a vertex is named by its smallest region id.
//! - `embedding`: with `--embedding` (or in a certificate file) and when planar, the clockwise
//!   neighbours of every vertex: `[{"vertex": id, "neighbours": [ids]}]`.

use std::collections::BTreeMap;
use std::path::Path;

use anyhow::Context as _;
use serde::Serialize;

use super::Section;
use super::analyse::Report;
use crate::analysis::{Analysis, PlanarityVerdict};
use crate::doc::Document;

/// One vertex's clockwise neighbours.
#[derive(Serialize, Clone, Debug, PartialEq, Eq)]
pub struct RotationOut {
    pub vertex: u64,
    pub neighbours: Vec<u64>,
}

/// The `planarity` object of `tinct analyse --json`.
#[derive(Serialize, Clone, Debug, PartialEq, Eq)]
pub struct PlanarityOut {
    pub planar: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub kind: Option<&'static str>,
    pub branch_vertices: Vec<u64>,
    pub paths: Vec<Vec<u64>>,
    pub edges: Vec<[u64; 2]>,
    pub regions: Vec<u64>,
    #[serde(skip_serializing_if = "BTreeMap::is_empty")]
    pub groups: BTreeMap<String, Vec<u64>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub embedding: Option<Vec<RotationOut>>,
}

/// The planarity section from an analysis that ran the test; `with_embedding` adds the rotation
/// system when the graph is planar (and the analysis kept it).
pub fn section(analysis: &Analysis, with_embedding: bool) -> anyhow::Result<PlanarityOut> {
    let verdict = analysis
        .planarity
        .as_ref()
        .context("the planarity test did not run")?;
    let mut out = PlanarityOut {
        planar: false,
        kind: None,
        branch_vertices: Vec::new(),
        paths: Vec::new(),
        edges: Vec::new(),
        regions: Vec::new(),
        groups: BTreeMap::new(),
        embedding: None,
    };
    match verdict {
        PlanarityVerdict::Planar => {
            out.planar = true;
            if with_embedding && let Some(e) = &analysis.embedding {
                out.embedding = Some(
                    e.rotations(&analysis.graph)
                        .map(|(vertex, neighbours)| RotationOut {
                            vertex: vertex.0,
                            neighbours: neighbours.iter().map(|id| id.0).collect(),
                        })
                        .collect(),
                );
            }
        }
        PlanarityVerdict::NotPlanar(o) => {
            out.kind = Some(o.kind);
            out.branch_vertices = o.branch_regions.iter().map(|id| id.0).collect();
            out.paths = o
                .paths
                .iter()
                .map(|p| p.iter().map(|id| id.0).collect())
                .collect();
            out.edges = o.edges.iter().map(|p| [p.a().0, p.b().0]).collect();
            out.regions = o.regions.iter().map(|id| id.0).collect();
            out.groups = o
                .groups
                .iter()
                .map(|(name, members)| {
                    (name.0.to_string(), members.iter().map(|id| id.0).collect())
                })
                .collect();
        }
        PlanarityVerdict::Unknown => anyhow::bail!("the planarity test was stopped"),
    }
    Ok(out)
}

/// Writes the certificate (with the embedding when planar) as pretty JSON to `path`.
pub fn write_certificate(certificate: &PlanarityOut, path: &Path) -> anyhow::Result<()> {
    let text = serde_json::to_string_pretty(certificate)? + "\n";
    crate::atomic::write_atomically(path, text.as_bytes()).map_err(|e| anyhow::anyhow!("{e}"))
}

/// The text `tinct analyse` prints: the report with the planarity section added (JSON key
/// `planarity`, or a line in the text report), or only the planarity section with
/// `--only planarity`. Writes the certificate file when asked.
pub fn attach(
    report: &Report,
    doc: &Document,
    analysis: &Analysis,
    json: bool,
    only: Option<Section>,
    with_embedding: bool,
    certificate_out: Option<&Path>,
) -> anyhow::Result<String> {
    let wanted = matches!(only, None | Some(Section::Planarity)) || certificate_out.is_some();
    let section = if wanted {
        let mut full = section(analysis, with_embedding || certificate_out.is_some())?;
        if let Some(path) = certificate_out {
            write_certificate(&full, path)?;
        }
        if !with_embedding {
            full.embedding = None;
        }
        Some(full).filter(|_| only != Some(Section::Rules))
    } else {
        None
    };
    if json {
        let value = match (&section, only) {
            (Some(p), Some(Section::Planarity)) => serde_json::json!({
                "schema": report.schema,
                "file": report.file,
                "planarity": p,
            }),
            _ => {
                let mut value = serde_json::to_value(report)?;
                if let (Some(p), Some(map)) = (&section, value.as_object_mut()) {
                    map.insert("planarity".to_string(), serde_json::to_value(p)?);
                }
                value
            }
        };
        Ok(serde_json::to_string_pretty(&value)? + "\n")
    } else {
        let mut text = match only {
            Some(Section::Planarity) => format!("{} ({})\n", report.title, report.file),
            _ => analyse_text(report, doc),
        };
        if let Some(p) = &section {
            text.push_str(&render_text(p, doc));
        }
        Ok(text)
    }
}

fn analyse_text(report: &Report, doc: &Document) -> String {
    super::analyse::render_text(report, doc)
}

/// The planarity lines of the text report, naming regions by name.
pub fn render_text(p: &PlanarityOut, doc: &Document) -> String {
    let name = |id: u64| {
        doc.regions()
            .get(&crate::doc::RegionId(id))
            .map_or_else(|| format!("#{id}"), |r| r.name.clone())
    };
    match p.kind {
        None => "  planarity: planar (four colours always suffice)\n".to_string(),
        Some(kind) => {
            let branch: Vec<String> = p.branch_vertices.iter().map(|&v| name(v)).collect();
            format!(
                "  planarity: NOT planar: a {kind} subdivision through {} ({} regions, {} borders)\n",
                branch.join(", "),
                p.regions.len(),
                p.edges.len()
            )
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::analysis::Request;
    use crate::doc::graph_formats::read_edge_list;

    fn analyse(doc: &Document, embedding: bool) -> PlanarityOut {
        let request = Request {
            planarity: true,
            embedding,
            colouring: None,
        };
        let analysis = crate::analysis::uncontrolled(|c| Analysis::run(doc, request, c));
        section(&analysis, embedding).unwrap()
    }

    #[test]
    fn edge_list_labels_come_back_unchanged() {
        // K3,3 on labels 0..6 (Kuratowski 1930: not planar).
        let text = "6 9\n0 3\n0 4\n0 5\n1 3\n1 4\n1 5\n2 3\n2 4\n2 5\n";
        let (doc, _) = read_edge_list(text, "k33").unwrap();
        let p = analyse(&doc, false);
        assert!(!p.planar);
        assert_eq!(p.kind, Some("K3,3"));
        assert_eq!(p.branch_vertices, vec![0, 1, 2, 3, 4, 5]);
        assert_eq!(p.edges.len(), 9);
        assert_eq!(p.regions, vec![0, 1, 2, 3, 4, 5]);
        // K4 is planar; its embedding lists three neighbours per vertex.
        let (doc, _) = read_edge_list("4 6\n0 1\n0 2\n0 3\n1 2\n1 3\n2 3\n", "k4").unwrap();
        let p = analyse(&doc, true);
        assert!(p.planar && p.kind.is_none());
        let embedding = p.embedding.unwrap();
        assert_eq!(embedding.len(), 4);
        assert!(embedding.iter().all(|r| r.neighbours.len() == 3));
    }
}
