//! Fewest relaxations in map terms: which corner contacts, hand-made borders, short borders, group
//! memberships or pins to drop so that k colours do; the engine's problem built from a document,
//! its answer checked and named in regions, and the one edit that applies it.
//!
//! Every land region is its own vertex (groups are not merged here: a region's membership of a
//! same-colour group is a constraint "same colour as the group", the group being a vertex of its
//! own with no borders). Active borders are "differ" constraints, pins are pins. Those of an
//! allowed kind are soft, at cost 1; the rest are hard.
//!
//! The same question for a flat drawing ([`fewest_relaxations_planar`]): which borders to drop so
//! that the borders can be drawn without crossings (the constraint graph is planar, so the
//! four-colour theorem applies). There a same-colour group is one vertex, so only borders
//! (corner, manual, short) are relaxable.

use std::collections::BTreeMap;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use super::Control;
use crate::doc::{
    Border, BorderKind, ConstraintGraph, Document, Edit, GroupId, RegionChange, RegionId,
    RegionPair, Units,
};
use crate::engine::Vertex;
use crate::engine::certify::{
    PlanarRelaxCheck, PlanarRelaxRejection, RelaxCheck, RelaxRejection, check_planar_relaxation,
    check_relaxation,
};
use crate::engine::relax::{
    Constraint, PlanarRelaxProblem, PlanarRelaxReport, RelaxError, RelaxOptions, RelaxProblem,
    RelaxReport, SoftEdge, SoftItem, relax, relax_planar,
};

/// Which kinds of rule may be dropped.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Allowed {
    /// Corner contacts the rule counts (and shared borders shorter than the map's minimum, which
    /// count as corners).
    pub corner: bool,
    /// Borders added by hand (every edge of a graph file is one).
    pub manual: bool,
    /// Shared borders shorter than this, in world units.
    pub short: Option<f64>,
    /// A region's membership of a same-colour group.
    pub group: bool,
    /// Pins.
    pub pin: bool,
    /// Borders cost more the longer they are, so the shortest go first: a corner contact (or a
    /// hand-made border) costs 1, the shortest soft shared border 2, one `n` times as long about
    /// `n + 1` ([`border_costs`]). Otherwise every relaxation costs 1.
    pub by_length: bool,
}

impl Default for Allowed {
    /// Corner contacts, hand-made borders and group memberships.
    fn default() -> Allowed {
        Allowed {
            corner: true,
            manual: true,
            short: None,
            group: true,
            pin: false,
            by_length: false,
        }
    }
}

/// The cost of each border in `lengths` (0 for corner contacts and hand-made borders) when
/// borders are weighed by length: 1 + ⌈length / q⌉, q being the shortest positive length among
/// them, so that the costs do not depend on the map's units.
pub fn border_costs(lengths: &[f64]) -> Vec<u64> {
    let q = lengths
        .iter()
        .copied()
        .filter(|l| *l > 0.0 && l.is_finite())
        .fold(f64::INFINITY, f64::min);
    lengths
        .iter()
        .map(|&l| {
            if l > 0.0 && q.is_finite() {
                1 + (l / q).ceil().min(1e12) as u64
            } else {
                1
            }
        })
        .collect()
}

impl Allowed {
    /// Reads a comma-separated list: `corner`, `manual`, `short:LEN`, `group`, `pin`. A length is
    /// in the map's units; a map in metres also takes `m` and `km` suffixes.
    pub fn parse(text: &str, units: Units) -> Result<Allowed, String> {
        let mut allowed = Allowed {
            corner: false,
            manual: false,
            short: None,
            group: false,
            pin: false,
            by_length: false,
        };
        for word in text.split(',').map(str::trim).filter(|w| !w.is_empty()) {
            match word {
                "corner" => allowed.corner = true,
                "manual" => allowed.manual = true,
                "group" => allowed.group = true,
                "pin" => allowed.pin = true,
                _ => {
                    let Some(length) = word.strip_prefix("short:") else {
                        return Err(format!(
                            "unknown kind \"{word}\" (use corner, manual, short:LENGTH, group, pin)"
                        ));
                    };
                    allowed.short = Some(parse_length(length, units)?);
                }
            }
        }
        Ok(allowed)
    }
}

