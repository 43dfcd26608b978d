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
/// classes `0..k` (shown to people as `1..=k`).
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
    /// The vertices that justify the step (neighbours holding the excluded colours).
    pub because: Vec<Vertex>,
    /// The step in words.
    pub text: String,
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
/// more than `max_steps` steps. `names` turns a vertex into the word used in the text.
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
    let mut fixes: Vec<(Vertex, u32, bool)> = Vec::new();
    for v in 0..n {
        if let Some(Some(c)) = pin_class.get(v) {
            fixes.push((v as Vertex, *c, true));
        }
    }
    for (i, &v) in symmetry.clique.iter().enumerate() {
        // Only a clique vertex that is not pinned; with pins, it may still take a pinned class, so
        // only fix it when no pins exist (the general rule becomes an exclusion below).
        if symmetry.first_free_class == 0 {
            fixes.push((v, i as u32, false));
        }
    }
    for (v, c, pinned) in fixes {
        if c >= k {
            return None;
        }
        let text = if pinned {
            format!("Fix {} = colour {} (pinned).", names(v), c + 1)
        } else {
            format!(
                "Fix {} = colour {} (a clique: colours can be renamed so).",
                names(v),
                c + 1
            )
        };
        search.push(0, StepKind::Fix, v, c, Vec::new(), text);
        if search.assign(v, c, 0) {
            return Some(search.steps);
        }
    }
    if symmetry.first_free_class > 0 {
        for (i, &v) in symmetry.clique.iter().enumerate() {
            for c in (symmetry.first_free_class + i as u32 + 1)..k {
                if search.state.domain[v as usize] & (1 << c) != 0 {
                    let text = format!(
                        "{} need not use colour {} (unpinned colours can be renamed).",
                        names(v),
                        c + 1
                    );
                    search.push(0, StepKind::Renamed, v, c, Vec::new(), text);
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
    fn push(
        &mut self,
        depth: u32,
        kind: StepKind,
        vertex: Vertex,
        colour: u32,
        because: Vec<Vertex>,
        text: String,
    ) {
        self.steps.push(ArgumentStep {
            depth,
            kind,
            vertex,
            colour,
            because,
            text,
        });
    }

    fn list(&self, vs: &[Vertex]) -> String {
        vs.iter()
            .map(|&v| (self.names)(v))
            .collect::<Vec<_>>()
            .join(", ")
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
            let colours: Vec<String> = who
                .iter()
                .map(|&u| (self.state.assigned[u as usize] + 1).to_string())
                .collect();
            let text = if case {
                format!(
                    "Contradiction: {} has no colour left (neighbours {} have colours {}; the other cases failed).",
                    (self.names)(v),
                    self.list(&who),
                    colours.join(", ")
                )
            } else {
                format!(
                    "Contradiction: {} has neighbours {} coloured {}.",
                    (self.names)(v),
                    self.list(&who),
                    colours.join(", ")
                )
            };
            self.push(depth, StepKind::Contradiction, v, NONE, who, text);
            return true;
        }
        if d.count_ones() == 1 && self.state.assigned[v as usize] == NONE {
            let forced = d.trailing_zeros();
            let (who, case) = self.excluders(v);
            let colours: Vec<String> = who
                .iter()
                .map(|&u| (self.state.assigned[u as usize] + 1).to_string())
                .collect();
            let mut text = format!("Then {} must be colour {}", (self.names)(v), forced + 1);
            if !who.is_empty() {
                text.push_str(&format!(
                    " (neighbours {} have colours {}",
                    self.list(&who),
                    colours.join(", ")
                ));
                text.push_str(if case {
                    "; the other cases failed)."
                } else {
                    ")."
                });
            } else {
                text.push_str(" (the other cases failed).");
            }
            self.push(depth, StepKind::Forced, v, forced, who, text);
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
            let text = format!("Suppose {} = colour {}.", (self.names)(v), c + 1);
            self.push(depth + 1, StepKind::Suppose, v, c, Vec::new(), text);
            let conflict = self.assign(v, c, depth + 1);
            if !conflict && !self.refute(depth + 1)? {
                return Some(false);
            }
            self.state = saved;
            let text = format!("So {} is not colour {}.", (self.names)(v), c + 1);
            self.push(depth, StepKind::Excluded, v, c, Vec::new(), text);
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
        let steps = case_analysis(&g, &[], 3, &sym, &names, 1000).unwrap();
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
        assert!(case_analysis(&g6, &[], 3, &sym, &names, 1000).is_none());
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
        let steps = case_analysis(&g, &[Some(0), None, None, None], 3, &sym, &names, 1000).unwrap();
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
}
