//! Colour science for palettes: sRGB and CIELAB, CIEDE2000, simulated colour-vision deficiencies,
//! the distinctness checks, slot assignment and Tinct's default palettes.
//!
//! A leaf like [`crate::engine`]: it uses nothing else in the crate, does no I/O and is
//! deterministic. Colours are plain `[u8; 3]` sRGB triples here; the document's `Rgb` wraps one.

pub mod assign;
pub mod ciede2000;
pub mod cvd;
pub mod design;
pub mod distinct;
pub mod families;
pub mod palettes;
pub mod space;
pub mod weight;

pub use assign::{AssignError, AssignmentScore, assign_slots, assignment_score, heaviest_off_most};
pub use ciede2000::ciede2000;
pub use cvd::Vision;
pub use design::{Purpose, design_palette, extend_palette};
pub use distinct::{
    NamedColour, PairDifference, Thresholds, View, Warning, distinctness_matrix,
    distinctness_warnings, pair_difference,
};
pub use families::{FamilyFill, family_palette};
pub use palettes::{DEFAULT_PALETTES, DefaultPalette, TINCT_4_RESERVES, default_palette_for};
pub use space::{
    Lab, Srgb8, lab_to_srgb8, lab_to_xyz, lightness, linear_to_lab, linear_to_srgb,
    linear_to_srgb8, linear_to_xyz, srgb_to_linear, srgb8_to_lab, srgb8_to_linear, xyz_to_lab,
    xyz_to_linear,
};
pub use weight::{
    WATER_BLUE, dominant_fills, fill_reads_as_water, heaviest, hue_angle, reads_as_water,
    visual_weight,
};
