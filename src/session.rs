//! An open project: the document, its undo history, where it lives on disk, whether it has
//! unsaved changes, and its rules kept current edit by edit. The editor holds one; the command
//! line and the tests use the same type, so every change goes the same way:
//! [`Session::apply`] (or undo, redo) changes the document through an edit, records the inverse,
//! and brings the rules up to date from what the edit touched.

use std::path::{Path, PathBuf};

use crate::analysis::{LiveRules, Rules};
use crate::doc::{Document, Edit, EditError, History, Touched};

/// An open document with its history and its file.
#[derive(Clone, Debug)]
pub struct Session {
    doc: Document,
    history: History,
    path: Option<PathBuf>,
    /// The revision that matches the file on disk; `None` when no revision does (recovered work).
    saved_revision: Option<u64>,
    rules: LiveRules,
}

impl Session {
    /// A session for a document just loaded from `path` (or a new one, with no path): it has
    /// no unsaved changes.
    pub fn new(doc: Document, path: Option<PathBuf>) -> Session {
        let saved_revision = Some(doc.revision());
        Session {
            rules: LiveRules::new(&doc),
            doc,
            history: History::default(),
            path,
            saved_revision,
        }
    }

    /// A session for work that is not on disk as it is (recovered after a crash): unsaved
    /// until saved.
    pub fn unsaved(doc: Document, path: Option<PathBuf>) -> Session {
        let mut session = Session::new(doc, path);
        session.saved_revision = None;
        session
    }

    /// The document.
    pub fn doc(&self) -> &Document {
        &self.doc
    }
    /// The undo and redo stacks.
    pub fn history(&self) -> &History {
        &self.history
    }
    /// Where the project is saved, if anywhere.
    pub fn path(&self) -> Option<&Path> {
        self.path.as_deref()
    }
    /// The rules and the colouring's problems, for the current revision.
    pub fn rules(&self) -> &Rules {
        self.rules.rules()
    }
    /// The revision the file on disk holds, if any.
    pub fn saved_revision(&self) -> Option<u64> {
        self.saved_revision
    }

    /// True when the document differs from what is on disk (or was never saved as it is).
    pub fn is_dirty(&self) -> bool {
        self.saved_revision != Some(self.doc.revision())
    }

    /// The window title: file name, and a mark when there are unsaved changes.
    pub fn title(&self) -> String {
        let name = self
            .path
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_else(|| format!("{} (not saved)", self.doc.title()));
        format!(
            "{}{} — Tinct",
            if self.is_dirty() { "• " } else { "" },
            name
        )
    }

    /// Applies an edit as one undoable step.
    pub fn apply(&mut self, edit: Edit) -> Result<(), EditError> {
        let mut touched = Touched::default();
        touched.add(&edit);
        self.history.apply(&mut self.doc, edit)?;
        if let Some(inverse) = self.history.next_undo() {
            touched.add(inverse);
        }
        self.rules.update(&self.doc, &touched);
        Ok(())
    }

    /// Undoes the newest step; its label, or `None` when there is nothing to undo.
    pub fn undo(&mut self) -> Result<Option<String>, EditError> {
        let mut touched = Touched::default();
        if let Some(edit) = self.history.next_undo() {
            touched.add(edit);
        }
        let label = self.history.undo(&mut self.doc)?;
        if let Some(edit) = self.history.next_redo() {
            touched.add(edit);
        }
        self.rules.update(&self.doc, &touched);
        Ok(label)
    }

    /// Redoes the newest undone step; its label, or `None` when there is nothing to redo.
    pub fn redo(&mut self) -> Result<Option<String>, EditError> {
        let mut touched = Touched::default();
        if let Some(edit) = self.history.next_redo() {
            touched.add(edit);
        }
        let label = self.history.redo(&mut self.doc)?;
        if let Some(edit) = self.history.next_undo() {
            touched.add(edit);
        }
        self.rules.update(&self.doc, &touched);
        Ok(label)
    }

    /// Records that `revision` was written to `path` (a save, possibly finished on another
    /// thread). The document is clean only if it is still at that revision.
    pub fn saved(&mut self, path: PathBuf, revision: u64) {
        self.path = Some(path);
        self.saved_revision = Some(revision);
    }

    /// Forgets that the file on disk matches any revision (so quitting asks, and autosave keeps
    /// the work).
    pub fn mark_unsaved(&mut self) {
        self.saved_revision = None;
    }

    /// Saves to `path` now, in the format its extension names, and makes it the session's file.
    pub fn save_as(&mut self, path: PathBuf) -> Result<(), crate::formats::FormatError> {
        crate::formats::save(&self.doc, &path)?;
        let revision = self.doc.revision();
        self.saved(path, revision);
        Ok(())
    }
}
