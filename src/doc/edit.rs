//! Edits: the only way a [`Document`] changes. Applying an edit returns its inverse, so undo is
//! "apply the inverse" and redo is "apply the inverse of the inverse".

use std::collections::BTreeMap;
use std::sync::Arc;

use super::model::{
    AttrValue, Border, Document, Geometry, Group, GroupId, Palette, Point, Region, RegionId,
    RegionPair, Role, Settings,
};

/// One change to a region's fields.
#[derive(Clone, Debug, PartialEq)]
pub enum RegionChange {
    Name(String),
    Role(Role),
    Anchor(Point),
    Geometry(Option<Arc<Geometry>>),
    Pin(Option<u32>),
    Group(Option<GroupId>),
    /// Sets (`Some`) or removes (`None`) one attribute, such as the parent unit.
    Attribute {
        name: String,
        value: Option<AttrValue>,
    },
}

/// A change to the document. Each variant sets something to a value; its inverse sets it back.
#[derive(Clone, Debug, PartialEq)]
pub enum Edit {
    /// Insert (`Some`, id unused), replace (`Some`, id used) or delete (`None`) a region. Deleting also
    /// deletes its borders and its colour, and the inverse restores them.
    PutRegion {
        id: RegionId,
        region: Option<Region>,
    },
    /// Change one field of an existing region.
    UpdateRegion {
        id: RegionId,
        change: RegionChange,
    },
    /// Insert, replace or delete the border between two existing regions.
    PutBorder {
        pair: RegionPair,
        border: Option<Border>,
    },
    /// Colour a region with a palette slot, or remove its colour.
    PutColour {
        id: RegionId,
        slot: Option<u32>,
    },
    /// Replace the whole colouring (adopting a computed colouring is one edit).
    SetColouring(BTreeMap<RegionId, u32>),
    /// Insert, rename or delete a same-colour group. Deleting ungroups its members (restored on undo).
    PutGroup {
        id: GroupId,
        group: Option<Group>,
    },
    SetPalette(Palette),
    SetSettings(Settings),
    SetTitle(String),
    /// Several edits as one undo step. Applied in order; if one fails, those before it are rolled back.
    Batch {
        label: String,
        edits: Vec<Edit>,
    },
}

/// Why an edit was refused. The document is unchanged when an edit is refused.
///
/// Colour slots are deliberately not checked against the palette: a palette may shrink while
/// regions still use its old slots, and an inverse edit must always apply. Slots the palette lacks
/// are reported by the colouring checks instead.
///
/// Colour slots are deliberately not checked against the palette: a palette may shrink while
/// regions still use its old slots, and an inverse edit must always apply. Slots the palette lacks
/// are reported by the colouring checks instead.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum EditError {
    #[error("there is no region {0}")]
    NoSuchRegion(RegionId),
    #[error("there is no group {0}")]
    NoSuchGroup(GroupId),
    #[error("region {0} has coordinates that are not finite numbers")]
    NotFinite(RegionId),
}

/// What an edit changed, for updating derived data without a rebuild.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Touched {
    /// Something that affects every region or border (settings, palette).
    pub everything: bool,
    /// Regions whose fields, colour or existence may have changed.
    pub regions: std::collections::BTreeSet<RegionId>,
    /// Borders that may have been added, changed or removed.
    pub pairs: std::collections::BTreeSet<RegionPair>,
}

impl Touched {
    /// Adds what `edit` names. Call it with an edit and with its inverse: between them they name
    /// everything before and after (a deleted region's borders appear only in the inverse).
    pub fn add(&mut self, edit: &Edit) {
        match edit {
            Edit::PutRegion { id, .. }
            | Edit::UpdateRegion { id, .. }
            | Edit::PutColour { id, .. } => {
                self.regions.insert(*id);
            }
            Edit::PutBorder { pair, .. } => {
                self.pairs.insert(*pair);
            }
            Edit::SetColouring(colouring) => self.regions.extend(colouring.keys().copied()),
            Edit::PutGroup { .. } | Edit::SetTitle(_) => {}
            Edit::SetPalette(_) | Edit::SetSettings(_) => self.everything = true,
            Edit::Batch { edits, .. } => edits.iter().for_each(|e| self.add(e)),
        }
    }
}

