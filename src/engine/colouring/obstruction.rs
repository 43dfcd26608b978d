//! Obstructions: a small vertex-critical subgraph that cannot be k-coloured (found by structure or
//! by deletion with the SAT solver), its name where it has one, a case analysis, and a DRAT proof.

use crate::engine::colouring::argument::{ArgumentStep, case_analysis};
use crate::engine::colouring::encoding::{Symmetry, colour_var, colouring_cnf};
use crate::engine::colouring::exact::{
    Decision, Limits, PartProof, k_colourable_logged, symmetry_for,
};
use crate::engine::colouring::lower_bound::{
    BoundEvidence, LowerBound, find_clique_in_order, odd_cycle, odd_wheel,
};
use crate::engine::colouring::sat::{Sat, SatAnswer};
use crate::engine::colouring::smallest_last::smallest_last_order;
use crate::engine::graph::{Graph, Vertex};

/// The name of an obstruction, where it has one.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ObstructionKind {
    /// A complete graph on k + 1 vertices.
    Complete,
    /// An odd cycle (k = 2).
    OddCycle,
    /// An odd wheel: a hub joined to every vertex of an odd cycle (k = 3).
    OddWheel,
    /// The Grötzsch graph: 11 vertices, triangle-free, needs 4 colours (Grötzsch 1959; the
    /// smallest such graph, Chvátal 1974, from memory).
    Grotzsch,
    /// A vertex-critical subgraph whose pins take part in the contradiction.
    Pinned,
    /// Another vertex-critical subgraph.
    Critical,
}

/// A machine-checkable refutation: the obstruction's colouring CNF and a DRAT proof.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Refutation {
    /// The number of colours refuted.
    pub colours: u32,
    /// CNF vertex `i` is graph vertex `vertices[i]`; variable `i * colours + c + 1` means
    /// "vertex i has class c".
    pub vertices: Vec<Vertex>,
    /// Class `i < pinned_slots.len()` stands for palette slot `pinned_slots[i]`.
    pub pinned_slots: Vec<u32>,
    /// `(CNF vertex, class)` for each pinned vertex.
    pub pins: Vec<(u32, u32)>,
    /// The symmetry-breaking rule the CNF's negative units follow (in CNF vertex numbers).
    pub symmetry: Symmetry,
    /// DIMACS CNF text.
    pub cnf: String,
    /// DRAT proof text refuting the CNF.
    pub drat: String,
}

/// A vertex-critical subgraph that needs more than `colours` colours, with its evidence.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Obstruction {
    /// The number of colours that is impossible.
    pub colours: u32,
    /// Graph vertices in the obstruction, ascending.
    pub vertices: Vec<Vertex>,
    /// Graph edges among them, `(u, v)` with `u < v`, ascending.
    pub edges: Vec<(Vertex, Vertex)>,
    /// Pins that take part: `(vertex, palette slot)`.
    pub pins: Vec<(Vertex, u32)>,
    /// Its name.
    pub kind: ObstructionKind,
    /// True when removing any single vertex makes the rest colourable (checked by search).
    pub vertex_critical: bool,
    /// A case analysis (vertices are graph vertices), for obstructions up to the size limit.
    pub argument: Option<Vec<ArgumentStep>>,
    /// CNF and DRAT proof.
    pub refutation: Option<Refutation>,
}

/// Limits on obstruction work.
#[derive(Debug, Clone, Copy)]
pub struct ObstructionOptions {
    /// Build a case analysis when the obstruction has at most this many vertices.
    pub argument_max_vertices: usize,
    /// Give up the case analysis beyond this many steps.
    pub argument_max_steps: usize,
    /// Do not try deletion search on parts larger than this.
    pub max_search_vertices: usize,
    /// Log a DRAT proof while deciding a part of at most this many vertices, so that a part whose
    /// shrinking runs out of time still carries its proof.
    pub proof_max_vertices: usize,
}

/// A part that cannot be coloured, with the proof its search logged (if any).
pub type FailedPart = (Vec<Vertex>, Option<PartProof>);

impl Default for ObstructionOptions {
    fn default() -> Self {
        ObstructionOptions {
            argument_max_vertices: 30,
            argument_max_steps: 4000,
            max_search_vertices: 20_000,
            proof_max_vertices: 2_000,
        }
    }
}

