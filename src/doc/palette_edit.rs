//! Palette edits for the palette panel and the command line: each helper checks its input and
//! returns an undoable [`Edit`], or an error that says in plain words what is wrong. Slots are
//! 0-based here and numbered from 1 in messages, as the interface shows them.

use crate::colour::DEFAULT_PALETTES;

use super::edit::{Edit, RegionChange};
use super::model::{Document, Palette, Rgb, Slot};

/// Why a palette edit was refused.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum PaletteEditError {
    #[error("{text:?} is not a colour: write six hexadecimal digits, such as #9cc98a")]
    BadHex { text: String },
    #[error("there is no slot {} (the palette has {len})", slot + 1)]
    NoSuchSlot { slot: usize, len: usize },
    #[error("a slot needs a name")]
    EmptyName,
    #[error(
        "slot {} '{name}' is in use ({coloured} coloured, {pinned} pinned regions): recolour or unpin them first",
        slot + 1
    )]
    SlotInUse {
        slot: usize,
        name: String,
        coloured: usize,
        pinned: usize,
    },
    #[error("a palette needs at least one slot")]
    LastSlot,
    #[error("there is no default palette {} (there are {len})", index + 1)]
    NoSuchDefault { index: usize, len: usize },
}

fn parse_hex(text: &str) -> Result<Rgb, PaletteEditError> {
    Rgb::from_hex(text.trim()).ok_or_else(|| PaletteEditError::BadHex {
        text: text.to_string(),
    })
}

fn check_slot(doc: &Document, slot: usize) -> Result<(), PaletteEditError> {
    if slot < doc.palette.slots.len() {
        Ok(())
    } else {
        Err(PaletteEditError::NoSuchSlot {
            slot,
            len: doc.palette.slots.len(),
        })
    }
}

/// Sets slot `slot`'s colour from `#rrggbb` (or `rrggbb`, either case).
pub fn set_slot_colour_hex(
    doc: &Document,
    slot: usize,
    hex: &str,
) -> Result<Edit, PaletteEditError> {
    check_slot(doc, slot)?;
    let colour = parse_hex(hex)?;
    let mut palette = doc.palette.clone();
    palette.slots[slot].colour = colour;
    Ok(Edit::SetPalette(palette))
}

/// Renames slot `slot`; surrounding spaces are dropped and the name may not be empty.
pub fn rename_slot(doc: &Document, slot: usize, name: &str) -> Result<Edit, PaletteEditError> {
    check_slot(doc, slot)?;
    let name = name.trim();
    if name.is_empty() {
        return Err(PaletteEditError::EmptyName);
    }
    let mut palette = doc.palette.clone();
    palette.slots[slot].name = name.to_string();
    Ok(Edit::SetPalette(palette))
}

/// Adds a slot at the end of the palette.
pub fn add_slot(doc: &Document, name: &str, hex: &str) -> Result<Edit, PaletteEditError> {
    let name = name.trim();
    if name.is_empty() {
        return Err(PaletteEditError::EmptyName);
    }
    let colour = parse_hex(hex)?;
    let mut palette = doc.palette.clone();
    palette.slots.push(Slot {
        name: name.to_string(),
        colour,
    });
    Ok(Edit::SetPalette(palette))
}

/// Adds `count` slots at the end of the palette, each as distinct as possible from every colour
/// already in it (by the palette check's own measures; see [`crate::colour::extend_palette`])
/// and suited to what the palette serves (fills of equal weight, or greyscale-safe steps),
/// named "Slot N" after their position. Used when a map needs more colours than the palette has.
pub fn grow_palette(doc: &Document, count: u32) -> Edit {
    let mut palette = doc.palette.clone();
    let existing: Vec<[u8; 3]> = palette.slots.iter().map(|s| s.colour.0).collect();
    let thresholds = crate::colour::Thresholds::default();
    let purpose = crate::colour::Purpose::of(&existing, &thresholds);
    let added = crate::colour::extend_palette(&existing, count as usize, &thresholds, purpose);
    for colour in added {
        palette.slots.push(Slot {
            name: format!("Slot {}", palette.slots.len() + 1),
            colour: Rgb(colour),
        });
    }
    Edit::SetPalette(palette)
}

/// Removes slot `slot`, which no region may use (as colour or pin); later slots move down by
/// one, and the colouring and pins that refer to them move with them, all in one undo step.
pub fn remove_slot(doc: &Document, slot: usize) -> Result<Edit, PaletteEditError> {
    check_slot(doc, slot)?;
    if doc.palette.slots.len() == 1 {
        return Err(PaletteEditError::LastSlot);
    }
    let s = slot as u32;
    let coloured = doc.colouring().values().filter(|&&c| c == s).count();
    let pinned = doc.regions.values().filter(|r| r.pin == Some(s)).count();
    if coloured + pinned > 0 {
        return Err(PaletteEditError::SlotInUse {
            slot,
            name: doc.palette.slots[slot].name.clone(),
            coloured,
            pinned,
        });
    }
    let mut palette = doc.palette.clone();
    palette.slots.remove(slot);
    let colouring = doc
        .colouring()
        .iter()
        .map(|(id, &c)| (*id, if c > s { c - 1 } else { c }))
        .collect();
    let mut edits = vec![Edit::SetPalette(palette), Edit::SetColouring(colouring)];
    for (id, region) in &doc.regions {
        if let Some(p) = region.pin.filter(|&p| p > s) {
            edits.push(Edit::UpdateRegion {
                id: *id,
                change: RegionChange::Pin(Some(p - 1)),
            });
        }
    }
    Ok(Edit::Batch {
        label: "Remove palette slot".to_string(),
        edits,
    })
}

