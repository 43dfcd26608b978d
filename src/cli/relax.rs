//! `tinct relax`: which corner contacts, hand-made borders, short borders, group memberships or
//! pins to drop so that k colours do, with the evidence that no fewer would.
//!
//! JSON shape (stable; later versions only add fields): `colours`; `relaxations`, each
//! `{"kind": "corner" | "manual" | "short", "a", "b", "names"}`, `{"kind": "group", "region",
//! "group", "names"}` or `{"kind": "pin", "region", "slot", "names"}` (ids are region and group
//! ids, slots 0-based); `cost`; `proven_optimal`; `lower_bound`; `impossible` (no set of allowed
//! relaxations gives k colours); `stopped` (the time limit came first); `evidence`:
//! `{"obstructions": [{"regions", "candidates" (the allowed relaxations inside it, in the shape
//! above: at least one of them must be dropped), "hard_only", "proof_bytes"}], "checked"}` (`checked`: the colouring, every
//! DRAT proof and the lower bound passed Tinct's independent checker); `colouring`:
//! `{"assignment": {"<region id>": colour}}` of the map with the relaxations dropped (colours
//! `0..k`), absent when there is none.
//!
//! With `--planar` (the fewest borders to drop so that the borders can be drawn flat) the shape is
//! the same without `colours` and `colouring`: `planar: true`; `relaxations`, `cost`,
//! `proven_optimal`, `lower_bound`, `impossible` (the borders that must stay already cross),
//! `stopped`; `evidence`: `{"kuratowski": [{"kind": "K5" | "K3,3", "regions", "branch_regions"
//! (one region naming each branch vertex), "candidates" (the allowed relaxations on it: at least
//! one must be dropped), "hard_only"}], "embedding": {"faces"} (the relaxed map's plane
//! embedding; absent when there is none), "checked"}` (`checked`: the embedding, every Kuratowski
//! subgraph and the lower bound passed Tinct's independent checker).

use std::collections::BTreeMap;
use std::path::PathBuf;
use std::time::Duration;

use serde::Serialize;

use super::{CommandResult, Failure, OrFail, Outcome};
use crate::analysis::relax::{
    Allowed, PlanarRelaxVerdict, RelaxVerdict, Relaxation, fewest_relaxations_planar_uncontrolled,
    fewest_relaxations_uncontrolled, planar_relaxation_edit, relaxation_edit,
};
use crate::doc::Document;

/// What `tinct relax` was asked.
pub struct RelaxArgs {
    pub file: PathBuf,
    pub colours: Option<u32>,
    /// The flat-drawing question instead of the colours one.
    pub planar: bool,
    pub allow: String,
    /// Borders weighed by length (`Allowed::by_length`).
    pub by_length: bool,
    pub json: bool,
    pub time_limit: Duration,
    pub apply: bool,
    pub out: Option<PathBuf>,
    pub geo: super::import::GeoArgs,
}

#[derive(Serialize)]
struct RelaxationOut {
    kind: &'static str,
    #[serde(skip_serializing_if = "Option::is_none")]
    a: Option<u64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    b: Option<u64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    region: Option<u64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    group: Option<u64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    slot: Option<u32>,
    names: Vec<String>,
}

#[derive(Serialize)]
struct ObstructionOut {
    regions: Vec<u64>,
    candidates: Vec<RelaxationOut>,
    hard_only: bool,
    proof_bytes: usize,
}

#[derive(Serialize)]
struct EvidenceOut {
    obstructions: Vec<ObstructionOut>,
    checked: bool,
}

#[derive(Serialize)]
struct ColouringOut {
    assignment: BTreeMap<String, u32>,
}

#[derive(Serialize)]
struct RelaxOut {
    colours: u32,
    relaxations: Vec<RelaxationOut>,
    cost: Option<u64>,
    proven_optimal: bool,
    lower_bound: u64,
    impossible: bool,
    stopped: bool,
    evidence: EvidenceOut,
    #[serde(skip_serializing_if = "Option::is_none")]
    colouring: Option<ColouringOut>,
}

fn name(doc: &Document, id: crate::doc::RegionId) -> String {
    doc.regions()
        .get(&id)
        .map_or_else(|| format!("#{id}"), |r| r.name.clone())
}

