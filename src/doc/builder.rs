//! Building a fresh document in one pass, for the loaders (project files, graph files, importers):
//! everything is collected, sorted once and checked once, so a million regions load in linear
//! time after the sort. Editing an existing document goes through [`crate::doc::Edit`] instead.

use std::collections::BTreeMap;
use std::sync::{Arc, OnceLock};

use super::model::{
    Border, Document, Group, GroupId, Palette, Region, RegionId, RegionPair, Settings,
};
use super::store::{BorderIndex, Borders, Regions, SlotLookup};

/// Why the collected parts do not make a document. The words name ids as the file does.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum BuildError {
    #[error("group id {0} appears twice")]
    DuplicateGroup(GroupId),
    #[error("region id {0} appears twice")]
    DuplicateRegion(RegionId),
    #[error("region {region} is in group {group}, which the file does not define")]
    UndefinedGroup { region: RegionId, group: GroupId },
    #[error("the border between {} and {} appears twice", .0.a(), .0.b())]
    DuplicateBorder(RegionPair),
    #[error("a border names region {missing}, which the file does not define")]
    BorderToMissingRegion { missing: RegionId },
    #[error("the colouring names region {0}, which the file does not define")]
    ColourOfMissingRegion(RegionId),
    #[error("region {0} is coloured twice")]
    DuplicateColour(RegionId),
}

/// Collects the parts of a new document; [`DocumentBuilder::build`] checks and assembles them.
#[derive(Debug, Default)]
pub struct DocumentBuilder {
    title: String,
    settings: Settings,
    palette: Palette,
    groups: Vec<(GroupId, Group)>,
    regions: Vec<(RegionId, Region)>,
    borders: Vec<(RegionPair, Border)>,
    colours: Vec<(RegionId, u32)>,
    next_region_id: u64,
    next_group_id: u64,
}

impl DocumentBuilder {
    /// An empty project with the default palette and settings.
    pub fn new(title: impl Into<String>) -> DocumentBuilder {
        DocumentBuilder {
            title: title.into(),
            next_region_id: 1,
            next_group_id: 1,
            ..Default::default()
        }
    }
    pub fn settings(&mut self, settings: Settings) -> &mut Self {
        self.settings = settings;
        self
    }
    pub fn palette(&mut self, palette: Palette) -> &mut Self {
        self.palette = palette;
        self
    }
    /// Room for this many regions and borders.
    pub fn reserve(&mut self, regions: usize, borders: usize) -> &mut Self {
        self.regions.reserve(regions);
        self.borders.reserve(borders);
        self
    }
    pub fn group(&mut self, id: GroupId, group: Group) -> &mut Self {
        self.groups.push((id, group));
        self
    }
    pub fn region(&mut self, id: RegionId, region: Region) -> &mut Self {
        self.regions.push((id, region));
        self
    }
    pub fn border(&mut self, pair: RegionPair, border: Border) -> &mut Self {
        self.borders.push((pair, border));
        self
    }
    pub fn colour(&mut self, id: RegionId, slot: u32) -> &mut Self {
        self.colours.push((id, slot));
        self
    }
    /// The id counters start at least here (a project file records them, so ids of deleted
    /// regions are not handed out again).
    pub fn next_ids(&mut self, region: u64, group: u64) -> &mut Self {
        self.next_region_id = self.next_region_id.max(region);
        self.next_group_id = self.next_group_id.max(group);
        self
    }

