//! The verdict panel: clashes and uncoloured land, the notes from reading the file, the fewest
//! colours and whether three can do (with their proofs), and whether the borders can be drawn
//! flat (with the Kuratowski certificate). What it says comes from a pure function
//! ([`verdict_lines`]) and the analysis; what the user asks for goes out as actions.

use egui::RichText;

use crate::analysis::{self, PlanarityVerdict, Rules};
use crate::doc::{Document, RegionId};
use crate::ui::commands::Command;
use crate::ui::frame::{Action, Frame, region_name as name};
use crate::ui::state::Highlight;
use crate::ui::widgets::marked;

/// One line of the verdict panel.
#[derive(Clone, Debug, PartialEq)]
pub enum VerdictLine {
    /// All is well with this aspect.
    Good(String),
    /// Something the user should fix; the regions are offered as links.
    Problem {
        text: String,
        regions: Vec<RegionId>,
    },
    /// Plain information.
    Note(String),
}

/// How many clashes or broken pins the verdict panel lists one by one.
const MAX_LISTED: usize = 25;

/// What the verdict panel says about the current colouring and rules. Pure, so it is unit-tested.
pub fn verdict_lines(doc: &Document, checks: &Rules) -> Vec<VerdictLine> {
    let mut out = Vec::new();
    let c = &checks.colouring;
    out.push(VerdictLine::Note(format!(
        "{} land regions as {} colouring units with {} borders",
        checks.land, checks.graph_vertices, checks.graph_edges
    )));
    for conflict in &checks.conflicts {
        out.push(VerdictLine::Problem {
            text: format!("Rules contradict: {}", conflict.describe(doc)),
            regions: conflict.regions(),
        });
    }
    if c.clashes.is_empty() {
        if c.uncoloured.is_empty() {
            out.push(VerdictLine::Good("No neighbours share a colour".into()));
        }
    } else {
        out.push(VerdictLine::Note(format!(
            "{}: neighbours with the same colour",
            crate::ui::words::count(c.clashes.len(), "clash", "clashes")
        )));
        // A long list helps nobody and costs frame time: show the first ones and count the rest.
        for clash in c.clashes.iter().take(MAX_LISTED) {
            out.push(VerdictLine::Problem {
                text: format!(
                    "{} and {} both have colour {}",
                    name(doc, clash.pair.a()),
                    name(doc, clash.pair.b()),
                    clash.slot + 1
                ),
                regions: vec![clash.pair.a(), clash.pair.b()],
            });
        }
        if c.clashes.len() > MAX_LISTED {
            out.push(VerdictLine::Note(format!(
                "… and {} more clashes",
                c.clashes.len() - MAX_LISTED
            )));
        }
    }
    // A map not coloured at all is a first step to take, not a list of faults.
    let nothing_coloured = doc.colouring().is_empty() && checks.land > 0;
    if nothing_coloured {
        out.push(VerdictLine::Note(
            "Not coloured yet: Colour with the fewest colours (Ctrl+Enter) colours it, keeping \
             pins and groups"
                .into(),
        ));
    } else if !c.uncoloured.is_empty() {
        let n = c.uncoloured.len();
        out.push(VerdictLine::Problem {
            text: format!(
                "{} {} no colour yet",
                crate::ui::words::count(n, "land region", "land regions"),
                if n == 1 { "has" } else { "have" }
            ),
            regions: c.uncoloured.iter().take(12).copied().collect(),
        });
    }
    let pins = c
        .pins_broken
        .iter()
        .filter(|p| !(nothing_coloured && p.coloured.is_none()));
    for p in pins.take(MAX_LISTED) {
        out.push(VerdictLine::Problem {
            text: format!(
                "{} is pinned to colour {} but {}",
                name(doc, p.region),
                p.pinned + 1,
                if p.coloured.is_some() {
                    "coloured otherwise"
                } else {
                    "has no colour yet"
                }
            ),
            regions: vec![p.region],
        });
    }
    for (g, members) in &c.groups_split {
        let group = doc.groups().get(g).map_or("?", |g| g.name.as_str());
        out.push(VerdictLine::Problem {
            text: format!("Group \"{group}\" is split across colours"),
            regions: members.clone(),
        });
    }
    if c.is_clean() && checks.conflicts.is_empty() {
        let used = checks.slot_use.iter().filter(|&&n| n > 0).count();
        out.push(VerdictLine::Good(format!(
            "The colouring is complete and valid, with {used} colours"
        )));
    }
    out
}