fn relaxation_out(doc: &Document, r: &Relaxation) -> RelaxationOut {
    let mut out = RelaxationOut {
        kind: r.kind(),
        a: None,
        b: None,
        region: None,
        group: None,
        slot: None,
        names: r.regions().into_iter().map(|id| name(doc, id)).collect(),
    };
    match *r {
        Relaxation::Border { pair, .. } => {
            out.a = Some(pair.a().0);
            out.b = Some(pair.b().0);
        }
        Relaxation::Group { region, group } => {
            out.region = Some(region.0);
            out.group = Some(group.0);
            if let Some(g) = doc.groups().get(&group) {
                out.names.push(g.name.clone());
            }
        }
        Relaxation::Pin { region, slot } => {
            out.region = Some(region.0);
            out.slot = Some(slot);
        }
    }
    out
}

fn to_out(doc: &Document, v: &RelaxVerdict) -> RelaxOut {
    let r = &v.report;
    RelaxOut {
        colours: r.colours,
        relaxations: v
            .relaxations()
            .iter()
            .map(|x| relaxation_out(doc, x))
            .collect(),
        cost: r.cost,
        proven_optimal: r.proven_optimal,
        lower_bound: r.lower_bound,
        impossible: r.infeasible,
        stopped: r.stopped,
        evidence: EvidenceOut {
            obstructions: r
                .obstructions
                .iter()
                .map(|o| ObstructionOut {
                    regions: v
                        .model
                        .regions_of(&o.vertices)
                        .iter()
                        .map(|id| id.0)
                        .collect(),
                    candidates: o
                        .soft
                        .iter()
                        .map(|&j| relaxation_out(doc, &v.model.items[j]))
                        .collect(),
                    hard_only: o.soft.is_empty(),
                    proof_bytes: o.drat.len(),
                })
                .collect(),
            checked: v.check.is_ok(),
        },
        colouring: r.colouring.as_ref().map(|c| ColouringOut {
            assignment: v
                .model
                .region_colouring(c)
                .into_iter()
                .map(|(id, c)| (id.0.to_string(), c))
                .collect(),
        }),
    }
}

/// "2 corner contacts", "1 group membership".
fn count(n: usize, kind: &str) -> String {
    let (one, many) = match kind {
        "corner" => ("corner contact", "corner contacts"),
        "manual" => ("border added by hand", "borders added by hand"),
        "short" => ("short border", "short borders"),
        "group" => ("group membership", "group memberships"),
        _ => ("pin", "pins"),
    };
    format!("{n} {}", if n == 1 { one } else { many })
}

fn render_text(doc: &Document, v: &RelaxVerdict, file: &str) -> String {
    let r = &v.report;
    let k = r.colours;
    let mut out = String::new();
    if r.infeasible {
        let o = r.obstructions.last();
        let regions: Vec<String> = o
            .map(|o| v.model.regions_of(&o.vertices))
            .unwrap_or_default()
            .into_iter()
            .map(|id| name(doc, id))
            .collect();
        out.push_str(&format!(
            "{file}: no set of allowed relaxations gives {k} colours: this part needs more than {k} whatever is dropped: {}\n",
            crate::analysis::and_list(&regions)
        ));
    } else if let Some(set) = &r.relaxation {
        if set.is_empty() {
            out.push_str(&format!(
                "{file}: {k} colours do as it is; nothing needs to be dropped\n"
            ));
        } else {
            let relaxations = v.relaxations();
            let mut parts = Vec::new();
            for kind in ["corner", "manual", "short", "group", "pin"] {
                let of: Vec<String> = relaxations
                    .iter()
                    .filter(|x| x.kind() == kind)
                    .map(|x| x.describe(doc))
                    .collect();
                if !of.is_empty() {
                    parts.push(format!("{}: {}", count(of.len(), kind), of.join(", ")));
                }
            }
            out.push_str(&format!(
                "{file}: does not fit in {k} colours as it stands; to use {k}, drop {}\n",
                parts.join("; ")
            ));
            if r.proven_optimal {
                out.push_str(&format!(
                    "  this is the fewest: {} found, each a part of the map that cannot take {k} colours unless one of its listed contacts or rules goes; no smaller choice meets them all\n",
                    if r.obstructions.len() == 1 { "1 obstruction".to_string() } else { format!("{} obstructions", r.obstructions.len()) }
                ));
            } else {
                out.push_str(&format!(
                    "  the best found before the time limit; at least {} must be dropped\n",
                    r.lower_bound
                ));
            }
        }
    } else {
        out.push_str(&format!(
            "{file}: no answer before the time limit; at least {} must be dropped for {k} colours\n",
            r.lower_bound
        ));
    }
    if r.relaxation.as_ref().is_some_and(|s| !s.is_empty()) {
        out.push_str(
            "  a dropped corner contact lets two regions that touch at a single point share a colour\n",
        );
    }
    match &v.check {
        Ok(_) => out.push_str(
            "  evidence: every colouring, DRAT proof and count above passed Tinct's own checker\n",
        ),
        Err(e) => out.push_str(&format!("  evidence REJECTED by the checker: {e}\n")),
    }
    out
}

