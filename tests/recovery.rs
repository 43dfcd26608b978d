//! Crash recovery: unsaved work written aside by `doc::recovery` comes back after the process is
//! killed, losing at most the edits of the last autosave interval; a damaged recovery file is
//! reported with a clear message and left in place, never loaded and never deleted.
//!
//! The editor's own loop (`ui::app`, which autosaves every `AUTOSAVE_EVERY` while there is unsaved
//! work) needs a window, so the crash test runs the same library calls in a child process: this
//! test binary started again with `TINCT_RECOVERY_CHILD` set, editing and autosaving on the same
//! schedule (with a shorter interval) until it is killed with SIGKILL.

// Calls into the C library (resource usage, signals, a counting allocator) need `unsafe`.
#![allow(unsafe_code)]

use std::io::{BufRead, BufReader};
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use super::support::generators::Rng as XorShift;
use tinct::doc::file::{self, FileError};
use tinct::doc::{Document, Edit, RegionId, recovery};

const TEST_NAME: &str =
    "recovery::autosaved_work_comes_back_after_a_kill_losing_at_most_one_interval";
/// The child's autosave interval (the editor uses `ui::app::AUTOSAVE_EVERY`, five seconds).
const INTERVAL: Duration = Duration::from_millis(150);
/// The child pauses at least this long after each edit, so one interval holds at most
/// `INTERVAL / PAUSE + 1` edits: the most a kill may lose.
const PAUSE: Duration = Duration::from_millis(5);

fn sample() -> (Document, PathBuf) {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-maps/three-valleys.tinct");
    (file::load(&path).unwrap(), path)
}

/// Edit number `i` (from 0): a new title naming it, and a colour on one region.
fn edit(doc: &Document, i: usize) -> Edit {
    let ids: Vec<RegionId> = doc.regions().keys().copied().collect();
    Edit::Batch {
        label: format!("draft {i}"),
        edits: vec![
            Edit::SetTitle(format!("Draft {}", i + 1)),
            Edit::PutColour {
                id: ids[i % ids.len()],
                slot: Some((i % 4) as u32),
            },
        ],
    }
}

/// The document after the first `k` edits.
fn replay(k: usize) -> Document {
    let (mut doc, _) = sample();
    for i in 0..k {
        let e = edit(&doc, i);
        doc.apply(e).unwrap();
    }
    doc
}

/// The child: edits, autosaves every `INTERVAL`, reports both on stdout, until it is killed.
fn child(dir: &Path) {
    let (mut doc, original) = sample();
    let mut autosaved_at = Instant::now();
    let give_up = Instant::now() + Duration::from_secs(60);
    let mut i = 0;
    while Instant::now() < give_up {
        let e = edit(&doc, i);
        doc.apply(e).unwrap();
        i += 1;
        println!("edited {i}");
        if autosaved_at.elapsed() >= INTERVAL {
            recovery::write(dir, &doc, Some(&original)).unwrap();
            autosaved_at = Instant::now();
            println!("autosaved {i}");
        }
        std::thread::sleep(PAUSE);
    }
}

