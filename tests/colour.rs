//! Colour science against outside sources: CIEDE2000 against Sharma, Wu and Dalal (2005), sRGB to
//! CIELAB and the Machado (2009) simulations against colour-science and colorspacious (through
//! `tests/scripts/colour_reference.py`, whose output is `tests/data/colour/reference.json`), and
//! slot assignment on cases solved by hand.

use serde_json::Value;
use tinct::colour::{
    self, Lab, Thresholds, Vision, assign_slots, assignment_score, ciede2000, srgb8_to_lab,
};

use super::support::root;

fn reference() -> Value {
    let path = root().join("tests/data/colour/reference.json");
    let text = std::fs::read_to_string(&path).expect("reference data is committed");
    serde_json::from_str(&text).expect("reference data is JSON")
}

fn triple(v: &Value) -> [f64; 3] {
    let a = v.as_array().expect("an array of three numbers");
    [0, 1, 2].map(|i| a[i].as_f64().expect("a number"))
}

fn hex(v: &Value) -> [u8; 3] {
    let s = v.as_str().expect("a hex string");
    tinct::doc::Rgb::from_hex(s).expect("valid hex").0
}

#[test]
fn ciede2000_matches_all_34_pairs_of_sharma_wu_dalal_2005() {
    // Source: Sharma, Wu and Dalal (2005), Table 1 (the values typed from memory and confirmed to
    // 4 decimals by colour-science 0.4.7's delta_E_CIE2000 in tests/scripts/colour_reference.py).
    let data = reference();
    let pairs = data["sharma_2005"].as_array().expect("pairs");
    assert_eq!(pairs.len(), 34);
    for p in pairs {
        let [l1, a1, b1] = triple(&p["lab1"]);
        let [l2, a2, b2] = triple(&p["lab2"]);
        let expected = p["delta_e00"].as_f64().expect("number");
        let ours = ciede2000(
            Lab {
                l: l1,
                a: a1,
                b: b1,
            },
            Lab {
                l: l2,
                a: a2,
                b: b2,
            },
        );
        assert!(
            (ours - expected).abs() < 5e-5,
            "pair {}: ours {ours:.5}, published {expected:.4}",
            p["pair"]
        );
        // The formula is symmetric (Sharma et al. 2005, section 3): pairs 7 and 8 are swapped copies.
        let back = ciede2000(
            Lab {
                l: l2,
                a: a2,
                b: b2,
            },
            Lab {
                l: l1,
                a: a1,
                b: b1,
            },
        );
        assert!((back - ours).abs() < 1e-9);
    }
}

#[test]
fn srgb_to_cielab_matches_colour_science_and_colorspacious() {
    // Source: colour-science 0.4.7 (sRGB_to_XYZ, XYZ_to_Lab with D65) and colorspacious 1.1.2
    // (sRGB255 -> CIELab). They derive the sRGB matrix from the primaries, we use the four-decimal
    // matrix printed in IEC 61966-2-1; the difference is below 0.02 in L*, a*, b*.
    let data = reference();
    for c in data["srgb"].as_array().expect("colours") {
        let rgb = hex(&c["hex"]);
        let ours = srgb8_to_lab(rgb);
        for key in ["lab_colour_science", "lab_colorspacious"] {
            let [l, a, b] = triple(&c[key]);
            let err = (ours.l - l)
                .abs()
                .max((ours.a - a).abs())
                .max((ours.b - b).abs());
            assert!(
                err < 0.02,
                "{} ({key}): ours {ours:?}, reference {l} {a} {b}",
                c["hex"]
            );
        }
        // Greyscale lightness is the L* of the same conversion.
        assert!((colour::lightness(rgb) - ours.l).abs() < 1e-9);
        // Linear RGB: the IEC 61966-2-1 decoding, as colorspacious computes it.
        let linear = colour::srgb8_to_linear(rgb);
        let theirs = triple(&c["linear"]);
        for i in 0..3 {
            assert!((linear[i] - theirs[i]).abs() < 1e-9, "{}", c["hex"]);
        }
    }
}