/// The verdict panel: clashes, uncoloured land, contradictions.
pub fn show(frame: &Frame, ui: &mut egui::Ui) {
    ui.heading("Verdict");
    let lines = verdict_lines(frame.doc(), frame.session.rules());
    for line in lines {
        match line {
            VerdictLine::Good(text) => {
                marked(ui, true, text);
            }
            VerdictLine::Note(text) => {
                ui.label(text);
            }
            VerdictLine::Problem { text, regions } => {
                marked(ui, false, text);
                ui.horizontal_wrapped(|ui| {
                    for id in regions {
                        if ui
                            .link(frame.name(id))
                            .on_hover_text("Select this region")
                            .clicked()
                        {
                            frame.go_to(id);
                        }
                    }
                });
            }
        }
    }
    // Notes kept with the project (each goes to its regions), then those about a graph file's
    // lines.
    let notes = frame.doc().notes().len() + frame.notices.len();
    if notes > 0 {
        egui::CollapsingHeader::new(format!("Notes from reading the file ({notes})")).show(
            ui,
            |ui| {
                // Long lists are cut: a county map can have hundreds of notes.
                for note in frame.doc().notes().iter().take(200) {
                    if note.regions.is_empty() {
                        ui.label(&note.message);
                    } else if ui
                        .link(&note.message)
                        .on_hover_text("Show these regions on the map")
                        .clicked()
                    {
                        frame.send(Action::GoTo(note.regions.clone()));
                    }
                }
                if frame.doc().notes().len() > 200 {
                    ui.label(format!(
                        "… and {} more (all are in the project file)",
                        frame.doc().notes().len() - 200
                    ));
                }
                for n in frame.notices {
                    ui.label(n);
                }
            },
        );
    }
    ui.add_space(6.0);
    colouring_ui(frame, ui);
    ui.add_space(6.0);
    planarity_ui(frame, ui);
}

/// The fewest rules to drop for one colour fewer than the proven minimum `m`: a button that
/// asks, then the answer with *Show on map* and *Drop them*.
fn relax_ui(frame: &Frame, ui: &mut egui::Ui, m: u32) {
    let answer = frame
        .relax
        .filter(|a| a.revision == frame.doc().revision() && a.minimum == m);
    let Some(answer) = answer else {
        if ui
            .button(format!("What to drop for {} colours", m - 1))
            .on_hover_text(Command::FindRelaxations.tooltip())
            .clicked()
        {
            frame.run(Command::FindRelaxations);
        }
        return;
    };
    answer_ui(
        frame,
        ui,
        answer,
        Highlight::Relaxations,
        Command::ApplyRelaxations,
    );
}

/// The fewest contacts to drop so that the borders can be drawn flat: a button that asks, then
/// the answer with *Show on map* and *Drop them*.
fn flat_relax_ui(frame: &Frame, ui: &mut egui::Ui) {
    let answer = frame
        .relax_flat
        .filter(|a| a.revision == frame.doc().revision());
    let Some(answer) = answer else {
        if ui
            .button(Command::FindFlatRelaxations.label())
            .on_hover_text(Command::FindFlatRelaxations.tooltip())
            .clicked()
        {
            frame.run(Command::FindFlatRelaxations);
        }
        return;
    };
    answer_ui(
        frame,
        ui,
        answer,
        Highlight::FlatRelaxations,
        Command::ApplyFlatRelaxations,
    );
}

/// An answer of the relaxation search: its line, *Show on map* and *Drop them*.
fn answer_ui(
    frame: &Frame,
    ui: &mut egui::Ui,
    answer: &crate::ui::state::RelaxAnswer,
    highlight: Highlight,
    apply: Command,
) {
    let words = answer.words_line();
    marked(
        ui,
        !answer.relaxations.is_empty() && !answer.impossible,
        format!("{words}."),
    );
    ui.horizontal(|ui| {
        let regions = answer.regions();
        if !regions.is_empty() && ui.button("Show on map").clicked() {
            frame.send(Action::ShowHighlight(highlight, regions));
        }
        if !answer.relaxations.is_empty()
            && ui
                .button("Drop them")
                .on_hover_text(apply.tooltip())
                .clicked()
        {
            frame.run(apply);
        }
    });
}

