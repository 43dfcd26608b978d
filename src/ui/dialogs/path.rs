//! The window that asks for a file path (typed, or chosen with the system dialog), with the
//! import options when a boundary file is opened and the picture options when one is exported.

use egui::RichText;

use crate::ui::commands::ExportFormat;
use crate::ui::frame::{Action, Frame};
use crate::ui::state::{ExportOptions, PathPurpose};
use crate::ui::widgets::focus_and_select;

/// The path window while it is open.
pub struct PathPrompt {
    pub purpose: PathPurpose,
    pub text: String,
    /// Whether its field has been given the keyboard focus (once, when it opens).
    focused: bool,
}

impl PathPrompt {
    pub fn new(purpose: PathPurpose, text: impl Into<String>) -> PathPrompt {
        PathPrompt {
            purpose,
            text: text.into(),
            focused: false,
        }
    }
}

/// The window's state: open or not, and the options it remembers for the session.
#[derive(Default)]
pub struct PathWindow {
    pub prompt: Option<PathPrompt>,
    /// How pictures are exported.
    pub export_options: ExportOptions,
    /// How boundary files are imported when opened.
    pub import_options: crate::geo::ImportOptions,
}

pub fn show(frame: &Frame, window: &mut PathWindow, ctx: &egui::Context) {
    let PathWindow {
        prompt: Some(prompt),
        export_options,
        import_options,
    } = window
    else {
        return;
    };
    let title = match prompt.purpose {
        PathPurpose::Open => "Open a file".to_string(),
        PathPurpose::SaveAs => "Save the project as".to_string(),
        PathPurpose::ExportProof => "Export the proof to a folder".to_string(),
        PathPurpose::Export(format) => format!("Export: {}", format.name()),
    };
    #[derive(PartialEq)]
    enum Choice {
        Go,
        Browse,
        Cancel,
    }
    let mut choice = None;
    egui::Window::new(title)
        .collapsible(false)
        .resizable(false)
        .show(ctx, |ui| {
            ui.label("Type the file's path, or browse for it.");
            let r = ui
                .horizontal(|ui| {
                    let label = ui.label("File path");
                    ui.add(egui::TextEdit::singleline(&mut prompt.text).desired_width(360.0))
                        .labelled_by(label.id)
                })
                .inner;
            if !prompt.focused {
                prompt.focused = true;
                focus_and_select(ui, &r, &prompt.text);
            }
            if r.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter)) {
                choice = Some(Choice::Go);
            }
            if let PathPurpose::Export(format) = prompt.purpose {
                let true_units = frame.doc().settings().units == crate::doc::Units::Metres;
                export_options_ui(ui, format, export_options, true_units);
            }
            if prompt.purpose == PathPurpose::Open
                && crate::geo::is_boundary_file(std::path::Path::new(prompt.text.trim()))
            {
                import_options_ui(ui, import_options);
            }
            ui.horizontal(|ui| {
                let go = match prompt.purpose {
                    PathPurpose::Open => "Open",
                    PathPurpose::SaveAs => "Save",
                    PathPurpose::ExportProof | PathPurpose::Export(_) => "Export",
                };
                if ui.button(go).clicked() {
                    choice = Some(Choice::Go);
                }
                if ui.button("Browse…").clicked() {
                    choice = Some(Choice::Browse);
                }
                if ui.button("Cancel").clicked() {
                    choice = Some(Choice::Cancel);
                }
            });
        });
    let purpose = prompt.purpose;
    let text = prompt.text.trim().to_string();
    match choice {
        Some(Choice::Go) if !text.is_empty() => {
            window.prompt = None;
            frame.send(Action::PathChosen(purpose, text.into()));
        }
        Some(Choice::Browse) => frame.send(Action::Browse(purpose)),
        Some(Choice::Cancel) => {
            window.prompt = None;
            frame.send(Action::PathCancelled);
        }
        _ => {}
    }
}