#[test]
fn simulations_match_colorspacious_machado_2009() {
    // Source: colorspacious 1.1.2's "sRGB1+CVD" at severity 100 (Machado, Oliveira and Fernandes
    // 2009), cross-checked in the script against colour-science's matrix_cvd_Machado2009.
    let data = reference();
    for c in data["srgb"].as_array().expect("colours") {
        let linear = colour::srgb8_to_linear(hex(&c["hex"]));
        for v in [Vision::Protanopia, Vision::Deuteranopia, Vision::Tritanopia] {
            let ours = v.simulate_linear(linear);
            let theirs = triple(&c["cvd_linear"][v.as_str()]);
            for i in 0..3 {
                assert!(
                    (ours[i] - theirs[i]).abs() < 1e-5,
                    "{} {}: ours {ours:?}, colorspacious {theirs:?}",
                    c["hex"],
                    v.as_str()
                );
            }
        }
    }
}

#[test]
fn slot_assignment_gives_the_most_bordering_classes_the_most_distinct_slots() {
    // Solved by hand: three classes all border each other, so every map has the same worst
    // bordering pair (slots 0 and 1 at 0.5, the only weak pair); the weighted sum then decides. Classes
    // 0 and 1 share 10 borders, the others 1 each, so 0 and 1 must not sit on the weak pair {0, 1}:
    // 0 -> 0, 1 -> 2, 2 -> 1 is the lexicographically smallest optimum (sum 10·2 + 1·0.5 + 1·2).
    let borders = vec![vec![0, 10, 1], vec![10, 0, 1], vec![1, 1, 0]];
    let d = vec![
        vec![f64::INFINITY, 0.5, 2.0],
        vec![0.5, f64::INFINITY, 2.0],
        vec![2.0, 2.0, f64::INFINITY],
    ];
    let map = assign_slots(&borders, &d, &[None; 3], None).expect("an assignment");
    assert_eq!(map, vec![0, 2, 1]);
    // Brute force over all six maps confirms no map scores higher.
    let best = assignment_score(&borders, &d, &map);
    for p in [
        [0, 1, 2],
        [0, 2, 1],
        [1, 0, 2],
        [1, 2, 0],
        [2, 0, 1],
        [2, 1, 0],
    ] {
        assert!(assignment_score(&borders, &d, &p) <= best, "{p:?}");
    }
}

#[test]
fn slot_assignment_keeps_fixed_classes_and_prefers_the_worst_pair_first() {
    // By hand: four slots, slot 3 is close to slot 0 (0.3); class 0 is pinned to slot 0. Classes 0
    // and 1 border each other once; classes 1 and 2 border 50 times but 2 never meets 0. The
    // smallest bordering distinctness decides first, so class 1 must avoid slot 3 (next to pinned
    // slot 0), whatever the weights say.
    let borders = vec![vec![0, 1, 0], vec![1, 0, 50], vec![0, 50, 0]];
    let mut d = vec![vec![1.0; 4]; 4];
    d[0][3] = 0.3;
    d[3][0] = 0.3;
    d[1][2] = 3.0;
    d[2][1] = 3.0;
    let map = assign_slots(&borders, &d, &[Some(0), None, None], None).expect("an assignment");
    assert_eq!(map[0], 0, "the pinned class keeps its slot");
    assert_ne!(map[1], 3);
    assert_eq!(
        (map[1].min(map[2]), map[1].max(map[2])),
        (1, 2),
        "the heavy pair takes the most distinct slots"
    );
    // A pin on a slot outside the palette is an error with the evidence.
    assert_eq!(
        assign_slots(&borders, &d, &[Some(7), None, None], None),
        Err(colour::AssignError::FixedOutOfRange { class: 0, slot: 7 })
    );
}

