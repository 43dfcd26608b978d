//! Whether two palette colours can be told apart: under normal vision, under the three simulated
//! dichromacies, and in greyscale; and the report of the slot pairs that fall short.
//!
//! # Thresholds
//! - **ΔE00 10** (normal vision and each simulation). A CIEDE2000 difference of about 1 is a
//!   just-noticeable difference side by side (the formula's design scale); about 2 to 3 is plainly
//!   visible side by side; fills that must be told apart *at a glance*, across a border and a label,
//!   need far more. 10 is our choice for "clearly distinct on adjacent fills", from memory of common
//!   practice in categorical palette design, where a minimum pairwise ΔE00 around 10 is the usual
//!   target; it is not a standard.
//! - **ΔL\* 15** (greyscale). A greyscale copy keeps only lightness, and lightness steps smaller than
//!   about 10 to 15 L\* units are easily lost to toner, paper and scanner noise: 15 is our choice,
//!   from memory of common practice for greyscale-safe fills (about six or seven distinguishable
//!   steps between a dark label-safe fill and white).
//!
//! Both are parameters ([`Thresholds`]); the defaults are these values.

use super::ciede2000::ciede2000;
use super::cvd::Vision;
use super::space::{Srgb8, lightness, linear_to_lab, srgb8_to_linear};

/// The limits below which two fills count as hard to tell apart.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Thresholds {
    /// Minimum CIEDE2000 difference, under normal vision and each simulated dichromacy.
    pub delta_e00: f64,
    /// Minimum difference in CIE lightness L\* for a greyscale copy.
    pub grey_delta_l: f64,
    /// Whether greyscale is checked at all (a map that will be copied in greyscale).
    pub greyscale: bool,
}

impl Thresholds {
    /// The views these thresholds check: every colour view, and greyscale when asked.
    pub fn views(&self) -> impl Iterator<Item = View> + '_ {
        View::ALL
            .into_iter()
            .filter(|v| self.greyscale || *v != View::Greyscale)
    }
}

impl Default for Thresholds {
    fn default() -> Thresholds {
        Thresholds {
            delta_e00: 10.0,
            grey_delta_l: 15.0,
            greyscale: true,
        }
    }
}

/// A way a pair of fills is looked at.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum View {
    /// In colour, as seen with this vision (compared by ΔE00).
    Colour(Vision),
    /// In a greyscale copy (compared by ΔL\*).
    Greyscale,
}

impl View {
    /// Every view, in report order.
    pub const ALL: [View; 5] = [
        View::Colour(Vision::Normal),
        View::Colour(Vision::Protanopia),
        View::Colour(Vision::Deuteranopia),
        View::Colour(Vision::Tritanopia),
        View::Greyscale,
    ];

    /// The word used in JSON.
    pub fn as_str(self) -> &'static str {
        match self {
            View::Colour(v) => v.as_str(),
            View::Greyscale => "greyscale",
        }
    }
}

/// How different two colours are in every view.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PairDifference {
    /// ΔE00 under each vision, in [`Vision::ALL`] order.
    pub delta_e00: [f64; 4],
    /// |ΔL\*| between the two colours.
    pub delta_l: f64,
}

impl PairDifference {
    /// The difference in one view (ΔE00, or ΔL\* for greyscale).
    pub fn in_view(&self, view: View) -> f64 {
        match view {
            View::Colour(v) => self.delta_e00[v as usize],
            View::Greyscale => self.delta_l,
        }
    }

    /// The threshold that applies to one view.
    pub fn threshold(view: View, thresholds: &Thresholds) -> f64 {
        match view {
            View::Colour(_) => thresholds.delta_e00,
            View::Greyscale => thresholds.grey_delta_l,
        }
    }

    /// The worst case over all views, as a fraction of each view's threshold: 1 or more means
    /// the pair passes every check; 0.5 means some view shows only half the required difference.
    pub fn worst_ratio(&self, thresholds: &Thresholds) -> f64 {
        thresholds
            .views()
            .map(|v| self.in_view(v) / Self::threshold(v, thresholds).max(f64::MIN_POSITIVE))
            .fold(f64::INFINITY, f64::min)
    }
}

/// The differences between two sRGB colours in every view. Simulations are compared before
/// clipping to the gamut, so two out-of-gamut simulated colours are not made equal by the clip.
pub fn pair_difference(first: Srgb8, second: Srgb8) -> PairDifference {
    let (x, y) = (srgb8_to_linear(first), srgb8_to_linear(second));
    let delta_e00 = Vision::ALL.map(|v| {
        ciede2000(
            linear_to_lab(v.simulate_linear(x)),
            linear_to_lab(v.simulate_linear(y)),
        )
    });
    PairDifference {
        delta_e00,
        delta_l: (lightness(first) - lightness(second)).abs(),
    }
}

