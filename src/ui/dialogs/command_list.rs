//! The searchable command list (Ctrl+K): type part of a name, arrows move the choice, Enter runs it.

use crate::ui::commands::search;
use crate::ui::frame::Frame;

/// The list while it is open: the words typed and the highlighted match.
#[derive(Default)]
pub struct CommandList {
    pub query: String,
    pub choice: usize,
}

pub fn show(frame: &Frame, list: &mut Option<CommandList>, ctx: &egui::Context) {
    let Some(CommandList { query, choice }) = list else {
        return;
    };
    let mut chosen = None;
    let mut open = true;
    egui::Window::new("Find a command")
        .open(&mut open)
        .collapsible(false)
        .show(ctx, |ui| {
            let r = ui
                .add(egui::TextEdit::singleline(query).hint_text("Type part of a command's name"));
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
        *list = None;
        frame.run(c);
    } else if !open {
        *list = None;
    }
}
