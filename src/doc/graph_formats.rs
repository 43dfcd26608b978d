//! Plain graph files for people who already have an adjacency list: the DIMACS graph format (`.col`)
//! and a simple edge list (`.edges`). Both load as a schematic project whose regions are the vertices.
//!
//! DIMACS format as published with the DIMACS Challenge on cliques and colouring ("Clique and
//! Coloring Problems Graph Format", 1993): `c` comment lines, one problem line `p edge NODES EDGES`
//! (some files write `col` for `edge`), edge lines `e W V` with vertices numbered from 1, and
//! optional node lines `n ID VALUE`. Edge list: a first line `N M`, then one `U V` line per edge,
//! vertices numbered from 0; blank lines and lines starting with `#` are skipped.

use std::collections::BTreeMap;
use std::fmt::Write as _;

use super::builder::DocumentBuilder;
use super::constraint::ConstraintGraph;
use super::model::{Border, Document, Region, RegionId, RegionPair};

/// Graphs with more vertices than this are refused before anything is allocated for them. The
/// vertex count comes from the first line, and every vertex becomes a region (about 200 bytes),
/// so a file of twenty bytes could otherwise ask for gigabytes; two million is twice the largest
/// map Tinct is measured on (`benches/scale.rs`, a million regions).
pub const MAX_VERTICES: u64 = 2_000_000;
/// Graph files with more edge lines than this are refused.
pub const MAX_EDGES: u64 = 50_000_000;

/// A problem that did not stop the load but that the user should know about.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Notice {
    /// 1-based line number in the input, when the notice is about one line.
    pub line: Option<usize>,
    pub message: String,
}

/// Why a graph file could not be read.
#[derive(Clone, Debug, PartialEq, Eq, thiserror::Error)]
#[error("line {line}: {message}")]
pub struct GraphFileError {
    pub line: usize,
    pub message: String,
}

fn fail<T>(line: usize, message: impl Into<String>) -> Result<T, GraphFileError> {
    Err(GraphFileError {
        line,
        message: message.into(),
    })
}

fn number(token: Option<&str>, line: usize, what: &str) -> Result<u64, GraphFileError> {
    match token {
        None => fail(line, format!("expected {what}, but the line ends")),
        Some(t) => t.parse::<u64>().or_else(|_| {
            fail(
                line,
                format!("expected {what} (a whole number), found {t:?}"),
            )
        }),
    }
}

/// Places `n` markers on a sunflower spiral (Vogel 1979), which spreads any number of points evenly
/// over a disc, so a graph without geometry is readable before the user arranges it.
pub fn spiral_anchor(i: usize) -> [f64; 2] {
    const GOLDEN_ANGLE: f64 = 2.399_963_229_728_653;
    const SPACING: f64 = 10.0;
    let r = SPACING * (i as f64 + 0.5).sqrt();
    let theta = i as f64 * GOLDEN_ANGLE;
    // Rounded so that files stay tidy; a hundredth of the spacing is far below anything visible.
    [
        (r * theta.cos() * 100.0).round() / 100.0,
        (r * theta.sin() * 100.0).round() / 100.0,
    ]
}

/// Builds a schematic document from vertices labelled `first..first + n` and 0-based edges.
fn schematic(
    title: &str,
    n: u64,
    first: u64,
    edges: &[(u64, u64)],
    notices: &mut Vec<Notice>,
) -> Document {
    let mut doc = DocumentBuilder::new(title);
    doc.reserve(n as usize, edges.len());
    for i in 0..n {
        let label = first + i;
        doc.region(
            RegionId(label),
            Region::new(label.to_string(), spiral_anchor(i as usize)),
        );
    }
    let mut self_loops = 0usize;
    let mut pairs: Vec<RegionPair> = Vec::with_capacity(edges.len());
    for &(u, v) in edges {
        match RegionPair::new(RegionId(first + u), RegionId(first + v)) {
            Some(pair) => pairs.push(pair),
            None => self_loops += 1,
        }
    }
    pairs.sort_unstable();
    let before = pairs.len();
    pairs.dedup();
    let repeats = before - pairs.len();
    for pair in pairs {
        doc.border(pair, Border::manual());
    }
    if self_loops > 0 {
        notices.push(Notice {
            line: None,
            message: format!("{self_loops} self-loop(s) ignored: a region cannot border itself"),
        });
    }
    if repeats > 0 {
        notices.push(Notice {
            line: None,
            message: format!("{repeats} repeated edge(s) merged"),
        });
    }
    doc.next_ids(first + n, 1);
    // Vertices are numbered from `first` and every edge is checked against `n` by the readers, so
    // the parts are consistent by construction.
    match doc.build() {
        Ok(doc) => doc,
        Err(e) => {
            debug_assert!(false, "a schematic document is consistent: {e}");
            Document::new(title)
        }
    }
}

