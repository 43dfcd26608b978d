//! The menu bar, generated from the command list.

use crate::ui::commands::{Command, Menu};
use crate::ui::frame::{Action, Frame};

/// Draws the menu bar; a chosen entry is sent as its command.
pub fn show(frame: &Frame, ui: &mut egui::Ui) {
    egui::MenuBar::new().ui(ui, |ui| {
        for menu in Menu::ALL {
            ui.menu_button(menu.label(), |ui| {
                for command in Command::all().into_iter().filter(|c| c.menu() == menu) {
                    // On/off settings are ticked checkboxes, their shortcut beside the name.
                    let toggle = match command {
                        Command::ToggleBorders => Some(frame.view.show_borders),
                        Command::ToggleLabels => Some(frame.view.show_labels),
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
                            frame.run(command);
                            ui.close();
                        }
                        continue;
                    }
                    let mut button = egui::Button::new(command.label());
                    if let Some(s) = command.shortcut() {
                        button = button.shortcut_text(ui.ctx().format_shortcut(&s));
                    }
                    let history = frame.session.history();
                    let enabled = match command {
                        Command::Undo => history.undo_label().is_some(),
                        Command::Redo => history.redo_label().is_some(),
                        Command::DeleteRegion => frame.view.selection.is_some(),
                        _ => true,
                    };
                    let selected = match command {
                        Command::UseTool(t) => frame.view.tool == t,
                        _ => false,
                    };
                    let button = button.selected(selected);
                    if ui
                        .add_enabled(enabled, button)
                        .on_hover_text(command.tooltip())
                        .clicked()
                    {
                        frame.run(command);
                        ui.close();
                    }
                }
                if menu == Menu::File && !frame.recent.is_empty() {
                    ui.separator();
                    ui.menu_button("Open recent", |ui| {
                        for path in frame.recent {
                            if ui.button(path.display().to_string()).clicked() {
                                frame.send(Action::OpenFile(path.clone()));
                                ui.close();
                            }
                        }
                    });
                }
            });
        }
    });
}
