//! An open project: the document, its undo history, where it lives on disk, whether it has
//! unsaved changes, and its rules kept current edit by edit. The editor holds one; the command
//! line and the tests use the same type, so every change goes the same way:
//! [`Session::apply`] (or undo, redo) changes the document through an edit, records the inverse,
//! and brings the rules up to date from what the edit touched.

use std::cell::Cell;
use std::collections::VecDeque;
use std::path::{Path, PathBuf};
use std::sync::Arc;

use crate::analysis::{LiveRules, Rules};
use crate::doc::{Document, Edit, EditError, History, Touched};

/// An open document with its history and its file.
#[derive(Clone, Debug)]
pub struct Session {
    doc: Document,
    history: History,
    path: Option<PathBuf>,
    /// Every state the document passes through gets a number; undo and redo go back to earlier
    /// numbers, so a document undone to what was saved is clean again.
    state: u64,
    next_state: u64,
    /// The states the undo and the redo steps lead back to, beside the history's stacks.
    undo_states: Vec<u64>,
    redo_states: Vec<u64>,
    /// The state of each recent revision: a save that finishes on another thread names the
    /// revision it wrote, and the document may have moved on since.
    recent: VecDeque<(u64, u64)>,
    /// The state the file on disk holds; `None` when no state does (recovered work).
    saved_state: Option<u64>,
    /// The document as the file on disk holds it (for maps up to [`EXACT_DIRTY_LIMIT`]
    /// regions), so that a change taken back by hand rather than by Undo leaves the work clean.
    saved_copy: Option<Arc<Document>>,
    /// The last state compared with the saved copy, and whether it differed.
    compared: Cell<Option<(u64, bool)>>,
    rules: LiveRules,
}

/// Up to this many regions, a session keeps a copy of the document as saved and tells unsaved
/// work by content: a change taken back by hand (a marker placed, then deleted) leaves the work
/// clean. Larger maps tell it by the history alone (comparing would cost a pass over the whole
/// map after every edit, and the copy doubles the memory).
pub const EXACT_DIRTY_LIMIT: usize = 50_000;

/// How many revisions [`Session::saved`] can still place.
const RECENT_REVISIONS: usize = 256;

impl Session {
    /// A session for a document just loaded from `path` (or a new one, with no path): it has
    /// no unsaved changes.
    pub fn new(doc: Document, path: Option<PathBuf>) -> Session {
        let mut session = Session {
            rules: LiveRules::new(&doc),
            history: History::default(),
            path,
            state: 0,
            next_state: 1,
            undo_states: Vec::new(),
            redo_states: Vec::new(),
            recent: VecDeque::new(),
            saved_state: Some(0),
            saved_copy: None,
            compared: Cell::new(None),
            doc,
        };
        session.keep_saved_copy(None);
        session.note_state();
        session
    }

