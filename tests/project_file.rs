//! The `.tinct` project file: golden files of format version 1, save/load round trips, and clear
//! errors for damaged, truncated, mistyped and newer files.

use proptest::prelude::*;
use tinct::doc::file::{self, FileError};
use tinct::doc::{BorderKind, Edit, GroupId, RegionId, RegionPair, Role, Settings, Units};
use tinct::projection::Projection;

use super::support::{arb, root};

fn golden(name: &str) -> std::path::PathBuf {
    root().join("tests/golden/v1").join(name)
}

/// Format version 1 golden file: these files are never rewritten, and must load forever.
#[test]
fn golden_v1_full_loads_with_every_feature() {
    let doc = file::load(&golden("full.tinct")).expect("golden file loads");
    assert_eq!(doc.title(), "Golden full: Orrin Marches");
    assert_eq!(doc.settings().units, Units::Metres);
    assert!(doc.settings().corners_count);
    assert_eq!(doc.settings().min_border_length, 25.0);
    assert_eq!(doc.palette().slots.len(), 4);
    assert_eq!(doc.palette().slots[3].colour.to_hex(), "#86c0c9");
    assert_eq!(doc.regions().len(), 5);
    let brack = &doc.regions()[&RegionId(1)];
    assert_eq!(brack.name, "Brack");
    assert_eq!(brack.group, Some(GroupId(1)));
    let geometry = brack.geometry.as_ref().expect("Brack has an outline");
    assert_eq!(geometry.polygons[0].holes.len(), 1);
    assert_eq!(doc.regions()[&RegionId(4)].role, Role::Water);
    assert_eq!(doc.regions()[&RegionId(2)].pin, Some(1));
    assert!(doc.regions()[&RegionId(5)].geometry.is_none());
    let pair = RegionPair::new(RegionId(2), RegionId(3)).unwrap();
    assert_eq!(doc.borders()[&pair].kind, BorderKind::Shared);
    assert!(doc.borders()[&RegionPair::new(RegionId(1), RegionId(3)).unwrap()].suppressed);
    assert_eq!(doc.colouring().get(&RegionId(2)), Some(&1));
    assert_eq!(doc.groups()[&GroupId(1)].name, "Brack and exclave");
}

#[test]
fn golden_v1_minimal_loads() {
    let doc = file::load(&golden("minimal.tinct")).expect("golden file loads");
    assert_eq!(doc.title(), "Golden minimal");
    assert!(doc.regions().is_empty());
    assert_eq!(doc.palette().slots.len(), 1);
}

/// Format version 1 as written before Tinct chose among projections: the centre of its Lambert
/// azimuthal projection, `projection_origin`. (Hand-written in the layout that writer used.)
#[test]
fn golden_v1_projection_origin_loads_as_lambert_azimuthal() {
    let doc = file::load(&golden("lambert_origin.tinct")).expect("golden file loads");
    assert_eq!(
        doc.settings().projection,
        Some(Projection::LambertAzimuthal {
            lon0: -96.5,
            lat0: 38.25
        })
    );
}

#[test]
fn other_projections_are_saved_beside_the_old_field_and_come_back() {
    let minimal = std::fs::read_to_string(golden("minimal.tinct")).unwrap();
    for projection in [
        Projection::AlbersEqualArea {
            lon0: -96.0,
            lat0: 23.0,
            lat1: 29.5,
            lat2: 45.5,
        },
        Projection::EqualEarth { lon0: -150.0 },
    ] {
        let mut doc = file::from_str(&minimal).unwrap();
        let settings = Settings {
            units: Units::Metres,
            projection: Some(projection),
            ..*doc.settings()
        };
        doc.apply(Edit::SetSettings(settings)).unwrap();
        let text = file::to_string(&doc);
        assert!(text.contains("    projection: Some("), "{text}");
        assert!(!text.contains("projection_origin"), "{text}");
        assert_eq!(
            file::from_str(&text).unwrap().settings().projection,
            Some(projection)
        );
    }
    // A Lambert azimuthal projection is written in the old field, so earlier builds read it.
    let text = std::fs::read_to_string(golden("lambert_origin.tinct")).unwrap();
    let saved = file::to_string(&file::from_str(&text).unwrap());
    assert_eq!(saved, text);
}

#[test]
fn a_projection_that_cannot_be_used_is_a_clear_error() {
    let minimal = std::fs::read_to_string(golden("minimal.tinct")).unwrap();
    let with = |settings: &str| {
        minimal.replace(
            "    units: Unitless,\n",
            &format!("    units: Metres,\n{settings}"),
        )
    };
    for (settings, expected) in [
        (
            "    projection_origin: Some((1.0, 2.0)),\n    projection: Some(EqualEarth(lon0: 0.0)),\n",
            "both projection_origin and projection",
        ),
        (
            "    projection: Some(AlbersEqualArea(lon0: 0.0, lat0: 0.0, lat1: -30.0, lat2: 30.0)),\n",
            "symmetrically about the equator",
        ),
        (
            "    projection: Some(LambertAzimuthal(lon0: 0.0, lat0: 120.0)),\n",
            "not a latitude",
        ),
    ] {
        let text = with(settings);
        assert!(text.contains(settings));
        match file::from_str(&text) {
            Err(FileError::Invalid(message)) => {
                assert!(message.contains(expected), "{message}")
            }
            other => panic!("{settings}: {other:?}"),
        }
    }
}

