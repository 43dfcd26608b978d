//! The panels around the map. Each `*_ui` function only draws: what it shows comes from state (or
//! from a pure function such as [`verdict_lines`]), and what the user asks for goes out as commands
//! or edits.

use egui::RichText;

use crate::doc::{BorderKind, Document, Edit, GroupId, RegionChange, RegionId, Role};

use super::app::{App, ExportOptions, Highlight, Level, PathPurpose};
use super::commands::{Command, ExportFormat, Menu, Tool, search};
use super::style;
use super::widgets::{colour32, swatch};
use crate::analysis::{self, PlanarityVerdict, Rules};

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

/// A line of text with a coloured dot before it: green for good news, red for a problem.
fn marked(ui: &mut egui::Ui, good: bool, text: String) {
    let colour = if good { style::GOOD } else { style::CLASH };
    ui.horizontal_wrapped(|ui| {
        let (rect, _) = ui.allocate_exact_size(egui::vec2(10.0, 10.0), egui::Sense::hover());
        ui.painter().circle_filled(rect.center(), 4.5, colour);
        ui.label(RichText::new(text).color(colour));
    });
}

fn name(doc: &Document, id: RegionId) -> String {
    doc.regions()
        .get(&id)
        .map_or_else(|| format!("#{id}"), |r| r.name.clone())
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
            super::words::count(c.clashes.len(), "clash", "clashes")
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
                super::words::count(n, "land region", "land regions"),
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

/// The menu bar, generated from the command list.
pub fn menu_ui(app: &mut App, ui: &mut egui::Ui) {
    egui::MenuBar::new().ui(ui, |ui| {
        for menu in Menu::ALL {
            ui.menu_button(menu.label(), |ui| {
                for command in Command::all().into_iter().filter(|c| c.menu() == menu) {
                    // On/off settings are ticked checkboxes, their shortcut beside the name.
                    let toggle = match command {
                        Command::ToggleBorders => Some(app.view.show_borders),
                        Command::ToggleLabels => Some(app.view.show_labels),
                        _ => None,
                    };
                    if let Some(mut on) = toggle {
                        let key = command
                            .shortcut()
                            .map(|s| format!("    {}", ui.ctx().format_shortcut(&s)))
                            .unwrap_or_default();
                        if ui
                            .checkbox(&mut on, format!("{}{key}", command.label()))
                            .on_hover_text(command.tooltip())
                            .clicked()
                        {
                            app.emit(command);
                            ui.close();
                        }
                        continue;
                    }
                    let mut button = egui::Button::new(command.label());
                    if let Some(s) = command.shortcut() {
                        button = button.shortcut_text(ui.ctx().format_shortcut(&s));
                    }
                    let enabled = match command {
                        Command::Undo => app.session.history().undo_label().is_some(),
                        Command::Redo => app.session.history().redo_label().is_some(),
                        Command::DeleteRegion => app.view.selection.is_some(),
                        _ => true,
                    };
                    let selected = match command {
                        Command::UseTool(t) => app.view.tool == t,
                        _ => false,
                    };
                    let button = button.selected(selected);
                    if ui
                        .add_enabled(enabled, button)
                        .on_hover_text(command.tooltip())
                        .clicked()
                    {
                        app.emit(command);
                        ui.close();
                    }
                }
                if menu == Menu::File && !app.recent.is_empty() {
                    ui.separator();
                    ui.menu_button("Open recent", |ui| {
                        for path in app.recent.clone() {
                            if ui.button(path.display().to_string()).clicked() {
                                app.open_recent(path);
                                ui.close();
                            }
                        }
                    });
                }
            });
        }
    });
}

/// The tool strip above the map.
pub fn toolbar_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.horizontal_wrapped(|ui| {
        for tool in Tool::ALL {
            let command = Command::UseTool(tool);
            let key = command
                .shortcut()
                .map(|s| ui.ctx().format_shortcut(&s))
                .unwrap_or_default();
            let hint = format!("{} ({key})", tool.hint());
            if ui
                .selectable_label(app.view.tool == tool, tool.label())
                .on_hover_text(hint)
                .clicked()
            {
                app.emit(command);
            }
        }
        ui.separator();
        if app.view.tool == Tool::Pin {
            ui.label("Pin to:");
            let slots = app.session.doc().palette().slots.clone();
            for (i, slot) in slots.iter().enumerate() {
                let c = colour32(slot.colour);
                swatch(ui, c, 12.0);
                if ui
                    .selectable_label(app.view.pin_slot == i as u32, &slot.name)
                    .clicked()
                {
                    app.view.pin_slot = i as u32;
                }
            }
        }
        if app.view.tool == Tool::Group {
            let groups: Vec<(GroupId, String)> = app
                .session
                .doc()
                .groups()
                .iter()
                .map(|(id, g)| (*id, g.name.clone()))
                .collect();
            ui.label("Add to:");
            let current = app
                .view
                .group
                .and_then(|g| groups.iter().find(|(id, _)| *id == g))
                .map(|(_, n)| n.clone());
            egui::ComboBox::from_id_salt("group-choice")
                .selected_text(current.unwrap_or_else(|| "a new group".into()))
                .show_ui(ui, |ui| {
                    ui.selectable_value(&mut app.view.group, None, "a new group");
                    for (id, name) in &groups {
                        ui.selectable_value(&mut app.view.group, Some(*id), name);
                    }
                });
        }
        if ui
            .button(Command::FitView.label())
            .on_hover_text(Command::FitView.tooltip())
            .clicked()
        {
            app.emit(Command::FitView);
        }
    });
}

