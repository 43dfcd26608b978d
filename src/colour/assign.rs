//! Slot assignment: which palette slot each colour class gets, so that the classes that share the
//! most borders get the most distinct slots.
//!
//! A colouring only says which regions share a class; any one-to-one choice of slots for the
//! classes is equally valid. We choose it by exact search over all injective maps from classes to
//! slots (at most 8!/(8-k)! for 8 slots, 40,320 when k = 8), maximising, in order:
//! 1. the smallest distinctness over class pairs that share at least one border (so the worst
//!    pair anyone will see side by side is as good as it can be);
//! 2. the sum over class pairs of border count times distinctness (so the pairs with many borders
//!    get the most distinct slots);
//! 3. the number of classes that keep their current slot (so nothing moves without a reason).
//!
//! Remaining ties go to the lexicographically smallest map, so the result is deterministic.
//!
//! Given the class sizes and the fills' visual weights, one rule comes before all of these: the
//! heaviest fill in use does not go to a class with the most regions (unless a pin puts it
//! there, or every class is as large); see [`heaviest_off_most`] for why. When no map keeps the
//! rule the best map without it is returned.
//! Distinctness is any symmetric score where larger is better; Tinct passes the worst-case ratio
//! of [`super::PairDifference::worst_ratio`].

/// Why no assignment could be made.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum AssignError {
    #[error("{classes} colours are in use but the palette has only {slots} slots")]
    TooFewSlots { classes: usize, slots: usize },
    #[error("colour {class} is fixed to slot {slot}, which the palette does not have")]
    FixedOutOfRange { class: usize, slot: usize },
    #[error("colours {first} and {second} are both fixed to slot {slot}")]
    FixedTwice {
        first: usize,
        second: usize,
        slot: usize,
    },
    #[error("the border counts and the fixed list must have one entry per colour")]
    Shape,
    #[error("more than 10 slots: the exact search would take too long")]
    TooLarge,
}

/// The best slot for each class (`result[class] = slot`).
///
/// `borders[i][j]` counts the borders between regions of classes `i` and `j` (symmetric, `k x k`);
/// `distinctness[s][t]` scores slots `s` and `t` (symmetric, `n x n`, `n >= k`); `fixed[i]` is the
/// slot class `i` must keep. The current slot of class `i` is taken to be `i`. With `weights`,
/// `(sizes, fill weights)`: `sizes[i]` regions in class `i`, `fill[s]` the visual weight of slot
/// `s`, for the rule on the heaviest fill.
///
/// # Complexity
/// O(n!/(n-k)! · k) time in the worst case, pruned by the fixed classes; O(k) extra space.
/// Refused above 10 slots.
///
/// # Certificate
/// None: the result is optimal by exhaustion. [`assignment_score`] recomputes the objective for any
/// map, so a caller can compare against alternatives.
pub fn assign_slots(
    borders: &[Vec<u64>],
    distinctness: &[Vec<f64>],
    fixed: &[Option<usize>],
    weights: Option<(&[usize], &[f64])>,
) -> Result<Vec<usize>, AssignError> {
    let k = borders.len();
    let n = distinctness.len();
    if fixed.len() != k || borders.iter().any(|r| r.len() != k) {
        return Err(AssignError::Shape);
    }
    if distinctness.iter().any(|r| r.len() != n)
        || weights.is_some_and(|(sizes, fill)| sizes.len() != k || fill.len() != n)
    {
        return Err(AssignError::Shape);
    }
    if k > n {
        return Err(AssignError::TooFewSlots {
            classes: k,
            slots: n,
        });
    }
    if n > 10 {
        return Err(AssignError::TooLarge);
    }
    let mut owner: Vec<Option<usize>> = vec![None; n];
    for (class, slot) in fixed.iter().enumerate() {
        if let Some(slot) = *slot {
            if slot >= n {
                return Err(AssignError::FixedOutOfRange { class, slot });
            }
            if let Some(first) = owner[slot] {
                return Err(AssignError::FixedTwice {
                    first,
                    second: class,
                    slot,
                });
            }
            owner[slot] = Some(class);
        }
    }
    let mut search = Search {
        borders,
        distinctness,
        fixed,
        weights,
        used: owner.iter().map(Option::is_some).collect(),
        current: Vec::with_capacity(k),
        best: None,
        best_breaking_rule: None,
    };
    search.extend();
    Ok(search
        .best
        .or(search.best_breaking_rule)
        .map(|(_, map)| map)
        .unwrap_or_default())
}

