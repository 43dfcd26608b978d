//! The palette panel: slot swatches, how many regions use each, and the distinctness check.

use egui::RichText;

use crate::ui::commands::Command;
use crate::ui::frame::Frame;
use crate::ui::widgets::{colour32, marked, swatch};

pub fn show(frame: &Frame, ui: &mut egui::Ui) {
    ui.heading("Palette");
    let doc = frame.doc();
    ui.label(&doc.palette().name);
    let counts = &frame.session.rules().slot_use;
    let warnings = &frame.palette_warnings.warnings;
    for (i, slot) in doc.palette().slots.iter().enumerate() {
        ui.horizontal(|ui| {
            swatch(ui, colour32(slot.colour), 16.0);
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
        0 if doc.settings().greyscale_copies => marked(
            ui,
            true,
            "Neighbouring colours stay distinct, also in greyscale and for colour-blind readers"
                .into(),
        ),
        0 => marked(
            ui,
            true,
            "Neighbouring colours stay distinct, also for colour-blind readers (greyscale copies not checked)"
                .into(),
        ),
        n => {
            marked(
                ui,
                false,
                format!(
                    "{}: see the palette check",
                    crate::ui::words::count(n, "warning", "warnings")
                ),
            );
            for w in warnings.iter().take(3) {
                ui.label(RichText::new(w).small());
            }
        }
    }
    ui.horizontal_wrapped(|ui| {
        for command in [Command::PaletteWindow, Command::AssignSlots] {
            if ui
                .button(command.label())
                .on_hover_text(command.tooltip())
                .clicked()
            {
                frame.run(command);
            }
        }
    });
}
