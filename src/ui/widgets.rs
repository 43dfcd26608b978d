//! Small pieces the panels and windows share.

use egui::Color32;

use crate::doc::Rgb;

use super::style;

/// A palette colour as egui paints it.
pub fn colour32(rgb: Rgb) -> Color32 {
    Color32::from_rgb(rgb.0[0], rgb.0[1], rgb.0[2])
}

/// A filled square of colour, drawn rather than typed so it needs no glyph from any font.
pub fn swatch(ui: &mut egui::Ui, colour: Color32, size: f32) {
    let (rect, _) = ui.allocate_exact_size(egui::vec2(size, size), egui::Sense::hover());
    ui.painter().rect_filled(rect, 2.0, colour);
    ui.painter().rect_stroke(
        rect,
        2.0,
        egui::Stroke::new(0.5, style::OUTLINE),
        egui::StrokeKind::Inside,
    );
}

/// A line of text with a coloured dot before it: green for good news, red for a problem.
pub fn marked(ui: &mut egui::Ui, good: bool, text: String) {
    let colour = if good { style::GOOD } else { style::CLASH };
    ui.horizontal_wrapped(|ui| {
        let (rect, _) = ui.allocate_exact_size(egui::vec2(10.0, 10.0), egui::Sense::hover());
        ui.painter().circle_filled(rect.center(), 4.5, colour);
        ui.label(egui::RichText::new(text).color(colour));
    });
}

/// Gives a text field that has just opened the keyboard focus, with its text selected, so that
/// typing replaces a suggested path and one-key shortcuts stay quiet.
pub fn focus_and_select(ui: &egui::Ui, response: &egui::Response, text: &str) {
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
