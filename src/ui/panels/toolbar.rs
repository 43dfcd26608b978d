//! The tool strip above the map: the tools, the pin tool's slot, the group tool's group, Fit.

use crate::doc::GroupId;
use crate::ui::commands::{Command, Tool};
use crate::ui::frame::{Action, Frame};
use crate::ui::widgets::{colour32, swatch};

pub fn show(frame: &Frame, ui: &mut egui::Ui) {
    let view = frame.view;
    ui.horizontal_wrapped(|ui| {
        for tool in Tool::ALL {
            let command = Command::UseTool(tool);
            let key = command
                .shortcut()
                .map(|s| ui.ctx().format_shortcut(&s))
                .unwrap_or_default();
            let hint = format!("{} ({key})", tool.hint());
            if ui
                .selectable_label(view.tool == tool, tool.label())
                .on_hover_text(hint)
                .clicked()
            {
                frame.run(command);
            }
        }
        ui.separator();
        if view.tool == Tool::Pin {
            ui.label("Pin to:");
            for (i, slot) in frame.doc().palette().slots.iter().enumerate() {
                swatch(ui, colour32(slot.colour), 12.0);
                if ui
                    .selectable_label(view.pin_slot == i as u32, &slot.name)
                    .clicked()
                {
                    frame.send(Action::SetPinSlot(i as u32));
                }
            }
        }
        if view.tool == Tool::Group {
            let groups = frame.doc().groups();
            ui.label("Add to:");
            let current = view
                .group
                .and_then(|g| groups.get(&g))
                .map_or("a new group", |g| g.name.as_str());
            let mut chosen: Option<GroupId> = view.group;
            egui::ComboBox::from_id_salt("group-choice")
                .selected_text(current)
                .show_ui(ui, |ui| {
                    ui.selectable_value(&mut chosen, None, "a new group");
                    for (id, group) in groups {
                        ui.selectable_value(&mut chosen, Some(*id), &group.name);
                    }
                });
            if chosen != view.group {
                frame.send(Action::SetGroup(chosen));
            }
        }
        if ui
            .button(Command::FitView.label())
            .on_hover_text(Command::FitView.tooltip())
            .clicked()
        {
            frame.run(Command::FitView);
        }
    });
}
