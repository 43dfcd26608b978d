//! The coloured map as one table of features, shared by the GIS exports (GeoPackage and
//! Shapefile): each region's polygons in output coordinates, its imported attributes with a
//! column type that fits every value, and Tinct's columns after them.
//!
//! Coordinates:
//! - a map imported from longitude/latitude (kept in metres on Tinct's equal-area projection)
//!   goes back to longitude/latitude on WGS 84 (EPSG:4326), cut at the 180-degree meridian;
//! - a planar map whose source named its coordinate system ([`crate::doc::Document::crs`]) is
//!   written in its own units with that system;
//! - any other planar map (sketches, invented maps, planar data without a system, projects saved
//!   before Tinct recorded a projection) in its own units with the system left undefined, which
//!   GIS software shows as "unknown" rather than placing it somewhere on Earth.

use crate::doc::{AttrValue, Crs, Document, Role, Units};

use super::ExportError;
use super::geojson::{OutputPolygon, polygon_planar, polygons_lon_lat};

/// The coordinate system of the written coordinates.
#[derive(Clone, Debug, PartialEq)]
pub enum OutputCrs {
    /// Longitude/latitude on WGS 84 (EPSG:4326).
    Wgs84,
    /// The system the source named.
    Source(Crs),
    /// Planar units of no known system.
    Undefined,
}

