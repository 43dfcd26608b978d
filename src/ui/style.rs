//! Colours of the editor (our own choices: quiet neutrals, with strong colours kept for warnings).

use egui::Color32;

pub const BACKGROUND: Color32 = Color32::from_rgb(0xf4, 0xf2, 0xec);
pub const UNCOLOURED: Color32 = Color32::from_rgb(0xe4, 0xe1, 0xd8);
pub const WATER: Color32 = Color32::from_rgb(0xe3, 0xec, 0xf1);
pub const WATER_HATCH: Color32 = Color32::from_rgb(0x6d, 0x9c, 0xc0);
pub const OUTLINE: Color32 = Color32::from_rgb(0x55, 0x55, 0x55);
pub const SELECTION: Color32 = Color32::from_rgb(0x17, 0x45, 0x8f);
pub const CLASH: Color32 = Color32::from_rgb(0xc4, 0x1e, 0x3a);
pub const LINK_SHARED: Color32 = Color32::from_rgb(0x4a, 0x4a, 0x4a);
pub const LINK_CORNER: Color32 = Color32::from_rgb(0x8a, 0x6d, 0x3b);
pub const LINK_MANUAL: Color32 = Color32::from_rgb(0xd0, 0x6a, 0x10);
pub const LINK_SUPPRESSED: Color32 = Color32::from_rgb(0xb0, 0xb0, 0xb0);
pub const GROUP: Color32 = Color32::from_rgb(0x6b, 0x2f, 0x9e);
pub const LABEL: Color32 = Color32::from_rgb(0x22, 0x22, 0x22);
pub const CERTIFICATE: Color32 = Color32::from_rgb(0xa3, 0x1a, 0x8c);
pub const OBSTRUCTION: Color32 = Color32::from_rgb(0xb3, 0x4a, 0x00);
/// Good news in the panels (a verdict that holds).
pub const GOOD: Color32 = Color32::from_rgb(0x2e, 0x7d, 0x32);
/// A warning: worth a look, not an error.
pub const WARNING: Color32 = Color32::from_rgb(0xa0, 0x60, 0x00);
/// The rules to drop for one colour fewer, shown on the map.
pub const RELAXED: Color32 = Color32::from_rgb(0x00, 0x6d, 0x77);
