//! The house rules on dependency direction, checked by reading the source (see DEVELOPERS.md):
//! the engine and the colour science know nothing else; the document knows no GUI; export looks
//! only down; only the project-file module knows RON;
//! only the user interface knows egui, eframe and rfd.

use super::support::{root, rust_files};

/// Lines of code with comments removed, so a sentence about a crate is not mistaken for its use.
fn code_lines(text: &str) -> Vec<(usize, String)> {
    text.lines()
        .enumerate()
        .map(|(i, l)| (i + 1, l.split("//").next().unwrap_or("").to_string()))
        .filter(|(_, l)| !l.trim().is_empty())
        .collect()
}

/// True when `word` occurs in `line` as a whole identifier.
fn names(line: &str, word: &str) -> bool {
    let bytes = line.as_bytes();
    let ident = |b: u8| b.is_ascii_alphanumeric() || b == b'_';
    let mut from = 0;
    while let Some(pos) = line[from..].find(word) {
        let start = from + pos;
        let end = start + word.len();
        let before_ok = start == 0 || !ident(bytes[start - 1]);
        let after_ok = end >= bytes.len() || !ident(bytes[end]);
        if before_ok && after_ok {
            return true;
        }
        from = end;
    }
    false
}

/// Every (file, line, text) under `src/<folder>` that names one of `words`.
fn offences(folder: &str, words: &[&str], except: &[&str]) -> Vec<String> {
    let dir = root().join("src").join(folder);
    let mut found = Vec::new();
    for path in rust_files(&dir) {
        let relative = path
            .strip_prefix(root())
            .unwrap_or(&path)
            .to_string_lossy()
            .replace('\\', "/");
        if except
            .iter()
            .any(|e| relative == *e || (e.ends_with('/') && relative.starts_with(e)))
        {
            continue;
        }
        let text = std::fs::read_to_string(&path).unwrap_or_default();
        for (n, line) in code_lines(&text) {
            for w in words {
                if names(&line, w) {
                    found.push(format!("{relative}:{n}: names `{w}`: {}", line.trim()));
                }
            }
        }
    }
    found
}

/// Every (file, line, text) under `src/<folder>` that contains one of `needles` as text.
fn offences_text(folder: &str, needles: &[&str]) -> Vec<String> {
    rust_files(&root().join("src").join(folder))
        .iter()
        .flat_map(|path| path_offences(path, needles))
        .collect()
}

/// The same for one file, `src/<file>`.
fn file_offences(file: &str, needles: &[&str]) -> Vec<String> {
    path_offences(&root().join("src").join(file), needles)
}

fn path_offences(path: &std::path::Path, needles: &[&str]) -> Vec<String> {
    let text = std::fs::read_to_string(path).unwrap_or_default();
    let mut found = Vec::new();
    for (n, line) in code_lines(&text) {
        for needle in needles {
            if line.contains(needle) {
                found.push(format!(
                    "{}:{n}: contains `{needle}`: {}",
                    path.display(),
                    line.trim()
                ));
            }
        }
    }
    found
}

/// What a leaf module (the engine, the colour science) must never name: no GUI, no
/// serialisation, no I/O, no threads, no logging (house style, "Engine").
const LEAF_FORBIDDEN: &[&str] = &[
    "egui",
    "eframe",
    "rfd",
    "serde",
    "serde_json",
    "ron",
    "println",
    "eprintln",
    "dbg",
    "spawn",
];

#[test]
fn engine_knows_only_graphs() {
    // No GUI, no serialisation, no I/O, no threads, no logging (house style, "Engine").
    let words = LEAF_FORBIDDEN;
    let mut found = offences("engine", words, &[]);
    found.extend(offences_text(
        "engine",
        &[
            "std::fs",
            "std::thread",
            "std::net",
            "std::process",
            "std::io",
            "crate::doc",
            "crate::geo::",
            "crate::geo;",
            "crate::geo,",
            "crate::ui",
            "crate::cli",
            "crate::worker",
            "crate::export",
            "crate::colour",
        ],
    ));
    assert!(
        found.is_empty(),
        "the engine must stay free of these:\n{}",
        found.join("\n")
    );
}

#[test]
fn document_knows_no_gui() {
    let mut found = offences("doc", &["egui", "eframe", "rfd"], &[]);
    found.extend(offences_text(
        "doc",
        &[
            "crate::ui",
            "crate::worker",
            "crate::cli",
            "crate::geo::",
            "crate::geo;",
            "crate::geo,",
            "crate::export",
            "std::thread",
        ],
    ));
    assert!(
        found.is_empty(),
        "the document must not know the GUI or the workers:\n{}",
        found.join("\n")
    );
}

