//! The state the editor's windows and canvas keep between frames, in a module of its own so
//! that the app holds it without importing the panels that draw it (no circle of imports inside
//! `src/ui`; `tests/invariants.rs` checks it).

use egui::epaint::Mesh;

use crate::doc::palette_check::{PairsChecked, SlotPairUse};
use crate::doc::{Palette, Settings};

use super::view::Camera;

/// The fills and outlines of the map, tessellated for one view. Drawing them is most of a
/// frame's work on a large map, so a frame reuses them when nothing has changed, and while the
/// view moves (pan, zoom) it moves the last drawing instead, redrawing once the view rests or
/// has moved too far for the old drawing to stand in.
pub struct BaseLayer {
    pub(super) mesh: std::sync::Arc<Mesh>,
    pub(super) generation: u64,
    pub(super) camera: Camera,
    pub(super) rect: egui::Rect,
    /// The world rectangle the drawing covers (the view at the time, with a margin).
    pub(super) covers: [[f64; 2]; 2],
    /// The view of the previous frame, to tell a moving view from one at rest.
    pub(super) last_camera: Camera,
    /// Regions too small to draw one by one, as an image, and where it goes on screen.
    pub(super) raster: Option<(egui::TextureHandle, egui::Rect)>,
}

impl BaseLayer {
    /// Whether small regions were painted as an image (the coarsest level of detail).
    pub fn uses_raster(&self) -> bool {
        self.raster.is_some()
    }

    /// Triangles in the tessellated part (fills and outlines).
    pub fn triangle_count(&self) -> usize {
        self.mesh.indices.len() / 3
    }
}

/// The working copy of the palette while the window is open.
pub struct PaletteEditor {
    pub draft: Palette,
    /// The hex text of each slot as typed (applied to the draft when it parses).
    pub hex: Vec<String>,
    /// One of Tinct's palettes chosen while the draft had changes of its own: replacing them
    /// waits for the user's word.
    pub replace_with: Option<Palette>,
    /// For a document state (`Scene::generation`) and a number of slots: the slot pairs to
    /// check, and which slots regions use or are pinned to.
    pub(super) pairs: Option<CheckedPairs>,
}

/// The slot pairs to check for one document state and slot count, and the slots in use.
pub(super) type CheckedPairs = ((u64, usize), PairsChecked, Vec<SlotPairUse>, Vec<bool>);

impl PaletteEditor {
    pub fn new(palette: &Palette) -> PaletteEditor {
        PaletteEditor {
            draft: palette.clone(),
            hex: palette.slots.iter().map(|s| s.colour.to_hex()).collect(),
            replace_with: None,
            pairs: None,
        }
    }

    /// Takes `palette` as the draft.
    pub(super) fn take(&mut self, palette: Palette) {
        self.hex = palette.slots.iter().map(|s| s.colour.to_hex()).collect();
        self.draft = palette;
        self.replace_with = None;
    }

    pub(super) fn reset(&mut self, palette: &Palette) {
        let pairs = self.pairs.take();
        *self = PaletteEditor::new(palette);
        self.pairs = pairs;
    }
}

/// The settings being edited while the window is open.
pub struct SettingsDraft {
    pub corners_count: bool,
    pub min_border_length: f64,
    pub tolerance: f64,
}

impl SettingsDraft {
    pub fn new(settings: &Settings) -> SettingsDraft {
        SettingsDraft {
            corners_count: settings.corners_count,
            min_border_length: settings.min_border_length,
            tolerance: settings.tolerance,
        }
    }
}
