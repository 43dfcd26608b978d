//! The offer of unsaved work kept from an earlier session that ended without saving.

use crate::ui::frame::{Action, Frame};

/// Draws the offer while there is one; true when it is on show (it is modal).
pub fn show(frame: &Frame, ctx: &egui::Context) -> bool {
    let Some(offer) = frame.recovery_offer else {
        return false;
    };
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
    egui::Modal::new(egui::Id::unique("recover")).show(ctx, |ui| {
        ui.heading("Unsaved work found");
        ui.label("Tinct closed without saving last time. It kept this work:");
        ui.label(what);
        ui.horizontal(|ui| {
            if ui.button("Recover it").clicked() {
                frame.send(Action::Recover(true));
            }
            if ui.button("Discard it").clicked() {
                frame.send(Action::Recover(false));
            }
        });
    });
    true
}