/// A border's length for weighing: shared borders their length, every other kind 0.
fn border_length(border: &Border) -> f64 {
    if border.kind == BorderKind::Shared {
        border.length
    } else {
        0.0
    }
}

fn parse_length(text: &str, units: Units) -> Result<f64, String> {
    let (number, factor) = if let Some(n) = text.strip_suffix("km") {
        (n, Some(1000.0))
    } else if let Some(n) = text.strip_suffix('m') {
        (n, Some(1.0))
    } else {
        (text, None)
    };
    if factor.is_some() && units != Units::Metres {
        return Err(format!(
            "\"{text}\": this map has no units, so give the length as a plain number"
        ));
    }
    match number.trim().parse::<f64>() {
        Ok(x) if x.is_finite() && x > 0.0 => Ok(x * factor.unwrap_or(1.0)),
        _ => Err(format!("\"{text}\" is not a positive length")),
    }
}

/// One thing that may be dropped.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Relaxation {
    /// A border: `kind` is "corner", "manual" or "short".
    Border {
        pair: RegionPair,
        kind: &'static str,
    },
    /// A region leaves its same-colour group.
    Group { region: RegionId, group: GroupId },
    /// A region's pin is removed.
    Pin { region: RegionId, slot: u32 },
}

impl Relaxation {
    /// "corner", "manual", "short", "group" or "pin".
    pub fn kind(&self) -> &'static str {
        match self {
            Relaxation::Border { kind, .. } => kind,
            Relaxation::Group { .. } => "group",
            Relaxation::Pin { .. } => "pin",
        }
    }

    /// The regions it is about.
    pub fn regions(&self) -> Vec<RegionId> {
        match *self {
            Relaxation::Border { pair, .. } => vec![pair.a(), pair.b()],
            Relaxation::Group { region, .. } | Relaxation::Pin { region, .. } => vec![region],
        }
    }

    /// In words: "Ashby–Corlen", "Ashby leaves group North", "Ashby's pin to slot 3".
    pub fn describe(&self, doc: &Document) -> String {
        let name = |id: RegionId| {
            doc.regions()
                .get(&id)
                .map_or_else(|| format!("#{id}"), |r| r.name.clone())
        };
        match *self {
            Relaxation::Border { pair, .. } => {
                format!("{}\u{2013}{}", name(pair.a()), name(pair.b()))
            }
            Relaxation::Group { region, group } => format!(
                "{} leaves group \"{}\"",
                name(region),
                doc.groups()
                    .get(&group)
                    .map_or_else(|| format!("#{group}"), |g| g.name.clone())
            ),
            Relaxation::Pin { region, slot } => {
                format!("{}'s pin to colour slot {}", name(region), slot + 1)
            }
        }
    }
}

/// The engine's problem for a document, and the way back.
#[derive(Clone, Debug)]
pub struct RelaxModel {
    pub problem: RelaxProblem,
    /// What each soft item of the problem stands for.
    pub items: Vec<Relaxation>,
    /// The region of each vertex (`None` for the vertex standing for a group's colour).
    pub vertex_region: Vec<Option<RegionId>>,
}