#[test]
fn greyscale_safe_palettes_pass_the_checks_they_were_designed_for() {
    // Thresholds as documented in src/colour/distinct.rs (ΔE00 10, greyscale ΔL* 15).
    // Three and four colours clear every view (the lightness range we allow, L* 46 to 93, holds
    // three steps of 15.67). From five colours on, greyscale cannot separate every pair (four
    // steps of 15 need 60 L*), so not every pair clears every view; the report and the slot
    // assignment deal with that on the map.
    let t = Thresholds::default();
    let palettes = colour::DEFAULT_PALETTES
        .iter()
        .filter(|p| p.purpose == colour::Purpose::Greyscale);
    let mut seen = 0;
    for palette in palettes {
        seen += 1;
        let n = palette.slots.len();
        assert!((3..=8).contains(&n));
        let names: std::collections::BTreeSet<&str> = palette.slots.iter().map(|s| s.0).collect();
        assert_eq!(names.len(), n, "{}: slot names are distinct", palette.name);
        for i in 0..n {
            for j in i + 1..n {
                let d = colour::pair_difference(palette.slots[i].1, palette.slots[j].1);
                if n <= 4 {
                    assert!(d.worst_ratio(&t) >= 1.0, "{} {i} {j}: {d:?}", palette.name);
                }
                // Five colours still clear every colour view (normal and the simulations), and
                // every palette keeps its colours apart for normal vision (ΔE00 15 up to five
                // colours, 10 beyond, with the hues that read as water left out).
                if n <= 5 {
                    assert!(
                        d.delta_e00.iter().all(|&e| e >= t.delta_e00),
                        "{} {i} {j}",
                        palette.name
                    );
                }
                let floor = if n <= 5 { 15.0 } else { t.delta_e00 };
                assert!(d.delta_e00[0] >= floor, "{} {i} {j}: {d:?}", palette.name);
            }
            // Light enough for black labels, and listed from light to dark (our own rules).
            let l = colour::lightness(palette.slots[i].1);
            assert!((45.9..=93.1).contains(&l), "{} {i}: L* {l}", palette.name);
            if i > 0 {
                assert!(l < colour::lightness(palette.slots[i - 1].1));
            }
        }
    }
    assert_eq!(seen, 6);
}

/// WCAG 2.1 relative luminance (success criterion 1.4.3, definition of relative luminance),
/// written again here from the standard rather than taken from the library.
fn wcag_luminance(rgb: [u8; 3]) -> f64 {
    let channel = |c: u8| {
        let c = f64::from(c) / 255.0;
        if c <= 0.03928 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        }
    };
    0.2126 * channel(rgb[0]) + 0.7152 * channel(rgb[1]) + 0.0722 * channel(rgb[2])
}

#[test]
fn colour_palettes_have_fills_of_equal_weight_that_stay_distinct_and_never_read_as_water() {
    // What the cartography issue asks of the default palettes for colour output:
    // - fills within 25 L* of each other, moderate chroma (C*ab 15 to 40, our choice);
    // - no hue that reads as water: CIELAB hue angle 190 to 290 degrees at chroma 8 or more
    //   (h_ab = atan2(b*, a*), CIE 15:2004);
    // - every pair at least ΔE00 10 apart in normal vision and the three simulations (CIEDE2000
    //   as checked against Sharma, Wu and Dalal 2005 in this file), 15 up to five colours;
    // - black labels meet the WCAG 2.1 contrast ratio 4.5:1 on every fill (the ratio
    //   (L1 + 0.05) / (L2 + 0.05) of the standard);
    // - no fill dominates: visual weight (ΔE00 from white) within 15 of every other fill.
    let t = Thresholds::default();
    let mut seen = 0;
    for palette in colour::DEFAULT_PALETTES
        .iter()
        .filter(|p| p.purpose == colour::Purpose::Colour)
    {
        seen += 1;
        let n = palette.slots.len();
        let labs: Vec<colour::Lab> = palette
            .slots
            .iter()
            .map(|s| colour::srgb8_to_lab(s.1))
            .collect();
        let l_max = labs.iter().map(|c| c.l).fold(f64::MIN, f64::max);
        let l_min = labs.iter().map(|c| c.l).fold(f64::MAX, f64::min);
        assert!(
            l_max - l_min <= 25.0,
            "{}: L* {l_min:.1} to {l_max:.1}",
            palette.name
        );
        let weights: Vec<f64> = palette
            .slots
            .iter()
            .map(|s| colour::visual_weight(s.1))
            .collect();
        let w_max = weights.iter().copied().fold(f64::MIN, f64::max);
        let w_min = weights.iter().copied().fold(f64::MAX, f64::min);
        assert!(
            w_max - w_min <= 15.0,
            "{}: weights {weights:?}",
            palette.name
        );
        assert!(
            colour::dominant_fills(&palette.slots.iter().map(|s| s.1).collect::<Vec<_>>())
                .is_empty()
        );
        for (i, lab) in labs.iter().enumerate() {
            let chroma = lab.a.hypot(lab.b);
            let hue = lab.b.atan2(lab.a).to_degrees().rem_euclid(360.0);
            assert!(
                (14.9..=40.1).contains(&chroma),
                "{} {i}: C* {chroma:.1}",
                palette.name
            );
            assert!(
                !(190.0..=290.0).contains(&hue),
                "{} {i}: hue {hue:.0} reads as water",
                palette.name
            );
            let contrast = (wcag_luminance(palette.slots[i].1) + 0.05) / 0.05;
            assert!(
                contrast >= 4.5,
                "{} {i}: {contrast:.2}:1 with black",
                palette.name
            );
        }
        for i in 0..n {
            for j in i + 1..n {
                let d = colour::pair_difference(palette.slots[i].1, palette.slots[j].1);
                let floor = if n <= 5 { 15.0 } else { t.delta_e00 };
                assert!(
                    d.delta_e00.iter().all(|&e| e >= floor),
                    "{} {i} {j}: {d:?}",
                    palette.name
                );
            }
        }
    }
    assert_eq!(seen, 6);
}

