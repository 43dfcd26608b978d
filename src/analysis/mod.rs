//! One analysis of one revision of a document, for the command line and the editor alike: the
//! constraint graph is built once, the rules are checked, the engines run on request, and every
//! certificate is mapped back to regions here and nowhere else.
//!
//! The analysis runs wherever its caller runs it (the editor's worker thread, or the command
//! line's main thread); it takes a cancellation flag and a progress callback, and never spawns,
//! sleeps or prints.

pub mod colouring;
pub mod hierarchy;
pub mod planarity;
pub mod relax;
pub mod rules;
mod verify;

use std::sync::Arc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::time::Duration;

use crate::doc::{ConstraintGraph, Document, RegionPair};
use crate::engine::Vertex;

pub use colouring::{
    BalanceBy, ColourOptions, ColouringVerdict, Impossibility, Step, colour, proof_texts,
};
pub use planarity::{Obstacle, PlanarityVerdict, RegionEmbedding, planarity_of};
pub use rules::{BorderCounts, LiveRules, Rules};

/// How long the search for the fewest colours may run before it reports what it has.
pub const COLOURING_TIME_LIMIT: Duration = Duration::from_secs(20);

/// What a long analysis needs from its caller: a flag that stops it, and somewhere to say how
/// far it got (a stage in words and a fraction done).
pub struct Control<'a> {
    pub cancel: &'a AtomicBool,
    pub progress: &'a dyn Fn(&str, f64),
}

impl Control<'_> {
    /// True once the caller has asked to stop.
    pub fn cancelled(&self) -> bool {
        self.cancel.load(Ordering::Relaxed)
    }
}

/// Runs `f` with a control that is never cancelled and reports nowhere (the command line).
pub fn uncontrolled<T>(f: impl FnOnce(&Control) -> T) -> T {
    let never = AtomicBool::new(false);
    f(&Control {
        cancel: &never,
        progress: &|_, _| {},
    })
}

/// Which parts to compute beyond the rules.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Request {
    pub planarity: bool,
    /// Keep the planar embedding (for `--embedding` and certificate files).
    pub embedding: bool,
    /// Colour, and how.
    pub colouring: Option<ColourOptions>,
}

impl Request {
    /// Everything the editor shows: the rules, planarity, and the fewest colours keeping the
    /// current colours where possible.
    pub fn everything() -> Request {
        Request {
            planarity: true,
            embedding: false,
            colouring: Some(ColourOptions::default()),
        }
    }
}

/// Everything found for one revision.
#[derive(Clone, Debug)]
pub struct Analysis {
    pub revision: u64,
    /// The engines' view of the document, for naming vertices.
    pub graph: Arc<ConstraintGraph>,
    pub rules: Rules,
    /// When asked for.
    pub planarity: Option<PlanarityVerdict>,
    /// When asked for and the map is planar.
    pub embedding: Option<RegionEmbedding>,
    /// When asked for (and not cancelled before it started).
    pub colouring: Option<ColouringVerdict>,
}

impl Analysis {
    /// The rules alone (no engine).
    pub fn rules(doc: &Document) -> Analysis {
        uncontrolled(|control| Analysis::run(doc, Request::rules_only(), control))
    }

    /// Analyses `doc`: the constraint graph once, the rules, then what `request` asks for.
    /// Parts not reached because of cancellation are `Unknown` or absent.
    pub fn run(doc: &Document, request: Request, control: &Control) -> Analysis {
        (control.progress)("Building the border graph", 0.0);
        let graph = Arc::new(ConstraintGraph::build(doc));
        let rules = Rules::of(doc, &graph);
        let (planarity, embedding) = if request.planarity {
            let (verdict, embedding) = planarity_of(doc, &graph, request.embedding, control);
            (Some(verdict), embedding)
        } else {
            (None, None)
        };
        let colouring = match request.colouring {
            Some(options) if !control.cancelled() => {
                Some(colouring::colour_graph(doc, &graph, control, options))
            }
            _ => None,
        };
        (control.progress)("Done", 1.0);
        Analysis {
            revision: doc.revision(),
            graph,
            rules,
            planarity,
            embedding,
            colouring,
        }
    }
}

