//! The palette window: edit slot colours and names on a working copy, see the palette as readers
//! with a colour-vision deficiency and a greyscale copy show it, read the warnings for the slot
//! pairs that neighbouring regions use, and apply the copy to the project as one undoable edit.

use egui::RichText;

use crate::colour::{DEFAULT_PALETTES, Warning};
use crate::doc::palette_check::{self, PairsChecked, SlotPairUse};
use crate::doc::palette_edit;
use crate::doc::{Edit, Palette, Rgb, Slot};

use crate::ui::frame::{Action, Frame};
use crate::ui::state::Level;
use crate::ui::style;
use crate::ui::widgets::{colour32, swatch};

/// The working copy of the palette while the window is open.
pub struct PaletteEditor {
    pub draft: Palette,
    /// The hex text of each slot as typed (applied to the draft when it parses).
    pub hex: Vec<String>,
    /// One of Tinct's palettes chosen while the draft had changes of its own: replacing them
    /// waits for the user's word.
    pub replace_with: Option<Palette>,
    /// For a document state (`Scene::generation`) and a number of slots: the slot pairs to
    /// check, and which slots regions use or are pinned to.
    pairs: Option<CheckedPairs>,
}

/// The slot pairs to check for one document state and slot count, and the slots in use.
type CheckedPairs = ((u64, usize), PairsChecked, Vec<SlotPairUse>, Vec<bool>);

impl PaletteEditor {
    pub fn new(palette: &Palette) -> PaletteEditor {
        PaletteEditor {
            draft: palette.clone(),
            hex: palette.slots.iter().map(|s| s.colour.to_hex()).collect(),
            replace_with: None,
            pairs: None,
        }
    }

    /// Takes `palette` as the draft.
    pub(crate) fn take(&mut self, palette: Palette) {
        self.hex = palette.slots.iter().map(|s| s.colour.to_hex()).collect();
        self.draft = palette;
        self.replace_with = None;
    }

    pub(crate) fn reset(&mut self, palette: &Palette) {
        let pairs = self.pairs.take();
        *self = PaletteEditor::new(palette);
        self.pairs = pairs;
    }
}

/// A swatch button that opens a small picker: hue, saturation and brightness sliders over the
/// colour itself (the hex field beside it takes exact values). Returns true when the colour
/// changed.
fn colour_picker(ui: &mut egui::Ui, rgb: &mut Rgb, slot: usize) -> bool {
    let button = ui
        .add(
            egui::Button::new("")
                .fill(colour32(*rgb))
                .min_size(egui::vec2(32.0, 18.0)),
        )
        .on_hover_text("Pick a colour");
    button.widget_info(|| {
        egui::WidgetInfo::labeled(
            egui::Role::Button,
            true,
            format!("Pick colour {}", slot + 1),
        )
    });
    let mut changed = false;
    egui::Popup::menu(&button)
        .close_behavior(egui::PopupCloseBehavior::CloseOnClickOutside)
        .show(|ui| {
            let mut hsva = egui::ecolor::Hsva::from_srgb(rgb.0);
            let mut degrees = hsva.h * 360.0;
            let mut any = false;
            any |= ui
                .add(
                    egui::Slider::new(&mut degrees, 0.0..=360.0)
                        .text("Hue")
                        .suffix("°")
                        .fixed_decimals(0),
                )
                .changed();
            any |= ui
                .add(
                    egui::Slider::new(&mut hsva.s, 0.0..=1.0)
                        .text("Saturation")
                        .fixed_decimals(2),
                )
                .changed();
            any |= ui
                .add(
                    egui::Slider::new(&mut hsva.v, 0.0..=1.0)
                        .text("Brightness")
                        .fixed_decimals(2),
                )
                .changed();
            hsva.h = degrees / 360.0;
            swatch(ui, colour32(*rgb), 24.0);
            if any {
                *rgb = Rgb(hsva.to_srgb());
                changed = true;
            }
        });
    changed
}

/// What the window says about a draft: one line per warning, or why all is well. Pure, so it is
/// unit-tested.
pub fn distinctness_lines(
    checked: PairsChecked,
    pairs: &[SlotPairUse],
    warnings: &[Warning],
    greyscale: bool,
) -> Vec<String> {
    if !warnings.is_empty() {
        return warnings.iter().map(|w| w.message.clone()).collect();
    }
    let scope = match checked {
        PairsChecked::Colouring => format!(
            "the {} that neighbouring regions use",
            crate::ui::words::count(pairs.len(), "slot pair", "slot pairs")
        ),
        PairsChecked::AllSlots => "every pair of slots (nothing is coloured yet)".to_string(),
    };
    let views = if greyscale {
        "in normal vision, for the three colour-vision deficiencies and in greyscale"
    } else {
        "in normal vision and for the three colour-vision deficiencies"
    };
    vec![format!("All clear: {scope} stay distinct {views}.")]
}

