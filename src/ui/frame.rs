//! What a panel sees during one frame, and how it asks for change.
//!
//! At the start of each frame the app builds a [`Frame`]: read-only borrows of the session, the
//! analysis and the shared view state, plus a queue of [`Action`]s. Panels and windows read it and
//! send actions; none of them can write the session, the document or another panel's state
//! (they hold only shared borrows). The app applies the queued actions in one place at the end
//! of the frame, edits included, so what a panel draws never changes under it mid-frame.

use std::cell::RefCell;
use std::path::PathBuf;

use crate::analysis::Analysis;
use crate::doc::recovery::Recovered;
use crate::doc::{Document, Edit, GroupId, RegionId};
use crate::session::Session;

use super::commands::Command;
use super::state::{Highlight, Level, Message, PaletteWarnings, PathPurpose, ViewState};

/// The answer to "what should happen to unsaved changes?".
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum UnsavedAnswer {
    /// Save (asking for a path if needed), then run the interrupted command.
    SaveFirst,
    /// Run the interrupted command without saving (nothing is marked saved).
    Discard,
    /// Drop the interrupted command.
    Cancel,
}

/// A change a panel asks for, applied by the app at the end of the frame.
#[derive(Clone, Debug, PartialEq)]
pub enum Action {
    /// Runs a command of the command list (menus, shortcuts, buttons).
    Run(Command),
    /// Changes the document through the undo history.
    Edit(Edit),
    /// Shows a message in the status line.
    Say(Level, String),
    Select(Option<RegionId>),
    /// Selects the first of these regions and moves the view to show them all.
    GoTo(Vec<RegionId>),
    /// The border tool's first region (or none: start again).
    BorderFrom(Option<RegionId>),
    SetPinSlot(u32),
    SetGroup(Option<GroupId>),
    /// Draws a certificate on the map and moves the view to its regions.
    ShowHighlight(Highlight, Vec<RegionId>),
    HideHighlight,
    /// Opens the step-by-step argument for a certificate (and shows it on the map).
    WalkThrough(Highlight, Vec<RegionId>),
    CancelAnalysis,
    /// Opens a file (asking first about unsaved changes).
    OpenFile(PathBuf),
    /// The path prompt was answered.
    PathChosen(PathPurpose, PathBuf),
    /// The path prompt was closed without a path.
    PathCancelled,
    /// Opens the system file dialog.
    Browse(PathPurpose),
    /// The answer to the unsaved-changes question.
    Unsaved(UnsavedAnswer),
    /// Takes back (true) or drops (false) the unsaved work of an earlier session.
    Recover(bool),
    /// Colours the map by the parent units `ParentKey` reads (in the background).
    ColourByParent(crate::doc::ParentKey),
}

/// The read-only view of the editor that panels draw from during one frame.
pub struct Frame<'a> {
    pub session: &'a Session,
    /// The latest analysis (possibly for an older revision: see `analysis_stale`).
    pub analysis: Option<&'a Analysis>,
    pub analysis_stale: bool,
    /// The running analysis's stage and fraction done.
    pub progress: Option<(String, f64)>,
    pub view: &'a ViewState,
    /// Counts document states (revisions restart with each document; this never does), for
    /// panels that keep something worked out from the document.
    pub generation: u64,
    pub palette_warnings: &'a PaletteWarnings,
    pub messages: &'a [Message],
    /// Files opened or saved recently, newest first.
    pub recent: &'a [PathBuf],
    /// Notes about a graph file's lines (an imported map keeps its notes in the document).
    pub notices: &'a [String],
    /// Unsaved work from an earlier session, waiting for the user's word.
    pub recovery_offer: Option<&'a Recovered>,
    /// A command waiting for the user to decide about unsaved changes.
    pub unsaved_question: Option<Command>,
    /// What to drop for one colour fewer, when it was worked out (possibly for an older
    /// revision: panels show it only for the current one).
    pub relax: Option<&'a super::state::RelaxAnswer>,
    /// What to drop so that the borders can be drawn flat, likewise.
    pub relax_flat: Option<&'a super::state::RelaxAnswer>,
    /// The queue `send` adds to (the app makes it empty with each frame).
    pub(super) actions: RefCell<Vec<Action>>,
}

impl<'a> Frame<'a> {
    /// The document on show.
    pub fn doc(&self) -> &'a Document {
        self.session.doc()
    }

    /// Asks for a change at the end of the frame.
    pub fn send(&self, action: Action) {
        self.actions.borrow_mut().push(action);
    }

    /// Asks for a command to run at the end of the frame.
    pub fn run(&self, command: Command) {
        self.send(Action::Run(command));
    }

    /// Asks for an edit of the document at the end of the frame.
    pub fn edit(&self, edit: Edit) {
        self.send(Action::Edit(edit));
    }

    /// Selects a region and moves the view to it.
    pub fn go_to(&self, id: RegionId) {
        self.send(Action::GoTo(vec![id]));
    }

    /// The actions sent during the frame, in order.
    pub fn into_actions(self) -> Vec<Action> {
        self.actions.into_inner()
    }

    /// A region's name, or its id when it is gone.
    pub fn name(&self, id: RegionId) -> String {
        region_name(self.doc(), id)
    }
}

/// A region's name, or its id when it is gone.
pub fn region_name(doc: &Document, id: RegionId) -> String {
    doc.regions()
        .get(&id)
        .map_or_else(|| format!("#{id}"), |r| r.name.clone())
}