impl Edit {
    /// True when this edit, applied, was undone by `inverse` that is the edit itself: nothing
    /// changed. A batch changed nothing when each of its edits changed nothing (its inverse
    /// holds their inverses newest first).
    pub fn changes_nothing(&self, inverse: &Edit) -> bool {
        match (self, inverse) {
            (Edit::Batch { edits, .. }, Edit::Batch { edits: undo, .. }) => {
                edits.len() == undo.len()
                    && edits
                        .iter()
                        .zip(undo.iter().rev())
                        .all(|(e, u)| e.changes_nothing(u))
            }
            (Edit::Batch { edits, .. }, single) => {
                edits.len() == 1 && edits[0].changes_nothing(single)
            }
            (edit, inverse) => edit == inverse,
        }
    }

    /// A short description for undo and redo menus.
    pub fn label(&self) -> String {
        match self {
            Edit::PutRegion {
                region: Some(_), ..
            } => "Add or replace region".into(),
            Edit::PutRegion { region: None, .. } => "Delete region".into(),
            Edit::UpdateRegion { change, .. } => match change {
                RegionChange::Name(_) => "Rename region",
                RegionChange::Role(_) => "Change land or water",
                RegionChange::Anchor(_) => "Move marker",
                RegionChange::Geometry(_) => "Change outline",
                RegionChange::Pin(_) => "Pin colour",
                RegionChange::Group(_) => "Change group",
                RegionChange::Attribute { .. } => "Change attribute",
            }
            .into(),
            Edit::PutBorder {
                border: Some(_), ..
            } => "Set border".into(),
            Edit::PutBorder { border: None, .. } => "Delete border".into(),
            Edit::PutColour { .. } => "Colour region".into(),
            Edit::SetColouring(_) => "Apply colouring".into(),
            Edit::PutGroup { group: Some(_), .. } => "Set group".into(),
            Edit::PutGroup { group: None, .. } => "Delete group".into(),
            Edit::SetPalette(_) => "Change palette".into(),
            Edit::SetSettings(_) => "Change settings".into(),
            Edit::SetTitle(_) => "Rename project".into(),
            Edit::Batch { label, .. } => label.clone(),
        }
    }
}

impl Document {
    /// Applies `edit` and returns the edit that undoes it. On error nothing changes.
    /// Every successful call increases the revision by one.
    pub fn apply(&mut self, edit: Edit) -> Result<Edit, EditError> {
        let inverse = self.apply_inner(edit)?;
        self.revision += 1;
        Ok(inverse)
    }