/// The list of regions with a search field.
pub fn regions_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.heading("Regions");
    ui.add(egui::TextEdit::singleline(&mut app.view.region_filter).hint_text("Search by name"))
        .widget_info(|| egui::WidgetInfo::labeled(egui::Role::TextInput, true, "Search regions"));
    // The matching ids are kept until the document or the search changes: on a large map,
    // filtering every name every frame would cost more than the rest of the frame.
    ui.horizontal(|ui| {
        ui.label("Order:");
        ui.radio_value(&mut app.view.list_in_file_order, false, "by name");
        ui.radio_value(&mut app.view.list_in_file_order, true, "as in the file");
    });
    let key = (
        app.scene.generation,
        app.view.region_filter.clone(),
        app.view.list_in_file_order,
    );
    if app.view.region_rows.as_ref().is_none_or(|(k, _)| *k != key) {
        let filter = app.view.region_filter.to_lowercase();
        let doc = app.session.doc();
        let mut names: std::collections::HashMap<String, usize> = Default::default();
        for r in doc.regions().values() {
            *names.entry(r.name.to_lowercase()).or_default() += 1;
        }
        let mut rows: Vec<(RegionId, bool)> = doc
            .regions()
            .iter()
            .filter(|(_, r)| filter.is_empty() || r.name.to_lowercase().contains(&filter))
            .map(|(id, r)| {
                (
                    *id,
                    names.get(&r.name.to_lowercase()).is_some_and(|&n| n > 1),
                )
            })
            .collect();
        if !app.view.list_in_file_order {
            let lower = |id: &RegionId| {
                doc.regions()
                    .get(id)
                    .map(|r| r.name.to_lowercase())
                    .unwrap_or_default()
            };
            rows.sort_by_cached_key(|(id, _)| (lower(id), *id));
        }
        app.view.region_rows = Some((key.clone(), rows));
    }
    let (key, rows) = app.view.region_rows.take().unwrap_or((key, Vec::new()));
    let doc = app.session.doc();
    ui.label(format!("{} shown of {}", rows.len(), doc.regions().len()));
    let row_height = ui.text_style_height(&egui::TextStyle::Body) + 4.0;
    let mut go = None;
    egui::ScrollArea::vertical()
        .auto_shrink([false, false])
        .show_rows(ui, row_height, rows.len(), |ui, range| {
            for (id, shared_name) in &rows[range] {
                let Some(r) = doc.regions().get(id) else {
                    continue;
                };
                let colour = match r.role {
                    Role::Water => Some(style::WATER),
                    Role::Land => doc
                        .colouring()
                        .get(id)
                        .and_then(|s| doc.palette().slots.get(*s as usize))
                        .map(|s| colour32(s.colour)),
                };
                ui.horizontal(|ui| {
                    swatch(ui, colour.unwrap_or(style::UNCOLOURED), 12.0);
                    // A name several regions share is told apart by the region's id.
                    let text = if *shared_name {
                        format!("{} (id {id})", r.name)
                    } else {
                        r.name.clone()
                    };
                    if ui
                        .selectable_label(app.view.selection == Some(*id), text)
                        .clicked()
                    {
                        go = Some(*id);
                    }
                });
            }
        });
    app.view.region_rows = Some((key, rows));
    if let Some(id) = go {
        app.go_to_region(id);
    }
}

