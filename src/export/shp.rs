//! Shapefile export (ESRI Shapefile Technical Description, July 1998): the `.shp` and `.shx`
//! written here, the `.dbf` through the `dbase` crate (the one the `shapefile` crate reads
//! with), a `.prj` when the coordinate system is known and a `.cpg` saying the table is UTF-8.
//!
//! - One Polygon record (shape type 5) per region; a region without an outline is a Null
//!   record (shape type 0), which the specification allows in any shapefile (the `shapefile`
//!   crate's writer cannot mix the two, hence the small writer here). Outer rings run clockwise,
//!   holes counter-clockwise, each closed, as the specification asks.
//! - `.dbf` field names hold at most 10 characters: the imported attributes are cut to fit (and
//!   numbered when two cuts clash), and Tinct's columns are [`super::gis::DBF_NAMES`]:
//!   `tinct_id`, `tinct_name`, `tinct_col` (the palette slot), `tinct_fill` (`#rrggbb`),
//!   `tinct_grp` and `tinct_pin`. Text longer than a field's 254 bytes is cut at a character.

use std::io::Cursor;

use shapefile::dbase::{self, FieldName, FieldValue, TableWriterBuilder};

use crate::doc::{AttrValue, Document};

use super::ExportError;
use super::geojson::OutputPolygon;
use super::gis::{self, ColumnKind, OutputCrs, WGS84_PRJ};

/// The files of a shapefile, each with its extension (without the dot).
pub type Files = Vec<(&'static str, Vec<u8>)>;

fn failed(e: impl std::fmt::Display) -> ExportError {
    ExportError::Render(format!("could not build the shapefile: {e}"))
}

/// A `.dbf` field name: ASCII letters, digits and underscores, at most 10 characters; with
/// `n`, the name cut shorter to end in `_n`.
pub fn dbf_name(name: &str, n: Option<usize>) -> String {
    let base: String = name
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || c == '_' {
                c
            } else {
                '_'
            }
        })
        .collect();
    let base = if base.is_empty() {
        "field".into()
    } else {
        base
    };
    match n {
        None => base.chars().take(10).collect(),
        Some(n) => {
            let suffix = format!("_{n}");
            let keep = 10usize.saturating_sub(suffix.len());
            format!("{}{suffix}", base.chars().take(keep).collect::<String>())
        }
    }
}

/// The shapefile's files for the map: `shp`, `shx`, `dbf`, `cpg` and, when the coordinate
/// system is known, `prj`.
pub fn to_shapefile(doc: &Document) -> Result<Files, ExportError> {
    let layer = gis::layer(doc, &gis::DBF_NAMES, dbf_name)?;
    let (shp, shx) = shapes(layer.features.iter().map(|f| f.polygons.as_slice()));
    let dbf = table(&layer)?;
    let mut files: Files = vec![("shp", shp), ("shx", shx), ("dbf", dbf)];
    files.push(("cpg", b"UTF-8".to_vec()));
    let prj = match &layer.crs {
        OutputCrs::Wgs84 => Some(WGS84_PRJ.to_string()),
        OutputCrs::Source(crs) => crs.wkt.clone(),
        OutputCrs::Undefined => None,
    };
    if let Some(prj) = prj {
        files.push(("prj", prj.into_bytes()));
    }
    Ok(files)
}

const POLYGON: i32 = 5;

fn header(out: &mut Vec<u8>, words: usize, bbox: [f64; 4]) {
    out.extend(9994i32.to_be_bytes());
    out.extend([0u8; 20]);
    out.extend((words as i32).to_be_bytes());
    out.extend(1000i32.to_le_bytes());
    out.extend(POLYGON.to_le_bytes());
    // Xmin, Ymin, Xmax, Ymax, then Z and M ranges (unused: zero).
    for v in [bbox[0], bbox[2], bbox[1], bbox[3], 0.0, 0.0, 0.0, 0.0] {
        out.extend(v.to_le_bytes());
    }
}

/// The `.shp` and `.shx` bytes for one record per feature.
fn shapes<'a>(features: impl Iterator<Item = &'a [OutputPolygon]>) -> (Vec<u8>, Vec<u8>) {
    let mut records: Vec<u8> = Vec::new();
    let mut index: Vec<(usize, usize)> = Vec::new();
    let mut bbox: Option<[f64; 4]> = None;
    for (number, polygons) in features.enumerate() {
        let offset = 100 + records.len();
        let mut content: Vec<u8> = Vec::new();
        match gis::envelope(polygons) {
            None => content.extend(0i32.to_le_bytes()),
            Some(b) => {
                bbox = Some(match bbox {
                    None => b,
                    Some(a) => [
                        a[0].min(b[0]),
                        a[1].max(b[1]),
                        a[2].min(b[2]),
                        a[3].max(b[3]),
                    ],
                });
                // Outer rings clockwise, holes counter-clockwise (the reverse of how the
                // polygons come), each closed.
                let rings: Vec<Vec<[f64; 2]>> = polygons
                    .iter()
                    .flat_map(|(e, h)| std::iter::once(e).chain(h))
                    .map(|r| {
                        let mut ring: Vec<[f64; 2]> = r.iter().rev().copied().collect();
                        ring.extend(ring.first().copied());
                        ring
                    })
                    .collect();
                let points: usize = rings.iter().map(Vec::len).sum();
                content.extend(POLYGON.to_le_bytes());
                for v in [b[0], b[2], b[1], b[3]] {
                    content.extend(v.to_le_bytes());
                }
                content.extend((rings.len() as i32).to_le_bytes());
                content.extend((points as i32).to_le_bytes());
                let mut start = 0i32;
                for ring in &rings {
                    content.extend(start.to_le_bytes());
                    start += ring.len() as i32;
                }
                for p in rings.iter().flatten() {
                    content.extend(p[0].to_le_bytes());
                    content.extend(p[1].to_le_bytes());
                }
            }
        }
        records.extend((number as i32 + 1).to_be_bytes());
        records.extend(((content.len() / 2) as i32).to_be_bytes());
        records.extend(content);
        index.push((offset, records.len() + 100 - offset - 8));
    }
    let bbox = bbox.unwrap_or([0.0; 4]);
    let mut shp = Vec::with_capacity(100 + records.len());
    header(&mut shp, (100 + records.len()) / 2, bbox);
    shp.extend(records);
    let mut shx = Vec::with_capacity(100 + 8 * index.len());
    header(&mut shx, (100 + 8 * index.len()) / 2, bbox);
    for (offset, length) in index {
        shx.extend(((offset / 2) as i32).to_be_bytes());
        shx.extend(((length / 2) as i32).to_be_bytes());
    }
    (shp, shx)
}