/// Reads a DIMACS graph (`.col`).
pub fn read_dimacs(text: &str, title: &str) -> Result<(Document, Vec<Notice>), GraphFileError> {
    let mut notices = Vec::new();
    let mut declared: Option<(u64, u64, usize)> = None;
    let mut edges = Vec::new();
    for (index, raw) in text.lines().enumerate() {
        let line = index + 1;
        let mut tokens = raw.split_whitespace();
        let Some(kind) = tokens.next() else { continue };
        match kind {
            "c" => continue,
            "p" => {
                if declared.is_some() {
                    return fail(
                        line,
                        "a second problem line (p ...); a file describes one graph",
                    );
                }
                match tokens.next() {
                    Some("edge") | Some("col") | Some("edges") => {}
                    Some(other) => {
                        return fail(
                            line,
                            format!("expected problem format \"edge\", found {other:?}"),
                        );
                    }
                    None => return fail(line, "expected \"p edge NODES EDGES\""),
                }
                let n = number(tokens.next(), line, "the number of vertices")?;
                let m = number(tokens.next(), line, "the number of edges")?;
                if n > MAX_VERTICES {
                    return fail(
                        line,
                        format!(
                            "{n} vertices is more than Tinct handles (the limit is {MAX_VERTICES} vertices)"
                        ),
                    );
                }
                declared = Some((n, m, line));
            }
            "e" => {
                let Some((n, _, _)) = declared else {
                    return fail(
                        line,
                        "an edge line comes before the problem line (p edge NODES EDGES)",
                    );
                };
                let u = number(tokens.next(), line, "the first vertex of the edge")?;
                let v = number(tokens.next(), line, "the second vertex of the edge")?;
                for w in [u, v] {
                    if w == 0 || w > n {
                        return fail(
                            line,
                            format!("vertex {w} is out of range: vertices are numbered 1 to {n}"),
                        );
                    }
                }
                if edges.len() as u64 >= MAX_EDGES {
                    return fail(
                        line,
                        format!("more than {MAX_EDGES} edges is more than Tinct handles"),
                    );
                }
                edges.push((u - 1, v - 1));
            }
            "n" => {
                // Node descriptors carry weights for other problems; colouring has no use for them.
                if notices
                    .iter()
                    .all(|n: &Notice| !n.message.starts_with("node lines"))
                {
                    notices.push(Notice {
                        line: Some(line),
                        message: "node lines (n ...) are ignored".into(),
                    });
                }
            }
            other => {
                return fail(
                    line,
                    format!(
                        "unknown line type {other:?}: expected c (comment), p (problem) or e (edge)"
                    ),
                );
            }
        }
        if let Some(extra) = tokens.next()
            && kind != "c"
            && kind != "n"
        {
            return fail(line, format!("unexpected {extra:?} at the end of the line"));
        }
    }
    let Some((n, m, p_line)) = declared else {
        return fail(
            text.lines().count().max(1),
            "no problem line (p edge NODES EDGES) found: is this a DIMACS graph?",
        );
    };
    let doc = schematic(title, n, 1, &edges, &mut notices);
    let distinct = doc.borders.len() as u64;
    if m != edges.len() as u64 && m != distinct {
        notices.push(Notice {
            line: Some(p_line),
            message: format!(
                "the problem line declares {m} edges but the file lists {} ({distinct} distinct)",
                edges.len()
            ),
        });
    }
    Ok((doc, notices))
}

