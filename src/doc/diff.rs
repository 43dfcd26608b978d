//! The edits that turn one document into another, as one undoable step: how recovered work is
//! put back on top of the file it came from, so that undo returns to the file as saved.

use std::collections::BTreeSet;

use super::edit::Edit;
use super::model::{Document, RegionId};

/// One [`Edit::Batch`] (labelled `label`) that, applied to `from`, gives a document whose
/// content equals `to`'s (title, settings, palette, groups, regions, borders and colouring).
/// Empty when they are equal already. The order keeps every step valid: groups are added
/// before regions join them, removed regions take their borders with them, and groups are
/// removed last.
pub fn edits_between(from: &Document, to: &Document, label: &str) -> Edit {
    let mut edits = Vec::new();
    if from.title() != to.title() {
        edits.push(Edit::SetTitle(to.title().to_string()));
    }
    if from.settings() != to.settings() {
        edits.push(Edit::SetSettings(*to.settings()));
    }
    if from.palette() != to.palette() {
        edits.push(Edit::SetPalette(to.palette().clone()));
    }
    for (id, group) in to.groups() {
        if from.groups().get(id) != Some(group) {
            edits.push(Edit::PutGroup {
                id: *id,
                group: Some(group.clone()),
            });
        }
    }
    for (id, _) in from.regions().iter() {
        if !to.regions().contains_key(id) {
            edits.push(Edit::PutRegion {
                id: *id,
                region: None,
            });
        }
    }
    for (id, region) in to.regions().iter() {
        if from.regions().get(id) != Some(region) {
            edits.push(Edit::PutRegion {
                id: *id,
                region: Some(region.clone()),
            });
        }
    }
    // Borders of regions that stay (a removed region's borders went with it).
    let pairs: BTreeSet<_> = from
        .borders()
        .keys()
        .filter(|p| to.regions().contains_key(&p.a()) && to.regions().contains_key(&p.b()))
        .chain(to.borders().keys())
        .copied()
        .collect();
    for pair in pairs {
        let (was, now) = (from.borders().get(&pair), to.borders().get(&pair));
        if was != now {
            edits.push(Edit::PutBorder {
                pair,
                border: now.cloned(),
            });
        }
    }
    let colouring = |d: &Document| -> Vec<(RegionId, u32)> {
        d.colouring().iter().map(|(id, s)| (*id, *s)).collect()
    };
    if colouring(from) != colouring(to) {
        edits.push(Edit::SetColouring(colouring(to).into_iter().collect()));
    }
    for id in from.groups().keys() {
        if !to.groups().contains_key(id) {
            edits.push(Edit::PutGroup {
                id: *id,
                group: None,
            });
        }
    }
    Edit::Batch {
        label: label.to_string(),
        edits,
    }
}
