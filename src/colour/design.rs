//! The search that designed Tinct's default palettes ([`super::palettes`]).
//!
//! Kept in the code so the palettes can be checked and re-derived: a unit test runs the search
//! for every size and purpose and compares its result with the committed values. The method is a
//! plain maximin design: candidates are sRGB colours on a grid of 16 levels per channel, kept when
//! they suit the [`Purpose`]; a greedy start adds the candidate farthest from those chosen, and a
//! local search then replaces one colour at a time while that improves, in order:
//! 1. the smallest worst-case ratio over all pairs: ΔE00 under normal vision and the three
//!    simulations against 10, and for greyscale-safe palettes also greyscale ΔL\* against 15;
//! 2. the smallest ΔE00 over all pairs under normal vision (most readers see in full colour, so
//!    among equally safe palettes we take the one with the clearest hues);
//! 3. the sum of the worst-case ratios.
//!
//! The two purposes:
//! - [`Purpose::Colour`], for maps printed or shown in colour: fills of equal visual weight, so
//!   that none looks highlighted. Lightness within one 25 L\* band (the band is searched: L\* 54
//!   to 79 up to 66 to 91, the best palette wins), moderate chroma (C\*ab 15 to 40), and no hue
//!   that reads as water (CIELAB hue angle 190 to 290 degrees, blues and cyans, see
//!   [`super::weight::reads_as_water`]), so that land never looks like sea or lake.
//! - [`Purpose::Greyscale`], for maps that will be photocopied: lightness steps of at least 15 L\*
//!   between every pair as well, which forces one fill down to about L\* 47: in colour that fill
//!   weighs more than the rest. L\* 46 to 93, so black labels stay legible on the darkest fill;
//!   chroma 12 to 50, and at most 50 - 0.6 (L\* - 46) so pale fills stay pastel; no hue that
//!   reads as water either.
//!
//! Deterministic: no randomness, ties go to the earlier candidate.

use super::ciede2000::ciede2000;
use super::cvd::Vision;
use super::distinct::Thresholds;
use super::space::{Lab, Srgb8, linear_to_lab, srgb8_to_linear};

/// What a palette is designed for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Purpose {
    /// Fills of equal visual weight for colour output (the default).
    Colour,
    /// Fills that stay apart in a greyscale copy, at the cost of one dark fill.
    Greyscale,
}

impl Purpose {
    /// The purpose an existing palette serves: greyscale-safe when it has two or more fills and
    /// every pair is at least the greyscale threshold apart in L\*, colour otherwise.
    pub fn of(colours: &[Srgb8], thresholds: &Thresholds) -> Purpose {
        let l: Vec<f64> = colours
            .iter()
            .map(|&c| super::space::lightness(c))
            .collect();
        let apart = l.iter().enumerate().all(|(i, a)| {
            l[i + 1..]
                .iter()
                .all(|b| (a - b).abs() >= thresholds.grey_delta_l)
        });
        if colours.len() >= 2 && apart {
            Purpose::Greyscale
        } else {
            Purpose::Colour
        }
    }
}

/// The candidates' limits for one purpose.
#[derive(Clone, Copy)]
struct Rules {
    lightness: (f64, f64),
    chroma: (f64, f64),
    /// Pale fills stay pastel: chroma at most `chroma.1 - pastel * (L* - lightness.0)`.
    pastel: f64,
    greyscale: bool,
    avoid_water: bool,
    /// Visual weight (ΔE00 from white) limits, for fills of equal weight.
    weight: (f64, f64),
}

const GREYSCALE: Rules = Rules {
    lightness: (46.0, 93.0),
    chroma: (12.0, 50.0),
    pastel: 0.6,
    greyscale: true,
    avoid_water: true,
    weight: (0.0, 100.0),
};

/// The lightness bands tried for colour palettes: each 25 L\* wide, from these lower ends.
const COLOUR_BANDS: [f64; 4] = [54.0, 58.0, 62.0, 66.0];

/// The weight bands tried for colour palettes: each 14 wide (in ΔE00 from white), from these
/// lower ends; narrower than the palette check's margin for a dominant fill.
const WEIGHT_BANDS: [f64; 4] = [16.0, 19.0, 22.0, 25.0];
const WEIGHT_BAND_WIDTH: f64 = 15.0;

fn colour_rules(low: f64, weight_low: f64) -> Rules {
    Rules {
        lightness: (low, low + 25.0),
        chroma: (15.0, 40.0),
        pastel: 0.0,
        greyscale: false,
        avoid_water: true,
        weight: (weight_low, weight_low + WEIGHT_BAND_WIDTH),
    }
}

