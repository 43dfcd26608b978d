//! Tinct's default palettes, one for each number of colours from 3 to 8.
//!
//! Our own design: the values are the output of [`super::design::design_palette`] (a maximin
//! search over CIEDE2000 under normal vision and the three simulated dichromacies, and greyscale
//! lightness, among moderate-chroma colours light enough for black labels), fixed here; a unit test
//! re-runs the search and fails if they drift apart. The names are ours, chosen by hand to say what
//! each colour looks like.

use super::space::Srgb8;

/// A default palette: a name and named colours, lightest first.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct DefaultPalette {
    pub name: &'static str,
    pub slots: &'static [(&'static str, Srgb8)],
}

/// The default palettes, for 3, 4, 5, 6, 7 and 8 colours in that order.
pub const DEFAULT_PALETTES: [DefaultPalette; 6] = [
    DefaultPalette {
        name: "Tinct 3",
        slots: &[
            ("Frost", [0xcc, 0xee, 0xff]),
            ("Apricot", [0xdd, 0x99, 0x77]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 4",
        slots: &[
            ("Frost", [0xcc, 0xee, 0xff]),
            ("Rosehip", [0xee, 0xaa, 0xcc]),
            ("Heather", [0xaa, 0x88, 0xbb]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 5",
        slots: &[
            ("Frost", [0xcc, 0xee, 0xff]),
            ("Blush", [0xee, 0xbb, 0xcc]),
            ("Apricot", [0xdd, 0x99, 0x77]),
            ("Lagoon", [0x22, 0x99, 0x99]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 6",
        slots: &[
            ("Frost", [0xcc, 0xee, 0xff]),
            ("Lilac", [0xcc, 0xcc, 0xff]),
            ("Reed", [0xbb, 0xbb, 0x88]),
            ("Rosewood", [0xcc, 0x88, 0x88]),
            ("Fjord", [0x33, 0x88, 0xcc]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 7",
        slots: &[
            ("Frost", [0xcc, 0xee, 0xff]),
            ("Mint", [0xbb, 0xdd, 0xcc]),
            ("Biscuit", [0xdd, 0xbb, 0xaa]),
            ("Dusk", [0x88, 0xaa, 0xcc]),
            ("Slate", [0x66, 0x99, 0x99]),
            ("Orchid", [0xaa, 0x66, 0xaa]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 8",
        slots: &[
            ("Frost", [0xcc, 0xee, 0xff]),
            ("Blush", [0xee, 0xcc, 0xdd]),
            ("Lichen", [0xaa, 0xcc, 0xaa]),
            ("Sand", [0xcc, 0xaa, 0x88]),
            ("Dusk", [0x88, 0x99, 0xcc]),
            ("Fern", [0x55, 0x99, 0x66]),
            ("Lagoon", [0x11, 0x88, 0x99]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
];

/// The default palette for `colours` colours (3 to 8), if there is one.
pub fn default_palette_for(colours: usize) -> Option<&'static DefaultPalette> {
    DEFAULT_PALETTES.iter().find(|p| p.slots.len() == colours)
}

#[cfg(test)]
mod tests {
    use super::super::design::design_palette;
    use super::super::distinct::Thresholds;
    use super::*;

    #[test]
    fn committed_palettes_are_what_the_design_search_finds() {
        let mut drift = Vec::new();
        for (i, palette) in DEFAULT_PALETTES.iter().enumerate() {
            let designed = design_palette(i + 3, &Thresholds::default());
            let committed: Vec<Srgb8> = palette.slots.iter().map(|s| s.1).collect();
            if committed != designed {
                let hex: Vec<String> = designed
                    .iter()
                    .map(|c| format!("[0x{:02x}, 0x{:02x}, 0x{:02x}]", c[0], c[1], c[2]))
                    .collect();
                drift.push(format!(
                    "{}: the search gives {}",
                    palette.name,
                    hex.join(", ")
                ));
            }
        }
        assert!(drift.is_empty(), "{}", drift.join("\n"));
    }
}
