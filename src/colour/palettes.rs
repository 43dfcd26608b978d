//! Tinct's default palettes: for each number of colours from 3 to 8, one for maps in colour
//! (fills of equal visual weight) and one for maps that will be photocopied (greyscale-safe).
//!
//! Our own design: the values are the output of [`super::design::design_palette`] (a maximin
//! search over CIEDE2000 under normal vision and the three simulated dichromacies, and for the
//! greyscale-safe ones greyscale lightness too; the module documentation there gives the rules),
//! fixed here; a unit test re-runs the search and fails if they drift apart. The names are ours,
//! chosen by hand to say what each colour looks like.
//!
//! The trade-off, which the README explains to users: a greyscale copy keeps only lightness, and
//! four fills 15 L\* apart span 45 L\*, so one fill of a greyscale-safe palette is dark (about
//! L\* 47, a brick) and weighs far more than the pale ones in colour: the regions it covers look
//! highlighted. The colour palettes keep every fill within 25 L\* and 15 units of visual weight
//! of each other instead, and no fill has a hue that reads as water; in a greyscale copy some of
//! their fills merge.

use super::design::Purpose;
use super::space::Srgb8;

/// A default palette: a name, what it is for, and named colours, lightest first.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct DefaultPalette {
    pub name: &'static str,
    pub purpose: Purpose,
    pub slots: &'static [(&'static str, Srgb8)],
}