/// Finds an obstruction to k-colouring `g` with the given pins, or `None` if `g` is k-colourable
/// (or the search was stopped).
///
/// An obstruction that needs no pins is preferred whenever one exists, because removing a pin
/// would not help there: first from `known` bound evidence or by structure (a K_{k+1}; an odd
/// cycle for k = 2; an odd wheel for k = 3), which are vertex-critical by themselves; otherwise
/// by deletion (Chinneck and Dravnieks' deletion filter, 1991): take a part that cannot be
/// coloured, shrink it with the solver's unsatisfiable cores, then try removing each vertex in
/// turn and keep the removal whenever the rest is still not k-colourable. Only when the map
/// without its pins is k-colourable are pins part of the search, and then the filter removes
/// pins as well as vertices, so that the pins left are exactly the ones the obstruction needs.
///
/// # Complexity
/// Structural search: about O(n + m) on sparse graphs. Deletion: one SAT call per vertex (and
/// per pin) of the shrunk part.
///
/// # Certificate
/// The returned [`Refutation`]; check it with [`crate::engine::colouring::check_refutation`].
#[allow(clippy::too_many_arguments)]
pub fn find_obstruction(
    g: &Graph,
    pin_class: &[Option<u32>],
    pinned_slots: &[u32],
    k: u32,
    start: Option<FailedPart>,
    known: Option<&LowerBound>,
    limits: Limits,
    options: &ObstructionOptions,
) -> Option<Obstruction> {
    let from_bound = known.and_then(|b| match &b.evidence {
        BoundEvidence::Clique(c) if c.len() > k as usize => Some(c[..=k as usize].to_vec()),
        BoundEvidence::OddCycle(c) if k == 2 => Some(c.clone()),
        BoundEvidence::OddWheel { hub, rim } if k == 3 => {
            Some(rim.iter().copied().chain([*hub]).collect())
        }
        _ => None,
    });
    let structural = match from_bound {
        Some(mut vs) => {
            vs.sort_unstable();
            Some(vs)
        }
        None => structural_obstruction(g, k),
    };
    let no_pins: Vec<Option<u32>> = Vec::new();
    if let Some(vs) = structural {
        return Some(build(
            g,
            &no_pins,
            pinned_slots,
            k,
            vs,
            true,
            limits,
            options,
            None,
        ));
    }
    let has_pins = pin_class.iter().any(Option::is_some);
    let logged =
        |pins: &[Option<u32>]| k_colourable_logged(g, pins, k, limits, options.proof_max_vertices);
    // Without pins, `start` (a part that failed with the pins) is what we want already.
    let pin_free_part = if has_pins {
        match logged(&no_pins) {
            Decision::NotColourable { part, proof } => Some((part, proof)),
            Decision::Colourable(_) => None,
            Decision::Unknown => return None,
        }
    } else {
        None
    };
    let ((part, proof), pins): (FailedPart, &[Option<u32>]) = match pin_free_part {
        Some(failed) => (failed, &no_pins),
        None => {
            let failed = match start {
                Some(failed) => failed,
                None => match logged(pin_class) {
                    Decision::NotColourable { part, proof } => (part, proof),
                    _ => return None,
                },
            };
            (failed, pin_class)
        }
    };
    if part.len() > options.max_search_vertices {
        return None;
    }
    let shrunk = shrink(g, pins, k, &part, limits);
    // The part as found, with the proof its search logged: the answer when shrinking or the
    // shrunk part's proof runs out of time.
    let whole = |proof: PartProof| {
        let refutation = refutation_from(&part, pins, pinned_slots, k, proof);
        build(
            g,
            pins,
            pinned_slots,
            k,
            part.clone(),
            false,
            limits,
            options,
            Some(refutation),
        )
    };
    match shrunk {
        Some(sh) => {
            let o = build(
                g,
                &sh.pins,
                pinned_slots,
                k,
                sh.vertices,
                sh.complete,
                limits,
                options,
                None,
            );
            match proof {
                Some(proof) if !(o.vertex_critical && o.refutation.is_some()) => Some(whole(proof)),
                _ => Some(o),
            }
        }
        None => proof.map(whole),
    }
}

