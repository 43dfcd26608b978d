//! Colours that follow a hierarchy, for a document: each region's parent unit is read from one of
//! its attributes (or a leading part of it, as in hierarchical codes: the first two digits of a
//! US county's FIPS code name its state), parents get families and regions tints
//! ([`crate::engine::colouring::hierarchy`]), and the result is one undoable edit that sets a
//! palette of families ([`crate::colour::family_palette`]) and the colouring.

use std::collections::BTreeMap;

use crate::colour::families::{MAX_FAMILIES, MAX_TINTS, family_palette};
use crate::doc::{ConstraintGraph, Document, Edit, Palette, ParentKey, RegionId, Rgb, Slot};
use crate::engine::colouring::{HierarchyReport, SolveOptions, arrange_tints, hierarchy_colouring};

use super::Control;

/// Why the map cannot be coloured by parent unit.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum HierarchyFailure {
    #[error("{count} land regions have no {key} (the parent unit), such as {examples}")]
    NoParent {
        key: String,
        count: usize,
        examples: String,
    },
    #[error("the same-colour group of {regions} spans the parent units {parents}")]
    GroupAcrossParents { regions: String, parents: String },
    #[error(
        "the map needs {families} families of {tints} tints; a palette of families offers at most {max_families} families and {max_tints} tints"
    )]
    TooMany {
        families: u32,
        tints: u32,
        max_families: usize,
        max_tints: usize,
    },
    #[error("the map has no land regions to colour")]
    Empty,
    #[error("{0}")]
    Engine(String),
}

/// A colouring by parent unit, ready to apply.
#[derive(Debug, Clone)]
pub struct HierarchyOutcome {
    pub report: HierarchyReport,
    /// The parent units, in the engine's order (sorted).
    pub parents: Vec<String>,
    /// Each parent unit's family (0-based), by name.
    pub family_of: BTreeMap<String, u32>,
    /// One undoable edit: the palette of families and the colouring.
    pub edit: Edit,
    /// Regions pinned to a slot: pins are not part of this colouring (they keep their pin, and
    /// the colouring may give them another fill).
    pub pins_ignored: usize,
    /// Neighbours across parent borders whose fills a reader may confuse (below the palette
    /// check's thresholds in some view), before and after the tints were arranged against it.
    pub clashes_before: usize,
    pub clashes_after: usize,
    /// Pairs of neighbours across parent borders, in all.
    pub across: usize,
}

impl HierarchyOutcome {
    /// In words: "4 families (proven fewest) of 4 tints (proven fewest) for 12 parent units".
    pub fn summary(&self) -> String {
        let proven = |p: bool| if p { " (proven fewest)" } else { "" };
        let r = &self.report;
        format!(
            "{} famil{}{} of {} tint{}{} for {} parent unit{}",
            r.families,
            if r.families == 1 { "y" } else { "ies" },
            proven(r.families_proven),
            r.tints,
            if r.tints == 1 { "" } else { "s" },
            proven(r.tints_proven),
            self.parents.len(),
            if self.parents.len() == 1 { "" } else { "s" }
        )
    }
}