/// Reads a plain edge list (`.edges`).
pub fn read_edge_list(text: &str, title: &str) -> Result<(Document, Vec<Notice>), GraphFileError> {
    let mut notices = Vec::new();
    let mut declared: Option<(u64, u64)> = None;
    let mut edges = Vec::new();
    for (index, raw) in text.lines().enumerate() {
        let line = index + 1;
        let trimmed = raw.trim();
        if trimmed.is_empty() || trimmed.starts_with('#') {
            continue;
        }
        let mut tokens = trimmed.split_whitespace();
        let a = number(tokens.next(), line, "a whole number")?;
        let b = number(tokens.next(), line, "a second whole number")?;
        if let Some(extra) = tokens.next() {
            return fail(
                line,
                format!("unexpected {extra:?}: each line holds two numbers"),
            );
        }
        match declared {
            None => {
                if a > MAX_VERTICES {
                    return fail(
                        line,
                        format!(
                            "{a} vertices is more than Tinct handles (the limit is {MAX_VERTICES} vertices)"
                        ),
                    );
                }
                declared = Some((a, b));
            }
            Some((n, _)) => {
                for w in [a, b] {
                    if w >= n {
                        return fail(
                            line,
                            format!(
                                "vertex {w} is out of range: vertices are numbered 0 to {}",
                                n.saturating_sub(1)
                            ),
                        );
                    }
                }
                if edges.len() as u64 >= MAX_EDGES {
                    return fail(
                        line,
                        format!("more than {MAX_EDGES} edges is more than Tinct handles"),
                    );
                }
                edges.push((a, b));
            }
        }
    }
    let Some((n, m)) = declared else {
        return fail(
            1,
            "the file is empty: expected a first line \"N M\" (vertices and edges)",
        );
    };
    let doc = schematic(title, n, 0, &edges, &mut notices);
    if m != edges.len() as u64 {
        notices.push(Notice {
            line: Some(1),
            message: format!(
                "the first line declares {m} edges but the file lists {}",
                edges.len()
            ),
        });
    }
    Ok((doc, notices))
}

/// Writes the document's constraint graph (land regions, groups merged, active borders) in DIMACS
/// format, with comment lines naming the region behind each vertex.
pub fn write_dimacs(doc: &Document) -> String {
    let cg = ConstraintGraph::build(doc);
    let mut out = String::new();
    let _ = writeln!(out, "c {}", doc.title.replace('\n', " "));
    let _ = writeln!(
        out,
        "c written by Tinct: one vertex per land region or same-colour group"
    );
    for v in 0..cg.vertex_count() {
        let members = cg.members(v as u32);
        let ids: Vec<String> = members.iter().map(|id| id.to_string()).collect();
        let _ = writeln!(
            out,
            "c vertex {} = region {} {}",
            v + 1,
            ids.join(","),
            cg.vertex_label(doc, v as u32)
        );
    }
    let _ = writeln!(
        out,
        "p edge {} {}",
        cg.graph.vertex_count(),
        cg.graph.edge_count()
    );
    for (u, v) in cg.graph.edges() {
        let _ = writeln!(out, "e {} {}", u + 1, v + 1);
    }
    out
}

/// Writes the document's constraint graph as an edge list (0-based), with `#` comments naming regions.
pub fn write_edge_list(doc: &Document) -> String {
    let cg = ConstraintGraph::build(doc);
    let mut out = String::new();
    let _ = writeln!(out, "# {}", doc.title.replace('\n', " "));
    for v in 0..cg.vertex_count() {
        let members = cg.members(v as u32);
        let ids: Vec<String> = members.iter().map(|id| id.to_string()).collect();
        let _ = writeln!(
            out,
            "# vertex {v} = region {} {}",
            ids.join(","),
            cg.vertex_label(doc, v as u32)
        );
    }
    let _ = writeln!(out, "{} {}", cg.graph.vertex_count(), cg.graph.edge_count());
    for (u, v) in cg.graph.edges() {
        let _ = writeln!(out, "{u} {v}");
    }
    out
}

/// Vertex numbers used by [`write_dimacs`] (1-based) for each land region.
pub fn dimacs_numbering(doc: &Document) -> BTreeMap<RegionId, u32> {
    ConstraintGraph::build(doc)
        .region_vertices()
        .map(|(r, v)| (r, v + 1))
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_edge_list_and_reports_mismatch() {
        let (doc, notices) = read_edge_list("# a path\n3 5\n0 1\n1 2\n", "p").unwrap();
        assert_eq!(doc.regions.len(), 3);
        assert_eq!(doc.borders.len(), 2);
        assert_eq!(notices.len(), 1);
        assert!(notices[0].message.contains("declares 5 edges"));
    }

    #[test]
    fn edge_list_out_of_range_names_line() {
        let err = read_edge_list("2 1\n0 2\n", "p").unwrap_err();
        assert_eq!(err.line, 2);
        assert!(err.message.contains("out of range"));
    }

    #[test]
    fn huge_declared_size_is_refused_before_allocation() {
        let err = read_dimacs("p edge 99999999999 1\n", "p").unwrap_err();
        assert!(err.message.contains("more than Tinct handles"));
    }
}