#[test]
fn saving_a_golden_file_again_gives_the_same_text() {
    // The writer is canonical: sorted, fixed layout. (If the writer ever changes layout, the golden
    // files stay as they are and this test compares against a fresh save instead.)
    for name in ["full.tinct", "minimal.tinct", "lambert_origin.tinct"] {
        let text = std::fs::read_to_string(golden(name)).unwrap();
        let doc = file::from_str(&text).unwrap();
        assert_eq!(file::to_string(&doc), text, "{name}");
    }
}

#[test]
fn every_truncation_is_a_clear_error_never_a_panic() {
    let text = std::fs::read_to_string(golden("full.tinct")).unwrap();
    let mut cut = 0;
    while cut < text.len() {
        if text.is_char_boundary(cut) && !text[cut..].trim().is_empty() {
            match file::from_str(&text[..cut]) {
                Ok(_) => panic!("a file cut at byte {cut} loaded"),
                Err(FileError::Syntax {
                    line,
                    column,
                    message,
                }) => {
                    assert!(line >= 1 && column >= 1 && !message.is_empty());
                }
                Err(FileError::Empty) => assert!(text[..cut].trim().is_empty()),
                Err(other) => panic!("cut at {cut}: unexpected error {other}"),
            }
        }
        cut += 7;
    }
}

#[test]
fn a_wrong_type_names_line_and_column_and_what_was_expected() {
    let text = std::fs::read_to_string(golden("full.tinct")).unwrap();
    let broken = text.replacen("corners_count: true", "corners_count: \"yes\"", 1);
    let line = broken
        .lines()
        .position(|l| l.contains("corners_count"))
        .unwrap()
        + 1;
    match file::from_str(&broken) {
        Err(FileError::Syntax {
            line: l, message, ..
        }) => {
            assert_eq!(l, line);
            assert!(message.to_lowercase().contains("bool"), "{message}");
        }
        other => panic!("expected a syntax error, got {other:?}"),
    }
}

#[test]
fn newer_format_is_refused_with_a_message_saying_so() {
    let text = std::fs::read_to_string(golden("minimal.tinct"))
        .unwrap()
        .replacen("format_version: 1", "format_version: 2", 1);
    let err = file::from_str(&text).unwrap_err();
    assert!(matches!(
        err,
        FileError::NewerVersion {
            found: 2,
            supported: 1
        }
    ));
    assert!(err.to_string().contains("newer Tinct"), "{err}");
}

#[test]
fn references_to_missing_regions_are_invalid() {
    let text = std::fs::read_to_string(golden("full.tinct"))
        .unwrap()
        .replacen("(a: 2, b: 3,", "(a: 2, b: 99,", 1);
    let err = file::from_str(&text).unwrap_err();
    assert!(
        matches!(err, FileError::Invalid(ref m) if m.contains("99")),
        "{err}"
    );
}

#[test]
fn atomic_save_replaces_whole_file_and_leaves_no_temporary_files() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("map.tinct");
    let old = file::load(&golden("minimal.tinct")).unwrap();
    let new = file::load(&golden("full.tinct")).unwrap();
    file::save(&old, &path).unwrap();
    file::save(&new, &path).unwrap();
    assert_eq!(file::load(&path).unwrap(), new);
    let names: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().file_name())
        .collect();
    assert_eq!(names, vec![std::ffi::OsString::from("map.tinct")]);
}

#[test]
fn a_failed_save_keeps_the_old_file_and_cleans_up() {
    let dir = tempfile::tempdir().unwrap();
    // The target is a folder: the rename must fail, and nothing else may change.
    let target = dir.path().join("taken.tinct");
    std::fs::create_dir(&target).unwrap();
    let doc = file::load(&golden("minimal.tinct")).unwrap();
    let err = file::save(&doc, &target).unwrap_err();
    assert!(matches!(err, FileError::Write { .. }));
    assert!(target.is_dir());
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]

    #[test]
    fn save_then_load_gives_an_identical_document(doc in arb::document()) {
        let text = file::to_string(&doc);
        let back = file::from_str(&text).map_err(|e| TestCaseError::fail(format!("{e}\n{text}")))?;
        prop_assert_eq!(&back, &doc);
        prop_assert_eq!(file::to_string(&back), text);
    }
}