impl RelaxModel {
    /// Builds the problem of `doc` for `colours` colours, with the `allowed` kinds soft.
    ///
    /// # Complexity
    /// O(R + B + G) for R regions, B borders and G groups.
    pub fn build(doc: &Document, colours: u32, allowed: &Allowed) -> RelaxModel {
        let mut vertex_region = Vec::new();
        let mut vertex_of: BTreeMap<RegionId, Vertex> = BTreeMap::new();
        for (id, _) in doc.land_regions() {
            vertex_of.insert(id, vertex_region.len() as Vertex);
            vertex_region.push(Some(id));
        }
        let mut group_vertex: BTreeMap<GroupId, Vertex> = BTreeMap::new();
        for (_, region) in doc.land_regions() {
            if let Some(g) = region.group {
                group_vertex.entry(g).or_insert(0);
            }
        }
        for v in group_vertex.values_mut() {
            *v = vertex_region.len() as Vertex;
            vertex_region.push(None);
        }
        let mut hard = Vec::new();
        let mut soft = Vec::new();
        let mut items = Vec::new();
        let min = doc.settings().min_border_length;
        let mut lengths = Vec::new();
        for (pair, border) in doc.active_borders() {
            let (Some(&u), Some(&v)) = (vertex_of.get(&pair.a()), vertex_of.get(&pair.b())) else {
                continue;
            };
            let kind = relaxable_kind(border, min, allowed);
            let constraint = Constraint::Differ(u, v);
            match kind {
                Some(kind) => {
                    soft.push(SoftItem {
                        constraint,
                        cost: 1,
                    });
                    items.push(Relaxation::Border { pair, kind });
                    lengths.push(border_length(border));
                }
                None => hard.push(constraint),
            }
        }
        if allowed.by_length {
            for (item, cost) in soft.iter_mut().zip(border_costs(&lengths)) {
                item.cost = cost;
            }
        }
        for (id, region) in doc.land_regions() {
            let v = vertex_of[&id];
            if let Some(g) = region.group {
                let constraint = Constraint::Same(v, group_vertex[&g]);
                if allowed.group {
                    soft.push(SoftItem {
                        constraint,
                        cost: 1,
                    });
                    items.push(Relaxation::Group {
                        region: id,
                        group: g,
                    });
                } else {
                    hard.push(constraint);
                }
            }
            if let Some(slot) = region.pin {
                let constraint = Constraint::Pin(v, slot);
                if allowed.pin {
                    soft.push(SoftItem {
                        constraint,
                        cost: 1,
                    });
                    items.push(Relaxation::Pin { region: id, slot });
                } else {
                    hard.push(constraint);
                }
            }
        }
        RelaxModel {
            problem: RelaxProblem {
                vertex_count: vertex_region.len(),
                hard,
                soft,
                colours,
            },
            items,
            vertex_region,
        }
    }

    /// The regions of some vertices, ascending (group vertices left out).
    pub fn regions_of(&self, vertices: &[Vertex]) -> Vec<RegionId> {
        let mut out: Vec<RegionId> = vertices
            .iter()
            .filter_map(|&v| self.vertex_region[v as usize])
            .collect();
        out.sort();
        out
    }

    /// The colouring of the report as colours per region.
    pub fn region_colouring(&self, colouring: &[u32]) -> BTreeMap<RegionId, u32> {
        self.vertex_region
            .iter()
            .zip(colouring)
            .filter_map(|(r, &c)| r.map(|r| (r, c)))
            .collect()
    }
}

/// The kind under which an active border may be dropped, or `None` if it is hard.
fn relaxable_kind(border: &Border, min: f64, allowed: &Allowed) -> Option<&'static str> {
    let counts_as_corner = border.kind == BorderKind::Corner
        || (border.kind == BorderKind::Shared && border.length < min);
    if counts_as_corner {
        return allowed.corner.then_some("corner");
    }
    match border.kind {
        BorderKind::Manual => allowed.manual.then_some("manual"),
        BorderKind::Shared if allowed.short.is_some_and(|l| border.length < l) => Some("short"),
        _ => None,
    }
}

/// The answer for a document, with the checker's verdict on it.
#[derive(Clone, Debug)]
pub struct RelaxVerdict {
    pub model: RelaxModel,
    pub report: RelaxReport,
    /// The independent checker's verdict on the whole report.
    pub check: Result<RelaxCheck, RelaxRejection>,
}

impl RelaxVerdict {
    /// The relaxations of the answer, in problem order.
    pub fn relaxations(&self) -> Vec<Relaxation> {
        self.report
            .relaxation
            .iter()
            .flatten()
            .map(|&j| self.model.items[j])
            .collect()
    }
}

