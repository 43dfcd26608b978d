//! The project settings window: which contacts count as borders (shared edges only, or corner
//! contacts too), the shortest shared border that counts, and the tolerance borders are found
//! with. Applying is one undoable edit; a new tolerance derives the borders again from the
//! outlines (borders added by hand and suppressed ones keep what the user made of them).

use crate::doc::{Edit, Settings, Units};
use crate::projection::Projection;

use crate::ui::frame::{Action, Frame};
use crate::ui::state::Level;

/// The settings being edited while the window is open.
pub struct SettingsDraft {
    pub corners_count: bool,
    pub min_border_length: f64,
    pub tolerance: f64,
    pub greyscale_copies: bool,
    /// The projection (maps imported from longitude/latitude only).
    pub projection: Option<Projection>,
    /// The projections offered: the current one and those fitted to the map's main mass.
    pub choices: Vec<Projection>,
}

impl SettingsDraft {
    /// The draft of `settings`, without projection choices (see [`SettingsDraft::for_document`]).
    pub fn new(settings: &Settings) -> SettingsDraft {
        SettingsDraft {
            corners_count: settings.corners_count,
            min_border_length: settings.min_border_length,
            tolerance: settings.tolerance,
            greyscale_copies: settings.greyscale_copies,
            projection: settings.projection,
            choices: settings.projection.into_iter().collect(),
        }
    }

    /// The draft of `doc`'s settings, with the projections it may be drawn in.
    pub fn for_document(doc: &crate::doc::Document) -> SettingsDraft {
        let mut draft = SettingsDraft::new(doc.settings());
        for p in crate::geo::document::projection_choices(doc) {
            if !draft.choices.contains(&p) {
                draft.choices.push(p);
            }
        }
        draft
    }
}

/// The edit that makes the project's settings `draft`, or `None` when nothing changes.
pub fn settings_edit(doc: &crate::doc::Document, draft: &SettingsDraft) -> Option<Edit> {
    let old = *doc.settings();
    let mut edits = Vec::new();
    // A new projection moves every outline (and records itself); the other settings follow.
    let projection = match draft.projection {
        Some(p) if Some(p) != old.projection => match crate::geo::document::reproject(doc, p) {
            Some(edit) => {
                edits.push(edit);
                Some(p)
            }
            None => old.projection,
        },
        _ => old.projection,
    };
    let settings = Settings {
        corners_count: draft.corners_count,
        min_border_length: draft.min_border_length.max(0.0),
        greyscale_copies: draft.greyscale_copies,
        projection,
        ..old
    };
    if settings != (Settings { projection, ..old }) {
        edits.push(Edit::SetSettings(settings));
    }
    if draft.tolerance.max(0.0) != old.tolerance {
        // Derived against the settings as they will be (the tolerance edit records them).
        let mut with = doc.clone();
        for e in &edits {
            let _ = with.apply(e.clone());
        }
        match crate::geo::document::rederive_borders(&with, draft.tolerance) {
            Some(rederive) => edits.push(rederive),
            None => edits.push(Edit::SetSettings(Settings {
                tolerance: draft.tolerance.max(0.0),
                ..settings
            })),
        }
    }
    (!edits.is_empty()).then(|| Edit::Batch {
        label: "Change project settings".into(),
        edits,
    })
}

/// A labelled length that cannot go below zero.
fn length_field(ui: &mut egui::Ui, label: &str, value: &mut f64, unit: &str) {
    ui.horizontal(|ui| {
        let label = ui.label(label);
        ui.add(
            egui::DragValue::new(value)
                .range(0.0..=f64::MAX)
                .speed(10.0)
                .suffix(unit),
        )
        .labelled_by(label.id);
    });
}

