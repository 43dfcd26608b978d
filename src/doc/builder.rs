//! Building a fresh document in one pass, for the loaders (project files, graph files, importers):
//! everything is collected, sorted once and checked once, so a million regions load in linear
//! time after the sort. Editing an existing document goes through [`crate::doc::Edit`] instead.

use std::collections::BTreeMap;
use std::sync::{Arc, OnceLock};

use super::model::{
    Border, Crs, Document, Group, GroupId, Note, Palette, Region, RegionId, RegionPair, Settings,
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
    // Ids and regions side by side, as the document keeps them, so that regions given in id
    // order (as files and importers give them) move into the document without a copy.
    region_ids: Vec<RegionId>,
    regions: Vec<Region>,
    border_pairs: Vec<RegionPair>,
    borders: Vec<Border>,
    colours: Vec<(RegionId, u32)>,
    next_region_id: u64,
    next_group_id: u64,
    crs: Option<Crs>,
    notes: Vec<Note>,
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
    /// Notes from importing the map (see [`Document::notes`]).
    pub fn notes(&mut self, notes: Vec<Note>) -> &mut Self {
        self.notes = notes;
        self
    }
    /// The coordinate system of the world units (see [`Document::crs`]).
    pub fn crs(&mut self, crs: Option<Crs>) -> &mut Self {
        self.crs = crs;
        self
    }
    pub fn palette(&mut self, palette: Palette) -> &mut Self {
        self.palette = palette;
        self
    }
    /// Room for this many regions and borders.
    pub fn reserve(&mut self, regions: usize, borders: usize) -> &mut Self {
        self.region_ids.reserve(regions);
        self.regions.reserve(regions);
        self.border_pairs.reserve(borders);
        self.borders.reserve(borders);
        self
    }
    pub fn group(&mut self, id: GroupId, group: Group) -> &mut Self {
        self.groups.push((id, group));
        self
    }
    pub fn region(&mut self, id: RegionId, region: Region) -> &mut Self {
        self.region_ids.push(id);
        self.regions.push(region);
        self
    }
    pub fn border(&mut self, pair: RegionPair, border: Border) -> &mut Self {
        self.border_pairs.push(pair);
        self.borders.push(border);
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

        let (region_ids, regions) = sorted_together(self.region_ids, self.regions);
        if let Some(w) = region_ids.windows(2).find(|w| w[0] == w[1]) {
            return Err(BuildError::DuplicateRegion(w[0]));
        }
        for (id, region) in region_ids.iter().zip(&regions) {
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
        let mut slots = vec![None; region_ids.len()];
        let mut s = 0;
        for (id, slot) in colours {
            while s < region_ids.len() && region_ids[s] < id {
                s += 1;
            }
            if s == region_ids.len() || region_ids[s] != id {
                return Err(BuildError::ColourOfMissingRegion(id));
            }
            slots[s] = Some(slot);
        }
        let regions = Regions::from_parts(region_ids, regions, slots);

        let (border_pairs, borders) = sorted_together(self.border_pairs, self.borders);
        if let Some(w) = border_pairs.windows(2).find(|w| w[0] == w[1]) {
            return Err(BuildError::DuplicateBorder(w[0]));
        }
        // Check every border's regions and note their slots: the border index comes for free.
        let lookup = SlotLookup::new(regions.ids());
        let mut ends = Vec::with_capacity(border_pairs.len());
        for pair in &border_pairs {
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
        let borders = Borders::from_parts(border_pairs, borders);

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
            crs: self.crs,
            notes: self.notes,
        })
    }
}

/// Keys and values sorted by key together; when the keys are already in order (files written by
/// Tinct, importers) both vectors come back as they are, without a copy.
fn sorted_together<K: Ord + Copy, V>(keys: Vec<K>, values: Vec<V>) -> (Vec<K>, Vec<V>) {
    if keys.is_sorted() {
        return (keys, values);
    }
    let mut order: Vec<usize> = (0..keys.len()).collect();
    order.sort_by_key(|&i| keys[i]);
    let mut slots: Vec<Option<V>> = values.into_iter().map(Some).collect();
    let values = order.iter().filter_map(|&i| slots[i].take()).collect();
    let keys = order.iter().map(|&i| keys[i]).collect();
    (keys, values)
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
