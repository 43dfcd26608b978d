//! What a map's rules and its current colouring say, without any engine: counts of regions and
//! borders, contradictions between rules, and the colouring's problems (clashes, uncoloured land,
//! pins not honoured, groups split). The editor shows it after every change, `tinct analyse`
//! prints it.

use std::collections::BTreeSet;

use crate::doc::{BorderKind, ColouringCheck, ConstraintGraph, Document, Role, RuleConflict};

/// How many recorded borders there are of each kind.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct BorderCounts {
    pub recorded: usize,
    /// Those that constrain the colouring under the current settings.
    pub active: usize,
    pub shared: usize,
    pub corner: usize,
    pub manual: usize,
    pub suppressed: usize,
}

/// The rules and the current colouring of one revision.
#[derive(Clone, Debug, PartialEq)]
pub struct Rules {
    pub revision: u64,
    pub regions: usize,
    pub land: usize,
    pub water: usize,
    pub groups: usize,
    /// Regions with a pin.
    pub pinned: usize,
    /// Regions with a colour.
    pub coloured: usize,
    /// Distinct slots the colouring uses.
    pub colours_used: usize,
    /// Coloured regions per palette slot.
    pub slot_use: Vec<usize>,
    pub borders: BorderCounts,
    /// Size of the constraint graph (land regions, groups merged, active borders).
    pub graph_vertices: usize,
    pub graph_edges: usize,
    pub colouring: ColouringCheck,
    /// Contradictions no colouring can satisfy.
    pub conflicts: Vec<RuleConflict>,
}

impl Rules {
    /// The rules of `doc`, whose constraint graph is `cg`.
    ///
    /// # Complexity
    /// O(R + B + G log G) for R regions, B borders and G groups.
    pub fn of(doc: &Document, cg: &ConstraintGraph) -> Rules {
        let regions = doc.regions();
        let land = regions.values().filter(|r| r.role == Role::Land).count();
        let mut borders = BorderCounts {
            recorded: doc.borders().len(),
            ..BorderCounts::default()
        };
        let index = doc.border_index();
        for (border, &(a, b)) in doc.borders().values().zip(&index.ends) {
            match border.kind {
                BorderKind::Shared => borders.shared += 1,
                BorderKind::Corner => borders.corner += 1,
                BorderKind::Manual => borders.manual += 1,
            }
            borders.suppressed += usize::from(border.suppressed);
            borders.active += usize::from(doc.border_is_active_at(border, a, b));
        }
        let mut slot_use = vec![0usize; doc.palette().slots.len()];
        let mut used = BTreeSet::new();
        for &slot in doc.colouring().values() {
            used.insert(slot);
            if let Some(n) = slot_use.get_mut(slot as usize) {
                *n += 1;
            }
        }
        Rules {
            revision: doc.revision(),
            regions: regions.len(),
            land,
            water: regions.len() - land,
            groups: doc.groups().len(),
            pinned: regions.values().filter(|r| r.pin.is_some()).count(),
            coloured: doc.colouring().len(),
            colours_used: used.len(),
            slot_use,
            borders,
            graph_vertices: cg.graph.vertex_count(),
            graph_edges: cg.graph.edge_count(),
            colouring: crate::doc::check_colouring(doc),
            conflicts: cg.conflicts.clone(),
        }
    }

    /// True when the colouring is complete, breaks no rule, and the rules do not contradict.
    pub fn ok(&self) -> bool {
        self.colouring.is_clean() && self.conflicts.is_empty()
    }
}