/// Finds the fewest relaxations of the `allowed` kinds that let `doc` take `colours` colours,
/// within `time_limit`, and checks the answer.
pub fn fewest_relaxations(
    doc: &Document,
    colours: u32,
    allowed: &Allowed,
    time_limit: Duration,
    control: &Control,
) -> Result<RelaxVerdict, RelaxError> {
    (control.progress)("Building the relaxation problem", 0.0);
    let model = RelaxModel::build(doc, colours, allowed);
    let options = RelaxOptions {
        deadline: Some(Instant::now() + time_limit),
        ..RelaxOptions::default()
    };
    let report = relax(&model.problem, &options, control.cancel, &mut |p| {
        let fraction = match p.best_cost {
            Some(best) if best > 0 => p.lower_bound as f64 / best as f64,
            _ => 0.0,
        };
        (control.progress)(
            &format!(
                "{} obstructions; at least {} to drop",
                p.obstructions, p.lower_bound
            ),
            fraction.min(1.0),
        );
    })?;
    let check = check_relaxation(&model.problem, &report);
    (control.progress)("Done", 1.0);
    Ok(RelaxVerdict {
        model,
        report,
        check,
    })
}

/// [`fewest_relaxations`] with no cancellation and no progress (the command line).
pub fn fewest_relaxations_uncontrolled(
    doc: &Document,
    colours: u32,
    allowed: &Allowed,
    time_limit: Duration,
) -> Result<RelaxVerdict, RelaxError> {
    let never = AtomicBool::new(false);
    fewest_relaxations(
        doc,
        colours,
        allowed,
        time_limit,
        &Control {
            cancel: &never,
            progress: &|_, _| {},
        },
    )
}

/// The one undoable edit that applies `relaxations`: borders are suppressed (kept on record, so
/// nothing is lost and re-deriving adjacency does not bring them back unnoticed; a hand-made
/// border too), regions leave their groups, pins are removed. `None` when there is nothing to do.
pub fn relaxation_edit(doc: &Document, relaxations: &[Relaxation], colours: u32) -> Option<Edit> {
    batch(doc, relaxations, &format!("so that {colours} colours do"))
}

/// [`relaxation_edit`] for the answer of [`fewest_relaxations_planar`]: the same one undoable
/// edit, labelled for a flat drawing.
pub fn planar_relaxation_edit(doc: &Document, relaxations: &[Relaxation]) -> Option<Edit> {
    batch(doc, relaxations, "so that the borders can be drawn flat")
}

fn batch(doc: &Document, relaxations: &[Relaxation], purpose: &str) -> Option<Edit> {
    let mut edits = Vec::new();
    for r in relaxations {
        match *r {
            Relaxation::Border { pair, .. } => {
                if let Some(border) = doc.borders().get(&pair) {
                    edits.push(Edit::PutBorder {
                        pair,
                        border: Some(Border {
                            suppressed: true,
                            ..*border
                        }),
                    });
                }
            }
            Relaxation::Group { region, .. } => edits.push(Edit::UpdateRegion {
                id: region,
                change: RegionChange::Group(None),
            }),
            Relaxation::Pin { region, .. } => edits.push(Edit::UpdateRegion {
                id: region,
                change: RegionChange::Pin(None),
            }),
        }
    }
    (!edits.is_empty()).then(|| Edit::Batch {
        label: format!(
            "Drop {} {} {purpose}",
            edits.len(),
            if edits.len() == 1 { "rule" } else { "rules" }
        ),
        edits,
    })
}

// ---- The same question for a flat drawing ----

/// The flat-drawing problem of a document, and the way back.
///
/// Vertices are those of the constraint graph (a same-colour group is one vertex, drawn as one
/// region), so group memberships are not relaxable here, and pins do not matter to a drawing.
/// Every active border between two vertices is an edge; the borders between the same two vertices
/// (a group's members beside one region) make one edge, soft only when every one of them is of an
/// allowed kind, at a cost of one per border.
#[derive(Clone, Debug)]
pub struct PlanarModel {
    pub problem: PlanarRelaxProblem,
    /// What each soft edge of the problem stands for: the borders dropped with it.
    pub items: Vec<Vec<Relaxation>>,
    pub graph: ConstraintGraph,
}

/// The borders between two vertices: whether any of them must stay, and those that may go with
/// their lengths.
type PairBorders = (bool, Vec<(Relaxation, f64)>);

