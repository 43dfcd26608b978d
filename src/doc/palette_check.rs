//! The palette seen from the map: which slot pairs adjacent regions use, the distinctness report
//! for those pairs, the palette as simulated readers see it, and the slot assignment as an edit.
//!
//! The colour science lives in [`crate::colour`]; this file only builds its inputs from the
//! document (land regions, active borders, the current colouring) and turns results into edits.

use std::collections::{BTreeMap, BTreeSet};

use crate::colour::{self, NamedColour, Thresholds, Vision, Warning};

use super::edit::Edit;
use super::model::{Document, Palette, RegionId, Rgb, Role};

/// How many active borders join regions of each pair of slots `(smaller, larger)` in the current
/// colouring. Borders between two regions of one slot (clashes) are not counted here.
pub fn slot_border_counts(doc: &Document) -> BTreeMap<(u32, u32), u64> {
    let mut out = BTreeMap::new();
    let regions = doc.regions();
    let index = doc.border_index();
    for (border, &(a, b)) in doc.borders().values().zip(&index.ends) {
        let (Some(x), Some(y)) = (regions.colour_at(a as usize), regions.colour_at(b as usize))
        else {
            continue;
        };
        if x != y && doc.border_is_active_at(border, a, b) {
            *out.entry((x.min(y), x.max(y))).or_insert(0) += 1;
        }
    }
    out
}

/// Which slot pairs the report looked at.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PairsChecked {
    /// The pairs that adjacent regions use in the current colouring.
    Colouring,
    /// Every pair of palette slots: nothing is coloured yet, so any two slots may meet.
    AllSlots,
}

/// One pair of slots that adjacent regions use, and how often.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct SlotPairUse {
    pub slots: (usize, usize),
    pub borders: u64,
}

/// The palette distinctness report for a document.
#[derive(Clone, Debug, PartialEq)]
pub struct PaletteReport {
    pub thresholds: Thresholds,
    pub pairs_checked: PairsChecked,
    /// The pairs looked at, with their border counts (0 when checking all slots).
    pub pairs: Vec<SlotPairUse>,
    /// Every pair below a threshold, in slot order then view order.
    pub warnings: Vec<Warning>,
    /// Slots the colouring uses that the palette does not have (their regions cannot be drawn).
    pub missing_slots: Vec<u32>,
    /// Fills that mislead on this map in colour: land that reads as water, a fill that outweighs
    /// the rest.
    pub fills: Vec<FillWarning>,
}

/// How a fill misleads (see [`crate::colour::weight`]).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum FillProblem {
    /// A land fill that reads as water, on a map with water.
    ReadsAsWater,
    /// A fill much heavier than the others: its regions look highlighted.
    Dominant,
}

impl FillProblem {
    /// The word used in JSON.
    pub fn as_str(self) -> &'static str {
        match self {
            FillProblem::ReadsAsWater => "reads_as_water",
            FillProblem::Dominant => "dominant",
        }
    }
}

/// One fill that misleads, in words.
#[derive(Clone, Debug, PartialEq)]
pub struct FillWarning {
    pub slot: usize,
    pub problem: FillProblem,
    pub message: String,
}

impl PaletteReport {
    /// True when no pair falls short and every used slot exists.
    pub fn is_clear(&self) -> bool {
        self.warnings.is_empty() && self.missing_slots.is_empty() && self.fills.is_empty()
    }
}

/// The palette's colours with their names, as the colour module takes them.
pub fn named_colours(palette: &Palette) -> Vec<NamedColour> {
    palette
        .slots
        .iter()
        .map(|s| NamedColour {
            name: s.name.clone(),
            rgb: s.colour.0,
        })
        .collect()
}

/// Checks the slot pairs that adjacent regions use (or every pair, before anything is coloured)
/// under normal vision, the three simulations and greyscale (see [`crate::colour::distinct`] for the
/// thresholds and why).
pub fn palette_report(doc: &Document, thresholds: &Thresholds) -> PaletteReport {
    let (pairs_checked, pairs, missing_slots) = checked_pairs(doc, doc.palette.slots.len());
    let warnings = pair_warnings(&doc.palette, &pairs, thresholds);
    let fills = fill_warnings(doc, &doc.palette);
    PaletteReport {
        thresholds: *thresholds,
        pairs_checked,
        pairs,
        warnings,
        missing_slots,
        fills,
    }
}