/// The choices that shape an exported picture (pictures only; data exports have none).
fn export_options_ui(
    ui: &mut egui::Ui,
    format: ExportFormat,
    options: &mut ExportOptions,
    true_units: bool,
) {
    if !matches!(
        format,
        ExportFormat::Svg | ExportFormat::Png | ExportFormat::Pdf
    ) {
        return;
    }
    let text_row = |ui: &mut egui::Ui, label: &str, value: &mut String, hint: &str| {
        ui.horizontal(|ui| {
            let l = ui.label(label);
            ui.add(egui::TextEdit::singleline(value).hint_text(hint))
                .labelled_by(l.id);
        });
    };
    text_row(ui, "Title", &mut options.title, "none");
    text_row(
        ui,
        "Source",
        &mut options.source,
        "none (written as \"Source: …\")",
    );
    ui.horizontal(|ui| {
        ui.checkbox(&mut options.labels, "Region names");
        ui.add_enabled(
            true_units,
            egui::Checkbox::new(&mut options.scale_bar, "Scale bar"),
        )
        .on_disabled_hover_text("This map is in free units: a length would mean nothing");
        ui.add_enabled(
            true_units,
            egui::Checkbox::new(&mut options.insets, "Far parts in inset frames"),
        )
        .on_hover_text("Regions far from the main mass (Alaska beside the other states) are drawn in framed boxes beside it");
        ui.checkbox(&mut options.legend, "Legend").on_hover_text(
            "The fills of a map colouring carry no meaning, so it is off unless you want one",
        );
    });
    if options.labels {
        ui.horizontal(|ui| {
            ui.label("Names from");
            let [lo, hi] = &mut options.name_pt;
            ui.add(
                egui::DragValue::new(lo)
                    .range(3.0..=36.0)
                    .speed(0.1)
                    .fixed_decimals(1),
            )
            .on_hover_text("The size of the smallest regions' names, in points (1/72 inch)");
            ui.label("to");
            ui.add(
                egui::DragValue::new(hi)
                    .range(3.0..=36.0)
                    .speed(0.1)
                    .fixed_decimals(1),
            )
            .on_hover_text("The size of the largest regions' names, in points");
            ui.label("pt");
            // The largest is held at least as large as the smallest.
            if *hi < *lo {
                *hi = *lo;
            }
        });
    }
    if options.legend {
        text_row(ui, "Legend heading", &mut options.legend_heading, "none");
    }
    if format == ExportFormat::Pdf {
        paper_ui(ui, options);
        return;
    }
    ui.horizontal(|ui| {
        ui.label("Page width");
        ui.add(
            egui::DragValue::new(&mut options.width_mm)
                .range(20.0..=2000.0)
                .suffix(" mm"),
        );
        if format == ExportFormat::Png {
            ui.label("at");
            egui::ComboBox::from_id_salt("export-dpi")
                .selected_text(format!("{} dpi", options.dpi))
                .show_ui(ui, |ui| {
                    for dpi in [96, 150, 300, 600] {
                        ui.selectable_value(&mut options.dpi, dpi, format!("{dpi} dpi"));
                    }
                });
            let px = options.width_mm / 25.4 * options.dpi as f64;
            ui.label(format!("({px:.0} pixels wide)"));
        }
    });
}

/// A PDF's paper: its size, which way up, and the margin; the map fills what is left.
fn paper_ui(ui: &mut egui::Ui, options: &mut ExportOptions) {
    use crate::export::{Orientation, PageSize};
    ui.horizontal(|ui| {
        let label = ui.label("Paper");
        egui::ComboBox::from_id_salt("export-paper")
            .selected_text(options.paper.name())
            .show_ui(ui, |ui| {
                for page in PageSize::NAMED {
                    ui.selectable_value(&mut options.paper, page, page.name());
                }
            })
            .response
            .labelled_by(label.id);
        let label = ui.label("Margin");
        ui.add(
            egui::DragValue::new(&mut options.margin_mm)
                .range(0.0..=100.0)
                .suffix(" mm"),
        )
        .labelled_by(label.id);
    });
    ui.horizontal(|ui| {
        ui.radio_value(&mut options.orientation, None, "Whichever fits best");
        ui.radio_value(
            &mut options.orientation,
            Some(Orientation::Portrait),
            "Portrait",
        );
        ui.radio_value(
            &mut options.orientation,
            Some(Orientation::Landscape),
            "Landscape",
        );
    });
}

/// How a boundary file is imported: the options of `tinct import`, for the Open window.
fn import_options_ui(ui: &mut egui::Ui, options: &mut crate::geo::ImportOptions) {
    use crate::geo::Rule;
    ui.separator();
    ui.label(RichText::new("Importing boundaries").strong());
    ui.horizontal(|ui| {
        ui.label("Regions border each other along");
        ui.radio_value(&mut options.rule, Rule::Rook, "an edge (rook)");
        ui.radio_value(
            &mut options.rule,
            Rule::Queen,
            "an edge or a corner (queen)",
        );
    });
    let number = |ui: &mut egui::Ui, label: &str, value: &mut f64| {
        ui.horizontal(|ui| {
            let l = ui.label(label);
            ui.add(
                egui::DragValue::new(value)
                    .range(0.0..=f64::MAX)
                    .speed(10.0),
            )
            .labelled_by(l.id);
            ui.label("(metres for longitude/latitude data, else map units)");
        });
    };
    number(ui, "Tolerance", &mut options.tolerance);
    number(ui, "Shortest shared border", &mut options.min_border_length);
    let text = |ui: &mut egui::Ui, label: &str, hint: &str, value: &mut Option<String>| {
        ui.horizontal(|ui| {
            let l = ui.label(label);
            let mut typed = value.clone().unwrap_or_default();
            if ui
                .add(egui::TextEdit::singleline(&mut typed).hint_text(hint))
                .labelled_by(l.id)
                .changed()
            {
                *value = (!typed.trim().is_empty()).then(|| typed.trim().to_string());
            }
        });
    };
    text(
        ui,
        "Name field",
        "name, NAME, Name, id or ID",
        &mut options.name_field,
    );
    text(
        ui,
        "Field that tells equal names apart",
        "for example STATE",
        &mut options.qualify_field,
    );
    text(ui, "Layer", "the only polygon layer", &mut options.layer);
    ui.checkbox(
        &mut options.split_parts,
        "One region per polygon part (the parts share a colour)",
    );
    let mut down = options.coordinates == crate::geo::CoordinateMode::PlanarDown;
    if ui
        .checkbox(
            &mut down,
            "Coordinates grow downward (screen or pixel coordinates, as in maps made for web pages)",
        )
        .changed()
    {
        options.coordinates = if down {
            crate::geo::CoordinateMode::PlanarDown
        } else {
            crate::geo::CoordinateMode::Auto
        };
    }
}
