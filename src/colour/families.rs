//! Palettes of families and tints, for colours that follow a hierarchy: each family is one hue
//! (a parent unit's), each tint a lightness of it (its children's).
//!
//! The families' hues are spread evenly over the CIELAB hue circle outside the arc that reads
//! as water ([`WATER_HUES`], the blues and cyans), so that families differ in hue as much as
//! they can; each family keeps one hue through all its tints. The tints of
//! every family span the same lightness range, [`TINT_LIGHTEST`] to [`TINT_DARKEST`] L*, in
//! steps that CIEDE2000 sees as equal (its lightness weight S_L grows away from L* 50, so the
//! steps are longer at the light end), lightest first, with chroma growing towards the dark end (a light tint of a
//! strong hue reads as a different hue); a colour outside sRGB loses chroma until it fits.
//! Tints of one family therefore differ in lightness, which every colour-vision simulation and a
//! greyscale copy keep. Neighbouring children of different parents differ in hue and sometimes
//! also in lightness; the palette check measures those pairs as for any palette.

use super::space::{Lab, Srgb8, lab_to_srgb8};

/// The lightest tint's CIELAB lightness.
pub const TINT_LIGHTEST: f64 = 94.0;
/// The darkest tint's lightness: near the darkest fill on which black text still meets the WCAG
/// 2.1 contrast ratio of 4.5:1 (L* 50 has relative luminance 0.184: (0.184 + 0.05) / 0.05 = 4.7).
pub const TINT_DARKEST: f64 = 50.0;
/// CIELAB hue angles (degrees) that read as water: no family takes a hue in this arc.
pub const WATER_HUES: (f64, f64) = (190.0, 290.0);
/// The chroma of a family's darkest tint (lighter tints take less; see [`family_palette`]).
pub const FAMILY_CHROMA: f64 = 36.0;

/// A name for a family by its CIELAB hue angle in degrees: our own words for the arcs.
pub fn hue_name(degrees: f64) -> &'static str {
    const NAMES: [(f64, &str); 9] = [
        (15.0, "Berry"),
        (45.0, "Rose"),
        (70.0, "Clay"),
        (95.0, "Ochre"),
        (125.0, "Olive"),
        (165.0, "Fern"),
        (190.0, "Jade"),
        (320.0, "Violet"),
        (345.0, "Plum"),
    ];
    let d = degrees.rem_euclid(360.0);
    NAMES
        .iter()
        .find(|(upto, _)| d < *upto)
        .map_or("Berry", |(_, n)| n)
}

/// The most families and tints a palette of families offers.
pub const MAX_FAMILIES: usize = 8;
pub const MAX_TINTS: usize = 6;

/// The lightness at `t` (0 the lightest tint, 1 the darkest), so that equal steps of `t` are
/// equal steps of CIEDE2000's lightness difference ΔL* / S_L, with S_L = 1 + 0.015 (L* - 50)² /
/// √(20 + (L* - 50)²) (Sharma, Wu and Dalal 2005, eq. 14): the inverse of the integral of
/// 1 / S_L, by steps of 0.01 L*.
fn lightness_at(t: f64) -> f64 {
    let s_l = |l: f64| 1.0 + 0.015 * (l - 50.0).powi(2) / (20.0 + (l - 50.0).powi(2)).sqrt();
    let step = 0.01;
    let steps = ((TINT_LIGHTEST - TINT_DARKEST) / step).round() as usize;
    let total: f64 = (0..steps)
        .map(|k| step / s_l(TINT_LIGHTEST - (k as f64 + 0.5) * step))
        .sum();
    let goal = t.clamp(0.0, 1.0) * total;
    let mut run = 0.0;
    for k in 0..steps {
        let l = TINT_LIGHTEST - (k as f64 + 0.5) * step;
        run += step / s_l(l);
        if run >= goal {
            return TINT_LIGHTEST - (k as f64 + 1.0) * step;
        }
    }
    TINT_DARKEST
}

/// One fill of a palette of families.
#[derive(Clone, Debug, PartialEq)]
pub struct FamilyFill {
    /// "Olive 2": the family's name and the tint's number, lightest 1.
    pub name: String,
    pub colour: Srgb8,
    pub family: usize,
    pub tint: usize,
}