/// The thresholds the palette check uses for `doc`: the defaults (ΔE00 10, greyscale ΔL\* 15),
/// with greyscale checked only when the project says the map will be copied in greyscale.
pub fn thresholds(doc: &Document) -> Thresholds {
    Thresholds {
        greyscale: doc.settings().greyscale_copies,
        ..Thresholds::default()
    }
}

/// Whether the map has water (regions that take no colour and are drawn as water).
pub fn has_water(doc: &Document) -> bool {
    doc.regions().values().any(|r| r.role == Role::Water)
}

/// The fills of `palette` (which need not be the document's) that mislead on this map in colour,
/// among the slots land regions use (every slot before anything is coloured):
/// - on a map with water, a land fill that reads as water (a blue or cyan hue, or close to the
///   blue of the water pattern);
/// - a fill much heavier than the others (more than [`colour::weight::DOMINANT_MARGIN`] above
///   the median weight of the rest), whose regions look highlighted.
pub fn fill_warnings(doc: &Document, palette: &Palette) -> Vec<FillWarning> {
    let used: BTreeSet<usize> = doc
        .land_regions()
        .filter_map(|(id, _)| doc.colouring().get(&id).map(|&s| s as usize))
        .filter(|&s| s < palette.slots.len())
        .collect();
    let slots: Vec<usize> = if used.is_empty() {
        (0..palette.slots.len()).collect()
    } else {
        used.into_iter().collect()
    };
    let mut out = Vec::new();
    if has_water(doc) {
        for &s in &slots {
            let slot = &palette.slots[s];
            if colour::fill_reads_as_water(slot.colour.0) {
                out.push(FillWarning {
                    slot: s,
                    problem: FillProblem::ReadsAsWater,
                    message: format!(
                        "{} reads as water (a blue or cyan): on this map, which has water, land \
                         in it looks like sea or lake; choose a warm, green or violet fill",
                        slot.name
                    ),
                });
            }
        }
    }
    let colours: Vec<colour::Srgb8> = slots.iter().map(|&s| palette.slots[s].colour.0).collect();
    // Tints of a palette of families differ in weight by design.
    let all: Vec<colour::Srgb8> = palette.slots.iter().map(|s| s.colour.0).collect();
    let dominant = if colour::families::is_family_palette(&all) {
        Vec::new()
    } else {
        colour::dominant_fills(&colours)
    };
    for (i, weight, median) in dominant {
        let s = slots[i];
        out.push(FillWarning {
            slot: s,
            problem: FillProblem::Dominant,
            message: format!(
                "{} weighs much more than the other fills ({weight:.0} against {median:.0}, as \
                 ΔE00 from white paper): in colour its regions look highlighted. A greyscale-safe \
                 palette needs one dark fill; for a map in colour choose fills of equal weight",
                palette.slots[s].name
            ),
        });
    }
    out.sort_by_key(|w| w.slot);
    out
}

/// The slot pairs a palette of `slots` colours must keep apart on this map: the pairs that
/// adjacent regions use in the current colouring or, before anything is coloured, every pair.
/// Also the slots the colouring uses that such a palette lacks.
pub fn checked_pairs(doc: &Document, slots: usize) -> (PairsChecked, Vec<SlotPairUse>, Vec<u32>) {
    let used: BTreeSet<u32> = doc
        .land_regions()
        .filter_map(|(id, _)| doc.colouring().get(&id).copied())
        .collect();
    let missing_slots = used
        .iter()
        .copied()
        .filter(|&s| s as usize >= slots)
        .collect();
    if used.is_empty() {
        let all: Vec<SlotPairUse> = (0..slots)
            .flat_map(|i| {
                (i + 1..slots).map(move |j| SlotPairUse {
                    slots: (i, j),
                    borders: 0,
                })
            })
            .collect();
        return (PairsChecked::AllSlots, all, missing_slots);
    }
    let used_pairs: Vec<SlotPairUse> = slot_border_counts(doc)
        .iter()
        .map(|(&(a, b), &borders)| SlotPairUse {
            slots: (a as usize, b as usize),
            borders,
        })
        .collect();
    (PairsChecked::Colouring, used_pairs, missing_slots)
}