impl PlanarModel {
    /// Builds the flat-drawing problem of `doc`, with borders of the `allowed` kinds soft.
    ///
    /// # Complexity
    /// O(R + B log B) for R regions and B borders.
    pub fn build(doc: &Document, allowed: &Allowed) -> PlanarModel {
        let graph = ConstraintGraph::build(doc);
        let min = doc.settings().min_border_length;
        let mut pairs: BTreeMap<(Vertex, Vertex), PairBorders> = BTreeMap::new();
        for (pair, border) in doc.active_borders() {
            let (Some(u), Some(v)) = (graph.vertex_of(pair.a()), graph.vertex_of(pair.b())) else {
                continue;
            };
            if u == v {
                continue;
            }
            let entry = pairs.entry((u.min(v), u.max(v))).or_default();
            match relaxable_kind(border, min, allowed) {
                Some(kind) => entry
                    .1
                    .push((Relaxation::Border { pair, kind }, border_length(border))),
                None => entry.0 = true,
            }
        }
        // Each soft edge costs what its borders cost together.
        let all_lengths: Vec<f64> = pairs
            .values()
            .filter(|(is_hard, _)| !is_hard)
            .flat_map(|(_, r)| r.iter().map(|(_, l)| *l))
            .collect();
        let costs = border_costs(&all_lengths);
        let mut next_cost = costs.iter();
        let mut hard = Vec::new();
        let mut soft = Vec::new();
        let mut items = Vec::new();
        for ((u, v), (is_hard, relaxations)) in pairs {
            if is_hard {
                hard.push((u, v));
            } else {
                let weighed: u64 = relaxations
                    .iter()
                    .map(|_| next_cost.next().copied().unwrap_or(1))
                    .sum();
                soft.push(SoftEdge {
                    u,
                    v,
                    cost: if allowed.by_length {
                        weighed
                    } else {
                        relaxations.len() as u64
                    },
                });
                items.push(relaxations.into_iter().map(|(r, _)| r).collect());
            }
        }
        PlanarModel {
            problem: PlanarRelaxProblem {
                vertex_count: graph.vertex_count(),
                hard,
                soft,
            },
            items,
            graph,
        }
    }

    /// Every region on some vertices (groups expanded), ascending.
    pub fn regions_of(&self, vertices: impl IntoIterator<Item = Vertex>) -> Vec<RegionId> {
        let mut out: Vec<RegionId> = vertices
            .into_iter()
            .flat_map(|v| self.graph.members(v).iter().copied())
            .collect();
        out.sort();
        out.dedup();
        out
    }
}

/// A Kuratowski subgraph of the answer's evidence in region terms.
#[derive(Clone, Debug, PartialEq)]
pub struct PlanarObstacle {
    /// `"K5"` or `"K3,3"`.
    pub kind: &'static str,
    /// Every region it passes through, ascending.
    pub regions: Vec<RegionId>,
    /// Its branch vertices, each named by its first region.
    pub branch_regions: Vec<RegionId>,
    /// The allowed relaxations on it: at least one of them must be dropped.
    pub candidates: Vec<Relaxation>,
}

/// The flat-drawing answer for a document, with the checker's verdict on it.
#[derive(Clone, Debug)]
pub struct PlanarRelaxVerdict {
    pub model: PlanarModel,
    pub report: PlanarRelaxReport,
    /// The independent checker's verdict on the whole report.
    pub check: Result<PlanarRelaxCheck, PlanarRelaxRejection>,
}

impl PlanarRelaxVerdict {
    /// The borders the answer drops, in problem order.
    pub fn relaxations(&self) -> Vec<Relaxation> {
        self.report
            .relaxation
            .iter()
            .flatten()
            .flat_map(|&j| self.model.items[j].iter().copied())
            .collect()
    }

    /// Every Kuratowski subgraph found, in region terms.
    pub fn obstacles(&self) -> Vec<PlanarObstacle> {
        self.report
            .obstructions
            .iter()
            .map(|o| {
                let k = &o.kuratowski;
                PlanarObstacle {
                    kind: k.kind.name(),
                    regions: self
                        .model
                        .regions_of(k.edges.iter().flat_map(|&(a, b)| [a, b])),
                    branch_regions: k
                        .branch_vertices
                        .iter()
                        .map(|&v| self.model.graph.first_member(v))
                        .collect(),
                    candidates: o
                        .soft
                        .iter()
                        .flat_map(|&j| self.model.items[j].iter().copied())
                        .collect(),
                }
            })
            .collect()
    }