#[test]
fn projections_are_a_leaf() {
    // Map projections are mathematics: the document records one, the importers choose one, so
    // they can use nothing above them (and nothing else in the crate).
    let mut found = offences("projection", LEAF_FORBIDDEN, &[]);
    found.extend(offences_text(
        "projection",
        &[
            "std::fs",
            "std::thread",
            "std::net",
            "std::process",
            "std::io",
            "crate::",
        ],
    ));
    assert!(
        found.is_empty(),
        "src/projection must stay a leaf:\n{}",
        found.join("\n")
    );
}

#[test]
fn colour_is_a_leaf() {
    // Like the engine: colour science only, no I/O, no GUI, nothing else from the crate.
    let words = LEAF_FORBIDDEN;
    let mut found = offences("colour", words, &[]);
    found.extend(offences_text(
        "colour",
        &[
            "std::fs",
            "std::thread",
            "std::net",
            "std::process",
            "std::io",
            "crate::",
        ],
    ));
    assert!(
        found.is_empty(),
        "src/colour must stay a leaf:\n{}",
        found.join("\n")
    );
}

#[test]
fn export_looks_only_down() {
    // Export sits beside `formats`: it uses doc, colour and geo, never the GUI, workers or CLI,
    // and writes no files itself (callers do).
    let mut found = offences(
        "export",
        &["egui", "eframe", "rfd", "println", "eprintln"],
        &[],
    );
    found.extend(offences_text(
        "export",
        &[
            "crate::ui",
            "crate::cli",
            "crate::worker",
            "crate::formats",
            "std::fs",
            "std::thread",
        ],
    ));
    assert!(
        found.is_empty(),
        "src/export must only use the layers below it:\n{}",
        found.join("\n")
    );
}

#[test]
fn only_export_knows_the_picture_crates() {
    // The PNG and PDF writers (resvg, svg2pdf, pdf-writer) are export's business: the editor and
    // the command line ask for bytes through `export`.
    let mut found = Vec::new();
    for folder in [
        "engine", "colour", "doc", "geo", "analysis", "worker", "ui", "cli",
    ] {
        found.extend(offences(
            folder,
            &["resvg", "usvg", "svg2pdf", "pdf_writer", "tiny_skia"],
            &[],
        ));
    }
    assert!(
        found.is_empty(),
        "picture crates belong in src/export only:\n{}",
        found.join("\n")
    );
}

#[test]
fn analysis_looks_only_down_and_the_command_line_does_not_use_the_worker() {
    // One analysis for both front ends: it uses doc, engine and colour, and knows nothing of
    // threads, the GUI, the worker or the command line; the command line calls it directly.
    let mut found = offences(
        "analysis",
        &["egui", "eframe", "rfd", "println", "eprintln", "spawn"],
        &[],
    );
    found.extend(offences_text(
        "analysis",
        &[
            "crate::ui",
            "crate::cli",
            "crate::worker",
            "crate::formats",
            "std::fs",
            "std::thread",
        ],
    ));
    found.extend(offences_text("cli", &["crate::worker", "worker::"]));
    assert!(
        found.is_empty(),
        "src/analysis must only use the layers below it, and src/cli not the worker:\n{}",
        found.join("\n")
    );
}

#[test]
fn importers_worker_formats_and_session_look_only_down() {
    // geo builds documents from files: it knows the document and the geometry, nothing above.
    let mut found = offences(
        "geo",
        &["egui", "eframe", "rfd", "println", "eprintln"],
        &[],
    );
    found.extend(offences_text(
        "geo",
        &[
            "crate::ui",
            "crate::cli",
            "crate::worker",
            "crate::analysis",
            "crate::export",
            "crate::formats",
            "crate::session",
            "std::thread",
        ],
    ));
    // The worker runs jobs; it knows no GUI and no command line.
    found.extend(offences("worker", &["egui", "eframe", "rfd"], &[]));
    found.extend(offences_text("worker", &["crate::ui", "crate::cli"]));
    // formats.rs and session.rs serve both front ends, so they name neither (nor the worker).
    for file in ["formats.rs", "session.rs"] {
        found.extend(file_offences(
            file,
            &[
                "crate::ui",
                "crate::cli",
                "crate::worker",
                "egui",
                "std::thread",
            ],
        ));
    }
    // Leaves: the geometry and the atomic writer use nothing else in the crate.
    for file in ["geometry.rs", "atomic.rs"] {
        found.extend(file_offences(file, &["crate::"]));
    }
    assert!(found.is_empty(), "a layer looks up:\n{}", found.join("\n"));
}

