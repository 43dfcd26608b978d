//! The `colouring` section of `tinct analyse`, and `tinct colour`.
//!
//! JSON shape (key `colouring`):
//! - `minimum`: the fewest colours found (null when nothing could be coloured); `proven`: whether it
//!   is proven minimal; `lower_bound` and `lower_bound_reason`: what is proven, and why in words.
//! - `assignment`: `{"<region id>": slot}` for every land region (slots 0-based): always a
//!   colouring with `minimum` colours, using slots past the palette when it is too small;
//!   `extra_slots_needed` says how many slots the palette lacks.
//! - `three_colourable`: true, false, or null when undecided.
//! - `obstruction` (when three colours are impossible): `kind` (`K4`, `odd_wheel`, `odd_cycle`,
//!   `grotzsch`, `pinned`, `critical`), `vertices` (its regions), `edges` (its borders as `[a, b]`),
//!   `pins` (the pins it needs), `critical` (every region in it is needed), `argument` (the case
//!   analysis in words, when small enough), `proof_checked` (the DRAT proof passed Tinct's own
//!   checker).
//! - `minimum_obstruction`: the same shape, for one colour fewer than the minimum, whenever a
//!   clique of `minimum` regions does not show the bound by itself.
//! - `stopped`: the time limit ended the search before the minimum was proven; `stopped_parts`:
//!   what else it cut short; `impossible`: why no colouring can exist.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::time::Duration;

use anyhow::Context as _;
use serde::Serialize;

use super::{CommandResult, Failure, OrFail, Outcome};
use crate::analysis::{self, BalanceBy, ColourOptions, ColouringVerdict, Impossibility};
use crate::engine::colouring::check_drat;

/// The `obstruction` and `minimum_obstruction` objects.
#[derive(Serialize, Clone, Debug)]
pub struct ObstructionOut {
    /// The number of colours it rules out.
    pub colours: u32,
    pub kind: String,
    pub description: String,
    pub vertices: Vec<u64>,
    pub edges: Vec<[u64; 2]>,
    pub pins: Vec<PinOut>,
    pub critical: bool,
    pub argument: Vec<String>,
    pub proof_checked: bool,
}

/// A pin an obstruction needs.
#[derive(Serialize, Clone, Debug)]
pub struct PinOut {
    pub region: u64,
    pub slot: u32,
}

/// The `colouring` object of `tinct analyse --json`.
#[derive(Serialize, Clone, Debug)]
pub struct ColouringOut {
    pub minimum: Option<u32>,
    pub proven: bool,
    pub lower_bound: u32,
    pub lower_bound_reason: String,
    pub assignment: BTreeMap<String, u32>,
    pub extra_slots_needed: u32,
    pub three_colourable: Option<bool>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub obstruction: Option<ObstructionOut>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub minimum_obstruction: Option<ObstructionOut>,
    pub stopped: bool,
    pub stopped_parts: Vec<&'static str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub impossible: Option<String>,
}

/// The colouring section of an analysis, writing the proof files into `proof_out`:
/// `three-colours.*` when three colours are impossible, `N-colours.*` for the obstruction to one
/// colour fewer than the minimum.
pub fn section(
    verdict: &ColouringVerdict,
    proof_out: Option<&Path>,
) -> anyhow::Result<ColouringOut> {
    if let Some(dir) = proof_out {
        write_proofs(dir, verdict)?;
    }
    Ok(to_out(verdict))
}

fn write_proofs(dir: &Path, v: &ColouringVerdict) -> anyhow::Result<()> {
    let files = analysis::proof_texts(v);
    if files.is_empty() {
        return Ok(());
    }
    std::fs::create_dir_all(dir).with_context(|| format!("cannot create {}", dir.display()))?;
    for (name, text) in files {
        crate::atomic::write_atomically(&dir.join(&name), text.as_bytes())
            .map_err(|e| anyhow::anyhow!("{e}"))?;
    }
    Ok(())
}

fn obstruction_out(i: &Impossibility) -> ObstructionOut {
    ObstructionOut {
        colours: i.colours,
        kind: i.code.clone(),
        description: i.kind.clone(),
        vertices: i.regions.iter().map(|r| r.0).collect(),
        edges: i.links.iter().map(|p| [p.a().0, p.b().0]).collect(),
        pins: i
            .pins
            .iter()
            .map(|&(region, slot)| PinOut {
                region: region.0,
                slot,
            })
            .collect(),
        critical: i.critical,
        argument: i
            .steps
            .as_ref()
            .map(|s| {
                s.iter()
                    .map(|st| format!("{}{}", "  ".repeat(st.depth as usize), st.text))
                    .collect()
            })
            .unwrap_or_default(),
        proof_checked: i
            .cnf_and_proof
            .as_ref()
            .is_some_and(|(cnf, drat)| check_drat(cnf, drat).is_ok()),
    }
}