impl Request {
    /// Only the rules.
    pub fn rules_only() -> Request {
        Request {
            planarity: false,
            embedding: false,
            colouring: None,
        }
    }
}

/// "a", "a and b", "a, b and c".
pub fn and_list(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [init @ .., last] => format!("{} and {last}", init.join(", ")),
    }
}

/// The two regions behind a graph edge that actually border each other. For a same-colour group
/// this is the member on that border, not just any member, so the map shows the real contact.
pub fn bordering_pair(
    doc: &Document,
    cg: &ConstraintGraph,
    u: Vertex,
    v: Vertex,
) -> Option<RegionPair> {
    let (us, vs) = (cg.members(u), cg.members(v));
    us.iter()
        .flat_map(|a| vs.iter().map(move |b| (*a, *b)))
        .filter_map(|(a, b)| RegionPair::new(a, b))
        .find(|pair| {
            doc.borders()
                .get(pair)
                .is_some_and(|border| doc.border_is_active(*pair, border))
        })
        .or_else(|| RegionPair::new(us[0], vs[0]))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A sample map, embedded at compile time (the analysis reads no files).
    fn load(name: &str) -> Document {
        let text = match name {
            "exclave-coast" => include_str!("../../sample-maps/exclave-coast.tinct"),
            "vessland-province" => include_str!("../../sample-maps/vessland-province.tinct"),
            _ => include_str!("../../sample-maps/three-valleys.tinct"),
        };
        crate::doc::file::from_str(text).unwrap()
    }

    #[test]
    fn the_exclave_sample_is_not_planar_and_its_obstacle_names_both_parts_of_the_group() {
        let doc = load("exclave-coast");
        let a = uncontrolled(|c| Analysis::run(&doc, Request::everything(), c));
        let Some(PlanarityVerdict::NotPlanar(o)) = a.planarity else {
            panic!("expected non-planar")
        };
        assert_eq!(o.kind, "K3,3");
        let aldwyn = doc.region_by_name("Aldwyn").unwrap();
        let tessary = doc.region_by_name("Port Tessary (Aldwyn exclave)").unwrap();
        assert!(o.regions.contains(&aldwyn) && o.regions.contains(&tessary));
    }
    #[test]
    fn the_province_needs_four_colours_with_a_proof_and_the_valleys_three() {
        let analyse =
            |doc: &Document| uncontrolled(|c| Analysis::run(doc, Request::everything(), c));
        let province = load("vessland-province");
        let c = analyse(&province).colouring.unwrap();
        assert_eq!(
            (c.minimum, c.proven, c.three_colourable),
            (Some(4), true, Some(false))
        );
        let why = c.three_impossible.unwrap();
        assert!(
            why.steps.as_ref().is_some_and(|s| !s.is_empty()),
            "a readable argument"
        );
        // Regression: Eskelvane's pin was named as the culprit, though its odd wheel fails
        // three colours with or without it.
        assert!(
            province
                .region_by_name("Eskelvane")
                .is_some_and(|id| province.regions()[&id].pin.is_some())
        );
        assert_eq!(why.code, "odd_wheel");
        assert!(why.pins.is_empty());
        for step in why.steps.as_ref().unwrap() {
            assert!(!step.text.contains("pinned"), "{}", step.text);
            assert!(!step.text.contains("colour 1"), "{}", step.text);
        }
        assert!(
            !c.lower_bound_reason.contains("pin"),
            "{}",
            c.lower_bound_reason
        );
        assert!(why.cnf_and_proof.is_some(), "a checkable proof");
        let colouring = c.colouring.unwrap();
        let mut coloured = province.clone();
        coloured
            .apply(crate::doc::Edit::SetColouring(colouring))
            .unwrap();
        assert!(
            crate::doc::check_colouring(&coloured).is_clean(),
            "the colouring honours every rule"
        );

        let valleys = analyse(&load("three-valleys")).colouring.unwrap();
        assert_eq!(
            (valleys.minimum, valleys.proven, valleys.three_colourable),
            (Some(3), true, Some(true))
        );
    }
}
