//! The state the panels share and read during a frame: how the map is shown, what is selected,
//! the messages, the picture options. Panels never write it; they send actions (`frame.rs`) that
//! the app applies at the end of the frame. A panel's or window's own small state (text being
//! typed, a cache of its rows, the view of the canvas) lives in that panel's module.

use std::time::Instant;

use crate::doc::{self, Document, GroupId, RegionId};

use super::commands::{ExportFormat, Tool};

/// The palette's distinctness warnings for the slot pairs neighbours use, for one revision.
#[derive(Default)]
pub struct PaletteWarnings {
    pub revision: u64,
    pub warnings: Vec<String>,
}

impl PaletteWarnings {
    pub fn of(doc: &Document) -> PaletteWarnings {
        PaletteWarnings {
            revision: doc.revision(),
            warnings: {
                let report =
                    doc::palette_check::palette_report(doc, &doc::palette_check::thresholds(doc));
                report
                    .warnings
                    .into_iter()
                    .map(|w| w.message)
                    .chain(report.fills.into_iter().map(|w| w.message))
                    .collect()
            },
        }
    }
}

/// Which certificate the map highlights.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Highlight {
    /// The regions whose borders cannot be drawn flat (a Kuratowski subdivision).
    NotPlanar,
    /// The regions that cannot take three colours.
    NotThreeColourable,
    /// The regions that cannot take one colour fewer than the minimum.
    NotFewerColourable,
    /// The rules to drop for one colour fewer (the fewest relaxations), or the part of the map
    /// that no allowed relaxation helps.
    Relaxations,
    /// The contacts to drop so that the borders can be drawn flat.
    FlatRelaxations,
}

/// What to drop so that the map takes one colour fewer: the fewest relaxations found for a
/// revision, in words, with what the checker said.
#[derive(Clone, Debug, PartialEq)]
pub struct RelaxAnswer {
    pub revision: u64,
    /// The map's proven minimum when asked, and the target (one fewer).
    pub minimum: u32,
    pub colours: u32,
    pub relaxations: Vec<crate::analysis::relax::Relaxation>,
    /// The kinds and their counts in words: "1 corner contact", "2 borders added by hand".
    pub counts: String,
    /// Each relaxation in words ("Glades–Martin").
    pub words: Vec<String>,
    /// No cheaper set exists (every cheaper one misses a checked obstruction).
    pub proven: bool,
    pub lower_bound: u64,
    /// No allowed relaxation helps: `part` needs more colours whatever is dropped.
    pub impossible: bool,
    pub part: Vec<crate::doc::RegionId>,
    /// The search stopped at its time limit (the answer may not be the fewest).
    pub stopped: bool,
    /// The independent checker accepted the answer and its evidence.
    pub checked: bool,
    /// The answer to "what to drop to draw the borders flat" (not to colours), and its verdict
    /// in words ("the corner contact of A and B makes these borders impossible to draw flat").
    pub flat: Option<String>,
}

impl RelaxAnswer {
    /// The answer in one line, for the status area and the verdict panel.
    pub fn words_line(&self) -> String {
        let a = self;
        if let Some(summary) = &a.flat {
            let mut text = summary.clone();
            if let Some(first) = text.get(..1) {
                text = first.to_uppercase() + &text[1..];
            }
            if !a.relaxations.is_empty() && !a.impossible {
                text.push_str(if a.proven && a.checked {
                    " (proven fewest)"
                } else if a.proven {
                    " (the fewest, but the checker did not accept the evidence)"
                } else {
                    " (not proven fewest)"
                });
            }
            return text;
        }
        if a.impossible {
            return format!(
                "No corner contact, border added by hand or group membership can be dropped to use {}: a part of {} regions needs {} whatever is dropped",
                a.colours,
                a.part.len(),
                a.minimum
            );
        }
        if a.relaxations.is_empty() {
            return if a.stopped {
                format!(
                    "No set of rules to drop for {} colours was found before the time limit (at least {} needed)",
                    a.colours, a.lower_bound
                )
            } else {
                format!("{} colours already do", a.colours)
            };
        }
        const SHOWN: usize = 6;
        let mut names = a
            .words
            .iter()
            .take(SHOWN)
            .cloned()
            .collect::<Vec<_>>()
            .join(", ");
        if a.words.len() > SHOWN {
            names.push_str(&format!(" and {} more", a.words.len() - SHOWN));
        }
        let proof = if a.proven && a.checked {
            " (proven fewest)".to_string()
        } else if a.proven {
            " (the fewest, but the checker did not accept the evidence)".to_string()
        } else {
            format!(" (not proven fewest: at least {} needed)", a.lower_bound)
        };
        format!(
            "Needs {}; drop {} to use {}{proof}: {names}",
            a.minimum, a.counts, a.colours
        )
    }

