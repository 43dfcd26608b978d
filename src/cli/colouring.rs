//! The `colouring` section of `tinct analyse`, and `tinct colour`.
//!
//! JSON shape (key `colouring`):
//! - `minimum`: the fewest colours found (null when nothing could be coloured); `proven`: whether it
//!   is proven minimal; `lower_bound` and `lower_bound_reason`: what is proven, and why in words.
//! - `assignment`: `{"<region id>": slot}` for every land region (slots 0-based), when a colouring
//!   fits the palette.
//! - `three_colourable`: true, false, or null when undecided.
//! - `obstruction` (when three colours are impossible): `kind` (`K4`, `odd_wheel`, `odd_cycle`,
//!   `grotzsch`, `pinned`, `critical`), `vertices` (its regions), `edges` (its borders as `[a, b]`),
//!   `argument` (the case analysis in words, when small enough), `proof_checked` (the DRAT proof passed
//!   Tinct's own checker).
//! - `stopped`: the time limit ended the search early; `impossible`: why no colouring can exist.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::time::Duration;

use anyhow::Context as _;
use serde::Serialize;

use crate::doc::Document;
use crate::engine::colouring::check_drat;
use crate::worker::JobContext;
use crate::worker::analysis::{self, BalanceBy, ColourOptions, ColouringVerdict};

/// The `obstruction` object.
#[derive(Serialize, Clone, Debug)]
pub struct ObstructionOut {
    pub kind: String,
    pub description: String,
    pub vertices: Vec<u64>,
    pub edges: Vec<[u64; 2]>,
    pub argument: Vec<String>,
    pub proof_checked: bool,
}

/// The `colouring` object of `tinct analyse --json`.
#[derive(Serialize, Clone, Debug)]
pub struct ColouringOut {
    pub minimum: Option<u32>,
    pub proven: bool,
    pub lower_bound: u32,
    pub lower_bound_reason: String,
    pub assignment: BTreeMap<String, u32>,
    pub three_colourable: Option<bool>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub obstruction: Option<ObstructionOut>,
    pub stopped: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub impossible: Option<String>,
}

fn context() -> JobContext {
    JobContext {
        cancel: Default::default(),
        progress: Default::default(),
    }
}

/// Analyses the colouring of `doc` (fresh, not keeping current colours) within `time_limit`, and writes
/// the proof files into `proof_out` when three colours are impossible.
pub fn section(
    doc: &Document,
    time_limit: Duration,
    proof_out: Option<&Path>,
) -> anyhow::Result<ColouringOut> {
    let options = ColourOptions {
        keep_current: false,
        balance: None,
        time_limit,
    };
    let verdict = analysis::colour(doc, &context(), options);
    if let (Some(dir), Some((cnf, drat))) = (
        proof_out,
        verdict
            .three_impossible
            .as_ref()
            .and_then(|i| i.cnf_and_proof.as_ref()),
    ) {
        std::fs::create_dir_all(dir).with_context(|| format!("cannot create {}", dir.display()))?;
        for (name, text) in [("three-colours.cnf", cnf), ("three-colours.drat", drat)] {
            crate::doc::file::write_atomically(&dir.join(name), text.as_bytes())
                .map_err(|e| anyhow::anyhow!("{e}"))?;
        }
    }
    Ok(to_out(&verdict))
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
        three_colourable: v.three_colourable,
        obstruction: v.three_impossible.as_ref().map(|i| ObstructionOut {
            kind: i.code.clone(),
            description: i.kind.to_string(),
            vertices: i.regions.iter().map(|r| r.0).collect(),
            edges: i.links.iter().map(|p| [p.a().0, p.b().0]).collect(),
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
        }),
        stopped: v.stopped,
        impossible: v.impossible.clone(),
    }
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
            "  fewest colours: {m}, proven ({} need {m})\n",
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

/// `tinct colour FILE --out OUT`: colours the map with the fewest colours and writes the project.
pub fn run_colour(
    file: &Path,
    out: &Path,
    keep: bool,
    balance: Option<BalanceBy>,
    time_limit: Duration,
) -> anyhow::Result<String> {
    let loaded = crate::formats::load(file)?;
    let mut doc = loaded.doc;
    let options = ColourOptions {
        keep_current: keep,
        balance,
        time_limit,
    };
    let verdict = analysis::colour(&doc, &context(), options);
    if let Some(why) = &verdict.impossible {
        anyhow::bail!("no colouring can satisfy this map: {why}");
    }
    let colouring = verdict
        .colouring
        .clone()
        .context("the palette has too few colours for this map")?;
    doc.apply(crate::doc::Edit::SetColouring(colouring))
        .map_err(|e| anyhow::anyhow!("{e}"))?;
    crate::formats::save(&doc, out)?;
    let mut summary = format!(
        "coloured {} with {} colours{}",
        file.display(),
        verdict.minimum.map_or("?".into(), |m| m.to_string()),
        if verdict.proven {
            " (proven fewest)"
        } else {
            ""
        }
    );
    if let Some(changed) = verdict.changed.filter(|_| keep) {
        summary.push_str(&format!("; {changed} regions changed colour"));
    }
    Ok(summary)
}

/// Where `--proof-out` writes.
pub fn proof_files(dir: &Path) -> [PathBuf; 2] {
    [
        dir.join("three-colours.cnf"),
        dir.join("three-colours.drat"),
    ]
}
