//! GeoPackage export (OGC GeoPackage Encoding Standard 1.3, OGC 12-128r15 and later): the coloured
//! map as one feature table, built in an in-memory SQLite database and returned as the file's
//! bytes (the caller writes them atomically, as it writes projects).
//!
//! What is written:
//! - `application_id` "GPKG" and `user_version` 10300 (clause 1.1.1.1.1; version 1.3, which
//!   every current GIS reads without a warning, where GDAL 3.6 warns about 1.4);
//! - `gpkg_spatial_ref_sys` with the three required rows (EPSG:4326, undefined Cartesian -1,
//!   undefined geographic 0) and the layer's own system when the source named one;
//! - `gpkg_contents` (with the layer's extent) and `gpkg_geometry_columns` (MULTIPOLYGON);
//! - the feature table: `fid`, `geom` (GeoPackage binary: the `GP` header with an xy envelope,
//!   then little-endian ISO WKB MultiPolygon), the imported attributes and Tinct's columns
//!   ([`super::gis::FULL_NAMES`]); a region without an outline has a null geometry;
//! - the R-tree spatial index extension (`gpkg_rtree_index`, clause F.3): the `rtree_<t>_<c>`
//!   virtual table filled from the envelopes, its `gpkg_extensions` row, and the triggers that
//!   keep it current when a GIS edits the layer (the 1.2 form of the triggers, which later
//!   versions still accept; written from the standard's annex, from memory of its text).

use rusqlite::{Connection, params};

use crate::doc::{AttrValue, Document};

use super::ExportError;
use super::gis::{self, ColumnKind, OutputCrs, WGS84_WKT};

fn failed(e: rusqlite::Error) -> ExportError {
    ExportError::Render(format!("could not build the GeoPackage: {e}"))
}

fn quoted(name: &str) -> String {
    format!("\"{}\"", name.replace('"', "\"\""))
}

/// A table name from the output file's name: letters, digits and underscores, not starting
/// with a digit or `gpkg_` (reserved), at most 63 characters; "regions" when nothing is left.
pub fn layer_name(stem: &str) -> String {
    let mut name: String = stem
        .chars()
        .map(|c| if c.is_alphanumeric() { c } else { '_' })
        .take(63)
        .collect();
    name = name.trim_matches('_').to_string();
    if name.is_empty() || name.to_ascii_lowercase().starts_with("gpkg_") {
        return "regions".into();
    }
    if name.starts_with(|c: char| c.is_ascii_digit()) {
        name.insert(0, 'm');
    }
    name
}

/// GeoPackage binary geometry (clause 2.1.3) of a multipolygon: version 0, little-endian, an xy
/// envelope, then ISO WKB.
pub fn geometry_blob(srs_id: i32, polygons: &[crate::export::geojson::OutputPolygon]) -> Vec<u8> {
    let envelope = gis::envelope(polygons).unwrap_or([0.0; 4]);
    let points: usize = polygons
        .iter()
        .map(|(e, h)| e.len() + 1 + h.iter().map(|r| r.len() + 1).sum::<usize>())
        .sum();
    let mut out = Vec::with_capacity(8 + 32 + 9 + polygons.len() * 9 + points * 16);
    out.extend(b"GP");
    out.push(0); // version 1 of the blob format is written 0
    out.push(0b0000_0011); // envelope xy (code 1), little-endian
    out.extend(srs_id.to_le_bytes());
    for v in envelope {
        out.extend(v.to_le_bytes());
    }
    out.push(1);
    out.extend(6u32.to_le_bytes());
    out.extend((polygons.len() as u32).to_le_bytes());
    for (exterior, holes) in polygons {
        out.push(1);
        out.extend(3u32.to_le_bytes());
        out.extend((1 + holes.len() as u32).to_le_bytes());
        for ring in std::iter::once(exterior).chain(holes) {
            out.extend((ring.len() as u32 + 1).to_le_bytes());
            for p in ring.iter().chain(ring.first()) {
                out.extend(p[0].to_le_bytes());
                out.extend(p[1].to_le_bytes());
            }
        }
    }
    out
}