/// Draws the window while it is open.
pub fn show(frame: &Frame, window: &mut Option<SettingsDraft>, ctx: &egui::Context) {
    let Some(draft) = window else {
        return;
    };
    let doc = frame.doc();
    let unit = match doc.settings().units {
        Units::Metres => " m",
        Units::Unitless => "",
    };
    let has_outlines = doc.regions().values().any(|r| r.geometry.is_some());
    let mut open = true;
    let mut apply = false;
    egui::Window::new("Project settings")
        .open(&mut open)
        .collapsible(false)
        .resizable(false)
        .show(ctx, |ui| {
            ui.label("Regions border each other when they share");
            ui.radio_value(&mut draft.corners_count, false, "an edge (rook contiguity)");
            ui.radio_value(
                &mut draft.corners_count,
                true,
                "an edge or just a corner point (queen contiguity)",
            );
            length_field(
                ui,
                "Shortest shared border that counts",
                &mut draft.min_border_length,
                unit,
            );
            ui.label(
                egui::RichText::new(
                    "Shorter shared borders count as corner contacts (they constrain the colouring only with corner contacts counted).",
                )
                .small(),
            );
            ui.add_enabled_ui(has_outlines, |ui| {
                length_field(ui, "Tolerance", &mut draft.tolerance, unit);
                ui.label(
                    egui::RichText::new(
                        "Boundaries this close count as touching. Changing it finds the borders again from the outlines; borders added by hand and borders you removed stay as you left them.",
                    )
                    .small(),
                );
            });
            ui.separator();
            ui.checkbox(
                &mut draft.greyscale_copies,
                "The map will also be copied in greyscale",
            );
            ui.label(
                egui::RichText::new(
                    "Photocopies and black-and-white prints keep only lightness. With this on, the palette check also asks neighbouring fills to differ in lightness; the greyscale-safe palettes do, at the cost of one dark fill that stands out in colour.",
                )
                .small(),
            );
            ui.separator();
            // The projection is chosen at import for the data's extent (and saved with it); a
            // map imported from longitude/latitude may be drawn in another.
            match draft.projection {
                Some(current) => {
                    ui.horizontal(|ui| {
                        let label = ui.label("Projection");
                        egui::ComboBox::from_id_salt("projection")
                            .selected_text(current.name())
                            .width(360.0)
                            .show_ui(ui, |ui| {
                                for p in &draft.choices {
                                    ui.selectable_value(&mut draft.projection, Some(*p), p.name());
                                }
                            })
                            .response
                            .labelled_by(label.id);
                    });
                    ui.label(
                        egui::RichText::new(
                            "Chosen at import for the extent of the map's main land mass. All three keep areas true; they differ in how they bend shapes: the conic suits mid-latitude lands wider east to west, the azimuthal compact or polar ones, Equal Earth the whole world. Applying moves every outline (one undoable step).",
                        )
                        .small(),
                    );
                }
                None => {
                    ui.label("Projection: none (the map's own coordinates)");
                }
            }
            ui.horizontal(|ui| {
                if ui.button("Apply").clicked() {
                    apply = true;
                }
            });
        });
    if apply {
        match settings_edit(doc, draft) {
            Some(edit) => {
                frame.edit(edit);
                frame.send(Action::Say(
                    Level::Info,
                    "Project settings changed (undo puts them back)".into(),
                ));
            }
            None => frame.send(Action::Say(
                Level::Info,
                "The settings are as they were".into(),
            )),
        }
        *window = None;
    } else if !open {
        *window = None;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::{Border, Document, Region, RegionId, RegionPair};

    #[test]
    fn switching_to_corner_contacts_makes_a_corner_border_count_and_undo_takes_it_back() {
        let mut doc = Document::new("t");
        for id in [1, 2] {
            doc.apply(Edit::PutRegion {
                id: RegionId(id),
                region: Some(Region::new(format!("R{id}"), [id as f64, 0.0])),
            })
            .unwrap();
        }
        let pair = RegionPair::new(RegionId(1), RegionId(2)).unwrap();
        doc.apply(Edit::PutBorder {
            pair,
            border: Some(Border::corner()),
        })
        .unwrap();
        assert_eq!(doc.active_borders().count(), 0);
        let mut draft = SettingsDraft::new(doc.settings());
        assert!(settings_edit(&doc, &draft).is_none(), "nothing changed");
        draft.corners_count = true;
        let undo = doc.apply(settings_edit(&doc, &draft).unwrap()).unwrap();
        assert_eq!(doc.active_borders().count(), 1);
        doc.apply(undo).unwrap();
        assert_eq!(doc.active_borders().count(), 0);
    }
}
