//! A human-readable case analysis showing that a small graph has no k-colouring, as a list of
//! steps a GUI can walk through ("fix A = 1, B = 2; then C must be 3; ...; contradiction").

use crate::engine::colouring::encoding::Symmetry;
use crate::engine::graph::{Graph, Vertex};

/// What one step of the argument does.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StepKind {
    /// A colour fixed at the start: a pin, or a clique vertex whose colour may be chosen freely
    /// because colours not named by pins can be renamed.
    Fix,
    /// Start of a case: suppose this vertex has this colour.
    Suppose,
    /// A colour forced because every other colour is excluded (by neighbours or refuted cases).
    Forced,
    /// A case has been refuted, so the vertex does not have this colour.
    Excluded,
    /// At the start, before any case: the vertex need not take this colour, because colours that
    /// no pin names can be renamed (symmetry breaking on a clique).
    Renamed,
    /// A vertex has no colour left: this case (or the whole argument, at depth 0) is impossible.
    Contradiction,
}

/// One step. Vertices are numbered as in the graph the argument was built for; colours are
/// classes `0..k`, shown to people as the letters A, B, C, … (see [`colour_letter`]) so that they
/// are never mistaken for palette slots, which are numbered.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ArgumentStep {
    /// Nesting depth of cases (0 = unconditional).
    pub depth: u32,
    /// What the step does.
    pub kind: StepKind,
    /// The vertex the step is about.
    pub vertex: Vertex,
    /// The colour involved (for a contradiction: none, `u32::MAX`).
    pub colour: u32,
    /// The vertices that justify the step: neighbours holding the excluded colours (for a fixed
    /// clique vertex: the clique vertices fixed before it).
    pub because: Vec<Vertex>,
    /// The colour each vertex of `because` holds, in the same order.
    pub because_colours: Vec<u32>,
    /// Some colours were excluded by earlier cases rather than by neighbours.
    pub after_cases: bool,
    /// For a `Fix` step of a pinned vertex: the palette slot it is pinned to (0-based).
    pub pinned_slot: Option<u32>,
    /// The step in words (with the names the argument was built with; see [`step_text`]).
    pub text: String,
}

/// The name of argument colour `c` as people read it: `A`, `B`, `C`, … (`A2`, `B2`, … past `Z`).
pub fn colour_letter(c: u32) -> String {
    let letter = char::from(b'A' + (c % 26) as u8);
    if c < 26 {
        letter.to_string()
    } else {
        format!("{letter}{}", c / 26 + 1)
    }
}

/// "a", "a and b", "a, b and c".
fn and_list(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [init @ .., last] => format!("{} and {last}", init.join(", ")),
    }
}

/// Why a colour is out of reach: "its neighbour X holds colour A" or "its neighbours X and Y hold
/// colours A and B", with "the other cases ruled out the rest" when earlier cases took part.
fn held_by(step: &ArgumentStep, names: &dyn Fn(Vertex) -> String) -> String {
    let who: Vec<String> = step.because.iter().map(|&v| names(v)).collect();
    let colours: Vec<String> = step
        .because_colours
        .iter()
        .map(|&c| colour_letter(c))
        .collect();
    let held = match who.len() {
        0 => String::new(),
        1 => format!("its neighbour {} holds colour {}", who[0], colours[0]),
        _ => format!(
            "its neighbours {} hold colours {}",
            and_list(&who),
            and_list(&colours)
        ),
    };
    match (held.is_empty(), step.after_cases) {
        (true, _) => "the other cases failed".into(),
        (false, true) => format!("{held}, and the other cases failed"),
        (false, false) => held,
    }
}

