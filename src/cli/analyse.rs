//! `tinct analyse`: what a project holds, what its rules say, and what is wrong with its colouring.
//!
//! The JSON shape is documented in the README and is stable: later versions add fields, never
//! rename or remove them.

use std::fmt::Write as _;
use std::path::PathBuf;
use std::time::Duration;

use serde::Serialize;

use super::{CommandResult, OrFail, Outcome, Section, colouring, import, planarity};
use crate::analysis::{Analysis, ColourOptions, Request, Rules};
use crate::doc::{self, Document};

/// What `tinct analyse` was asked.
pub struct AnalyseArgs {
    pub file: PathBuf,
    pub json: bool,
    pub strict: bool,
    pub only: Option<Section>,
    pub embedding: bool,
    pub certificate_out: Option<PathBuf>,
    pub time_limit: Duration,
    pub proof_out: Option<PathBuf>,
    pub geo: import::GeoArgs,
}

/// `tinct analyse`: one analysis (the constraint graph once, then the parts asked for), printed
/// as text or JSON, with the certificate and proof files written when asked.
pub fn run_analyse(a: &AnalyseArgs) -> CommandResult {
    let loaded = super::load(&a.file, &a.geo)?;
    let request = Request {
        planarity: matches!(a.only, None | Some(Section::Planarity)) || a.certificate_out.is_some(),
        embedding: a.embedding || a.certificate_out.is_some(),
        colouring: matches!(a.only, None | Some(Section::Colouring)).then_some(ColourOptions {
            keep_current: false,
            balance: None,
            time_limit: a.time_limit,
        }),
    };
    let analysis = crate::analysis::uncontrolled(|c| Analysis::run(&loaded.doc, request, c));
    let report = report(
        &a.file.display().to_string(),
        &loaded.doc,
        &analysis.rules,
        &loaded.notices,
    );
    // The planarity section lives in planarity.rs, the colouring one in colouring.rs.
    let text = if a.only == Some(Section::Colouring) {
        if a.json {
            serde_json::json!({ "schema": report.schema, "file": report.file }).to_string()
        } else {
            format!("{} ({})\n", report.title, report.file)
        }
    } else {
        planarity::attach(
            &report,
            &loaded.doc,
            &analysis,
            a.json,
            a.only,
            a.embedding,
            a.certificate_out.as_deref(),
        )
        .cannot_write()?
    };
    let text = match &analysis.colouring {
        Some(verdict) => {
            let section = colouring::section(verdict, a.proof_out.as_deref()).cannot_write()?;
            colouring::append(text, a.json, &section).cannot_write()?
        }
        None => text,
    };
    Ok(Outcome {
        stdout: text,
        notes: Vec::new(),
        problems: a.strict && !report.ok,
    })
}

/// The analysis report (`--json` prints exactly this).
#[derive(Serialize)]
pub struct Report {
    /// Version of this JSON shape.
    pub schema: u32,
    pub file: String,
    pub title: String,
    pub summary: Summary,
    pub borders: BorderCounts,
    pub groups: Vec<GroupOut>,
    pub pins: Vec<PinOut>,
    pub clashes: Vec<ClashOut>,
    pub uncoloured: Vec<u64>,
    pub pins_broken: Vec<PinBrokenOut>,
    pub groups_split: Vec<u64>,
    pub rule_conflicts: Vec<ConflictOut>,
    pub notices: Vec<NoticeOut>,
    /// True when the current colouring is complete and breaks no rule, and the rules do not contradict.
    pub ok: bool,
}

#[derive(Serialize)]
pub struct Summary {
    pub regions: usize,
    pub land: usize,
    pub water: usize,
    pub groups: usize,
    pub pins: usize,
    pub coloured: usize,
    pub colours_used: usize,
    pub palette_slots: usize,
    /// Vertices and edges of the constraint graph (land only, groups merged, active borders).
    pub graph_vertices: usize,
    pub graph_edges: usize,
}

#[derive(Serialize)]
pub struct BorderCounts {
    pub recorded: usize,
    pub active: usize,
    pub shared: usize,
    pub corner: usize,
    pub manual: usize,
    pub suppressed: usize,
}

#[derive(Serialize)]
pub struct GroupOut {
    pub id: u64,
    pub name: String,
    pub members: Vec<u64>,
}

#[derive(Serialize)]
pub struct PinOut {
    pub region: u64,
    pub slot: u32,
}

#[derive(Serialize)]
pub struct ClashOut {
    pub a: u64,
    pub b: u64,
    pub slot: u32,
}

#[derive(Serialize)]
pub struct PinBrokenOut {
    pub region: u64,
    pub pinned: u32,
    pub coloured: Option<u32>,
}

#[derive(Serialize)]
pub struct ConflictOut {
    pub kind: &'static str,
    pub regions: Vec<u64>,
    pub message: String,
}

#[derive(Serialize)]
pub struct NoticeOut {
    pub line: Option<usize>,
    pub message: String,
}

