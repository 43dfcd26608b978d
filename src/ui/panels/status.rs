//! The status line: the tool's hint, the border tool's first region, the latest message.

use egui::RichText;

use crate::ui::frame::Frame;
use crate::ui::state::Level;
use crate::ui::style;

pub fn show(frame: &Frame, ui: &mut egui::Ui) {
    ui.horizontal(|ui| {
        ui.label(frame.view.tool.hint());
        if let Some(first) = frame.view.border_first {
            ui.label(
                RichText::new(format!(
                    "— border from {}: click the second region",
                    frame.name(first)
                ))
                .strong(),
            );
        }
    });
    if let Some(m) = frame.messages.last() {
        let colour = match m.level {
            Level::Info => ui.visuals().text_color(),
            Level::Warning => style::WARNING,
            Level::Error => style::CLASH,
        };
        ui.label(RichText::new(&m.text).color(colour));
    }
}
