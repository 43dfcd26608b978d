//! The recovery file: unsaved work written aside every few seconds, so that a crash or a power cut
//! loses at most the last few seconds of edits. It lives in the user's state folder, never next to
//! the project, and is removed once the work is saved or deliberately discarded.

use std::path::{Path, PathBuf};
use std::time::SystemTime;

use super::file::{self, FileError};
use super::model::Document;

/// Where recovery files go: `$TINCT_RECOVERY_DIR`, else `$XDG_STATE_HOME/tinct`, else
/// `~/.local/state/tinct`, else the system's temporary folder.
pub fn recovery_dir() -> PathBuf {
    if let Some(dir) = std::env::var_os("TINCT_RECOVERY_DIR") {
        return PathBuf::from(dir);
    }
    if let Some(state) = std::env::var_os("XDG_STATE_HOME") {
        return PathBuf::from(state).join("tinct");
    }
    if let Some(home) = std::env::var_os("HOME") {
        return PathBuf::from(home).join(".local/state/tinct");
    }
    std::env::temp_dir().join("tinct")
}

/// Unsaved work found in a recovery folder.
#[derive(Debug)]
pub struct Recovered {
    pub doc: Document,
    /// The file the work belonged to, if it had been saved before.
    pub original: Option<PathBuf>,
    /// When the recovery file was written.
    pub written: Option<SystemTime>,
}

fn project_path(dir: &Path) -> PathBuf {
    dir.join("recovery.tinct")
}

fn origin_path(dir: &Path) -> PathBuf {
    dir.join("recovery.origin")
}

/// Writes `doc` (and the path of the file it belongs to) as the recovery file in `dir`, atomically.
pub fn write(dir: &Path, doc: &Document, original: Option<&Path>) -> Result<(), FileError> {
    std::fs::create_dir_all(dir).map_err(|source| FileError::Write {
        path: dir.to_path_buf(),
        source,
    })?;
    let origin = original
        .map(|p| p.to_string_lossy().into_owned())
        .unwrap_or_default();
    file::write_atomically(&origin_path(dir), origin.as_bytes())?;
    file::save(doc, &project_path(dir))
}

/// Reads the recovery file in `dir`: `Ok(None)` when there is none; an error when it exists but is
/// damaged (the caller reports it and leaves the file for the user to inspect; it is never trusted).
pub fn read(dir: &Path) -> Result<Option<Recovered>, FileError> {
    let path = project_path(dir);
    if !path.exists() {
        return Ok(None);
    }
    let doc = file::load(&path)?;
    let original = std::fs::read_to_string(origin_path(dir))
        .ok()
        .filter(|s| !s.trim().is_empty())
        .map(PathBuf::from);
    let written = std::fs::metadata(&path).and_then(|m| m.modified()).ok();
    Ok(Some(Recovered {
        doc,
        original,
        written,
    }))
}

/// The path of the recovery file in `dir` (for messages about a damaged one).
pub fn file_in(dir: &Path) -> PathBuf {
    project_path(dir)
}

/// The files opened or saved most recently, newest first, as remembered in `dir`.
pub fn recent_files(dir: &Path) -> Vec<PathBuf> {
    std::fs::read_to_string(dir.join("recent.txt"))
        .map(|text| {
            text.lines()
                .filter(|l| !l.trim().is_empty())
                .map(PathBuf::from)
                .collect()
        })
        .unwrap_or_default()
}

/// Puts `path` first in the list of recent files in `dir` (at most `RECENT_LIMIT`), and returns the list.
pub fn remember_file(dir: &Path, path: &Path) -> Vec<PathBuf> {
    let path = std::fs::canonicalize(path).unwrap_or_else(|_| path.to_path_buf());
    let mut list = recent_files(dir);
    list.retain(|p| p != &path);
    list.insert(0, path);
    list.truncate(RECENT_LIMIT);
    let text: String = list.iter().map(|p| format!("{}\n", p.display())).collect();
    // Forgetting the list is harmless; the user's work is never at stake here.
    let _ = std::fs::create_dir_all(dir)
        .map(|_| file::write_atomically(&dir.join("recent.txt"), text.as_bytes()));
    list
}

/// How many recent files are remembered.
pub const RECENT_LIMIT: usize = 8;

/// Removes the recovery file (after a save, or when the user discards the work).
pub fn clear(dir: &Path) {
    let _ = std::fs::remove_file(project_path(dir));
    let _ = std::fs::remove_file(origin_path(dir));
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::{Edit, Region};

    #[test]
    fn write_read_clear_round_trip_and_damage_is_reported() {
        let dir = std::env::temp_dir().join(format!("tinct-recovery-test-{}", std::process::id()));
        let mut doc = Document::new("Unsaved work");
        let (_, e) = doc.add_region_edit(Region::new("Fold", [1.0, 2.0]));
        doc.apply(e).unwrap();
        doc.apply(Edit::SetTitle("Renamed".into())).unwrap();
        assert!(read(&dir).unwrap().is_none());
        write(&dir, &doc, Some(Path::new("/maps/fold.tinct"))).unwrap();
        let back = read(&dir).unwrap().unwrap();
        assert_eq!(back.doc, doc);
        assert_eq!(
            back.original.as_deref(),
            Some(Path::new("/maps/fold.tinct"))
        );
        std::fs::write(file_in(&dir), "(format_version: 1, title: \"cut").unwrap();
        assert!(matches!(read(&dir), Err(FileError::Syntax { .. })));
        clear(&dir);
        assert!(read(&dir).unwrap().is_none());
        for i in 0..10 {
            remember_file(&dir, Path::new(&format!("/maps/{i}.tinct")));
        }
        let recent = remember_file(&dir, Path::new("/maps/3.tinct"));
        assert_eq!(recent.len(), RECENT_LIMIT);
        assert_eq!(recent[0], Path::new("/maps/3.tinct"));
        assert_eq!(recent_files(&dir), recent);
        let _ = std::fs::remove_dir_all(&dir);
    }
}
