//! Text contrast by the W3C's Web Content Accessibility Guidelines (WCAG) 2.1: relative luminance,
//! contrast ratio, and the choice of dark or light label ink for a fill.
//!
//! The formulas are the standard's own definitions ("relative luminance" and "contrast ratio" in
//! the WCAG 2.1 glossary), written out here rather than borrowed from the colour module: the
//! standard fixes its own threshold for the sRGB curve (0.03928), and a check against a standard
//! should read like the standard.

use crate::doc::Rgb;

/// The contrast WCAG 2.1 asks of normal-size text (success criterion 1.4.3, level AA).
pub const MIN_TEXT_CONTRAST: f64 = 4.5;

/// The dark ink labels use when it is dark enough: a soft black that prints better than pure black
/// on coloured fills.
pub const DARK_INK: Rgb = Rgb([0x1b, 0x1b, 0x1b]);
/// Pure black, for the few mid-tone fills on which [`DARK_INK`] and white both fall short.
pub const BLACK: Rgb = Rgb([0, 0, 0]);
/// Light ink, for dark fills.
pub const WHITE: Rgb = Rgb([0xff, 0xff, 0xff]);

/// Relative luminance of an sRGB colour, 0 for black and 1 for white (WCAG 2.1 glossary:
/// each channel `c = v / 255` becomes `c / 12.92` when `c <= 0.03928`, else
/// `((c + 0.055) / 1.055) ^ 2.4`; then `L = 0.2126 R + 0.7152 G + 0.0722 B`).
pub fn relative_luminance(colour: Rgb) -> f64 {
    let linear = |v: u8| {
        let c = f64::from(v) / 255.0;
        if c <= 0.03928 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        }
    };
    let [r, g, b] = colour.0;
    0.2126 * linear(r) + 0.7152 * linear(g) + 0.0722 * linear(b)
}

/// Contrast ratio `(L1 + 0.05) / (L2 + 0.05)`, lighter over darker (WCAG 2.1 glossary): from 1
/// (the same colour) to 21 (black on white).
pub fn contrast_ratio(a: Rgb, b: Rgb) -> f64 {
    let (la, lb) = (relative_luminance(a), relative_luminance(b));
    (la.max(lb) + 0.05) / (la.min(lb) + 0.05)
}

/// Label ink for a fill: [`DARK_INK`] when it reaches [`MIN_TEXT_CONTRAST`] and beats white,
/// otherwise white when that reaches it, otherwise black. Black or white always does: the ratio
/// against black is `(L + 0.05) / 0.05` and against white `1.05 / (L + 0.05)`; the better of the
/// two is worst where they are equal, at `L + 0.05 = sqrt(0.0525)`, and even there it is about
/// 4.58.
pub fn ink_for(fill: Rgb) -> Rgb {
    let dark = contrast_ratio(DARK_INK, fill);
    let light = contrast_ratio(WHITE, fill);
    if dark >= MIN_TEXT_CONTRAST && dark >= light {
        DARK_INK
    } else if light >= MIN_TEXT_CONTRAST {
        WHITE
    } else {
        BLACK
    }
}

/// The halo behind `ink` on `fill`: the fill pushed most of the way towards the opposite of the
/// ink (towards white behind dark ink, towards black behind light ink), so the halo reads as a
/// paler (or deeper) version of the fill rather than a white patch, and only raises the contrast.
pub fn halo_for(ink: Rgb, fill: Rgb) -> Rgb {
    let towards = if relative_luminance(ink) < 0.5 {
        255.0
    } else {
        0.0
    };
    let mix = |c: u8| (f64::from(c) + (towards - f64::from(c)) * 0.6).round() as u8;
    Rgb(fill.0.map(mix))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn known_values_of_the_standard() {
        // WCAG 2.1: black on white is 21:1 and any colour on itself 1:1 (the ends of the range
        // the definition of "contrast ratio" states).
        assert!((contrast_ratio(BLACK, WHITE) - 21.0).abs() < 1e-9);
        assert!((contrast_ratio(WHITE, WHITE) - 1.0).abs() < 1e-12);
        assert_eq!(relative_luminance(BLACK), 0.0);
        assert!((relative_luminance(WHITE) - 1.0).abs() < 1e-12);
        // #777777 on white is about 4.48:1, just short of 4.5 (a well-known example, from memory),
        // while #767676 is the lightest grey that passes at about 4.54:1 (also from memory).
        let grey77 = contrast_ratio(Rgb([0x77, 0x77, 0x77]), WHITE);
        assert!((grey77 - 4.48).abs() < 0.01, "{grey77}");
        let grey76 = contrast_ratio(Rgb([0x76, 0x76, 0x76]), WHITE);
        assert!((grey76 - 4.54).abs() < 0.01, "{grey76}");
        // Symmetric: the order of the two colours does not matter.
        let a = Rgb([0x20, 0x60, 0xa0]);
        assert_eq!(contrast_ratio(a, WHITE), contrast_ratio(WHITE, a));
    }

    #[test]
    fn ink_reaches_four_and_a_half_on_every_grey_and_on_the_worst_mid_tones() {
        // Every grey from black to white, and every colour on a coarse grid of the cube: the
        // chosen ink always reaches the AA ratio.
        for v in 0..=255u8 {
            let fill = Rgb([v, v, v]);
            assert!(
                contrast_ratio(ink_for(fill), fill) >= MIN_TEXT_CONTRAST,
                "{v}"
            );
        }
        for r in (0..=255u8).step_by(15) {
            for g in (0..=255u8).step_by(15) {
                for b in (0..=255u8).step_by(15) {
                    let fill = Rgb([r, g, b]);
                    let ink = ink_for(fill);
                    assert!(contrast_ratio(ink, fill) >= MIN_TEXT_CONTRAST);
                    // The halo never lowers the contrast the ink has against the fill.
                    let halo = halo_for(ink, fill);
                    assert!(contrast_ratio(ink, halo) >= contrast_ratio(ink, fill) - 1e-9);
                }
            }
        }
        // Light fills take the soft dark ink, dark fills white.
        assert_eq!(ink_for(Rgb([0xf4, 0xf4, 0xf2])), DARK_INK);
        assert_eq!(ink_for(Rgb([0x20, 0x30, 0x60])), WHITE);
    }
}