/// The selected region's details, editable.
pub fn details_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.heading("Region");
    let Some(id) = app
        .view
        .selection
        .filter(|id| app.session.doc().regions().contains_key(id))
    else {
        ui.label("Click a region on the map or in the list.");
        return;
    };
    let region = app.session.doc().regions()[&id].clone();
    let mut edits: Vec<Edit> = Vec::new();

    // Name: typed into a draft, committed on Enter or when the field loses focus. While the field
    // is not being edited it shows the document's name (which undo may have changed).
    let field_id = egui::Id::unique(("region-name", id));
    let focused = ui.memory(|m| m.has_focus(field_id));
    let mut text = match &app.view.name_draft {
        Some((d, t)) if *d == id && focused => t.clone(),
        _ => region.name.clone(),
    };
    ui.horizontal(|ui| {
        ui.label("Name");
        let r = ui.add(egui::TextEdit::singleline(&mut text).id(field_id));
        r.widget_info(|| egui::WidgetInfo::labeled(egui::Role::TextInput, true, "Region name"));
        if r.lost_focus() && text.trim() != region.name && !text.trim().is_empty() {
            edits.push(Edit::UpdateRegion {
                id,
                change: RegionChange::Name(text.trim().to_string()),
            });
        }
    });
    app.view.name_draft = Some((id, text));
    ui.label(format!(
        "Id {id}{}",
        region.source_index.map_or(String::new(), |i| format!(
            ", feature {i} of its source file"
        ))
    ));

    let mut water = region.role == Role::Water;
    if ui
        .checkbox(&mut water, "Water or background (takes no colour)")
        .changed()
    {
        edits.push(Edit::UpdateRegion {
            id,
            change: RegionChange::Role(if water { Role::Water } else { Role::Land }),
        });
    }

    let doc = app.session.doc();
    let slot_name = |s: Option<u32>| match s {
        None => "none".to_string(),
        Some(s) => doc
            .palette()
            .slots
            .get(s as usize)
            .map_or(format!("slot {}", s + 1), |slot| slot.name.clone()),
    };
    let colour = doc.colouring().get(&id).copied();
    ui.label(format!("Colour: {}", slot_name(colour)));
    let mut pin = region.pin;
    egui::ComboBox::from_label("Pinned colour")
        .selected_text(slot_name(pin))
        .show_ui(ui, |ui| {
            ui.selectable_value(&mut pin, None, "none");
            for (i, slot) in doc.palette().slots.iter().enumerate() {
                ui.selectable_value(&mut pin, Some(i as u32), &slot.name);
            }
        });
    if pin != region.pin {
        edits.push(Edit::UpdateRegion {
            id,
            change: RegionChange::Pin(pin),
        });
    }
    let group_name = |g: Option<GroupId>| {
        g.and_then(|g| doc.groups().get(&g))
            .map_or("none".to_string(), |g| g.name.clone())
    };
    let mut group = region.group;
    egui::ComboBox::from_label("Same-colour group")
        .selected_text(group_name(group))
        .show_ui(ui, |ui| {
            ui.selectable_value(&mut group, None, "none");
            for (gid, g) in doc.groups() {
                ui.selectable_value(&mut group, Some(*gid), &g.name);
            }
        });
    if group != region.group {
        edits.push(Edit::UpdateRegion {
            id,
            change: RegionChange::Group(group),
        });
    }

    ui.separator();
    let neighbours = doc.borders_of(id);
    ui.label(RichText::new(format!("Borders ({})", neighbours.len())).strong());
    let units = doc.settings().units;
    let mut jump = None;
    egui::ScrollArea::vertical()
        .id_salt("neighbours")
        .max_height(180.0)
        .show(ui, |ui| {
            for (other, pair, border) in &neighbours {
                let active = doc.border_is_active(*pair, border);
                let kind = match border.kind {
                    BorderKind::Shared => format!("shared, {}", units.length_text(border.length)),
                    BorderKind::Corner => "corner".to_string(),
                    BorderKind::Manual => "by hand".to_string(),
                };
                let state = if border.suppressed {
                    ", removed"
                } else if !active {
                    ", ignored"
                } else {
                    ""
                };
                ui.horizontal(|ui| {
                    if ui.link(name(doc, *other)).clicked() {
                        jump = Some(*other);
                    }
                    ui.label(format!("({kind}{state})"));
                });
            }
        });
    if let Some(j) = jump {
        app.go_to_region(j);
    }
    for e in edits {
        app.edit(e);
    }
}