/// The assignment objective, written again here from its documentation (not from the library):
/// the least distinctness over class pairs that border, then the border-weighted sum, then the
/// number of classes that keep their slot.
fn objective(borders: &[Vec<u64>], d: &[Vec<f64>], map: &[usize]) -> (f64, f64, usize) {
    let mut worst = f64::INFINITY;
    let mut sum = 0.0;
    for i in 0..map.len() {
        for j in i + 1..map.len() {
            let w = borders[i][j] + borders[j][i];
            if w > 0 {
                worst = worst.min(d[map[i]][map[j]]);
                sum += w as f64 * d[map[i]][map[j]];
            }
        }
    }
    let kept = (0..map.len()).filter(|&c| map[c] == c).count();
    (worst, sum, kept)
}

fn all_maps(k: usize, n: usize, fixed: &[Option<usize>]) -> Vec<Vec<usize>> {
    let mut out = Vec::new();
    let mut stack = vec![Vec::new()];
    while let Some(partial) = stack.pop() {
        if partial.len() == k {
            out.push(partial);
            continue;
        }
        for s in 0..n {
            let allowed = match fixed[partial.len()] {
                Some(f) => f == s,
                None => !fixed.contains(&Some(s)),
            };
            if allowed && !partial.contains(&s) {
                let mut next = partial.clone();
                next.push(s);
                stack.push(next);
            }
        }
    }
    out
}

/// A random slot-assignment case: `k` classes with border counts from `weights`, `n` slots with
/// distinctness from `scores` (both read as 6 x 6 tables), and at most one pinned class.
#[allow(clippy::type_complexity)]
fn assignment_case(
    k: usize,
    n: usize,
    weights: &[u64],
    scores: &[u32],
    pin: Option<(usize, usize)>,
) -> (Vec<Vec<u64>>, Vec<Vec<f64>>, Vec<Option<usize>>) {
    let mut borders = vec![vec![0u64; k]; k];
    let mut d = vec![vec![f64::INFINITY; n]; n];
    for i in 0..k {
        for j in i + 1..k {
            borders[i][j] = weights[i * 6 + j];
            borders[j][i] = borders[i][j];
        }
    }
    for i in 0..n {
        for j in i + 1..n {
            d[i][j] = f64::from(scores[i * 6 + j]) / 4.0;
            d[j][i] = d[i][j];
        }
    }
    let mut fixed = vec![None; k];
    if let Some((c, s)) = pin.filter(|&(c, s)| c < k && s < n) {
        fixed[c] = Some(s);
    }
    (borders, d, fixed)
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(64))]
    #[test]
    fn slot_assignment_is_optimal_by_brute_force(
        k in 1usize..=4,
        extra in 0usize..=2,
        weights in proptest::collection::vec(0u64..4, 36),
        scores in proptest::collection::vec(1u32..20, 36),
        pin in proptest::option::of((0usize..4, 0usize..6)),
    ) {
        let n = k + extra;
        let (borders, d, fixed) = assignment_case(k, n, &weights, &scores, pin);
        let map = assign_slots(&borders, &d, &fixed, None).expect("an assignment");
        proptest::prop_assert_eq!(map.len(), k);
        for (c, f) in fixed.iter().enumerate() {
            if let Some(s) = f {
                proptest::prop_assert_eq!(map[c], *s);
            }
        }
        let ours = objective(&borders, &d, &map);
        for other in all_maps(k, n, &fixed) {
            let theirs = objective(&borders, &d, &other);
            proptest::prop_assert!(
                theirs.partial_cmp(&ours) != Some(std::cmp::Ordering::Greater),
                "{:?} scores {:?}, better than ours {:?} with {:?}", other, theirs, map, ours
            );
        }
    }
}

