//! Dense storage behind the document: regions in id order in plain vectors with their colours
//! beside them, borders as a sorted vector of region pairs, and an index derived once per revision
//! (the dense position of every region, the two positions of every border, the borders of every
//! region). Read through map-like views; written only by the edits and the builder.

use std::collections::BTreeMap;
use std::ops::Index;

use super::model::{Border, Region, RegionId, RegionPair};

/// The regions of a document in ascending id order, each with its colour (a palette slot).
///
/// Lookups by id are binary searches over a dense array of ids; [`Regions::slot`] gives the
/// position (the *slot*) that the derived index and the analysis use. Slots move when regions are
/// deleted, so they are never saved or shown: ids are the stable names.
#[derive(Clone, Debug, Default)]
pub struct Regions {
    ids: Vec<RegionId>,
    items: Vec<Region>,
    colours: Vec<Option<u32>>,
    coloured: usize,
}

impl PartialEq for Regions {
    /// Regions and colours compare as content; the colour count is bookkeeping.
    fn eq(&self, other: &Regions) -> bool {
        self.ids == other.ids && self.items == other.items && self.colours == other.colours
    }
}

impl Regions {
    /// Number of regions.
    pub fn len(&self) -> usize {
        self.ids.len()
    }
    /// True when there are none.
    pub fn is_empty(&self) -> bool {
        self.ids.is_empty()
    }
    /// The dense position of `id`, if the document has it.
    #[inline]
    pub fn slot(&self, id: &RegionId) -> Option<usize> {
        self.ids.binary_search(id).ok()
    }
    /// The region with this id.
    pub fn get(&self, id: &RegionId) -> Option<&Region> {
        self.slot(id).map(|s| &self.items[s])
    }
    /// True when the document has a region with this id.
    pub fn contains_key(&self, id: &RegionId) -> bool {
        self.slot(id).is_some()
    }
    /// `(id, region)` in ascending id order.
    pub fn iter(
        &self,
    ) -> impl DoubleEndedIterator<Item = (&RegionId, &Region)> + ExactSizeIterator + Clone {
        self.ids.iter().zip(self.items.iter())
    }
    /// The ids, ascending.
    pub fn keys(&self) -> std::slice::Iter<'_, RegionId> {
        self.ids.iter()
    }
    /// The regions, in id order.
    pub fn values(&self) -> std::slice::Iter<'_, Region> {
        self.items.iter()
    }
    /// The ids as a slice (position = slot).
    pub fn ids(&self) -> &[RegionId] {
        &self.ids
    }
    /// The region at a slot.
    pub fn at(&self, slot: usize) -> (RegionId, &Region) {
        (self.ids[slot], &self.items[slot])
    }
    /// The colour at a slot.
    #[inline]
    pub fn colour_at(&self, slot: usize) -> Option<u32> {
        self.colours[slot]
    }

    /// Inserts or replaces a region (a replaced region keeps its colour). Appending in id order is
    /// O(1); inserting in the middle moves the later entries.
    pub(super) fn insert(&mut self, id: RegionId, region: Region) -> Option<Region> {
        match self.ids.binary_search(&id) {
            Ok(s) => Some(std::mem::replace(&mut self.items[s], region)),
            Err(s) => {
                self.ids.insert(s, id);
                self.items.insert(s, region);
                self.colours.insert(s, None);
                None
            }
        }
    }
    /// Removes a region with its colour.
    pub(super) fn remove(&mut self, id: &RegionId) -> Option<(Region, Option<u32>)> {
        let s = self.slot(id)?;
        self.ids.remove(s);
        let colour = self.colours.remove(s);
        if colour.is_some() {
            self.coloured -= 1;
        }
        Some((self.items.remove(s), colour))
    }
    pub(super) fn get_mut(&mut self, id: &RegionId) -> Option<&mut Region> {
        let s = self.slot(id)?;
        Some(&mut self.items[s])
    }
    pub(super) fn iter_mut(&mut self) -> impl Iterator<Item = (&RegionId, &mut Region)> {
        self.ids.iter().zip(self.items.iter_mut())
    }
    /// Sets or clears one colour; `None` when the region does not exist.
    pub(super) fn set_colour(&mut self, id: &RegionId, slot: Option<u32>) -> Option<Option<u32>> {
        let s = self.slot(id)?;
        let old = std::mem::replace(&mut self.colours[s], slot);
        self.coloured = self.coloured + usize::from(slot.is_some()) - usize::from(old.is_some());
        Some(old)
    }
    /// Replaces the whole colouring; every id must exist (checked by the caller).
    pub(super) fn replace_colouring(
        &mut self,
        colouring: &BTreeMap<RegionId, u32>,
    ) -> BTreeMap<RegionId, u32> {
        let old = Colouring { regions: self }.to_map();
        self.colours.iter_mut().for_each(|c| *c = None);
        // Both sides are in id order: one merge pass.
        let mut s = 0;
        for (id, &slot) in colouring {
            while s < self.ids.len() && self.ids[s] < *id {
                s += 1;
            }
            if s < self.ids.len() && self.ids[s] == *id {
                self.colours[s] = Some(slot);
            }
        }
        self.coloured = colouring.len();
        old
    }
    /// Builds from ids in ascending order with no id twice (checked by the builder), the
    /// regions and the colours in the same order.
    pub(super) fn from_parts(
        ids: Vec<RegionId>,
        items: Vec<Region>,
        colours: Vec<Option<u32>>,
    ) -> Regions {
        debug_assert!(ids.windows(2).all(|w| w[0] < w[1]));
        debug_assert!(ids.len() == items.len() && ids.len() == colours.len());
        let coloured = colours.iter().filter(|c| c.is_some()).count();
        Regions {
            ids,
            items,
            colours,
            coloured,
        }
    }
}