/// The verdict panel: clashes, uncoloured land, contradictions.
pub fn verdict_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.heading("Verdict");
    let lines = verdict_lines(app.session.doc(), app.session.rules());
    let mut jump = None;
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
                            .link(name(app.session.doc(), id))
                            .on_hover_text("Select this region")
                            .clicked()
                        {
                            jump = Some(id);
                        }
                    }
                });
            }
        }
    }
    if let Some(id) = jump {
        app.go_to_region(id);
    }
    // Notes kept with the project (each goes to its regions), then those about a graph file's
    // lines.
    let notes = app.session.doc().notes().len() + app.notices.len();
    if notes > 0 {
        let mut go: Option<Vec<RegionId>> = None;
        egui::CollapsingHeader::new(format!("Notes from reading the file ({notes})")).show(
            ui,
            |ui| {
                // Long lists are cut: a county map can have hundreds of notes.
                for note in app.session.doc().notes().iter().take(200) {
                    if note.regions.is_empty() {
                        ui.label(&note.message);
                    } else if ui
                        .link(&note.message)
                        .on_hover_text("Show these regions on the map")
                        .clicked()
                    {
                        go = Some(note.regions.clone());
                    }
                }
                if app.session.doc().notes().len() > 200 {
                    ui.label(format!(
                        "… and {} more (all are in the project file)",
                        app.session.doc().notes().len() - 200
                    ));
                }
                for n in &app.notices {
                    ui.label(n);
                }
            },
        );
        if let Some(regions) = go {
            app.view.selection = regions.first().copied();
            app.view.go_to = Some(regions);
        }
    }
    ui.add_space(6.0);
    colouring_ui(app, ui);
    ui.add_space(6.0);
    planarity_ui(app, ui);
}

/// The fewest colours, whether three can do, and the proof when they cannot.
fn colouring_ui(app: &mut App, ui: &mut egui::Ui) {
    // Borrowed out of the app for the frame rather than cloned: on a large map the verdict holds
    // a colour for every region, and a clone each frame cost more than the rest of the frame.
    let analysis = app.analysis.take();
    let verdict = analysis.as_ref().and_then(|a| a.colouring.as_ref());
    colouring_verdict_ui(app, ui, verdict);
    app.analysis = analysis;
}

fn colouring_verdict_ui(
    app: &mut App,
    ui: &mut egui::Ui,
    verdict: Option<&analysis::ColouringVerdict>,
) {
    ui.label(RichText::new("Fewest colours").strong());
    let running = app.analysis_progress().is_some();
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
        evidence_buttons(app, ui, why, Highlight::NotFewerColourable);
    }
    if verdict.extra_slots_needed > 0 {
        let n = verdict.extra_slots_needed;
        marked(
            ui,
            false,
            format!(
                "The palette has {} slots; this colouring needs {n} more.",
                app.session.doc().palette().slots.len()
            ),
        );
        if ui
            .button(Command::ColourAddingSlots.label())
            .on_hover_text(Command::ColourAddingSlots.tooltip())
            .clicked()
        {
            app.emit(Command::ColourAddingSlots);
        }
    } else if ui
        .button(Command::ColourFewest.label())
        .on_hover_text(Command::ColourFewest.tooltip())
        .clicked()
    {
        app.emit(Command::ColourFewest);
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
            evidence_buttons(app, ui, why, Highlight::NotThreeColourable);
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
    app: &mut App,
    ui: &mut egui::Ui,
    why: &analysis::Impossibility,
    highlight: Highlight,
) {
    ui.horizontal_wrapped(|ui| {
        let showing = app.view.highlight == Some(highlight);
        if ui
            .button(if showing {
                "Hide on map"
            } else {
                "Show them on map"
            })
            .clicked()
        {
            if showing {
                app.view.highlight = None;
            } else {
                app.show_highlight(highlight, why.regions.clone());
            }
        }
        if why.steps.is_some() && ui.button("Walk through the argument").clicked() {
            app.argument_step = Some(0);
            app.argument_for = highlight;
            app.show_highlight(highlight, why.regions.clone());
        }
        if why.cnf_and_proof.is_some()
            && ui
                .button(Command::ExportProof.label())
                .on_hover_text(Command::ExportProof.tooltip())
                .clicked()
        {
            app.emit(Command::ExportProof);
        }
    });
}