/// The objective of one map, as compared by [`assign_slots`] (larger is better, compared in order).
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd)]
pub struct AssignmentScore {
    pub worst_bordering_pair: f64,
    pub weighted_sum: f64,
    pub kept: usize,
}

/// The objective of `map` (`map[class] = slot`).
pub fn assignment_score(
    borders: &[Vec<u64>],
    distinctness: &[Vec<f64>],
    map: &[usize],
) -> AssignmentScore {
    let mut worst = f64::INFINITY;
    let mut sum = 0.0;
    for i in 0..map.len() {
        for j in i + 1..map.len() {
            let w = borders[i][j] + borders[j][i];
            if w == 0 {
                continue;
            }
            let d = distinctness[map[i]][map[j]];
            worst = worst.min(d);
            sum += w as f64 * d.min(1e6);
        }
    }
    AssignmentScore {
        worst_bordering_pair: worst,
        weighted_sum: sum,
        kept: map.iter().enumerate().filter(|(c, s)| c == *s).count(),
    }
}

struct Search<'a> {
    borders: &'a [Vec<u64>],
    distinctness: &'a [Vec<f64>],
    fixed: &'a [Option<usize>],
    weights: Option<(&'a [usize], &'a [f64])>,
    used: Vec<bool>,
    current: Vec<usize>,
    best: Option<(AssignmentScore, Vec<usize>)>,
    /// The best map that hands the heaviest fill to a largest class, for when every map does.
    best_breaking_rule: Option<(AssignmentScore, Vec<usize>)>,
}

/// Whether `map` hands the heaviest fill in use to a class with the most regions, where another
/// class has fewer and no pin put it there.
fn breaks_weight_rule(
    map: &[usize],
    fixed: &[Option<usize>],
    sizes: &[usize],
    fill: &[f64],
) -> bool {
    let in_use = || (0..map.len()).filter(|&c| sizes[c] > 0);
    let Some(heavy_class) =
        in_use().max_by(|&a, &b| fill[map[a]].total_cmp(&fill[map[b]]).then(b.cmp(&a)))
    else {
        return false;
    };
    let most = in_use().map(|c| sizes[c]).max().unwrap_or(0);
    let fewest = in_use().map(|c| sizes[c]).min().unwrap_or(0);
    sizes[heavy_class] == most && fewest < most && fixed[heavy_class].is_none()
}

impl Search<'_> {
    fn extend(&mut self) {
        let class = self.current.len();
        if class == self.borders.len() {
            let score = assignment_score(self.borders, self.distinctness, &self.current);
            let breaks = self.weights.is_some_and(|(sizes, fill)| {
                breaks_weight_rule(&self.current, self.fixed, sizes, fill)
            });
            let slot = if breaks {
                &mut self.best_breaking_rule
            } else {
                &mut self.best
            };
            // Strictly better only: the first map found (lexicographically smallest) wins ties.
            if slot.as_ref().is_none_or(|(b, _)| score > *b) {
                *slot = Some((score, self.current.clone()));
            }
            return;
        }
        if let Some(slot) = self.fixed[class] {
            self.current.push(slot);
            self.extend();
            self.current.pop();
            return;
        }
        for slot in 0..self.distinctness.len() {
            if self.used[slot] {
                continue;
            }
            self.used[slot] = true;
            self.current.push(slot);
            self.extend();
            self.current.pop();
            self.used[slot] = false;
        }
    }
}