/// The default palettes: for colour, 3 to 8 colours in that order, then greyscale-safe, 3 to 8.
pub const DEFAULT_PALETTES: [DefaultPalette; 12] = [
    DefaultPalette {
        name: "Tinct 3",
        purpose: Purpose::Colour,
        slots: &[
            ("Rosehip", [0xff, 0xaa, 0xbb]),
            ("Heather", [0x99, 0x77, 0xaa]),
            ("Olive", [0x77, 0x88, 0x55]),
        ],
    },
    DefaultPalette {
        name: "Tinct 4",
        purpose: Purpose::Colour,
        slots: &[
            ("Mint", [0x99, 0xdd, 0xbb]),
            ("Lilac", [0xdd, 0xbb, 0xff]),
            ("Olive", [0x88, 0x99, 0x55]),
            ("Mauve", [0xbb, 0x77, 0x99]),
        ],
    },
    DefaultPalette {
        name: "Tinct 5",
        purpose: Purpose::Colour,
        slots: &[
            ("Mint", [0x99, 0xdd, 0xbb]),
            ("Lilac", [0xee, 0xbb, 0xff]),
            ("Sage", [0x99, 0xaa, 0x66]),
            ("Heather", [0xaa, 0x88, 0xbb]),
            ("Juniper", [0x66, 0x99, 0x88]),
        ],
    },
    DefaultPalette {
        name: "Tinct 6",
        purpose: Purpose::Colour,
        slots: &[
            ("Celadon", [0xbb, 0xee, 0xdd]),
            ("Blush", [0xff, 0xcc, 0xff]),
            ("Straw", [0xdd, 0xdd, 0x99]),
            ("Jade", [0x66, 0xbb, 0xaa]),
            ("Wisteria", [0xbb, 0x99, 0xdd]),
            ("Sage", [0x99, 0xaa, 0x66]),
        ],
    },
    DefaultPalette {
        name: "Tinct 7",
        purpose: Purpose::Colour,
        slots: &[
            ("Mint", [0x99, 0xdd, 0xaa]),
            ("Lilac", [0xee, 0xbb, 0xff]),
            ("Rose", [0xee, 0x99, 0xbb]),
            ("Moss", [0xaa, 0xaa, 0x66]),
            ("Wisteria", [0xaa, 0x88, 0xcc]),
            ("Juniper", [0x66, 0x99, 0x77]),
            ("Mauve", [0xbb, 0x77, 0x99]),
        ],
    },
    DefaultPalette {
        name: "Tinct 8",
        purpose: Purpose::Colour,
        slots: &[
            ("Lichen", [0xaa, 0xcc, 0xaa]),
            ("Rose", [0xff, 0xaa, 0xcc]),
            ("Lilac", [0xcc, 0xaa, 0xee]),
            ("Straw", [0xbb, 0xbb, 0x77]),
            ("Jade", [0x77, 0xaa, 0x99]),
            ("Heather", [0xbb, 0x88, 0xbb]),
            ("Clay", [0xbb, 0x77, 0x77]),
            ("Ochre", [0x99, 0x88, 0x44]),
        ],
    },
    DefaultPalette {
        name: "Tinct 3 greyscale-safe",
        purpose: Purpose::Greyscale,
        slots: &[
            ("Chalk", [0xdd, 0xee, 0xcc]),
            ("Apricot", [0xdd, 0x99, 0x77]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 4 greyscale-safe",
        purpose: Purpose::Greyscale,
        slots: &[
            ("Chalk", [0xdd, 0xee, 0xcc]),
            ("Rosehip", [0xee, 0xaa, 0xcc]),
            ("Rosewood", [0xbb, 0x88, 0x88]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 5 greyscale-safe",
        purpose: Purpose::Greyscale,
        slots: &[
            ("Chalk", [0xdd, 0xee, 0xcc]),
            ("Blush", [0xee, 0xbb, 0xcc]),
            ("Apricot", [0xdd, 0x99, 0x77]),
            ("Verdigris", [0x33, 0x99, 0x88]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 6 greyscale-safe",
        purpose: Purpose::Greyscale,
        slots: &[
            ("Chalk", [0xdd, 0xee, 0xcc]),
            ("Celadon", [0x99, 0xdd, 0xcc]),
            ("Lilac", [0xcc, 0xaa, 0xdd]),
            ("Khaki", [0xaa, 0x99, 0x66]),
            ("Cinnamon", [0xaa, 0x77, 0x66]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 7 greyscale-safe",
        purpose: Purpose::Greyscale,
        slots: &[
            ("Chalk", [0xdd, 0xee, 0xcc]),
            ("Shell", [0xee, 0xcc, 0xcc]),
            ("Sand", [0xcc, 0xbb, 0x99]),
            ("Heather", [0xbb, 0x99, 0xcc]),
            ("Olive", [0x88, 0x99, 0x55]),
            ("Rosewood", [0x99, 0x77, 0x77]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
    DefaultPalette {
        name: "Tinct 8 greyscale-safe",
        purpose: Purpose::Greyscale,
        slots: &[
            ("Chalk", [0xdd, 0xee, 0xcc]),
            ("Blush", [0xee, 0xcc, 0xee]),
            ("Jade", [0x77, 0xcc, 0xbb]),
            ("Apricot", [0xdd, 0x99, 0x77]),
            ("Ochre", [0xaa, 0x99, 0x55]),
            ("Mauve", [0xbb, 0x77, 0x88]),
            ("Fern", [0x55, 0x88, 0x44]),
            ("Brick", [0xaa, 0x55, 0x33]),
        ],
    },
];

/// The default palette for `colours` colours (3 to 8) and `purpose`, if there is one.
pub fn default_palette_for(colours: usize, purpose: Purpose) -> Option<&'static DefaultPalette> {
    DEFAULT_PALETTES
        .iter()
        .find(|p| p.slots.len() == colours && p.purpose == purpose)
}

/// The two reserves that follow "Tinct 4" in the document's default palette, for maps that need
/// five or six colours: [`super::design::extend_palette`] of "Tinct 4" (a unit test checks it).
pub const TINCT_4_RESERVES: [(&str, Srgb8); 2] = [
    ("Straw", [0xdd, 0xbb, 0x77]),
    ("Wisteria", [0xaa, 0x88, 0xcc]),
];

#[cfg(test)]
mod tests {
    use super::super::design::design_palette;
    use super::super::distinct::Thresholds;
    use super::*;

    #[test]
    fn committed_palettes_are_what_the_design_search_finds() {
        let mut drift = Vec::new();
        for palette in &DEFAULT_PALETTES {
            let designed =
                design_palette(palette.slots.len(), &Thresholds::default(), palette.purpose);
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

    #[test]
    fn the_reserves_are_what_extending_tinct_4_gives() {
        let t = Thresholds::default();
        let four: Vec<Srgb8> = default_palette_for(4, Purpose::Colour)
            .unwrap()
            .slots
            .iter()
            .map(|s| s.1)
            .collect();
        let reserves: Vec<Srgb8> = TINCT_4_RESERVES.iter().map(|s| s.1).collect();
        assert_eq!(
            super::super::design::extend_palette(&four, 2, &t, Purpose::Colour),
            reserves
        );
    }
}