    /// A session for work that is not on disk as it is (recovered after a crash): unsaved
    /// until saved.
    pub fn unsaved(doc: Document, path: Option<PathBuf>) -> Session {
        let mut session = Session::new(doc, path);
        session.saved_state = None;
        session.saved_copy = None;
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
    /// True when the document differs from what is on disk (or was never saved as it is): a
    /// change undone back to the saved state leaves it clean.
    /// Exact for maps up to [`EXACT_DIRTY_LIMIT`] regions: the document is compared with the
    /// saved copy (once per state); above it, any change since the save counts until undone.
    pub fn is_dirty(&self) -> bool {
        if self.saved_state == Some(self.state) {
            return false;
        }
        let Some(copy) = &self.saved_copy else {
            return true;
        };
        if let Some((state, dirty)) = self.compared.get()
            && state == self.state
        {
            return dirty;
        }
        let dirty = **copy != self.doc;
        self.compared.set(Some((self.state, dirty)));
        dirty
    }

    /// Keeps the document as saved: `written` when the save says what it wrote, else the
    /// document itself when it is still at the saved state (nothing otherwise).
    fn keep_saved_copy(&mut self, written: Option<Arc<Document>>) {
        self.compared.set(None);
        self.saved_copy = match written {
            Some(doc) => Some(doc),
            None if self.saved_state == Some(self.state) => Some(Arc::new(self.doc.clone())),
            None => None,
        }
        .filter(|d| d.regions().len() <= EXACT_DIRTY_LIMIT);
    }

    fn note_state(&mut self) {
        self.recent.push_back((self.doc.revision(), self.state));
        if self.recent.len() > RECENT_REVISIONS {
            self.recent.pop_front();
        }
    }

    /// A new state after an edit: the old one is where undo leads.
    fn moved_on(&mut self) {
        self.undo_states.push(self.state);
        // The history keeps a bounded number of steps; so do the states beside them.
        let keep = self.history.undo_count();
        if self.undo_states.len() > keep {
            self.undo_states.drain(..self.undo_states.len() - keep);
        }
        self.redo_states.clear();
        self.state = self.next_state;
        self.next_state += 1;
        self.note_state();
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
        if self.history.apply(&mut self.doc, edit)? {
            self.moved_on();
            if let Some(inverse) = self.history.next_undo() {
                touched.add(inverse);
            }
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
        if label.is_some() {
            self.redo_states.push(self.state);
            self.state = self.undo_states.pop().unwrap_or(u64::MAX);
            self.note_state();
        }
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
        if label.is_some() {
            self.undo_states.push(self.state);
            self.state = self.redo_states.pop().unwrap_or(u64::MAX);
            self.note_state();
        }
        if let Some(edit) = self.history.next_undo() {
            touched.add(edit);
        }
        self.rules.update(&self.doc, &touched);
        Ok(label)
    }

    /// Records that `revision` was written to `path` (a save, possibly finished on another
    /// thread). The document is clean only if it is still at that revision.
    pub fn saved(&mut self, path: PathBuf, revision: u64) {
        self.saved_with(path, revision, None);
    }

    /// As [`Session::saved`], with the document the save wrote (its snapshot), so that the work
    /// is clean whenever it comes back to that content.
    pub fn saved_with(&mut self, path: PathBuf, revision: u64, written: Option<Arc<Document>>) {
        self.path = Some(path);
        self.saved_state = self
            .recent
            .iter()
            .rev()
            .find(|(r, _)| *r == revision)
            .map(|(_, state)| *state);
        let written = written.filter(|d| d.revision() == revision);
        self.keep_saved_copy(written);
    }

    /// Forgets that the file on disk matches any revision (so quitting asks, and autosave keeps
    /// the work).
    pub fn mark_unsaved(&mut self) {
        self.saved_state = None;
        self.saved_copy = None;
        self.compared.set(None);
    }

    /// Saves to `path` now, in the format its extension names, and makes it the session's file.
    pub fn save_as(&mut self, path: PathBuf) -> Result<(), crate::formats::FormatError> {
        crate::formats::save(&self.doc, &path)?;
        let revision = self.doc.revision();
        self.saved(path, revision);
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::{Region, RegionId};

    fn add(session: &mut Session, id: u64) {
        session
            .apply(Edit::PutRegion {
                id: RegionId(id),
                region: Some(Region::new(format!("R{id}"), [id as f64, 0.0])),
            })
            .unwrap();
    }

    #[test]
    fn dirty_means_different_from_the_file_even_across_undo_and_redo() {
        let mut s = Session::new(Document::new("t"), None);
        assert!(!s.is_dirty());
        add(&mut s, 1);
        assert!(s.is_dirty());
        s.undo().unwrap();
        assert!(!s.is_dirty(), "undone back to what is on disk");
        s.redo().unwrap();
        assert!(s.is_dirty());
        // Saved here; an edit and its undo come back to the saved state.
        s.saved(PathBuf::from("x.tinct"), s.doc().revision());
        assert!(!s.is_dirty());
        add(&mut s, 2);
        s.undo().unwrap();
        assert!(!s.is_dirty());
        // Undo past the save, then a new edit: the saved state can no longer be reached.
        s.undo().unwrap();
        assert!(s.is_dirty());
        add(&mut s, 3);
        s.undo().unwrap();
        assert!(s.is_dirty(), "a different branch, not the saved state");
    }

    #[test]
    fn a_save_of_an_earlier_revision_counts_for_that_state_only() {
        let mut s = Session::new(Document::new("t"), None);
        add(&mut s, 1);
        let written = s.doc().revision();
        add(&mut s, 2);
        // The save of `written` finishes on another thread after the second edit.
        s.saved(PathBuf::from("x.tinct"), written);
        assert!(s.is_dirty());
        s.undo().unwrap();
        assert!(!s.is_dirty());
        // Recovered work is on no disk.
        let r = Session::unsaved(Document::new("r"), None);
        assert!(r.is_dirty());
    }

    #[test]
    fn a_change_taken_back_by_hand_leaves_the_work_clean() {
        // Found by the random editor test: a marker placed and then deleted (not undone) left the
        // work marked unsaved though the document was as saved.
        let mut s = Session::new(Document::new("t"), None);
        add(&mut s, 1);
        assert!(s.is_dirty());
        s.apply(Edit::PutRegion {
            id: RegionId(1),
            region: None,
        })
        .unwrap();
        assert!(!s.is_dirty(), "the same content as the file");
        // The same after a save that finished while the document moved on.
        add(&mut s, 2);
        let written = s.doc().revision();
        let copy = Arc::new(s.doc().clone());
        add(&mut s, 3);
        s.saved_with(PathBuf::from("x.tinct"), written, Some(copy));
        assert!(s.is_dirty());
        s.apply(Edit::PutRegion {
            id: RegionId(3),
            region: None,
        })
        .unwrap();
        assert!(!s.is_dirty());
        s.mark_unsaved();
        assert!(s.is_dirty());
    }
}