/// For a list of colours, the worst-case ratio of every pair ([`PairDifference::worst_ratio`]):
/// a symmetric matrix with infinity on the diagonal.
pub fn distinctness_matrix(colours: &[Srgb8], thresholds: &Thresholds) -> Vec<Vec<f64>> {
    let n = colours.len();
    let mut out = vec![vec![f64::INFINITY; n]; n];
    for i in 0..n {
        for j in i + 1..n {
            let r = pair_difference(colours[i], colours[j]).worst_ratio(thresholds);
            out[i][j] = r;
            out[j][i] = r;
        }
    }
    out
}

/// A named palette colour, as the report sees it.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct NamedColour {
    pub name: String,
    pub rgb: Srgb8,
}

/// One pair of slots that is hard to tell apart in one view.
#[derive(Clone, Debug, PartialEq)]
pub struct Warning {
    /// The two slots (0-based, smaller first).
    pub slots: (usize, usize),
    pub view: View,
    /// The difference found (ΔE00, or ΔL\* for greyscale).
    pub value: f64,
    /// The threshold it falls below.
    pub threshold: f64,
    /// The warning in plain words, with slots numbered from 1 as the interface shows them.
    pub message: String,
}

/// Every pair of `pairs` that falls below a threshold in any view, in pair order then view order.
/// Pairs naming a slot the palette lacks, and pairs of a slot with itself, are skipped.
///
/// # Complexity
/// O(p) CIEDE2000 evaluations (five per pair) for `p` pairs.
pub fn distinctness_warnings(
    palette: &[NamedColour],
    pairs: &[(usize, usize)],
    thresholds: &Thresholds,
) -> Vec<Warning> {
    let mut sorted: Vec<(usize, usize)> = pairs
        .iter()
        .map(|&(a, b)| (a.min(b), a.max(b)))
        .filter(|&(a, b)| a != b && b < palette.len())
        .collect();
    sorted.sort_unstable();
    sorted.dedup();
    let mut out = Vec::new();
    for (i, j) in sorted {
        let (a, b) = (&palette[i], &palette[j]);
        let difference = pair_difference(a.rgb, b.rgb);
        for view in thresholds.views() {
            let value = difference.in_view(view);
            let threshold = PairDifference::threshold(view, thresholds);
            if value >= threshold {
                continue;
            }
            let who = match view {
                View::Colour(v) => format!("look alike to {}", v.readers()),
                View::Greyscale => "look alike in a greyscale copy".to_string(),
            };
            let measure = match view {
                View::Colour(_) => format!("ΔE00 {value:.1}, below {threshold:.0}"),
                View::Greyscale => {
                    format!("lightness differs by {value:.1} L*, below {threshold:.0}")
                }
            };
            out.push(Warning {
                slots: (i, j),
                view,
                value,
                threshold,
                message: format!(
                    "Slots {} '{}' and {} '{}' {who} ({measure})",
                    i + 1,
                    a.name,
                    j + 1,
                    b.name
                ),
            });
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn named(name: &str, rgb: Srgb8) -> NamedColour {
        NamedColour {
            name: name.into(),
            rgb,
        }
    }

    #[test]
    fn red_and_green_of_equal_lightness_look_alike_to_dichromats_only() {
        // A textbook red-green confusion pair (common practice): similar lightness, opposite a*.
        let palette = [
            named("Rust", [0xb0, 0x6a, 0x50]),
            named("Olive", [0x6f, 0x86, 0x4f]),
        ];
        let warnings = distinctness_warnings(&palette, &[(0, 1)], &Thresholds::default());
        let views: Vec<View> = warnings.iter().map(|w| w.view).collect();
        assert!(
            !views.contains(&View::Colour(Vision::Normal)),
            "{warnings:?}"
        );
        assert!(
            views.contains(&View::Colour(Vision::Deuteranopia)),
            "{warnings:?}"
        );
        assert!(views.contains(&View::Greyscale), "{warnings:?}");
        let grey = warnings.iter().find(|w| w.view == View::Greyscale).unwrap();
        assert!(
            grey.message
                .starts_with("Slots 1 'Rust' and 2 'Olive' look alike in a greyscale")
        );
    }

    #[test]
    fn black_and_white_pass_everything() {
        let d = pair_difference([0, 0, 0], [255, 255, 255]);
        assert!(d.worst_ratio(&Thresholds::default()) > 1.0);
        let m = distinctness_matrix(&[[0, 0, 0], [255, 255, 255]], &Thresholds::default());
        assert_eq!(m[0][1], m[1][0]);
        assert!(m[0][0].is_infinite());
    }
}
