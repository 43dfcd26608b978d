//! Visual weight of fills, and the two ways a land fill misleads on a map in colour: it reads as
//! water, or it outweighs the other fills so that the regions it covers look highlighted.
//!
//! - **Visual weight** is the CIEDE2000 difference between a fill and white paper. Darkness and
//!   saturation both draw the eye on a white page, and ΔE00 from white combines them on one
//!   perceptual scale: a pale tint weighs about 10, a dark saturated brick about 50. The measure
//!   is our choice (common practice is to judge weight by lightness and chroma separately); it
//!   is deterministic and needs no parameters.
//! - **Reads as water**: a CIELAB hue angle from 190 to 290 degrees (cyans and blues) with chroma
//!   C\*ab of 8 or more. Blue for water is a convention of the trade (common practice, from
//!   memory; it is not a standard), so a blue land fill next to water, or on an island, makes
//!   land look like sea or lake. Below chroma 8 a fill is a grey whatever its hue angle.

use super::ciede2000::ciede2000;
use super::space::{Lab, Srgb8, srgb8_to_lab};

/// The blue that marks water in Tinct's exports (the lines of the water pattern); a land fill
/// within ΔE00 10 of it reads as water whatever its hue angle.
pub const WATER_BLUE: Srgb8 = [0x8f, 0xb3, 0xcc];

/// The hue angles (degrees) of fills that read as water.
pub const WATER_HUES: (f64, f64) = (190.0, 290.0);

/// The chroma below which a fill reads as grey whatever its hue.
pub const WATER_MIN_CHROMA: f64 = 8.0;

/// How much heavier than the median of the other fills (in ΔE00 from white) a fill may be before
/// it counts as dominant. 18 is our choice: the fills of a palette designed for colour stay
/// within 15 of each other, and the dark fill of a greyscale-safe palette is 20 to 30 heavier
/// than the median of the rest.
pub const DOMINANT_MARGIN: f64 = 18.0;

/// The CIELAB hue angle h_ab in degrees, 0 to 360 (CIE 15:2004).
pub fn hue_angle(lab: Lab) -> f64 {
    lab.b.atan2(lab.a).to_degrees().rem_euclid(360.0)
}

/// Whether a fill reads as water (see the module documentation).
pub fn reads_as_water(lab: Lab) -> bool {
    let h = hue_angle(lab);
    lab.a.hypot(lab.b) >= WATER_MIN_CHROMA && (WATER_HUES.0..=WATER_HUES.1).contains(&h)
}

/// Whether a land fill reads as water: its hue is a blue or cyan (see the module
/// documentation), or it is within ΔE00 10 of [`WATER_BLUE`].
pub fn fill_reads_as_water(rgb: Srgb8) -> bool {
    let lab = srgb8_to_lab(rgb);
    reads_as_water(lab) || ciede2000(lab, srgb8_to_lab(WATER_BLUE)) < 10.0
}

/// The visual weight of a fill: ΔE00 from white paper.
pub fn visual_weight(rgb: Srgb8) -> f64 {
    ciede2000(
        srgb8_to_lab(rgb),
        Lab {
            l: 100.0,
            a: 0.0,
            b: 0.0,
        },
    )
}

/// The fills (by index) that outweigh the median of the others by more than
/// [`DOMINANT_MARGIN`], with their weight and that median.
pub fn dominant_fills(colours: &[Srgb8]) -> Vec<(usize, f64, f64)> {
    let weights: Vec<f64> = colours.iter().map(|&c| visual_weight(c)).collect();
    let mut out = Vec::new();
    for (i, &w) in weights.iter().enumerate() {
        let mut others: Vec<f64> = weights
            .iter()
            .enumerate()
            .filter(|(j, _)| *j != i)
            .map(|(_, &x)| x)
            .collect();
        if others.is_empty() {
            continue;
        }
        others.sort_by(f64::total_cmp);
        let median = if others.len() % 2 == 1 {
            others[others.len() / 2]
        } else {
            (others[others.len() / 2 - 1] + others[others.len() / 2]) / 2.0
        };
        if w > median + DOMINANT_MARGIN {
            out.push((i, w, median));
        }
    }
    out
}

/// The index of the heaviest of `colours` (the first on a tie), if any.
pub fn heaviest(colours: &[Srgb8]) -> Option<usize> {
    colours
        .iter()
        .map(|&c| visual_weight(c))
        .enumerate()
        .fold(None, |best: Option<(usize, f64)>, (i, w)| match best {
            Some((_, b)) if b >= w => best,
            _ => Some((i, w)),
        })
        .map(|(i, _)| i)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hue_angles_follow_the_cie_definition() {
        // CIE 15:2004, h_ab = atan2(b*, a*): +a* is 0 degrees, +b* 90, -a* 180, -b* 270.
        let lab = |a, b| Lab { l: 50.0, a, b };
        assert!((hue_angle(lab(10.0, 0.0)) - 0.0).abs() < 1e-9);
        assert!((hue_angle(lab(0.0, 10.0)) - 90.0).abs() < 1e-9);
        assert!((hue_angle(lab(-10.0, 0.0)) - 180.0).abs() < 1e-9);
        assert!((hue_angle(lab(0.0, -10.0)) - 270.0).abs() < 1e-9);
    }

    #[test]
    fn blues_read_as_water_and_greys_and_warm_fills_do_not() {
        // Common web colours (CSS Color Module Level 4 named colours). The sRGB blue primary
        // itself has a CIELAB hue angle of about 306 degrees (from memory: its a* is large and
        // positive), so by the 190 to 290 rule it reads as violet; the design keeps a margin
        // to 310 on that side.
        let water = |rgb| reads_as_water(srgb8_to_lab(rgb));
        assert!(water([0x46, 0x82, 0xb4]), "steelblue");
        assert!(water([0x87, 0xce, 0xeb]), "skyblue");
        assert!(water([0xcc, 0xee, 0xff]), "a pale blue tint");
        assert!(!water([0x80, 0x80, 0x80]), "grey");
        assert!(!water([0xff, 0xa5, 0x00]), "orange");
        assert!(!water([0x22, 0x8b, 0x22]), "forestgreen");
    }

    #[test]
    fn weight_grows_with_darkness_and_saturation() {
        assert!(visual_weight([0xff, 0xff, 0xff]) < 1e-9);
        assert!(visual_weight([0xaa, 0x55, 0x33]) > visual_weight([0xdd, 0x99, 0x77]));
        assert!(visual_weight([0xdd, 0x99, 0x77]) > visual_weight([0xee, 0xdd, 0xcc]));
        assert_eq!(
            heaviest(&[[0xcc, 0xee, 0xff], [0xaa, 0x55, 0x33], [0xee, 0xaa, 0xcc]]),
            Some(1)
        );
        // The old four-colour default: its brick outweighs the three pale tints.
        let old = [
            [0xcc, 0xee, 0xff],
            [0xee, 0xaa, 0xcc],
            [0xaa, 0x88, 0xbb],
            [0xaa, 0x55, 0x33],
        ];
        let dominant = dominant_fills(&old);
        assert_eq!(dominant.len(), 1, "{dominant:?}");
        assert_eq!(dominant[0].0, 3);
    }
}
