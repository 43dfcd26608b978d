//! Fewest relaxations in map terms: which corner contacts, hand-made borders, short borders, group
//! memberships or pins to drop so that k colours do; the engine's problem built from a document,
//! its answer checked and named in regions, and the one edit that applies it.
//!
//! Every land region is its own vertex (groups are not merged here: a region's membership of a
//! same-colour group is a constraint "same colour as the group", the group being a vertex of its
//! own with no borders). Active borders are "differ" constraints, pins are pins. Those of an
//! allowed kind are soft, at cost 1; the rest are hard.

use std::collections::BTreeMap;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use super::Control;
use crate::doc::{
    Border, BorderKind, Document, Edit, GroupId, RegionChange, RegionId, RegionPair, Units,
};
use crate::engine::Vertex;
use crate::engine::certify::{RelaxCheck, RelaxRejection, check_relaxation};
use crate::engine::relax::{
    Constraint, RelaxError, RelaxOptions, RelaxProblem, RelaxReport, SoftItem, relax,
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
        }
    }
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
                }
                None => hard.push(constraint),
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
            "Drop {} {} so that {colours} colours do",
            edits.len(),
            if edits.len() == 1 { "rule" } else { "rules" }
        ),
        edits,
    })
}
