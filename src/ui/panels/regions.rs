//! The list of regions, searchable by name, sorted by name or in file order.

use crate::doc::{RegionId, Role};
use crate::ui::frame::Frame;
use crate::ui::style;
use crate::ui::widgets::{colour32, swatch};

/// What the list's rows were made for: the scene generation, the search text and the order
/// (file order when true).
type RowsKey = (u64, String, bool);

/// The list's own state: the search text, the order, and the rows found for them.
#[derive(Default)]
pub struct RegionList {
    pub filter: String,
    /// In the order of the source file (ids) rather than by name.
    pub in_file_order: bool,
    /// The rows for a document state, search and order, each with whether its name is shared
    /// with another region (then shown with its id). Kept until one of those changes: on a
    /// large map, filtering every name every frame would cost more than the rest of the frame.
    rows: Option<(RowsKey, Vec<(RegionId, bool)>)>,
}

impl RegionList {
    /// The rows shown last frame: each region with whether its name is shared.
    pub fn shown(&self) -> &[(RegionId, bool)] {
        self.rows.as_ref().map_or(&[], |(_, rows)| rows.as_slice())
    }

    fn rows(&mut self, frame: &Frame) -> &[(RegionId, bool)] {
        let key = (frame.generation, self.filter.clone(), self.in_file_order);
        if self.rows.as_ref().is_none_or(|(k, _)| *k != key) {
            let filter = self.filter.to_lowercase();
            let doc = frame.doc();
            let mut names: std::collections::HashMap<String, usize> = Default::default();
            for r in doc.regions().values() {
                *names.entry(r.name.to_lowercase()).or_default() += 1;
            }
            let mut rows: Vec<(RegionId, bool)> = doc
                .regions()
                .iter()
                .filter(|(_, r)| filter.is_empty() || r.name.to_lowercase().contains(&filter))
                .map(|(id, r)| {
                    (
                        *id,
                        names.get(&r.name.to_lowercase()).is_some_and(|&n| n > 1),
                    )
                })
                .collect();
            if !self.in_file_order {
                let lower = |id: &RegionId| {
                    doc.regions()
                        .get(id)
                        .map(|r| r.name.to_lowercase())
                        .unwrap_or_default()
                };
                rows.sort_by_cached_key(|(id, _)| (lower(id), *id));
            }
            self.rows = Some((key, rows));
        }
        self.rows.as_ref().map_or(&[], |(_, rows)| rows.as_slice())
    }
}

pub fn show(frame: &Frame, list: &mut RegionList, ui: &mut egui::Ui) {
    ui.heading("Regions");
    ui.add(egui::TextEdit::singleline(&mut list.filter).hint_text("Search by name"))
        .widget_info(|| egui::WidgetInfo::labeled(egui::Role::TextInput, true, "Search regions"));
    ui.horizontal(|ui| {
        ui.label("Order:");
        ui.radio_value(&mut list.in_file_order, false, "by name");
        ui.radio_value(&mut list.in_file_order, true, "as in the file");
    });
    let doc = frame.doc();
    let rows = list.rows(frame);
    ui.label(format!("{} shown of {}", rows.len(), doc.regions().len()));
    let row_height = ui.text_style_height(&egui::TextStyle::Body) + 4.0;
    egui::ScrollArea::vertical()
        .auto_shrink([false, false])
        .show_rows(ui, row_height, rows.len(), |ui, range| {
            for (id, shared_name) in &rows[range] {
                let Some(r) = doc.regions().get(id) else {
                    continue;
                };
                let colour = match r.role {
                    Role::Water => Some(style::WATER),
                    Role::Land => doc
                        .colouring()
                        .get(id)
                        .and_then(|s| doc.palette().slots.get(*s as usize))
                        .map(|s| colour32(s.colour)),
                };
                ui.horizontal(|ui| {
                    swatch(ui, colour.unwrap_or(style::UNCOLOURED), 12.0);
                    // A name several regions share is told apart by the region's id.
                    let text = if *shared_name {
                        format!("{} (id {id})", r.name)
                    } else {
                        r.name.clone()
                    };
                    if ui
                        .selectable_label(frame.view.selection == Some(*id), text)
                        .clicked()
                    {
                        frame.go_to(*id);
                    }
                });
            }
        });
}