/// The step-by-step argument that fewer colours fail, in a window of its own.
pub fn argument_ui(app: &mut App, ctx: &egui::Context) {
    let Some(index) = app.argument_step else {
        return;
    };
    let minimum = app.argument_for == Highlight::NotFewerColourable;
    let why = app
        .analysis
        .as_ref()
        .and_then(|a| a.colouring.as_ref())
        .and_then(|c| {
            if minimum {
                c.minimum_impossible.as_ref()
            } else {
                c.three_impossible.as_ref()
            }
        });
    let colours = why.map_or(3, |w| w.colours);
    let steps = why.and_then(|i| i.steps.clone());
    let Some(steps) = steps.filter(|s| !s.is_empty()) else {
        app.argument_step = None;
        return;
    };
    let index = index.min(steps.len() - 1);
    let mut open = true;
    let mut next = index;
    let title = if colours == 3 {
        "Why three colours are impossible".to_string()
    } else {
        format!("Why {colours} colours are impossible")
    };
    egui::Window::new(title)
        .open(&mut open)
        .default_width(460.0)
        .default_pos([240.0, 70.0])
        .show(ctx, |ui| {
            ui.label(format!("Step {} of {}", index + 1, steps.len()));
            egui::ScrollArea::vertical()
                .max_height(320.0)
                .show(ui, |ui| {
                    for (i, step) in steps.iter().enumerate().take(index + 1) {
                        let text = format!("{}{}", "    ".repeat(step.depth as usize), step.text);
                        let text = if i == index {
                            RichText::new(text).strong()
                        } else {
                            RichText::new(text)
                        };
                        ui.label(text);
                    }
                });
            ui.horizontal(|ui| {
                if ui
                    .add_enabled(index > 0, egui::Button::new("Back"))
                    .clicked()
                {
                    next = index - 1;
                }
                if ui
                    .add_enabled(index + 1 < steps.len(), egui::Button::new("Next"))
                    .clicked()
                {
                    next = index + 1;
                }
                if ui.button("Show all").clicked() {
                    next = steps.len() - 1;
                }
            });
        });
    app.view.selection = Some(steps[next].region);
    app.argument_step = if open { Some(next) } else { None };
}

/// The planarity verdict, its certificate and the background job's progress.
fn planarity_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.label(RichText::new("Can the borders be drawn flat?").strong());
    if let Some((stage, fraction)) = app.analysis_progress() {
        ui.horizontal(|ui| {
            ui.spinner();
            ui.label(format!("{stage}…"));
            if ui
                .button("Cancel")
                .on_hover_text("Stop the background analysis")
                .clicked()
            {
                app.cancel_analysis();
            }
        });
        ui.add(egui::ProgressBar::new(fraction as f32).show_percentage());
    }
    let stale = app.analysis_is_stale();
    let Some(analysis) = &app.analysis else {
        ui.label("Not analysed yet.");
        return;
    };
    if stale {
        ui.label(RichText::new("(for an earlier version of the map; updating)").italics());
    }
    let mut toggle = false;
    let mut jump = None;
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
                    if ui.link(name(app.session.doc(), *id)).clicked() {
                        jump = Some(*id);
                    }
                }
            });
            let showing = app.view.highlight == Some(Highlight::NotPlanar);
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
                toggle = true;
            }
        }
        PlanarityVerdict::Unknown => {
            ui.label("Not known: the analysis was stopped.");
        }
    }
    if toggle {
        if app.view.highlight == Some(Highlight::NotPlanar) {
            app.view.highlight = None;
        } else {
            let regions = app.highlight_regions(Highlight::NotPlanar);
            app.show_highlight(Highlight::NotPlanar, regions);
        }
    }
    if let Some(id) = jump {
        app.go_to_region(id);
    }
}

