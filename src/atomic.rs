//! Writing a file so that a crash, a kill or a power cut leaves either the old file or the new one,
//! never a mix: the one way Tinct writes projects, exports, proofs, certificates and its own
//! state files. A leaf: it uses nothing else in the crate.

use std::io::Write;
use std::path::{Path, PathBuf};

/// A file could not be written (the old file, if any, is untouched).
#[derive(Debug, thiserror::Error)]
#[error("cannot write {}: {source}", path.display())]
pub struct WriteError {
    pub path: PathBuf,
    #[source]
    pub source: std::io::Error,
}

/// Writes `bytes` to `path` so that `path` holds either its old content or all of `bytes`, never a mix.
///
/// The bytes go to a temporary file beside the target (`.NAME.PID-N.saving`, same folder so the
/// rename cannot cross file systems), which is flushed to disk, given the target's permissions,
/// and renamed over the target; then the folder itself is flushed so the rename survives a power
/// cut. A save that is killed part-way leaves the old file untouched and at most one temporary
/// file, which the next successful save of the same file removes.
pub fn write_atomically(path: &Path, bytes: &[u8]) -> Result<(), WriteError> {
    write_atomically_with(path, |out| out.write_all(bytes))
}

/// [`write_atomically`] for content written piece by piece by `write` (into a buffered writer),
/// so that a large file never has to exist in memory as a whole.
pub fn write_atomically_with(
    path: &Path,
    write: impl FnOnce(&mut dyn Write) -> std::io::Result<()>,
) -> Result<(), WriteError> {
    let err = |source| WriteError {
        path: path.to_path_buf(),
        source,
    };
    let folder = match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let file_name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "project".into());
    // The counter keeps two saves from one process (the editor's save and its recovery writer,
    // or two threads) from sharing a temporary file.
    static SAVES: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(0);
    let n = SAVES.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    let temp = folder.join(format!(".{file_name}.{}-{n}.saving", std::process::id()));
    let result = (|| {
        let mut out = std::io::BufWriter::with_capacity(1 << 20, std::fs::File::create(&temp)?);
        write(&mut out)?;
        let mut file = out.into_inner().map_err(|e| e.into_error())?;
        file.flush()?;
        if let Ok(meta) = std::fs::metadata(path) {
            // Best effort: a project that was read-only to others stays so.
            let _ = file.set_permissions(meta.permissions());
        }
        file.sync_all()?;
        drop(file);
        std::fs::rename(&temp, path)?;
        // Make the rename itself durable.
        #[cfg(unix)]
        if let Ok(dir) = std::fs::File::open(&folder) {
            let _ = dir.sync_all();
        }
        Ok(())
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&temp);
    } else {
        remove_stale_temporaries(&folder, &file_name);
    }
    result.map_err(err)
}

/// The temporary files that saves of `file_name` left in `folder` when they were killed.
pub fn stale_temporaries(folder: &Path, file_name: &str) -> Vec<PathBuf> {
    let prefix = format!(".{file_name}.");
    let mut found: Vec<PathBuf> = std::fs::read_dir(folder)
        .into_iter()
        .flatten()
        .flatten()
        .filter(|entry| {
            let name = entry.file_name();
            let name = name.to_string_lossy();
            name.strip_prefix(&prefix)
                .and_then(|rest| rest.strip_suffix(".saving"))
                .is_some_and(|middle| {
                    !middle.is_empty() && middle.bytes().all(|b| b.is_ascii_digit() || b == b'-')
                })
        })
        .map(|entry| entry.path())
        .collect();
    found.sort();
    found
}

/// Removes what interrupted saves of the same file left behind. A save of the same file running
/// at this very moment in another process loses its temporary file and reports an error (its
/// rename fails); the file on disk is whole either way.
fn remove_stale_temporaries(folder: &Path, file_name: &str) {
    for stale in stale_temporaries(folder, file_name) {
        let _ = std::fs::remove_file(stale);
    }
}