/// A step in plain words, with `names` for the vertices. Colours are letters, pins name their
/// palette slot (numbered from 1, as the palette shows them).
pub fn step_text(step: &ArgumentStep, names: &dyn Fn(Vertex) -> String) -> String {
    let who = names(step.vertex);
    let colour = colour_letter(step.colour);
    match step.kind {
        StepKind::Fix => match step.pinned_slot {
            Some(slot) => format!(
                "{who} is pinned to palette slot {}; call that colour {colour}.",
                slot + 1
            ),
            None if step.because.is_empty() => {
                format!("Colours are interchangeable, so we may call {who}'s colour {colour}.")
            }
            None => {
                let earlier: Vec<String> = step.because.iter().map(|&v| names(v)).collect();
                format!(
                    "{who} borders {}, so its colour is another one; colours are interchangeable, so we may call it {colour}.",
                    and_list(&earlier)
                )
            }
        },
        StepKind::Renamed => format!(
            "Colours that no pin names are interchangeable, so we may choose their names so that {who} is not colour {colour}."
        ),
        StepKind::Suppose => format!("Suppose {who} takes colour {colour}."),
        StepKind::Forced => format!(
            "Then {who} must take colour {colour}: {}.",
            held_by(step, names)
        ),
        StepKind::Excluded => format!("So {who} cannot take colour {colour}."),
        StepKind::Contradiction => format!(
            "{who} has no colour left: {}. Contradiction.",
            held_by(step, names)
        ),
    }
}

#[derive(Clone, Copy, PartialEq, Eq)]
enum Reason {
    None,
    Neighbour(Vertex),
    Case,
}

#[derive(Clone)]
struct State {
    domain: Vec<u32>,
    assigned: Vec<u32>,
    reason: Vec<Reason>, // reason[v * k + c] for the removal of c from v's domain
}

struct Search<'a> {
    g: &'a Graph,
    k: u32,
    names: &'a dyn Fn(Vertex) -> String,
    steps: Vec<ArgumentStep>,
    max_steps: usize,
    state: State,
}

const NONE: u32 = u32::MAX;

/// Builds a case analysis refuting k-colourability of `g` with the given pins (classes) and
/// symmetry rule, or `None` if the graph is colourable, k exceeds 31, or the argument would need
/// more than `max_steps` steps. `names` turns a vertex into the word used in the text;
/// `pinned_slots[c]` is the palette slot of pinned class `c` (for the words only).
///
/// The search assigns forced colours first (a vertex with one colour left), and otherwise splits on
/// the vertex with fewest colours left, which keeps arguments short on critical graphs.
///
/// # Complexity
/// Exponential in the worst case; bounded by `max_steps`.
///
/// # Certificate
/// The steps themselves can be replayed: [`replay_argument`] checks each one against the graph.
pub fn case_analysis(
    g: &Graph,
    pin_class: &[Option<u32>],
    pinned_slots: &[u32],
    k: u32,
    symmetry: &Symmetry,
    names: &dyn Fn(Vertex) -> String,
    max_steps: usize,
) -> Option<Vec<ArgumentStep>> {
    if k == 0 || k > 31 {
        return None;
    }
    let n = g.vertex_count();
    let full = (1u32 << k) - 1;
    let mut search = Search {
        g,
        k,
        names,
        steps: Vec::new(),
        max_steps,
        state: State {
            domain: vec![full; n],
            assigned: vec![NONE; n],
            reason: vec![Reason::None; n * k as usize],
        },
    };
    // (vertex, class, pinned slot, clique vertices fixed before it)
    let mut fixes: Vec<(Vertex, u32, Option<u32>, Vec<Vertex>)> = Vec::new();
    for v in 0..n {
        if let Some(Some(c)) = pin_class.get(v) {
            let slot = pinned_slots.get(*c as usize).copied().unwrap_or(*c);
            fixes.push((v as Vertex, *c, Some(slot), Vec::new()));
        }
    }
    if symmetry.first_free_class == 0 {
        // Only without pins: with pins a clique vertex may still take a pinned class, so the
        // general rule becomes the exclusions below.
        for (i, &v) in symmetry.clique.iter().enumerate() {
            fixes.push((v, i as u32, None, symmetry.clique[..i].to_vec()));
        }
    }
    for (v, c, slot, earlier) in fixes {
        if c >= k {
            return None;
        }
        search.push(0, StepKind::Fix, v, c, earlier, false, slot);
        if search.assign(v, c, 0) {
            return Some(search.steps);
        }
    }
    if symmetry.first_free_class > 0 {
        for (i, &v) in symmetry.clique.iter().enumerate() {
            for c in (symmetry.first_free_class + i as u32 + 1)..k {
                if search.state.domain[v as usize] & (1 << c) != 0 {
                    search.push(0, StepKind::Renamed, v, c, Vec::new(), false, None);
                    if search.exclude(v, c, Reason::Case, 0) {
                        return Some(search.steps);
                    }
                }
            }
        }
    }
    match search.refute(0) {
        Some(true) => Some(search.steps),
        _ => None,
    }
}

