//! Checks of the document's current colouring against its rules: clashes between neighbours, land
//! left uncoloured, pins not honoured, groups split across colours.

use std::collections::BTreeMap;

use super::model::{Document, GroupId, RegionId, RegionPair, Role};

/// Two active neighbours that have the same colour.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Clash {
    pub pair: RegionPair,
    pub slot: u32,
}

/// A region whose colour is not the one it is pinned to.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct PinBroken {
    pub region: RegionId,
    pub pinned: u32,
    pub coloured: Option<u32>,
}

/// Everything wrong with the current colouring.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct ColouringCheck {
    pub clashes: Vec<Clash>,
    /// Land regions with no colour, ascending.
    pub uncoloured: Vec<RegionId>,
    pub pins_broken: Vec<PinBroken>,
    /// Groups whose members do not all have one colour: (group, members), ascending.
    pub groups_split: Vec<(super::model::GroupId, Vec<RegionId>)>,
    /// Coloured regions whose slot the palette does not have.
    pub slots_missing: Vec<RegionId>,
}

impl ColouringCheck {
    /// True when the colouring satisfies every rule and covers all land.
    pub fn is_clean(&self) -> bool {
        self.clashes.is_empty()
            && self.uncoloured.is_empty()
            && self.pins_broken.is_empty()
            && self.groups_split.is_empty()
            && self.slots_missing.is_empty()
    }
}

/// Checks the document's colouring.
///
/// # Complexity
/// O(R + B + G log G) for R regions, B borders and G groups.
pub fn check_colouring(doc: &Document) -> ColouringCheck {
    let mut out = ColouringCheck::default();
    let regions = doc.regions();
    let index = doc.border_index();
    for (i, border) in doc.borders().values().enumerate() {
        let (a, b) = index.ends[i];
        if let (Some(x), Some(y)) = (regions.colour_at(a as usize), regions.colour_at(b as usize))
            && x == y
            && doc.border_is_active_at(border, a, b)
        {
            out.clashes.push(Clash {
                pair: doc.borders().at(i).0,
                slot: x,
            });
        }
    }
    let palette_slots = doc.palette().slots.len();
    // Colours seen per group: the first colour, and whether another one (or none) appeared.
    let mut group_colours: BTreeMap<GroupId, (Option<u32>, bool, Vec<RegionId>)> = BTreeMap::new();
    for (slot, (id, region)) in regions.iter().enumerate() {
        if region.role != Role::Land {
            continue;
        }
        let colour = regions.colour_at(slot);
        match colour {
            None => out.uncoloured.push(*id),
            Some(s) if s as usize >= palette_slots => out.slots_missing.push(*id),
            Some(_) => {}
        }
        if let Some(pinned) = region.pin
            && colour != Some(pinned)
        {
            out.pins_broken.push(PinBroken {
                region: *id,
                pinned,
                coloured: colour,
            });
        }
        if let Some(g) = region.group {
            let entry = group_colours
                .entry(g)
                .or_insert((colour, false, Vec::new()));
            entry.1 |= entry.0 != colour;
            entry.2.push(*id);
        }
    }
    for (group, (_, split, members)) in group_colours {
        if split {
            out.groups_split.push((group, members));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::edit::{Edit, RegionChange};

    #[test]
    fn finds_clash_uncoloured_and_broken_pin() {
        let (mut doc, pair) =
            crate::doc::fixtures::clashing_pair_and_one_uncoloured(["A", "B", "C"]);
        doc.apply(Edit::UpdateRegion {
            id: RegionId(2),
            change: RegionChange::Pin(Some(1)),
        })
        .unwrap();
        let check = check_colouring(&doc);
        assert_eq!(check.clashes, vec![Clash { pair, slot: 0 }]);
        assert_eq!(check.uncoloured, vec![RegionId(3)]);
        assert_eq!(
            check.pins_broken,
            vec![PinBroken {
                region: RegionId(2),
                pinned: 1,
                coloured: Some(0)
            }]
        );
        assert!(!check.is_clean());
    }
}