/// `tinct relax FILE --colours K` or `tinct relax FILE --planar`.
pub fn run_relax(a: &RelaxArgs) -> CommandResult {
    if a.apply && a.out.is_none() {
        return Err(Failure::BadInput(anyhow::anyhow!(
            "--apply needs --out FILE.tinct to write the relaxed project to"
        )));
    }
    let colours = match (a.colours, a.planar) {
        (Some(_), true) => {
            return Err(Failure::BadInput(anyhow::anyhow!(
                "--colours and --planar ask different questions: give one of them"
            )));
        }
        (None, true) => return run_relax_planar(a),
        (None, false) => {
            return Err(Failure::BadInput(anyhow::anyhow!(
                "give --colours K (the fewest relaxations for K colours) or --planar (for a flat drawing)"
            )));
        }
        (Some(k), false) => k,
    };
    if colours == 0 {
        return Err(Failure::BadInput(anyhow::anyhow!(
            "--colours must be at least 1"
        )));
    }
    let (doc, allowed) = load_allowing(a)?;
    let verdict =
        fewest_relaxations_uncontrolled(&doc, colours, &allowed, a.time_limit).bad_input()?;
    let file = a.file.display().to_string();
    let stdout = if a.json {
        serde_json::to_string_pretty(&to_out(&doc, &verdict))
            .map_err(anyhow::Error::from)
            .bad_input()?
            + "\n"
    } else {
        render_text(&doc, &verdict, &file)
    };
    let notes = Vec::new();
    let found = verdict.report.relaxation.is_some() && verdict.check.is_ok();
    let relaxations = verdict.relaxations();
    let edit = relaxation_edit(&doc, &relaxations, colours);
    finish(a, doc, stdout, notes, found, relaxations.len(), edit)
}

#[derive(Serialize)]
struct KuratowskiOut {
    kind: &'static str,
    regions: Vec<u64>,
    branch_regions: Vec<u64>,
    candidates: Vec<RelaxationOut>,
    hard_only: bool,
}

#[derive(Serialize)]
struct EmbeddingOut {
    faces: usize,
}

#[derive(Serialize)]
struct PlanarEvidenceOut {
    kuratowski: Vec<KuratowskiOut>,
    #[serde(skip_serializing_if = "Option::is_none")]
    embedding: Option<EmbeddingOut>,
    checked: bool,
}

#[derive(Serialize)]
struct PlanarRelaxOut {
    planar: bool,
    relaxations: Vec<RelaxationOut>,
    cost: Option<u64>,
    proven_optimal: bool,
    lower_bound: u64,
    impossible: bool,
    stopped: bool,
    evidence: PlanarEvidenceOut,
}

fn planar_out(doc: &Document, v: &PlanarRelaxVerdict) -> PlanarRelaxOut {
    let r = &v.report;
    PlanarRelaxOut {
        planar: true,
        relaxations: v
            .relaxations()
            .iter()
            .map(|x| relaxation_out(doc, x))
            .collect(),
        cost: r.cost,
        proven_optimal: r.proven_optimal,
        lower_bound: r.lower_bound,
        impossible: r.infeasible,
        stopped: r.stopped,
        evidence: PlanarEvidenceOut {
            kuratowski: v
                .obstacles()
                .into_iter()
                .map(|o| KuratowskiOut {
                    kind: o.kind,
                    regions: o.regions.iter().map(|id| id.0).collect(),
                    branch_regions: o.branch_regions.iter().map(|id| id.0).collect(),
                    hard_only: o.candidates.is_empty(),
                    candidates: o
                        .candidates
                        .iter()
                        .map(|x| relaxation_out(doc, x))
                        .collect(),
                })
                .collect(),
            embedding: v
                .check
                .as_ref()
                .ok()
                .and_then(|c| c.faces)
                .map(|faces| EmbeddingOut { faces }),
            checked: v.check.is_ok(),
        },
    }
}