/// The palette: slot swatches and names.
pub fn palette_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.heading("Palette");
    let doc = app.session.doc();
    ui.label(&doc.palette().name);
    let counts = &app.session.rules().slot_use;
    let warnings = &app.palette_warnings.warnings;
    for (i, slot) in doc.palette().slots.iter().enumerate() {
        let c = colour32(slot.colour);
        ui.horizontal(|ui| {
            swatch(ui, c, 16.0);
            ui.label(format!(
                "{}. {} {} — {} regions",
                i + 1,
                slot.name,
                slot.colour.to_hex(),
                counts.get(i).copied().unwrap_or(0)
            ));
        });
    }
    match warnings.len() {
        0 => marked(
            ui,
            true,
            "Neighbouring colours stay distinct, also in greyscale and for colour-blind readers"
                .into(),
        ),
        n => {
            marked(
                ui,
                false,
                format!(
                    "{}: some neighbouring colours are hard to tell apart",
                    super::words::count(n, "warning", "warnings")
                ),
            );
            for w in warnings.iter().take(3) {
                ui.label(RichText::new(w).small());
            }
        }
    }
    ui.horizontal_wrapped(|ui| {
        if ui
            .button(Command::PaletteWindow.label())
            .on_hover_text(Command::PaletteWindow.tooltip())
            .clicked()
        {
            app.emit(Command::PaletteWindow);
        }
        if ui
            .button(Command::AssignSlots.label())
            .on_hover_text(Command::AssignSlots.tooltip())
            .clicked()
        {
            app.emit(Command::AssignSlots);
        }
    });
}

/// The status line: file, tool hint, messages.
pub fn status_ui(app: &mut App, ui: &mut egui::Ui) {
    ui.horizontal(|ui| {
        ui.label(app.view.tool.hint());
        if let Some(first) = app.view.border_first {
            ui.label(
                RichText::new(format!(
                    "— border from {}: click the second region",
                    name(app.session.doc(), first)
                ))
                .strong(),
            );
        }
    });
    if let Some(m) = app.messages.last() {
        let colour = match m.level {
            Level::Info => ui.visuals().text_color(),
            Level::Warning => style::WARNING,
            Level::Error => style::CLASH,
        };
        ui.label(RichText::new(&m.text).color(colour));
    }
}

/// The choices that shape an exported picture (pictures only; data exports have none).
fn export_options_ui(ui: &mut egui::Ui, format: ExportFormat, options: &mut ExportOptions) {
    if !matches!(format, ExportFormat::Svg | ExportFormat::Png) {
        return;
    }
    ui.horizontal(|ui| {
        ui.checkbox(&mut options.labels, "Region names");
        ui.checkbox(&mut options.legend, "Legend");
    });
    ui.horizontal(|ui| {
        ui.label("Page width");
        ui.add(
            egui::DragValue::new(&mut options.width_mm)
                .range(20.0..=2000.0)
                .suffix(" mm"),
        );
        if format == ExportFormat::Png {
            ui.label("at");
            egui::ComboBox::from_id_salt("export-dpi")
                .selected_text(format!("{} dpi", options.dpi))
                .show_ui(ui, |ui| {
                    for dpi in [96, 150, 300, 600] {
                        ui.selectable_value(&mut options.dpi, dpi, format!("{dpi} dpi"));
                    }
                });
            let px = options.width_mm / 25.4 * options.dpi as f64;
            ui.label(format!("({px:.0} pixels wide)"));
        }
    });
}

/// Gives a text field that has just opened the keyboard focus, with its text selected, so that
/// typing replaces a suggested path and one-key shortcuts stay quiet.
fn focus_and_select(ui: &egui::Ui, response: &egui::Response, text: &str) {
    response.request_focus();
    if let Some(mut state) = egui::text_edit::TextEditState::load(ui.ctx(), response.id) {
        state
            .cursor
            .set_char_range(Some(egui::text_selection::CCursorRange::select_all_str(
                text,
            )));
        state.store(ui.ctx(), response.id);
    }
}