impl<'a> IntoIterator for &'a Regions {
    type Item = (&'a RegionId, &'a Region);
    type IntoIter = std::iter::Zip<std::slice::Iter<'a, RegionId>, std::slice::Iter<'a, Region>>;
    fn into_iter(self) -> Self::IntoIter {
        self.ids.iter().zip(self.items.iter())
    }
}

impl Index<&RegionId> for Regions {
    type Output = Region;
    fn index(&self, id: &RegionId) -> &Region {
        match self.get(id) {
            Some(r) => r,
            None => panic!("no region {id}"),
        }
    }
}

/// The current colouring: region to palette slot. Land regions without an entry are uncoloured.
/// A view over the regions' colours, read like a map.
#[derive(Clone, Copy, Debug)]
pub struct Colouring<'a> {
    regions: &'a Regions,
}

impl<'a> Colouring<'a> {
    pub(super) fn of(regions: &'a Regions) -> Colouring<'a> {
        Colouring { regions }
    }
    /// The colour of a region.
    pub fn get(&self, id: &RegionId) -> Option<&'a u32> {
        let s = self.regions.slot(id)?;
        self.regions.colours[s].as_ref()
    }
    /// True when the region has a colour.
    pub fn contains_key(&self, id: &RegionId) -> bool {
        self.get(id).is_some()
    }
    /// Number of coloured regions.
    pub fn len(&self) -> usize {
        self.regions.coloured
    }
    /// True when no region has a colour.
    pub fn is_empty(&self) -> bool {
        self.regions.coloured == 0
    }
    /// `(id, slot)` for every coloured region, in id order.
    pub fn iter(&self) -> impl DoubleEndedIterator<Item = (&'a RegionId, &'a u32)> + Clone + 'a {
        self.regions
            .ids
            .iter()
            .zip(self.regions.colours.iter())
            .filter_map(|(id, c)| c.as_ref().map(|c| (id, c)))
    }
    /// The coloured regions' ids.
    pub fn keys(&self) -> impl Iterator<Item = &'a RegionId> + 'a {
        self.iter().map(|(id, _)| id)
    }
    /// The colours, in id order.
    pub fn values(&self) -> impl Iterator<Item = &'a u32> + 'a {
        self.regions.colours.iter().flatten()
    }
    /// A copy as an ordered map (for an edit, or to compare).
    pub fn to_map(&self) -> BTreeMap<RegionId, u32> {
        self.iter().map(|(id, c)| (*id, *c)).collect()
    }
}