#[test]
fn autosaved_work_comes_back_after_a_kill_losing_at_most_one_interval() {
    if let Some(dir) = std::env::var_os("TINCT_RECOVERY_CHILD") {
        child(Path::new(&dir));
        return;
    }
    let most_lost = (INTERVAL.as_millis() / PAUSE.as_millis()) as usize + 1;
    let mut rng = XorShift::new(0xC0FFEE);
    let (_, original) = sample();
    for round in 0..5 {
        let dir = tempfile::tempdir().unwrap();
        let mut child = Command::new(std::env::current_exe().unwrap())
            .args([TEST_NAME, "--exact", "--nocapture", "--test-threads=1"])
            .env("TINCT_RECOVERY_CHILD", dir.path())
            .stdout(Stdio::piped())
            .stderr(Stdio::null())
            .spawn()
            .unwrap();
        let mut lines = BufReader::new(child.stdout.take().unwrap()).lines();
        // Let it autosave a few times, then kill it after a random number of further edits.
        let (mut edited, mut autosaved, mut seen_autosaves) = (0usize, 0usize, 0);
        let extra = (rng.next_u64() % 60) as usize;
        let mut kill_after: Option<usize> = None;
        for line in lines.by_ref() {
            let line = line.unwrap();
            if let Some(n) = line.strip_prefix("edited ") {
                edited = n.parse().unwrap();
            } else if let Some(n) = line.strip_prefix("autosaved ") {
                autosaved = n.parse().unwrap();
                seen_autosaves += 1;
                if seen_autosaves == 3 {
                    kill_after = Some(edited + extra);
                }
            }
            if kill_after.is_some_and(|k| edited >= k) {
                break;
            }
        }
        // SAFETY: kill(2) on the id of a child we started and have not yet waited for.
        unsafe {
            libc::kill(child.id() as libc::pid_t, libc::SIGKILL);
        }
        // What the child managed to report before it died is still in the pipe.
        for line in lines {
            let Ok(line) = line else { break };
            if let Some(n) = line.strip_prefix("edited ") {
                edited = n.parse().unwrap();
            } else if let Some(n) = line.strip_prefix("autosaved ") {
                autosaved = n.parse().unwrap();
            }
        }
        let status = child.wait().unwrap();
        assert!(!status.success(), "the child was killed");

        let found = recovery::read(dir.path())
            .unwrap()
            .expect("a recovery file");
        let k: usize = found
            .doc
            .title()
            .strip_prefix("Draft ")
            .and_then(|n| n.parse().ok())
            .expect("the recovered title names its edit");
        // The recovery file holds exactly the work of some moment: the first k edits, whole.
        assert_eq!(found.doc, replay(k), "round {round}");
        assert_eq!(found.original.as_deref(), Some(original.as_path()));
        // Nothing older than the last autosave the child finished; at most one interval lost.
        assert!(
            k >= autosaved,
            "round {round}: recovered {k}, autosaved {autosaved}"
        );
        assert!(k <= edited, "round {round}: recovered {k}, edited {edited}");
        assert!(
            edited - k <= most_lost,
            "round {round}: {} edits lost, more than one interval ({most_lost})",
            edited - k
        );
    }
}

/// Writes `bytes` as the recovery file in a fresh folder and checks that reading it fails with a
/// message containing `expected`, and leaves the file exactly as it was.
fn damaged(bytes: &[u8], expected: &str) {
    let dir = tempfile::tempdir().unwrap();
    let path = recovery::file_in(dir.path());
    std::fs::write(&path, bytes).unwrap();
    let err = match recovery::read(dir.path()) {
        Err(e) => e,
        Ok(found) => panic!(
            "a damaged recovery file was trusted: {:?}",
            found.map(|f| f.doc.title().to_string())
        ),
    };
    let message = err.to_string();
    assert!(
        message.contains(expected),
        "{message:?} should say {expected:?}"
    );
    // Not deleted, not rewritten: the user decides what happens to it.
    assert_eq!(std::fs::read(&path).unwrap(), bytes);
}

#[test]
fn a_damaged_recovery_file_is_reported_and_left_alone() {
    let (doc, _) = sample();
    let text = file::to_string(&doc);
    // Truncated mid-write (as by a power cut on a file system without ordered writes).
    let cut = &text.as_bytes()[..text.len() / 3];
    damaged(cut, "truncated");
    // Garbage.
    damaged(b"\x00\x01 this is not a project", "line 1");
    damaged(b"{\"type\": \"FeatureCollection\"}", "line 1");
    // Empty (a crash between creating and writing a file on some file systems).
    damaged(b"", "empty");
    // Saved by a newer Tinct.
    let newer = text.replacen("format_version: 1", "format_version: 9", 1);
    damaged(newer.as_bytes(), "newer Tinct");
    // Well-formed but inconsistent: a border naming a region the file does not define.
    let inconsistent = text.replacen(
        "borders: [",
        "borders: [\n    (a: 999998, b: 999999, kind: Manual),",
        1,
    );
    damaged(inconsistent.as_bytes(), "999998");
}

#[test]
fn a_damaged_recovery_file_is_a_syntax_error_naming_the_line() {
    let dir = tempfile::tempdir().unwrap();
    let (doc, _) = sample();
    recovery::write(dir.path(), &doc, None).unwrap();
    let path = recovery::file_in(dir.path());
    let text = std::fs::read_to_string(&path).unwrap();
    // A flipped byte on line 5.
    let mut lines: Vec<&str> = text.lines().collect();
    let broken = lines[4].replacen(':', ";", 1);
    lines[4] = &broken;
    std::fs::write(&path, lines.join("\n")).unwrap();
    match recovery::read(dir.path()) {
        Err(FileError::Syntax { line, .. }) => assert_eq!(line, 5),
        other => panic!("expected a syntax error on line 5, got {other:?}"),
    }
    assert!(path.exists());
    // Clearing is the user's decision (the editor's "Discard"), and only then is it removed.
    recovery::clear(dir.path());
    assert!(!path.exists());
    assert!(recovery::read(dir.path()).unwrap().is_none());
}