#[test]
fn anyhow_is_only_for_the_front_ends() {
    // Library errors are typed enums that carry their evidence; `anyhow` only where they are
    // turned into messages for people (house style, "Errors").
    let mut found = Vec::new();
    for folder in [
        "engine", "colour", "doc", "geo", "export", "analysis", "worker",
    ] {
        found.extend(offences(folder, &["anyhow"], &[]));
    }
    for file in [
        "formats.rs",
        "session.rs",
        "atomic.rs",
        "geometry.rs",
        "lib.rs",
    ] {
        found.extend(file_offences(file, &["anyhow"]));
    }
    assert!(
        found.is_empty(),
        "anyhow belongs in src/cli and src/ui only:\n{}",
        found.join("\n")
    );
}

#[test]
fn only_the_project_file_module_knows_ron() {
    let mut found = Vec::new();
    for folder in [
        "engine", "colour", "doc", "geo", "export", "analysis", "worker", "ui", "cli",
    ] {
        found.extend(offences(folder, &["ron"], &["src/doc/file/"]));
    }
    assert!(
        found.is_empty(),
        "only src/doc/file/ may use RON:\n{}",
        found.join("\n")
    );
}

#[test]
fn only_the_user_interface_knows_the_gui_crates() {
    let mut found = Vec::new();
    for folder in [
        "engine", "colour", "doc", "geo", "export", "analysis", "worker", "cli",
    ] {
        found.extend(offences(folder, &["egui", "eframe", "rfd"], &[]));
    }
    assert!(
        found.is_empty(),
        "GUI crates belong in src/ui only:\n{}",
        found.join("\n")
    );
}

#[test]
fn the_checker_catches_an_offence() {
    // The scanner itself must work, or the tests above prove nothing.
    assert!(names("use egui::Ui;", "egui"));
    assert!(!names("use eguix::Ui;", "egui"));
    assert!(
        code_lines("let a = 1; // egui")
            .iter()
            .all(|(_, l)| !names(l, "egui"))
    );
}

/// The modules of `src/ui` (as paths such as `app` or `panels::canvas`; a folder's `mod.rs` is
/// the folder) and, for each, the modules of `src/ui` it names: `crate::ui::a::b`, `super::a`
/// (from the module's parent) or, in a folder's `mod.rs`, a child `a::`.
fn ui_imports() -> std::collections::BTreeMap<String, std::collections::BTreeSet<String>> {
    let dir = root().join("src/ui");
    let module_of = |path: &std::path::Path| -> String {
        let rel = path.strip_prefix(&dir).unwrap().with_extension("");
        let mut parts: Vec<String> = rel
            .components()
            .map(|c| c.as_os_str().to_string_lossy().into_owned())
            .collect();
        if parts.last().is_some_and(|p| p == "mod") {
            parts.pop();
        }
        parts.join("::")
    };
    let files = rust_files(&dir);
    let modules: std::collections::BTreeSet<String> = files
        .iter()
        .map(|p| module_of(p))
        .filter(|m| !m.is_empty())
        .collect();
    // The longest module that `path` (segments after the `ui` root) starts with.
    let resolve = |path: &[String]| -> Option<String> {
        (1..=path.len())
            .rev()
            .map(|n| path[..n].join("::"))
            .find(|m| modules.contains(m))
    };
    let segments = |rest: &str| -> Vec<String> {
        rest.split("::")
            .map(|s| {
                s.chars()
                    .take_while(|c| c.is_ascii_alphanumeric() || *c == '_')
                    .collect::<String>()
            })
            .take_while(|s| !s.is_empty())
            .collect()
    };
    let mut graph = std::collections::BTreeMap::new();
    for path in &files {
        let module = module_of(path);
        if module.is_empty() {
            continue; // src/ui/mod.rs only declares and wires the modules
        }
        let is_folder = path.file_stem().is_some_and(|s| s == "mod");
        // `super` from a file is the folder it is in; from a folder's `mod.rs`, the folder's parent.
        let parent: Vec<String> = {
            let mut p: Vec<String> = module.split("::").map(str::to_string).collect();
            p.pop();
            p
        };
        let text = std::fs::read_to_string(path).unwrap();
        // A file's unit tests (`use super::*` names the file itself) are not its imports.
        let text = text.split("#[cfg(test)]").next().unwrap_or_default();
        let mut uses = std::collections::BTreeSet::new();
        for (_, line) in code_lines(text) {
            let mut found = |prefix: &str, base: &[String]| {
                let mut rest = line.as_str();
                while let Some(at) = rest.find(prefix) {
                    let before = rest[..at].chars().last();
                    rest = &rest[at + prefix.len()..];
                    if before.is_some_and(|c| c.is_ascii_alphanumeric() || c == '_' || c == ':') {
                        continue;
                    }
                    let mut full = base.to_vec();
                    full.extend(segments(rest));
                    if let Some(m) = resolve(&full)
                        && m != module
                    {
                        uses.insert(m);
                    }
                }
            };
            found("crate::ui::", &[]);
            found("super::", &parent);
            if is_folder {
                let children = modules.iter().filter(|m| {
                    m.strip_prefix(&format!("{module}::"))
                        .is_some_and(|c| !c.contains("::"))
                });
                for child in children {
                    let name = child.rsplit("::").next().unwrap();
                    let base: Vec<String> = child.split("::").map(str::to_string).collect();
                    found(&format!("{name}::"), &base);
                }
            }
        }
        graph.insert(module, uses);
    }
    graph
}