/// Default palette `index` of [`DEFAULT_PALETTES`] (0 is the three-colour one for colour, 6 the
/// three-colour greyscale-safe one) as a document palette.
pub fn default_palette(index: usize) -> Option<Palette> {
    let p = DEFAULT_PALETTES.get(index)?;
    Some(Palette {
        name: p.name.to_string(),
        slots: p
            .slots
            .iter()
            .map(|(name, rgb)| Slot {
                name: name.to_string(),
                colour: Rgb(*rgb),
            })
            .collect(),
    })
}

/// Replaces the palette with default palette `index`. Regions keep their slot numbers; slots the
/// new palette lacks are reported by the colouring checks, as for any smaller palette.
pub fn use_default_palette(_doc: &Document, index: usize) -> Result<Edit, PaletteEditError> {
    default_palette(index)
        .map(Edit::SetPalette)
        .ok_or(PaletteEditError::NoSuchDefault {
            index,
            len: DEFAULT_PALETTES.len(),
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_grown_palette_keeps_its_slots_and_adds_distinct_ones() {
        let doc = Document::default();
        let before = doc.palette.slots.clone();
        let Edit::SetPalette(grown) = grow_palette(&doc, 3) else {
            panic!("a palette edit")
        };
        assert_eq!(grown.slots.len(), before.len() + 3);
        assert_eq!(&grown.slots[..before.len()], &before[..]);
        let mut colours: Vec<Rgb> = grown.slots.iter().map(|s| s.colour).collect();
        colours.sort_by_key(|c| c.0);
        colours.dedup();
        assert_eq!(colours.len(), grown.slots.len(), "no colour twice");
        assert_eq!(grown.slots.last().map(|s| s.name.as_str()), Some("Slot 9"));
    }
    use crate::doc::{Region, RegionId};

    fn doc_with_regions() -> Document {
        let mut doc = Document::new("t");
        for (i, name) in ["A", "B", "C"].iter().enumerate() {
            doc.apply(Edit::PutRegion {
                id: RegionId(i as u64 + 1),
                region: Some(Region::new(*name, [i as f64, 0.0])),
            })
            .unwrap();
        }
        doc
    }

    #[test]
    fn bad_hex_is_refused_in_plain_words() {
        let doc = doc_with_regions();
        let err = set_slot_colour_hex(&doc, 0, "#12345g").unwrap_err();
        assert_eq!(
            err,
            PaletteEditError::BadHex {
                text: "#12345g".into()
            }
        );
        assert!(err.to_string().contains("six hexadecimal digits"));
        assert!(matches!(
            set_slot_colour_hex(&doc, 99, "#123456"),
            Err(PaletteEditError::NoSuchSlot { slot: 99, .. })
        ));
        let edit = set_slot_colour_hex(&doc, 1, " 0A0b0C ").unwrap();
        let mut doc2 = doc.clone();
        doc2.apply(edit).unwrap();
        assert_eq!(doc2.palette.slots[1].colour, Rgb([10, 11, 12]));
    }

    #[test]
    fn removing_a_slot_renumbers_later_slots_and_undoes_whole() {
        let mut doc = doc_with_regions();
        doc.apply(Edit::PutColour {
            id: RegionId(1),
            slot: Some(3),
        })
        .unwrap();
        doc.apply(Edit::UpdateRegion {
            id: RegionId(2),
            change: RegionChange::Pin(Some(4)),
        })
        .unwrap();
        doc.apply(Edit::PutColour {
            id: RegionId(3),
            slot: Some(1),
        })
        .unwrap();
        assert!(matches!(
            remove_slot(&doc, 1),
            Err(PaletteEditError::SlotInUse {
                slot: 1,
                coloured: 1,
                pinned: 0,
                ..
            })
        ));
        let before = doc.clone();
        let name_of_3 = doc.palette.slots[3].name.clone();
        let undo = doc.apply(remove_slot(&doc, 2).unwrap()).unwrap();
        assert_eq!(doc.colouring()[&RegionId(1)], 2);
        assert_eq!(doc.palette.slots[2].name, name_of_3);
        assert_eq!(doc.regions[&RegionId(2)].pin, Some(3));
        assert_eq!(doc.colouring()[&RegionId(3)], 1);
        doc.apply(undo).unwrap();
        assert_eq!(doc, before);
    }

    #[test]
    fn default_palettes_are_offered_by_index() {
        let doc = doc_with_regions();
        let Edit::SetPalette(p) = use_default_palette(&doc, 1).unwrap() else {
            panic!("a palette edit")
        };
        assert_eq!(p.slots.len(), 4);
        let Edit::SetPalette(p) = use_default_palette(&doc, 7).unwrap() else {
            panic!("a palette edit")
        };
        assert_eq!(p.name, "Tinct 4 greyscale-safe");
        assert!(use_default_palette(&doc, 12).is_err());
    }
}
