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
/// slot class `i` must keep. The current slot of class `i` is taken to be `i`.
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
) -> Result<Vec<usize>, AssignError> {
    let k = borders.len();
    let n = distinctness.len();
    if fixed.len() != k || borders.iter().any(|r| r.len() != k) {
        return Err(AssignError::Shape);
    }
    if distinctness.iter().any(|r| r.len() != n) {
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
        used: owner.iter().map(Option::is_some).collect(),
        current: Vec::with_capacity(k),
        best: None,
    };
    search.extend();
    Ok(search.best.map(|(_, map)| map).unwrap_or_default())
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
    used: Vec<bool>,
    current: Vec<usize>,
    best: Option<(AssignmentScore, Vec<usize>)>,
}

impl Search<'_> {
    fn extend(&mut self) {
        let class = self.current.len();
        if class == self.borders.len() {
            let score = assignment_score(self.borders, self.distinctness, &self.current);
            // Strictly better only: the first map found (lexicographically smallest) wins ties.
            let better = match &self.best {
                None => true,
                Some((b, _)) => score > *b,
            };
            if better {
                self.best = Some((score, self.current.clone()));
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn refuses_bad_shapes() {
        assert_eq!(
            assign_slots(
                &[vec![0; 3], vec![0; 3], vec![0; 3]],
                &[vec![1.0; 2], vec![1.0; 2]],
                &[None; 3]
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
                &[Some(1), Some(1)]
            ),
            Err(AssignError::FixedTwice {
                first: 0,
                second: 1,
                slot: 1
            })
        );
    }
}