    fn apply_inner(&mut self, edit: Edit) -> Result<Edit, EditError> {
        Ok(match edit {
            Edit::PutRegion {
                id,
                region: Some(region),
            } => {
                if region.geometry.as_ref().is_some_and(|g| !g.is_finite())
                    || !(region.anchor[0].is_finite() && region.anchor[1].is_finite())
                {
                    return Err(EditError::NotFinite(id));
                }
                if let Some(g) = region.group
                    && !self.groups.contains_key(&g)
                {
                    return Err(EditError::NoSuchGroup(g));
                }
                self.next_region_id = self.next_region_id.max(id.0 + 1);
                let old = self.regions.insert(id, region);
                if old.is_none() {
                    self.structure_changed();
                }
                Edit::PutRegion { id, region: old }
            }
            Edit::PutRegion { id, region: None } => {
                let (region, colour) = self
                    .regions
                    .remove(&id)
                    .ok_or(EditError::NoSuchRegion(id))?;
                self.structure_changed();
                let mut restore = vec![Edit::PutRegion {
                    id,
                    region: Some(region),
                }];
                for (pair, border) in self.borders.remove_all_of(id) {
                    restore.push(Edit::PutBorder {
                        pair,
                        border: Some(border),
                    });
                }
                if let Some(slot) = colour {
                    restore.push(Edit::PutColour {
                        id,
                        slot: Some(slot),
                    });
                }
                if restore.len() == 1 {
                    restore.pop().unwrap_or(Edit::Batch {
                        label: String::new(),
                        edits: Vec::new(),
                    })
                } else {
                    Edit::Batch {
                        label: "Delete region".into(),
                        edits: restore,
                    }
                }
            }
            Edit::UpdateRegion { id, change } => {
                // Validate before borrowing the region mutably.
                match &change {
                    RegionChange::Group(Some(g)) if !self.groups.contains_key(g) => {
                        return Err(EditError::NoSuchGroup(*g));
                    }
                    RegionChange::Anchor(p) if !(p[0].is_finite() && p[1].is_finite()) => {
                        return Err(EditError::NotFinite(id));
                    }
                    RegionChange::Geometry(Some(g)) if !g.is_finite() => {
                        return Err(EditError::NotFinite(id));
                    }
                    _ => {}
                }
                let region = self
                    .regions
                    .get_mut(&id)
                    .ok_or(EditError::NoSuchRegion(id))?;
                let old = match change {
                    RegionChange::Name(v) => {
                        RegionChange::Name(std::mem::replace(&mut region.name, v))
                    }
                    RegionChange::Role(v) => {
                        RegionChange::Role(std::mem::replace(&mut region.role, v))
                    }
                    RegionChange::Anchor(v) => {
                        RegionChange::Anchor(std::mem::replace(&mut region.anchor, v))
                    }
                    RegionChange::Geometry(v) => {
                        RegionChange::Geometry(std::mem::replace(&mut region.geometry, v))
                    }
                    RegionChange::Pin(v) => {
                        RegionChange::Pin(std::mem::replace(&mut region.pin, v))
                    }
                    RegionChange::Group(v) => {
                        RegionChange::Group(std::mem::replace(&mut region.group, v))
                    }
                    RegionChange::Attribute { name, value } => {
                        let old = match value {
                            Some(v) => region.attributes.insert(name.clone(), v),
                            None => region.attributes.remove(&name),
                        };
                        RegionChange::Attribute { name, value: old }
                    }
                };
                Edit::UpdateRegion { id, change: old }
            }
            Edit::PutBorder { pair, border } => {
                for id in [pair.a(), pair.b()] {
                    if !self.regions.contains_key(&id) {
                        return Err(EditError::NoSuchRegion(id));
                    }
                }
                let added = border.is_some();
                let old = match border {
                    Some(b) => self.borders.insert(pair, b),
                    None => self.borders.remove(&pair),
                };
                if added != old.is_some() {
                    self.structure_changed();
                }
                Edit::PutBorder { pair, border: old }
            }
            Edit::PutColour { id, slot } => {
                let old = self
                    .regions
                    .set_colour(&id, slot)
                    .ok_or(EditError::NoSuchRegion(id))?;
                Edit::PutColour { id, slot: old }
            }
            Edit::SetColouring(colouring) => {
                if let Some(id) = colouring.keys().find(|id| !self.regions.contains_key(id)) {
                    return Err(EditError::NoSuchRegion(*id));
                }
                Edit::SetColouring(self.regions.replace_colouring(&colouring))
            }
            Edit::PutGroup {
                id,
                group: Some(group),
            } => {
                self.next_group_id = self.next_group_id.max(id.0 + 1);
                Edit::PutGroup {
                    id,
                    group: self.groups.insert(id, group),
                }
            }
            Edit::PutGroup { id, group: None } => {
                let group = self.groups.remove(&id).ok_or(EditError::NoSuchGroup(id))?;
                let mut restore = vec![Edit::PutGroup {
                    id,
                    group: Some(group),
                }];
                for (rid, region) in self.regions.iter_mut().filter(|(_, r)| r.group == Some(id)) {
                    region.group = None;
                    restore.push(Edit::UpdateRegion {
                        id: *rid,
                        change: RegionChange::Group(Some(id)),
                    });
                }
                if restore.len() == 1 {
                    restore.pop().unwrap_or(Edit::Batch {
                        label: String::new(),
                        edits: Vec::new(),
                    })
                } else {
                    Edit::Batch {
                        label: "Delete group".into(),
                        edits: restore,
                    }
                }
            }
            Edit::SetPalette(palette) => {
                Edit::SetPalette(std::mem::replace(&mut self.palette, palette))
            }
            Edit::SetSettings(settings) => {
                Edit::SetSettings(std::mem::replace(&mut self.settings, settings))
            }
            Edit::SetTitle(title) => Edit::SetTitle(std::mem::replace(&mut self.title, title)),
            Edit::Batch { label, edits } => {
                let mut inverses = Vec::with_capacity(edits.len());
                for edit in edits {
                    match self.apply_inner(edit) {
                        Ok(inverse) => inverses.push(inverse),
                        Err(e) => {
                            // Roll back what this batch already did, newest first.
                            for inverse in inverses.into_iter().rev() {
                                let undone = self.apply_inner(inverse);
                                debug_assert!(undone.is_ok(), "rolling back a batch cannot fail");
                            }
                            return Err(e);
                        }
                    }
                }
                inverses.reverse();
                Edit::Batch {
                    label,
                    edits: inverses,
                }
            }
        })
    }

    /// Regions or borders were added or removed: the border index must be derived again. (Other
    /// edits, colours and fields included, leave it as it is.)
    fn structure_changed(&mut self) {
        self.index = std::sync::OnceLock::new();
    }

    /// An edit that adds a new region with a fresh id; returns the id it will get.
    pub fn add_region_edit(&self, region: Region) -> (RegionId, Edit) {
        let id = self.peek_region_id();
        (
            id,
            Edit::PutRegion {
                id,
                region: Some(region),
            },
        )
    }