    /// Sorts and checks what was collected and makes the document (at revision 0).
    ///
    /// # Complexity
    /// O((R + B) log (R + B)) for R regions and B borders, dominated by the sorts.
    pub fn build(self) -> Result<Document, BuildError> {
        let mut groups = self.groups;
        sort_by_id(&mut groups, |(id, _)| *id);
        if let Some(w) = groups.windows(2).find(|w| w[0].0 == w[1].0) {
            return Err(BuildError::DuplicateGroup(w[0].0));
        }
        let groups: BTreeMap<GroupId, Group> = groups.into_iter().collect();

        let mut regions = self.regions;
        sort_by_id(&mut regions, |(id, _)| *id);
        if let Some(w) = regions.windows(2).find(|w| w[0].0 == w[1].0) {
            return Err(BuildError::DuplicateRegion(w[0].0));
        }
        for (id, region) in &regions {
            if let Some(g) = region.group
                && !groups.contains_key(&g)
            {
                return Err(BuildError::UndefinedGroup {
                    region: *id,
                    group: g,
                });
            }
        }

        let mut colours = self.colours;
        sort_by_id(&mut colours, |(id, _)| *id);
        if let Some(w) = colours.windows(2).find(|w| w[0].0 == w[1].0) {
            return Err(BuildError::DuplicateColour(w[0].0));
        }
        // Regions and colours are both in id order: merge them.
        let mut entries = Vec::with_capacity(regions.len());
        let mut colour_iter = colours.into_iter().peekable();
        for (id, region) in regions {
            if let Some(&(cid, _)) = colour_iter.peek()
                && cid < id
            {
                return Err(BuildError::ColourOfMissingRegion(cid));
            }
            let colour = match colour_iter.peek() {
                Some(&(cid, slot)) if cid == id => {
                    colour_iter.next();
                    Some(slot)
                }
                _ => None,
            };
            entries.push((id, region, colour));
        }
        if let Some((cid, _)) = colour_iter.next() {
            return Err(BuildError::ColourOfMissingRegion(cid));
        }
        let regions = Regions::from_sorted(entries);

        let mut borders = self.borders;
        sort_by_id(&mut borders, |(pair, _)| *pair);
        if let Some(w) = borders.windows(2).find(|w| w[0].0 == w[1].0) {
            return Err(BuildError::DuplicateBorder(w[0].0));
        }
        // Check every border's regions and note their slots: the border index comes for free.
        let lookup = SlotLookup::new(regions.ids());
        let mut ends = Vec::with_capacity(borders.len());
        for (pair, _) in &borders {
            let slot = |end: RegionId| {
                lookup
                    .slot(end)
                    .map(|s| s as u32)
                    .ok_or(BuildError::BorderToMissingRegion { missing: end })
            };
            ends.push((slot(pair.a())?, slot(pair.b())?));
        }
        let index = OnceLock::new();
        let _ = index.set(Arc::new(BorderIndex::from_ends(regions.len(), ends)));
        let borders = Borders::from_sorted(borders);

        let next_region_id = self
            .next_region_id
            .max(regions.ids().last().map_or(1, |id| id.0 + 1));
        let next_group_id = self
            .next_group_id
            .max(groups.keys().next_back().map_or(1, |id| id.0 + 1));
        Ok(Document {
            title: self.title,
            settings: self.settings,
            palette: self.palette,
            groups,
            regions,
            borders,
            next_region_id,
            next_group_id,
            revision: 0,
            index,
        })
    }
}

/// Sorts by key unless already sorted (files written by Tinct are): equal keys are refused
/// afterwards, so the order among them does not matter.
fn sort_by_id<T, K: Ord>(items: &mut [T], key: impl Fn(&T) -> K) {
    if !items.is_sorted_by_key(&key) {
        items.sort_unstable_by_key(key);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parts_in_any_order_make_the_same_document_as_edits() {
        let mut b = DocumentBuilder::new("t");
        let pair = RegionPair::new(RegionId(2), RegionId(1)).unwrap();
        b.region(RegionId(2), Region::new("B", [1.0, 0.0]))
            .region(RegionId(1), Region::new("A", [0.0, 0.0]))
            .border(pair, Border::manual())
            .colour(RegionId(2), 1);
        let built = b.build().unwrap();

        let mut edited = Document::new("t");
        for name in ["A", "B"] {
            let (_, e) = edited.add_region_edit(Region::new(name, [0.0, 0.0]));
            edited.apply(e).unwrap();
        }
        edited
            .apply(crate::doc::Edit::UpdateRegion {
                id: RegionId(2),
                change: crate::doc::RegionChange::Anchor([1.0, 0.0]),
            })
            .unwrap();
        edited
            .apply(crate::doc::Edit::PutBorder {
                pair,
                border: Some(Border::manual()),
            })
            .unwrap();
        edited
            .apply(crate::doc::Edit::PutColour {
                id: RegionId(2),
                slot: Some(1),
            })
            .unwrap();
        assert_eq!(built, edited);
        assert_eq!(built.peek_region_id(), RegionId(3));
    }

    #[test]
    fn inconsistent_parts_are_refused_with_the_id() {
        let mut b = DocumentBuilder::new("t");
        b.region(RegionId(1), Region::new("A", [0.0, 0.0]))
            .colour(RegionId(7), 0);
        assert_eq!(
            b.build().unwrap_err(),
            BuildError::ColourOfMissingRegion(RegionId(7))
        );
        let mut b = DocumentBuilder::new("t");
        b.region(RegionId(1), Region::new("A", [0.0, 0.0])).border(
            RegionPair::new(RegionId(1), RegionId(5)).unwrap(),
            Border::manual(),
        );
        assert_eq!(
            b.build().unwrap_err().to_string(),
            "a border names region 5, which the file does not define"
        );
        let mut b = DocumentBuilder::new("t");
        b.region(RegionId(3), Region::new("A", [0.0, 0.0]))
            .region(RegionId(3), Region::new("B", [0.0, 0.0]));
        assert_eq!(
            b.build().unwrap_err(),
            BuildError::DuplicateRegion(RegionId(3))
        );
    }
}