/// Colours `doc` so that colours follow the parent units named by `key`.
pub fn colour_by_parent(
    doc: &Document,
    key: &ParentKey,
    options: &SolveOptions,
    control: &Control,
) -> Result<HierarchyOutcome, HierarchyFailure> {
    let cg = ConstraintGraph::build(doc);
    let n = cg.vertex_count();
    if n == 0 {
        return Err(HierarchyFailure::Empty);
    }
    // Each vertex's parent: every member of a group must agree.
    let mut missing: Vec<&str> = Vec::new();
    let mut missing_count = 0;
    let mut vertex_parent: Vec<String> = Vec::with_capacity(n);
    for v in 0..n as u32 {
        let mut parents: Vec<String> = Vec::new();
        for id in cg.members(v) {
            let region = &doc.regions()[id];
            match region
                .attributes
                .get(&key.field)
                .and_then(|a| key.parent_of(a))
            {
                Some(p) => parents.push(p),
                None => {
                    missing_count += 1;
                    if missing.len() < 5 {
                        missing.push(region.name.as_str());
                    }
                }
            }
        }
        parents.sort();
        parents.dedup();
        if parents.len() > 1 {
            let names: Vec<&str> = cg
                .members(v)
                .iter()
                .map(|id| doc.regions()[id].name.as_str())
                .collect();
            return Err(HierarchyFailure::GroupAcrossParents {
                regions: names.join(", "),
                parents: parents.join(", "),
            });
        }
        vertex_parent.push(parents.pop().unwrap_or_default());
    }
    if missing_count > 0 {
        return Err(HierarchyFailure::NoParent {
            key: key.to_string(),
            count: missing_count,
            examples: missing.join(", "),
        });
    }
    let parents: Vec<String> = {
        let mut p = vertex_parent.clone();
        p.sort();
        p.dedup();
        p
    };
    let index: BTreeMap<&str, u32> = parents
        .iter()
        .enumerate()
        .map(|(i, p)| (p.as_str(), i as u32))
        .collect();
    let parent_of: Vec<u32> = vertex_parent.iter().map(|p| index[p.as_str()]).collect();
    let mut report = hierarchy_colouring(
        &cg.graph,
        &parent_of,
        parents.len(),
        options,
        control.cancel,
        &mut |done, total| {
            let stage = if done == 0 {
                "Colouring the parent units".to_string()
            } else {
                format!(
                    "Colouring the regions of parent unit {done} of {}",
                    total - 1
                )
            };
            (control.progress)(&stage, done as f64 / total as f64)
        },
    )
    .map_err(|e| HierarchyFailure::Engine(e.to_string()))?;
    let fills = family_palette(report.families as usize, report.tints as usize).ok_or(
        HierarchyFailure::TooMany {
            families: report.families,
            tints: report.tints,
            max_families: MAX_FAMILIES,
            max_tints: MAX_TINTS,
        },
    )?;
    // Across parent borders, tints arranged so that as few neighbouring fills as possible are
    // ones a reader may confuse (in any view the palette check uses for this map).
    let thresholds = crate::doc::palette_check::thresholds(doc);
    let clashes: Vec<Vec<bool>> = fills
        .iter()
        .map(|a| {
            fills
                .iter()
                .map(|b| {
                    let d = crate::colour::pair_difference(a.colour, b.colour);
                    thresholds.views().any(|v| {
                        d.in_view(v) < crate::colour::PairDifference::threshold(v, &thresholds)
                    })
                })
                .collect()
        })
        .collect();
    let clash = |a: u32, b: u32| clashes[a as usize][b as usize];
    let (clashes_before, clashes_after) = arrange_tints(&cg.graph, &parent_of, &mut report, &clash);
    let palette = Palette {
        name: format!(
            "{} families of {} tints by {key}",
            report.families, report.tints
        ),
        slots: fills
            .iter()
            .map(|f| Slot {
                name: f.name.clone(),
                colour: Rgb(f.colour),
            })
            .collect(),
    };
    let vertex_slots: Vec<Option<u32>> = (0..n as u32)
        .map(|v| Some(report.slot(&parent_of, v)))
        .collect();
    let colouring: BTreeMap<RegionId, u32> = cg.to_region_colouring(&vertex_slots);
    let family_of = parents
        .iter()
        .enumerate()
        .map(|(i, p)| (p.clone(), report.family_of_parent[i]))
        .collect();
    let pins_ignored = doc.land_regions().filter(|(_, r)| r.pin.is_some()).count();
    Ok(HierarchyOutcome {
        report,
        parents,
        family_of,
        edit: Edit::Batch {
            label: format!("Colour by parent unit ({key})"),
            edits: vec![Edit::SetPalette(palette), Edit::SetColouring(colouring)],
        },
        pins_ignored,
        clashes_before,
        clashes_after,
        across: cg
            .graph
            .edges()
            .filter(|&(u, v)| parent_of[u as usize] != parent_of[v as usize])
            .count(),
    })
}
