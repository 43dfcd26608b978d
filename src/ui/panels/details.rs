//! The selected region's details: name, land or water, pin, group, parent unit, and its borders.

use egui::RichText;

use crate::doc::{
    AttrValue, BorderKind, Edit, GroupId, PARENT_ATTRIBUTE, ParentKey, RegionChange, RegionId, Role,
};
use crate::ui::frame::Frame;

/// The panel's own state: the name being typed for the selected region.
#[derive(Default)]
pub struct Details {
    name_draft: Option<(RegionId, String)>,
    /// The parent unit being typed for the selected region.
    parent_draft: Option<(RegionId, String)>,
}

pub fn show(frame: &Frame, details: &mut Details, ui: &mut egui::Ui) {
    ui.heading("Region");
    let doc = frame.doc();
    let Some((id, region)) = frame
        .view
        .selection
        .and_then(|id| doc.regions().get(&id).map(|r| (id, r)))
    else {
        ui.label("Click a region on the map or in the list.");
        return;
    };

    // Name: typed into a draft, committed on Enter or when the field loses focus. While the field
    // is not being edited it shows the document's name (which undo may have changed).
    let field_id = egui::Id::unique(("region-name", id));
    let focused = ui.memory(|m| m.has_focus(field_id));
    let mut text = match &details.name_draft {
        Some((d, t)) if *d == id && focused => t.clone(),
        _ => region.name.clone(),
    };
    ui.horizontal(|ui| {
        ui.label("Name");
        let r = ui.add(egui::TextEdit::singleline(&mut text).id(field_id));
        r.widget_info(|| egui::WidgetInfo::labeled(egui::Role::TextInput, true, "Region name"));
        if r.lost_focus() && text.trim() != region.name && !text.trim().is_empty() {
            frame.edit(Edit::UpdateRegion {
                id,
                change: RegionChange::Name(text.trim().to_string()),
            });
        }
    });
    details.name_draft = Some((id, text));
    ui.label(format!(
        "Id {id}{}",
        region.source_index.map_or(String::new(), |i| format!(
            ", feature {i} of its source file"
        ))
    ));

    let mut water = region.role == Role::Water;
    if ui
        .checkbox(&mut water, "Water or background (takes no colour)")
        .changed()
    {
        frame.edit(Edit::UpdateRegion {
            id,
            change: RegionChange::Role(if water { Role::Water } else { Role::Land }),
        });
    }

    let slot_name = |s: Option<u32>| match s {
        None => "none".to_string(),
        Some(s) => doc
            .palette()
            .slots
            .get(s as usize)
            .map_or(format!("slot {}", s + 1), |slot| slot.name.clone()),
    };
    let colour = doc.colouring().get(&id).copied();
    ui.label(format!("Colour: {}", slot_name(colour)));
    let mut pin = region.pin;
    egui::ComboBox::from_label("Pinned colour")
        .selected_text(slot_name(pin))
        .show_ui(ui, |ui| {
            ui.selectable_value(&mut pin, None, "none");
            for (i, slot) in doc.palette().slots.iter().enumerate() {
                ui.selectable_value(&mut pin, Some(i as u32), &slot.name);
            }
        });
    if pin != region.pin {
        frame.edit(Edit::UpdateRegion {
            id,
            change: RegionChange::Pin(pin),
        });
    }
    let group_name = |g: Option<GroupId>| {
        g.and_then(|g| doc.groups().get(&g))
            .map_or("none".to_string(), |g| g.name.clone())
    };
    let mut group = region.group;
    egui::ComboBox::from_label("Same-colour group")
        .selected_text(group_name(group))
        .show_ui(ui, |ui| {
            ui.selectable_value(&mut group, None, "none");
            for (gid, g) in doc.groups() {
                ui.selectable_value(&mut group, Some(*gid), &g.name);
            }
        });
    if group != region.group {
        frame.edit(Edit::UpdateRegion {
            id,
            change: RegionChange::Group(group),
        });
    }

    // The parent unit (for colours that follow a hierarchy): the attribute `parent`, typed like
    // the name and committed when the field loses focus; empty removes it.
    let parent_id = egui::Id::unique(("region-parent", id));
    let focused = ui.memory(|m| m.has_focus(parent_id));
    let current = region
        .attributes
        .get(PARENT_ATTRIBUTE)
        .and_then(|v| {
            ParentKey {
                field: PARENT_ATTRIBUTE.into(),
                prefix: None,
            }
            .parent_of(v)
        })
        .unwrap_or_default();
    let mut text = match &details.parent_draft {
        Some((d, t)) if *d == id && focused => t.clone(),
        _ => current.clone(),
    };
    ui.horizontal(|ui| {
        ui.label("Parent unit");
        let r = ui.add(
            egui::TextEdit::singleline(&mut text)
                .id(parent_id)
                .hint_text("none (as a county's state)"),
        );
        r.widget_info(|| {
            egui::WidgetInfo::labeled(egui::Role::TextInput, true, "Region parent unit")
        });
        if r.lost_focus() && text.trim() != current {
            let value = text.trim();
            frame.edit(Edit::UpdateRegion {
                id,
                change: RegionChange::Attribute {
                    name: PARENT_ATTRIBUTE.into(),
                    value: (!value.is_empty()).then(|| AttrValue::Text(value.to_string())),
                },
            });
        }
    });
    details.parent_draft = Some((id, text));

    ui.separator();
    let neighbours = doc.borders_of(id);
    ui.label(RichText::new(format!("Borders ({})", neighbours.len())).strong());
    let units = doc.settings().units;
    egui::ScrollArea::vertical()
        .id_salt("neighbours")
        .max_height(180.0)
        .show(ui, |ui| {
            for (other, pair, border) in &neighbours {
                let active = doc.border_is_active(*pair, border);
                let kind = match border.kind {
                    BorderKind::Shared => format!("shared, {}", units.length_text(border.length)),
                    BorderKind::Corner => "corner".to_string(),
                    BorderKind::Manual => "by hand".to_string(),
                };
                let state = if border.suppressed {
                    ", removed"
                } else if !active {
                    ", ignored"
                } else {
                    ""
                };
                ui.horizontal(|ui| {
                    if ui.link(frame.name(*other)).clicked() {
                        frame.go_to(*other);
                    }
                    ui.label(format!("({kind}{state})"));
                });
            }
        });
}