impl Index<&RegionId> for Colouring<'_> {
    type Output = u32;
    fn index(&self, id: &RegionId) -> &u32 {
        match self.get(id) {
            Some(c) => c,
            None => panic!("region {id} has no colour"),
        }
    }
}

impl PartialEq<BTreeMap<RegionId, u32>> for Colouring<'_> {
    fn eq(&self, other: &BTreeMap<RegionId, u32>) -> bool {
        self.len() == other.len() && self.iter().eq(other.iter())
    }
}

impl PartialEq<Colouring<'_>> for BTreeMap<RegionId, u32> {
    fn eq(&self, other: &Colouring<'_>) -> bool {
        other == self
    }
}

impl PartialEq for Colouring<'_> {
    fn eq(&self, other: &Colouring<'_>) -> bool {
        self.len() == other.len() && self.iter().eq(other.iter())
    }
}

/// The recorded borders, sorted by region pair.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Borders {
    pairs: Vec<RegionPair>,
    items: Vec<Border>,
}

impl Borders {
    /// Number of recorded borders (active or not).
    pub fn len(&self) -> usize {
        self.pairs.len()
    }
    /// True when there are none.
    pub fn is_empty(&self) -> bool {
        self.pairs.is_empty()
    }
    /// The position of a pair in the sorted list.
    #[inline]
    pub fn position(&self, pair: &RegionPair) -> Option<usize> {
        self.pairs.binary_search(pair).ok()
    }
    /// The border between two regions.
    pub fn get(&self, pair: &RegionPair) -> Option<&Border> {
        self.position(pair).map(|i| &self.items[i])
    }
    /// True when the pair has a recorded border.
    pub fn contains_key(&self, pair: &RegionPair) -> bool {
        self.position(pair).is_some()
    }
    /// `(pair, border)` in pair order.
    pub fn iter(
        &self,
    ) -> impl DoubleEndedIterator<Item = (&RegionPair, &Border)> + ExactSizeIterator + Clone {
        self.pairs.iter().zip(self.items.iter())
    }
    /// The pairs, sorted.
    pub fn keys(&self) -> std::slice::Iter<'_, RegionPair> {
        self.pairs.iter()
    }
    /// The borders, in pair order.
    pub fn values(&self) -> std::slice::Iter<'_, Border> {
        self.items.iter()
    }
    /// The border at a position.
    pub fn at(&self, i: usize) -> (RegionPair, &Border) {
        (self.pairs[i], &self.items[i])
    }

    pub(super) fn insert(&mut self, pair: RegionPair, border: Border) -> Option<Border> {
        match self.pairs.binary_search(&pair) {
            Ok(i) => Some(std::mem::replace(&mut self.items[i], border)),
            Err(i) => {
                self.pairs.insert(i, pair);
                self.items.insert(i, border);
                None
            }
        }
    }
    pub(super) fn remove(&mut self, pair: &RegionPair) -> Option<Border> {
        let i = self.position(pair)?;
        self.pairs.remove(i);
        Some(self.items.remove(i))
    }
    /// Removes every border of `id`, returning them in pair order.
    pub(super) fn remove_all_of(&mut self, id: RegionId) -> Vec<(RegionPair, Border)> {
        let mut removed = Vec::new();
        let mut keep = 0;
        for i in 0..self.pairs.len() {
            if self.pairs[i].contains(id) {
                removed.push((self.pairs[i], self.items[i]));
            } else {
                self.pairs.swap(keep, i);
                self.items.swap(keep, i);
                keep += 1;
            }
        }
        self.pairs.truncate(keep);
        self.items.truncate(keep);
        removed
    }
    /// Builds from pairs in ascending order with none twice (checked by the builder) and the
    /// borders in the same order.
    pub(super) fn from_parts(pairs: Vec<RegionPair>, items: Vec<Border>) -> Borders {
        debug_assert!(pairs.windows(2).all(|w| w[0] < w[1]));
        Borders { pairs, items }
    }
}