/// Text cut to at most `max` bytes, at a character boundary.
fn cut(text: &str, max: usize) -> &str {
    let mut end = text.len().min(max);
    while !text.is_char_boundary(end) {
        end -= 1;
    }
    &text[..end]
}

/// How a numeric column is laid out: its width and decimals, wide enough for every value.
fn numeric_layout(values: &[f64], integer: bool) -> (u8, u8) {
    let width = |decimals: usize| {
        values
            .iter()
            .map(|v| format!("{v:.decimals$}").len())
            .max()
            .unwrap_or(1)
            .max(1)
    };
    if integer {
        return (width(0).min(254) as u8, 0);
    }
    // GDAL's habit for reals is 24 characters with 15 decimals; fewer decimals where a value
    // needs more room before the point.
    let decimals = (0..=15).rev().find(|&d| width(d) <= 24).unwrap_or(0);
    (width(decimals).clamp(3, 254) as u8, decimals as u8)
}

/// The `.dbf` bytes.
fn table(layer: &gis::Layer) -> Result<Vec<u8>, ExportError> {
    let mut builder = TableWriterBuilder::with_encoding(dbase::Unicode);
    for (i, column) in layer.columns.iter().enumerate() {
        let name = FieldName::try_from(column.name.as_str()).map_err(failed)?;
        let column_values = || layer.features.iter().map(move |f| &f.values[i]);
        builder = match column.kind {
            ColumnKind::Text => {
                let longest = column_values()
                    .map(|v| match v {
                        AttrValue::Text(t) => cut(t, 254).len(),
                        _ => 0,
                    })
                    .max()
                    .unwrap_or(0);
                builder.add_character_field(name, longest.clamp(1, 254) as u8)
            }
            ColumnKind::Bool => builder.add_logical_field(name),
            ColumnKind::Integer | ColumnKind::Real => {
                let numbers: Vec<f64> = column_values()
                    .filter_map(|v| match v {
                        AttrValue::Number(n) => Some(*n),
                        _ => None,
                    })
                    .collect();
                let (width, decimals) =
                    numeric_layout(&numbers, column.kind == ColumnKind::Integer);
                builder.add_numeric_field(name, width, decimals)
            }
        };
    }
    let mut out = Cursor::new(Vec::new());
    {
        let mut writer = builder.build_with_dest(&mut out);
        for feature in &layer.features {
            let mut record = dbase::Record::default();
            for (value, column) in feature.values.iter().zip(&layer.columns) {
                let field = match (column.kind, value) {
                    (ColumnKind::Text, AttrValue::Text(t)) => {
                        FieldValue::Character(Some(cut(t, 254).to_string()))
                    }
                    (ColumnKind::Text, AttrValue::Null) => FieldValue::Character(None),
                    (ColumnKind::Text, AttrValue::Number(n)) => {
                        FieldValue::Character(Some(n.to_string()))
                    }
                    (ColumnKind::Text, AttrValue::Bool(b)) => {
                        FieldValue::Character(Some(b.to_string()))
                    }
                    (ColumnKind::Bool, AttrValue::Bool(b)) => FieldValue::Logical(Some(*b)),
                    (ColumnKind::Bool, _) => FieldValue::Logical(None),
                    (_, AttrValue::Number(n)) => FieldValue::Numeric(Some(*n)),
                    (_, _) => FieldValue::Numeric(None),
                };
                record.insert(column.name.clone(), field);
            }
            writer.write_record(&record).map_err(failed)?;
        }
        writer.finalize().map_err(failed)?;
    }
    Ok(out.into_inner())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dbf_names_fit_ten_characters() {
        assert_eq!(dbf_name("POPULATION_2020", None), "POPULATION");
        assert_eq!(dbf_name("POPULATION_2020", Some(2)), "POPULATI_2");
        assert_eq!(dbf_name("région", None), "r_gion");
        assert_eq!(dbf_name("", None), "field");
    }

    #[test]
    fn numeric_fields_are_wide_enough_for_every_value() {
        assert_eq!(numeric_layout(&[1.0, -250.0, 7.0], true), (4, 0));
        let (width, decimals) = numeric_layout(&[0.5, 123456.25], false);
        assert_eq!((width, decimals), (22, 15));
        let (width, decimals) = numeric_layout(&[1.5e20], false);
        assert!(usize::from(width) >= format!("{:.*}", decimals as usize, 1.5e20).len());
    }

    #[test]
    fn text_is_cut_at_a_character() {
        assert_eq!(cut("héllo", 2), "h");
        assert_eq!(cut("abc", 10), "abc");
    }
}