/// The warnings for `pairs` of `palette` (which need not be the document's: the editor checks a
/// palette while it is being edited).
pub fn pair_warnings(
    palette: &Palette,
    pairs: &[SlotPairUse],
    thresholds: &Thresholds,
) -> Vec<Warning> {
    let pair_list: Vec<(usize, usize)> = pairs.iter().map(|p| p.slots).collect();
    colour::distinctness_warnings(&named_colours(palette), &pair_list, thresholds)
}

/// The palette as each reader sees it, for showing side by side: one row per vision in
/// [`Vision::ALL`] order (normal first), then the greyscale row (a grey of the same L\*).
pub fn simulated_palettes(palette: &Palette) -> Vec<(String, Vec<Rgb>)> {
    let mut out: Vec<(String, Vec<Rgb>)> = Vision::ALL
        .iter()
        .map(|v| {
            let row = palette
                .slots
                .iter()
                .map(|s| Rgb(v.simulate(s.colour.0)))
                .collect();
            (v.as_str().to_string(), row)
        })
        .collect();
    out.push((
        "greyscale".to_string(),
        palette.slots.iter().map(|s| grey_of(s.colour)).collect(),
    ));
    out
}

/// The neutral grey with the same CIE lightness as `rgb`.
pub fn grey_of(rgb: Rgb) -> Rgb {
    let l = colour::lightness(rgb.0);
    let (grey, _) = colour::lab_to_srgb8(colour::Lab { l, a: 0.0, b: 0.0 });
    Rgb(grey)
}

/// Why slots could not be reassigned.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SlotAssignError {
    #[error("the colouring uses slot {slot}, but the palette has only {palette_len} slots")]
    MissingSlot { slot: u32, palette_len: usize },
    #[error("{0}")]
    Assign(#[from] colour::AssignError),
}

/// The colouring with its classes moved to the palette slots that suit them best (see
/// [`crate::colour::assign`]): classes that share many borders get the most distinct slots.
/// A class with a pinned region keeps its slot. `Ok(None)` when the current slots are already
/// the best choice; otherwise one undoable edit, labelled "Assign palette slots".
pub fn slot_assignment_edit(
    doc: &Document,
    thresholds: &Thresholds,
) -> Result<Option<Edit>, SlotAssignError> {
    let n = doc.palette.slots.len();
    // Classes are the slots in use, in slot order.
    let classes: Vec<u32> = doc
        .colouring()
        .values()
        .copied()
        .collect::<BTreeSet<u32>>()
        .into_iter()
        .collect();
    if let Some(&slot) = classes.iter().find(|&&s| s as usize >= n) {
        return Err(SlotAssignError::MissingSlot {
            slot,
            palette_len: n,
        });
    }
    // Work over every palette slot as a class (unused slots have no borders), so that "keep
    // the current slot" means keeping the identity.
    let mut borders = vec![vec![0u64; n]; n];
    for ((a, b), count) in slot_border_counts(doc) {
        borders[a as usize][b as usize] += count;
        borders[b as usize][a as usize] += count;
    }
    let mut fixed: Vec<Option<usize>> = vec![None; n];
    for (id, region) in &doc.regions {
        if let (Some(_), Some(&slot)) = (region.pin, doc.colouring().get(id)) {
            fixed[slot as usize] = Some(slot as usize);
        }
    }
    let colours: Vec<colour::Srgb8> = doc.palette.slots.iter().map(|s| s.colour.0).collect();
    let distinctness = colour::distinctness_matrix(&colours, thresholds);
    // Regions per class (land only), and the fills' weights: the heaviest fill never goes to
    // the class with the most regions.
    let mut sizes = vec![0usize; n];
    for (id, _) in doc.land_regions() {
        if let Some(&slot) = doc.colouring().get(&id) {
            sizes[slot as usize] += 1;
        }
    }
    let weights: Vec<f64> = colours.iter().map(|&c| colour::visual_weight(c)).collect();
    let map = colour::assign_slots(&borders, &distinctness, &fixed, Some((&sizes, &weights)))?;
    if map.iter().enumerate().all(|(c, s)| c == *s) {
        return Ok(None);
    }
    let colouring: BTreeMap<RegionId, u32> = doc
        .colouring()
        .iter()
        .map(|(id, &slot)| (*id, map[slot as usize] as u32))
        .collect();
    Ok(Some(Edit::Batch {
        label: "Assign palette slots".to_string(),
        edits: vec![Edit::SetColouring(colouring)],
    }))
}