impl<'a> IntoIterator for &'a Borders {
    type Item = (&'a RegionPair, &'a Border);
    type IntoIter = std::iter::Zip<std::slice::Iter<'a, RegionPair>, std::slice::Iter<'a, Border>>;
    fn into_iter(self) -> Self::IntoIter {
        self.pairs.iter().zip(self.items.iter())
    }
}

impl Index<&RegionPair> for Borders {
    type Output = Border;
    fn index(&self, pair: &RegionPair) -> &Border {
        match self.get(pair) {
            Some(b) => b,
            None => panic!("no border between {} and {}", pair.a(), pair.b()),
        }
    }
}

/// What is derived from the regions and borders once per revision: the slots of every border's
/// two regions, and for every region the positions of its borders (compressed rows, neighbours
/// in ascending id order).
#[derive(Debug, Default)]
pub struct BorderIndex {
    /// `(slot of a, slot of b)` per border position.
    pub ends: Vec<(u32, u32)>,
    offsets: Vec<u32>,
    incident: Vec<u32>,
}

impl BorderIndex {
    pub(super) fn build(regions: &Regions, borders: &Borders) -> BorderIndex {
        let lookup = SlotLookup::new(regions.ids());
        let ends: Vec<(u32, u32)> = borders
            .keys()
            .map(|p| {
                // Borders only join existing regions (edits and the builder check it).
                let a = lookup.slot(p.a()).unwrap_or(0);
                let b = lookup.slot(p.b()).unwrap_or(0);
                (a as u32, b as u32)
            })
            .collect();
        BorderIndex::from_ends(regions.len(), ends)
    }

    /// The index for `n` regions from the slots of every border's two regions.
    pub(super) fn from_ends(n: usize, ends: Vec<(u32, u32)>) -> BorderIndex {
        let mut offsets = vec![0u32; n + 1];
        for &(a, b) in &ends {
            offsets[a as usize + 1] += 1;
            offsets[b as usize + 1] += 1;
        }
        for s in 0..n {
            offsets[s + 1] += offsets[s];
        }
        let mut fill = offsets.clone();
        let mut incident = vec![0u32; 2 * ends.len()];
        for (i, &(a, b)) in ends.iter().enumerate() {
            for s in [a, b] {
                incident[fill[s as usize] as usize] = i as u32;
                fill[s as usize] += 1;
            }
        }
        // Each region's borders in the order of the neighbour's id (= its slot).
        for s in 0..n {
            let row = &mut incident[offsets[s] as usize..offsets[s + 1] as usize];
            row.sort_unstable_by_key(|&i| {
                let (a, b) = ends[i as usize];
                if a as usize == s { b } else { a }
            });
        }
        BorderIndex {
            ends,
            offsets,
            incident,
        }
    }

    /// Positions of the borders of the region at `slot`, by neighbour id.
    pub fn of_slot(&self, slot: usize) -> &[u32] {
        &self.incident[self.offsets[slot] as usize..self.offsets[slot + 1] as usize]
    }
}

/// Id to slot, by a direct table when ids are dense enough (the usual case: ids are handed out
/// from a counter), else by binary search.
pub struct SlotLookup<'a> {
    ids: &'a [RegionId],
    table: Vec<u32>,
}

impl<'a> SlotLookup<'a> {
    /// A lookup for these ascending ids.
    pub fn new(ids: &'a [RegionId]) -> SlotLookup<'a> {
        let top = ids.last().map_or(0, |id| id.0);
        let table = if top < (4 * ids.len() as u64 + 1024).min(u32::MAX as u64) {
            let mut t = vec![u32::MAX; top as usize + 1];
            for (s, id) in ids.iter().enumerate() {
                t[id.0 as usize] = s as u32;
            }
            t
        } else {
            Vec::new()
        };
        SlotLookup { ids, table }
    }
    /// The slot of `id`.
    #[inline]
    pub fn slot(&self, id: RegionId) -> Option<usize> {
        if self.table.is_empty() {
            self.ids.binary_search(&id).ok()
        } else {
            match self.table.get(id.0 as usize) {
                Some(&s) if s != u32::MAX => Some(s as usize),
                _ => None,
            }
        }
    }
}