/// A circle in the graph, if there is one (as the list of its modules).
fn circle(
    graph: &std::collections::BTreeMap<String, std::collections::BTreeSet<String>>,
) -> Option<Vec<String>> {
    fn visit(
        node: &str,
        graph: &std::collections::BTreeMap<String, std::collections::BTreeSet<String>>,
        path: &mut Vec<String>,
        done: &mut std::collections::BTreeSet<String>,
    ) -> Option<Vec<String>> {
        if let Some(i) = path.iter().position(|n| n == node) {
            let mut found = path[i..].to_vec();
            found.push(node.to_string());
            return Some(found);
        }
        if done.contains(node) {
            return None;
        }
        path.push(node.to_string());
        for next in graph.get(node).into_iter().flatten() {
            if let Some(found) = visit(next, graph, path, done) {
                return Some(found);
            }
        }
        path.pop();
        done.insert(node.to_string());
        None
    }
    let mut done = std::collections::BTreeSet::new();
    graph
        .keys()
        .find_map(|n| visit(n, graph, &mut Vec::new(), &mut done))
}

#[test]
fn the_user_interface_has_no_circle_of_imports() {
    // The app holds the panels' and windows' state and draws them; they import the frame and the
    // shared state, never the app, so nothing they do can reach past the frame.
    let graph = ui_imports();
    assert!(graph.len() >= 20, "{graph:?}");
    assert!(
        graph["panels::canvas"].contains("frame")
            && graph["app"].contains("panels")
            && graph["panels"].contains("panels::canvas"),
        "the reader sees imports: {graph:?}"
    );
    if let Some(found) = circle(&graph) {
        panic!("a circle of imports in src/ui: {}", found.join(" -> "));
    }
    // The check finds one when there is one.
    let mut with_circle = graph.clone();
    with_circle
        .get_mut("panels::canvas")
        .unwrap()
        .insert("app".to_string());
    assert!(circle(&with_circle).is_some());
}

#[test]
fn panels_and_windows_draw_from_the_frame_and_never_reach_the_app() {
    // Every panel and window gets a read-only frame and sends actions: none of them imports the
    // app, so none can write the session, the document or another panel's state mid-frame.
    let graph = ui_imports();
    let drawn: Vec<&String> = graph
        .keys()
        .filter(|m| m.starts_with("panels::") || m.starts_with("dialogs::"))
        .collect();
    assert!(
        drawn.len() >= 14,
        "one module per panel and window: {drawn:?}"
    );
    for module in drawn {
        assert!(
            !graph[module].contains("app"),
            "{module} imports the app: {:?}",
            graph[module]
        );
    }
    let dir = root().join("src/ui");
    for folder in ["panels", "dialogs"] {
        for path in rust_files(&dir.join(folder)) {
            let text = std::fs::read_to_string(&path).unwrap();
            for (n, line) in code_lines(&text) {
                assert!(
                    !line.contains("&mut App") && !line.contains("&mut Session"),
                    "{}:{n} takes the app or the session to write: {line}",
                    path.display()
                );
            }
        }
    }
}
