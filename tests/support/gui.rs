//! Helpers for driving the editor through egui_kittest.

use egui_kittest::Harness;
use tinct::ui::App;

/// A primary click at `p` as a mouse makes it (move there, press, release), then two frames.
pub fn click_at(h: &mut Harness<'static, App>, p: egui::Pos2) {
    h.hover_at(p);
    for pressed in [true, false] {
        h.event(egui::Event::PointerButton {
            pos: p,
            button: egui::PointerButton::Primary,
            pressed,
            modifiers: egui::Modifiers::NONE,
        });
    }
    h.run_steps(2);
}
