//! Undo and redo: stacks of inverse edits.

use super::edit::{Edit, EditError};
use super::model::Document;

/// One undo or redo step: what to apply, and the label shown in menus.
#[derive(Clone, Debug)]
struct Step {
    label: String,
    edit: Edit,
}

/// The undo and redo stacks of one open document.
#[derive(Clone, Debug)]
pub struct History {
    undo: Vec<Step>,
    redo: Vec<Step>,
    /// At most this many undo steps are kept; the oldest are dropped first.
    limit: usize,
}

impl Default for History {
    fn default() -> History {
        History {
            undo: Vec::new(),
            redo: Vec::new(),
            limit: 1000,
        }
    }
}

impl History {
    /// An empty history that keeps at most `limit` undo steps.
    pub fn with_limit(limit: usize) -> History {
        History {
            limit: limit.max(1),
            ..History::default()
        }
    }

    /// Applies `edit` to `doc` and records its inverse, clearing the redo stack; an edit that
    /// changed nothing (its inverse is itself, as when a colouring is set to the one already
    /// there) is not recorded, so it neither fills the history nor leaves the work unsaved.
    /// True when a step was recorded.
    pub fn apply(&mut self, doc: &mut Document, edit: Edit) -> Result<bool, EditError> {
        let label = edit.label();
        let forward = edit.clone();
        let inverse = doc.apply(edit)?;
        if forward.changes_nothing(&inverse) {
            return Ok(false);
        }
        self.undo.push(Step {
            label,
            edit: inverse,
        });
        if self.undo.len() > self.limit {
            self.undo.remove(0);
        }
        self.redo.clear();
        Ok(true)
    }

    /// Undoes the newest step; returns its label, or `None` when there is nothing to undo.
    pub fn undo(&mut self, doc: &mut Document) -> Result<Option<String>, EditError> {
        let Some(step) = self.undo.pop() else {
            return Ok(None);
        };
        match doc.apply(step.edit.clone()) {
            Ok(redo) => {
                self.redo.push(Step {
                    label: step.label.clone(),
                    edit: redo,
                });
                Ok(Some(step.label))
            }
            Err(e) => {
                // The document no longer matches the history (it cannot happen through this type);
                // keep the step so nothing is silently lost, and report.
                self.undo.push(step);
                Err(e)
            }
        }
    }

    /// Redoes the newest undone step; returns its label, or `None` when there is nothing to redo.
    pub fn redo(&mut self, doc: &mut Document) -> Result<Option<String>, EditError> {
        let Some(step) = self.redo.pop() else {
            return Ok(None);
        };
        match doc.apply(step.edit.clone()) {
            Ok(undo) => {
                self.undo.push(Step {
                    label: step.label.clone(),
                    edit: undo,
                });
                Ok(Some(step.label))
            }
            Err(e) => {
                self.redo.push(step);
                Err(e)
            }
        }
    }

    /// The label of the step [`History::undo`] would undo.
    pub fn undo_label(&self) -> Option<&str> {
        self.undo.last().map(|s| s.label.as_str())
    }

    /// The label of the step [`History::redo`] would redo.
    pub fn redo_label(&self) -> Option<&str> {
        self.redo.last().map(|s| s.label.as_str())
    }

    /// The edit [`History::undo`] would apply (the inverse of the newest change).
    pub fn next_undo(&self) -> Option<&Edit> {
        self.undo.last().map(|s| &s.edit)
    }

    /// The edit [`History::redo`] would apply.
    pub fn next_redo(&self) -> Option<&Edit> {
        self.redo.last().map(|s| &s.edit)
    }

    /// Number of steps that can be undone.
    pub fn undo_count(&self) -> usize {
        self.undo.len()
    }

    /// Number of steps that can be redone.
    pub fn redo_count(&self) -> usize {
        self.redo.len()
    }

    /// Forgets every step (after loading another document).
    pub fn clear(&mut self) {
        self.undo.clear();
        self.redo.clear();
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::doc::model::Region;

    #[test]
    fn undo_then_redo_round_trips_and_new_edit_clears_redo() {
        let mut doc = Document::new("t");
        let mut history = History::default();
        let (_, add) = doc.add_region_edit(Region::new("A", [1.0, 2.0]));
        history.apply(&mut doc, add).unwrap();
        let after_add = doc.clone();
        history
            .apply(&mut doc, Edit::SetTitle("renamed".into()))
            .unwrap();
        assert_eq!(
            history.undo(&mut doc).unwrap().as_deref(),
            Some("Rename project")
        );
        assert_eq!(doc, after_add);
        assert_eq!(
            history.redo(&mut doc).unwrap().as_deref(),
            Some("Rename project")
        );
        assert_eq!(doc.title, "renamed");
        history.undo(&mut doc).unwrap();
        history
            .apply(&mut doc, Edit::SetTitle("other".into()))
            .unwrap();
        assert_eq!(history.redo_label(), None);
    }

    #[test]
    fn an_edit_that_changes_nothing_is_not_a_step_and_keeps_redo() {
        // Found by the random editor test: evening out colours that were already even left the
        // work marked unsaved though nothing had changed.
        let mut doc = Document::new("t");
        let mut history = History::default();
        let (id, add) = doc.add_region_edit(Region::new("A", [1.0, 2.0]));
        assert!(history.apply(&mut doc, add).unwrap());
        let colouring: std::collections::BTreeMap<_, _> = [(id, 1)].into();
        assert!(
            history
                .apply(&mut doc, Edit::SetColouring(colouring.clone()))
                .unwrap()
        );
        history.undo(&mut doc).unwrap();
        history.redo(&mut doc).unwrap();
        history.undo(&mut doc).unwrap();
        // Setting what is there already: nothing recorded, the redo step survives.
        let same = Edit::Batch {
            label: "Even out colour use".into(),
            edits: vec![Edit::SetColouring(Default::default())],
        };
        assert!(!history.apply(&mut doc, same).unwrap());
        assert_eq!(history.undo_count(), 1);
        assert_eq!(history.redo_label(), Some("Apply colouring"));
        // A batch of a change and a no-op is a change.
        let mixed = Edit::Batch {
            label: "both".into(),
            edits: vec![Edit::SetTitle("t".into()), Edit::SetTitle("u".into())],
        };
        assert!(history.apply(&mut doc, mixed).unwrap());
    }

    #[test]
    fn limit_drops_oldest_steps() {
        let mut doc = Document::new("t");
        let mut history = History::with_limit(2);
        for t in ["a", "b", "c"] {
            history.apply(&mut doc, Edit::SetTitle(t.into())).unwrap();
        }
        history.undo(&mut doc).unwrap();
        history.undo(&mut doc).unwrap();
        assert_eq!(history.undo(&mut doc).unwrap(), None);
        assert_eq!(doc.title, "a");
    }
}
