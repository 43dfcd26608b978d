//! Edits and undo: every edit kind is undone exactly by its inverse (property tests).

use proptest::prelude::*;
use tinct::doc::{Document, History};

use super::support::arb;

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn applying_the_inverse_restores_the_document_exactly(doc in arb::document(), op in arb::op()) {
        let mut doc = doc;
        let Some(edit) = arb::edit_for(&doc, &op) else { return Ok(()) };
        let before = doc.clone();
        let revision = doc.revision();
        match doc.apply(edit.clone()) {
            Ok(inverse) => {
                prop_assert_eq!(doc.revision(), revision + 1);
                let again = doc.apply(inverse).expect("an inverse always applies");
                prop_assert_eq!(&doc, &before);
                // The inverse of the inverse redoes the edit.
                let mut redone = before.clone();
                redone.apply(edit).expect("the edit applied once already");
                doc.apply(again).expect("redo applies");
                prop_assert_eq!(&doc, &redone);
            }
            Err(_) => {
                prop_assert_eq!(&doc, &before);
                prop_assert_eq!(doc.revision(), revision);
            }
        }
    }

    #[test]
    fn the_edits_between_two_documents_lead_from_one_to_the_other_and_undo_back(
        from in arb::document(),
        steps in proptest::collection::vec(arb::op(), 0..30),
        unrelated in arb::document(),
    ) {
        // A later version of the same document (as recovered work is of its file), and an
        // unrelated one (ids that clash, groups and borders that differ everywhere).
        let mut later = from.clone();
        for op in &steps {
            if let Some(edit) = arb::edit_for(&later, op) {
                let _ = later.apply(edit);
            }
        }
        for to in [later, unrelated] {
            let mut doc = from.clone();
            let inverse = doc
                .apply(tinct::doc::edits_between(&from, &to, "Recover"))
                .expect("the edits between two documents apply");
            prop_assert_eq!(&doc, &to);
            doc.apply(inverse).expect("and undo");
            prop_assert_eq!(&doc, &from);
        }
    }

    #[test]
    fn undoing_everything_returns_to_the_start_and_redo_replays(ops in proptest::collection::vec(arb::op(), 0..40)) {
        let mut doc = Document::new("start");
        let start = doc.clone();
        let mut history = History::default();
        let mut snapshots = vec![doc.clone()];
        for op in &ops {
            // An edit that changes nothing is not a step (it records nothing).
            if let Some(edit) = arb::edit_for(&doc, op)
                && history.apply(&mut doc, edit) == Ok(true)
            {
                snapshots.push(doc.clone());
            }
        }
        let end = doc.clone();
        for expected in snapshots.iter().rev().skip(1) {
            prop_assert!(history.undo(&mut doc).expect("undo applies").is_some());
            prop_assert_eq!(&doc, expected);
        }
        prop_assert_eq!(history.undo(&mut doc).expect("nothing left"), None);
        prop_assert_eq!(&doc, &start);
        while history.redo(&mut doc).expect("redo applies").is_some() {}
        prop_assert_eq!(&doc, &end);
    }
}

/// The rules as a full rebuild gives them (the reference the incremental update is held to).
fn rebuilt(doc: &Document) -> tinct::analysis::Rules {
    tinct::analysis::Rules::of(doc, &tinct::doc::ConstraintGraph::build(doc))
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]

    #[test]
    fn rules_kept_edit_by_edit_equal_a_rebuild_after_every_step(
        ops in proptest::collection::vec(arb::op(), 1..60),
        undo_every in 2usize..7,
    ) {
        let mut session = tinct::session::Session::new(Document::new("start"), None);
        for (i, op) in ops.iter().enumerate() {
            if let Some(edit) = arb::edit_for(session.doc(), op) {
                let _ = session.apply(edit);
                prop_assert_eq!(session.rules(), &rebuilt(session.doc()));
            }
            // Undo and redo now and then: they must keep the rules current too.
            if i % undo_every == 0 {
                session.undo().expect("undo applies");
                prop_assert_eq!(session.rules(), &rebuilt(session.doc()));
                if i % (2 * undo_every) == 0 {
                    session.redo().expect("redo applies");
                    prop_assert_eq!(session.rules(), &rebuilt(session.doc()));
                }
            }
        }
    }
}
