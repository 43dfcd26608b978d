//! The command line as a user meets it: the documented JSON fields, exit codes, and clear errors on
//! bad input (exit 2, message on standard error, no panic).

use serde_json::Value;

use super::support::{root, stderr, stdout, tinct, tinct_path};

fn sample(name: &str) -> std::path::PathBuf {
    root().join("sample-maps").join(format!("{name}.tinct"))
}

fn assert_bad_input(out: &std::process::Output, words: &str) {
    assert_eq!(out.status.code(), Some(2), "stderr: {}", stderr(out));
    let err = stderr(out);
    assert!(err.contains(words), "expected {words:?} in: {err}");
    assert!(!err.contains("panicked"), "{err}");
    assert!(stdout(out).is_empty());
}

#[test]
fn analyse_json_prints_the_documented_fields_for_every_sample() {
    for name in super::sample_maps::SAMPLES {
        let out = tinct_path(&["analyse"], &sample(name), &["--json"]);
        assert_eq!(out.status.code(), Some(0), "{name}: {}", stderr(&out));
        let json: Value = serde_json::from_str(&stdout(&out)).unwrap();
        for field in [
            "schema",
            "file",
            "title",
            "summary",
            "borders",
            "groups",
            "pins",
            "clashes",
            "uncoloured",
            "pins_broken",
            "groups_split",
            "rule_conflicts",
            "notices",
            "ok",
        ] {
            assert!(json.get(field).is_some(), "{name}: missing {field}");
        }
        for field in [
            "regions",
            "land",
            "water",
            "groups",
            "pins",
            "coloured",
            "colours_used",
            "palette_slots",
            "graph_vertices",
            "graph_edges",
        ] {
            assert!(json["summary"][field].is_u64(), "{name}: summary.{field}");
        }
        assert!(json["summary"]["regions"].as_u64().unwrap() >= 20);
    }
}

#[test]
fn exclave_sample_reports_its_group() {
    let out = tinct_path(&["analyse"], &sample("exclave-coast"), &["--json"]);
    let json: Value = serde_json::from_str(&stdout(&out)).unwrap();
    let groups = json["groups"].as_array().unwrap();
    assert_eq!(groups.len(), 1);
    assert_eq!(groups[0]["name"], "Aldwyn");
    assert_eq!(groups[0]["members"].as_array().unwrap().len(), 2);
}

#[test]
fn strict_exits_1_when_problems_are_found_and_0_otherwise() {
    // The samples ship uncoloured, so --strict reports problems.
    let out = tinct_path(&["analyse"], &sample("three-valleys"), &["--strict"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(stdout(&out).contains("uncoloured"));
    let out = tinct_path(&["analyse"], &sample("three-valleys"), &[]);
    assert_eq!(out.status.code(), Some(0));
}

#[test]
fn truncated_project_is_exit_2_naming_the_line() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(sample("vessland-province")).unwrap();
    let path = dir.path().join("cut.tinct");
    std::fs::write(&path, &text[..text.len() / 3]).unwrap();
    let out = tinct_path(&["analyse"], &path, &["--json"]);
    assert_bad_input(&out, "line ");
    // The damaged file is left exactly as it was.
    assert_eq!(
        std::fs::read_to_string(&path).unwrap(),
        &text[..text.len() / 3]
    );
}

#[test]
fn wrong_type_in_a_field_is_exit_2() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(sample("three-valleys"))
        .unwrap()
        .replacen("tolerance: 0.0", "tolerance: \"wide\"", 1);
    let path = dir.path().join("typed.tinct");
    std::fs::write(&path, text).unwrap();
    assert_bad_input(&tinct_path(&["analyse"], &path, &[]), "line 7");
}

#[test]
fn dimacs_with_a_bad_line_is_exit_2() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bad.col");
    std::fs::write(&path, "c bad\np edge 3 2\ne 1 2\ne 2 three\n").unwrap();
    assert_bad_input(&tinct_path(&["analyse"], &path, &["--json"]), "line 4");
}

#[test]
fn empty_files_are_exit_2() {
    let dir = tempfile::tempdir().unwrap();
    for name in ["empty.tinct", "empty.col", "empty.edges"] {
        let path = dir.path().join(name);
        std::fs::write(&path, "").unwrap();
        let out = tinct_path(&["analyse"], &path, &[]);
        assert_eq!(out.status.code(), Some(2), "{name}");
        assert!(!stderr(&out).contains("panicked"));
    }
}

