//! DIMACS and edge-list input, checked against the DIMACS graph format's published description:
//! "Clique and Coloring Problems Graph Format" (DIMACS Implementation Challenge, 1993), which
//! specifies comment lines `c ...`, one problem line `p FORMAT NODES EDGES` with FORMAT `edge`,
//! edge lines `e W V` with nodes numbered 1..NODES, and optional node lines `n ID VALUE`.

use tinct::doc::graph_formats::{read_dimacs, read_edge_list, write_dimacs, write_edge_list};
use tinct::doc::{BorderKind, ConstraintGraph, RegionId, RegionPair};

/// A small instance written out by hand in the format's published layout: the 5-cycle with a hub
/// (the wheel W5), with a comment, a node line and one edge listed in both directions.
const WHEEL: &str = "c hand-written wheel: hub 6, rim 1-2-3-4-5\n\
c second comment line\n\
p edge 6 11\n\
n 6 1\n\
e 1 2\ne 2 3\ne 3 4\ne 4 5\ne 5 1\n\
e 6 1\ne 6 2\ne 6 3\ne 6 4\ne 6 5\n\
e 2 1\n";

#[test]
fn reads_the_hand_written_dimacs_instance() {
    let (doc, notices) = read_dimacs(WHEEL, "wheel").unwrap();
    assert_eq!(doc.regions().len(), 6);
    // Vertices keep their DIMACS numbers as region ids and names.
    assert_eq!(doc.regions()[&RegionId(6)].name, "6");
    assert_eq!(doc.borders().len(), 10);
    assert!(doc.borders().values().all(|b| b.kind == BorderKind::Manual));
    for rim in 1..=5 {
        assert!(
            doc.borders()
                .contains_key(&RegionPair::new(RegionId(6), RegionId(rim)).unwrap())
        );
    }
    // 11 edge lines declared and listed, 10 distinct: the repeat is reported, not an error.
    let text: Vec<&str> = notices.iter().map(|n| n.message.as_str()).collect();
    assert!(text.iter().any(|m| m.contains("repeated edge")), "{text:?}");
    assert!(text.iter().any(|m| m.contains("node lines")), "{text:?}");
}

#[test]
fn dimacs_errors_name_the_line() {
    let cases = [
        ("p edge 3 1\ne 1 x\n", 2, "whole number"),
        ("e 1 2\np edge 3 1\n", 1, "before the problem line"),
        ("p edge 3 1\ne 1 4\n", 2, "out of range"),
        ("p edge 3 1\ne 0 1\n", 2, "out of range"),
        ("p edge 3 1\nq 1 2\n", 2, "unknown line type"),
        ("p edge 3 1\np edge 3 1\n", 2, "second problem line"),
        ("p clique 3 1\n", 1, "problem format"),
        ("p edge 3 1\ne 1 2 3\n", 2, "unexpected"),
        ("c only a comment\n", 1, "no problem line"),
    ];
    for (text, line, words) in cases {
        let err = read_dimacs(text, "t").unwrap_err();
        assert_eq!(err.line, line, "{text:?}: {err}");
        assert!(err.message.contains(words), "{text:?}: {err}");
    }
}

#[test]
fn declared_edge_count_that_does_not_match_is_reported() {
    let (_, notices) = read_dimacs("p edge 3 7\ne 1 2\n", "t").unwrap();
    assert!(
        notices
            .iter()
            .any(|n| n.line == Some(1) && n.message.contains("declares 7 edges"))
    );
}

#[test]
fn dimacs_and_edge_list_round_trip_through_a_project() {
    let (doc, _) = read_dimacs(WHEEL, "wheel").unwrap();
    let (again, _) = read_dimacs(&write_dimacs(&doc), "wheel").unwrap();
    let a = ConstraintGraph::build(&doc);
    let b = ConstraintGraph::build(&again);
    assert_eq!(a.graph, b.graph);
    let (from_list, _) = read_edge_list(&write_edge_list(&doc), "wheel").unwrap();
    assert_eq!(ConstraintGraph::build(&from_list).graph, a.graph);
}

#[test]
fn edge_list_errors_name_the_line() {
    let cases = [
        ("", 1, "empty"),
        ("3\n", 1, "second whole number"),
        ("3 1\n0 5\n", 2, "out of range"),
        ("3 1\n0 1 2\n", 2, "unexpected"),
        ("3 1\n# fine\n0 -1\n", 3, "whole number"),
    ];
    for (text, line, words) in cases {
        let err = read_edge_list(text, "t").unwrap_err();
        assert_eq!(err.line, line, "{text:?}: {err}");
        assert!(err.message.contains(words), "{text:?}: {err}");
    }
}