    /// An edit that creates a new group with a fresh id; returns the id it will get.
    pub fn add_group_edit(&self, name: impl Into<String>) -> (GroupId, Edit) {
        let id = self.peek_group_id();
        (
            id,
            Edit::PutGroup {
                id,
                group: Some(Group { name: name.into() }),
            },
        )
    }

    /// An edit that removes the border between two regions the way a user means it: a hand-made
    /// border is deleted; a derived one (shared or corner) is kept on record as suppressed.
    /// Returns `None` when there is no such border or it is already suppressed.
    pub fn remove_border_edit(&self, pair: RegionPair) -> Option<Edit> {
        let border = self.borders.get(&pair)?;
        match border.kind {
            super::model::BorderKind::Manual => Some(Edit::PutBorder { pair, border: None }),
            _ if border.suppressed => None,
            _ => Some(Edit::PutBorder {
                pair,
                border: Some(Border {
                    suppressed: true,
                    ..*border
                }),
            }),
        }
    }

    /// An edit that makes two regions border each other the way a user means it: a suppressed
    /// derived border is restored; otherwise a hand-made border is added. `None` when they already
    /// border each other.
    pub fn add_border_edit(&self, pair: RegionPair) -> Option<Edit> {
        match self.borders.get(&pair) {
            Some(b) if b.suppressed => Some(Edit::PutBorder {
                pair,
                border: Some(Border {
                    suppressed: false,
                    ..*b
                }),
            }),
            Some(_) => None,
            None => Some(Edit::PutBorder {
                pair,
                border: Some(Border::manual()),
            }),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::model::BorderKind;

    fn two_regions() -> Document {
        let mut doc = Document::new("t");
        for name in ["A", "B"] {
            let (_, e) = doc.add_region_edit(Region::new(name, [0.0, 0.0]));
            doc.apply(e).unwrap();
        }
        doc
    }

    #[test]
    fn deleting_a_region_takes_its_borders_and_colour_and_undo_restores_them() {
        let mut doc = two_regions();
        let pair = RegionPair::new(RegionId(1), RegionId(2)).unwrap();
        doc.apply(Edit::PutBorder {
            pair,
            border: Some(Border::shared(3.0)),
        })
        .unwrap();
        doc.apply(Edit::PutColour {
            id: RegionId(1),
            slot: Some(2),
        })
        .unwrap();
        let before = doc.clone();
        let inverse = doc
            .apply(Edit::PutRegion {
                id: RegionId(1),
                region: None,
            })
            .unwrap();
        assert!(doc.borders.is_empty() && doc.colouring().is_empty());
        doc.apply(inverse).unwrap();
        assert_eq!(doc, before);
    }

    #[test]
    fn failed_batch_leaves_document_unchanged() {
        let mut doc = two_regions();
        let before = doc.clone();
        let revision = doc.revision();
        let err = doc
            .apply(Edit::Batch {
                label: "x".into(),
                edits: vec![
                    Edit::SetTitle("changed".into()),
                    Edit::PutColour {
                        id: RegionId(99),
                        slot: Some(1),
                    },
                ],
            })
            .unwrap_err();
        assert_eq!(err, EditError::NoSuchRegion(RegionId(99)));
        assert_eq!(doc, before);
        assert_eq!(doc.revision(), revision);
    }

    #[test]
    fn removing_derived_border_suppresses_it_and_adding_restores_it() {
        let mut doc = two_regions();
        let pair = RegionPair::new(RegionId(2), RegionId(1)).unwrap();
        doc.apply(Edit::PutBorder {
            pair,
            border: Some(Border::shared(3.0)),
        })
        .unwrap();
        doc.apply(doc.remove_border_edit(pair).unwrap()).unwrap();
        assert!(doc.borders[&pair].suppressed);
        assert_eq!(doc.active_borders().count(), 0);
        doc.apply(doc.add_border_edit(pair).unwrap()).unwrap();
        assert_eq!(
            doc.borders[&pair],
            Border {
                kind: BorderKind::Shared,
                length: 3.0,
                suppressed: false
            }
        );
    }

    #[test]
    fn region_ids_are_never_reused() {
        let mut doc = two_regions();
        doc.apply(Edit::PutRegion {
            id: RegionId(2),
            region: None,
        })
        .unwrap();
        let (id, _) = doc.add_region_edit(Region::new("C", [0.0, 0.0]));
        assert_eq!(id, RegionId(3));
    }
}
