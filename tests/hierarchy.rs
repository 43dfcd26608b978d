//! Colours that follow a hierarchy, checked on real data: the US counties within their states
//! (us-atlas 3.0.1, US Census Bureau boundaries, public domain; tests/data/geo/PROVENANCE.md),
//! and the Columbus, Ohio neighbourhoods split east and west by their own EW field (GeoDa sample
//! data via libpysal). Every check here is written from the definition, not from the engine.

use std::collections::{BTreeMap, BTreeSet};

use tinct::analysis::hierarchy::colour_by_parent;
use tinct::doc::{Document, ParentKey, RegionId};
use tinct::engine::colouring::SolveOptions;

use super::support::{root, stderr, tinct, tinct_path};

/// Checks the three rules of a colouring by parent unit on `doc` as coloured, with `parent` the
/// parent unit of each region: neighbours differ; one family per parent; neighbouring parents,
/// different families. Families are read from the palette's slot names ("Plum 2" is family Plum).
/// Returns the number of families and of fills in use.
fn check_by_parent(doc: &Document, parent: &BTreeMap<RegionId, String>) -> (usize, usize) {
    let colouring = doc.colouring();
    let family = |id: &RegionId| {
        let slot = colouring[id];
        let name = &doc.palette().slots[slot as usize].name;
        name.rsplit_once(' ').unwrap().0.to_string()
    };
    let mut family_of: BTreeMap<&str, String> = BTreeMap::new();
    for (id, p) in parent {
        let f = family(id);
        let known = family_of.entry(p.as_str()).or_insert_with(|| f.clone());
        assert_eq!(*known, f, "parent {p}: one family for all its regions");
    }
    for (pair, _) in doc.active_borders() {
        let (a, b) = (pair.a(), pair.b());
        assert_ne!(
            colouring[&a], colouring[&b],
            "neighbours {a} and {b} share a fill"
        );
        if parent[&a] != parent[&b] {
            assert_ne!(
                family(&a),
                family(&b),
                "neighbouring parents {} and {} share a family",
                parent[&a],
                parent[&b]
            );
        }
    }
    let families: BTreeSet<&String> = family_of.values().collect();
    let fills: BTreeSet<u32> = colouring.iter().map(|(_, s)| *s).collect();
    (families.len(), fills.len())
}

#[test]
fn us_counties_within_states_take_families_by_state_and_tints_within() {
    let mut doc = super::relax::counties();
    let key = ParentKey::parse("GEOID:2").unwrap();
    let outcome = tinct::analysis::uncontrolled(|c| {
        colour_by_parent(&doc, &key, &SolveOptions::default(), c)
    })
    .unwrap();
    doc.apply(outcome.edit.clone()).unwrap();
    let parent: BTreeMap<RegionId, String> = doc
        .regions()
        .iter()
        .map(|(id, r)| (*id, r.name[..2].to_string()))
        .collect();
    check_by_parent(&doc, &parent);
    let r = &outcome.report;
    // The fixture lists the counties with at least one border: those of 54 state and territory
    // codes (Guam and American Samoa have none). The states need four families: Nevada and its five
    // neighbours (Oregon, Idaho, Utah, Arizona, California) form an odd wheel (common practice:
    // a wheel with an odd rim needs four colours; the neighbours are from a general atlas, from
    // memory).
    assert_eq!(outcome.parents.len(), 54);
    assert_eq!(r.families, 4);
    assert!(r.families_proven);
    // Within states, under the queen rule, Florida needs five tints: Glades, Martin, Palm Beach,
    // Okeechobee and Hendry all meet one another (a K5, the obstruction tests/relax.rs finds).
    assert_eq!(r.tints, 5);
    assert!(r.tints_proven, "{}", outcome.summary());
    let (hardest, _) = r.hardest_parent.as_ref().unwrap();
    assert_eq!(
        outcome.parents[*hardest as usize], "12",
        "Florida's FIPS code"
    );
    assert_eq!(doc.palette().slots.len(), 20);
    assert!(
        outcome
            .summary()
            .contains("4 families (proven fewest) of 5 tints (proven fewest)")
    );
    // One undo gives the map back as it was.
    let before = super::relax::counties();
    let mut history_doc = before.clone();
    let inverse = history_doc.apply(outcome.edit.clone()).unwrap();
    history_doc.apply(inverse).unwrap();
    assert_eq!(history_doc.palette(), before.palette());
    assert_eq!(history_doc.colouring().len(), before.colouring().len());
}