/// The rule that keeps the heaviest fill off the most regions: a dark or saturated fill draws
/// the eye, so handed to the largest colour class it makes the map look like a highlight of
/// those regions.
///
/// `counts[s]` is how many regions slot `s` colours, `weights[s]` the visual weight of its fill
/// (see [`super::visual_weight`]) and `pinned[s]` whether a pin holds a region to it. When the
/// heaviest slot in use colours at least as many regions as any other, and some other slot in
/// use colours fewer, returns the pair of slots to swap: the heaviest and the unpinned slot in
/// use with the fewest regions (the lightest of those on a tie). Swapping two whole colour
/// classes keeps a colouring valid and keeps groups together. `None` when the rule holds, or
/// when a pin holds the heaviest fill (the user's choice stands).
///
/// # Complexity
/// O(n) for `n` slots.
pub fn heaviest_off_most(
    counts: &[usize],
    weights: &[f64],
    pinned: &[bool],
) -> Option<(usize, usize)> {
    let used: Vec<usize> = (0..counts.len().min(weights.len()))
        .filter(|&s| counts[s] > 0)
        .collect();
    let heavy = used
        .iter()
        .copied()
        .max_by(|&a, &b| weights[a].total_cmp(&weights[b]).then(b.cmp(&a)))?;
    let most = used.iter().map(|&s| counts[s]).max()?;
    if counts[heavy] < most || pinned.get(heavy).copied().unwrap_or(false) {
        return None;
    }
    let other = used
        .iter()
        .copied()
        .filter(|&s| s != heavy && counts[s] < counts[heavy])
        .filter(|&s| !pinned.get(s).copied().unwrap_or(false))
        .min_by(|&a, &b| {
            counts[a]
                .cmp(&counts[b])
                .then(weights[a].total_cmp(&weights[b]))
                .then(a.cmp(&b))
        })?;
    Some((heavy, other))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_heaviest_fill_leaves_the_largest_class() {
        // Slot 3 is the heaviest and colours the most regions: it swaps with slot 1, the
        // smallest class.
        let weights = [10.0, 20.0, 25.0, 50.0];
        assert_eq!(
            heaviest_off_most(&[12, 5, 9, 14], &weights, &[false; 4]),
            Some((3, 1))
        );
        // A tie for the most counts too (common sense: the heavy fill should not lead).
        assert_eq!(
            heaviest_off_most(&[14, 5, 9, 14], &weights, &[false; 4]),
            Some((3, 1))
        );
        // Already fine, or every class equal, or the heavy fill pinned: nothing to do.
        assert_eq!(
            heaviest_off_most(&[14, 5, 9, 6], &weights, &[false; 4]),
            None
        );
        assert_eq!(
            heaviest_off_most(&[7, 7, 7, 7], &weights, &[false; 4]),
            None
        );
        assert_eq!(
            heaviest_off_most(&[12, 5, 9, 14], &weights, &[false, false, false, true]),
            None
        );
        // The smallest class is pinned: the next smallest takes the heavy fill.
        assert_eq!(
            heaviest_off_most(&[12, 5, 9, 14], &weights, &[false, true, false, false]),
            Some((3, 2))
        );
        // Unused slots do not count: slot 3 is unused, so slot 2 is the heaviest in use.
        assert_eq!(
            heaviest_off_most(&[3, 2, 9, 0], &weights, &[false; 4]),
            Some((2, 1))
        );
    }

    #[test]
    fn refuses_bad_shapes() {
        assert_eq!(
            assign_slots(
                &[vec![0; 3], vec![0; 3], vec![0; 3]],
                &[vec![1.0; 2], vec![1.0; 2]],
                &[None; 3],
                None
            ),
            Err(AssignError::TooFewSlots {
                classes: 3,
                slots: 2
            })
        );
        assert_eq!(
            assign_slots(
                &[vec![0; 2], vec![0; 2]],
                &[vec![1.0; 2], vec![1.0; 2]],
                &[Some(1), Some(1)],
                None
            ),
            Err(AssignError::FixedTwice {
                first: 0,
                second: 1,
                slot: 1
            })
        );
    }
}