/// The refutation a search logged for `part`, in the form the checker reads.
fn refutation_from(
    part: &[Vertex],
    pin_class: &[Option<u32>],
    pinned_slots: &[u32],
    k: u32,
    proof: PartProof,
) -> Refutation {
    let comments = vec![
        format!(
            "Tinct: no {k}-colouring of a {}-vertex part of the map",
            part.len()
        ),
        format!("variable i*{k}+c+1 means: part vertex i has colour class c"),
        format!("part vertex i is graph vertex {part:?}[i]"),
        format!(
            "symmetry: clique {:?}, first free class {}",
            proof.symmetry.clique, proof.symmetry.first_free_class
        ),
    ];
    Refutation {
        colours: k,
        vertices: part.to_vec(),
        pinned_slots: pinned_slots.to_vec(),
        pins: part
            .iter()
            .enumerate()
            .filter_map(|(i, &v)| {
                pin_class
                    .get(v as usize)
                    .copied()
                    .flatten()
                    .map(|c| (i as u32, c))
            })
            .collect(),
        symmetry: proof.symmetry,
        cnf: proof.cnf.to_dimacs(&comments),
        drat: proof.drat,
    }
}

fn structural_obstruction(g: &Graph, k: u32) -> Option<Vec<Vertex>> {
    let (order, degeneracy) = smallest_last_order(g);
    let clique = find_clique_in_order(g, &order, degeneracy, 200_000, k as usize + 1);
    if clique.len() > k as usize {
        let mut c = clique[..=k as usize].to_vec();
        c.sort_unstable();
        return Some(c);
    }
    if k == 2
        && let Some(mut c) = odd_cycle(g)
    {
        c.sort_unstable();
        return Some(c);
    }
    if k == 3
        && let Some((hub, rim)) = odd_wheel(g)
    {
        let mut c = rim;
        c.push(hub);
        c.sort_unstable();
        return Some(c);
    }
    None
}

/// What the deletion filter kept.
struct Shrunk {
    /// Graph vertices, ascending.
    vertices: Vec<Vertex>,
    /// Class per graph vertex for the pins that are still needed (empty when none are).
    pins: Vec<Option<u32>>,
    /// True when every vertex and pin was tried (the result is critical).
    complete: bool,
}

