//! The panels around and on the map, one module each. Every panel draws from the frame's
//! read-only view ([`Frame`](super::frame::Frame)) and sends actions; what it keeps between
//! frames (a search text, the canvas's view and drawing caches) is in its own struct here.

pub mod canvas;
pub mod details;
pub mod menu;
pub mod palette;
pub mod regions;
pub mod status;
pub mod toolbar;
pub mod verdict;

/// The panels' own state.
#[derive(Default)]
pub struct Panels {
    pub canvas: canvas::Canvas,
    pub regions: regions::RegionList,
    pub details: details::Details,
}

impl Panels {
    /// Forgets what was kept for the document on show (another one replaces it). The scene
    /// stays, to be brought in step with the new document.
    pub fn reset(&mut self) {
        self.canvas.reset();
        self.regions = Default::default();
        self.details = Default::default();
    }
}