impl Search<'_> {
    #[allow(clippy::too_many_arguments)]
    fn push(
        &mut self,
        depth: u32,
        kind: StepKind,
        vertex: Vertex,
        colour: u32,
        because: Vec<Vertex>,
        after_cases: bool,
        pinned_slot: Option<u32>,
    ) {
        let because_colours = because
            .iter()
            .map(|&u| self.state.assigned[u as usize])
            .collect();
        let mut step = ArgumentStep {
            depth,
            kind,
            vertex,
            colour,
            because,
            because_colours,
            after_cases,
            pinned_slot,
            text: String::new(),
        };
        step.text = step_text(&step, self.names);
        self.steps.push(step);
    }

    /// Vertices (neighbours) that excluded colours from v; "case" exclusions are noted by the flag.
    fn excluders(&self, v: Vertex) -> (Vec<Vertex>, bool) {
        let mut who = Vec::new();
        let mut case = false;
        for c in 0..self.k {
            match self.state.reason[v as usize * self.k as usize + c as usize] {
                Reason::Neighbour(u) => {
                    if !who.contains(&u) {
                        who.push(u);
                    }
                }
                Reason::Case => case = true,
                Reason::None => {}
            }
        }
        (who, case)
    }

    /// Assigns v = c and propagates; true on contradiction. All of v's neighbours lose c before
    /// any consequence is followed, so a forced colour never clashes with an assigned neighbour.
    fn assign(&mut self, v: Vertex, c: u32, depth: u32) -> bool {
        let k = self.k as usize;
        self.state.assigned[v as usize] = c;
        self.state.domain[v as usize] = 1 << c;
        let mut touched = Vec::new();
        for &w in self.g.neighbours(v) {
            if self.state.assigned[w as usize] == NONE
                && self.state.domain[w as usize] & (1 << c) != 0
            {
                self.state.domain[w as usize] &= !(1 << c);
                self.state.reason[w as usize * k + c as usize] = Reason::Neighbour(v);
                touched.push(w);
            }
        }
        for w in touched {
            if self.state.assigned[w as usize] == NONE && self.check(w, depth) {
                return true;
            }
        }
        false
    }

    /// Removes c from v's colours and propagates; true on contradiction.
    fn exclude(&mut self, v: Vertex, c: u32, reason: Reason, depth: u32) -> bool {
        let k = self.k as usize;
        self.state.domain[v as usize] &= !(1 << c);
        self.state.reason[v as usize * k + c as usize] = reason;
        self.check(v, depth)
    }

    /// Reports a contradiction if v has no colour left, or assigns its only colour.
    fn check(&mut self, v: Vertex, depth: u32) -> bool {
        let d = self.state.domain[v as usize];
        if d == 0 {
            let (who, case) = self.excluders(v);
            self.push(depth, StepKind::Contradiction, v, NONE, who, case, None);
            return true;
        }
        if d.count_ones() == 1 && self.state.assigned[v as usize] == NONE {
            let forced = d.trailing_zeros();
            let (who, case) = self.excluders(v);
            self.push(depth, StepKind::Forced, v, forced, who, case, None);
            return self.assign(v, forced, depth);
        }
        false
    }

    /// Refutes the current state; Some(true) = every case ends in a contradiction, Some(false) =
    /// a colouring exists, None = too many steps.
    fn refute(&mut self, depth: u32) -> Option<bool> {
        if self.steps.len() > self.max_steps {
            return None;
        }
        let n = self.g.vertex_count();
        let pick = (0..n as Vertex)
            .filter(|&v| self.state.assigned[v as usize] == NONE)
            .min_by_key(|&v| {
                let assigned_neighbours = self
                    .g
                    .neighbours(v)
                    .iter()
                    .filter(|&&w| self.state.assigned[w as usize] != NONE)
                    .count();
                (
                    self.state.domain[v as usize].count_ones(),
                    usize::MAX - assigned_neighbours,
                    usize::MAX - self.g.degree(v),
                )
            });
        let Some(v) = pick else {
            return Some(false);
        };
        loop {
            let c = self.state.domain[v as usize].trailing_zeros();
            let saved = self.state.clone();
            self.push(depth + 1, StepKind::Suppose, v, c, Vec::new(), false, None);
            let conflict = self.assign(v, c, depth + 1);
            if !conflict && !self.refute(depth + 1)? {
                return Some(false);
            }
            self.state = saved;
            self.push(depth, StepKind::Excluded, v, c, Vec::new(), false, None);
            if self.exclude(v, c, Reason::Case, depth) {
                return Some(true);
            }
            if self.state.assigned[v as usize] != NONE {
                return self.refute(depth);
            }
        }
    }
}