fn to_out(v: &ColouringVerdict) -> ColouringOut {
    ColouringOut {
        minimum: v.minimum,
        proven: v.proven,
        lower_bound: v.lower_bound,
        lower_bound_reason: v.lower_bound_reason.clone(),
        assignment: v
            .colouring
            .as_ref()
            .map(|c| c.iter().map(|(id, s)| (id.0.to_string(), *s)).collect())
            .unwrap_or_default(),
        extra_slots_needed: v.extra_slots_needed,
        three_colourable: v.three_colourable,
        obstruction: v.three_impossible.as_ref().map(obstruction_out),
        minimum_obstruction: v.minimum_impossible.as_ref().map(obstruction_out),
        stopped: v.stopped,
        stopped_parts: v.stopped_parts.iter().map(|p| p.code()).collect(),
        impossible: v.impossible.clone(),
    }
}

/// "1 slot", "3 slots".
fn slots(n: u32) -> String {
    format!("{n} slot{}", if n == 1 { "" } else { "s" })
}

/// The colouring lines of the text report.
pub fn render_text(c: &ColouringOut) -> String {
    let mut out = String::new();
    if let Some(why) = &c.impossible {
        out.push_str(&format!("  colouring: impossible: {why}\n"));
        return out;
    }
    match c.minimum {
        Some(m) if c.proven => out.push_str(&format!(
            "  fewest colours: {m}, proven: fewer cannot work because {}\n",
            c.lower_bound_reason
        )),
        Some(m) => out.push_str(&format!(
            "  fewest colours: {m} found, at least {} proven{}\n",
            c.lower_bound,
            if c.stopped {
                " (the search stopped at its time limit)"
            } else {
                ""
            }
        )),
        None => out.push_str("  fewest colours: none found\n"),
    }
    if let Some(o) = c.minimum_obstruction.as_ref().filter(|o| o.colours != 3) {
        out.push_str(&format!(
            "  why not {}: {} ({} regions){}{}\n",
            o.colours,
            o.description,
            o.vertices.len(),
            if o.proof_checked {
                "; DRAT proof checked"
            } else {
                ""
            },
            if o.critical {
                ""
            } else {
                "; not shrunk to the fewest regions in time"
            }
        ));
        for line in &o.argument {
            out.push_str(&format!("    {line}\n"));
        }
    }
    if c.extra_slots_needed > 0 {
        out.push_str(&format!(
            "  palette: {} too few for this colouring (`tinct colour --add-slots` adds them)\n",
            slots(c.extra_slots_needed)
        ));
    }
    match (c.three_colourable, &c.obstruction) {
        (Some(true), _) => out.push_str("  three colours: possible\n"),
        (Some(false), Some(o)) => {
            out.push_str(&format!(
                "  three colours: impossible: {} ({} regions){}\n",
                o.description,
                o.vertices.len(),
                if o.proof_checked {
                    "; DRAT proof checked"
                } else {
                    ""
                }
            ));
            for line in &o.argument {
                out.push_str(&format!("    {line}\n"));
            }
        }
        (Some(false), None) => out.push_str("  three colours: impossible\n"),
        (None, _) => out.push_str("  three colours: not decided\n"),
    }
    if !c.stopped_parts.is_empty() {
        out.push_str(&format!(
            "  cut short by the time limit: {}\n",
            c.stopped_parts.join(", ").replace('_', " ")
        ));
    }
    out
}

/// Adds the colouring section to an analysis already rendered by the earlier sections.
pub fn append(rendered: String, json: bool, section: &ColouringOut) -> anyhow::Result<String> {
    if json {
        let mut value: serde_json::Value = serde_json::from_str(&rendered)?;
        if let Some(map) = value.as_object_mut() {
            map.insert("colouring".into(), serde_json::to_value(section)?);
        }
        Ok(serde_json::to_string_pretty(&value)? + "\n")
    } else {
        Ok(rendered + &render_text(section))
    }
}