/// The rule on the heaviest fill, written again from the documentation of
/// `tinct::colour::assign`: the heaviest fill among the classes in use does not go to a class
/// with the most regions, unless a pin put it there or no class has fewer.
fn keeps_weight_rule(
    map: &[usize],
    fixed: &[Option<usize>],
    sizes: &[usize],
    fill: &[f64],
) -> bool {
    let in_use: Vec<usize> = (0..map.len()).filter(|&c| sizes[c] > 0).collect();
    let Some(&heavy) = in_use.iter().max_by(|&&a, &&b| {
        fill[map[a]]
            .partial_cmp(&fill[map[b]])
            .unwrap()
            .then(b.cmp(&a))
    }) else {
        return true;
    };
    let most = in_use.iter().map(|&c| sizes[c]).max().unwrap();
    let fewest = in_use.iter().map(|&c| sizes[c]).min().unwrap();
    !(sizes[heavy] == most && fewest < most && fixed[heavy].is_none())
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(64))]
    #[test]
    fn slot_assignment_keeps_the_heaviest_fill_off_the_most_regions(
        k in 2usize..=4,
        extra in 0usize..=2,
        weights in proptest::collection::vec(0u64..4, 36),
        scores in proptest::collection::vec(1u32..20, 36),
        sizes in proptest::collection::vec(0usize..6, 4),
        fill in proptest::collection::vec(1u32..60, 6),
        pin in proptest::option::of((0usize..4, 0usize..6)),
    ) {
        let n = k + extra;
        let sizes = &sizes[..k];
        let fill: Vec<f64> = fill[..n].iter().map(|&w| f64::from(w)).collect();
        let (borders, d, fixed) = assignment_case(k, n, &weights, &scores, pin);
        let map = assign_slots(&borders, &d, &fixed, Some((sizes, &fill))).expect("an assignment");
        let keeping: Vec<Vec<usize>> = all_maps(k, n, &fixed)
            .into_iter()
            .filter(|m| keeps_weight_rule(m, &fixed, sizes, &fill))
            .collect();
        let candidates = if keeping.is_empty() { all_maps(k, n, &fixed) } else { keeping.clone() };
        proptest::prop_assert!(
            keeping.is_empty() || keeps_weight_rule(&map, &fixed, sizes, &fill),
            "{:?} hands the heaviest fill to the most regions", map
        );
        let ours = objective(&borders, &d, &map);
        for other in candidates {
            let theirs = objective(&borders, &d, &other);
            proptest::prop_assert!(
                theirs.partial_cmp(&ours) != Some(std::cmp::Ordering::Greater),
                "{:?} scores {:?}, better than ours {:?} with {:?}", other, theirs, map, ours
            );
        }
    }
}

/// The four-colour palette Tinct shipped before fills of equal weight: a pale blue first and a
/// dark brick last (the values of its earlier release, kept here as the example of what the
/// palette check must flag).
fn earlier_four() -> tinct::doc::Palette {
    use tinct::doc::{Palette, Rgb, Slot};
    let slot = |name: &str, rgb| Slot {
        name: name.into(),
        colour: Rgb(rgb),
    };
    Palette {
        name: "earlier".into(),
        slots: vec![
            slot("Frost", [0xcc, 0xee, 0xff]),
            slot("Rosehip", [0xee, 0xaa, 0xcc]),
            slot("Heather", [0xaa, 0x88, 0xbb]),
            slot("Brick", [0xaa, 0x55, 0x33]),
        ],
    }
}

