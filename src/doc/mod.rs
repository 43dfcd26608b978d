//! The document: regions, borders, groups, pins, palette and colouring; the edits that change it and
//! the history that undoes them; the constraint graph handed to the engines; project and graph files.
//!
//! Nothing here knows about the GUI or threads. Only [`file`](mod@file) knows RON.

pub mod builder;
pub mod checks;
pub mod constraint;
pub mod diff;
pub mod edit;
pub mod file;
#[cfg(test)]
pub(crate) mod fixtures;
pub mod graph_formats;
pub mod history;
pub mod model;
pub mod palette_check;
pub mod palette_edit;
pub mod parent;
pub mod recovery;
pub mod store;

pub use builder::{BuildError, DocumentBuilder};
pub use checks::{ColouringCheck, check_colouring};
pub use constraint::{ConstraintGraph, RuleConflict};
pub use diff::edits_between;
pub use edit::{Edit, EditError, RegionChange, Touched};
pub use history::History;
pub use model::{
    AttrValue, Attributes, Border, BorderKind, Crs, Document, Geometry, Group, GroupId, Note,
    Palette, Point, Polygon, Region, RegionId, RegionPair, Rgb, Role, Settings, Slot, Units,
};
pub use palette_check::{PaletteReport, palette_report, simulated_palettes, slot_assignment_edit};
pub use palette_edit::PaletteEditError;
pub use parent::{PARENT_ATTRIBUTE, ParentKey};
pub use store::{BorderIndex, Borders, Colouring, Regions, SlotLookup};
