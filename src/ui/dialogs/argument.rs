//! The step-by-step argument that fewer colours fail, in a window of its own; each step selects
//! the region it is about.

use egui::RichText;

use crate::ui::frame::{Action, Frame};
use crate::ui::state::Highlight;

/// The walk through one argument while its window is open.
pub struct Walk {
    /// Which argument: the one for three colours, or for one fewer than the minimum.
    pub about: Highlight,
    pub step: usize,
    /// The step whose region was last selected (selecting again each frame would undo the
    /// user's own clicks).
    selected: Option<usize>,
}

impl Walk {
    pub fn new(about: Highlight) -> Walk {
        Walk {
            about,
            step: 0,
            selected: None,
        }
    }
}

pub fn show(frame: &Frame, walk: &mut Option<Walk>, ctx: &egui::Context) {
    let Some(current) = walk else {
        return;
    };
    let minimum = current.about == Highlight::NotFewerColourable;
    let why = frame
        .analysis
        .and_then(|a| a.colouring.as_ref())
        .and_then(|c| {
            if minimum {
                c.minimum_impossible.as_ref()
            } else {
                c.three_impossible.as_ref()
            }
        });
    let colours = why.map_or(3, |w| w.colours);
    let Some(steps) = why.and_then(|i| i.steps.as_ref()).filter(|s| !s.is_empty()) else {
        *walk = None;
        return;
    };
    let index = current.step.min(steps.len() - 1);
    let mut open = true;
    let mut next = index;
    let title = if colours == 3 {
        "Why three colours are impossible".to_string()
    } else {
        format!("Why {colours} colours are impossible")
    };
    egui::Window::new(title)
        .open(&mut open)
        .default_width(460.0)
        .default_pos([240.0, 70.0])
        .show(ctx, |ui| {
            ui.label(format!("Step {} of {}", index + 1, steps.len()));
            egui::ScrollArea::vertical()
                .max_height(320.0)
                .show(ui, |ui| {
                    for (i, step) in steps.iter().enumerate().take(index + 1) {
                        let text = format!("{}{}", "    ".repeat(step.depth as usize), step.text);
                        let text = if i == index {
                            RichText::new(text).strong()
                        } else {
                            RichText::new(text)
                        };
                        ui.label(text);
                    }
                });
            ui.horizontal(|ui| {
                if ui
                    .add_enabled(index > 0, egui::Button::new("Back"))
                    .clicked()
                {
                    next = index - 1;
                }
                if ui
                    .add_enabled(index + 1 < steps.len(), egui::Button::new("Next"))
                    .clicked()
                {
                    next = index + 1;
                }
                if ui.button("Show all").clicked() {
                    next = steps.len() - 1;
                }
            });
        });
    if !open {
        *walk = None;
        return;
    }
    current.step = next;
    if current.selected != Some(next) {
        current.selected = Some(next);
        frame.send(Action::Select(Some(steps[next].region)));
    }
}