/// How a boundary file is imported: the options of `tinct import`, for the Open window.
fn import_options_ui(ui: &mut egui::Ui, options: &mut crate::geo::ImportOptions) {
    use crate::geo::Rule;
    ui.separator();
    ui.label(RichText::new("Importing boundaries").strong());
    ui.horizontal(|ui| {
        ui.label("Regions border each other along");
        ui.radio_value(&mut options.rule, Rule::Rook, "an edge (rook)");
        ui.radio_value(
            &mut options.rule,
            Rule::Queen,
            "an edge or a corner (queen)",
        );
    });
    let number = |ui: &mut egui::Ui, label: &str, value: &mut f64| {
        ui.horizontal(|ui| {
            let l = ui.label(label);
            ui.add(
                egui::DragValue::new(value)
                    .range(0.0..=f64::MAX)
                    .speed(10.0),
            )
            .labelled_by(l.id);
            ui.label("(metres for longitude/latitude data, else map units)");
        });
    };
    number(ui, "Tolerance", &mut options.tolerance);
    number(ui, "Shortest shared border", &mut options.min_border_length);
    let text = |ui: &mut egui::Ui, label: &str, hint: &str, value: &mut Option<String>| {
        ui.horizontal(|ui| {
            let l = ui.label(label);
            let mut typed = value.clone().unwrap_or_default();
            if ui
                .add(egui::TextEdit::singleline(&mut typed).hint_text(hint))
                .labelled_by(l.id)
                .changed()
            {
                *value = (!typed.trim().is_empty()).then(|| typed.trim().to_string());
            }
        });
    };
    text(
        ui,
        "Name field",
        "name, NAME, Name, id or ID",
        &mut options.name_field,
    );
    text(
        ui,
        "Field that tells equal names apart",
        "for example STATE",
        &mut options.qualify_field,
    );
    text(ui, "Layer", "the only polygon layer", &mut options.layer);
    ui.checkbox(
        &mut options.split_parts,
        "One region per polygon part (the parts share a colour)",
    );
}