    /// The verdict in words (one line, no file name): the cause named when one border is enough.
    pub fn summary(&self, doc: &Document) -> String {
        let r = &self.report;
        if r.infeasible {
            let regions: Vec<String> = self
                .obstacles()
                .last()
                .map(|o| o.regions.iter().map(|&id| region_name(doc, id)).collect())
                .unwrap_or_default();
            return format!(
                "these borders cannot be drawn flat whatever allowed rule is dropped: the borders among {} that must stay already cross",
                super::and_list(&regions)
            );
        }
        let Some(set) = &r.relaxation else {
            return format!(
                "no answer before the time limit; at least {} to drop for a flat drawing",
                r.lower_bound
            );
        };
        let relaxations = self.relaxations();
        match relaxations.as_slice() {
            [] if set.is_empty() => {
                "these borders can be drawn flat as they are; nothing needs to be dropped".into()
            }
            [one] if r.proven_optimal => format!(
                "{} makes these borders impossible to draw flat",
                one.cause(doc)
            ),
            _ => {
                let list: Vec<String> = relaxations.iter().map(|x| x.cause(doc)).collect();
                format!(
                    "these borders cannot be drawn flat as they stand; to draw them flat, drop {}",
                    super::and_list(&list)
                )
            }
        }
    }
}

fn region_name(doc: &Document, id: RegionId) -> String {
    doc.regions()
        .get(&id)
        .map_or_else(|| format!("#{id}"), |r| r.name.clone())
}

impl Relaxation {
    /// As a cause: "the corner contact of Ashby and Corlen", "the border of Ashby and Esk added
    /// by hand", "the short border of Ashby and Brell", "Ashby's membership of group North",
    /// "Ashby's pin".
    pub fn cause(&self, doc: &Document) -> String {
        match *self {
            Relaxation::Border { pair, kind } => {
                let (a, b) = (region_name(doc, pair.a()), region_name(doc, pair.b()));
                match kind {
                    "corner" => format!("the corner contact of {a} and {b}"),
                    "manual" => format!("the border of {a} and {b} added by hand"),
                    _ => format!("the short border of {a} and {b}"),
                }
            }
            Relaxation::Group { .. } | Relaxation::Pin { .. } => self.describe(doc),
        }
    }
}

/// Finds the fewest borders of the `allowed` kinds whose loss lets `doc`'s borders be drawn flat
/// (a planar graph), within `time_limit`, and checks the answer. Group memberships and pins are
/// not relaxed: a group is drawn as one region, and a pin does not change a drawing.
pub fn fewest_relaxations_planar(
    doc: &Document,
    allowed: &Allowed,
    time_limit: Duration,
    control: &Control,
) -> Result<PlanarRelaxVerdict, RelaxError> {
    (control.progress)("Building the flat-drawing problem", 0.0);
    let model = PlanarModel::build(doc, allowed);
    let options = RelaxOptions {
        deadline: Some(Instant::now() + time_limit),
        ..RelaxOptions::default()
    };
    let report = relax_planar(&model.problem, &options, control.cancel, &mut |p| {
        let fraction = match p.best_cost {
            Some(best) if best > 0 => p.lower_bound as f64 / best as f64,
            _ => 0.0,
        };
        (control.progress)(
            &format!(
                "{} Kuratowski subgraphs; at least {} to drop",
                p.obstructions, p.lower_bound
            ),
            fraction.min(1.0),
        );
    })?;
    let check = check_planar_relaxation(&model.problem, &report);
    (control.progress)("Done", 1.0);
    Ok(PlanarRelaxVerdict {
        model,
        report,
        check,
    })
}

/// [`fewest_relaxations_planar`] with no cancellation and no progress (the command line).
pub fn fewest_relaxations_planar_uncontrolled(
    doc: &Document,
    allowed: &Allowed,
    time_limit: Duration,
) -> Result<PlanarRelaxVerdict, RelaxError> {
    let never = AtomicBool::new(false);
    fewest_relaxations_planar(
        doc,
        allowed,
        time_limit,
        &Control {
            cancel: &never,
            progress: &|_, _| {},
        },
    )
}