struct Candidate {
    rgb: Srgb8,
    labs: [Lab; 4],
}

fn candidate(rgb: Srgb8) -> Candidate {
    let linear = srgb8_to_linear(rgb);
    Candidate {
        rgb,
        labs: Vision::ALL.map(|v| linear_to_lab(v.simulate_linear(linear))),
    }
}

/// Designed land fills keep clear of the hues that read as water with a margin (10 degrees on
/// the cyan side, 20 on the violet side, where pale lavenders still look bluish on paper), so
/// that none sits on the edge of the palette check's band.
fn near_water(lab: Lab) -> bool {
    let h = super::weight::hue_angle(lab);
    lab.a.hypot(lab.b) >= super::weight::WATER_MIN_CHROMA
        && (super::weight::WATER_HUES.0 - 10.0..=super::weight::WATER_HUES.1 + 20.0).contains(&h)
}

fn candidates(rules: &Rules) -> Vec<Candidate> {
    let mut out = Vec::new();
    for r in 0..16u8 {
        for g in 0..16u8 {
            for b in 0..16u8 {
                let c = candidate([r * 17, g * 17, b * 17]);
                let normal = c.labs[0];
                let chroma = normal.a.hypot(normal.b);
                let max_chroma = rules.chroma.1 - rules.pastel * (normal.l - rules.lightness.0);
                if (rules.lightness.0..=rules.lightness.1).contains(&normal.l)
                    && chroma >= rules.chroma.0
                    && chroma <= max_chroma
                    && !(rules.avoid_water && near_water(normal))
                    && (rules.weight.0..=rules.weight.1)
                        .contains(&super::weight::visual_weight(c.rgb))
                {
                    out.push(c);
                }
            }
        }
    }
    out
}

/// (worst ratio, ΔE00 under normal vision) for two candidates.
fn pair(a: &Candidate, b: &Candidate, t: &Thresholds, greyscale: bool) -> (f64, f64) {
    let mut min_e = f64::INFINITY;
    for v in 0..4 {
        min_e = min_e.min(ciede2000(a.labs[v], b.labs[v]));
    }
    let normal = ciede2000(a.labs[0], b.labs[0]);
    let mut ratio = min_e / t.delta_e00;
    if greyscale {
        // Greyscale by the normal L*, which is the luminance-based lightness.
        let dl = (a.labs[0].l - b.labs[0].l).abs();
        ratio = ratio.min(dl / t.grey_delta_l);
    }
    (ratio, normal)
}

#[derive(Clone, Copy, PartialEq, PartialOrd)]
struct Score(f64, f64, f64);

fn score(chosen: &[usize], all: &[Candidate], t: &Thresholds, greyscale: bool) -> Score {
    let mut s = Score(f64::INFINITY, f64::INFINITY, 0.0);
    for i in 0..chosen.len() {
        for j in i + 1..chosen.len() {
            let (r, e) = pair(&all[chosen[i]], &all[chosen[j]], t, greyscale);
            s.0 = s.0.min(r);
            s.1 = s.1.min(e);
            s.2 += r;
        }
    }
    s
}

/// Colours to add to an existing palette: `extra` candidates chosen one at a time, each the
/// farthest (by the same worst-case ratio as [`design_palette`]) from every colour already in the
/// palette and those added before it, among the candidates of `purpose` (for colour, in the
/// 25 L\* band that starts at the palette's darkest fill, so the new fills weigh the
/// same). The existing colours stay as they are.
///
/// # Complexity
/// O(extra · (existing + extra) · m) CIEDE2000 evaluations for `m` candidates (about 1,500).
pub fn extend_palette(
    existing: &[Srgb8],
    extra: usize,
    thresholds: &Thresholds,
    purpose: Purpose,
) -> Vec<Srgb8> {
    let mut present: Vec<Candidate> = existing.iter().map(|&rgb| candidate(rgb)).collect();
    let rules = match purpose {
        Purpose::Greyscale => GREYSCALE,
        Purpose::Colour => {
            let darkest = present
                .iter()
                .map(|c| c.labs[0].l)
                .fold(f64::INFINITY, f64::min);
            let low = if darkest.is_finite() {
                darkest.clamp(COLOUR_BANDS[0], COLOUR_BANDS[COLOUR_BANDS.len() - 1])
            } else {
                COLOUR_BANDS[2]
            };
            let weights: Vec<f64> = existing
                .iter()
                .map(|&c| super::weight::visual_weight(c))
                .collect();
            let lightest = weights.iter().copied().fold(f64::INFINITY, f64::min);
            let weight_low = if lightest.is_finite() {
                lightest.clamp(WEIGHT_BANDS[0], WEIGHT_BANDS[WEIGHT_BANDS.len() - 1])
            } else {
                WEIGHT_BANDS[1]
            };
            colour_rules(low, weight_low)
        }
    };
    let all = candidates(&rules);
    let mut added = Vec::new();
    let mut used = vec![false; all.len()];
    for _ in 0..extra {
        let mut best: Option<(f64, usize)> = None;
        for (c, candidate) in all.iter().enumerate() {
            if used[c] || present.iter().any(|p| p.rgb == candidate.rgb) {
                continue;
            }
            let d = present
                .iter()
                .map(|x| pair(x, candidate, thresholds, rules.greyscale).0)
                .fold(f64::INFINITY, f64::min);
            if best.is_none_or(|(b, _)| d > b) {
                best = Some((d, c));
            }
        }
        let Some((_, c)) = best else { break };
        used[c] = true;
        added.push(all[c].rgb);
        present.push(candidate(all[c].rgb));
    }
    added
}