/// The fewest colours, whether three can do, and the proof when they cannot.
fn colouring_ui(frame: &Frame, ui: &mut egui::Ui) {
    let verdict = frame.analysis.and_then(|a| a.colouring.as_ref());
    ui.label(RichText::new("Fewest colours").strong());
    let running = frame.progress.is_some();
    let Some(verdict) = verdict else {
        ui.label(if running {
            "Searching…"
        } else {
            "Not analysed yet."
        });
        return;
    };
    if let Some(why) = &verdict.impossible {
        marked(ui, false, format!("No colouring is possible: {why}."));
        return;
    }
    match verdict.minimum {
        Some(m) if verdict.proven => marked(
            ui,
            true,
            format!(
                "{m}, proven: fewer cannot work because {}.",
                verdict.lower_bound_reason
            ),
        ),
        Some(m) => {
            let still = if running {
                ", still searching"
            } else if verdict.stopped {
                "; the search stopped at its time limit"
            } else {
                ""
            };
            marked(
                ui,
                false,
                format!("{m} found, at least {} proven{still}", verdict.lower_bound),
            );
        }
        None => {
            ui.label("No colouring found yet.");
        }
    }
    // What to drop for one colour fewer than a proven minimum.
    if let (Some(m), true) = (verdict.minimum, verdict.proven && !frame.analysis_stale)
        && m >= 3
    {
        relax_ui(frame, ui, m);
    }
    // The part of the map that rules out one colour fewer, when no clique of regions shows it
    // (the three-colour case has its own line below).
    if let Some(why) = verdict
        .minimum_impossible
        .as_ref()
        .filter(|w| w.colours != 3)
    {
        ui.label(format!(
            "The part of the map that rules out {} colours ({} regions{}):",
            why.colours,
            why.regions.len(),
            if why.critical {
                ""
            } else {
                "; not shrunk to the fewest before the time limit"
            }
        ));
        evidence_buttons(frame, ui, why, Highlight::NotFewerColourable);
    }
    if verdict.extra_slots_needed > 0 {
        let n = verdict.extra_slots_needed;
        marked(
            ui,
            false,
            format!(
                "The palette has {} slots; this colouring needs {n} more.",
                frame.doc().palette().slots.len()
            ),
        );
        if ui
            .button(Command::ColourAddingSlots.label())
            .on_hover_text(Command::ColourAddingSlots.tooltip())
            .clicked()
        {
            frame.run(Command::ColourAddingSlots);
        }
    } else if ui
        .button(Command::ColourFewest.label())
        .on_hover_text(Command::ColourFewest.tooltip())
        .clicked()
    {
        frame.run(Command::ColourFewest);
    }
    ui.add_space(4.0);
    ui.label(RichText::new("Can three colours do?").strong());
    match (verdict.three_colourable, &verdict.three_impossible) {
        (Some(true), _) => marked(ui, true, "Yes: three colours are enough.".into()),
        (Some(false), Some(why)) => {
            marked(
                ui,
                false,
                format!(
                    "No, and there is a proof: {} ({} regions) cannot take three colours.",
                    why.kind,
                    why.regions.len()
                ),
            );
            evidence_buttons(frame, ui, why, Highlight::NotThreeColourable);
        }
        (Some(false), None) => marked(ui, false, "No.".into()),
        (None, _) => {
            ui.label(if running {
                "Not decided yet."
            } else {
                "Not decided (the search stopped)."
            });
        }
    }
}