#[test]
fn the_palette_check_flags_land_that_reads_as_water_and_a_fill_that_dominates() {
    use tinct::doc::palette_check::{FillProblem, fill_warnings, palette_report, thresholds};
    // A sample map with water (a lake and the sea).
    let doc = tinct::doc::file::load(&root().join("sample-maps/three-valleys.tinct")).unwrap();
    assert!(tinct::doc::palette_check::has_water(&doc));
    let warnings = fill_warnings(&doc, &earlier_four());
    let problems: Vec<(usize, FillProblem)> =
        warnings.iter().map(|w| (w.slot, w.problem)).collect();
    assert_eq!(
        problems,
        vec![(0, FillProblem::ReadsAsWater), (3, FillProblem::Dominant)],
        "{warnings:?}"
    );
    assert!(warnings[0].message.contains("Frost reads as water"));
    assert!(warnings[1].message.contains("Brick weighs much more"));
    // Tinct's own colour palette passes both checks, and the document's report is clear.
    assert!(fill_warnings(&doc, doc.palette()).is_empty());
    assert!(palette_report(&doc, &thresholds(&doc)).is_clear());
    // Without water, a blue land fill misleads nobody; the dominant fill still does.
    let mut dry = doc.clone();
    let water: Vec<_> = dry
        .regions()
        .iter()
        .filter(|(_, r)| r.role == tinct::doc::Role::Water)
        .map(|(id, _)| *id)
        .collect();
    for id in water {
        dry.apply(tinct::doc::Edit::UpdateRegion {
            id,
            change: tinct::doc::RegionChange::Role(tinct::doc::Role::Land),
        })
        .unwrap();
    }
    let problems: Vec<FillProblem> = fill_warnings(&dry, &earlier_four())
        .iter()
        .map(|w| w.problem)
        .collect();
    assert_eq!(problems, vec![FillProblem::Dominant]);
}

#[test]
fn colouring_and_evening_out_never_give_the_heaviest_fill_to_the_most_regions() {
    // Real boundaries: the Columbus, Ohio neighbourhoods (49 regions; libpysal's example data,
    // provenance in tests/data/geo/PROVENANCE.md), coloured with the earlier palette whose brick
    // is far heavier than its other fills, then with colour use evened out.
    use tinct::analysis::{BalanceBy, ColourOptions, colour, uncontrolled};
    let loaded = tinct::formats::load(
        &root().join("tests/data/geo/columbus.shp"),
        &tinct::geo::ImportOptions::default(),
    )
    .unwrap();
    let mut doc = loaded.doc;
    doc.apply(tinct::doc::Edit::SetPalette(earlier_four()))
        .unwrap();
    let weights: Vec<f64> = earlier_four()
        .slots
        .iter()
        .map(|s| tinct::colour::visual_weight(s.colour.0))
        .collect();
    // A colouring the user made, in which the brick colours the most regions: recolouring keeps
    // colours where it can, but not that.
    let first = uncontrolled(|c| colour(&doc, c, ColourOptions::default()))
        .colouring
        .unwrap();
    let mut counts = [0usize; 4];
    for slot in first.values() {
        counts[*slot as usize] += 1;
    }
    let most = (0..4).max_by_key(|&s| counts[s]).unwrap() as u32;
    let swapped = first
        .iter()
        .map(|(id, &s)| {
            let s = if s == most {
                3
            } else if s == 3 {
                most
            } else {
                s
            };
            (*id, s)
        })
        .collect();
    let mut by_hand = doc.clone();
    by_hand
        .apply(tinct::doc::Edit::SetColouring(swapped))
        .unwrap();
    for (keep_current, balance) in [
        (false, None),
        (false, Some(BalanceBy::Count)),
        (false, Some(BalanceBy::Area)),
        (true, None),
    ] {
        let start = if keep_current { &by_hand } else { &doc };
        let verdict = uncontrolled(|c| {
            colour(
                start,
                c,
                ColourOptions {
                    keep_current,
                    balance,
                    ..Default::default()
                },
            )
        });
        let colouring = verdict.colouring.expect("a colouring");
        let mut counts = vec![0usize; 4];
        for slot in colouring.values() {
            counts[*slot as usize] += 1;
        }
        let heaviest = (0..4)
            .filter(|&s| counts[s] > 0)
            .max_by(|&a, &b| weights[a].total_cmp(&weights[b]))
            .unwrap();
        let most = *counts.iter().max().unwrap();
        let fewest = counts.iter().copied().filter(|&n| n > 0).min().unwrap();
        assert!(
            counts[heaviest] < most || fewest == most,
            "{balance:?}: slot {heaviest} (the heaviest fill) colours {} of {counts:?}",
            counts[heaviest]
        );
        let mut coloured = doc.clone();
        coloured
            .apply(tinct::doc::Edit::SetColouring(colouring))
            .unwrap();
        assert!(tinct::doc::check_colouring(&coloured).is_clean());
    }
}