fn render_planar_text(doc: &Document, v: &PlanarRelaxVerdict, file: &str) -> String {
    let r = &v.report;
    let mut out = format!("{file}: {}\n", v.summary(doc));
    let subgraphs = |n: usize| {
        if n == 1 {
            "1 Kuratowski subgraph".to_string()
        } else {
            format!("{n} Kuratowski subgraphs")
        }
    };
    if r.infeasible {
        if let Some(o) = v.obstacles().last() {
            out.push_str(&format!(
                "  a {} subdivision through {} regions, every border of it one that must stay\n",
                o.kind,
                o.regions.len()
            ));
        }
    } else if r.relaxation.as_ref().is_some_and(|s| !s.is_empty()) {
        if r.proven_optimal {
            out.push_str(&format!(
                "  this is the fewest: {} found (each a K5 or K3,3 drawn in borders, which no flat drawing has), and no smaller choice breaks them all\n",
                subgraphs(r.obstructions.len())
            ));
        } else {
            out.push_str(&format!(
                "  the best found before the time limit; at least {} must be dropped\n",
                r.lower_bound
            ));
        }
        out.push_str(
            "  dropping a border changes no region: it only leaves that contact outside what the four-colour guarantee covers\n",
        );
    }
    match &v.check {
        Ok(_) => out.push_str(
            "  evidence: the flat drawing of what is left and every Kuratowski subgraph above passed Tinct's own checker\n",
        ),
        Err(e) => out.push_str(&format!("  evidence REJECTED by the checker: {e}\n")),
    }
    out
}

/// The map of `tinct relax`, and what may be dropped on it (`--allow`, `--by-length`).
fn load_allowing(a: &RelaxArgs) -> Result<(Document, Allowed), Failure> {
    let doc = super::load(&a.file, &a.geo)?.doc;
    let allowed = Allowed {
        by_length: a.by_length,
        ..Allowed::parse(&a.allow, doc.settings().units)
            .map_err(|e| anyhow::anyhow!("--allow: {e}"))
            .bad_input()?
    };
    Ok((doc, allowed))
}

/// `tinct relax FILE --planar`.
fn run_relax_planar(a: &RelaxArgs) -> CommandResult {
    let (doc, allowed) = load_allowing(a)?;
    let verdict =
        fewest_relaxations_planar_uncontrolled(&doc, &allowed, a.time_limit).bad_input()?;
    let file = a.file.display().to_string();
    let stdout = if a.json {
        serde_json::to_string_pretty(&planar_out(&doc, &verdict))
            .map_err(anyhow::Error::from)
            .bad_input()?
            + "\n"
    } else {
        render_planar_text(&doc, &verdict, &file)
    };
    let mut notes = Vec::new();
    // Groups are in the default kinds, so only an explicit pin earns the note; the README says
    // that group memberships are not dropped for a flat drawing.
    if allowed.pin {
        notes.push(
            "note: pins and group memberships are not dropped for a flat drawing (a pin changes no drawing; a group is drawn as one region)"
                .to_string(),
        );
    }
    let found = verdict.report.relaxation.is_some() && verdict.check.is_ok();
    let relaxations = verdict.relaxations();
    let edit = planar_relaxation_edit(&doc, &relaxations);
    finish(a, doc, stdout, notes, found, relaxations.len(), edit)
}

/// The end of `tinct relax`: with `--apply --out`, the answer's `edit` applied and the project
/// written (refused when no checked answer was `found`); the outcome, a problem when none was.
fn finish(
    a: &RelaxArgs,
    mut doc: Document,
    stdout: String,
    mut notes: Vec<String>,
    found: bool,
    dropped: usize,
    edit: Option<crate::doc::Edit>,
) -> CommandResult {
    if a.apply
        && let Some(out) = &a.out
    {
        if !found {
            return Err(Failure::BadInput(anyhow::anyhow!(
                "nothing to apply: no checked set of relaxations was found"
            )));
        }
        if let Some(edit) = edit {
            doc.apply(edit).bad_input()?;
        }
        super::save(&doc, out)?;
        notes.push(format!(
            "wrote {} with {dropped} dropped (undo restores them)",
            out.display(),
        ));
    }
    Ok(Outcome {
        stdout,
        notes,
        problems: !found,
    })
}