    /// The regions to show on the map.
    pub fn regions(&self) -> Vec<crate::doc::RegionId> {
        let mut out: Vec<crate::doc::RegionId> = self
            .relaxations
            .iter()
            .flat_map(|r| r.regions())
            .chain(self.part.iter().copied())
            .collect();
        out.sort();
        out.dedup();
        out
    }
}

/// How serious a message in the status area is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Level {
    Info,
    Warning,
    Error,
}

/// A message shown to the user.
#[derive(Clone, Debug)]
pub struct Message {
    pub level: Level,
    pub text: String,
    pub at: Instant,
}

/// The purpose of the file-path prompt.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PathPurpose {
    Open,
    SaveAs,
    /// A folder for the CNF and DRAT proof files.
    ExportProof,
    /// Where an export goes.
    Export(ExportFormat),
}

/// How pictures are exported (kept for the session, not in the project).
#[derive(Clone, Debug, PartialEq)]
pub struct ExportOptions {
    /// Region names on the picture.
    pub labels: bool,
    /// The smallest and largest name size, in points.
    pub name_pt: [f64; 2],
    /// A legend of the colours in use; off by default, since in a plain map colouring the fills
    /// carry no meaning.
    pub legend: bool,
    /// The legend's heading (empty for none).
    pub legend_heading: String,
    /// A title above the map (empty for none).
    pub title: String,
    /// A source line under the map (empty for none).
    pub source: String,
    /// A scale bar, for maps in true units.
    pub scale_bar: bool,
    /// Regions far from the main mass in inset frames (maps imported from longitude/latitude).
    pub insets: bool,
    /// Page width in millimetres (SVG and PNG; a PDF's follows from its paper).
    pub width_mm: f64,
    /// Resolution of a PNG, in dots per inch at that page width.
    pub dpi: u32,
    /// The paper of a PDF, which way up (`None`: whichever gives the larger map), and its margin.
    pub paper: crate::export::PageSize,
    pub orientation: Option<crate::export::Orientation>,
    pub margin_mm: f64,
}

impl Default for ExportOptions {
    fn default() -> ExportOptions {
        ExportOptions {
            labels: true,
            name_pt: [6.0, 10.0],
            legend: false,
            legend_heading: String::new(),
            title: String::new(),
            source: String::new(),
            scale_bar: true,
            insets: true,
            width_mm: 180.0,
            dpi: 300,
            paper: crate::export::PageSize::A4,
            orientation: None,
            margin_mm: 15.0,
        }
    }
}

/// How the map is shown and what the tools act on; never saved in the project.
pub struct ViewState {
    pub tool: Tool,
    pub selection: Option<RegionId>,
    /// The first region clicked with the border tool.
    pub border_first: Option<RegionId>,
    pub show_borders: bool,
    pub show_labels: bool,
    /// The palette slot the pin tool uses.
    pub pin_slot: u32,
    /// The group the group tool adds to.
    pub group: Option<GroupId>,
    pub highlight: Option<Highlight>,
}

impl Default for ViewState {
    fn default() -> ViewState {
        ViewState {
            tool: Tool::Select,
            selection: None,
            border_first: None,
            show_borders: false,
            show_labels: true,
            pin_slot: 0,
            group: None,
            highlight: None,
        }
    }
}
