//! The desktop editor (eframe/egui), behind the default `gui` feature.
//!
//! `App` holds the session, the view state and the worker; each frame drains worker events, draws the
//! panels, which emit commands, and applies those commands at the end of the frame.

pub mod app;
pub mod canvas;
pub mod commands;
pub mod mesh;
pub mod palette;
pub mod panels;
pub mod settings;
pub mod state;
pub mod style;
pub mod view;
pub mod widgets;
pub mod words;

use std::path::PathBuf;

pub use app::App;

impl App {
    /// Draws one frame of the whole editor into `ui` (also what the UI tests drive).
    pub fn ui(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.logic(&ctx);
        self.shortcuts(&ctx);
        egui::Panel::top("menu").show(ui, |ui| panels::menu_ui(self, ui));
        egui::Panel::top("tools").show(ui, |ui| panels::toolbar_ui(self, ui));
        egui::Panel::bottom("status").show(ui, |ui| panels::status_ui(self, ui));
        egui::Panel::left("regions")
            .default_size(220.0)
            .show(ui, |ui| panels::regions_ui(self, ui));
        egui::Panel::right("inspector")
            .default_size(320.0)
            .show(ui, |ui| {
                egui::ScrollArea::vertical().show(ui, |ui| {
                    panels::details_ui(self, ui);
                    ui.separator();
                    panels::verdict_ui(self, ui);
                    ui.separator();
                    panels::palette_ui(self, ui);
                });
            });
        egui::CentralPanel::default().show(ui, |ui| canvas::canvas_ui(self, ui));
        panels::dialogs_ui(self, &ctx);
        panels::argument_ui(self, &ctx);
        palette::palette_window_ui(self, &ctx);
        settings::settings_window_ui(self, &ctx);
        self.run_pending(&ctx);
    }
}

impl eframe::App for App {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        App::ui(self, ui);
    }
}

/// Opens the editor window on `path`, or on the embedded sample map.
pub fn run(path: Option<PathBuf>) -> anyhow::Result<()> {
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default()
            .with_inner_size([1280.0, 800.0])
            .with_title("Tinct"),
        ..Default::default()
    };
    eframe::run_native("Tinct", options, Box::new(move |cc| Ok(Box::new(App::new(Some(cc.egui_ctx.clone()), path)))))
        .map_err(|e| {
            anyhow::anyhow!(
                "cannot open the editor window ({e}). Without a display, use the command line: `tinct analyse FILE` (see `tinct --help`)"
            )
        })
}