/// A palette of `families` families of `tints` tints each, family-major (fill `family * tints +
/// tint`); `None` when either count is 0 or above [`MAX_FAMILIES`] / [`MAX_TINTS`].
pub fn family_palette(families: usize, tints: usize) -> Option<Vec<FamilyFill>> {
    if families == 0 || tints == 0 || families > MAX_FAMILIES || tints > MAX_TINTS {
        return None;
    }
    let mut out = Vec::with_capacity(families * tints);
    for family in 0..families {
        // Hues spread evenly over the arc that avoids water's blues and cyans.
        let degrees = (WATER_HUES.1
            + (360.0 - (WATER_HUES.1 - WATER_HUES.0)) * (family as f64 + 0.5) / families as f64)
            .rem_euclid(360.0);
        let hue = degrees.to_radians();
        let name = hue_name(degrees);
        let chroma = FAMILY_CHROMA;
        for tint in 0..tints {
            // Position from the lightest (0) to the darkest (1).
            let t = if tints == 1 {
                0.5
            } else {
                tint as f64 / (tints - 1) as f64
            };
            let l = lightness_at(t);
            // Chroma from a third of the hue's own at the lightest to all of it at the darkest.
            let mut c = chroma * (1.0 / 3.0 + 2.0 / 3.0 * t);
            let fill = loop {
                let (rgb, inside) = lab_to_srgb8(Lab {
                    l,
                    a: c * hue.cos(),
                    b: c * hue.sin(),
                });
                if inside || c < 0.5 {
                    break rgb;
                }
                c *= 0.9;
            };
            out.push(FamilyFill {
                name: format!("{name} {}", tint + 1),
                colour: fill,
                family,
                tint,
            });
        }
    }
    Some(out)
}

/// True when `colours` are exactly a palette of families made by [`family_palette`] with at
/// least two tints: its tints differ in weight by design, so the check for a fill that
/// dominates does not apply.
pub fn is_family_palette(colours: &[Srgb8]) -> bool {
    (1..=MAX_FAMILIES).any(|f| {
        (2..=MAX_TINTS).any(|t| {
            f * t == colours.len()
                && family_palette(f, t)
                    .is_some_and(|p| p.iter().zip(colours).all(|(fill, c)| fill.colour == *c))
        })
    })
}

#[cfg(test)]
mod tests {
    use super::super::ciede2000::ciede2000;
    use super::super::cvd::Vision;
    use super::super::space::{lightness, srgb8_to_lab};
    use super::*;

    #[test]
    fn tints_of_one_family_stay_apart_in_every_view_and_in_greyscale() {
        for families in 1..=MAX_FAMILIES {
            for tints in 1..=4 {
                let p = family_palette(families, tints).unwrap();
                assert_eq!(p.len(), families * tints);
                for f in 0..families {
                    let fam: Vec<&FamilyFill> = p.iter().filter(|x| x.family == f).collect();
                    for (i, a) in fam.iter().enumerate() {
                        for b in &fam[i + 1..] {
                            for vision in Vision::ALL {
                                let (x, y) = (vision.simulate(a.colour), vision.simulate(b.colour));
                                let d = ciede2000(srgb8_to_lab(x), srgb8_to_lab(y));
                                assert!(d >= 10.0, "{} / {} under {vision:?}: {d}", a.name, b.name);
                            }
                            let dl = (lightness(a.colour) - lightness(b.colour)).abs();
                            assert!(dl >= 10.0, "{} / {}: {dl} L*", a.name, b.name);
                        }
                    }
                }
            }
        }
    }

    #[test]
    fn a_palette_of_families_is_recognised_and_a_changed_one_is_not() {
        let mut colours: Vec<Srgb8> = family_palette(4, 3)
            .unwrap()
            .iter()
            .map(|f| f.colour)
            .collect();
        assert!(is_family_palette(&colours));
        colours[5] = [0x80, 0x80, 0x80];
        assert!(!is_family_palette(&colours));
        let one_tint: Vec<Srgb8> = family_palette(4, 1)
            .unwrap()
            .iter()
            .map(|f| f.colour)
            .collect();
        assert!(!is_family_palette(&one_tint));
    }

    #[test]
    fn counts_outside_the_offer_give_none() {
        assert!(family_palette(0, 3).is_none());
        assert!(family_palette(3, 0).is_none());
        assert!(family_palette(MAX_FAMILIES + 1, 2).is_none());
        assert!(family_palette(2, MAX_TINTS + 1).is_none());
        assert!(family_palette(MAX_FAMILIES, MAX_TINTS).is_some());
    }
}
