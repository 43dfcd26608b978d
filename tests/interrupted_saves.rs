//! Interrupted saves: the real `tinct` binary saves a large project over an older one and is
//! killed (SIGKILL, no chance to clean up) at seeded random moments. After every kill the file on
//! disk must be the old project or the new one, byte for byte and loadable, and what the killed
//! saves leave behind (their temporary files) must be removed by the next successful save.

// Calls into the C library (resource usage, signals, a counting allocator) need `unsafe`.
#![allow(unsafe_code)]

use std::path::Path;
use std::process::{Command, Stdio};
use std::time::Instant;

use super::support::generators as synthetic;
use tinct::doc::Document;
use tinct::doc::file;
use tinct::geo::{ImportOptions, import_json};

/// A project of a few megabytes: a jittered grid with its geometry and borders.
fn large_project() -> Document {
    let regions = synthetic::jittered_grid(40, 40, 6, 0.2, 2024);
    let json = synthetic::to_geojson(&regions);
    let map = import_json(json.as_bytes(), &ImportOptions::default()).unwrap();
    map.into_document("Large synthetic project")
}

fn convert(input: &Path, output: &Path) -> std::process::Child {
    Command::new(env!("CARGO_BIN_EXE_tinct"))
        .arg("convert")
        .arg(input)
        .arg(output)
        .stdout(Stdio::null())
        .stderr(Stdio::null())
        .spawn()
        .unwrap()
}

#[test]
fn a_save_killed_at_any_moment_leaves_the_old_project_or_the_new_one_whole() {
    let dir = tempfile::tempdir().unwrap();
    let input = dir.path().join("large.tinct");
    let target = dir.path().join("work.tinct");
    let old_doc =
        file::load(&Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-maps/three-valleys.tinct"))
            .unwrap();
    let new_doc = large_project();
    file::save(&new_doc, &input).unwrap();
    let old_bytes = file::to_string(&old_doc).into_bytes();
    let new_bytes = std::fs::read(&input).unwrap();
    assert_ne!(old_bytes, new_bytes);

    // Calibrate: how long one whole `convert` takes here (load, serialise, write, flush, rename).
    let calibrate = dir.path().join("calibrate.tinct");
    let start = Instant::now();
    assert!(convert(&input, &calibrate).wait().unwrap().success());
    let whole = start.elapsed();
    assert_eq!(std::fs::read(&calibrate).unwrap(), new_bytes);

    let mut rng = synthetic::Rng::new(0x5AFE);
    let (mut saw_old, mut saw_new, mut left_temporaries) = (0, 0, 0);
    let mut killed = Vec::new();
    // Late kills are stretched whenever one still finds the old project: a loaded machine (CI
    // runs the suites side by side) saves slower than the calibration run did, and both
    // outcomes must be seen whatever the load.
    let mut stretch = 1.0f64;
    let mut kills = 0;
    while kills < 40 || ((saw_new == 0 || saw_old == 0) && kills < 200) {
        kills += 1;
        std::fs::write(&target, &old_bytes).unwrap();
        // Kill moments spread from just after the start to past the usual end of the save, every
        // other one near the end, where the text is written, flushed and renamed.
        let uniform = (rng.symmetric() + 1.0) / 2.0;
        let late = killed.len() % 2 == 1;
        let fraction = if late {
            (0.75 + 0.35 * uniform) * stretch
        } else {
            0.05 + 1.45 * uniform
        };
        let mut child = convert(&input, &target);
        std::thread::sleep(whole.mul_f64(fraction));
        // SAFETY: kill(2) on the id of a child we started and have not yet waited for.
        unsafe {
            libc::kill(child.id() as libc::pid_t, libc::SIGKILL);
        }
        let _ = child.wait();
        killed.push(child.id());

        let on_disk = std::fs::read(&target).unwrap();
        if on_disk == old_bytes {
            saw_old += 1;
            if late {
                stretch = (stretch * 1.25).min(25.0);
            }
        } else if on_disk == new_bytes {
            saw_new += 1;
        } else {
            panic!(
                "after a kill at {fraction:.2} of a save, the file is neither project ({} bytes)",
                on_disk.len()
            );
        }
        // Whatever the killed saves left is theirs: a temporary file named after their process.
        let stale = file::stale_temporaries(dir.path(), "work.tinct");
        let pid = child.id();
        if stale
            .iter()
            .any(|p| p.to_string_lossy().contains(&format!(".work.tinct.{pid}-")))
        {
            left_temporaries += 1;
        }
        for path in &stale {
            let name = path.file_name().unwrap().to_string_lossy().into_owned();
            assert!(
                killed
                    .iter()
                    .any(|pid| name.starts_with(&format!(".work.tinct.{pid}-"))),
                "{name} was not left by a killed save"
            );
        }
    }
    println!(
        "{kills} kills: old project {saw_old} times, new project {saw_new} times; {left_temporaries} kills \
         left a temporary file (killed while writing); one save takes {whole:?}, late kills \
         stretched {stretch:.2}x"
    );
    // Kills landed both before and after the rename, so both outcomes were exercised.
    assert!(saw_old > 0 && saw_new > 0, "old {saw_old}, new {saw_new}");
    // The file on disk was always one of these two texts, and each loads whole.
    assert_eq!(file::from_bytes(&old_bytes).unwrap(), old_doc);
    assert_eq!(file::from_bytes(&new_bytes).unwrap(), new_doc);

    // The next successful save removes every temporary file the killed ones left.
    assert!(convert(&input, &target).wait().unwrap().success());
    assert_eq!(std::fs::read(&target).unwrap(), new_bytes);
    assert_eq!(
        file::stale_temporaries(dir.path(), "work.tinct"),
        Vec::<std::path::PathBuf>::new()
    );
}

#[test]
fn a_leftover_temporary_file_is_removed_by_the_next_save_and_others_are_kept() {
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("map.tinct");
    // What a save killed mid-write leaves: a partial temporary file beside the project.
    let leftover = dir.path().join(".map.tinct.4242-0.saving");
    std::fs::write(&leftover, "(format_version: 1, title: \"half").unwrap();
    // Files that only look similar belong to someone else and stay.
    let unrelated = [
        ".map.tinct.notes.saving",
        ".other.tinct.4242-0.saving",
        "map.tinct.4242-0.saving",
    ];
    for name in unrelated {
        std::fs::write(dir.path().join(name), "keep").unwrap();
    }
    assert_eq!(
        file::stale_temporaries(dir.path(), "map.tinct"),
        vec![leftover.clone()]
    );
    let doc = Document::new("Saved");
    file::save(&doc, &target).unwrap();
    assert!(!leftover.exists());
    for name in unrelated {
        assert!(dir.path().join(name).exists(), "{name} was removed");
    }
    assert_eq!(file::load(&target).unwrap(), doc);
}

#[cfg(unix)]
#[test]
fn saving_over_a_project_keeps_its_permissions() {
    use std::os::unix::fs::PermissionsExt;
    let dir = tempfile::tempdir().unwrap();
    let target = dir.path().join("shared.tinct");
    file::save(&Document::new("First"), &target).unwrap();
    std::fs::set_permissions(&target, std::fs::Permissions::from_mode(0o640)).unwrap();
    file::save(&Document::new("Second"), &target).unwrap();
    let mode = std::fs::metadata(&target).unwrap().permissions().mode() & 0o777;
    assert_eq!(mode, 0o640);
    assert_eq!(file::load(&target).unwrap().title(), "Second");
}
