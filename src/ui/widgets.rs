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
