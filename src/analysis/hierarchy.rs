//! Colours that follow a hierarchy, for a document: each region's parent unit is read from one of
//! its attributes (or a leading part of it, as in hierarchical codes: the first two digits of a
//! US county's FIPS code name its state), parents get families and regions tints
//! ([`crate::engine::colouring::hierarchy`]), and the result is one undoable edit that sets a
//! palette of families ([`crate::colour::family_palette`]) and the colouring.

use std::collections::BTreeMap;

use crate::colour::families::{MAX_FAMILIES, MAX_TINTS, family_palette};
use crate::doc::{AttrValue, ConstraintGraph, Document, Edit, Palette, RegionId, Rgb, Slot};
use crate::engine::colouring::{HierarchyReport, SolveOptions, hierarchy_colouring};

use super::Control;

/// Where a region's parent unit is written: an attribute, or its first `prefix` characters.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ParentKey {
    pub field: String,
    pub prefix: Option<usize>,
}

impl ParentKey {
    /// Reads "STATE" or "GEOID:2" (the first two characters of GEOID).
    pub fn parse(text: &str) -> Result<ParentKey, String> {
        let (field, prefix) = match text.rsplit_once(':') {
            Some((f, n)) => {
                let n: usize = n.trim().parse().map_err(|_| {
                    format!("{n:?} is not a number of leading characters (as in GEOID:2)")
                })?;
                if n == 0 {
                    return Err("the number of leading characters must be at least 1".into());
                }
                (f, Some(n))
            }
            None => (text, None),
        };
        let field = field.trim();
        if field.is_empty() {
            return Err("name the attribute that holds the parent unit (such as STATE)".into());
        }
        Ok(ParentKey {
            field: field.to_string(),
            prefix,
        })
    }

    /// The parent unit named by `value`, if it names one.
    pub fn parent_of(&self, value: &AttrValue) -> Option<String> {
        let text = match value {
            AttrValue::Null => return None,
            AttrValue::Bool(b) => b.to_string(),
            AttrValue::Number(n) if n.fract() == 0.0 && n.abs() < 1e15 => format!("{}", *n as i64),
            AttrValue::Number(n) => n.to_string(),
            AttrValue::Text(t) => t.trim().to_string(),
        };
        if text.is_empty() {
            return None;
        }
        Some(match self.prefix {
            Some(n) => text.chars().take(n).collect(),
            None => text,
        })
    }
}

impl std::fmt::Display for ParentKey {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self.prefix {
            Some(n) => write!(f, "{}:{n}", self.field),
            None => f.write_str(&self.field),
        }
    }
}

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
}

impl HierarchyOutcome {
    /// In words: "4 families (proven fewest) of 4 tints (proven fewest) for 12 parent units".
    pub fn summary(&self) -> String {
        let proven = |p: bool| if p { " (proven fewest)" } else { "" };
        let r = &self.report;
        format!(
            "{} famil{}{} of {} tint{}{} for {} parent units",
            r.families,
            if r.families == 1 { "y" } else { "ies" },
            proven(r.families_proven),
            r.tints,
            if r.tints == 1 { "" } else { "s" },
            proven(r.tints_proven),
            self.parents.len()
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
    let report = hierarchy_colouring(
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
    })
}
