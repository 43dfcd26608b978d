//! The desktop editor (eframe/egui), behind the default `gui` feature.
//!
//! `App` holds the session, the shared view state, the panels' and windows' own state and the
//! workers. Each frame drains worker events, builds one read-only [`Frame`] from which every
//! panel (`panels/`) and window (`dialogs/`) draws and to which they send actions, then applies
//! those actions in one place at the end of the frame.

pub mod app;
pub mod commands;
pub mod dialogs;
pub mod frame;
pub mod jobs;
pub mod mesh;
pub mod panels;
pub mod state;
pub mod style;
pub mod view;
pub mod widgets;
pub mod words;

use std::path::PathBuf;

pub use app::App;

use dialogs::Dialogs;
use frame::Frame;
use panels::Panels;

/// Draws every panel and window of one frame from `frame`; what they ask for is in its queue.
fn draw(frame: &Frame, panels: &mut Panels, dialogs: &mut Dialogs, ui: &mut egui::Ui) {
    let ctx = ui.ctx().clone();
    egui::Panel::top("menu").show(ui, |ui| panels::menu::show(frame, ui));
    egui::Panel::top("tools").show(ui, |ui| panels::toolbar::show(frame, ui));
    egui::Panel::bottom("status").show(ui, |ui| panels::status::show(frame, ui));
    egui::Panel::left("regions")
        .default_size(220.0)
        .show(ui, |ui| {
            panels::regions::show(frame, &mut panels.regions, ui)
        });
    egui::Panel::right("inspector")
        .default_size(320.0)
        .show(ui, |ui| {
            egui::ScrollArea::vertical().show(ui, |ui| {
                panels::details::show(frame, &mut panels.details, ui);
                ui.separator();
                panels::verdict::show(frame, ui);
                ui.separator();
                panels::palette::show(frame, ui);
            });
        });
    egui::CentralPanel::default()
        .show(ui, |ui| panels::canvas::show(frame, &mut panels.canvas, ui));
    if dialogs::recovery::show(frame, &ctx) {
        return;
    }
    dialogs::unsaved::show(frame, &ctx);
    dialogs::path::show(frame, &mut dialogs.path, &ctx);
    dialogs::command_list::show(frame, &mut dialogs.commands, &ctx);
    dialogs::argument::show(frame, &mut dialogs.walk, &ctx);
    dialogs::palette::show(frame, &mut dialogs.palette, &ctx);
    dialogs::settings::show(frame, &mut dialogs.settings, &ctx);
    dialogs::by_parent::show(frame, &mut dialogs.by_parent, &ctx);
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
