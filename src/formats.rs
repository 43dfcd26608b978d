//! Reading and writing every kind of file Tinct understands, chosen by the file's extension.
//!
//! It sits above the document and the importers, so the command line and the editor share one way in.

use std::path::{Path, PathBuf};

use crate::doc::file::FileError;
use crate::doc::graph_formats::GraphFileError;
use crate::doc::{self, Document};
use crate::geo::{ImportError, ImportOptions};

/// Why a file could not be read or written. Each names the file.
#[derive(Debug, thiserror::Error)]
pub enum FormatError {
    #[error("cannot read {}: {source}", path.display())]
    Read {
        path: PathBuf,
        source: std::io::Error,
    },
    #[error("{}: line {line}: the text is not valid UTF-8", path.display())]
    NotUtf8 { path: PathBuf, line: usize },
    #[error("{}: {source}", path.display())]
    Project { path: PathBuf, source: FileError },
    #[error("{}: {source}", path.display())]
    Graph {
        path: PathBuf,
        source: GraphFileError,
    },
    #[error("{}: {source}", path.display())]
    Import { path: PathBuf, source: ImportError },
    #[error("{}: cannot tell what kind of file this is (extension {extension:?}); Tinct reads {READABLE}", path.display())]
    UnknownKind { path: PathBuf, extension: String },
    #[error("{}: cannot write files with extension {extension:?}; Tinct writes .tinct, .col, .dimacs and .edges", path.display())]
    NotWritable { path: PathBuf, extension: String },
    #[error("{0}")]
    Write(#[from] crate::atomic::WriteError),
}

impl FormatError {
    /// True when the problem is in writing, not in what was read.
    pub fn is_write(&self) -> bool {
        matches!(self, FormatError::Write(_))
            || matches!(
                self,
                FormatError::Project {
                    source: FileError::Write { .. },
                    ..
                }
            )
    }
}

/// A document read from a file, with notices about problems that did not stop the load.
pub struct Loaded {
    pub doc: Document,
    pub notices: Vec<doc::graph_formats::Notice>,
}

/// The kinds of input Tinct reads, by extension.
pub const READABLE: &str = ".tinct (project), .col or .dimacs (DIMACS graph), .edges (edge list), \
                             .geojson, .json, .topojson, .shp, .gpkg or .fgb (boundaries)";

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

fn read_text(path: &Path) -> Result<String, FormatError> {
    let bytes = std::fs::read(path).map_err(|source| FormatError::Read {
        path: path.to_path_buf(),
        source,
    })?;
    String::from_utf8(bytes).map_err(|e| {
        let upto = &e.as_bytes()[..e.utf8_error().valid_up_to()];
        FormatError::NotUtf8 {
            path: path.to_path_buf(),
            line: upto.iter().filter(|&&b| b == b'\n').count() + 1,
        }
    })
}

/// True for the extensions of boundary files (imported with [`ImportOptions`]).
pub use crate::geo::is_boundary_file;

/// Reads `path` as a project, graph or boundary file; boundary files are imported with
/// `import` (rule, tolerance, name field, ...). Errors name the file and, where there is one,
/// the line.
pub fn load(path: &Path, import: &ImportOptions) -> Result<Loaded, FormatError> {
    let graph = |e| FormatError::Graph {
        path: path.to_path_buf(),
        source: e,
    };
    match extension(path).as_str() {
        "tinct" => {
            let doc = doc::file::load(path).map_err(|source| FormatError::Project {
                path: path.to_path_buf(),
                source,
            })?;
            Ok(Loaded {
                doc,
                notices: Vec::new(),
            })
        }
        "col" | "dimacs" => {
            let text = read_text(path)?;
            let (doc, notices) =
                doc::graph_formats::read_dimacs(&text, &title_of(path)).map_err(graph)?;
            Ok(Loaded { doc, notices })
        }
        "edges" => {
            let text = read_text(path)?;
            let (doc, notices) =
                doc::graph_formats::read_edge_list(&text, &title_of(path)).map_err(graph)?;
            Ok(Loaded { doc, notices })
        }
        _ if is_boundary_file(path) => {
            let map =
                crate::geo::import_path(path, import).map_err(|source| FormatError::Import {
                    path: path.to_path_buf(),
                    source,
                })?;
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
        other => Err(FormatError::UnknownKind {
            path: path.to_path_buf(),
            extension: other.to_string(),
        }),
    }
}

/// Writes `doc` to `path` in the format its extension names, atomically. A project is written
/// straight from the document to the file.
pub fn save(doc: &Document, path: &Path) -> Result<(), FormatError> {
    let text = match extension(path).as_str() {
        "tinct" => {
            return doc::file::save(doc, path).map_err(|source| FormatError::Project {
                path: path.to_path_buf(),
                source,
            });
        }
        "col" | "dimacs" => doc::graph_formats::write_dimacs(doc),
        "edges" => doc::graph_formats::write_edge_list(doc),
        other => {
            return Err(FormatError::NotWritable {
                path: path.to_path_buf(),
                extension: other.to_string(),
            });
        }
    };
    Ok(crate::atomic::write_atomically(path, text.as_bytes())?)
}