/// The map as a GeoPackage file; `table` names its one layer (see [`layer_name`]).
pub fn to_geopackage(doc: &Document, table: &str) -> Result<Vec<u8>, ExportError> {
    let layer = gis::layer(doc, &gis::FULL_NAMES, |name, n| match n {
        None => name.to_string(),
        Some(n) => format!("{name}_{n}"),
    })?;
    let db = Connection::open_in_memory().map_err(failed)?;
    db.execute_batch(
        "PRAGMA application_id = 1196444487;
         PRAGMA user_version = 10300;
         CREATE TABLE gpkg_spatial_ref_sys (
           srs_name TEXT NOT NULL, srs_id INTEGER PRIMARY KEY, organization TEXT NOT NULL,
           organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL,
           description TEXT);
         CREATE TABLE gpkg_contents (
           table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL,
           identifier TEXT UNIQUE, description TEXT DEFAULT '',
           last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
           min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER,
           CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id));
         CREATE TABLE gpkg_geometry_columns (
           table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL,
           srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL,
           CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name),
           CONSTRAINT uk_gc_table_name UNIQUE (table_name),
           CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
           CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id));
         CREATE TABLE gpkg_extensions (
           table_name TEXT, column_name TEXT, extension_name TEXT NOT NULL,
           definition TEXT NOT NULL, scope TEXT NOT NULL,
           CONSTRAINT ge_tce UNIQUE (table_name, column_name, extension_name));
         INSERT INTO gpkg_spatial_ref_sys VALUES
           ('Undefined cartesian SRS', -1, 'NONE', -1, 'undefined',
            'undefined cartesian coordinate reference system'),
           ('Undefined geographic SRS', 0, 'NONE', 0, 'undefined',
            'undefined geographic coordinate reference system');",
    )
    .map_err(failed)?;
    db.execute(
        "INSERT INTO gpkg_spatial_ref_sys VALUES ('WGS 84 geodetic', 4326, 'EPSG', 4326, ?1, \
         'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid')",
        [WGS84_WKT],
    )
    .map_err(failed)?;
    let srs_id: i32 = match &layer.crs {
        OutputCrs::Wgs84 => 4326,
        OutputCrs::Undefined => -1,
        OutputCrs::Source(crs) => {
            let id = crs
                .epsg
                .and_then(|c| i32::try_from(c).ok())
                .filter(|&c| c != 4326)
                .unwrap_or(100_000);
            let (organization, code) = match crs.epsg {
                Some(code) => ("EPSG", i64::from(code)),
                None => ("NONE", i64::from(id)),
            };
            db.execute(
                "INSERT OR IGNORE INTO gpkg_spatial_ref_sys VALUES (?1, ?2, ?3, ?4, ?5, NULL)",
                params![
                    if crs.name.is_empty() {
                        "unnamed"
                    } else {
                        &crs.name
                    },
                    id,
                    organization,
                    code,
                    crs.wkt.as_deref().unwrap_or("undefined"),
                ],
            )
            .map_err(failed)?;
            id
        }
    };

    let columns: Vec<String> = layer
        .columns
        .iter()
        .map(|c| {
            let kind = match c.kind {
                ColumnKind::Integer => "INTEGER",
                ColumnKind::Real => "DOUBLE",
                ColumnKind::Text => "TEXT",
                ColumnKind::Bool => "BOOLEAN",
            };
            format!("{} {kind}", quoted(&c.name))
        })
        .collect();
    let t = quoted(table);
    db.execute_batch(&format!(
        "CREATE TABLE {t} (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, geom MULTIPOLYGON{});",
        columns.iter().map(|c| format!(", {c}")).collect::<String>()
    ))
    .map_err(failed)?;

    let extent = layer
        .features
        .iter()
        .filter_map(|f| gis::envelope(&f.polygons))
        .reduce(|a, b| {
            [
                a[0].min(b[0]),
                a[1].max(b[1]),
                a[2].min(b[2]),
                a[3].max(b[3]),
            ]
        });
    db.execute(
        "INSERT INTO gpkg_contents (table_name, data_type, identifier, description, min_x, \
         min_y, max_x, max_y, srs_id) VALUES (?1, 'features', ?1, ?2, ?3, ?4, ?5, ?6, ?7)",
        params![
            table,
            format!("{} (coloured by Tinct)", doc.title()),
            extent.map(|e| e[0]),
            extent.map(|e| e[2]),
            extent.map(|e| e[1]),
            extent.map(|e| e[3]),
            srs_id
        ],
    )
    .map_err(failed)?;
    db.execute(
        "INSERT INTO gpkg_geometry_columns VALUES (?1, 'geom', 'MULTIPOLYGON', ?2, 0, 0)",
        params![table, srs_id],
    )
    .map_err(failed)?;

    let rtree = quoted(&format!("rtree_{table}_geom"));
    db.execute_batch(&format!(
        "CREATE VIRTUAL TABLE {rtree} USING rtree(id, minx, maxx, miny, maxy);"
    ))
    .map_err(failed)?;
    {
        let placeholders: String = (0..layer.columns.len())
            .map(|i| format!(", ?{}", i + 3))
            .collect();
        let names: String = layer
            .columns
            .iter()
            .map(|c| format!(", {}", quoted(&c.name)))
            .collect();
        let transaction = db.unchecked_transaction().map_err(failed)?;
        let mut insert = transaction
            .prepare(&format!(
                "INSERT INTO {t} (fid, geom{names}) VALUES (?1, ?2{placeholders})"
            ))
            .map_err(failed)?;
        let mut index = transaction
            .prepare(&format!("INSERT INTO {rtree} VALUES (?1, ?2, ?3, ?4, ?5)"))
            .map_err(failed)?;
        for (i, feature) in layer.features.iter().enumerate() {
            let fid = i as i64 + 1;
            let geometry =
                (!feature.polygons.is_empty()).then(|| geometry_blob(srs_id, &feature.polygons));
            let mut values: Vec<rusqlite::types::Value> = vec![fid.into(), geometry.into()];
            for (value, column) in feature.values.iter().zip(&layer.columns) {
                values.push(sql_value(value, column.kind));
            }
            insert
                .execute(rusqlite::params_from_iter(values))
                .map_err(failed)?;
            if let Some(e) = gis::envelope(&feature.polygons) {
                index
                    .execute(params![fid, e[0], e[1], e[2], e[3]])
                    .map_err(failed)?;
            }
        }
        drop((insert, index));
        transaction.commit().map_err(failed)?;
    }
    db.execute(
        "INSERT INTO gpkg_extensions VALUES (?1, 'geom', 'gpkg_rtree_index', \
         'http://www.geopackage.org/spec120/#extension_rtree', 'write-only')",
        [table],
    )
    .map_err(failed)?;
    db.execute_batch(&rtree_triggers(table)).map_err(failed)?;

    let mut db = db;
    let bytes = db.serialize(rusqlite::MAIN_DB).map_err(failed)?.to_vec();
    Ok(bytes)
}