/// Deletion filter over the vertices of `part` and their pins. Each vertex and each pin has a
/// selector variable; the SAT call assumes the selectors of what is still in, and its
/// unsatisfiable core drops everything it did not use. Pins are tried first, so that an
/// obstruction leans on as few pins as possible.
fn shrink(
    g: &Graph,
    pin_class: &[Option<u32>],
    k: u32,
    part: &[Vertex],
    limits: Limits,
) -> Option<Shrunk> {
    let sub = g.induced(part);
    let s = part.len() as u32;
    let sub_pins: Vec<Option<u32>> = part
        .iter()
        .map(|&v| pin_class.get(v as usize).copied().flatten())
        .collect();
    let pinned: Vec<u32> = (0..s).filter(|&i| sub_pins[i as usize].is_some()).collect();
    let vertex_selector = |i: u32| (s * k + i + 1) as i32;
    let pin_selector = |j: usize| (s * k + s + j as u32 + 1) as i32;
    // Sound whatever pins are deselected: it only permutes classes no pin in `sub_pins` names.
    let symmetry = symmetry_for(&sub, &sub_pins, 20_000);
    let mut sat = Sat::new(
        s * k + s + pinned.len() as u32,
        false,
        limits.cancel,
        limits.deadline,
    );
    for i in 0..s {
        let mut clause = vec![-vertex_selector(i)];
        clause.extend((0..k).map(|c| colour_var(i, c, k)));
        sat.add_clause(&clause);
    }
    for (j, &i) in pinned.iter().enumerate() {
        match sub_pins[i as usize] {
            Some(c) if c < k => sat.add_clause(&[-pin_selector(j), colour_var(i, c, k)]),
            _ => sat.add_clause(&[-pin_selector(j)]),
        }
    }
    for (u, v) in sub.edges() {
        for c in 0..k {
            sat.add_clause(&[-colour_var(u, c, k), -colour_var(v, c, k)]);
        }
    }
    for (i, &v) in symmetry.clique.iter().enumerate() {
        for c in (symmetry.first_free_class + i as u32 + 1)..k {
            sat.add_clause(&[-colour_var(v, c, k)]);
        }
    }
    let mut vertex_in = vec![true; s as usize];
    let mut pin_in = vec![true; pinned.len()];
    let assumptions = |vertex_in: &[bool], pin_in: &[bool]| -> Vec<i32> {
        let mut a: Vec<i32> = (0..s)
            .filter(|&i| vertex_in[i as usize])
            .map(vertex_selector)
            .collect();
        a.extend(
            (0..pinned.len())
                .filter(|&j| pin_in[j] && vertex_in[pinned[j] as usize])
                .map(pin_selector),
        );
        a
    };
    let restrict_to_core = |sat: &Sat, vertex_in: &mut [bool], pin_in: &mut [bool]| {
        let core = sat.core_vars();
        let used = |lit: i32| core.binary_search(&(lit as u32)).is_ok();
        for i in 0..s {
            if vertex_in[i as usize] && !used(vertex_selector(i)) {
                vertex_in[i as usize] = false;
            }
        }
        for j in 0..pinned.len() {
            if pin_in[j] && (!vertex_in[pinned[j] as usize] || !used(pin_selector(j))) {
                pin_in[j] = false;
            }
        }
    };
    match sat.solve(&assumptions(&vertex_in, &pin_in)) {
        SatAnswer::Unsat => restrict_to_core(&sat, &mut vertex_in, &mut pin_in),
        _ => return None,
    }
    let mut complete = true;
    // Pins first; then low-degree vertices, the likeliest to be unnecessary.
    for j in 0..pinned.len() {
        if !pin_in[j] {
            continue;
        }
        pin_in[j] = false;
        match sat.solve(&assumptions(&vertex_in, &pin_in)) {
            SatAnswer::Unsat => restrict_to_core(&sat, &mut vertex_in, &mut pin_in),
            SatAnswer::Sat => pin_in[j] = true,
            SatAnswer::Unknown => {
                pin_in[j] = true;
                complete = false;
                break;
            }
        }
    }
    let mut order: Vec<u32> = (0..s).collect();
    order.sort_by_key(|&i| (sub.degree(i), i));
    for i in order {
        if !complete || !vertex_in[i as usize] {
            continue;
        }
        vertex_in[i as usize] = false;
        match sat.solve(&assumptions(&vertex_in, &pin_in)) {
            SatAnswer::Unsat => restrict_to_core(&sat, &mut vertex_in, &mut pin_in),
            SatAnswer::Sat => vertex_in[i as usize] = true,
            SatAnswer::Unknown => {
                vertex_in[i as usize] = true;
                complete = false;
            }
        }
    }
    let mut vertices: Vec<Vertex> = (0..s)
        .filter(|&i| vertex_in[i as usize])
        .map(|i| part[i as usize])
        .collect();
    vertices.sort_unstable();
    let mut pins = Vec::new();
    if pin_in.iter().any(|&b| b) {
        pins = vec![None; g.vertex_count()];
        for (j, &i) in pinned.iter().enumerate() {
            if pin_in[j] && vertex_in[i as usize] {
                pins[part[i as usize] as usize] = sub_pins[i as usize];
            }
        }
    }
    Some(Shrunk {
        vertices,
        pins,
        complete,
    })
}