/// Replays an argument against the graph and checks that every step follows: forced colours are
/// the only ones left, contradictions have every colour excluded, and every case is closed.
/// Written separately from the search: it keeps its own colour sets per case.
pub fn replay_argument(g: &Graph, k: u32, steps: &[ArgumentStep]) -> bool {
    let n = g.vertex_count();
    // Stack of (depth, colour per vertex, excluded sets) for open cases.
    let mut colour: Vec<Vec<u32>> = vec![vec![NONE; n]];
    let mut banned: Vec<Vec<u64>> = vec![vec![0; n]];
    let mut closed_top = false;
    let mut cases: Vec<(usize, u32)> = Vec::new();
    let mut last_closed: Option<(usize, u32)> = None;
    let mut any_case = false;
    // Colour c is out of reach for v: excluded by a closed case, or held by a neighbour.
    let unavailable = |colour: &[u32], banned: u64, v: usize, c: u32| {
        banned & (1 << c) != 0
            || g.neighbours(v as Vertex)
                .iter()
                .any(|&w| colour[w as usize] == c)
    };
    for step in steps {
        let v = step.vertex as usize;
        if v >= n {
            return false;
        }
        let d = step.depth as usize;
        match step.kind {
            StepKind::Fix => {
                if d != 0 || colour.len() != 1 || !cases.is_empty() || step.colour >= k {
                    return false;
                }
                colour[0][v] = step.colour;
            }
            StepKind::Suppose => {
                if d != colour.len() || step.colour >= k {
                    return false;
                }
                let mut c = colour[d - 1].clone();
                c[v] = step.colour;
                colour.push(c);
                banned.push(banned[d - 1].clone());
                cases.push((v, step.colour));
                last_closed = None;
                any_case = true;
            }
            StepKind::Forced => {
                if d + 1 != colour.len() || step.colour >= k {
                    return false;
                }
                // Every other colour is held by a neighbour or excluded by a closed case.
                let ok = (0..k)
                    .filter(|&c| c != step.colour)
                    .all(|c| unavailable(&colour[d], banned[d][v], v, c));
                if !ok {
                    return false;
                }
                colour[d][v] = step.colour;
            }
            StepKind::Renamed => {
                // A symmetry exclusion, only at depth 0 before any case (its soundness is the
                // certificate's symmetry rule, checked there, not here).
                if d != 0 || any_case || colour.len() != 1 || step.colour >= k {
                    return false;
                }
                banned[0][v] |= 1 << step.colour;
            }
            StepKind::Excluded => {
                // The case at depth d+1 just closed with a contradiction.
                if d + 1 != colour.len() || step.colour >= k {
                    return false;
                }
                if last_closed != Some((v, step.colour)) {
                    return false;
                }
                last_closed = None;
                banned[d][v] |= 1 << step.colour;
            }
            StepKind::Contradiction => {
                if d + 1 != colour.len() {
                    return false;
                }
                let ok = (0..k).all(|c| unavailable(&colour[d], banned[d][v], v, c));
                if !ok {
                    return false;
                }
                if d == 0 {
                    closed_top = true;
                } else {
                    colour.pop();
                    banned.pop();
                    last_closed = cases.pop();
                }
            }
        }
        // A neighbour clash from fixes or suppositions counts only through explicit contradictions.
    }
    closed_top
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn five_wheel_argument_replays() {
        // W5 (hub 0, rim 1..5) needs 4 colours (common practice): with hub and two rim vertices
        // fixed, the rest is forced around the odd rim into a contradiction.
        let edges: Vec<(u32, u32)> = (1..=5)
            .flat_map(|i| [(0, i), (i, if i == 5 { 1 } else { i + 1 })])
            .collect();
        let (g, _) = Graph::from_edges(6, &edges).unwrap();
        let sym = Symmetry {
            clique: vec![0, 1, 2],
            first_free_class: 0,
        };
        let names = |v: Vertex| format!("v{v}");
        let steps = case_analysis(&g, &[], &[], 3, &sym, &names, 1000).unwrap();
        assert!(replay_argument(&g, 3, &steps));
        assert!(steps.iter().any(|s| s.kind == StepKind::Contradiction));
        // Corrupt a forced step: the replay must reject it.
        let mut bad = steps.clone();
        if let Some(s) = bad.iter_mut().find(|s| s.kind == StepKind::Forced) {
            s.colour = (s.colour + 1) % 3;
        }
        assert!(!replay_argument(&g, 3, &bad));
        // A 6-wheel is 3-colourable: no argument.
        let edges: Vec<(u32, u32)> = (1..=6)
            .flat_map(|i| [(0, i), (i, if i == 6 { 1 } else { i + 1 })])
            .collect();
        let (g6, _) = Graph::from_edges(7, &edges).unwrap();
        assert!(case_analysis(&g6, &[], &[], 3, &sym, &names, 1000).is_none());
    }

    #[test]
    fn a_renaming_step_is_only_accepted_before_any_case() {
        // K4 with one vertex pinned to colour 1 and no 3-colouring (common practice: K4 needs 4).
        // The unpinned clique vertices may be renamed, which shows as `Renamed` steps up front.
        let edges = [(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)];
        let (g, _) = Graph::from_edges(4, &edges).unwrap();
        let sym = Symmetry {
            clique: vec![1, 2],
            first_free_class: 1,
        };
        let names = |v: Vertex| format!("v{v}");
        let steps = case_analysis(
            &g,
            &[Some(0), None, None, None],
            &[4],
            3,
            &sym,
            &names,
            1000,
        )
        .unwrap();
        assert!(replay_argument(&g, 3, &steps));
        let renamed = steps.iter().filter(|s| s.kind == StepKind::Renamed).count();
        assert!(renamed > 0, "{steps:#?}");
        // The same exclusion inside a case is not a valid step.
        let mut bad = steps.clone();
        let first = bad
            .iter()
            .position(|s| s.kind == StepKind::Renamed)
            .unwrap();
        bad[first].depth = 1;
        assert!(!replay_argument(&g, 3, &bad));
    }

    #[test]
    fn steps_read_as_sentences_with_letters_for_colours_and_agreeing_verbs() {
        let names = |v: Vertex| ["Ardle", "Brisk", "Corran"][v as usize].to_string();
        let step = |kind, because: Vec<Vertex>, because_colours: Vec<u32>| ArgumentStep {
            depth: 0,
            kind,
            vertex: 2,
            colour: 2,
            because,
            because_colours,
            after_cases: false,
            pinned_slot: None,
            text: String::new(),
        };
        assert_eq!(
            step_text(&step(StepKind::Forced, vec![0], vec![0]), &names),
            "Then Corran must take colour C: its neighbour Ardle holds colour A."
        );
        assert_eq!(
            step_text(&step(StepKind::Forced, vec![0, 1], vec![0, 1]), &names),
            "Then Corran must take colour C: its neighbours Ardle and Brisk hold colours A and B."
        );
        let mut pinned = step(StepKind::Fix, vec![], vec![]);
        pinned.pinned_slot = Some(4);
        assert_eq!(
            step_text(&pinned, &names),
            "Corran is pinned to palette slot 5; call that colour C."
        );
        assert_eq!(
            step_text(&step(StepKind::Fix, vec![], vec![]), &names),
            "Colours are interchangeable, so we may call Corran's colour C."
        );
        // No digit ever names an argument colour: digits are palette slots.
        for kind in [
            StepKind::Suppose,
            StepKind::Excluded,
            StepKind::Renamed,
            StepKind::Contradiction,
        ] {
            let text = step_text(&step(kind, vec![0, 1], vec![0, 1]), &names);
            assert!(!text.chars().any(|c| c.is_ascii_digit()), "{text}");
        }
        assert_eq!(colour_letter(0), "A");
        assert_eq!(colour_letter(27), "B2");
    }
}