fn sql_value(value: &AttrValue, kind: ColumnKind) -> rusqlite::types::Value {
    use rusqlite::types::Value as V;
    match (value, kind) {
        (AttrValue::Null, _) => V::Null,
        (AttrValue::Bool(b), ColumnKind::Bool) => V::Integer(i64::from(*b)),
        (AttrValue::Number(n), ColumnKind::Integer) => V::Integer(*n as i64),
        (AttrValue::Number(n), ColumnKind::Real) => V::Real(*n),
        (AttrValue::Text(t), _) => V::Text(t.clone()),
        (AttrValue::Bool(b), _) => V::Text(b.to_string()),
        (AttrValue::Number(n), _) => V::Text(n.to_string()),
    }
}

/// The triggers of the R-tree extension for `table`'s `geom` column and its `fid` key.
fn rtree_triggers(table: &str) -> String {
    let t = quoted(table);
    let r = quoted(&format!("rtree_{table}_geom"));
    let name = |suffix: &str| quoted(&format!("rtree_{table}_geom_{suffix}"));
    let values = "NEW.fid, ST_MinX(NEW.geom), ST_MaxX(NEW.geom), ST_MinY(NEW.geom), \
                  ST_MaxY(NEW.geom)";
    format!(
        "CREATE TRIGGER {insert} AFTER INSERT ON {t}
           WHEN (NEW.geom NOT NULL AND NOT ST_IsEmpty(NEW.geom))
         BEGIN INSERT OR REPLACE INTO {r} VALUES ({values}); END;
         CREATE TRIGGER {update1} AFTER UPDATE OF geom ON {t}
           WHEN OLD.fid = NEW.fid AND (NEW.geom NOTNULL AND NOT ST_IsEmpty(NEW.geom))
         BEGIN INSERT OR REPLACE INTO {r} VALUES ({values}); END;
         CREATE TRIGGER {update2} AFTER UPDATE OF geom ON {t}
           WHEN OLD.fid = NEW.fid AND (NEW.geom ISNULL OR ST_IsEmpty(NEW.geom))
         BEGIN DELETE FROM {r} WHERE id = OLD.fid; END;
         CREATE TRIGGER {update3} AFTER UPDATE ON {t}
           WHEN OLD.fid != NEW.fid AND (NEW.geom NOTNULL AND NOT ST_IsEmpty(NEW.geom))
         BEGIN
           DELETE FROM {r} WHERE id = OLD.fid;
           INSERT OR REPLACE INTO {r} VALUES ({values});
         END;
         CREATE TRIGGER {update4} AFTER UPDATE ON {t}
           WHEN OLD.fid != NEW.fid AND (NEW.geom ISNULL OR ST_IsEmpty(NEW.geom))
         BEGIN DELETE FROM {r} WHERE id IN (OLD.fid, NEW.fid); END;
         CREATE TRIGGER {delete} AFTER DELETE ON {t}
           WHEN OLD.geom NOT NULL
         BEGIN DELETE FROM {r} WHERE id = OLD.fid; END;",
        insert = name("insert"),
        update1 = name("update1"),
        update2 = name("update2"),
        update3 = name("update3"),
        update4 = name("update4"),
        delete = name("delete"),
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn layer_names_are_plain_identifiers() {
        assert_eq!(layer_name("coloured map (v2)"), "coloured_map__v2");
        assert_eq!(layer_name("2026 counties"), "m2026_counties");
        assert_eq!(layer_name("gpkg_contents"), "regions");
        assert_eq!(layer_name("---"), "regions");
    }
}