#[allow(clippy::too_many_arguments)]
fn build(
    g: &Graph,
    pin_class: &[Option<u32>],
    pinned_slots: &[u32],
    k: u32,
    vertices: Vec<Vertex>,
    critical: bool,
    limits: Limits,
    options: &ObstructionOptions,
    ready: Option<Refutation>,
) -> Obstruction {
    let sub = g.induced(&vertices);
    // Renumber the pinned classes that occur here as 0..q, so the symmetry rule can use the rest.
    let mut present: Vec<u32> = vertices
        .iter()
        .filter_map(|&v| pin_class.get(v as usize).copied().flatten())
        .collect();
    present.sort_unstable();
    present.dedup();
    let sub_pins: Vec<Option<u32>> = vertices
        .iter()
        .map(|&v| {
            pin_class
                .get(v as usize)
                .copied()
                .flatten()
                .map(|c| present.partition_point(|&p| p < c) as u32)
        })
        .collect();
    let sub_slots: Vec<u32> = present
        .iter()
        .map(|&c| pinned_slots.get(c as usize).copied().unwrap_or(c))
        .collect();
    let symmetry = symmetry_for(&sub, &sub_pins, 20_000);
    let cnf = colouring_cnf(&sub, &sub_pins, k, &symmetry);
    let comments = vec![
        format!(
            "Tinct: no {k}-colouring of a {}-vertex obstruction",
            vertices.len()
        ),
        format!("variable i*{k}+c+1 means: obstruction vertex i has colour class c"),
        format!("obstruction vertex i is graph vertex {vertices:?}[i]"),
        format!(
            "symmetry: clique {:?}, first free class {}",
            symmetry.clique, symmetry.first_free_class
        ),
    ];
    let refutation = ready.or_else(|| {
        let cnf_text = cnf.to_dimacs(&comments);
        let mut sat = Sat::new(cnf.variables, true, limits.cancel, limits.deadline);
        for c in &cnf.clauses {
            sat.add_clause(c);
        }
        match sat.solve(&[]) {
            SatAnswer::Unsat => sat.proof().map(|drat| Refutation {
                colours: k,
                vertices: vertices.clone(),
                pinned_slots: sub_slots.clone(),
                pins: sub_pins
                    .iter()
                    .enumerate()
                    .filter_map(|(i, p)| p.map(|c| (i as u32, c)))
                    .collect(),
                symmetry: symmetry.clone(),
                cnf: cnf_text,
                drat,
            }),
            _ => None,
        }
    });
    let argument = if vertices.len() <= options.argument_max_vertices {
        let names = |i: Vertex| format!("vertex {}", vertices[i as usize]);
        case_analysis(
            &sub,
            &sub_pins,
            &sub_slots,
            k,
            &symmetry,
            &names,
            options.argument_max_steps,
        )
        .map(|steps| {
            steps
                .into_iter()
                .map(|mut s| {
                    s.vertex = vertices[s.vertex as usize];
                    s.because = s.because.iter().map(|&b| vertices[b as usize]).collect();
                    s
                })
                .collect()
        })
    } else {
        None
    };
    let edges: Vec<(Vertex, Vertex)> = sub
        .edges()
        .map(|(a, b)| (vertices[a as usize], vertices[b as usize]))
        .collect();
    let pins: Vec<(Vertex, u32)> = vertices
        .iter()
        .zip(&sub_pins)
        .filter_map(|(&v, p)| p.map(|c| (v, sub_slots[c as usize])))
        .collect();
    let kind = classify(&sub, k, !pins.is_empty());
    Obstruction {
        colours: k,
        vertices,
        edges,
        pins,
        kind,
        vertex_critical: critical,
        argument,
        refutation,
    }
}

fn classify(sub: &Graph, k: u32, pinned: bool) -> ObstructionKind {
    let n = sub.vertex_count();
    let m = sub.edge_count();
    if pinned {
        return ObstructionKind::Pinned;
    }
    if n == k as usize + 1 && m == n * (n - 1) / 2 {
        return ObstructionKind::Complete;
    }
    let degrees: Vec<usize> = (0..n as u32).map(|v| sub.degree(v)).collect();
    if k == 2 && n % 2 == 1 && m == n && degrees.iter().all(|&d| d == 2) {
        return ObstructionKind::OddCycle;
    }
    if k == 3 && n >= 6 && n.is_multiple_of(2) && m == 2 * (n - 1) {
        let hubs = degrees.iter().filter(|&&d| d == n - 1).count();
        let rims = degrees.iter().filter(|&&d| d == 3).count();
        if hubs == 1 && rims == n - 1 {
            return ObstructionKind::OddWheel;
        }
    }
    if k == 3 && n == 11 && m == 20 {
        let triangle_free = sub.edges().all(|(a, b)| {
            let (na, nb) = (sub.neighbours(a), sub.neighbours(b));
            !na.iter().any(|x| nb.binary_search(x).is_ok())
        });
        if triangle_free {
            return ObstructionKind::Grotzsch;
        }
    }
    ObstructionKind::Critical
}