/// Show on map, walk through the argument, export the proof: for one obstruction.
fn evidence_buttons(
    frame: &Frame,
    ui: &mut egui::Ui,
    why: &analysis::Impossibility,
    highlight: Highlight,
) {
    ui.horizontal_wrapped(|ui| {
        let showing = frame.view.highlight == Some(highlight);
        if ui
            .button(if showing {
                "Hide on map"
            } else {
                "Show them on map"
            })
            .clicked()
        {
            frame.send(if showing {
                Action::HideHighlight
            } else {
                Action::ShowHighlight(highlight, why.regions.clone())
            });
        }
        if why.steps.is_some() && ui.button("Walk through the argument").clicked() {
            frame.send(Action::WalkThrough(highlight, why.regions.clone()));
        }
        if why.cnf_and_proof.is_some()
            && ui
                .button(Command::ExportProof.label())
                .on_hover_text(Command::ExportProof.tooltip())
                .clicked()
        {
            frame.run(Command::ExportProof);
        }
    });
}

/// The planarity verdict, its certificate and the background job's progress.
fn planarity_ui(frame: &Frame, ui: &mut egui::Ui) {
    ui.label(RichText::new("Can the borders be drawn flat?").strong());
    if let Some((stage, fraction)) = &frame.progress {
        ui.horizontal(|ui| {
            ui.spinner();
            ui.label(format!("{stage}…"));
            if ui
                .button("Cancel")
                .on_hover_text("Stop the background analysis")
                .clicked()
            {
                frame.send(Action::CancelAnalysis);
            }
        });
        ui.add(egui::ProgressBar::new(*fraction as f32).show_percentage());
    }
    let stale = frame.analysis_stale;
    let Some(analysis) = frame.analysis else {
        ui.label("Not analysed yet.");
        return;
    };
    if stale {
        ui.label(RichText::new("(for an earlier version of the map; updating)").italics());
    }
    match analysis
        .planarity
        .as_ref()
        .unwrap_or(&PlanarityVerdict::Unknown)
    {
        PlanarityVerdict::Planar => {
            marked(ui, true, "Yes: the border graph is planar.".into());
            ui.label("Four colours always suffice unless pinned colours say otherwise.");
        }
        PlanarityVerdict::NotPlanar(o) => {
            marked(
                ui,
                false,
                format!(
                    "No: {} regions form a subdivided {} (Kuratowski), so four colours are not guaranteed.",
                    o.regions.len(),
                    o.kind
                ),
            );
            ui.label("Its corner regions:");
            ui.horizontal_wrapped(|ui| {
                for id in &o.branch_regions {
                    if ui.link(frame.name(*id)).clicked() {
                        frame.go_to(*id);
                    }
                }
            });
            let showing = frame.view.highlight == Some(Highlight::NotPlanar);
            let label = if showing {
                "Hide on map"
            } else {
                "Show on map"
            };
            if ui
                .button(label)
                .on_hover_text("Draw the crossing-forcing borders and their regions on the map")
                .clicked()
            {
                frame.send(if showing {
                    Action::HideHighlight
                } else {
                    Action::ShowHighlight(Highlight::NotPlanar, o.regions.clone())
                });
            }
            if !stale {
                flat_relax_ui(frame, ui);
            }
        }
        PlanarityVerdict::Unknown => {
            ui.label("Not known: the analysis was stopped.");
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::Edit;

    #[test]
    fn verdict_lists_clashes_with_their_regions_and_uncoloured_land() {
        let (mut doc, _) =
            crate::doc::fixtures::clashing_pair_and_one_uncoloured(["Ash", "Birch", "Cedar"]);
        let lines = verdict_lines(&doc, &crate::analysis::Analysis::rules(&doc).rules);
        assert!(lines.contains(&VerdictLine::Problem {
            text: "Ash and Birch both have colour 1".into(),
            regions: vec![RegionId(1), RegionId(2)]
        }));
        assert!(lines.iter().any(|l| matches!(l, VerdictLine::Problem { text, regions } if text.contains("1 land region has no colour") && regions == &vec![RegionId(3)])));
        doc.apply(Edit::PutColour {
            id: RegionId(2),
            slot: Some(1),
        })
        .unwrap();
        doc.apply(Edit::PutColour {
            id: RegionId(3),
            slot: Some(0),
        })
        .unwrap();
        let lines = verdict_lines(&doc, &crate::analysis::Analysis::rules(&doc).rules);
        assert!(lines.contains(&VerdictLine::Good(
            "The colouring is complete and valid, with 2 colours".into()
        )));
    }
}
