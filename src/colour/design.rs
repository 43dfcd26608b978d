//! The search that designed Tinct's default palettes ([`super::palettes`]).
//!
//! Kept in the code so the palettes can be checked and re-derived: a unit test runs the search
//! for every size and compares its result with the committed values. The method is a plain
//! maximin design: candidates are sRGB colours on a grid of 16 levels per channel, kept when they
//! print well (L\* 46 to 93, so black labels stay legible on the darkest fill; chroma C\*ab 12 to 50,
//! moderate, so large areas are not loud, and at most 50 - 0.6 (L\* - 46) so pale fills stay
//! pastel); a greedy start adds the candidate farthest from those
//! chosen, and a local search then replaces one colour at a time while that improves, in order:
//! 1. the smallest worst-case ratio over all pairs ([`super::PairDifference::worst_ratio`]: ΔE00
//!    under normal vision and the three simulations against 10, greyscale ΔL\* against 15);
//! 2. the smallest ΔE00 over all pairs under normal vision (most readers see in full colour, so
//!    among equally safe palettes we take the one with the clearest hues);
//! 3. the sum of the worst-case ratios.
//!
//! Deterministic: no randomness, ties go to the earlier candidate.

use super::ciede2000::ciede2000;
use super::cvd::Vision;
use super::distinct::Thresholds;
use super::space::{Lab, Srgb8, linear_to_lab, srgb8_to_linear};

/// Lightness and chroma limits of the candidates.
const L_RANGE: (f64, f64) = (46.0, 93.0);
const C_RANGE: (f64, f64) = (12.0, 50.0);

struct Candidate {
    rgb: Srgb8,
    labs: [Lab; 4],
}

fn candidates() -> Vec<Candidate> {
    let mut out = Vec::new();
    for r in 0..16u8 {
        for g in 0..16u8 {
            for b in 0..16u8 {
                let rgb = [r * 17, g * 17, b * 17];
                let linear = srgb8_to_linear(rgb);
                let labs = Vision::ALL.map(|v| linear_to_lab(v.simulate_linear(linear)));
                let normal = labs[0];
                let chroma = normal.a.hypot(normal.b);
                // Pale fills stay pastel: the lighter the colour, the less chroma it may have.
                let max_chroma = C_RANGE.1 - 0.6 * (normal.l - L_RANGE.0);
                if (L_RANGE.0..=L_RANGE.1).contains(&normal.l)
                    && chroma >= C_RANGE.0
                    && chroma <= max_chroma
                {
                    out.push(Candidate { rgb, labs });
                }
            }
        }
    }
    out
}

/// (worst ratio, ΔE00 under normal vision) for two candidates.
fn pair(a: &Candidate, b: &Candidate, t: &Thresholds) -> (f64, f64) {
    let mut min_e = f64::INFINITY;
    for v in 0..4 {
        min_e = min_e.min(ciede2000(a.labs[v], b.labs[v]));
    }
    // Greyscale by the normal L*, which is the luminance-based lightness.
    let dl = (a.labs[0].l - b.labs[0].l).abs();
    let normal = ciede2000(a.labs[0], b.labs[0]);
    ((min_e / t.delta_e00).min(dl / t.grey_delta_l), normal)
}

#[derive(Clone, Copy, PartialEq, PartialOrd)]
struct Score(f64, f64, f64);

fn score(chosen: &[usize], all: &[Candidate], t: &Thresholds) -> Score {
    let mut s = Score(f64::INFINITY, f64::INFINITY, 0.0);
    for i in 0..chosen.len() {
        for j in i + 1..chosen.len() {
            let (r, e) = pair(&all[chosen[i]], &all[chosen[j]], t);
            s.0 = s.0.min(r);
            s.1 = s.1.min(e);
            s.2 += r;
        }
    }
    s
}

/// Colours to add to an existing palette: `extra` candidates chosen one at a time, each the
/// farthest (by the same worst-case ratio as [`design_palette`]) from every colour already in the
/// palette and those added before it. The existing colours stay as they are.
///
/// # Complexity
/// O(extra · (existing + extra) · m) CIEDE2000 evaluations for `m` candidates (about 1,500).
pub fn extend_palette(existing: &[Srgb8], extra: usize, thresholds: &Thresholds) -> Vec<Srgb8> {
    let all = candidates();
    let mut present: Vec<Candidate> = existing
        .iter()
        .map(|&rgb| {
            let linear = srgb8_to_linear(rgb);
            Candidate {
                rgb,
                labs: Vision::ALL.map(|v| linear_to_lab(v.simulate_linear(linear))),
            }
        })
        .collect();
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
                .map(|x| pair(x, candidate, thresholds).0)
                .fold(f64::INFINITY, f64::min);
            if best.is_none_or(|(b, _)| d > b) {
                best = Some((d, c));
            }
        }
        let Some((_, c)) = best else { break };
        used[c] = true;
        added.push(all[c].rgb);
        present.push(Candidate {
            rgb: all[c].rgb,
            labs: all[c].labs,
        });
    }
    added
}

/// Designs a palette of `n` colours (2 or more) as described in the module documentation,
/// ordered from light to dark.
///
/// # Complexity
/// Each improvement round is O(n² · m) CIEDE2000 evaluations for `m` candidates (about 1,500);
/// the number of rounds is small in practice and capped at 60.
pub fn design_palette(n: usize, thresholds: &Thresholds) -> Vec<Srgb8> {
    let all = candidates();
    if all.is_empty() || n == 0 {
        return Vec::new();
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
                .map(|&x| pair(&all[x], &all[c], thresholds).0)
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
    let mut current = score(&chosen, &all, thresholds);
    for _round in 0..60 {
        let mut best: Option<(Score, usize, usize)> = None;
        for slot in 0..chosen.len() {
            for c in 0..all.len() {
                if chosen.contains(&c) {
                    continue;
                }
                let mut trial = chosen.clone();
                trial[slot] = c;
                let s = score(&trial, &all, thresholds);
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
    out.into_iter().map(|(_, rgb)| rgb).collect()
}