/// What `tinct colour` was asked.
pub struct ColourArgs {
    pub file: PathBuf,
    pub out: PathBuf,
    /// Keep the current colours where possible.
    pub keep: bool,
    pub balance: Option<BalanceBy>,
    pub time_limit: Duration,
    /// Add the palette slots the map lacks instead of refusing.
    pub add_slots: bool,
    pub geo: super::import::GeoArgs,
}

/// `tinct colour FILE --out OUT`: colours the map with the fewest colours and writes the project.
/// When the palette has too few slots, `add_slots` adds them (as distinct as possible from the
/// palette's colours); without it the command refuses and says how many are missing.
pub fn run_colour(a: &ColourArgs) -> CommandResult {
    let loaded = super::load(&a.file, &a.geo)?;
    let mut doc = loaded.doc;
    let options = ColourOptions {
        keep_current: a.keep,
        balance: a.balance,
        time_limit: a.time_limit,
    };
    let verdict = analysis::uncontrolled(|c| analysis::colour(&doc, c, options));
    if let Some(why) = &verdict.impossible {
        return Err(Failure::BadInput(anyhow::anyhow!(
            "no colouring can satisfy this map: {why}"
        )));
    }
    let colouring = verdict
        .colouring
        .clone()
        .context("no colouring was found within the time limit")
        .bad_input()?;
    let extra = verdict.extra_slots_needed;
    if extra > 0 && !a.add_slots {
        return Err(Failure::BadInput(anyhow::anyhow!(
            "this map needs {} colours but the palette has only {}: run again with --add-slots to add {}",
            verdict.minimum.unwrap_or(0),
            doc.palette().slots.len(),
            slots(extra)
        )));
    }
    let mut edits = Vec::new();
    if extra > 0 {
        edits.push(crate::doc::palette_edit::grow_palette(&doc, extra));
    }
    edits.push(crate::doc::Edit::SetColouring(colouring));
    doc.apply(crate::doc::Edit::Batch {
        label: "Colour with the fewest colours".into(),
        edits,
    })
    .bad_input()?;
    super::save(&doc, &a.out)?;
    let mut summary = format!(
        "coloured {} with {} colours{}",
        a.file.display(),
        verdict.minimum.map_or("?".into(), |m| m.to_string()),
        if verdict.proven {
            " (proven fewest)"
        } else {
            ""
        }
    );
    if extra > 0 {
        summary.push_str(&format!("; added {} to the palette", slots(extra)));
    }
    if let Some(changed) = verdict.changed.filter(|_| a.keep) {
        summary.push_str(&format!("; {changed} regions changed colour"));
    }
    Ok(Outcome::notes(vec![summary]))
}

/// `tinct colour FILE --by-parent KEY --out OUT`: colours that follow a hierarchy, with a palette
/// of families; writes the project and says how many families and tints, and whether each is the
/// fewest.
pub fn run_colour_by_parent(
    file: &std::path::Path,
    out: &std::path::Path,
    key: &crate::doc::ParentKey,
    time_limit: Duration,
    geo: &super::import::GeoArgs,
) -> CommandResult {
    let loaded = super::load(file, geo)?;
    let mut doc = loaded.doc;
    let options = crate::engine::colouring::SolveOptions {
        time_limit: Some(time_limit),
        prove_three: false,
        ..Default::default()
    };
    let outcome =
        analysis::uncontrolled(|c| analysis::hierarchy::colour_by_parent(&doc, key, &options, c))
            .map_err(|e| Failure::BadInput(anyhow::anyhow!("{e}")))?;
    doc.apply(outcome.edit.clone()).bad_input()?;
    super::save(&doc, out)?;
    let mut notes = vec![format!(
        "coloured {} by parent unit: {}",
        file.display(),
        outcome.summary()
    )];
    notes.push(if outcome.clashes_after == 0 {
        "every pair of neighbours across a parent border is clearly distinct in every view the palette check uses".to_string()
    } else {
        format!(
            "{} of the {} pairs of neighbours across parent borders may look alike to some readers ({} before the tints were arranged); `tinct palette` lists the fill pairs",
            outcome.clashes_after, outcome.across, outcome.clashes_before
        )
    });
    if outcome.pins_ignored > 0 {
        notes.push(format!(
            "{} pinned regions: pins name slots of the old palette, so this colouring does not follow them",
            outcome.pins_ignored
        ));
    }
    Ok(Outcome::notes(notes))
}