/// Draws the palette window while it is open.
pub fn show(frame: &Frame, window: &mut Option<PaletteEditor>, ctx: &egui::Context) {
    let Some(editor) = window else {
        return;
    };
    let key = (frame.generation, editor.draft.slots.len());
    let doc = frame.doc();
    if editor.pairs.as_ref().is_none_or(|(k, ..)| *k != key) {
        let (checked, pairs, _) = palette_check::checked_pairs(doc, key.1);
        let mut in_use: Vec<bool> = (0..key.1)
            .map(|i| frame.session.rules().slot_use.get(i).copied().unwrap_or(0) > 0)
            .collect();
        for pin in doc.regions().values().filter_map(|r| r.pin) {
            if let Some(u) = in_use.get_mut(pin as usize) {
                *u = true;
            }
        }
        editor.pairs = Some((key, checked, pairs, in_use));
    }
    let thresholds = palette_check::thresholds(doc);
    let in_use = editor
        .pairs
        .as_ref()
        .map(|p| p.3.clone())
        .unwrap_or_default();
    let mut open = true;
    let mut apply = false;
    let mut reset = false;
    let mut remove: Option<usize> = None;
    egui::Window::new("Palette and print check")
        .open(&mut open)
        .default_width(520.0)
        .show(ctx, |ui| {
            ui.horizontal(|ui| {
                ui.label("Palette name");
                ui.text_edit_singleline(&mut editor.draft.name);
            });
            ui.horizontal(|ui| {
                let label = ui.label("Start from one of ours:");
                egui::ComboBox::from_id_salt("default-palettes")
                    .selected_text("choose…")
                    .show_ui(ui, |ui| {
                        for (index, p) in DEFAULT_PALETTES.iter().enumerate() {
                            let label = format!("{} ({} colours)", p.name, p.slots.len());
                            if ui.selectable_label(false, label).clicked()
                                && let Some(palette) = palette_edit::default_palette(index)
                            {
                                // Changes made here are not thrown away without a word.
                                if editor.draft == *doc.palette() {
                                    editor.take(palette);
                                } else {
                                    editor.replace_with = Some(palette);
                                }
                            }
                        }
                    })
                    .response
                    .labelled_by(label.id);
            });
            if let Some(palette) = editor.replace_with.clone() {
                ui.horizontal_wrapped(|ui| {
                    ui.label(format!(
                        "Starting from {} replaces the changes made here.",
                        palette.name
                    ));
                    if ui.button("Replace them").clicked() {
                        editor.take(palette);
                    }
                    if ui.button("Keep my changes").clicked() {
                        editor.replace_with = None;
                    }
                });
            }
            ui.separator();
            egui::Grid::new("palette-slots")
                .num_columns(5)
                .spacing([8.0, 4.0])
                .show(ui, |ui| {
                    for i in 0..editor.draft.slots.len() {
                        ui.label(format!("{}.", i + 1));
                        let slot = &mut editor.draft.slots[i];
                        if colour_picker(ui, &mut slot.colour, i) {
                            editor.hex[i] = slot.colour.to_hex();
                        }
                        ui.add_sized([130.0, 20.0], egui::TextEdit::singleline(&mut slot.name))
                            .widget_info(|| {
                                egui::WidgetInfo::labeled(
                                    egui::Role::TextInput,
                                    true,
                                    format!("Name of slot {}", i + 1),
                                )
                            });
                        let hex = ui.add_sized(
                            [80.0, 20.0],
                            egui::TextEdit::singleline(&mut editor.hex[i]),
                        );
                        hex.widget_info(|| {
                            egui::WidgetInfo::labeled(
                                egui::Role::TextInput,
                                true,
                                format!("Hex colour of slot {}", i + 1),
                            )
                        });
                        if hex.changed()
                            && let Some(parsed) = Rgb::from_hex(editor.hex[i].trim())
                        {
                            slot.colour = parsed;
                        }
                        let used = in_use.get(i).copied().unwrap_or(false);
                        if ui
                            .add_enabled(!used && editor.draft.slots.len() > 1, egui::Button::new("Remove"))
                            .on_disabled_hover_text(
                                "Regions use or are pinned to this colour: recolour or unpin them first",
                            )
                            .clicked()
                        {
                            remove = Some(i);
                        }
                        ui.end_row();
                    }
                });
            if ui.button("Add a colour").clicked() {
                let colour = Rgb([0xbb, 0xbb, 0xbb]);
                editor.draft.slots.push(Slot {
                    name: format!("Colour {}", editor.draft.slots.len() + 1),
                    colour,
                });
                editor.hex.push(colour.to_hex());
            }
            ui.separator();
            ui.label(RichText::new("As readers see it").strong());
            egui::Grid::new("palette-simulated")
                .num_columns(2)
                .show(ui, |ui| {
                    for (vision, row) in palette_check::simulated_palettes(&editor.draft) {
                        ui.label(vision);
                        ui.horizontal(|ui| {
                            for rgb in row {
                                swatch(ui, colour32(rgb), 20.0);
                            }
                        });
                        ui.end_row();
                    }
                });
            ui.separator();
            ui.label(RichText::new("Neighbouring colours").strong());
            if let Some((_, checked, pairs, _)) = &editor.pairs {
                let warnings = palette_check::pair_warnings(&editor.draft, pairs, &thresholds);
                let good = warnings.is_empty();
                for line in distinctness_lines(*checked, pairs, &warnings, thresholds.greyscale) {
                    let colour = if good {
                        style::GOOD
                    } else {
                        style::WARNING
                    };
                    ui.label(RichText::new(line).color(colour));
                }
                for w in palette_check::fill_warnings(doc, &editor.draft) {
                    ui.label(RichText::new(w.message).color(style::WARNING));
                }
                let greyscale = if thresholds.greyscale {
                    format!(
                        "lightness difference of at least {:.0} L* in greyscale",
                        thresholds.grey_delta_l
                    )
                } else {
                    "greyscale not checked (turn on greyscale copies in the project settings)"
                        .to_string()
                };
                ui.label(
                    RichText::new(format!(
                        "Thresholds: colour difference ΔE00 of at least {:.0}; {greyscale}. Simulations approximate; check a printed proof by eye.",
                        thresholds.delta_e00
                    ))
                    .small(),
                );
            }
            ui.separator();
            ui.horizontal(|ui| {
                let changed = editor.draft != *doc.palette();
                if ui
                    .add_enabled(changed, egui::Button::new("Apply to the project"))
                    .clicked()
                {
                    apply = true;
                }
                if ui
                    .add_enabled(changed, egui::Button::new("Discard these changes"))
                    .clicked()
                {
                    reset = true;
                }
            });
        });
    if let Some(i) = remove {
        editor.draft.slots.remove(i);
        editor.hex.remove(i);
    }
    if reset {
        editor.reset(doc.palette());
    }
    if apply {
        let draft = editor.draft.clone();
        if let Some(bad) = draft.slots.iter().position(|s| s.name.trim().is_empty()) {
            frame.send(Action::Say(
                Level::Error,
                format!("Slot {} needs a name", bad + 1),
            ));
        } else {
            frame.edit(Edit::SetPalette(draft));
            frame.send(Action::Say(
                Level::Info,
                "Palette applied (undo puts the old one back)".into(),
            ));
        }
    }
    if !open {
        *window = None;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::colour::View;
    use crate::colour::Vision;

    #[test]
    fn the_window_lists_warnings_or_says_what_was_checked() {
        let pairs = vec![SlotPairUse {
            slots: (0, 1),
            borders: 3,
        }];
        let clear = distinctness_lines(PairsChecked::Colouring, &pairs, &[], true);
        assert_eq!(clear.len(), 1);
        assert!(clear[0].contains("the 1 slot pair that neighbouring regions use"));
        let none_coloured = distinctness_lines(PairsChecked::AllSlots, &[], &[], false);
        assert!(none_coloured[0].contains("nothing is coloured yet"));
        assert!(clear[0].contains("in greyscale"));
        assert!(
            !none_coloured[0].contains("greyscale"),
            "greyscale is not claimed when it was not checked"
        );
        let warning = Warning {
            slots: (0, 1),
            view: View::Colour(Vision::Deuteranopia),
            value: 4.0,
            threshold: 10.0,
            message: "Slots 1 'A' and 2 'B' look alike".into(),
        };
        assert_eq!(
            distinctness_lines(PairsChecked::Colouring, &pairs, &[warning], true),
            vec!["Slots 1 'A' and 2 'B' look alike".to_string()]
        );
    }
}