/// Designs a palette of `n` colours (2 or more) for `purpose` as described in the module
/// documentation, ordered from light to dark.
///
/// # Complexity
/// Each improvement round is O(n² · m) CIEDE2000 evaluations for `m` candidates (a few hundred
/// to about 1,500); the number of rounds is small in practice and capped at 60; colour palettes
/// run the search once per lightness band.
pub fn design_palette(n: usize, thresholds: &Thresholds, purpose: Purpose) -> Vec<Srgb8> {
    match purpose {
        Purpose::Greyscale => design_with(n, thresholds, &GREYSCALE).1,
        Purpose::Colour => {
            let mut best: Option<(Score, Vec<Srgb8>)> = None;
            for low in COLOUR_BANDS {
                for weight_low in WEIGHT_BANDS {
                    let rules = colour_rules(low, weight_low);
                    let (s, palette) = design_with(n, thresholds, &rules);
                    if palette.len() == n && best.as_ref().is_none_or(|(b, _)| s > *b) {
                        best = Some((s, palette));
                    }
                }
            }
            best.map(|(_, p)| p).unwrap_or_default()
        }
    }
}

fn design_with(n: usize, thresholds: &Thresholds, rules: &Rules) -> (Score, Vec<Srgb8>) {
    let all = candidates(rules);
    let g = rules.greyscale;
    if all.is_empty() || n == 0 {
        return (Score(0.0, 0.0, 0.0), Vec::new());
    }
    // Greedy start: the lightest candidate, then each time the farthest from those chosen.
    let mut chosen = vec![
        (0..all.len())
            .max_by(|&a, &b| all[a].labs[0].l.total_cmp(&all[b].labs[0].l))
            .unwrap_or(0),
    ];
    while chosen.len() < n.min(all.len()) {
        let mut best: Option<(f64, usize)> = None;
        for c in 0..all.len() {
            if chosen.contains(&c) {
                continue;
            }
            let d = chosen
                .iter()
                .map(|&x| pair(&all[x], &all[c], thresholds, g).0)
                .fold(f64::INFINITY, f64::min);
            if best.is_none_or(|(b, _)| d > b) {
                best = Some((d, c));
            }
        }
        match best {
            Some((_, c)) => chosen.push(c),
            None => break,
        }
    }
    // Local search: the best single replacement, while it improves the score.
    let mut current = score(&chosen, &all, thresholds, g);
    for _round in 0..60 {
        let mut best: Option<(Score, usize, usize)> = None;
        for slot in 0..chosen.len() {
            for c in 0..all.len() {
                if chosen.contains(&c) {
                    continue;
                }
                let mut trial = chosen.clone();
                trial[slot] = c;
                let s = score(&trial, &all, thresholds, g);
                if s > current && best.as_ref().is_none_or(|(b, _, _)| s > *b) {
                    best = Some((s, slot, c));
                }
            }
        }
        match best {
            Some((s, slot, c)) => {
                chosen[slot] = c;
                current = s;
            }
            None => break,
        }
    }
    let mut out: Vec<(f64, Srgb8)> = chosen
        .iter()
        .map(|&c| (all[c].labs[0].l, all[c].rgb))
        .collect();
    out.sort_by(|a, b| b.0.total_cmp(&a.0));
    (current, out.into_iter().map(|(_, rgb)| rgb).collect())
}