/// The type of a column: the narrowest that holds every value of it.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ColumnKind {
    Integer,
    Real,
    Text,
    Bool,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Column {
    pub name: String,
    pub kind: ColumnKind,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Feature {
    /// Empty for a region without an outline (written as a null geometry).
    pub polygons: Vec<OutputPolygon>,
    /// One value per column.
    pub values: Vec<AttrValue>,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Layer {
    pub crs: OutputCrs,
    pub columns: Vec<Column>,
    pub features: Vec<Feature>,
}

/// The names of Tinct's own columns, in order: id, name, slot, fill, group, pinned.
pub struct TinctNames {
    pub id: &'static str,
    pub name: &'static str,
    pub slot: &'static str,
    pub fill: &'static str,
    pub group: &'static str,
    pub pinned: &'static str,
}

/// The names the GeoPackage export uses (those of the GeoJSON export, plus `tinct_name`).
pub const FULL_NAMES: TinctNames = TinctNames {
    id: "tinct_id",
    name: "tinct_name",
    slot: "tinct_colour",
    fill: "tinct_fill",
    group: "tinct_group",
    pinned: "tinct_pinned",
};

/// The names the Shapefile export uses: a `.dbf` field name holds at most 10 characters.
pub const DBF_NAMES: TinctNames = TinctNames {
    id: "tinct_id",
    name: "tinct_name",
    slot: "tinct_col",
    fill: "tinct_fill",
    group: "tinct_grp",
    pinned: "tinct_pin",
};

fn kind_of(values: impl Iterator<Item = AttrValue>) -> ColumnKind {
    let mut kind: Option<ColumnKind> = None;
    for value in values {
        let this = match value {
            AttrValue::Null => continue,
            AttrValue::Bool(_) => ColumnKind::Bool,
            AttrValue::Number(n) if n.fract() == 0.0 && n.abs() < 9.0e15 => ColumnKind::Integer,
            AttrValue::Number(_) => ColumnKind::Real,
            AttrValue::Text(_) => ColumnKind::Text,
        };
        kind = Some(match (kind, this) {
            (None, k) => k,
            (Some(a), b) if a == b => a,
            (Some(ColumnKind::Integer), ColumnKind::Real)
            | (Some(ColumnKind::Real), ColumnKind::Integer) => ColumnKind::Real,
            _ => ColumnKind::Text,
        });
    }
    kind.unwrap_or(ColumnKind::Text)
}

/// Builds the table. `fit_name` turns an attribute's name into one the format accepts (or
/// returns it unchanged); names that then clash, ignoring case, with each other or with Tinct's
/// columns are told apart by a number (an imported column named like one of Tinct's is left
/// out: Tinct's value replaces it, as when a Tinct export is imported and exported again).
pub fn layer(
    doc: &Document,
    names: &TinctNames,
    fit_name: impl Fn(&str, Option<usize>) -> String,
) -> Result<Layer, ExportError> {
    let (crs, projection) = match (doc.settings().units, doc.settings().projection) {
        (Units::Metres, Some(projection)) => (OutputCrs::Wgs84, Some(projection)),
        // Planar maps (in metres or free units) keep their own coordinates.
        (Units::Metres, None) | (Units::Unitless, _) => (
            doc.crs()
                .cloned()
                .map_or(OutputCrs::Undefined, OutputCrs::Source),
            None,
        ),
    };

    let tinct = [
        names.id,
        names.name,
        names.slot,
        names.fill,
        names.group,
        names.pinned,
    ];
    // Imported attribute names in the order first met.
    let mut sources: Vec<String> = Vec::new();
    let mut seen = std::collections::HashSet::new();
    for (_, region) in doc.regions() {
        for (key, _) in region.attributes.iter() {
            if seen.insert(key.as_str()) {
                sources.push(key.clone());
            }
        }
    }
    let mut taken: Vec<String> = tinct.iter().map(|n| n.to_ascii_lowercase()).collect();
    let mut columns: Vec<(Option<String>, Column)> = Vec::new();
    for source in sources {
        if tinct.iter().any(|t| t.eq_ignore_ascii_case(&source)) {
            continue;
        }
        let mut name = fit_name(&source, None);
        let mut n = 1;
        while taken.contains(&name.to_ascii_lowercase()) {
            n += 1;
            name = fit_name(&source, Some(n));
        }
        taken.push(name.to_ascii_lowercase());
        let kind = kind_of(
            doc.regions()
                .iter()
                .filter_map(|(_, r)| r.attributes.get(&source).cloned()),
        );
        columns.push((Some(source), Column { name, kind }));
    }
    let kinds = [
        ColumnKind::Integer,
        ColumnKind::Text,
        ColumnKind::Integer,
        ColumnKind::Text,
        ColumnKind::Text,
        ColumnKind::Bool,
    ];
    for (name, kind) in tinct.iter().zip(kinds) {
        columns.push((
            None,
            Column {
                name: name.to_string(),
                kind,
            },
        ));
    }

    let mut features = Vec::with_capacity(doc.regions().len());
    for (id, region) in doc.regions() {
        let polygons: Vec<OutputPolygon> = match &region.geometry {
            Some(g) => match &projection {
                Some(p) => g
                    .polygons
                    .iter()
                    .flat_map(|q| polygons_lon_lat(p, q))
                    .collect(),
                None => g.polygons.iter().filter_map(polygon_planar).collect(),
            },
            None => Vec::new(),
        };
        let ColourColumns { slot, fill, group } = colour_columns(doc, *id, region);
        let text = |t: Option<String>| t.map_or(AttrValue::Null, AttrValue::Text);
        let mut values: Vec<AttrValue> = columns
            .iter()
            .filter_map(|(source, _)| source.as_ref())
            .map(|s| region.attributes.get(s).cloned().unwrap_or(AttrValue::Null))
            .collect();
        values.extend([
            AttrValue::Number(id.0 as f64),
            AttrValue::Text(region.name.clone()),
            slot.map_or(AttrValue::Null, |s| AttrValue::Number(f64::from(s))),
            text(fill),
            text(group),
            AttrValue::Bool(region.pin.is_some()),
        ]);
        features.push(Feature { polygons, values });
    }
    Ok(Layer {
        crs,
        columns: columns.into_iter().map(|(_, c)| c).collect(),
        features,
    })
}

/// What every GIS export says of a region's colour: its palette slot (none for water or
/// uncoloured land), the slot's fill as `#rrggbb`, and its same-colour group's name.
pub struct ColourColumns {
    pub slot: Option<u32>,
    pub fill: Option<String>,
    pub group: Option<String>,
}

pub fn colour_columns(
    doc: &Document,
    id: crate::doc::RegionId,
    region: &crate::doc::Region,
) -> ColourColumns {
    let slot = if region.role == Role::Land {
        doc.colouring().get(&id).copied()
    } else {
        None
    };
    ColourColumns {
        slot,
        fill: slot
            .and_then(|s| doc.palette().slots.get(s as usize))
            .map(|s| s.colour.to_hex()),
        group: region
            .group
            .and_then(|g| doc.groups().get(&g))
            .map(|g| g.name.clone()),
    }
}

/// Well-known text of WGS 84 (EPSG:4326) in the form of OGC 01-009 (WKT 1), as GeoPackage's
/// `gpkg_spatial_ref_sys` table holds it (the EPSG registry's parameters: the WGS 84 ellipsoid,
/// a = 6378137 m, 1/f = 298.257223563).
pub const WGS84_WKT: &str = "GEOGCS[\"WGS 84\",DATUM[\"WGS_1984\",SPHEROID[\"WGS 84\",6378137,\
298.257223563,AUTHORITY[\"EPSG\",\"7030\"]],AUTHORITY[\"EPSG\",\"6326\"]],PRIMEM[\"Greenwich\",0,\
AUTHORITY[\"EPSG\",\"8901\"]],UNIT[\"degree\",0.0174532925199433,AUTHORITY[\"EPSG\",\"9122\"]],\
AXIS[\"Latitude\",NORTH],AXIS[\"Longitude\",EAST],AUTHORITY[\"EPSG\",\"4326\"]]";

/// The same system in the ESRI dialect of WKT that Shapefile `.prj` files use.
pub const WGS84_PRJ: &str = "GEOGCS[\"GCS_WGS_1984\",DATUM[\"D_WGS_1984\",SPHEROID[\"WGS_1984\",\
6378137.0,298.257223563]],PRIMEM[\"Greenwich\",0.0],UNIT[\"Degree\",0.0174532925199433]]";

/// The bounding box `[min x, max x, min y, max y]` of a feature's exteriors, or `None`.
pub fn envelope(polygons: &[OutputPolygon]) -> Option<[f64; 4]> {
    let mut points = polygons.iter().flat_map(|(e, _)| e.iter());
    let first = points.next()?;
    let mut b = [first[0], first[0], first[1], first[1]];
    for p in points {
        b = [
            b[0].min(p[0]),
            b[1].max(p[0]),
            b[2].min(p[1]),
            b[3].max(p[1]),
        ];
    }
    Some(b)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_column_takes_the_narrowest_type_that_holds_every_value() {
        let kind = |v: Vec<AttrValue>| kind_of(v.into_iter());
        use AttrValue::*;
        assert_eq!(
            kind(vec![Number(1.0), Null, Number(2.0)]),
            ColumnKind::Integer
        );
        assert_eq!(kind(vec![Number(1.0), Number(2.5)]), ColumnKind::Real);
        assert_eq!(kind(vec![Bool(true), Null]), ColumnKind::Bool);
        assert_eq!(kind(vec![Number(1.0), Text("a".into())]), ColumnKind::Text);
        assert_eq!(kind(vec![Null]), ColumnKind::Text);
    }
}
