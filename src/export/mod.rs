//! Export: SVG and PNG pictures for print, GeoJSON for GIS, CSV for spreadsheets.
//!
//! Pure functions over a [`Document`](crate::doc::Document) that return text or bytes; the
//! command line and the editor write them where the user asked. Beside `formats` in the layering:
//! uses `doc`, `colour` and `geo` (for the inverse projection), and nothing above.

pub mod csv;
pub mod geojson;
pub mod png;
pub mod svg;

pub use csv::to_csv;
pub use geojson::to_geojson;
pub use png::{PngSize, to_png};
pub use svg::{MapFrame, SvgOptions, to_svg};

/// Why an export could not be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ExportError {
    #[error("the map is empty: there is nothing to draw")]
    EmptyMap,
    #[error("{0}")]
    NotGeographic(String),
    #[error("the picture would be {width} x {height} pixels; the limit is {limit} pixels a side")]
    TooLarge { width: u64, height: u64, limit: u64 },
    #[error("{0}")]
    BadOption(String),
    #[error("could not render the picture: {0}")]
    Render(String),
}