#[test]
fn missing_file_and_unknown_extension_are_exit_2() {
    assert_bad_input(&tinct(&["analyse", "/no/such/file.tinct"]), "cannot read");
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("map.xyz");
    std::fs::write(&path, "x").unwrap();
    assert_bad_input(
        &tinct_path(&["analyse"], &path, &[]),
        "cannot tell what kind of file",
    );
}

#[test]
fn convert_between_formats_keeps_the_graph() {
    let dir = tempfile::tempdir().unwrap();
    let col = dir.path().join("map.col");
    let out = tinct_path(
        &["convert"],
        &sample("three-valleys"),
        &[col.to_str().unwrap()],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let project = dir.path().join("back.tinct");
    assert_eq!(
        tinct(&["convert", col.to_str().unwrap(), project.to_str().unwrap()])
            .status
            .code(),
        Some(0)
    );
    let a: Value = serde_json::from_str(&stdout(&tinct_path(
        &["analyse"],
        &sample("three-valleys"),
        &["--json"],
    )))
    .unwrap();
    let b: Value =
        serde_json::from_str(&stdout(&tinct_path(&["analyse"], &project, &["--json"]))).unwrap();
    assert_eq!(
        a["summary"]["graph_vertices"],
        b["summary"]["graph_vertices"]
    );
    assert_eq!(a["summary"]["graph_edges"], b["summary"]["graph_edges"]);
}

#[test]
fn every_command_has_help() {
    for args in [
        vec!["--help"],
        vec!["analyse", "--help"],
        vec!["convert", "--help"],
        vec!["open", "--help"],
    ] {
        let out = tinct(&args);
        assert_eq!(out.status.code(), Some(0), "{args:?}");
        assert!(stdout(&out).contains("Usage"), "{args:?}");
    }
}

#[test]
fn analyse_reports_the_fewest_colours_and_the_three_colour_verdict_for_each_sample() {
    // (map, fewest colours, three colourable): the first two are claims the sample generator proved by
    // exhaustive search (sample-maps/tools/make_samples.py); the exclave map's 4 likewise.
    for (name, minimum, three) in [
        ("vessland-province", 4, false),
        ("three-valleys", 3, true),
        ("exclave-coast", 4, false),
    ] {
        let out = tinct_path(
            &["analyse"],
            &sample(name),
            &["--json", "--only", "colouring"],
        );
        assert_eq!(out.status.code(), Some(0), "{name}: {}", stderr(&out));
        let json: Value = serde_json::from_str(&stdout(&out)).unwrap();
        let c = &json["colouring"];
        assert_eq!(c["minimum"], minimum, "{name}");
        assert_eq!(c["proven"], true, "{name}");
        assert_eq!(c["three_colourable"], three, "{name}");
        assert!(c["assignment"].as_object().is_some_and(|a| !a.is_empty()));
        if !three {
            assert_eq!(c["obstruction"]["proof_checked"], true, "{name}");
            assert!(
                c["obstruction"]["vertices"]
                    .as_array()
                    .is_some_and(|v| v.len() >= 4)
            );
        }
    }
}

#[test]
fn colour_writes_a_project_that_analyses_clean_and_proof_out_writes_checkable_files() {
    let dir = tempfile::tempdir().unwrap();
    let out_path = dir.path().join("coloured.tinct");
    let out = tinct_path(
        &["colour"],
        &sample("vessland-province"),
        &["--out", out_path.to_str().unwrap()],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let strict = tinct_path(&["analyse"], &out_path, &["--strict", "--only", "rules"]);
    assert_eq!(
        strict.status.code(),
        Some(0),
        "the coloured map has no problems: {}",
        stdout(&strict)
    );

    let proof = dir.path().join("proof");
    let out = tinct_path(
        &["analyse"],
        &sample("exclave-coast"),
        &[
            "--only",
            "colouring",
            "--proof-out",
            proof.to_str().unwrap(),
        ],
    );
    assert_eq!(out.status.code(), Some(0));
    let cnf = std::fs::read_to_string(proof.join("three-colours.cnf")).unwrap();
    let drat = std::fs::read_to_string(proof.join("three-colours.drat")).unwrap();
    assert!(
        cnf.starts_with("c") || cnf.starts_with("p cnf"),
        "DIMACS CNF"
    );
    tinct::engine::colouring::check_drat(&cnf, &drat)
        .expect("the written proof refutes the written CNF");
}

#[test]
fn a_bad_time_limit_is_bad_input() {
    let out = tinct_path(
        &["analyse"],
        &sample("three-valleys"),
        &["--time-limit", "0"],
    );
    assert_eq!(out.status.code(), Some(2));
    assert!(stderr(&out).contains("time-limit"));
}

/// An edge-list file (vertices from 0) in `dir`.
fn edge_file(
    dir: &std::path::Path,
    name: &str,
    n: u32,
    edges: &[(u32, u32)],
) -> std::path::PathBuf {
    let mut text = format!("{n} {}\n", edges.len());
    for (a, b) in edges {
        text.push_str(&format!("{a} {b}\n"));
    }
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap();
    path
}

#[test]
fn a_map_needing_more_colours_than_the_palette_gets_a_colouring_and_an_offer_of_slots() {
    // Regression: K8 (needs 8 colours, common practice) loaded with the six-slot palette gave
    // "minimum": 8 with an empty assignment.
    let dir = tempfile::tempdir().unwrap();
    let k8 = super::support::generators::complete(8);
    let file = edge_file(dir.path(), "k8.edges", 8, &k8);
    let out = tinct_path(&["analyse"], &file, &["--json", "--only", "colouring"]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let json: Value = serde_json::from_str(&stdout(&out)).unwrap();
    let c = &json["colouring"];
    assert_eq!(c["minimum"], 8);
    assert_eq!(c["extra_slots_needed"], 2);
    let slots: std::collections::BTreeSet<u64> = c["assignment"]
        .as_object()
        .unwrap()
        .values()
        .map(|v| v.as_u64().unwrap())
        .collect();
    assert_eq!(slots.len(), 8, "eight regions, eight slots");

    // `tinct colour` says how many slots are missing, and adds them when asked.
    let coloured = dir.path().join("k8.tinct");
    let out = tinct_path(&["colour"], &file, &["--out", coloured.to_str().unwrap()]);
    assert_bad_input(&out, "--add-slots to add 2 slots");
    assert!(!coloured.exists());
    let out = tinct_path(
        &["colour"],
        &file,
        &["--out", coloured.to_str().unwrap(), "--add-slots"],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert!(stderr(&out).contains("added 2 slots"), "{}", stderr(&out));
    let strict = tinct_path(
        &["analyse"],
        &coloured,
        &["--strict", "--json", "--only", "rules"],
    );
    assert_eq!(strict.status.code(), Some(0), "{}", stdout(&strict));
    let json: Value = serde_json::from_str(&stdout(&strict)).unwrap();
    assert_eq!(json["summary"]["palette_slots"], 8);
}

#[test]
fn a_bound_no_clique_shows_gets_its_own_obstruction_proof_and_files() {
    // Regression: a map needing five colours without five mutual neighbours said only "an
    // exhaustive search ruled out 4 colours". The 23-vertex Mycielski graph (DIMACS myciel4:
    // chromatic number 5, no triangle; Mycielski 1955) needs 5.
    let (n, edges) = super::support::generators::mycielski(5);
    let n = n as u32;
    assert_eq!(n, 23);
    let dir = tempfile::tempdir().unwrap();
    let file = edge_file(dir.path(), "myciel4.edges", n, &edges);
    let proof = dir.path().join("proof");
    let out = tinct_path(
        &["analyse"],
        &file,
        &[
            "--json",
            "--only",
            "colouring",
            "--proof-out",
            proof.to_str().unwrap(),
        ],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let json: Value = serde_json::from_str(&stdout(&out)).unwrap();
    let c = &json["colouring"];
    assert_eq!(
        (c["minimum"].as_u64(), c["proven"].as_bool()),
        (Some(5), Some(true))
    );
    assert_eq!(c["stopped"], false);
    let o = &c["minimum_obstruction"];
    assert_eq!(o["colours"], 4);
    assert_eq!(o["proof_checked"], true);
    assert_eq!(o["critical"], true);
    let reason = c["lower_bound_reason"].as_str().unwrap();
    assert!(reason.contains("cannot take 4 colours"), "{reason}");
    let cnf = std::fs::read_to_string(proof.join("4-colours.cnf")).unwrap();
    let drat = std::fs::read_to_string(proof.join("4-colours.drat")).unwrap();
    tinct::engine::colouring::check_drat(&cnf, &drat).expect("the written proof checks");
    assert!(proof.join("three-colours.cnf").exists());
}

#[test]
fn a_failed_write_is_exit_3_whatever_the_command() {
    // Regression: `tinct colour` reported a project it could not write as bad input (exit 2).
    let out = tinct_path(
        &["colour"],
        &sample("three-valleys"),
        &["--out", "/nonexistent-folder/coloured.tinct"],
    );
    assert_eq!(out.status.code(), Some(3), "{}", stderr(&out));
    assert!(stderr(&out).contains("cannot"), "{}", stderr(&out));
    let out = tinct_path(
        &["convert"],
        &sample("three-valleys"),
        &["/nonexistent-folder/graph.col"],
    );
    assert_eq!(out.status.code(), Some(3), "{}", stderr(&out));
    // A wrong extension is the user's input, not a failed write.
    let dir = tempfile::tempdir().unwrap();
    let out = tinct_path(
        &["convert"],
        &sample("three-valleys"),
        &[dir.path().join("graph.txt").to_str().unwrap()],
    );
    assert_bad_input(&out, "cannot write files with extension");
}

#[test]
fn analyse_imports_a_boundary_file_with_the_rule_it_is_given() {
    // The sample's GeoJSON read with the queen rule counts corner contacts as borders, so its
    // constraint graph has at least as many edges as with the rook rule (common practice).
    let edges = |rule: &str| {
        let out = tinct_path(
            &["analyse"],
            &root().join("sample-maps/vessland-province.geojson"),
            &["--json", "--only", "rules", "--rule", rule],
        );
        assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
        let json: Value = serde_json::from_str(&stdout(&out)).unwrap();
        (
            json["summary"]["graph_edges"].as_u64().unwrap(),
            json["borders"]["corner"].as_u64().unwrap(),
        )
    };
    let (rook, corners) = edges("rook");
    let (queen, _) = edges("queen");
    assert!(queen >= rook);
    assert_eq!(queen > rook, corners > 0);
}

#[test]
fn geopackage_and_flatgeobuf_files_import_from_the_command_line() {
    // GDAL-written copies of the 14-state extract (tests/data/geo/PROVENANCE.md): the same regions
    // and borders whichever format carries them, and the same projection, which the command names.
    let geo = root().join("tests/data/geo");
    let dir = tempfile::tempdir().unwrap();
    let mut borders = Vec::new();
    let mut projections = Vec::new();
    for file in [
        "us_states_subset.geojson",
        "us_states_subset.gpkg",
        "us_states_subset.fgb",
    ] {
        let out = dir.path().join(format!("{file}.tinct"));
        let run = tinct(&[
            "import",
            geo.join(file).to_str().unwrap(),
            "--out",
            out.to_str().unwrap(),
        ]);
        assert_eq!(run.status.code(), Some(0), "{file}: {}", stderr(&run));
        let said = stderr(&run);
        let line = said
            .lines()
            .find(|l| l.contains("imported"))
            .unwrap()
            .to_string();
        borders.push(line.split(" into ").next().unwrap().to_string());
        projections.push(
            said.lines()
                .find(|l| l.contains("projection: "))
                .unwrap()
                .to_string(),
        );
    }
    assert_eq!(borders[0], "tinct: imported 14 regions and 25 borders");
    assert!(
        projections
            .iter()
            .all(|p| p
                .starts_with("tinct: projection: Albers equal-area conic (standard parallels ")),
        "{projections:?}"
    );
    assert!(
        projections.iter().all(|p| *p == projections[0]),
        "{projections:?}"
    );
    assert!(borders.iter().all(|b| *b == borders[0]), "{borders:?}");
    // A layer that is not there: exit 2, naming the layers the file has.
    let out = tinct(&[
        "analyse",
        geo.join("us_states_subset.gpkg").to_str().unwrap(),
        "--layer",
        "counties",
    ]);
    assert_bad_input(&out, "states (MULTIPOLYGON, 14 features)");
}
