//! The window of *Colour by parent unit…*: which attribute names each region's parent unit (a
//! county's state, a district's province), optionally its first few characters, with a count of
//! the parent units it gives and of the land regions without one. *Colour* sends the choice; the
//! colouring runs in the background and lands as one undoable step.

use std::collections::{BTreeMap, BTreeSet};

use eframe::egui;

use crate::doc::{Document, PARENT_ATTRIBUTE, ParentKey};
use crate::ui::frame::{Action, Frame};

/// The window's state while it is open.
#[derive(Clone, Debug, PartialEq)]
pub struct ByParentDraft {
    /// The attributes land regions carry, and on how many regions, most common first.
    pub fields: Vec<(String, usize)>,
    pub field: String,
    /// Leading characters to keep (0: the whole value).
    pub prefix: u32,
    /// (field, prefix, revision) -> (parent units, land regions without one), worked out once
    /// each.
    counted: BTreeMap<(String, u32, u64), (usize, usize)>,
}

impl ByParentDraft {
    pub fn for_document(doc: &Document) -> ByParentDraft {
        let mut counts: BTreeMap<&str, usize> = BTreeMap::new();
        for (_, region) in doc.land_regions() {
            for (name, _) in region.attributes.iter() {
                *counts.entry(name.as_str()).or_default() += 1;
            }
        }
        let mut fields: Vec<(String, usize)> = counts
            .into_iter()
            .map(|(k, n)| (k.to_string(), n))
            .collect();
        fields.sort_by(|a, b| b.1.cmp(&a.1).then(a.0.cmp(&b.0)));
        // The attribute the import's --parent-field writes, when there; else the most common.
        let field = fields
            .iter()
            .find(|(f, _)| f == PARENT_ATTRIBUTE)
            .or(fields.first())
            .map(|(f, _)| f.clone())
            .unwrap_or_default();
        ByParentDraft {
            fields,
            field,
            prefix: 0,
            counted: BTreeMap::new(),
        }
    }

    /// The key the window describes, if it names a field.
    pub fn key(&self) -> Option<ParentKey> {
        (!self.field.is_empty()).then(|| ParentKey {
            field: self.field.clone(),
            prefix: (self.prefix > 0).then_some(self.prefix as usize),
        })
    }

    /// Parent units and land regions without one, for the current choice.
    fn count(&mut self, doc: &Document) -> Option<(usize, usize)> {
        let key = self.key()?;
        let entry = (self.field.clone(), self.prefix, doc.revision());
        if let Some(c) = self.counted.get(&entry) {
            return Some(*c);
        }
        let mut parents = BTreeSet::new();
        let mut without = 0;
        for (_, region) in doc.land_regions() {
            match region
                .attributes
                .get(&key.field)
                .and_then(|v| key.parent_of(v))
            {
                Some(p) => {
                    parents.insert(p);
                }
                None => without += 1,
            }
        }
        let c = (parents.len(), without);
        self.counted.insert(entry, c);
        Some(c)
    }
}

/// Draws the window while it is open.
pub fn show(frame: &Frame, window: &mut Option<ByParentDraft>, ctx: &egui::Context) {
    let Some(draft) = window else {
        return;
    };
    let mut open = true;
    let mut colour = false;
    egui::Window::new("Colour by parent unit")
        .open(&mut open)
        .collapsible(false)
        .resizable(false)
        .show(ctx, |ui| {
            ui.label(
                "Each parent unit gets a family of tints, neighbouring parents different families; each region a tint of its parent's family, neighbours within a parent different tints.",
            );
            if draft.fields.is_empty() {
                ui.label("The regions carry no attributes to name a parent unit. Import the boundary file with a parent field (tinct import --parent-field).");
                return;
            }
            ui.horizontal(|ui| {
                let label = ui.label("Parent unit from");
                egui::ComboBox::from_id_salt("parent-field")
                    .selected_text(draft.field.as_str())
                    .show_ui(ui, |ui| {
                        for (f, n) in draft.fields.clone() {
                            ui.selectable_value(&mut draft.field, f.clone(), format!("{f} ({n} regions)"));
                        }
                    })
                    .response
                    .labelled_by(label.id);
            });
            ui.horizontal(|ui| {
                let label = ui.label("First characters only");
                ui.add(egui::DragValue::new(&mut draft.prefix).range(0..=20))
                    .labelled_by(label.id)
                    .on_hover_text("0 takes the whole value; 2 takes the first two characters, as a county's FIPS code names its state");
            });
            if let Some((parents, without)) = draft.count(frame.doc()) {
                let units = if parents == 1 {
                    "1 parent unit".to_string()
                } else {
                    format!("{parents} parent units")
                };
                let text = match without {
                    0 => format!("{units}; every land region has one"),
                    1 => format!("{units}; 1 land region has none, so the map cannot be coloured this way"),
                    n => format!("{units}; {n} land regions have none, so the map cannot be coloured this way"),
                };
                ui.label(text);
                ui.horizontal(|ui| {
                    if ui
                        .add_enabled(without == 0 && parents > 0, egui::Button::new("Colour"))
                        .clicked()
                    {
                        colour = true;
                    }
                    ui.label(
                        egui::RichText::new("Replaces the palette with one of families (undoable)")
                            .small(),
                    );
                });
            }
        });
    if colour {
        if let Some(key) = draft.key() {
            frame.send(Action::ColourByParent(key));
        }
        *window = None;
    } else if !open {
        *window = None;
    }
}
