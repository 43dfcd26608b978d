//! Small documents shared by unit tests across modules (compiled for tests only).

use super::{Border, Document, Edit, Region, RegionId, RegionPair};
#[cfg(feature = "gui")]
use super::{Geometry, Polygon};

/// Three marker regions named `names`; the first two border each other and both have colour 1
/// (slot 0), the third has no colour. Returns the document and the clashing pair.
pub fn clashing_pair_and_one_uncoloured(names: [&str; 3]) -> (Document, RegionPair) {
    let mut doc = Document::new("t");
    for name in names {
        let (_, e) = doc.add_region_edit(Region::new(name, [0.0, 0.0]));
        doc.apply(e).unwrap();
    }
    let pair = RegionPair::new(RegionId(1), RegionId(2)).unwrap();
    doc.apply(Edit::PutBorder {
        pair,
        border: Some(Border::shared(1.0)),
    })
    .unwrap();
    for id in [RegionId(1), RegionId(2)] {
        doc.apply(Edit::PutColour { id, slot: Some(0) }).unwrap();
    }
    (doc, pair)
}

/// An axis-parallel square outline with its lower left corner at (x, y) and side s.
#[cfg(feature = "gui")]
pub fn square(x: f64, y: f64, s: f64) -> Geometry {
    Geometry {
        polygons: vec![Polygon {
            exterior: vec![[x, y], [x + s, y], [x + s, y + s], [x, y + s]],
            holes: vec![],
        }],
    }
}