#[test]
fn the_command_line_imports_a_parent_field_and_colours_by_it() {
    // Columbus neighbourhoods: EW (1 east, 0 west of the centre) as the parent unit.
    let dir = tempfile::tempdir().unwrap();
    let shp = root().join("tests/data/geo/columbus.shp");
    let project = dir.path().join("columbus.tinct");
    let o = tinct_path(
        &["import"],
        &shp,
        &["--parent-field", "EW", "--out", project.to_str().unwrap()],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let coloured = dir.path().join("by-side.tinct");
    let o = tinct_path(
        &["colour"],
        &project,
        &["--by-parent", "--out", coloured.to_str().unwrap()],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let said = stderr(&o);
    assert!(
        said.contains("families") && said.contains("for 2 parent units"),
        "{said}"
    );
    let doc = tinct::doc::file::load(&coloured).unwrap();
    let parent: BTreeMap<RegionId, String> = doc
        .regions()
        .iter()
        .map(|(id, r)| {
            let p = r
                .attributes
                .get("parent")
                .expect("the import kept the parent unit");
            let key = ParentKey::parse("parent").unwrap();
            (*id, key.parent_of(p).unwrap())
        })
        .collect();
    let (families, fills) = check_by_parent(&doc, &parent);
    // East and west meet: two families.
    assert_eq!(families, 2);

    // The legend groups the fills by family: a row per family, a swatch per tint in use.
    let svg = dir.path().join("by-side.svg");
    let o = tinct_path(
        &["export"],
        &coloured,
        &["--svg", svg.to_str().unwrap(), "--legend"],
    );
    assert!(o.status.success(), "{}", stderr(&o));
    let text = std::fs::read_to_string(&svg).unwrap();
    let xml = roxmltree::Document::parse(&text).unwrap();
    let legend = xml
        .descendants()
        .find(|n| n.attribute("id") == Some("legend"))
        .expect("a legend");
    let rows: Vec<&str> = legend
        .children()
        .filter(|n| n.has_tag_name("text"))
        .filter_map(|n| n.text())
        .collect();
    let swatches = legend.children().filter(|n| n.has_tag_name("rect")).count();
    assert_eq!(rows.len(), 2, "{rows:?}");
    assert_eq!(swatches, fills);
    let names: BTreeSet<String> = doc
        .palette()
        .slots
        .iter()
        .map(|s| s.name.rsplit_once(' ').unwrap().0.to_string())
        .collect();
    assert!(
        rows.iter().all(|r| names.contains(*r)),
        "{rows:?} against {names:?}"
    );

    // A field the file does not have: refused at import, with the fields it has.
    let o = tinct_path(
        &["import"],
        &shp,
        &[
            "--parent-field",
            "STATE",
            "--out",
            project.to_str().unwrap(),
        ],
    );
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(
        stderr(&o).contains("holds the parent units"),
        "{}",
        stderr(&o)
    );
    // A project without parent units: refused by colour, saying how many regions lack one.
    let plain = root().join("sample-maps/three-valleys.tinct");
    let o = tinct_path(
        &["colour"],
        &plain,
        &["--by-parent", "--out", coloured.to_str().unwrap()],
    );
    assert_eq!(o.status.code(), Some(2), "{}", stderr(&o));
    assert!(stderr(&o).contains("have no parent"), "{}", stderr(&o));
    // A malformed key.
    let o = tinct(&[
        "colour",
        "x.tinct",
        "--by-parent",
        "GEOID:two",
        "--out",
        "y.tinct",
    ]);
    assert_eq!(o.status.code(), Some(2));
}
