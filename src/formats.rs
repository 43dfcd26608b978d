//! Reading and writing every kind of file Tinct understands, chosen by the file's extension.
//!
//! It sits above the document and the importers, so the command line and the editor share one way in.

use std::path::Path;

use anyhow::{Context, anyhow};

use crate::doc::{self, Document};

/// A document read from a file, with notices about problems that did not stop the load.
pub struct Loaded {
    pub doc: Document,
    pub notices: Vec<doc::graph_formats::Notice>,
}

/// The kinds of input Tinct reads, by extension.
pub const READABLE: &str = ".tinct (project), .col or .dimacs (DIMACS graph), .edges (edge list), \
                             .geojson, .json, .topojson or .shp (boundaries)";

fn title_of(path: &Path) -> String {
    path.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "Untitled".into())
}

fn extension(path: &Path) -> String {
    path.extension()
        .map(|e| e.to_string_lossy().to_ascii_lowercase())
        .unwrap_or_default()
}

fn read_text(path: &Path) -> anyhow::Result<String> {
    let bytes = std::fs::read(path).with_context(|| format!("cannot read {}", path.display()))?;
    String::from_utf8(bytes).map_err(|e| {
        let upto = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        let line = upto.iter().filter(|&&b| b == b'\n').count() + 1;
        anyhow!(
            "{}: line {line}: the text is not valid UTF-8",
            path.display()
        )
    })
}

/// Reads `path` as a project or graph file. Errors name the file and, where there is one, the line.
pub fn load(path: &Path) -> anyhow::Result<Loaded> {
    match extension(path).as_str() {
        "tinct" => {
            let doc = doc::file::load(path).map_err(|e| anyhow!("{}: {e}", path.display()))?;
            Ok(Loaded {
                doc,
                notices: Vec::new(),
            })
        }
        "col" | "dimacs" => {
            let text = read_text(path)?;
            let (doc, notices) = doc::graph_formats::read_dimacs(&text, &title_of(path))
                .map_err(|e| anyhow!("{}: {e}", path.display()))?;
            Ok(Loaded { doc, notices })
        }
        "edges" => {
            let text = read_text(path)?;
            let (doc, notices) = doc::graph_formats::read_edge_list(&text, &title_of(path))
                .map_err(|e| anyhow!("{}: {e}", path.display()))?;
            Ok(Loaded { doc, notices })
        }
        "geojson" | "json" | "topojson" | "shp" => {
            // Boundary files are imported with the default rule (rook, no tolerance).
            let map = crate::geo::import_path(path, &crate::geo::ImportOptions::default())
                .map_err(|e| anyhow!("{}: {e}", path.display()))?;
            let notices = map
                .diagnostics
                .iter()
                .map(|d| doc::graph_formats::Notice {
                    line: None,
                    message: d.message.clone(),
                })
                .collect();
            Ok(Loaded {
                doc: map.into_document(title_of(path)),
                notices,
            })
        }
        other => Err(anyhow!(
            "{}: cannot tell what kind of file this is (extension {:?}); Tinct reads {READABLE}",
            path.display(),
            other
        )),
    }
}

/// Writes `doc` to `path` in the format its extension names, atomically.
pub fn save(doc: &Document, path: &Path) -> anyhow::Result<()> {
    let text = match extension(path).as_str() {
        "tinct" => doc::file::to_string(doc),
        "col" | "dimacs" => doc::graph_formats::write_dimacs(doc),
        "edges" => doc::graph_formats::write_edge_list(doc),
        other => {
            return Err(anyhow!(
                "{}: cannot write files with extension {other:?}; Tinct writes .tinct, .col, .dimacs and .edges",
                path.display()
            ));
        }
    };
    doc::file::write_atomically(path, text.as_bytes()).map_err(|e| anyhow!("{e}"))
}