/// Builds the report for a loaded document.
pub fn report(
    file: &str,
    doc: &Document,
    rules: &Rules,
    notices: &[doc::graph_formats::Notice],
) -> Report {
    let check = &rules.colouring;
    let b = &rules.borders;
    Report {
        schema: 1,
        file: file.to_string(),
        title: doc.title().to_string(),
        summary: Summary {
            regions: rules.regions,
            land: rules.land,
            water: rules.water,
            groups: rules.groups,
            pins: rules.pinned,
            coloured: rules.coloured,
            colours_used: rules.colours_used,
            palette_slots: doc.palette().slots.len(),
            graph_vertices: rules.graph_vertices,
            graph_edges: rules.graph_edges,
        },
        borders: BorderCounts {
            recorded: b.recorded,
            active: b.active,
            shared: b.shared,
            corner: b.corner,
            manual: b.manual,
            suppressed: b.suppressed,
        },
        groups: doc
            .groups()
            .iter()
            .map(|(id, g)| GroupOut {
                id: id.0,
                name: g.name.clone(),
                members: doc.group_members(*id).iter().map(|r| r.0).collect(),
            })
            .collect(),
        pins: doc
            .regions()
            .iter()
            .filter_map(|(id, r)| r.pin.map(|slot| PinOut { region: id.0, slot }))
            .collect(),
        clashes: check
            .clashes
            .iter()
            .map(|c| ClashOut {
                a: c.pair.a().0,
                b: c.pair.b().0,
                slot: c.slot,
            })
            .collect(),
        uncoloured: check.uncoloured.iter().map(|r| r.0).collect(),
        pins_broken: check
            .pins_broken
            .iter()
            .map(|p| PinBrokenOut {
                region: p.region.0,
                pinned: p.pinned,
                coloured: p.coloured,
            })
            .collect(),
        groups_split: check.groups_split.iter().map(|(g, _)| g.0).collect(),
        rule_conflicts: rules
            .conflicts
            .iter()
            .map(|c| ConflictOut {
                kind: c.kind(),
                regions: c.regions().iter().map(|r| r.0).collect(),
                message: c.describe(doc),
            })
            .collect(),
        notices: notices
            .iter()
            .map(|n| NoticeOut {
                line: n.line,
                message: n.message.clone(),
            })
            .collect(),
        ok: rules.ok(),
    }
}

/// The report as text for people.
pub fn render_text(r: &Report, doc: &Document) -> String {
    let name = |id: u64| {
        doc.regions()
            .get(&doc::RegionId(id))
            .map_or_else(|| format!("#{id}"), |r| r.name.clone())
    };
    let mut out = String::new();
    let s = &r.summary;
    let _ = writeln!(out, "{} ({})", r.title, r.file);
    let _ = writeln!(
        out,
        "  regions: {} ({} land, {} water), groups: {}, pins: {}",
        s.regions, s.land, s.water, s.groups, s.pins
    );
    let b = &r.borders;
    let _ = writeln!(
        out,
        "  borders: {} recorded, {} active ({} shared, {} corner, {} by hand, {} suppressed)",
        b.recorded, b.active, b.shared, b.corner, b.manual, b.suppressed
    );
    let _ = writeln!(
        out,
        "  colouring: {} of {} land regions coloured with {} colours (palette has {} slots)",
        s.coloured.min(s.land),
        s.land,
        s.colours_used,
        s.palette_slots
    );
    for n in &r.notices {
        match n.line {
            Some(l) => {
                let _ = writeln!(out, "  note (line {l}): {}", n.message);
            }
            None => {
                let _ = writeln!(out, "  note: {}", n.message);
            }
        }
    }
    for c in &r.rule_conflicts {
        let _ = writeln!(out, "  rule conflict: {}", c.message);
    }
    for c in &r.clashes {
        let _ = writeln!(
            out,
            "  clash: {} and {} border each other and both have colour {}",
            name(c.a),
            name(c.b),
            c.slot + 1
        );
    }
    if !r.uncoloured.is_empty() {
        let shown: Vec<String> = r.uncoloured.iter().take(10).map(|&id| name(id)).collect();
        let more = r.uncoloured.len().saturating_sub(10);
        let _ = writeln!(
            out,
            "  uncoloured: {}{}",
            shown.join(", "),
            if more > 0 {
                format!(" and {more} more")
            } else {
                String::new()
            }
        );
    }
    for p in &r.pins_broken {
        let _ = writeln!(
            out,
            "  pin not honoured: {} is pinned to colour {}",
            name(p.region),
            p.pinned + 1
        );
    }
    for g in &r.groups_split {
        let group = doc
            .groups()
            .get(&doc::GroupId(*g))
            .map_or("?", |g| g.name.as_str());
        let _ = writeln!(
            out,
            "  group split: the members of \"{group}\" have different colours"
        );
    }
    let _ = writeln!(
        out,
        "  verdict: {}",
        if r.ok {
            "the colouring is complete and breaks no rule"
        } else {
            "problems found"
        }
    );
    out
}
