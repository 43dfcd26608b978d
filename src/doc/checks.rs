//! Checks of the document's current colouring against its rules: clashes between neighbours, land
//! left uncoloured, pins not honoured, groups split across colours.

use super::model::{Document, RegionId, RegionPair};

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
/// O((R + B) log R).
pub fn check_colouring(doc: &Document) -> ColouringCheck {
    let mut out = ColouringCheck::default();
    for (pair, _) in doc.active_borders() {
        if let (Some(&x), Some(&y)) = (doc.colouring.get(&pair.a()), doc.colouring.get(&pair.b()))
            && x == y
        {
            out.clashes.push(Clash { pair, slot: x });
        }
    }
    for (id, region) in doc.land_regions() {
        let colour = doc.colouring.get(&id).copied();
        match colour {
            None => out.uncoloured.push(id),
            Some(slot) if slot as usize >= doc.palette.slots.len() => out.slots_missing.push(id),
            Some(_) => {}
        }
        if let Some(pinned) = region.pin
            && colour != Some(pinned)
        {
            out.pins_broken.push(PinBroken {
                region: id,
                pinned,
                coloured: colour,
            });
        }
    }
    for group in doc.groups.keys() {
        let members = doc.group_members(*group);
        let land: Vec<RegionId> = members
            .into_iter()
            .filter(|id| doc.regions[id].role == super::model::Role::Land)
            .collect();
        let mut colours: Vec<Option<u32>> = land
            .iter()
            .map(|id| doc.colouring.get(id).copied())
            .collect();
        colours.sort();
        colours.dedup();
        if colours.len() > 1 {
            out.groups_split.push((*group, land));
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