/// Dialog windows: the path prompt, the unsaved-changes question and the command list.
pub fn dialogs_ui(app: &mut App, ctx: &egui::Context) {
    if let Some(offer) = &app.recovery_offer {
        let when = offer
            .written
            .and_then(|t| t.elapsed().ok())
            .map(|d| format!("{} minutes ago", d.as_secs() / 60))
            .unwrap_or_else(|| "recently".into());
        let what = format!(
            "\"{}\" ({} regions), written aside {when}{}.",
            offer.doc.title(),
            offer.doc.regions().len(),
            offer
                .original
                .as_ref()
                .map(|p| format!(", belonging to {}", p.display()))
                .unwrap_or_default()
        );
        let mut choice = None;
        egui::Modal::new(egui::Id::unique("recover")).show(ctx, |ui| {
            ui.heading("Unsaved work found");
            ui.label("Tinct closed without saving last time. It kept this work:");
            ui.label(what);
            ui.horizontal(|ui| {
                if ui.button("Recover it").clicked() {
                    choice = Some(true);
                }
                if ui.button("Discard it").clicked() {
                    choice = Some(false);
                }
            });
        });
        match choice {
            Some(true) => app.recover(),
            Some(false) => app.discard_recovery(),
            None => {}
        }
        return;
    }
    if let Some(command) = app.confirm_discard {
        let mut choice = None;
        egui::Modal::new(egui::Id::unique("confirm-discard")).show(ctx, |ui| {
            ui.heading("Unsaved changes");
            ui.label("This project has changes that are not saved. What should happen to them?");
            ui.horizontal(|ui| {
                if ui.button("Save first").clicked() {
                    choice = Some(0);
                }
                if ui.button("Discard them").clicked() {
                    choice = Some(1);
                }
                if ui.button("Cancel").clicked() {
                    choice = Some(2);
                }
            });
        });
        match choice {
            Some(0) => {
                // Save, then carry on with what was interrupted (once the save succeeds).
                app.confirm_discard = None;
                app.after_save = Some(command);
                app.emit(Command::Save);
            }
            Some(1) => {
                // Agreed for this command only: the work is not marked saved.
                app.discard_agreed = Some(command);
                app.confirm_discard = None;
                app.emit(command);
            }
            Some(2) => app.confirm_discard = None,
            _ => {}
        }
    }
    if let Some(prompt) = &mut app.path_prompt {
        let title = match prompt.purpose {
            PathPurpose::Open => "Open a file".to_string(),
            PathPurpose::SaveAs => "Save the project as".to_string(),
            PathPurpose::ExportProof => "Export the proof to a folder".to_string(),
            PathPurpose::Export(format) => format!("Export a {}", format.name()),
        };
        let export_options = &mut app.export_options;
        let import_options = &mut app.import_options;
        let mut action: Option<u8> = None;
        egui::Window::new(title)
            .collapsible(false)
            .resizable(false)
            .show(ctx, |ui| {
                ui.label("Type the file's path, or browse for it.");
                let r = ui
                    .horizontal(|ui| {
                        let label = ui.label("File path");
                        ui.add(egui::TextEdit::singleline(&mut prompt.text).desired_width(360.0))
                            .labelled_by(label.id)
                    })
                    .inner;
                if !prompt.focused {
                    prompt.focused = true;
                    focus_and_select(ui, &r, &prompt.text);
                }
                if r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter)) {
                    action = Some(0);
                }
                if let PathPurpose::Export(format) = prompt.purpose {
                    export_options_ui(ui, format, export_options);
                }
                if prompt.purpose == PathPurpose::Open
                    && crate::geo::is_boundary_file(std::path::Path::new(prompt.text.trim()))
                {
                    import_options_ui(ui, import_options);
                }
                ui.horizontal(|ui| {
                    let go = match prompt.purpose {
                        PathPurpose::Open => "Open",
                        PathPurpose::SaveAs => "Save",
                        PathPurpose::ExportProof | PathPurpose::Export(_) => "Export",
                    };
                    if ui.button(go).clicked() {
                        action = Some(0);
                    }
                    if ui.button("Browse…").clicked() {
                        action = Some(1);
                    }
                    if ui.button("Cancel").clicked() {
                        action = Some(2);
                    }
                });
            });
        let purpose = prompt.purpose;
        let text = prompt.text.trim().to_string();
        match action {
            Some(0) if !text.is_empty() => {
                app.path_prompt = None;
                let path = std::path::PathBuf::from(text);
                match purpose {
                    PathPurpose::Open => app.open_path(path),
                    PathPurpose::SaveAs => app.save_to(&path),
                    PathPurpose::ExportProof => app.export_proof(&path),
                    PathPurpose::Export(format) => app.export_to(format, path),
                }
            }
            Some(1) => app.browse(purpose),
            Some(2) => {
                app.path_prompt = None;
                app.after_save = None;
            }
            _ => {}
        }
    }
    if let Some(query) = &mut app.command_search {
        let choice = &mut app.command_choice;
        let mut chosen = None;
        let mut open = true;
        egui::Window::new("Find a command")
            .open(&mut open)
            .collapsible(false)
            .show(ctx, |ui| {
                let r = ui.add(
                    egui::TextEdit::singleline(query).hint_text("Type part of a command's name"),
                );
                r.widget_info(|| {
                    egui::WidgetInfo::labeled(egui::Role::TextInput, true, "Command search")
                });
                r.request_focus();
                let matches = search(query);
                if r.changed() {
                    *choice = 0;
                }
                // Arrows move the choice, Enter runs it (the best match, unless moved).
                let (up, down, enter) = ui.input_mut(|i| {
                    (
                        i.consume_key(egui::Modifiers::NONE, egui::Key::ArrowUp),
                        i.consume_key(egui::Modifiers::NONE, egui::Key::ArrowDown),
                        i.consume_key(egui::Modifiers::NONE, egui::Key::Enter),
                    )
                });
                if !matches.is_empty() {
                    if down {
                        *choice = (*choice + 1) % matches.len();
                    }
                    if up {
                        *choice = (*choice + matches.len() - 1) % matches.len();
                    }
                    *choice = (*choice).min(matches.len() - 1);
                    if enter {
                        chosen = Some(matches[*choice]);
                    }
                } else if !query.trim().is_empty() {
                    ui.label("No command has these words in its name");
                }
                for (i, command) in matches.iter().enumerate() {
                    let key = command
                        .shortcut()
                        .map(|s| ui.ctx().format_shortcut(&s))
                        .unwrap_or_default();
                    if ui
                        .selectable_label(i == *choice, format!("{}    {key}", command.label()))
                        .on_hover_text(command.tooltip())
                        .clicked()
                    {
                        chosen = Some(*command);
                    }
                }
            });
        if let Some(c) = chosen {
            app.command_search = None;
            app.emit(c);
        } else if !open {
            app.command_search = None;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

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
