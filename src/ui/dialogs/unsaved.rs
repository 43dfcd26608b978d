//! The question asked before a command would drop unsaved changes (New, Open, Quit). The
//! interrupted command waits in the app; this window only sends the answer.

use crate::ui::frame::{Action, Frame, UnsavedAnswer};

pub fn show(frame: &Frame, ctx: &egui::Context) {
    if frame.unsaved_question.is_none() {
        return;
    }
    egui::Modal::new(egui::Id::unique("confirm-discard")).show(ctx, |ui| {
        ui.heading("Unsaved changes");
        ui.label("This project has changes that are not saved. What should happen to them?");
        ui.horizontal(|ui| {
            for (label, answer) in [
                ("Save first", UnsavedAnswer::SaveFirst),
                ("Discard them", UnsavedAnswer::Discard),
                ("Cancel", UnsavedAnswer::Cancel),
            ] {
                if ui.button(label).clicked() {
                    frame.send(Action::Unsaved(answer));
                }
            }
        });
    });
}
